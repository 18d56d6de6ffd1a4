"""The demo job (`python -m mobile_app demo`): the invented ceramics workshop of `demo_data`, typed in
field by field as a person would, with its instruments and observations.

The demo supervisor's PIN is DEMO_PIN.
"""

from __future__ import annotations

import sys
from pathlib import Path

from mobile_app.store.circuits import COPIED_TO_NEXT_CIRCUIT
from mobile_app.store.demo_data import (
    BOARDS,
    DEMO_CURVE_NAME,
    DEMO_CURVE_POINTS,
    DEMO_PIN,
    INSTRUMENTS,
    JOB,
    OBSERVATIONS,
    PEOPLE,
)
from mobile_app.store.errors import StoreError
from mobile_app.store.fields import READING_FIELDS
from mobile_app.store.store import Store

_OWN = ("number", "description", "points_served", "length_m", "ring", *READING_FIELDS)
"""A demo circuit's own fields; the rest, when not given, are the previous circuit's (as typed)."""

__all__ = ["BOARDS", "DEMO_CURVE_NAME", "DEMO_PIN", "JOB", "cli_demo", "create_demo_job"]


def create_demo_job(store: Store) -> int:
    """Add the demo job to `store` in one transaction; return its id.

    The demo people and library curve are added once and reused when the demo is made again.
    """
    with store.batch():
        known = {(p["name"], p["role"]): p["id"] for p in store.people.all()}
        ids = {
            name: known.get((name, role))
            or store.people.add(name, role, DEMO_PIN if role == "supervisor" else None)
            for name, role in PEOPLE
        }
        curves = {d["name"]: d["id"] for d in store.library.all()}
        curve_id = curves.get(DEMO_CURVE_NAME) or store.library.add(
            DEMO_CURVE_NAME, DEMO_CURVE_POINTS, rating_a=100
        )
        return _add_job(store, ids["Rosa Quennell"], curve_id)


def _add_job(store: Store, recorder: int, curve_id: int) -> int:
    """The demo job's boards, circuits, instruments and observations, typed in field by field."""
    job_id = store.jobs.create(JOB, by=recorder)
    circuit_ids: dict[tuple[str, str], int] = {}
    for designation, location, supplied_from, board_fields, circuits in BOARDS:
        board_id = store.boards.add(job_id, designation, location, supplied_from, by=recorder)
        for name, raw in board_fields.items():
            store.boards.set_field(board_id, name, raw, by=recorder)
        previous: dict[str, str] = {}
        for number, description, given in circuits:
            circuit_id = store.circuits.add(board_id, number, description, by=recorder)
            circuit_ids[(designation, number)] = circuit_id
            fields = {n: r for n, r in previous.items() if n not in COPIED_TO_NEXT_CIRCUIT} | given
            previous = {n: r for n, r in fields.items() if n not in _OWN}
            for name, raw in fields.items():
                if name == "device_kind" and raw == "curve":
                    store.circuits.set_field(circuit_id, "library_device_id", str(curve_id), by=recorder)
                store.circuits.set_field(circuit_id, name, raw, by=recorder)
    for instrument in INSTRUMENTS:
        store.instruments.add(job_id, instrument, by=recorder)
    for severity, location, finding, concerns in OBSERVATIONS:
        fields = {"severity": severity, "location": location, "finding": finding}
        observation_id = store.observations.add(job_id, fields, by=recorder)
        if concerns:
            store.observations.set_circuits(observation_id, [circuit_ids[c] for c in concerns], by=recorder)
    return job_id


def cli_demo(data_dir: Path | None) -> int:
    """`python -m mobile_app demo --data DIR`: create the demo job; its id is the last line printed."""
    try:
        store = Store.open(data_dir)
    except StoreError as error:
        print(f"demo: {error}", file=sys.stderr)
        return 2
    try:
        if store.recovered is not None:
            print(store.recovered.message, file=sys.stderr)
        job_id = create_demo_job(store)
        print(f"Demo job created in {store.path}")
    except StoreError as error:
        print(f"demo: {error}", file=sys.stderr)
        return 2
    finally:
        store.close()
    print(job_id)
    return 0
