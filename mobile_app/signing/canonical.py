"""The canonical form of a document and its SHA-256: the bytes an approval signs.

Rules (repeated in the export format, EXPORT-FORMAT.md):
- JSON (RFC 8259) with object keys sorted by Unicode code point, recursively;
- no insignificant whitespace: `,` between items and `:` between a key and its value, nothing else;
- strings as UTF-8, not escaped to `\\uXXXX` (only `"`, `\\` and control characters are escaped, as
  JSON requires);
- numbers as Python's `json` module writes them: integers in decimal, floats as the shortest text that
  reads back to the same double (`0.62`, `1e-05`, `2.0`); NaN and infinities are refused;
- `true`, `false`, `null` for booleans and nothing.

It is `json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=False,
allow_nan=False)` encoded as UTF-8, the same in the server and in the browser build (both run CPython).
Unlike RFC 8785 it keeps a float's `.0` and sorts keys by code point rather than UTF-16 unit; a
reader that recomputes the hash elsewhere must follow these rules, not RFC 8785's.
The SHA-256 is FIPS 180-4's, written as 64 lower-case hex digits.
"""

from __future__ import annotations

import hashlib
import json
from typing import Any

from mobile_app.signing.errors import KeyFormatError


def canonical_bytes(value: Any) -> bytes:
    """The canonical JSON of `value` (rules in the module docstring), as UTF-8 bytes.

    Raises KeyFormatError for what JSON cannot hold exactly (NaN, infinity, a key that is not text).
    """
    try:
        text = json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=False, allow_nan=False)
    except (TypeError, ValueError) as error:
        raise KeyFormatError("document", f"has no canonical form ({error})") from error
    return text.encode("utf-8")


def sha256_hex(data: bytes) -> str:
    """SHA-256 of `data` (FIPS 180-4) as 64 lower-case hex digits."""
    return hashlib.sha256(data).hexdigest()


def canonical_hash(value: Any) -> str:
    """SHA-256 of the canonical JSON of `value`, in lower-case hex."""
    return sha256_hex(canonical_bytes(value))


def check_form(data: Any, schema: str, version: int, what: str) -> dict[str, Any]:
    """`data` as a dict of the given `schema` and `schema_version`; KeyFormatError naming `what`."""
    if not isinstance(data, dict) or data.get("schema") != schema:
        raise KeyFormatError(what, f"not a {schema} record")
    if data.get("schema_version") != version:
        raise KeyFormatError(what, f"schema_version {data.get('schema_version')!r} is not read here")
    return data
