"""Sending export bundles to the office's WebDAV folder: the outbox on the device and the sync.

Public surface:

    from mobile_app.sync import Outbox, sync_store
    outbox = Outbox(store.db)          # the outbox table in the store's database; takes the store's lock
    outbox.enqueue(bundle_dir, job_id, revision) -> id ; waiting() ; sent() ; due(now, force) ;
    get(id) ; next_try_at() ; mark_sent(id, now, sent_to) ; mark_failed(id, message, kind, next_try_at) ;
    last_error()
    outbox.queue_export(bundle_dir, job_id, revision) -> Queued(id, replaced)   # a newer export of
                                       # the same job and revision replaces one still waiting
    SyncTarget(url, user, password, timeout_s=30, ca_file=None)
    save_target(store, url, user, password) ; load_target(store) -> SyncTarget
    check_url(url) ; scrub(text, target)
    save_password(store, pw) ; load_password(store) -> str   # sealed in the settings with a device
                                       # key kept apart: KeyStore, FileKeyStore (file `device-key`);
                                       # use_key_store(ks) installs a platform's own (the browser's)
    sync_once(store_or_db, transport, now=None, force=False, progress=None, limits=None) -> SyncReport
                                       # transport: a Transport, or a SyncTarget for the platform's own
    sync_store(store, force=False, progress=None) -> SyncReport      # with the saved target
    await sync_once_async(store_or_db, async_transport_or_target, ...) ; await sync_store_async(store,
                                       force=False, progress=None)   # the same run as coroutines
    SyncLimits(run_s=600, bundle_s=180) ; SyncLimits.of(store)        # settings sync_run_limit_s,
                                       # sync_bundle_limit_s: time limits measured from the start
    SyncReport: sent, waiting, error, error_kind, probed, next_try_at, busy (another run holds the
                store's lease), stopped_at_limit, cleaned (leftover uploads deleted)
    Transport                          # the seam: set_deadline, kind, make_folder, put, get, move,
                                       # delete, close (see `transport`)
    AsyncTransport                     # the same requests as coroutines (the runner's own seam)
    open_transport(target) -> Transport ; WebDavTransport(target)    # webdav4 over httpx
    open_async_transport(target) -> AsyncTransport ; use_async_transport(opener)   # the platform's
    FetchTransport(target, fetcher)    # WebDAV over a fetch function (the browser's, in the static build)
    SyncTask(data_dir, on_report=None).start() / .wake() / .stop()   # background thread, server form

Errors: OutboxError with BundleError and UnknownBundleError (the outbox); SyncError with
NotConfiguredError (and its SecretError: a saved password this device cannot open),
InsecureTargetError, OfflineError, DroppedError, SlowServerError (and its TimeLimitError), AuthError,
ServerError, StorageFullError, ProtocolError, CertificateError and VerifyError (the sync; `kind`
picks the backoff). Neither is a StoreError. `python -m mobile_app sync`
is `mobile_app.sync.cli.cli_sync`.

Modules: `outbox` (the table, no network), `target` (the office folder, its address rules, the
errors), `saved` (the office folder saved on the device, the password sealed with a key kept apart),
`seal` (the seal, HMAC-SHA256 only), `transport` (the seam), `runner` (one run: limits, backoff),
`send` (one bundle: temporary folder, verify, MOVE), `lease` (one run at a time per store, a row in
the database), `connect` (the platform's transport), `webdav` (webdav4 over httpx, the only module
importing a network library), `fetch` (WebDAV over a fetch function: the browser build's transport),
`schedule` (the awaited sync that runs when something is due, without threads), `task` (the
background thread of the server form), `cli`. Imports point to the export
names and the store only. A name is imported from its module when first used, so the outbox and the
runner can be loaded without httpx or webdav4.
"""

from __future__ import annotations

import importlib
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from mobile_app.sync.connect import open_async_transport, open_transport, use_async_transport
    from mobile_app.sync.fetch import FetchTransport
    from mobile_app.sync.outbox import (
        BundleError,
        Outbox,
        OutboxError,
        Queued,
        UnknownBundleError,
    )
    from mobile_app.sync.runner import (
        SyncLimits,
        SyncReport,
        sync_once,
        sync_once_async,
        sync_store,
        sync_store_async,
    )
    from mobile_app.sync.saved import (
        FileKeyStore,
        KeyStore,
        load_password,
        load_target,
        save_password,
        save_target,
        use_key_store,
    )
    from mobile_app.sync.target import (
        AuthError,
        CertificateError,
        DroppedError,
        InsecureTargetError,
        NotConfiguredError,
        OfflineError,
        ProtocolError,
        ServerError,
        SlowServerError,
        StorageFullError,
        SyncError,
        SyncTarget,
        TimeLimitError,
        VerifyError,
        check_url,
        scrub,
    )
    from mobile_app.sync.task import SyncTask
    from mobile_app.sync.transport import AsyncTransport, Transport
    from mobile_app.sync.webdav import WebDavTransport

_MODULE_OF = {
    "Outbox": "outbox",
    "OutboxError": "outbox",
    "Queued": "outbox",
    "BundleError": "outbox",
    "UnknownBundleError": "outbox",
    "SyncLimits": "runner",
    "SyncReport": "runner",
    "open_transport": "connect",
    "open_async_transport": "connect",
    "use_async_transport": "connect",
    "FetchTransport": "fetch",
    "Transport": "transport",
    "AsyncTransport": "transport",
    "sync_once_async": "runner",
    "sync_store_async": "runner",
    "WebDavTransport": "webdav",
    "TimeLimitError": "target",
    "SyncTask": "task",
    "sync_once": "runner",
    "sync_store": "runner",
    "SyncTarget": "target",
    "check_url": "target",
    "load_password": "saved",
    "load_target": "saved",
    "save_password": "saved",
    "save_target": "saved",
    "use_key_store": "saved",
    "scrub": "target",
    "SyncError": "target",
    "SecretError": "target",
    "KeyStore": "saved",
    "FileKeyStore": "saved",
    "AuthError": "target",
    "CertificateError": "target",
    "DroppedError": "target",
    "InsecureTargetError": "target",
    "NotConfiguredError": "target",
    "OfflineError": "target",
    "ProtocolError": "target",
    "ServerError": "target",
    "SlowServerError": "target",
    "StorageFullError": "target",
    "VerifyError": "target",
}

__all__ = [
    "AsyncTransport",
    "AuthError",
    "BundleError",
    "CertificateError",
    "DroppedError",
    "FetchTransport",
    "FileKeyStore",
    "InsecureTargetError",
    "KeyStore",
    "NotConfiguredError",
    "OfflineError",
    "Outbox",
    "OutboxError",
    "ProtocolError",
    "Queued",
    "SecretError",
    "ServerError",
    "SlowServerError",
    "StorageFullError",
    "SyncError",
    "SyncLimits",
    "SyncReport",
    "SyncTarget",
    "SyncTask",
    "TimeLimitError",
    "Transport",
    "UnknownBundleError",
    "VerifyError",
    "WebDavTransport",
    "check_url",
    "load_password",
    "load_target",
    "open_async_transport",
    "open_transport",
    "save_password",
    "save_target",
    "scrub",
    "sync_once",
    "sync_once_async",
    "sync_store",
    "sync_store_async",
    "use_async_transport",
    "use_key_store",
]


def __getattr__(name: str) -> Any:
    """A public name, imported from its module on first use."""
    if name not in _MODULE_OF:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    return getattr(importlib.import_module(f"{__name__}.{_MODULE_OF[name]}"), name)


def __dir__() -> list[str]:
    return sorted(__all__)
