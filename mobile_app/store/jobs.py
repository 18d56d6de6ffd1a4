"""Jobs: created with the default supply, saved field by field with the raw text kept and a row
version, their circuits reassessed when a supply field changes; each job's audit trail."""

from __future__ import annotations

from typing import Any

from mobile_app.store.circuits import Circuits
from mobile_app.store.core import Core, now_iso
from mobile_app.store.fields import JOB_FIELDS, SUPPLY_FIELDS
from mobile_app.store.library import Library
from mobile_app.store.outcome import CircuitVerdict, ObservationSeverity, Overall, overall_outcome
from mobile_app.store.rows import as_text, check_version, fields_of, parse, saved, set_clause
from mobile_app.store.settings import Settings


class Jobs:
    """The jobs of a store (`store.jobs`)."""

    def __init__(self, core: Core, library: Library, settings: Settings, circuits: Circuits) -> None:
        self.core = core
        self.library = library
        self.settings = settings
        self.circuits = circuits

    def create(self, fields: dict[str, str] | None = None, by: int | None = None) -> int:
        """Create a draft job from typed fields; blank system, U0, Cmin take the defaults."""
        typed = dict(fields or {})
        defaults = {
            "system": self.settings.get("default_system", ""),
            "u0": self.settings.get("default_u0", "230 V"),
            "cmin": self.settings.get("default_cmin", "0.95"),
        }
        for name, default in defaults.items():
            if not as_text(typed.get(name)).strip():
                typed[name] = default
        parsed = [parse("job", name, typed.get(name, ""), self.library) for name in JOB_FIELDS]
        values = [v for p in parsed for v in (p.raw, p.value, p.error)]
        stamp = now_iso()
        with self.core.write() as conn:
            cursor = conn.execute(
                "INSERT INTO jobs (status, created_at, updated_at, recorded_by) VALUES ('draft', ?, ?, ?)",
                (stamp, stamp, by),
            )
            job_id = int(cursor.lastrowid or 0)
            conn.execute(f"UPDATE jobs SET {set_clause(JOB_FIELDS)} WHERE id = ?", (*values, job_id))
            self.core.audit(conn, job_id, by, "job", job_id, None, None, "created")
        return job_id

    def all(self, search: str = "") -> list[dict[str, Any]]:
        """Jobs, newest change first, with circuit counts (deleted drafts left out).

        `search` matches the client reference, site address or description.
        """
        pattern = "%" + search.replace("\\", "\\\\").replace("%", "\\%").replace("_", "\\_") + "%"
        return self.core.query(
            "SELECT j.id, j.client_ref_raw AS client_ref, j.site_address_raw AS site_address,"
            " j.date_raw AS date, j.status, j.revision, j.version, j.parent_job_id,"
            " j.updated_at,"
            " EXISTS (SELECT 1 FROM jobs k WHERE k.parent_job_id = j.id AND k.deleted_at IS NULL)"
            " AS superseded,"
            " COUNT(c.id) AS circuits,"
            " COALESCE(SUM(c.verdict = 'fail'), 0) AS failing,"
            " COALESCE(SUM(c.verdict = 'not-shown'), 0) AS not_shown"
            " FROM jobs j LEFT JOIN boards b ON b.job_id = j.id LEFT JOIN circuits c"
            " ON c.board_id = b.id WHERE j.deleted_at IS NULL AND (j.client_ref_raw LIKE :p ESCAPE '\\'"
            " OR j.site_address_raw LIKE :p ESCAPE '\\'"
            " OR j.description_raw LIKE :p ESCAPE '\\')"
            " GROUP BY j.id ORDER BY j.updated_at DESC, j.id DESC",
            {"p": pattern},
        )

    def get(self, job_id: int) -> dict[str, Any]:
        """One job: ids, status, revision, version, review details and its fields as typed."""
        row = self.core.row("job", job_id)
        plain = {k: v for k, v in row.items() if not k.endswith(("_raw", "_value", "_error"))}
        return dict(plain, fields=fields_of(row, JOB_FIELDS))

    def set_field(
        self,
        job_id: int,
        name: str,
        raw: str,
        by: int | None = None,
        expected_version: int | None = None,
    ) -> dict[str, Any]:
        """Save one job field as typed; a supply field reassesses every circuit of the job."""
        parsed = parse("job", name, raw, self.library)
        with self.core.write() as conn:
            job = self.core.draft_job(job_id)
            check_version("job", job, expected_version)
            version = job["version"]
            if job[f"{name}_raw"] != parsed.raw:
                version += 1
                conn.execute(
                    f"UPDATE jobs SET {set_clause((name,))}, version = ?, updated_at = ? WHERE id = ?",
                    (parsed.raw, parsed.value, parsed.error, version, now_iso(), job_id),
                )
                self.core.audit(conn, job_id, by, "job", job_id, name, job[f"{name}_raw"], parsed.raw)
                if name in SUPPLY_FIELDS:
                    self.circuits.reassess_job(conn, job_id)
        return saved(parsed, name, version)

    def reassess(self, job_id: int) -> int:
        """Reassess every circuit of a draft job, e.g. after a settings change or a new calc
        version; returns how many circuits. Submitted and approved jobs keep their assessments."""
        with self.core.write() as conn:
            self.core.draft_job(job_id)
            self.circuits.reassess_job(conn, job_id)
        return int(
            self.core.db.conn.execute(
                "SELECT COUNT(*) FROM circuits c JOIN boards b ON b.id = c.board_id WHERE b.job_id = ?",
                (job_id,),
            ).fetchone()[0]
        )

    def overall(self, job_id: int) -> Overall:
        """The job's overall outcome from its circuits' verdicts and its observations' severities."""
        self.core.row("job", job_id)
        circuits = [
            CircuitVerdict(f"{row['board']} / {row['number']}", row["verdict"])
            for row in self.core.query(
                "SELECT b.designation_raw AS board, c.number_raw AS number, c.verdict FROM circuits c"
                " JOIN boards b ON b.id = c.board_id WHERE b.job_id = ? ORDER BY b.position, c.position",
                (job_id,),
            )
        ]
        rows = self.core.query(
            "SELECT severity_value, finding_raw FROM observations WHERE job_id = ? ORDER BY position",
            (job_id,),
        )
        observations = [
            ObservationSeverity(number, row["severity_value"], row["finding_raw"])
            for number, row in enumerate(rows, start=1)
        ]
        return overall_outcome(circuits, observations)

    def audit(self, job_id: int) -> list[dict[str, Any]]:
        """A job's audit trail, oldest first: id, when, who, what, entity, field, old, new."""
        self.core.row("job", job_id)
        rows = self.core.query(
            'SELECT a.id, a.at AS "when", a.person_id, p.name AS who, a.entity, a.entity_id,'
            " a.field, a.old, a.new, COALESCE(c.number_raw, b.designation_raw) AS label"
            " FROM audit a LEFT JOIN people p ON p.id = a.person_id"
            " LEFT JOIN circuits c ON a.entity = 'circuit' AND c.id = a.entity_id"
            " LEFT JOIN boards b ON a.entity = 'board' AND b.id = a.entity_id"
            " WHERE a.job_id = ? ORDER BY a.id",
            (job_id,),
        )
        return [
            dict(
                row,
                what=" ".join(str(part) for part in (row["entity"], row["label"], row["field"]) if part),
            )
            for row in rows
        ]
