"""Boardside in the browser (the static build, Python running in the page through Pyodide).

`entry` is the module the page's Python worker starts: `prepare()` while the web client loads, then
`run()` when it connects. `storage` binds the job store to the worker's browser-storage mount. Other
platform edges of the browser (downloads, sending with fetch, the browser's crypto) join here as
modules of their own, each handed to the app through the same entry.

Nothing here is imported by the server form; `boardside_js` and `flet_js` exist only in the worker.
"""
