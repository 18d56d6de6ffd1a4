"""What the parts share about the job, board and circuit rows: each field's three columns (as typed,
parsed, error), parsing a typed field, and the row-version check."""

from __future__ import annotations

from typing import Any

from mobile_app.store.errors import ConflictError, UnknownFieldError
from mobile_app.store.fields import (
    BOARD_FIELDS,
    CIRCUIT_FIELDS,
    INSTRUMENT_FIELDS,
    JOB_FIELDS,
    OBSERVATION_FIELDS,
    Parsed,
    parse_field,
)
from mobile_app.store.library import Library

NAMES = {
    "job": JOB_FIELDS,
    "board": BOARD_FIELDS,
    "circuit": CIRCUIT_FIELDS,
    "instrument": INSTRUMENT_FIELDS,
    "observation": OBSERVATION_FIELDS,
}


def as_text(raw: object) -> str:
    """What was typed, as text (None becomes blank)."""
    return "" if raw is None else str(raw)


def parse(kind: str, name: str, raw: object, library: Library) -> Parsed:
    """Parse a field of `kind`, checking its name; library references must exist."""
    if name not in NAMES[kind]:
        raise UnknownFieldError(kind, name)
    parsed = parse_field(kind, name, as_text(raw))
    if name == "library_device_id" and parsed.value is not None:
        if library.find(int(parsed.value)) is None:
            return Parsed(parsed.raw, None, f"no device with id {parsed.value} in the library")
    return parsed


def check_version(kind: str, row: dict[str, Any], expected_version: int | None) -> None:
    """ConflictError when the caller's row version is stale."""
    if expected_version is not None and expected_version != row["version"]:
        raise ConflictError(kind, row["id"], expected_version, row["version"])


def fields_of(row: dict[str, Any], names: tuple[str, ...]) -> dict[str, dict[str, Any]]:
    """The {"raw", "value", "error"} triple of each named field of a row."""
    return {
        n: {"raw": row[f"{n}_raw"], "value": row[f"{n}_value"], "error": row[f"{n}_error"]} for n in names
    }


def triples(names: tuple[str, ...], parsed: list[Parsed]) -> dict[str, Any]:
    """Row columns `<name>_raw`, `<name>_value`, `<name>_error` for parsed fields."""
    row: dict[str, Any] = {}
    for name, field in zip(names, parsed, strict=True):
        row.update({f"{name}_raw": field.raw, f"{name}_value": field.value, f"{name}_error": field.error})
    return row


def set_clause(names: tuple[str, ...]) -> str:
    """`a_raw = ?, a_value = ?, a_error = ?, …` for the named fields."""
    return ", ".join(f"{n}_raw = ?, {n}_value = ?, {n}_error = ?" for n in names)


def saved(parsed: Parsed, name: str, version: int) -> dict[str, Any]:
    """What a field save returns: the field, as typed, parsed, its error and the row's version."""
    return {
        "field": name,
        "raw": parsed.raw,
        "value": parsed.value,
        "error": parsed.error,
        "version": version,
    }
