// Compile Python files to bytecode with the browser's own Python (Pyodide under Node), so the page
// does not compile them at every start. Bytecode is tied to the Python version, and the browser's
// Python is newer than the one that runs the build.
//
//   node compile_pyc.mjs PYODIDE_DIR SOURCELESS_DIR CACHED_DIR
//
// SOURCELESS_DIR: each x.py gets an x.pyc beside it (the build then drops x.py).
// CACHED_DIR: each x.py gets __pycache__/x.cpython-3NN.pyc and keeps its source for tracebacks.
// Both kinds are "unchecked-hash" files: used without comparing file times, which an unpacked archive
// does not keep.
import path from "node:path";
import { pathToFileURL } from "node:url";

const [pyodideDir, sourcelessDir, cachedDir] = process.argv.slice(2);
const { loadPyodide } = await import(pathToFileURL(path.join(pyodideDir, "pyodide.mjs")).href);
const pyodide = await loadPyodide({ indexURL: pyodideDir + path.sep });
const FS = pyodide.FS;
for (const [mount, folder] of [["/sourceless", sourcelessDir], ["/cached", cachedDir]]) {
  FS.mkdirTree(mount);
  FS.mount(FS.filesystems.NODEFS, { root: path.resolve(folder) }, mount);
}
const ok = pyodide.runPython(`
import compileall
from py_compile import PycInvalidationMode

mode = PycInvalidationMode.UNCHECKED_HASH
ok_sourceless = compileall.compile_dir("/sourceless", quiet=1, legacy=True, invalidation_mode=mode)
ok_cached = compileall.compile_dir("/cached", quiet=1, invalidation_mode=mode)
bool(ok_sourceless and ok_cached)
`);
process.exit(ok ? 0 : 1);
