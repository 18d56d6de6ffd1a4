"""The jobs list and one job's screen: supply, boards and each board's circuits with their marks."""

from __future__ import annotations

import datetime
from dataclasses import dataclass, replace
from typing import Any

from mobile_app.state.devices import cable_text, device_text, rating_mismatch
from mobile_app.state.fields import JOB_SPECS, STEPS, SUPPLY_SPECS, Choice, FieldSpec, all_specs
from mobile_app.state.settings import SettingsState
from mobile_app.state.text import VerdictMark, format_quantity, status_word, verdict_mark
from mobile_app.store import StoreError


@dataclass(frozen=True)
class JobRow:
    """One line of the jobs list."""

    id: int
    title: str
    subtitle: str
    status: str
    status_word: str
    circuits: int
    failing: int
    not_shown: int

    @property
    def summary(self) -> str:
        """`8 circuits · 2 failing · 1 not shown`."""
        return count_summary(self.circuits, self.failing, self.not_shown)


def count_summary(circuits: int, failing: int, not_shown: int) -> str:
    """`8 circuits · 2 failing · 1 not shown` (the counts that are not zero after the first)."""
    parts = [f"{circuits} circuit" + ("" if circuits == 1 else "s")]
    if failing:
        parts.append(f"{failing} failing")
    if not_shown:
        parts.append(f"{not_shown} not shown")
    return " · ".join(parts)


STATUS_FILTERS: tuple[Choice, ...] = (
    Choice("all", "All"),
    Choice("draft", "Draft"),
    Choice("submitted", "In review"),
    Choice("approved", "Approved"),
)


class JobsList:
    """The jobs list: search text and the rows that match it."""

    def __init__(self, store: Any) -> None:
        self.store = store
        self.search = ""
        self.status = "all"

    def rows(self) -> list[JobRow]:
        """Jobs matching the search and the status filter, as the store orders them."""
        rows = [
            JobRow(
                id=int(job["id"]),
                title=job.get("client_ref") or f"Job {job['id']}",
                subtitle=" · ".join(p for p in (job.get("site_address"), job.get("date")) if p),
                status=job.get("status") or "draft",
                status_word=status_word(job.get("status")),
                circuits=int(job.get("circuits") or 0),
                failing=int(job.get("failing") or 0),
                not_shown=int(job.get("not_shown") or 0),
            )
            for job in self.store.jobs.all(self.search.strip())
        ]
        if self.status == "all":
            return rows
        return [row for row in rows if row.status == self.status]

    def new_job(self, client_ref: str, site_address: str = "", by: int | None = None) -> int:
        """Create a draft job with the supply defaults from settings and one board; returns its id."""
        defaults = SettingsState(self.store).job_defaults()
        fields = {
            "client_ref": client_ref.strip() or "New job",
            "site_address": site_address.strip(),
            "date": datetime.date.today().isoformat(),
            **defaults,
        }
        job_id = int(self.store.jobs.create(fields, by=by))
        self.store.boards.add(job_id, "DB1")
        return job_id


@dataclass(frozen=True)
class CircuitRow:
    """One circuit under its board: reference, description, device, cable pair, Zs and verdict, the
    primary cause when it does not pass, and where a tap goes (its results once it has readings)."""

    id: int
    number: str
    description: str
    verdict: str
    mark: VerdictMark
    device: str = ""
    cables: str = ""
    zs: str = ""
    cause: str = ""
    has_readings: bool = False
    rating_note: str | None = None

    @property
    def detail(self) -> str:
        """`B32 · 2.5/1.5 mm² · Zs 0.62 Ω`, each short part kept on one line when the text wraps (a
        saved curve's long name wraps between its words, never inside a number)."""
        return " · ".join(_unbroken(p) for p in (self.device, self.cables, self.zs) if p)

    @property
    def step(self) -> str:
        """The screen a tap opens: the results when there are readings, else the walk's first step."""
        return "results" if self.has_readings else "device"


UNBROKEN_UP_TO = 16
"""A part of a row's detail this short is kept on one line (its spaces made non-breaking)."""


def _unbroken(part: str) -> str:
    return part.replace(" ", "\u00a0") if len(part) <= UNBROKEN_UP_TO else part


def circuit_row(summary: dict[str, Any]) -> CircuitRow:
    """A CircuitRow from one of `store.circuits.summaries`."""
    kind = summary.get("device_kind")
    zs = summary.get("zs_ohm")
    verdict = summary.get("verdict") or "not-shown"
    return CircuitRow(
        id=int(summary["id"]),
        number=str(summary.get("number") or ""),
        description=str(summary.get("description") or ""),
        verdict=verdict,
        mark=verdict_mark(verdict),
        device=device_text(kind, summary.get("device_curve"), summary.get("device_rating_a"),
                           summary.get("library_name")),
        cables=cable_text(summary.get("line_csa_mm2"), summary.get("cpc_csa_mm2")),
        zs=zs_text(zs, summary.get("zs_used_ohm"), summary.get("zs_source")),
        cause="" if verdict == "pass" else str(summary.get("cause") or ""),
        has_readings=bool(summary.get("has_readings")),
        rating_note=rating_mismatch(kind, summary.get("device_rating_a"), summary.get("library_rating_a")),
    )


def zs_text(measured: Any, used: Any, source: Any) -> str:
    """A row's Zs: as measured; else the one the assessment worked out, with where from ("Zs 0.75 Ω
    from Ze + (R1+R2)", as the walk's loop step takes it, calc.walk.loop_impedance); else "no Zs"."""
    if isinstance(measured, int | float):
        return f"Zs {format_quantity(float(measured), 'Ω')}"
    if isinstance(used, int | float):
        return f"Zs {format_quantity(float(used), 'Ω')} from {source or 'other readings'}"
    return "no Zs"


CIRCUIT_FILTERS: tuple[str, ...] = ("all", "fail", "not-shown")
FIRST_TEST_STEP = next(step for step in STEPS if step not in ("device", "conductors"))
"""Where a copied circuit opens: its device and cables are there, its tests are not."""


@dataclass(frozen=True)
class BoardView:
    """One board with its circuits (those the filter lets through) and how many it has in all."""

    id: int
    designation: str
    location: str
    circuits: tuple[CircuitRow, ...]
    total: int = 0

    @property
    def summary(self) -> str:
        """`50 circuits · 2 failing · 1 not shown`."""
        verdicts = [c.verdict for c in self.circuits]
        return count_summary(len(verdicts), verdicts.count("fail"), verdicts.count("not-shown"))


FOLD_OVER = 60
"""A job with more circuits than this shows its boards folded (a line each, opened one by one): a
screen of hundreds of circuits takes seconds to build and is no way to find one."""


@dataclass(frozen=True)
class JobField:
    """One job or supply field: spec, text as typed, parsed value text, message."""

    spec: FieldSpec
    raw: str
    parsed_text: str
    message: str | None


class JobScreen:
    """One job: its header and supply fields, boards and circuits."""

    def __init__(self, store: Any, job_id: int, by: int | None = None) -> None:
        self.store = store
        self.job_id = job_id
        self.by = by
        self._typed: dict[str, str] = {}
        self._save_errors: dict[str, str] = {}
        self.circuit_filter = "all"
        self.reload()

    def reload(self) -> None:
        """Read the job again."""
        self.job: dict[str, Any] = self.store.jobs.get(self.job_id)

    @property
    def title(self) -> str:
        """The job's client reference, or its number."""
        raw = (self.job["fields"].get("client_ref") or {}).get("raw")
        return raw or self.job.get("client_ref") or f"Job {self.job_id}"

    @property
    def status_word(self) -> str:
        """Draft, In review, Approved."""
        return status_word(self.job.get("status"))

    @property
    def read_only(self) -> bool:
        """Only draft jobs can be changed."""
        return (self.job.get("status") or "draft") != "draft"

    def _field(self, spec: FieldSpec) -> JobField:
        stored = self.job["fields"].get(spec.name) or {}
        raw = self._typed.get(spec.name, stored.get("raw") or "")
        value = stored.get("value")
        parsed = ""
        if spec.kind == "number" and isinstance(value, int | float) and not stored.get("error"):
            parsed = "= " + format_quantity(float(value), spec.unit)
        error = stored.get("error")
        message = self._save_errors.get(spec.name) or (f"{spec.label}: {error}" if error else None)
        return JobField(spec, raw, parsed, message)

    def supply_fields(self) -> list[JobField]:
        """System, U0, Cmin, Ze, prospective fault current."""
        return [self._field(spec) for spec in SUPPLY_SPECS]

    def set_field(self, name: str, raw: str) -> JobField:
        """Save one job field at once; a failed save keeps the typed text and says why."""
        spec = next(s for s in JOB_SPECS + SUPPLY_SPECS if s.name == name)
        self._typed[name] = raw
        try:
            self.store.jobs.set_field(self.job_id, name, raw, by=self.by)
        except StoreError as exc:
            self._save_errors[name] = f"Not saved ({exc}); your text is kept"
            return self._field(spec)
        self._typed.pop(name, None)
        self._save_errors.pop(name, None)
        self.reload()
        return self._field(spec)

    def _all_boards(self) -> list[BoardView]:
        views = []
        for board in self.store.boards.of_job(self.job_id):
            circuits = tuple(circuit_row(c) for c in self.store.circuits.summaries(board["id"]))
            views.append(BoardView(int(board["id"]), str(board.get("designation") or ""),
                                   str(board.get("location") or ""), circuits, len(circuits)))
        return views

    @staticmethod
    def folds(boards: list[BoardView]) -> bool:
        """Whether the boards start folded: the job has more than FOLD_OVER circuits (all of them,
        whatever the filter shows)."""
        return sum(board.total for board in boards) > FOLD_OVER

    def boards(self) -> list[BoardView]:
        """Boards in order, each with its circuits; with a filter (`circuit_filter` "fail" or
        "not-shown") only the matching circuits, and only the boards that have some."""
        boards = self._all_boards()
        if self.circuit_filter == "all":
            return boards
        kept = [replace(b, circuits=tuple(c for c in b.circuits if c.verdict == self.circuit_filter))
                for b in boards]
        return [b for b in kept if b.circuits]

    def filter_choices(self) -> tuple[Choice, ...]:
        """All, Failing (n), Not shown (n)."""
        rows = [c for b in self._all_boards() for c in b.circuits]
        failing = sum(1 for c in rows if c.verdict == "fail")
        open_ = sum(1 for c in rows if c.verdict == "not-shown")
        return (Choice("all", f"All ({len(rows)})"), Choice("fail", f"Failing ({failing})"),
                Choice("not-shown", f"Not shown ({open_})"))

    @property
    def filter_empty_text(self) -> str:
        """What the list says when the filter leaves nothing."""
        return {"fail": "No failing circuits in this job.",
                "not-shown": "Every circuit is decided: none is not shown."}.get(self.circuit_filter, "")

    def add_board(self, designation: str) -> tuple[int | None, str]:
        """Add a board by its name (asked first): (its id, message), or (None, why not)."""
        name = designation.strip()
        if not name:
            return None, "Name the board first (e.g. DB2, Garage board)"
        boards = self.store.boards.of_job(self.job_id)
        taken = {str(b.get("designation") or "").strip().casefold() for b in boards}
        if name.casefold() in taken:
            return None, f"This job already has a board called {name}"
        try:
            board_id = int(self.store.boards.add(self.job_id, name, by=self.by))
        except StoreError as exc:
            return None, f"Board not added: {exc}"
        return board_id, f"Added: {name}"

    def add_circuit(self, board_id: int, description: str = "") -> int:
        """Add the board's next circuit; choices the store left blank get the usual defaults."""
        existing = self.store.circuits.of_board(board_id)
        numbers = [int(c["number"]) for c in existing if str(c.get("number", "")).isdigit()]
        number = str(max(numbers, default=0) + 1)
        circuit_id = int(self.store.circuits.add(board_id, number, description, by=self.by))
        fields = self.store.circuits.get(circuit_id)["fields"]
        for spec in all_specs().values():
            if spec.default and not (fields.get(spec.name) or {}).get("raw"):
                self.store.circuits.set_field(circuit_id, spec.name, spec.default, by=self.by)
        return circuit_id

    def copy_circuit(self, circuit_id: int) -> tuple[int | None, str]:
        """Copy a circuit to the end of its board with the next reference and no readings:
        (the copy's id, message), or (None, why not)."""
        try:
            copy_id = int(self.store.circuits.copy(circuit_id, by=self.by))
        except StoreError as exc:
            return None, f"Not copied: {exc}"
        number = self.store.circuits.get(copy_id)["fields"]["number"]["raw"]
        return copy_id, f"Copied as circuit {number}: enter its readings"


def ensure_demo(store: Any) -> int:
    """The demo job's id, creating it (`mobile_app.store.demo`) if the store does not hold it."""
    from mobile_app.store import demo

    for job in store.jobs.all(demo.JOB["client_ref"]):
        if job.get("client_ref") == demo.JOB["client_ref"]:
            return int(job["id"])
    return int(demo.create_demo_job(store))


def demo_if_empty(store: Any) -> int | None:
    """Create the demo job when the store holds no job at all (`--demo`); returns its id or None."""
    if store.jobs.all():
        return None
    return ensure_demo(store)
