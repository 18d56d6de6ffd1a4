"""What a job lists besides its boards: the test instruments used (`store.instruments`) and the
observations made (`store.observations`), each saved field by field with the raw text kept, a row
version and an audit entry; an observation also names the circuits it concerns."""

from __future__ import annotations

import json
from typing import Any

from mobile_app.store.core import Core, now_iso
from mobile_app.store.errors import InvalidValueError
from mobile_app.store.fields import INSTRUMENT_FIELDS, OBSERVATION_FIELDS
from mobile_app.store.library import Library
from mobile_app.store.rows import as_text, check_version, fields_of, parse, saved, set_clause, triples

_TABLES = {"instrument": "instruments", "observation": "observations"}
_NAMES = {"instrument": INSTRUMENT_FIELDS, "observation": OBSERVATION_FIELDS}


class Items:
    """The instruments or the observations of a store's jobs (`store.instruments`,
    `store.observations`); only a draft job's items can be added, changed or removed."""

    def __init__(self, core: Core, library: Library, kind: str) -> None:
        self.core = core
        self.library = library
        self.kind = kind
        self.table = _TABLES[kind]
        self.names = _NAMES[kind]

    def add(self, job_id: int, fields: dict[str, str] | None = None, by: int | None = None) -> int:
        """Add an item to a draft job from typed fields (blank when not given); returns its id."""
        typed = dict(fields or {})
        parsed = [parse(self.kind, name, as_text(typed.get(name)), self.library) for name in self.names]
        with self.core.write() as conn:
            self.core.draft_job(job_id)
            position = conn.execute(
                f"SELECT COALESCE(MAX(position), 0) + 1 FROM {self.table} WHERE job_id = ?", (job_id,)
            ).fetchone()[0]
            row = dict(triples(self.names, parsed), job_id=job_id, position=position, updated_at=now_iso())
            item_id = self.core.insert(conn, self.table, row)
            summary = " · ".join(p.raw.strip() for p in parsed if p.raw.strip()) or "added"
            self.core.audit(conn, job_id, by, self.kind, item_id, None, None, summary)
            self.core.touch_job(conn, job_id)
        return item_id

    def of_job(self, job_id: int) -> list[dict[str, Any]]:
        """A job's items in order: id, job_id, number (1, 2, … in order), version, fields (and an
        observation's `circuit_ids`)."""
        self.core.row("job", job_id)
        rows = self.core.query(f"SELECT * FROM {self.table} WHERE job_id = ? ORDER BY position", (job_id,))
        return [self._item(row, number) for number, row in enumerate(rows, start=1)]

    def get(self, item_id: int) -> dict[str, Any]:
        """One item, numbered by its place in its job's list."""
        row = self.core.row(self.kind, item_id)
        number = self.core.one(
            f"SELECT COUNT(*) AS n FROM {self.table} WHERE job_id = ? AND position <= ?",
            (row["job_id"], row["position"]),
        )
        return self._item(row, int(number["n"]) if number else 1)

    def _item(self, row: dict[str, Any], number: int) -> dict[str, Any]:
        item = {
            "id": row["id"],
            "job_id": row["job_id"],
            "number": number,
            "version": row["version"],
            "updated_at": row["updated_at"],
            "fields": fields_of(row, self.names),
        }
        if self.kind == "observation":
            item["circuit_ids"] = json.loads(row["circuit_ids"] or "[]")
        return item

    def set_field(
        self,
        item_id: int,
        name: str,
        raw: str,
        by: int | None = None,
        expected_version: int | None = None,
    ) -> dict[str, Any]:
        """Save one field as typed; ConflictError when `expected_version` is stale, ReadOnlyError
        unless the job is a draft."""
        parsed = parse(self.kind, name, raw, self.library)
        with self.core.write() as conn:
            row = self.core.row(self.kind, item_id)
            self.core.draft_job(row["job_id"])
            check_version(self.kind, row, expected_version)
            version = row["version"]
            if row[f"{name}_raw"] != parsed.raw:
                version += 1
                conn.execute(
                    f"UPDATE {self.table} SET {set_clause((name,))}, version = ?, updated_at = ?"
                    " WHERE id = ?",
                    (parsed.raw, parsed.value, parsed.error, version, now_iso(), item_id),
                )
                self.core.audit(conn, row["job_id"], by, self.kind, item_id, name, row[f"{name}_raw"],
                                parsed.raw)
                self.core.touch_job(conn, row["job_id"])
        return saved(parsed, name, version)

    def set_circuits(self, item_id: int, circuit_ids: list[int], by: int | None = None) -> list[int]:
        """The circuits an observation concerns (ids of circuits of its job, kept in the order given,
        each once); InvalidValueError for a circuit of another job."""
        if self.kind != "observation":
            raise InvalidValueError(f"{self.kind}.circuits", "only an observation names circuits")
        wanted = list(dict.fromkeys(int(c) for c in circuit_ids))
        with self.core.write() as conn:
            row = self.core.row(self.kind, item_id)
            self.core.draft_job(row["job_id"])
            own = {
                r["id"]
                for r in self.core.query(
                    "SELECT c.id FROM circuits c JOIN boards b ON b.id = c.board_id WHERE b.job_id = ?",
                    (row["job_id"],),
                )
            }
            strangers = [c for c in wanted if c not in own]
            if strangers:
                raise InvalidValueError(
                    "observation.circuits", f"circuit {strangers[0]} is not a circuit of this job"
                )
            old = json.loads(row["circuit_ids"] or "[]")
            if old != wanted:
                conn.execute(
                    f"UPDATE {self.table} SET circuit_ids = ?, version = version + 1, updated_at = ?"
                    " WHERE id = ?",
                    (json.dumps(wanted), now_iso(), item_id),
                )
                self.core.audit(conn, row["job_id"], by, self.kind, item_id, "circuits", json.dumps(old),
                                json.dumps(wanted))
                self.core.touch_job(conn, row["job_id"])
        return wanted

    def remove(self, item_id: int, by: int | None = None) -> None:
        """Remove an item from a draft job; the audit trail keeps what it said."""
        with self.core.write() as conn:
            row = self.core.row(self.kind, item_id)
            self.core.draft_job(row["job_id"])
            said = " · ".join(row[f"{n}_raw"].strip() for n in self.names if row[f"{n}_raw"].strip())
            conn.execute(f"DELETE FROM {self.table} WHERE id = ?", (item_id,))
            self.core.audit(conn, row["job_id"], by, self.kind, item_id, "removed", said or None, None)
            self.core.touch_job(conn, row["job_id"])


def copy_items(core: Core, conn: Any, from_job: int, to_job: int, circuit_ids: dict[int, int]) -> None:
    """Copy a job's instruments and observations to another job (a new revision, inside the caller's
    transaction); an observation's circuits are mapped to the copies' ids."""
    for table in _TABLES.values():
        for row in core.query(f"SELECT * FROM {table} WHERE job_id = ? ORDER BY position", (from_job,)):
            copied = {k: v for k, v in row.items() if k != "id"}
            copied.update(job_id=to_job, version=1)
            if table == "observations":
                old = json.loads(row["circuit_ids"] or "[]")
                copied["circuit_ids"] = json.dumps([circuit_ids[c] for c in old if c in circuit_ids])
            core.insert(conn, table, copied)


def export_items(items: Items, job_id: int, circuit_labels: dict[int, str]) -> list[dict[str, Any]]:
    """A job's instruments or observations as the job document holds them: id, number, fields as
    typed, updated_at; an observation's `circuit_ids` and their `circuits` labels (`DB-1 / 3`)."""
    out = []
    for item in items.of_job(job_id):
        entry = {k: item[k] for k in ("id", "number", "fields", "updated_at")}
        if items.kind == "observation":
            entry["circuit_ids"] = item["circuit_ids"]
            entry["circuits"] = [circuit_labels.get(c, f"circuit {c}") for c in item["circuit_ids"]]
        out.append(entry)
    return out


def import_items(
    core: Core, conn: Any, library: Library, job_id: int, doc: dict[str, Any], circuit_ids: dict[int, int]
) -> dict[str, dict[int, int]]:
    """Insert a job document's instruments and observations into a new job (inside the caller's
    transaction), fields as typed, an observation's circuits mapped to this store's ids (a circuit
    the document does not hold is left out); returns {kind: {document id: new id}}."""
    ids: dict[str, dict[int, int]] = {}
    for kind, table in _TABLES.items():
        ids[kind] = {}
        for position, item in enumerate(doc.get(table) or [], start=1):
            fields = item.get("fields") or {}
            parsed = [
                parse(kind, name, as_text((fields.get(name) or {}).get("raw")), library)
                for name in _NAMES[kind]
            ]
            row = dict(triples(_NAMES[kind], parsed), job_id=job_id, position=position,
                       updated_at=item.get("updated_at") or now_iso())
            if kind == "observation":
                row["circuit_ids"] = json.dumps(
                    [circuit_ids[int(c)] for c in item.get("circuit_ids") or [] if int(c) in circuit_ids]
                )
            new_id = core.insert(conn, table, row)
            if item.get("id") is not None:
                ids[kind][int(item["id"])] = new_id
    return ids
