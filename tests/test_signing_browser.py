"""The signing package in Python in the browser (Pyodide, as shipped inside flet-web), in real Chromium.

The page loads Pyodide from flet-web's own copy, unpacks the signing package with its pure-Python
dependencies (python-ecdsa, six, confusable_homoglyphs) and runs the same code as the server. There
`hashlib.pbkdf2_hmac` is missing, so the key-derivation seam must take the browser's WebCrypto; the
results must be the ones the server computes: one stored form, both sides read it.
"""

from __future__ import annotations

import asyncio
import functools
import http.server
import importlib.util
import json
import threading
import zipfile
from pathlib import Path

import pytest
from test_e2e_walk import CHROMIUM, CHROMIUM_ARGS

from mobile_app.signing import (
    canonical_hash,
    derive,
    generate_key_pair,
    new_params,
    protect,
    sign,
    verify,
)
from mobile_app.signing.kdf import Derived

pytestmark = [
    pytest.mark.browser,
    pytest.mark.slow,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium"),
]
ROOT = Path(__file__).resolve().parents[1]
PASSPHRASE = "copper earth loop ninety"
PAGE = """<!doctype html><title>pyodide</title><script type="module">
import { loadPyodide } from "./pyodide/pyodide.mjs";
try {
  const py = await loadPyodide({ indexURL: "./pyodide/" });
  const archive = await (await fetch("app.zip")).arrayBuffer();
  py.unpackArchive(archive, "zip", { extractDir: "/app" });
  py.runPython("import sys; sys.path.insert(0, '/app')");
  const code = await (await fetch("check.py")).text();
  window.result = await py.runPythonAsync(code);
} catch (error) { window.result = JSON.stringify({ error: String(error) }); }
</script>"""
CHECK = """
import hashlib, json, time
from mobile_app.signing import (KdfParams, canonical_hash, derive, matches, normalise_name, parse_derived,
                                sealed_from_dict, sign, unlock, verify)
from mobile_app.signing.kdf import backend_name
inputs = json.loads(open("/app/inputs.json").read())
out = {"has_pbkdf2_hmac": hasattr(hashlib, "pbkdf2_hmac"), "backend": backend_name()}
out["rfc7914"] = (await derive("passwd", KdfParams(iterations=1, salt=b"salt", length=64))).hex()
stored = parse_derived(inputs["pin"])
out["pin_right"] = matches(stored, await derive("2468", stored.params))
out["pin_wrong"] = matches(stored, await derive("2469", stored.params))
started = time.perf_counter()
pair = await unlock(sealed_from_dict(inputs["sealed"]), inputs["passphrase"])
out["unlock_s"] = time.perf_counter() - started
out["public_key"] = pair.public_key.hex()
out["signature"] = sign(pair.seed, b"approved in the browser").hex()
server_key = bytes.fromhex(inputs["server_public"])
server_signature = bytes.fromhex(inputs["server_signature"])
verify(server_key, b"signed on the server", server_signature)
out["canonical"] = canonical_hash(inputs["doc"])
out["name"] = normalise_name("  Ines\\u3000Okafor ")
json.dumps(out)
"""


def _add_package(archive: zipfile.ZipFile, module: str) -> None:
    """Put an installed module or package (its .py files and data) into the archive at the top."""
    spec = importlib.util.find_spec(module)
    assert spec is not None and spec.origin is not None
    origin = Path(spec.origin)
    if origin.name != "__init__.py":
        archive.write(origin, origin.name)
        return
    top = origin.parent.parents[module.count(".")]
    for path in origin.parent.rglob("*"):
        if path.is_file() and "__pycache__" not in path.parts and not path.name.startswith("test_"):
            archive.write(path, str(path.relative_to(top)))


class _Handler(http.server.SimpleHTTPRequestHandler):
    extensions_map = {**http.server.SimpleHTTPRequestHandler.extensions_map,
                      ".wasm": "application/wasm", ".mjs": "text/javascript", ".zip": "application/zip"}

    def log_message(self, *args: object) -> None:
        return


@pytest.fixture(scope="module")
def site(tmp_path_factory: pytest.TempPathFactory):
    """A loopback static site: flet-web's Pyodide, the page, the archive and the server's inputs."""
    folder = tmp_path_factory.mktemp("pyodide-site")
    pyodide_dir = Path(importlib.util.find_spec("flet_web").origin).parent / "web" / "pyodide"
    (folder / "pyodide").symlink_to(pyodide_dir)
    (folder / "index.html").write_text(PAGE, encoding="utf-8")
    (folder / "check.py").write_text(CHECK, encoding="utf-8")
    pin_params = new_params(100_000)
    server_pair = generate_key_pair()
    browser_pair = generate_key_pair()
    doc = {"job": {"client_ref": "W-1", "zs": 0.62, "note": "Ω ²"}, "boards": [[1, 2.0, 1e-05, None]]}
    inputs = {
        "pin": Derived(pin_params, asyncio.run(derive("2468", pin_params))).text(),
        "sealed": asyncio.run(protect("Ines Okafor", browser_pair, PASSPHRASE)).to_dict(),
        "passphrase": PASSPHRASE,
        "server_public": server_pair.public_key.hex(),
        "server_signature": sign(server_pair.seed, b"signed on the server").hex(),
        "doc": doc,
    }
    with zipfile.ZipFile(folder / "app.zip", "w") as archive:
        for module in ("mobile_app", "ecdsa", "six", "confusable_homoglyphs"):
            if module == "mobile_app":
                archive.writestr("mobile_app/__init__.py", "")
                _add_package(archive, "mobile_app.signing")
            else:
                _add_package(archive, module)
        archive.writestr("inputs.json", json.dumps(inputs))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", 0),
                                             functools.partial(_Handler, directory=str(folder)))
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    yield f"http://127.0.0.1:{server.server_address[1]}", browser_pair, doc
    server.shutdown()
    thread.join(timeout=5)


@pytest.fixture(scope="module")
def result(site) -> dict:
    from playwright.sync_api import sync_playwright

    url, _pair, _doc = site
    with sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        page = browser.new_context().new_page()
        page.route("**/*", lambda route: route.continue_() if route.request.url.startswith(url)
                   else route.abort())
        page.goto(url + "/index.html")
        page.wait_for_function("window.result !== undefined", timeout=240_000)
        data = json.loads(page.evaluate("window.result"))
        browser.close()
    assert "error" not in data, data.get("error")
    return data


def test_the_browser_has_no_pbkdf2_hmac_and_the_seam_takes_webcrypto(result) -> None:
    assert result["has_pbkdf2_hmac"] is False and result["backend"] == "webcrypto"


def test_webcrypto_pbkdf2_matches_rfc7914(result) -> None:
    # RFC 7914 section 11, PBKDF2-HMAC-SHA256 ("passwd", "salt", c=1, dkLen=64).
    assert result["rfc7914"] == (
        "55ac046e56e3089fec1691c22544b605f94185216dde0465e68b9d57c20dacbc49ca9cccf179b645991664b39d77ef31"
        "7c71b845b1e30bd509112041d3a19783")


def test_a_pin_stored_on_the_server_is_checked_in_the_browser(result) -> None:
    assert result["pin_right"] is True and result["pin_wrong"] is False


def test_a_key_sealed_on_the_server_unlocks_and_signs_in_the_browser(site, result) -> None:
    _url, pair, _doc = site
    assert result["public_key"] == pair.public_key.hex()
    verify(pair.public_key, b"approved in the browser", bytes.fromhex(result["signature"]))


def test_canonical_hashes_and_names_agree(site, result) -> None:
    _url, _pair, doc = site
    assert result["canonical"] == canonical_hash(doc)
    assert result["name"] == "Ines Okafor"
    print(f"unlock in the browser (PBKDF2, 2,000,000 iterations): {result['unlock_s']:.2f} s")
