"""The demo job: an invented ceramics workshop with three boards and 22 circuits.

Everything here is made up for demonstration (site, people, client reference, readings and the
library curve); it matches no real site or product. The demo supervisor's PIN is DEMO_PIN.
"""

from __future__ import annotations

import sys
from pathlib import Path

from mobile_app.store.errors import StoreError
from mobile_app.store.store import Store

DEMO_PIN = "2468"
DEMO_CURVE_NAME = "Workshop incomer 100 A moulded-case breaker (demo points, invented)"
DEMO_CURVE_POINTS = [[130, 3000], [200, 400], [300, 90], [450, 30], [600, 0.04], [2000, 0.02]]

JOB = {
    "client_ref": "TY-2026-118",
    "site_address": "Unit 7, Tannery Yard, Harlow Mill Road, Wexcombe",
    "description": "Periodic verification: ceramics workshop, kiln room and detached glaze store",
    "date": "2026-11-24",
    "system": "TN-C-S",
    "u0": "230 V",
    "cmin": "0.95",
    "ze": "0.28 Ω",
    "pfc": "1.9 kA",
}

_T_E_25 = {"line_csa": "2.5", "cpc_csa": "1.5", "cpc_arrangement": "in-cable"}
_T_E_15 = {"line_csa": "1.5", "cpc_csa": "1.0", "cpc_arrangement": "in-cable"}
_RCD_30 = {"rcd_idn": "30 mA", "rcd_type": "general"}

# (designation, location, supplied from, board fields, circuits); each circuit is
# (number, description, fields as typed). Fields not given are copied from the previous circuit.
BOARDS: list[tuple[str, str, str, dict[str, str], list[tuple[str, str, dict[str, str]]]]] = [
    (
        "DB-1",
        "Workshop entrance, north wall",
        "Origin (meter cupboard)",
        {},
        [
            (
                "1",
                "Workshop sockets (ring)",
                {
                    "role": "final",
                    "device_kind": "mcb",
                    "device_curve": "B",
                    "device_rating": "32",
                    "line_material": "copper",
                    "line_insulation": "thermoplastic-70",
                    "cpc_material": "copper",
                    **_T_E_25,
                    "zs": "0.71",
                    "zsc": "0.55",
                    "r1r2": "0.42",
                    "test_temp_c": "18 °C",
                },
            ),
            ("2", "Office sockets (radial)", {"device_rating": "20", "zs": "710 mΩ", "r1r2": "0.40"}),
            ("3", "Workshop lighting", {"device_rating": "6", **_T_E_15, "zs": "1.12"}),
            ("4", "Office lighting", {"zs": "0.98"}),
            ("5", "Wheel benches", {"device_curve": "C", "device_rating": "16", **_T_E_25, "zs": "0.82"}),
            ("6", "Pug mill motor", {"device_curve": "D", "device_rating": "16", "zs": "0.93"}),
            ("7", "Extract fan", {"device_curve": "C", "device_rating": "10", **_T_E_15, "zs": "1.31"}),
            ("8", "Water heater", {"device_curve": "B", "device_rating": "16", **_T_E_25, "zs": "0.79"}),
            (
                "9",
                "Glaze spray booth",
                {"device_curve": "C", "device_rating": "32", "line_csa": "6", "cpc_csa": "2.5", "zs": "0.91"},
            ),
            (
                "10",
                "Sub-main to kiln room board DB-2",
                {
                    "role": "distribution",
                    "device_kind": "curve",
                    "device_curve": "",
                    "device_rating": "100",
                    "line_csa": "25",
                    "line_insulation": "thermosetting-90",
                    "cpc_csa": "16",
                    "zs": "0.31",
                    "zsc": "0.27",
                    "r1r2": "",
                },
            ),
            (
                "11",
                "Feed to glaze store board DB-3",
                {
                    "device_kind": "mcb",
                    "device_curve": "C",
                    "device_rating": "40",
                    "line_csa": "10",
                    "line_insulation": "thermoplastic-70",
                    "cpc_csa": "10",
                    "zs": "0.39",
                    "zsc": "0.33",
                },
            ),
            (
                "12",
                "Spare way, kept for a second kiln controller",
                {"role": "final", "device_curve": "B", "device_rating": "16", **_T_E_25, "zs": "", "zsc": ""},
            ),
        ],
    ),
    (
        "DB-2",
        "Kiln room, east wall",
        "DB-1 way 10",
        {},
        [
            (
                "1",
                "Kiln 1",
                {
                    "role": "final",
                    "device_kind": "fuse-gg",
                    "device_curve": "",
                    "device_rating": "32",
                    "library_device_id": "",
                    "line_csa": "6",
                    "line_insulation": "thermosetting-90",
                    "cpc_csa": "2.5",
                    "zs": "0.55",
                    "zsc": "0.41",
                    "r1r2": "0.27",
                },
            ),
            ("2", "Kiln 2", {"zs": "1.21", "zsc": "0.88", "r1r2": "0.93"}),
            (
                "3",
                "Kiln room sockets",
                {"device_rating": "20", **_T_E_25, "line_insulation": "thermoplastic-70", "zs": "0.74"},
            ),
            (
                "4",
                "Kiln controller",
                {"device_rating": "10", "line_csa": "1.5", "cpc_csa": "1.5", "zs": "1.9"},
            ),
            ("5", "Dryer cabinet", {"device_rating": "16", **_T_E_25, "zs": "1.3"}),
            ("6", "Kiln room lighting", {"device_rating": "6", **_T_E_15, "zs": "1.6"}),
        ],
    ),
    (
        "DB-3",
        "Glaze store, inside the door",
        "DB-1 way 11",
        {"system": "TT", "ze": "48 Ω"},
        [
            (
                "1",
                "Glaze store sockets",
                {
                    "role": "final",
                    "device_kind": "mcb",
                    "device_curve": "B",
                    "device_rating": "16",
                    "line_material": "copper",
                    "line_insulation": "thermoplastic-70",
                    "cpc_material": "copper",
                    **_T_E_25,
                    **_RCD_30,
                    "zs": "49.2",
                    "zsc": "0.64",
                    "test_temp_c": "9 °C",
                },
            ),
            ("2", "Glaze store lighting", {"device_rating": "6", **_T_E_15, "zs": "49.6", "zsc": "0.93"}),
            ("3", "Panel heater", {"device_rating": "10", **_T_E_25, "zs": "49.9", "zsc": "0.71"}),
            (
                "4",
                "Outside light by the door",
                {"device_rating": "6", **_T_E_15, "zs": "50.3", "zsc": "1.02"},
            ),
        ],
    ),
]

PEOPLE = (("Rosa Quennell", "qualified"), ("Tomasz Brill", "apprentice"), ("Ines Okafor", "supervisor"))


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
    """The demo job's boards and circuits, typed in field by field as a person would."""
    job_id = store.jobs.create(JOB, by=recorder)
    for designation, location, supplied_from, board_fields, circuits in BOARDS:
        board_id = store.boards.add(job_id, designation, location, supplied_from, by=recorder)
        for name, raw in board_fields.items():
            store.boards.set_field(board_id, name, raw, by=recorder)
        for number, description, fields in circuits:
            circuit_id = store.circuits.add(board_id, number, description, by=recorder)
            for name, raw in fields.items():
                if name == "device_kind" and raw == "curve":
                    store.circuits.set_field(circuit_id, "library_device_id", str(curve_id), by=recorder)
                store.circuits.set_field(circuit_id, name, raw, by=recorder)
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
