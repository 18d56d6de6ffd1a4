"""Reading a JSON job document from bytes within a size limit and a memory bound.

`parse_document(data)` returns the parsed JSON value or raises DocumentError with one line:

- over `MAX_DOCUMENT_BYTES` (32 MiB; a 500-circuit job is about 4 MB) it is refused before
  anything is read;
- a document far denser in values than any job document (more than one value or container per
  `MIN_BYTES_PER_VALUE` bytes, where an export has one per 20 or so) is refused before parsing,
  since tiny values (`{}`, `[]`, `0`) cost Python 20 to 60 times their bytes;
- text that is not JSON or not UTF-8 (RFC 8259 section 8.1), numbers of thousands of digits,
  nesting deeper than Python's parser goes, NaN and Infinity are refused with a plain message.

Memory: parsing a str and keeping the Python objects costs about 5 times the bytes of an export (the
text is held as a str of 2 bytes a character as soon as one character lies beyond Latin-1, such as
Ω, and every small dict and string carries its own overhead). Two measures bring it under 3 times
(`tests/bench_import.py` prints the figures):

- the bytes are read as Latin-1 (one byte, one character), not decoded as UTF-8: JSON's structure is
  ASCII and UTF-8 never uses a byte below 0x80 inside a multi-byte character, so the structure reads
  the same, and each string holding a byte above 0x7F is put right afterwards (re-encoded as Latin-1
  and decoded as UTF-8, which also refuses bytes that are not UTF-8). A document with `\\u` escapes
  above `\\u007f` (which the Latin-1 reading would mistake) is decoded as UTF-8 instead;
- every key, short string and number is kept once however often it occurs (the field names, units,
  step titles and formulas repeat for every circuit).
"""

from __future__ import annotations

import json
import re
from typing import Any

from mobile_app.store.errors import DocumentError

MAX_DOCUMENT_BYTES = 32 * 1024 * 1024
MIN_BYTES_PER_VALUE = 10
SHARED_TEXT_CHARS = 64
_BOM = b"\xef\xbb\xbf"
_HIGH_ESCAPE = re.compile(rb"\\u(?!00[0-7])")


class _Lean:
    """object_pairs_hook and parse_float for json.loads: strings put right, repeats kept once."""

    def __init__(self, latin1: bool) -> None:
        self.latin1 = latin1
        self.texts: dict[str, str] = {}
        self.numbers: dict[str, float] = {}

    def text(self, value: str) -> str:
        if self.latin1 and not value.isascii():
            value = value.encode("latin-1").decode("utf-8")
        if len(value) <= SHARED_TEXT_CHARS:
            return self.texts.setdefault(value, value)
        return value

    def value(self, value: Any) -> Any:
        kind = type(value)
        if kind is str:
            return self.text(value)
        if kind is list:
            return [self.value(item) for item in value]
        return value

    def number(self, text: str) -> float:
        found = self.numbers.get(text)
        if found is None:
            found = self.numbers[text] = float(text)
        return found

    def __call__(self, pairs: list[tuple[str, Any]]) -> dict[str, Any]:
        return {self.text(key): self.value(value) for key, value in pairs}


def _refuse_constant(name: str) -> float:
    """NaN and Infinity are not JSON: a document holding them did not come from this export."""
    raise DocumentError(f"not valid JSON: {name} is not a JSON number")


def size_problem(size_bytes: int) -> str | None:
    """Why a document of this size is refused, or None."""
    if size_bytes <= MAX_DOCUMENT_BYTES:
        return None
    return (f"the file is {size_bytes / 2**20:.1f} MB; at most {MAX_DOCUMENT_BYTES / 2**20:.0f} MB "
            "can be imported")


def parse_document(data: bytes | str) -> Any:
    """The JSON value in `data` (UTF-8 bytes, or text), read within the limits above."""
    size_bytes = len(data)
    problem = size_problem(size_bytes)
    if problem:
        raise DocumentError(problem)
    marks: tuple[Any, ...] = (",", "{", "[") if isinstance(data, str) else (b",", b"{", b"[")
    values = sum(data.count(mark) for mark in marks)
    if values > max(1000, size_bytes // MIN_BYTES_PER_VALUE):
        raise DocumentError(f"holds {values} values in {size_bytes} bytes, far more than a job document")
    try:
        return _parse(data)
    except RecursionError as error:
        raise DocumentError("not valid JSON: nested too deep") from error
    except (UnicodeDecodeError, json.JSONDecodeError) as error:
        raise DocumentError(f"not valid JSON: {error}") from error
    except ValueError as error:  # a whole number of more digits than Python converts
        raise DocumentError(f"not valid JSON: {error}") from error


def _parse(data: bytes | str) -> Any:
    """json.loads with the lean hooks: Latin-1 reading for UTF-8 bytes where that is safe."""
    if isinstance(data, str):
        text, latin1 = data, False
    elif json.detect_encoding(data) not in ("utf-8", "utf-8-sig"):
        raise DocumentError("not valid JSON: not UTF-8 text (RFC 8259 section 8.1)")
    elif _HIGH_ESCAPE.search(data):
        text, latin1 = data.removeprefix(_BOM).decode("utf-8"), False
    else:
        text, latin1 = data.removeprefix(_BOM).decode("latin-1"), True
    lean = _Lean(latin1)
    return json.loads(text, object_pairs_hook=lean, parse_float=lean.number,
                      parse_constant=_refuse_constant)
