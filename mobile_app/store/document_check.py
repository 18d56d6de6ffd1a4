"""Checking a job document before it is imported: a pure function, run before the import's transaction.

`check_job_document(doc)` raises DocumentError naming the first place that is wrong
(`boards[1].circuits[0].fields.zs.raw: must be text, a number or null, not a list`), or returns.
It checks two things:

- limits that hold anywhere in the document: nesting at most `MAX_DEPTH` deep, text at most
  `MAX_TEXT_CHARS` characters, keys text of at most `MAX_KEY_CHARS`, lists of at most `MAX_ITEMS`,
  numbers finite and at most `MAX_NUMBER` in size (no reading, id or assessment figure comes near
  it; SQLite's integers end at 2⁶³ and JSON readers lose whole numbers past 2⁵³);
- the shape the import reads: each key it uses has the type it needs (`SHAPE` below). Keys it does
  not know are allowed (a later version may add some) but still held to the limits.

The walk is iterative, so a document nested thousands deep cannot exhaust Python's stack.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass, field
from typing import Any

from mobile_app.store.errors import DocumentError

MAX_DEPTH = 24
MAX_TEXT_CHARS = 20_000
MAX_KEY_CHARS = 200
MAX_ITEMS = 100_000
MAX_NUMBER = 1e15
_NAMES = {bool: "true or false", int: "a whole number", float: "a number", str: "text",
          list: "a list", dict: "an object", type(None): "null"}


@dataclass(frozen=True)
class Value:
    """A value of one of `kinds` (`int` is a JSON whole number; true and false count only as `bool`)."""

    kinds: tuple[type, ...]
    required: bool = False


@dataclass(frozen=True)
class Obj:
    """An object whose listed keys have these shapes (others allowed); None allowed if `nullable`."""

    keys: dict[str, Any] = field(default_factory=dict)
    required: bool = False
    nullable: bool = False


@dataclass(frozen=True)
class ListOf:
    """A list whose every item has the shape `item`."""

    item: Any
    required: bool = False


@dataclass(frozen=True)
class MapOf:
    """An object whose every value has the shape `value` (keys are names)."""

    value: Any
    required: bool = False


TEXT = (str, type(None))
INT = (int, type(None))
NUMBER = (int, float, type(None))
SCALAR = (str, int, float, bool, type(None))
FIELDS = MapOf(Obj({"raw": Value((str, int, float, type(None))), "value": Value(SCALAR),
                    "error": Value(TEXT)}), required=True)
CIRCUIT = Obj({
    "id": Value(INT), "number": Value(SCALAR), "description": Value(TEXT), "fields": FIELDS,
    "verdict": Value(TEXT), "assessment": Obj(nullable=True), "calc_version": Value(TEXT),
    "assessment_error": Value(TEXT), "updated_at": Value(TEXT), "updated_by": Value(INT),
})
BOARD = Obj({
    "id": Value(INT), "designation": Value(TEXT), "location": Value(TEXT),
    "supplied_from": Value(TEXT), "fields": FIELDS, "circuits": ListOf(CIRCUIT),
})
JOB = Obj({
    "id": Value(INT), "revision": Value(INT), "status": Value(TEXT), "parent_job_id": Value(INT),
    "revision_reason": Value(TEXT), "fields": FIELDS,
    **{name: Value(TEXT) for name in ("client_ref", "site_address", "description", "date", "system",
                                      "recorded_by", "recorded_at", "submitted_by", "submitted_at",
                                      "approved_by", "approved_at", "review_comment")},
    "overall": Obj({"outcome": Value(TEXT), "reasons": ListOf(Value((str,)))}, nullable=True),
    "approval_reasons": ListOf(Obj({"item": Value(TEXT), "what": Value(TEXT), "reason": Value(TEXT)})),
}, required=True)
ITEM = {"id": Value(INT), "number": Value(INT), "fields": FIELDS, "updated_at": Value(TEXT)}
OBSERVATION = Obj({**ITEM, "circuit_ids": ListOf(Value((int,))), "circuits": ListOf(Value((str,)))})
SHAPE = Obj({
    "schema": Value((str,), required=True),
    "schema_version": Value((int,), required=True),
    "calc_version": Value(TEXT),
    "exported_at": Value(TEXT),
    "cautions": ListOf(Value((str,))),
    "job": JOB,
    "boards": ListOf(BOARD, required=True),
    "instruments": ListOf(Obj(ITEM)),
    "observations": ListOf(OBSERVATION),
    "library_devices": ListOf(Obj({
        "id": Value((int,), required=True), "name": Value((str,), required=True),
        "rating_a": Value(NUMBER), "points": ListOf(ListOf(Value((int, float))), required=True),
    })),
    "people": ListOf(Obj({"id": Value((int,), required=True), "name": Value((str,), required=True),
                          "role": Value((str,), required=True)})),
    "audit": ListOf(Obj({
        "id": Value(INT), "when": Value((str,), required=True), "person_id": Value(INT),
        "who": Value(TEXT), "entity": Value((str,), required=True), "entity_id": Value(INT),
        "field": Value(TEXT), "old": Value(TEXT), "new": Value(TEXT),
    })),
})


def check_job_document(doc: Any) -> None:
    """Raise DocumentError at the first place where `doc` breaks a limit or the shape the import
    reads (see the module's docstring); return if it has none."""
    check_limits(doc)
    _check_shape(doc, SHAPE, ())


def check_limits(doc: Any) -> None:
    """The limits that hold anywhere in a document, checked without recursion."""
    stack: list[tuple[Any, int, tuple[Any, ...]]] = [(doc, 0, ())]
    while stack:
        value, depth, where = stack.pop()
        if isinstance(value, dict | list):
            if depth >= MAX_DEPTH:
                raise DocumentError(f"nested deeper than {MAX_DEPTH} levels", _where(where))
            if len(value) > MAX_ITEMS:
                raise DocumentError(f"holds more than {MAX_ITEMS} items", _where(where))
            stack.extend((item, depth + 1, (where, key)) for key, item in _children(value, where))
        else:
            _check_scalar(value, where)


def _children(value: dict[Any, Any] | list[Any], where: tuple[Any, ...]) -> Iterator[tuple[Any, Any]]:
    """(key or index, item) of an object or a list; keys checked."""
    if isinstance(value, list):
        yield from enumerate(value)
        return
    for key, item in value.items():
        if not isinstance(key, str) or len(key) > MAX_KEY_CHARS:
            raise DocumentError(f"has a key that is not a name of at most {MAX_KEY_CHARS} characters",
                                _where(where))
        yield key, item


def _check_scalar(value: Any, where: tuple[Any, ...]) -> None:
    """Text within its length, numbers finite and within MAX_NUMBER, or true/false/null."""
    if isinstance(value, str):
        if len(value) > MAX_TEXT_CHARS:
            raise DocumentError(f"is text longer than {MAX_TEXT_CHARS} characters", _where(where))
        if not value.isascii():
            try:
                value.encode("utf-8")
            except UnicodeEncodeError as error:
                raise DocumentError("is text with a broken character (a lone surrogate)",
                                    _where(where)) from error
    elif isinstance(value, bool) or value is None:
        return
    elif isinstance(value, int | float):
        if not math.isfinite(value) or abs(value) > MAX_NUMBER:
            raise DocumentError(f"is a number beyond ±{MAX_NUMBER:.0e}", _where(where))
    else:
        raise DocumentError(f"is not a JSON value ({type(value).__name__})", _where(where))


def _check_shape(value: Any, shape: Any, where: tuple[Any, ...]) -> None:
    """`value` against its shape (the shapes nest a few levels only, so recursion is bounded)."""
    if isinstance(shape, Value):
        if not _is(value, shape.kinds):
            raise DocumentError(_wrong(value, shape.kinds), _where(where))
    elif isinstance(shape, Obj):
        if value is None and shape.nullable:
            return
        if not isinstance(value, dict):
            kinds = (dict, type(None)) if shape.nullable else (dict,)
            raise DocumentError(_wrong(value, kinds), _where(where))
        for key, inner in shape.keys.items():
            if key in value:
                _check_shape(value[key], inner, (where, key))
            elif inner.required:
                raise DocumentError("is missing", _where((where, key)))
    elif isinstance(shape, ListOf):
        if not isinstance(value, list):
            raise DocumentError(_wrong(value, (list,)), _where(where))
        for index, item in enumerate(value):
            _check_shape(item, shape.item, (where, index))
    elif isinstance(shape, MapOf):
        if not isinstance(value, dict):
            raise DocumentError(_wrong(value, (dict,)), _where(where))
        for key, item in value.items():
            _check_shape(item, shape.value, (where, key))


def _is(value: Any, kinds: tuple[type, ...]) -> bool:
    """True if `value` is of one of `kinds`; true and false are not numbers here."""
    if isinstance(value, bool):
        return bool in kinds
    return isinstance(value, kinds)


def _wrong(value: Any, kinds: tuple[type, ...]) -> str:
    """`must be text or null, not a list`."""
    wanted = [_NAMES[kind] for kind in kinds if not (kind is int and float in kinds)]
    said = wanted[0] if len(wanted) == 1 else ", ".join(wanted[:-1]) + " or " + wanted[-1]
    return f"must be {said}, not {_NAMES.get(type(value), type(value).__name__)}"


def _where(where: tuple[Any, ...]) -> str:
    """`boards[1].circuits[0].fields.zs` from the linked (parent, key) pairs; `the document` at the top."""
    parts: list[str] = []
    while where:
        where, key = where
        parts.append(f"[{key}]" if isinstance(key, int) else f".{key}")
    text = "".join(reversed(parts)).lstrip(".")
    return text or "the document"
