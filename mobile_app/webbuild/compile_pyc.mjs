// Compile Python files to bytecode with the browser's own Python (Pyodide under Node), so the page
// does not compile them at every start. Bytecode is tied to the Python version, and the browser's
// Python is newer than the one that runs the build.
//
//   node compile_pyc.mjs PYODIDE_DIR SOURCELESS_DIR CACHED_DIR
//
// SOURCELESS_DIR: each x.py gets an x.pyc beside it without its docstrings (the build then drops x.py):
// the libraries' docstrings are their manuals, which nothing in the page reads (as `python -OO` does, but
// asserts and __debug__ stay as they are). Measured on Boardside's libraries and export archives: 0.5 MB
// less gzip-compressed.
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
import ast
import compileall
import importlib.util
from importlib._bootstrap_external import _code_to_hash_pyc
from pathlib import Path
from py_compile import PycInvalidationMode


def without_docstrings(tree):
    for node in ast.walk(tree):
        if isinstance(node, (ast.Module, ast.ClassDef, ast.FunctionDef, ast.AsyncFunctionDef)):
            first = node.body[0] if node.body else None
            if (isinstance(first, ast.Expr) and isinstance(first.value, ast.Constant)
                    and isinstance(first.value.value, str)):
                node.body = node.body[1:] or [ast.copy_location(ast.Pass(), first)]
    return tree


def compile_sourceless(folder):
    ok = True
    for path in sorted(Path(folder).rglob("*.py")):
        source = path.read_bytes()
        try:
            code = compile(without_docstrings(ast.parse(source, str(path))), str(path), "exec", dont_inherit=True)
        except (SyntaxError, ValueError) as error:
            print(f"{path}: {error}")
            ok = False
            continue
        pyc = _code_to_hash_pyc(code, importlib.util.source_hash(source), checked=False)
        path.with_suffix(".pyc").write_bytes(pyc)
    return ok


ok_sourceless = compile_sourceless("/sourceless")
mode = PycInvalidationMode.UNCHECKED_HASH
ok_cached = compileall.compile_dir("/cached", quiet=1, invalidation_mode=mode)
bool(ok_sourceless and ok_cached)
`);
process.exit(ok ? 0 : 1);
