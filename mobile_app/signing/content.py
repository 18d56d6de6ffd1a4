"""What an approval covers in a job document: every reading, every outcome, the people and times.

The document (EXPORT-FORMAT.md, "boardside-job") is cut into parts, each hashed on its own with
`canonical_hash`, so that a check can say which part changed:

- `job`: the job's fields, revision, reason, who recorded and submitted it and when;
- `boards/<i>`: board i's fields (without its circuits);
- `boards/<i>/circuits/<j>`: circuit j of board i: fields as typed, verdict, assessment, calc
  version, when it last changed and by whom (by name), and the library device it uses (name, rating
  and points, not its id);
- `instruments/<i>`, `observations/<i>`: each instrument and observation (fields as typed, its
  number, when it changed; an observation's circuits by their labels, not their ids).

A field added in version 2 of the document (the whole test record) counts only when something was
typed into it: blank, it hashes as if absent, so an approval made before those fields existed still
holds once the store has them. The same holds for the job's `approval_reasons` (what the supervisor
wrote for each failing or open item they approved with): covered when there are any. The overall
outcome is left out: it follows from the circuits' verdicts and the observations, which are covered.

Left out: what the store numbers locally (ids, which an import renumbers), what approval itself
sets (`status`, `approved_by`, `approved_at`: the approval carries its own), what each export
sets (`exported_at`, `cautions`, the top-level `calc_version`), the audit trail (an approval commits
to it through `audit_head` instead), and the `approval` and `roster_entry` an export adds.
The document hash an approval signs is `canonical_hash` of the `{part: hash}` map.
"""

from __future__ import annotations

from typing import Any

from mobile_app.signing.canonical import canonical_hash

_JOB_LEFT_OUT = frozenset({"id", "status", "parent_job_id", "approved_by", "approved_at", "overall"})
ADDED_IN_VERSION_2 = {
    "job": frozenset({"client_name", "client_address", "purpose", "next_inspection", "limitations"}),
    "board": frozenset({"pfc", "main_device", "main_rating", "origin", "earthing_csa", "bonding_csa", "ra"}),
    "circuit": frozenset({
        "points_served", "wiring_type", "reference_method", "length_m", "ring", "selv",
        "breaking_capacity", "let_through_at", "rcd_waveform", "rcd_additional", "cpc_insulation",
        "cpc_bunched", "cpc_protected", "r2", "ring_r1", "ring_rn", "ring_r2", "insulation_test_voltage",
        "insulation_line_line", "insulation_line_earth", "polarity", "rcd_time_1x", "rcd_time_5x",
        "rcd_test_button",
    }),
}
"""The fields each level gained in version 2 of the job document (EXPORT-FORMAT.md)."""
_ITEMS_LEFT_OUT = frozenset({"id", "circuit_ids"})
_COUNT_WHEN_GIVEN = frozenset({"approval_reasons"})
"""Keys added since approvals were first signed that count only when they hold something."""


def _blank(field: Any) -> bool:
    """A field with nothing typed, no value and no error."""
    return isinstance(field, dict) and not field.get("raw") and field.get("value") is None \
        and not field.get("error")


def _fields(fields: Any, level: str) -> Any:
    """A level's fields as hashed: those added in version 2 left out while blank."""
    if not isinstance(fields, dict):
        return fields
    added = ADDED_IN_VERSION_2[level]
    return {k: v for k, v in fields.items() if not (k in added and _blank(v))}


def _with_fields(item: dict[str, Any], level: str, left_out: frozenset[str]) -> dict[str, Any]:
    part = {k: v for k, v in item.items() if k not in left_out and not (k in _COUNT_WHEN_GIVEN and not v)}
    if "fields" in part:
        part["fields"] = _fields(part["fields"], level)
    return part


def _people(doc: dict[str, Any]) -> dict[Any, Any]:
    return {p.get("id"): p.get("name") for p in doc.get("people") or [] if isinstance(p, dict)}


def _library(doc: dict[str, Any]) -> dict[Any, dict[str, Any]]:
    return {
        d.get("id"): {k: v for k, v in d.items() if k != "id"}
        for d in doc.get("library_devices") or []
        if isinstance(d, dict)
    }


def _circuit(circuit: dict[str, Any], people: dict[Any, Any], library: dict[Any, Any]) -> dict[str, Any]:
    fields = dict(circuit.get("fields") or {})
    device_field = fields.pop("library_device_id", None) or {}
    device_id = device_field.get("value") if isinstance(device_field, dict) else None
    part = {k: v for k, v in circuit.items() if k not in ("id", "fields", "updated_by")}
    part["fields"] = _fields(fields, "circuit")
    part["updated_by"] = people.get(circuit.get("updated_by"))
    part["library_device"] = library.get(device_id) if device_id is not None else None
    return part


def approved_parts(doc: dict[str, Any]) -> dict[str, str]:
    """The `{part: canonical hash}` map of a job document (module docstring)."""
    people, library = _people(doc), _library(doc)
    job = doc.get("job") or {}
    parts = {"job": canonical_hash(_with_fields(job, "job", _JOB_LEFT_OUT))}
    for i, board in enumerate(doc.get("boards") or []):
        parts[f"boards/{i}"] = canonical_hash(_with_fields(board, "board", frozenset({"id", "circuits"})))
        for j, circuit in enumerate(board.get("circuits") or []):
            parts[f"boards/{i}/circuits/{j}"] = canonical_hash(_circuit(circuit, people, library))
    for kind in ("instruments", "observations"):
        for i, item in enumerate(doc.get(kind) or []):
            if isinstance(item, dict):
                kept = {k: v for k, v in item.items() if k not in _ITEMS_LEFT_OUT}
                parts[f"{kind}/{i}"] = canonical_hash(kept)
    return parts


def document_hash(parts: dict[str, str]) -> str:
    """The hash an approval signs: canonical_hash of the parts map."""
    return canonical_hash(parts)


def describe_part(doc: dict[str, Any], key: str) -> str:
    """A part in words for a message: "the job", "board DB1", "board DB1 circuit 3"."""
    pieces = key.split("/")
    if pieces[0] in ("instruments", "observations"):
        return f"{pieces[0][:-1]} {int(pieces[1]) + 1}"
    if pieces[0] != "boards":
        return "the job"
    boards = doc.get("boards") or []
    board = boards[int(pieces[1])] if int(pieces[1]) < len(boards) else {}
    words = f"board {board.get('designation') or int(pieces[1]) + 1}"
    if len(pieces) < 4:
        return words
    circuits = board.get("circuits") or []
    circuit = circuits[int(pieces[3])] if int(pieces[3]) < len(circuits) else {}
    return f"{words} circuit {circuit.get('number') or int(pieces[3]) + 1}"


def changed_parts(doc: dict[str, Any], approved: dict[str, str]) -> list[str]:
    """The parts of `doc` whose hash differs from the approved map, with those added or removed,
    in words (describe_part), in document order."""
    now = approved_parts(doc)
    keys = list(now) + [k for k in approved if k not in now]
    return [describe_part(doc, k) + ("" if k in now else " (removed)")
            for k in keys if now.get(k) != approved.get(k)]
