"""The server form's transport: webdav4 over httpx, with a deadline on every read and write.

`WebDavTransport(target)` implements `mobile_app.sync.transport.Transport`. httpx's timeouts hold for
one read or write at a time, so a server that answers a byte every half second never trips them;
here every socket wait is cut to what is left before the deadline (`set_deadline`) through an
httpcore network backend, so a request ends at the deadline whatever the server does. Errors from
httpx and webdav4 are turned into the typed errors of `mobile_app.sync.target` with plain messages.
Only this module imports httpx and webdav4; the runner never does.
"""

from __future__ import annotations

import contextlib
import ssl
from collections.abc import Iterable, Iterator
from typing import Any

import httpcore
import httpx
from webdav4 import client as dav
from webdav4.http import Client as HTTPClient

from mobile_app.sync.target import (
    AuthError,
    CertificateError,
    DroppedError,
    OfflineError,
    ProtocolError,
    ServerError,
    SlowServerError,
    StorageFullError,
    SyncError,
    SyncTarget,
    TimeLimitError,
    check_done,
    check_url,
    parse_file_names,
    parse_is_collection,
    status_error,
)
from mobile_app.sync.transport import remaining_s

PROPFIND_BODY = (b'<?xml version="1.0" encoding="utf-8"?>'
                 b'<d:propfind xmlns:d="DAV:"><d:prop><d:resourcetype/></d:prop></d:propfind>')
WRITE_SLICE_BYTES = 16 * 1024
READ_BLOCK_BYTES = 64 * 1024


class Deadline:
    """The time (time.monotonic) at which every network wait ends, shared by the streams."""

    def __init__(self) -> None:
        self.at_s: float | None = None

    def wait_s(self, timeout_s: float | None, timeout_error: type[Exception]) -> float | None:
        """`timeout_s` cut to the time left; `timeout_error` (an httpcore timeout) once it is past."""
        try:
            return remaining_s(self.at_s, timeout_s)
        except TimeLimitError as exc:
            raise timeout_error(str(exc)) from exc

    @property
    def passed(self) -> bool:
        try:
            remaining_s(self.at_s)
        except TimeLimitError:
            return True
        return False


class DeadlineStream(httpcore.NetworkStream):
    """A socket stream whose every read and write waits at most until the deadline."""

    def __init__(self, inner: httpcore.NetworkStream, deadline: Deadline) -> None:
        self.inner, self.deadline = inner, deadline

    def read(self, max_bytes: int, timeout: float | None = None) -> bytes:
        return self.inner.read(max_bytes, self.deadline.wait_s(timeout, httpcore.ReadTimeout))

    def write(self, buffer: bytes, timeout: float | None = None) -> None:
        for start in range(0, len(buffer), WRITE_SLICE_BYTES):
            self.inner.write(buffer[start:start + WRITE_SLICE_BYTES],
                             self.deadline.wait_s(timeout, httpcore.WriteTimeout))

    def close(self) -> None:
        self.inner.close()

    def start_tls(self, ssl_context: ssl.SSLContext, server_hostname: str | None = None,
                  timeout: float | None = None) -> httpcore.NetworkStream:
        wait_s = self.deadline.wait_s(timeout, httpcore.ConnectTimeout)
        return DeadlineStream(self.inner.start_tls(ssl_context, server_hostname, wait_s), self.deadline)

    def get_extra_info(self, info: str) -> Any:
        return self.inner.get_extra_info(info)


class DeadlineBackend(httpcore.NetworkBackend):
    """httpcore's own socket backend with the deadline on connecting and on every stream."""

    def __init__(self, deadline: Deadline) -> None:
        self.inner, self.deadline = httpcore.SyncBackend(), deadline

    def connect_tcp(self, host: str, port: int, timeout: float | None = None,
                    local_address: str | None = None,
                    socket_options: Iterable[Any] | None = None) -> httpcore.NetworkStream:
        wait_s = self.deadline.wait_s(timeout, httpcore.ConnectTimeout)
        stream = self.inner.connect_tcp(host, port, wait_s, local_address, socket_options)
        return DeadlineStream(stream, self.deadline)

    def connect_unix_socket(self, path: str, timeout: float | None = None,
                            socket_options: Iterable[Any] | None = None) -> httpcore.NetworkStream:
        raise httpcore.UnsupportedProtocol("the office folder is reached over TCP only")

    def sleep(self, seconds: float) -> None:
        self.inner.sleep(seconds)


@contextlib.contextmanager
def _as_httpx() -> Iterator[None]:
    """httpcore's errors as httpx's errors of the same name (what webdav4 and `classify` know)."""
    try:
        yield
    except httpcore.TimeoutException as exc:
        raise getattr(httpx, type(exc).__name__, httpx.TimeoutException)(str(exc)) from exc
    except (httpcore.NetworkError, httpcore.ProtocolError, httpcore.UnsupportedProtocol) as exc:
        raise getattr(httpx, type(exc).__name__, httpx.TransportError)(str(exc)) from exc


class _Body(httpx.SyncByteStream):
    """A response body from httpcore, its errors mapped as httpx maps them."""

    def __init__(self, stream: Iterable[bytes]) -> None:
        self.stream = stream

    def __iter__(self) -> Iterator[bytes]:
        with _as_httpx():
            yield from self.stream

    def close(self) -> None:
        closer = getattr(self.stream, "close", None)
        if closer is not None:
            closer()


class DeadlineHTTPTransport(httpx.BaseTransport):
    """An httpx transport over an httpcore connection pool that uses the deadline backend."""

    def __init__(self, ssl_context: ssl.SSLContext, deadline: Deadline) -> None:
        self.pool = httpcore.ConnectionPool(ssl_context=ssl_context, max_connections=4,
                                            network_backend=DeadlineBackend(deadline))

    def handle_request(self, request: httpx.Request) -> httpx.Response:
        core_request = httpcore.Request(
            method=request.method,
            url=httpcore.URL(scheme=request.url.raw_scheme, host=request.url.raw_host,
                             port=request.url.port, target=request.url.raw_path),
            headers=request.headers.raw, content=request.stream, extensions=request.extensions)
        with _as_httpx():
            response = self.pool.handle_request(core_request)
        return httpx.Response(status_code=response.status, headers=response.headers,
                              stream=_Body(response.stream), extensions=response.extensions)

    def close(self) -> None:
        self.pool.close()


def classify(exc: Exception, deadline_passed: bool = False) -> SyncError:
    """Turn an httpx or webdav4 error into a typed SyncError with a plain message (no URL)."""
    if isinstance(exc, SyncError):
        return exc
    if isinstance(exc, httpx.ConnectError) and _caused_by_ssl(exc):
        return CertificateError("the office server's https certificate could not be verified; "
                                "if the office uses its own authority, set its certificate file")
    if isinstance(exc, httpx.TimeoutException) and deadline_passed:
        return TimeLimitError("the office folder was too slow: the sync reached its time limit")
    if isinstance(exc, httpx.ConnectTimeout | httpx.ConnectError):
        return OfflineError("the office folder did not answer (no connection or server down)")
    if isinstance(exc, httpx.TimeoutException):
        return SlowServerError("the office folder was too slow to answer (timed out)")
    if isinstance(exc, httpx.HTTPError):
        return DroppedError("the connection to the office folder broke during the transfer")
    if isinstance(exc, dav.InsufficientStorage):
        return StorageFullError("the office folder is full (HTTP 507)")
    if isinstance(exc, dav.BadGatewayError):
        return ServerError("the office server failed (HTTP 502)")
    if isinstance(exc, dav.HTTPError):
        return status_error(exc.status_code)
    if isinstance(exc, dav.ForbiddenOperation):
        return AuthError("the office folder does not let this user create folders (HTTP 403)")
    if isinstance(exc, dav.ResourceConflict):
        return ProtocolError("the office folder's parent does not exist on the server (HTTP 409)")
    if isinstance(exc, dav.ClientError):
        return ProtocolError(f"the office folder gave an unexpected answer ({type(exc).__name__})")
    return ProtocolError(f"unexpected problem while sending ({type(exc).__name__})")


def _caused_by_ssl(exc: BaseException) -> bool:
    """True if an ssl.SSLError is among the causes of `exc`."""
    seen: BaseException | None = exc
    while seen is not None:
        if isinstance(seen, ssl.SSLError):
            return True
        seen = seen.__cause__ or seen.__context__
    return False


class WebDavTransport:
    """The office folder through webdav4 over httpx (see `Transport` for each method)."""

    def __init__(self, target: SyncTarget) -> None:
        self.target = target
        self.url = check_url(target.url)
        self.deadline = Deadline()
        context = (ssl.create_default_context(cafile=target.ca_file) if target.ca_file
                   else httpx.create_ssl_context())
        http = HTTPClient(
            base_url=self.url,
            auth=(target.user, target.password) if target.user else None,
            timeout=httpx.Timeout(target.timeout_s, connect=min(target.timeout_s, 10.0)),
            follow_redirects=False, trust_env=False,
            transport=DeadlineHTTPTransport(context, self.deadline))
        self.client = dav.Client(self.url, http_client=http, retry=False)

    def set_deadline(self, at_s: float | None) -> None:
        self.deadline.at_s = at_s

    def _url(self, path: str) -> httpx.URL:
        """The URL of a path below the office folder (a folder's with its trailing `/`)."""
        if not path:
            return httpx.URL(self.url)
        return self.client.join_url(path, add_trailing_slash=path.endswith("/"))

    def close(self) -> None:
        self.client.http.close()

    @contextlib.contextmanager
    def _typed(self) -> Iterator[None]:
        """Every error inside as a typed SyncError."""
        try:
            yield
        except SyncError:
            raise
        except Exception as exc:  # noqa: BLE001 - every failure is classified
            raise classify(exc, self.deadline.passed) from exc

    def kind(self, path: str) -> str | None:
        with self._typed():
            response = self.client.http.request(
                "PROPFIND", self._url(path), content=PROPFIND_BODY,
                headers={"Depth": "0", "Content-Type": "application/xml; charset=utf-8"})
            if response.status_code == 404:
                return None
            if response.status_code != 207:
                raise status_error(response.status_code) if response.status_code >= 300 else \
                    ProtocolError("the office address is not a WebDAV folder (no multistatus)")
            return "folder" if parse_is_collection(response.read()) else "file"

    def files(self, path: str) -> list[str]:
        with self._typed():
            response = self.client.http.request(
                "PROPFIND", self._url(path), content=PROPFIND_BODY,
                headers={"Depth": "1", "Content-Type": "application/xml; charset=utf-8"})
            if response.status_code == 404:
                return []
            if response.status_code != 207:
                raise status_error(response.status_code) if response.status_code >= 300 else \
                    ProtocolError("the office address is not a WebDAV folder (no multistatus)")
            return parse_file_names(response.read())

    def make_folder(self, path: str) -> bool:
        with self._typed():
            try:
                self.client.mkdir(path)
            except dav.ResourceAlreadyExists:
                return False
            return True

    def put(self, path: str, data: bytes) -> None:
        with self._typed():
            response = self.client.http.put(self._url(path), content=data)
            if response.status_code >= 300:
                raise status_error(response.status_code)

    def get(self, path: str, max_bytes: int) -> bytes | None:
        with self._typed(), self.client.http.stream("GET", self._url(path)) as response:
            if response.status_code == 404:
                return None
            if response.status_code != 200:
                raise status_error(response.status_code)
            kept, size = [], 0
            for chunk in response.iter_bytes(READ_BLOCK_BYTES):
                kept.append(chunk)
                size += len(chunk)
                if size > max_bytes:
                    break
            return b"".join(kept)[: max_bytes + 1]

    def move(self, source: str, destination: str, overwrite: bool = False) -> bool:
        with self._typed():
            response = self.client.http.request("MOVE", self._url(source), headers={
                "Destination": str(self._url(destination)), "Overwrite": "T" if overwrite else "F"})
            if response.status_code == 412:
                return False
            check_done(response.status_code)
            return True

    def delete(self, path: str) -> bool:
        with self._typed():
            response = self.client.http.request("DELETE", self._url(path))
            if response.status_code == 404:
                return False
            check_done(response.status_code)
            return True
