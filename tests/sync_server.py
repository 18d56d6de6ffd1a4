"""A real WebDAV server (wsgidav on cheroot) on 127.0.0.1 for the sync tests and benchmark.

Run as a subprocess: `python sync_server.py --root DIR --port P --user U --password PW --log FILE`
plus optional faults, applied by a small WSGI layer in front of wsgidav (the server itself is real):

- `--fail STATUS:N`   answer the first N requests with STATUS (500, 507, ...);
- `--slow SECONDS:N`  sleep before answering the first N requests (a slow server);
- `--exit-after-bytes B`  the process dies (os._exit) once B bytes of PUT bodies were read: the
                      server stops in the middle of an upload, leaving a partial file on its disk;
- `--cert PEM --key PEM`  serve https with that certificate;
- `--truncate-put B`  PUT bodies are cut to B bytes but the server still answers 201 (a lying server);
- `--trickle SECONDS:N[:METHOD]`  the first N answers (to METHOD only, if given) send their body one
                      byte every SECONDS (a stalled link that never stays silent long enough for a
                      per-read timeout);
- `--exit-after METHOD`  the process dies (os._exit) after doing the first METHOD request and before
                      answering it: the server did the work, the client never hears so;
- `--made-meanwhile`  the first PROPFIND that finds no folder is answered 404, and then the folder is made on
                      the server's disk, as another device would make it between our PROPFIND and MKCOL;
- `--cors ORIGIN`     wsgidav's own CORS setting (`cors_config`), as the README tells an office to set
                      it for the browser build: a page from ORIGIN may send the sync's requests.

Every request is appended to the log file as `METHOD PATH STATUS` so tests can count them.
`DavServer` starts and stops such a process from a test.
"""

from __future__ import annotations

import argparse
import hashlib
import json
import os
import socket
import subprocess
import sys
import threading
import time
from pathlib import Path

HERE = Path(__file__).resolve()


class _Faults:
    """Counters for the injected faults, shared by cheroot's worker threads."""

    def __init__(self, args: argparse.Namespace) -> None:
        self.lock = threading.Lock()
        fail = (args.fail or "0:0").split(":")
        self.fail_status, self.fail_left = int(fail[0]), int(fail[1])
        slow = (args.slow or "0:0").split(":")
        self.slow_s, self.slow_left = float(slow[0]), int(slow[1])
        self.exit_after_bytes = args.exit_after_bytes
        self.truncate_put = args.truncate_put
        trickle = (args.trickle or "0:0").split(":")
        self.trickle_s, self.trickle_left = float(trickle[0]), int(trickle[1])
        self.trickle_method = trickle[2] if len(trickle) > 2 else None
        self.exit_after = args.exit_after
        self.made_meanwhile = int(args.made_meanwhile)  # once: the office folder
        self.put_bytes = 0

    def take(self, name: str) -> bool:
        """Use one of the first-N counters; True while it lasts."""
        with self.lock:
            left = getattr(self, name)
            if left > 0:
                setattr(self, name, left - 1)
                return True
            return False


class _DyingInput:
    """wsgi.input that kills the server process after a number of body bytes."""

    def __init__(self, inner, faults: _Faults) -> None:
        self.inner = inner
        self.faults = faults

    def read(self, size: int = -1) -> bytes:
        data = self.inner.read(size)
        with self.faults.lock:
            self.faults.put_bytes += len(data)
            if self.faults.put_bytes >= self.faults.exit_after_bytes:
                os._exit(3)
        return data

    def readline(self, *args):
        return self.inner.readline(*args)


class _TruncatingInput:
    """wsgi.input that ends early: the stored file is shorter than what was sent."""

    def __init__(self, inner, limit: int) -> None:
        self.inner = inner
        self.left = limit

    def read(self, size: int = -1) -> bytes:
        data = self.inner.read(size)
        kept = data[: max(self.left, 0)]
        self.left -= len(kept)
        return kept


def _trickled(body, seconds: float):
    """An answer's body sent one byte at a time, `seconds` apart."""
    for chunk in body:
        for i in range(len(chunk)):
            time.sleep(seconds)
            yield chunk[i:i + 1]


def fault_layer(app, faults: _Faults, log_path: Path, root: Path):
    """Wrap a WSGI app with the faults and the request log."""
    log_lock = threading.Lock()

    def write_log(environ, status: str) -> None:
        line = f"{environ['REQUEST_METHOD']} {environ.get('PATH_INFO', '')} {status.split()[0]}\n"
        with log_lock, open(log_path, "a", encoding="utf-8") as fh:
            fh.write(line)

    def wrapped(environ, start_response):
        if faults.take("slow_left"):
            time.sleep(faults.slow_s)
        if faults.take("fail_left"):
            status = f"{faults.fail_status} Injected"
            write_log(environ, status)
            start_response(status, [("Content-Type", "text/plain"), ("Content-Length", "8")])
            return [b"injected"]
        if environ["REQUEST_METHOD"] == "PUT":
            if faults.exit_after_bytes is not None:
                environ["wsgi.input"] = _DyingInput(environ["wsgi.input"], faults)
            if faults.truncate_put is not None:
                limit = faults.truncate_put
                environ["wsgi.input"] = _TruncatingInput(environ["wsgi.input"], limit)
                if int(environ.get("CONTENT_LENGTH") or 0) > limit:
                    environ["CONTENT_LENGTH"] = str(limit)

        seen: list[str] = []

        def logging_start(status, headers, exc_info=None):
            write_log(environ, status)
            seen.append(status)
            return start_response(status, headers, exc_info)

        answer = app(environ, logging_start)
        try:
            body = list(answer)
        finally:
            if hasattr(answer, "close"):
                answer.close()
        if (environ["REQUEST_METHOD"] == "PROPFIND" and seen and seen[0].startswith("404")
                and faults.take("made_meanwhile")):
            (root / environ.get("PATH_INFO", "").strip("/")).mkdir(parents=True, exist_ok=True)
        if faults.exit_after == environ["REQUEST_METHOD"]:
            os._exit(3)
        if faults.trickle_method in (None, environ["REQUEST_METHOD"]) and faults.take("trickle_left"):
            return _trickled(body, faults.trickle_s)
        return body

    return wrapped


def serve(args: argparse.Namespace) -> None:
    """Build wsgidav with basic auth over `args.root` and serve it until killed."""
    from cheroot import wsgi
    from wsgidav.wsgidav_app import WsgiDAVApp

    config = {
        "host": "127.0.0.1",
        "port": args.port,
        "provider_mapping": {"/": str(args.root)},
        "simple_dc": {"user_mapping": {"*": {args.user: {"password": args.password}}}},
        "http_authenticator": {
            "accept_basic": True,
            "accept_digest": False,
            "default_to_digest": False,
        },
        "verbose": 0,
        "logging": {"enable": False, "enable_loggers": []},
        "dir_browser": {"enable": False},
    }
    if args.cors:
        config["cors"] = cors_config(args.cors)
    app = fault_layer(WsgiDAVApp(config), _Faults(args), Path(args.log), Path(args.root))
    server = wsgi.Server(("127.0.0.1", args.port), app, numthreads=8)
    if args.cert:
        from cheroot.ssl.builtin import BuiltinSSLAdapter

        server.ssl_adapter = BuiltinSSLAdapter(args.cert, args.key)
    server.prepare()
    print("READY", flush=True)
    server.serve()


def cors_config(origin: str) -> dict[str, object]:
    """wsgidav's `cors` setting that lets the browser build at `origin` sync (the README's example):
    the methods and request headers `mobile_app.sync.fetch` uses; wsgidav answers the preflight
    OPTIONS before it asks for the password."""
    from mobile_app.sync.fetch import ALLOWED_HEADERS, METHODS

    return {"allow_origin": [origin], "allow_methods": [*METHODS, "OPTIONS"],
            "allow_headers": list(ALLOWED_HEADERS), "max_age": 600}


def free_port() -> int:
    """A port on 127.0.0.1 that was free a moment ago."""
    with socket.socket() as sock:
        sock.bind(("127.0.0.1", 0))
        return sock.getsockname()[1]


class DavServer:
    """A wsgidav subprocess on 127.0.0.1 serving `root`, restartable on the same port."""

    def __init__(self, root: Path, log: Path, user: str = "office", password: str = "s3cret-Pw!",
                 tls: tuple[Path, Path] | None = None, cors: str | None = None):
        self.root, self.log, self.user, self.password = root, log, user, password
        self.tls, self.cors = tls, cors
        self.port = free_port()
        self.proc: subprocess.Popen | None = None
        root.mkdir(parents=True, exist_ok=True)

    @property
    def url(self) -> str:
        return f"{'https' if self.tls else 'http'}://127.0.0.1:{self.port}/office/"

    def start(self, *faults: str) -> DavServer:
        """Start the server with optional fault flags and wait until it listens."""
        cmd = [sys.executable, str(HERE), "--root", str(self.root), "--port", str(self.port),
               "--user", self.user, "--password", self.password, "--log", str(self.log), *faults]
        if self.tls:
            cmd += ["--cert", str(self.tls[0]), "--key", str(self.tls[1])]
        if self.cors:
            cmd += ["--cors", self.cors]
        self.proc = subprocess.Popen(cmd, stdout=subprocess.PIPE, text=True)
        assert self.proc.stdout is not None
        line = self.proc.stdout.readline()
        assert line.strip() == "READY", f"server did not start: {line!r}"
        return self

    def stop(self) -> None:
        """Stop the server (if it is still running) and wait for it."""
        if self.proc is not None and self.proc.poll() is None:
            self.proc.terminate()
            self.proc.wait(timeout=10)
        self.proc = None

    def requests(self) -> list[str]:
        """The request log lines so far."""
        return self.log.read_text(encoding="utf-8").splitlines() if self.log.exists() else []


def self_signed_cert(folder: Path) -> tuple[Path, Path]:
    """A self-signed certificate and key for 127.0.0.1 made with the openssl command (P-256)."""
    cert, key = folder / "cert.pem", folder / "key.pem"
    subprocess.run(["openssl", "req", "-x509", "-newkey", "ec", "-pkeyopt",
                    "ec_paramgen_curve:prime256v1", "-nodes", "-keyout", str(key), "-out", str(cert),
                    "-days", "2", "-subj", "/CN=127.0.0.1", "-addext", "subjectAltName=IP:127.0.0.1"],
                   check=True, capture_output=True)
    return cert, key


def make_bundle(parent: Path, name: str, files: dict[str, bytes]) -> Path:
    """Write a small bundle folder: the files, then manifest.json (export format) listing them."""
    folder = parent / name
    folder.mkdir(parents=True)
    listed = {}
    for file_name, data in files.items():
        (folder / file_name).write_bytes(data)
        listed[file_name] = {"sha256": hashlib.sha256(data).hexdigest(), "bytes": len(data)}
    manifest = {"schema": "boardside-bundle", "schema_version": 1, "name": name, "files": listed}
    (folder / "manifest.json").write_text(json.dumps(manifest, indent=1), encoding="utf-8")
    return folder


def tree_hashes(folder: Path) -> dict[str, str]:
    """SHA-256 of every file under `folder`, keyed by its path relative to it (the server's disk)."""
    return {str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(folder.rglob("*")) if p.is_file()}


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("--root", type=Path, required=True)
    parser.add_argument("--port", type=int, required=True)
    parser.add_argument("--user", required=True)
    parser.add_argument("--password", required=True)
    parser.add_argument("--log", required=True)
    parser.add_argument("--fail")
    parser.add_argument("--slow")
    parser.add_argument("--exit-after-bytes", type=int)
    parser.add_argument("--truncate-put", type=int)
    parser.add_argument("--trickle")
    parser.add_argument("--made-meanwhile", action="store_true")
    parser.add_argument("--exit-after")
    parser.add_argument("--cert")
    parser.add_argument("--key")
    parser.add_argument("--cors")
    serve(parser.parse_args())


if __name__ == "__main__":
    main()

