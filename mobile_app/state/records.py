"""The screens that complete the record beyond the walk: a board's details, the job's details with
its instruments and overall outcome, and the job's observations."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from mobile_app.state.fields import BOARD_SPECS, INSTRUMENT_SPECS, JOB_SPECS, OBSERVATION_SPECS, FieldSpec
from mobile_app.state.form import Form
from mobile_app.state.text import VerdictMark, overall_mark


def _read_only(store: Any, job_id: int) -> bool:
    return (store.jobs.get(job_id).get("status") or "draft") != "draft"


@dataclass(frozen=True)
class Overall:
    """The job's overall outcome as shown: its mark and the reasons, the deciding ones first."""

    outcome: str
    mark: VerdictMark
    reasons: tuple[str, ...]


def overall_of(store: Any, job_id: int) -> Overall:
    """The overall outcome the store works out from the circuits and the observations."""
    result = store.jobs.overall(job_id)
    return Overall(result.outcome, overall_mark(result.outcome), tuple(result.reasons))


class BoardScreen:
    """One board's details: name, location, what feeds it, its own supply, main device, origin."""

    def __init__(self, store: Any, board_id: int, by: int | None = None) -> None:
        self.store = store
        self.board_id = board_id
        self.by = by
        board = store.boards.get(board_id)
        self.job_id = int(board["job_id"])
        self.form = Form(BOARD_SPECS, lambda: store.boards.get(board_id)["fields"],
                         lambda name, raw: store.boards.set_field(board_id, name, raw, by=by), self._shown)

    @property
    def read_only(self) -> bool:
        """Only a draft job's boards can be changed."""
        return _read_only(self.store, self.job_id)

    @property
    def title(self) -> str:
        """`Board DB-1`."""
        return f"Board {self.form.raw('designation') or self.board_id}"

    def _shown(self, spec: FieldSpec, raw_of: Any) -> bool:
        """RA shows where the board's earthing system (or, left blank, the job's) is TT."""
        if spec.name == "ra":
            system = raw_of("system") or (self.store.jobs.get(self.job_id)["fields"].get("system") or {}).get(
                "value")
            return str(system).upper() == "TT" or bool(raw_of("ra"))
        return all(raw_of(other) in allowed for other, allowed in spec.shown_when.items())


class JobDetails:
    """The job's details (client, site, purpose, dates, limitations), its instruments and its overall
    outcome."""

    def __init__(self, store: Any, job_id: int, by: int | None = None) -> None:
        self.store = store
        self.job_id = job_id
        self.by = by
        self.form = Form(JOB_SPECS, lambda: store.jobs.get(job_id)["fields"],
                         lambda name, raw: store.jobs.set_field(job_id, name, raw, by=by))
        self._instruments: dict[int, Form] = {}

    @property
    def read_only(self) -> bool:
        """Only a draft job can be changed."""
        return _read_only(self.store, self.job_id)

    def instruments(self) -> list[tuple[int, int, Form]]:
        """Each instrument as (id, number, its form), in order."""
        rows = self.store.instruments.of_job(self.job_id)
        return [(int(row["id"]), int(row["number"]), self._instrument_form(int(row["id"]))) for row in rows]

    def _instrument_form(self, item_id: int) -> Form:
        if item_id not in self._instruments:
            self._instruments[item_id] = Form(
                INSTRUMENT_SPECS, lambda: self.store.instruments.get(item_id)["fields"],
                lambda name, raw: self.store.instruments.set_field(item_id, name, raw, by=self.by))
        else:
            self._instruments[item_id].reload()
        return self._instruments[item_id]

    def add_instrument(self) -> int:
        """A new, blank instrument at the end of the list; its id."""
        return int(self.store.instruments.add(self.job_id, by=self.by))

    def remove_instrument(self, item_id: int) -> None:
        """Take an instrument off the list (the audit trail keeps what it said)."""
        self.store.instruments.remove(item_id, by=self.by)
        self._instruments.pop(item_id, None)

    def overall(self) -> Overall:
        """The job's overall outcome now."""
        return overall_of(self.store, self.job_id)


@dataclass(frozen=True)
class CircuitChip:
    """A circuit an observation may concern: its id, label (`DB-1 / 3`) and whether it is picked."""

    id: int
    label: str
    picked: bool


@dataclass(frozen=True)
class ObservationView:
    """One observation as shown: its id, number, form and the circuits to pick from."""

    id: int
    number: int
    form: Form
    circuits: tuple[CircuitChip, ...]


class ObservationsScreen:
    """The job's observations: each with a severity, where, what was found and the circuits it
    concerns; added and removed while the job is a draft."""

    def __init__(self, store: Any, job_id: int, by: int | None = None) -> None:
        self.store = store
        self.job_id = job_id
        self.by = by
        self._forms: dict[int, Form] = {}

    @property
    def read_only(self) -> bool:
        """Only a draft job can be changed."""
        return _read_only(self.store, self.job_id)

    def _circuits(self) -> list[tuple[int, str]]:
        return [(int(c["id"]), f"{b['designation']} / {c['number']}")
                for b in self.store.boards.of_job(self.job_id) for c in self.store.circuits.of_board(b["id"])]

    def _form(self, item_id: int) -> Form:
        if item_id not in self._forms:
            self._forms[item_id] = Form(
                OBSERVATION_SPECS, lambda: self.store.observations.get(item_id)["fields"],
                lambda name, raw: self.store.observations.set_field(item_id, name, raw, by=self.by))
        else:
            self._forms[item_id].reload()
        return self._forms[item_id]

    def items(self) -> list[ObservationView]:
        """Every observation in order."""
        circuits = self._circuits()
        views = []
        for row in self.store.observations.of_job(self.job_id):
            picked = set(row["circuit_ids"])
            chips = tuple(CircuitChip(cid, label, cid in picked) for cid, label in circuits)
            item_id = int(row["id"])
            views.append(ObservationView(item_id, int(row["number"]), self._form(item_id), chips))
        return views

    def add(self) -> int:
        """A new, blank observation at the end; its id."""
        return int(self.store.observations.add(self.job_id, by=self.by))

    def remove(self, item_id: int) -> None:
        """Take an observation off the record (the audit trail keeps what it said)."""
        self.store.observations.remove(item_id, by=self.by)
        self._forms.pop(item_id, None)

    def toggle_circuit(self, item_id: int, circuit_id: int) -> list[int]:
        """Pick or drop one circuit the observation concerns; the circuits now picked."""
        current = list(self.store.observations.get(item_id)["circuit_ids"])
        wanted = [c for c in current if c != circuit_id] if circuit_id in current else [*current, circuit_id]
        return list(self.store.observations.set_circuits(item_id, wanted, by=self.by))

    def missing(self) -> list[str]:
        """What each observation still needs, as `Observation 2: Severity is needed`."""
        return [f"Observation {view.number}: {need}" for view in self.items() for need in view.form.missing()]

    def overall(self) -> Overall:
        """The job's overall outcome now."""
        return overall_of(self.store, self.job_id)
