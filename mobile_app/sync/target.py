"""The office's WebDAV folder as configured on the device: address rules, credentials, errors.

The address must be https, or http to a loopback address only (127.0.0.0/8, ::1, localhost); it is
checked before any traffic. Settings `sync_url`, `sync_user` and, for an office with its own
certificate authority, `sync_ca_file` (a PEM file) live in the store, the password only sealed with
a device key kept apart (`mobile_app.sync.saved`); it never appears in an export, a log or an error
message (`scrub` removes it from any text). The typed errors below are what every
transport raises (`mobile_app.sync.webdav` turns httpx's and webdav4's into them); the server's XML is
parsed safely here. No network library is imported here.
"""

from __future__ import annotations

import base64
import ipaddress
import xml.etree.ElementTree as ET
from dataclasses import dataclass, field
from urllib.parse import quote, unquote, urlsplit

MAX_XML_BYTES = 1 << 20


class SyncError(Exception):
    """Base of every error the sync raises on purpose; `kind` picks the backoff."""

    kind = "protocol"


class NotConfiguredError(SyncError, LookupError):
    """No office folder is set on this device (setting `sync_url`)."""


class SecretError(NotConfiguredError):
    """The saved sync password cannot be opened here (its device key is missing or another one, or
    the sealed text was changed): it must be entered again in the sync settings."""

    def __init__(self, problem: str) -> None:
        super().__init__(problem)
        self.problem = problem

    def __str__(self) -> str:
        return f"the saved sync password cannot be read: {self.problem}; enter it again in the sync settings"


class InsecureTargetError(SyncError, ValueError):
    """The office folder's address is refused: not https (plain http only to loopback) or bad."""


class OfflineError(SyncError, ConnectionError):
    """The office folder did not answer: no connection, or the server is down."""

    kind = "offline"


class DroppedError(SyncError, ConnectionError):
    """The connection broke during a transfer; the partial upload is overwritten next time."""

    kind = "dropped"


class SlowServerError(SyncError, TimeoutError):
    """The office folder did not answer in time."""

    kind = "timeout"


class TimeLimitError(SlowServerError):
    """The sync reached its time limit (per bundle or per run) before the office folder finished."""


class AuthError(SyncError, PermissionError):
    """The office folder refused the user name or password (HTTP 401 or 403)."""

    kind = "auth"


class ServerError(SyncError, RuntimeError):
    """The office server failed (HTTP 5xx)."""

    kind = "server"


class StorageFullError(ServerError):
    """The office server has no room left (HTTP 507)."""

    kind = "storage"


class ProtocolError(SyncError, ValueError):
    """The server's answer was not what a WebDAV folder gives."""


class CertificateError(SyncError, ConnectionError):
    """The office server's https certificate could not be verified."""

    kind = "certificate"


class VerifyError(SyncError, ValueError):
    """A file read back from the server differs from the one sent; it is sent again."""

    kind = "verify"


@dataclass(frozen=True)
class SyncTarget:
    """The office's WebDAV folder and its credentials (the password is never shown in a repr)."""

    url: str
    user: str
    password: str = field(repr=False)
    timeout_s: float = 30.0
    ca_file: str | None = None  # PEM file of the office's own certificate authority, if any


def is_loopback_host(host: str) -> bool:
    """True for localhost, 127.0.0.0/8 and ::1 (also as an IPv4-mapped address)."""
    if host.lower() == "localhost":
        return True
    try:
        address = ipaddress.ip_address(host)
    except ValueError:
        return False
    mapped = getattr(address, "ipv4_mapped", None)
    return address.is_loopback or bool(mapped and mapped.is_loopback)


def check_url(url: str) -> str:
    """The folder URL, checked and ending in `/`; raises InsecureTargetError before any traffic."""
    try:
        parts = urlsplit(url.strip())
        host = parts.hostname or ""
        parts.port  # noqa: B018 - raises ValueError for a bad port
    except ValueError as exc:
        raise InsecureTargetError("the office folder address is not a valid URL") from exc
    if parts.username is not None or parts.password is not None:
        raise InsecureTargetError(
            "put the user name and password in the sync settings, not in the address")
    if not host:
        raise InsecureTargetError("the office folder address has no server name")
    if parts.scheme == "http" and not is_loopback_host(host):
        raise InsecureTargetError(
            f"plain http is refused for {host}: use https (http is allowed only to this device)")
    if parts.scheme not in ("http", "https"):
        raise InsecureTargetError("the office folder address must start with https://")
    if parts.query or parts.fragment:
        raise InsecureTargetError("the office folder address must not have ? or # parts")
    return url.strip() if url.strip().endswith("/") else url.strip() + "/"


def scrub(text: str, target: SyncTarget) -> str:
    """`text` with the password (plain, URL-quoted, or inside a Basic auth value) replaced by ***."""
    secrets = {target.password, quote(target.password, safe=""),
               base64.b64encode(f"{target.user}:{target.password}".encode()).decode()}
    for secret in sorted((s for s in secrets if s), key=len, reverse=True):
        text = text.replace(secret, "***")
    return text


def status_error(status: int) -> SyncError:
    """The typed error for an HTTP status that is not a success."""
    if status in (401, 403):
        return AuthError(f"the office folder refused the user name or password (HTTP {status}); "
                         "check them in the sync settings")
    if status == 507:
        return StorageFullError("the office folder is full (HTTP 507)")
    if status >= 500:
        return ServerError(f"the office server failed (HTTP {status})")
    if 300 <= status < 400:
        return ProtocolError(f"the office folder redirects elsewhere (HTTP {status}): "
                             "check its address (redirects are not followed)")
    return ProtocolError(f"the office folder answered HTTP {status}")


def check_done(status: int) -> None:
    """Raise for a MOVE or DELETE that did not fully happen (207: some members failed)."""
    if status == 207:
        raise ProtocolError("the office folder did only part of a move or delete (HTTP 207)")
    if status >= 300:
        raise status_error(status)


def parse_is_collection(body: bytes) -> bool:
    """True if a PROPFIND multistatus says the resource is a collection.

    Parsed safely: at most 1 MiB, and any DTD or entity declaration is refused before parsing.
    """
    first = _multistatus(body).find("{DAV:}response")
    return first is not None and first.find(".//{DAV:}resourcetype/{DAV:}collection") is not None


def parse_file_names(body: bytes) -> list[str]:
    """The names of the files (not folders) a PROPFIND Depth 1 multistatus lists (RFC 4918 9.1), each
    the last segment of its href, percent-decoded; parsed as safely as `parse_is_collection`."""
    names = []
    for response in _multistatus(body).findall("{DAV:}response"):
        href = (response.findtext("{DAV:}href") or "").strip()
        if response.find(".//{DAV:}resourcetype/{DAV:}collection") is None and href \
                and not href.endswith("/"):
            names.append(unquote(href.rsplit("/", 1)[-1]))
    return sorted(names)


def _multistatus(body: bytes) -> ET.Element:
    """The root of a WebDAV multistatus: at most 1 MiB, no DTD or entity declarations."""
    if len(body) > MAX_XML_BYTES:
        raise ProtocolError("the office folder's answer is too large")
    lowered = body.lower()
    if b"<!doctype" in lowered or b"<!entity" in lowered:
        raise ProtocolError("the office folder's answer declares entities; refused")
    try:
        root = ET.fromstring(body)
    except ET.ParseError as exc:
        raise ProtocolError("the office folder's answer is not valid WebDAV XML") from exc
    if root.tag != "{DAV:}multistatus":
        raise ProtocolError("the office folder's answer is not a WebDAV multistatus")
    return root
