"""The whole test record in the store: a circuit's other tests, a board's supply and origin details,
a job's client, purpose, instruments, observations and overall outcome; a store written by the
previous release (schema 5) opens with everything it held."""

from __future__ import annotations

import gzip
import json
from collections.abc import Iterator
from pathlib import Path

import pytest
from approving import reasons_for

from mobile_app.store import Store
from mobile_app.store.core import STORE_FILE
from mobile_app.store.errors import InvalidValueError, ReadOnlyError
from mobile_app.store.fields import parse_field
from mobile_app.store.outcome import CircuitVerdict, ObservationSeverity, overall_outcome
from mobile_app.store.schema import SCHEMA_VERSION

FIXTURES = Path(__file__).with_name("fixtures")

# A ring final circuit on an RCBO with every test, typed as a person would.
RING = {
    "role": "final",
    "device_kind": "RCBO",
    "device_curve": "b",
    "device_rating": "32 A",
    "breaking_capacity": "6 kA",
    "rcd_idn": "30 mA",
    "rcd_waveform": "a",
    "rcd_additional": "yes",
    "line_csa": "2.5",
    "cpc_csa": "1.5",
    "cpc_arrangement": "in-cable",
    "wiring_type": "flat twin and earth",
    "reference_method": "C",
    "points_served": "9",
    "length_m": "48 m",
    "ring": "yes",
    "ring_r1": "0.52",
    "ring_rn": "0.53",
    "ring_r2": "0.86",
    "insulation_test_voltage": "500 V",
    "insulation_line_line": ">999",
    "insulation_line_earth": "200",
    "polarity": "yes",
    "zs": "0.62",
    "zsc": "0.41",
    "test_temp_c": "20",
    "rcd_time_1x": "24 ms",
    "rcd_time_5x": "11 ms",
    "rcd_test_button": "yes",
}


@pytest.fixture
def store(tmp_path: Path) -> Iterator[Store]:
    with Store.open(tmp_path) as opened:
        yield opened


def _job(store: Store, **fields: str) -> tuple[int, int]:
    """A draft job (TN-C-S, Ze 0.35 Ω, PFC 1.5 kA at the origin) with one board; (job id, board id)."""
    job_id = store.jobs.create({"client_ref": "T-1", "system": "TN-C-S", "ze": "0.35", "pfc": "1.5 kA",
                                **fields})
    return job_id, store.boards.add(job_id, "DB1")


def _circuit(store: Store, board_id: int, typed: dict[str, str], number: str = "1") -> int:
    circuit_id = store.circuits.add(board_id, number, "Sockets")
    for name, raw in typed.items():
        assert store.circuits.set_field(circuit_id, name, raw)["error"] is None, name
    return circuit_id


@pytest.mark.parametrize(
    ("kind", "name", "raw", "value"),
    [
        ("circuit", "insulation_line_earth", ">999", ">999"),
        ("circuit", "insulation_line_earth", "> 299.5 MΩ", ">299.5"),
        ("circuit", "insulation_line_line", "0,8", 0.8),
        ("circuit", "rcd_time_1x", "24 ms", 0.024),
        ("circuit", "rcd_time_1x", ">300 ms", ">0.3"),
        ("circuit", "polarity", "Yes", "yes"),
        ("circuit", "rcd_test_button", "n", "no"),
        ("circuit", "device_kind", "rcbo", "rcbo"),
        ("circuit", "rcd_waveform", "ac", "AC"),
        ("circuit", "cpc_insulation", "xlpe", "thermosetting-90"),
        ("circuit", "points_served", "12", 12),
        ("circuit", "length_m", "23 m", 23.0),
        ("circuit", "breaking_capacity", "10 kA", 10000.0),
        ("circuit", "reference_method", "  C ", "C"),
        ("board", "ra", "48 Ω", 48.0),
        ("board", "earthing_csa", "16mm2", 16.0),
        ("board", "origin", "yes", "yes"),
        ("job", "purpose", "Periodic inspection", "periodic"),
        ("job", "next_inspection", "01/12/2031", "2031-12-01"),
        ("instrument", "calibration_date", "2026-05-01", "2026-05-01"),
        ("observation", "severity", "Serious", "serious"),
    ],
)
def test_each_new_field_parses_what_is_typed(kind: str, name: str, raw: str, value: object) -> None:
    parsed = parse_field(kind, name, raw)
    assert (parsed.raw, parsed.value, parsed.error) == (raw, value, None)


@pytest.mark.parametrize(
    ("kind", "name", "raw", "problem"),
    [
        ("circuit", "insulation_line_earth", ">", "needs a number after >"),
        ("circuit", "rcd_time_1x", "0.5 Ω", "unit"),
        ("circuit", "points_served", "nine", "whole number of points"),
        ("circuit", "polarity", "maybe", "must be one of: no, yes"),
        ("circuit", "breaking_capacity", "6", "write 6 kA"),
        ("job", "purpose", "survey", "must be one of: fault-finding, new-work, periodic"),
        ("observation", "severity", "C2", "must be one of: attention, note, serious"),
        ("instrument", "calibration_date", "May", "must be a date"),
    ],
)
def test_bad_text_is_kept_with_an_error(kind: str, name: str, raw: str, problem: str) -> None:
    parsed = parse_field(kind, name, raw)
    assert parsed.raw == raw and parsed.value is None
    assert parsed.error is not None and problem in parsed.error


def test_a_ring_with_every_test_reaches_calc_and_passes(store: Store) -> None:
    job_id, board_id = _job(store)
    circuit_id = _circuit(store, board_id, dict(RING, let_through_i2t="45000", let_through_at="6 kA"))
    data = store.circuits.calc_input(circuit_id)
    assert data["supply"] == {"system": "TN-C-S", "u0": 230.0, "cmin": 0.95, "ze": 0.35, "pfc": 1500.0}
    assert data["circuit"]["device"] == {"kind": "rcbo", "curve": "B", "rating": 32.0,
                                         "breaking_capacity": 6000.0}
    assert data["circuit"]["rcd"] == {"idn": 0.03, "type": "general", "waveform": "A", "additional": True}
    assert (data["circuit"]["ring"], data["circuit"]["length_m"]) == (True, 48.0)
    assert data["measured"]["insulation"] == {"test_voltage": 500.0, "line_line": ">999",
                                              "line_earth": 200.0}
    assert data["measured"]["ring"] == {"r1": 0.52, "rn": 0.53, "r2": 0.86}
    assert (data["measured"]["rcd_time_1x"], data["measured"]["polarity"]) == (0.024, True)
    circuit = store.circuits.get(circuit_id)
    result = circuit["assessment"]
    assert circuit["verdict"] == "pass", result["primary_cause"]
    # IEC 60364-6 Table 6.1: 500 V d.c., at least 1 MΩ; IEC 61008-1 / 61009-1 Table 1: 300 ms at IΔn,
    # 40 ms at 5 IΔn for a general RCD; ring (r1 + r2)/4 (common practice).
    assert (result["insulation_ok"], result["insulation_min_mohm"]) == (True, 200.0)
    assert (result["rcd_time_limit_1x_s"], result["rcd_time_limit_5x_s"]) == (0.3, 0.04)
    assert result["ring_expected_r1r2_ohm"] == pytest.approx((0.52 + 0.86) / 4)
    assert all(result[f"{name}_ok"] for name in ("ring", "polarity", "rcd_time", "rcd_button",
                                                  "continuity", "breaking_capacity"))


@pytest.mark.parametrize(
    ("field", "raw", "check"),
    [
        ("insulation_line_earth", "0.4", "insulation"),  # IEC 60364-6 Table 6.1: ≥ 1 MΩ at 500 V
        ("polarity", "no", "polarity"),
        ("rcd_time_1x", "350 ms", "rcd-time"),  # IEC 61008-1 Table 1: ≤ 300 ms at IΔn
        ("rcd_test_button", "no", "rcd-button"),
        ("ring_rn", "0.71", "ring"),  # common practice: r1 and rn within 0.05 Ω
        ("breaking_capacity", "1 kA", "breaking-capacity"),  # IEC 60364-4-43 434.5.1: ≥ PFC 1.5 kA
    ],
)
def test_a_failing_test_fails_the_circuit_with_its_cause(
    store: Store, field: str, raw: str, check: str
) -> None:
    _job_id, board_id = _job(store)
    circuit_id = _circuit(store, board_id, dict(RING, let_through_i2t="45000", let_through_at="6 kA"))
    saved = store.circuits.set_field(circuit_id, field, raw)
    circuit = store.circuits.get(circuit_id)
    assert saved["verdict"] == circuit["verdict"] == "fail"
    outcomes = {c["id"]: c["outcome"] for c in circuit["assessment"]["checks"]}
    assert outcomes[check] == "fail"
    assert circuit["assessment"]["primary_cause"]["check"] == check


def test_the_boards_supply_takes_the_place_of_the_jobs(store: Store) -> None:
    job_id, board_id = _job(store)
    circuit_id = _circuit(store, board_id, {**RING, "rcd_idn": "", "rcd_waveform": "", "device_kind": "mcb"})
    for name, raw in (("system", "TT"), ("ze", "21 Ω"), ("pfc", "0.9 kA"), ("ra", "48 Ω")):
        store.boards.set_field(board_id, name, raw)
    supply = store.circuits.calc_input(circuit_id)["supply"]
    assert supply == {"system": "TT", "u0": 230.0, "cmin": 0.95, "ze": 21.0, "pfc": 900.0, "ra": 48.0}
    assert store.circuits.get(circuit_id)["assessment"]["inputs"]["supply"]["ra"] == 48.0
    store.circuits.set_field(circuit_id, "rcd_idn", "30 mA")
    result = store.circuits.get(circuit_id)["assessment"]
    # IEC 60364-4-41 411.5.3: RA · IΔn ≤ 50 V, with the board's RA (48 Ω × 0.03 A = 1.44 V)
    assert result["touch_voltage_v"] == pytest.approx(48 * 0.03)
    store.boards.set_field(board_id, "ra", "2000 Ω")
    result = store.circuits.get(circuit_id)["assessment"]
    assert result["touch_voltage_v"] == pytest.approx(60.0) and result["touch_voltage_ok"] is False


def test_an_rcbo_without_its_idn_says_so_by_name(store: Store) -> None:
    _job_id, board_id = _job(store)
    circuit_id = _circuit(store, board_id, {**RING, "rcd_idn": ""})
    circuit = store.circuits.get(circuit_id)
    assert circuit["verdict"] == "not-shown"
    assert circuit["assessment_error"] == "circuit.rcd: is required for an RCBO (its IΔn)"


def test_a_separate_cpc_gives_calc_its_own_insulation_and_bunching(store: Store) -> None:
    _job_id, board_id = _job(store)
    circuit_id = _circuit(store, board_id, {**RING, "cpc_bunched": "no", "cpc_protected": "yes",
                                            "cpc_insulation": "pvc"})
    assert "bunched" not in store.circuits.calc_input(circuit_id)["circuit"]["cpc"]
    store.circuits.set_field(circuit_id, "cpc_arrangement", "separate")
    cpc = store.circuits.calc_input(circuit_id)["circuit"]["cpc"]
    assert (cpc["insulation"], cpc["bunched"], cpc["protected"]) == ("thermoplastic-70", False, True)
    # IEC 60364-5-54 Table A.54.2: a separate 70 °C thermoplastic conductor not bunched, copper, k 143
    assert store.circuits.get(circuit_id)["assessment"]["k_cpc"] == 143


def test_a_new_circuit_copies_device_and_wiring_but_no_readings(store: Store) -> None:
    _job_id, board_id = _job(store)
    _circuit(store, board_id, RING)
    second = store.circuits.get(store.circuits.add(board_id, "L2-4", "Cooker"))["fields"]
    for copied in ("device_kind", "breaking_capacity", "rcd_waveform", "wiring_type", "reference_method"):
        assert second[copied]["raw"] == RING[copied], copied
    for own in ("points_served", "length_m", "ring", "ring_r1", "insulation_line_earth", "polarity",
                "rcd_time_1x", "rcd_test_button", "zs"):
        assert second[own]["raw"] == "", own
    assert second["number"]["raw"] == "L2-4"


def test_instruments_and_observations_are_kept_field_by_field(store: Store) -> None:
    job_id, board_id = _job(store)
    first = _circuit(store, board_id, RING)
    second = _circuit(store, board_id, RING, "2")
    meter = store.instruments.add(job_id, {"name": "Multifunction tester", "serial": "MF-20391",
                                           "calibration_date": "2026-03-02"}, by=None)
    store.instruments.add(job_id, {"name": "Loop tester"})
    saved = store.instruments.set_field(meter, "calibration_date", "2 March")
    assert saved["error"] == "must be a date such as 2026-03-14" and saved["raw"] == "2 March"
    observation = store.observations.add(job_id, {"finding": "Socket cracked", "severity": "attention",
                                                  "location": "Kitchen"})
    assert store.observations.set_circuits(observation, [second, first, second]) == [second, first]
    listed = store.observations.of_job(job_id)
    assert listed[0]["circuit_ids"] == [second, first] and listed[0]["number"] == 1
    assert [i["fields"]["name"]["raw"] for i in store.instruments.of_job(job_id)] == [
        "Multifunction tester", "Loop tester"]
    store.instruments.remove(meter)
    assert [i["number"] for i in store.instruments.of_job(job_id)] == [1]
    trail = [(a["entity"], a["field"], a["old"], a["new"]) for a in store.jobs.audit(job_id)]
    assert ("instrument", "calibration_date", "2026-03-02", "2 March") in trail
    assert ("instrument", "removed", "Multifunction tester · MF-20391 · 2 March", None) in trail
    assert ("observation", "circuits", "[]", json.dumps([second, first])) in trail


def test_an_observation_names_only_circuits_of_its_job(store: Store) -> None:
    job_id, _board_id = _job(store)
    _other_job, other_board = _job(store)
    stranger = _circuit(store, other_board, RING)
    observation = store.observations.add(job_id, {"finding": "x"})
    with pytest.raises(InvalidValueError, match=f"circuit {stranger} is not a circuit of this job"):
        store.observations.set_circuits(observation, [stranger])


def test_items_are_read_only_once_submitted(store: Store) -> None:
    job_id, _board_id = _job(store)
    person = store.people.add("Ann Field", "qualified")
    observation = store.observations.add(job_id, {"finding": "x"})
    store.review.submit(job_id, person)
    with pytest.raises(ReadOnlyError):
        store.observations.set_field(observation, "severity", "note")
    with pytest.raises(ReadOnlyError):
        store.instruments.add(job_id, {"name": "meter"})
    with pytest.raises(ReadOnlyError):
        store.observations.remove(observation)


@pytest.mark.parametrize(
    ("verdicts", "severities", "outcome"),
    [
        (["pass", "pass"], ["note", "attention"], "satisfactory"),
        (["pass", "fail"], ["note"], "unsatisfactory"),
        (["pass", "pass"], ["serious"], "unsatisfactory"),
        (["pass", "not-shown"], [], "not-shown"),
        (["pass", "pass"], [None], "not-shown"),
        ([], [], "not-shown"),
        (["fail", "not-shown"], [None], "unsatisfactory"),
    ],
)
def test_overall_outcome(verdicts: list[str], severities: list[str | None], outcome: str) -> None:
    """A failing circuit or a serious observation makes the record unsatisfactory (the issue's rule);
    anything undecided keeps it open."""
    circuits = [CircuitVerdict(f"DB1 / {n}", v) for n, v in enumerate(verdicts, start=1)]
    observations = [ObservationSeverity(n, s, "finding") for n, s in enumerate(severities, start=1)]
    result = overall_outcome(circuits, observations)
    assert result.outcome == outcome and result.reasons


def test_the_jobs_overall_outcome_names_its_reasons(store: Store) -> None:
    job_id, board_id = _job(store)
    _circuit(store, board_id, dict(RING, let_through_i2t="45000", let_through_at="6 kA"))
    assert store.jobs.overall(job_id).outcome == "satisfactory"
    observation = store.observations.add(job_id, {"finding": "No main bonding to the gas pipe",
                                                  "severity": "serious"})
    assert store.jobs.overall(job_id).reasons == (
        "observation 1 is serious: No main bonding to the gas pipe",)
    store.observations.set_field(observation, "severity", "attention")
    failing = _circuit(store, board_id, dict(RING, polarity="no"), "L2-4")
    assert store.circuits.get(failing)["verdict"] == "fail"
    assert store.jobs.overall(job_id).reasons == ("circuit fails: DB1 / L2-4",)


def test_a_new_revision_keeps_instruments_and_observations(store: Store) -> None:
    from mobile_app.store.demo import DEMO_PIN

    job_id, board_id = _job(store, purpose="periodic", next_inspection="2031-11-24",
                            limitations="Loft not accessible")
    circuit_id = _circuit(store, board_id, RING)
    store.instruments.add(job_id, {"name": "Insulation tester", "serial": "IR-7"})
    observation = store.observations.add(job_id, {"finding": "Label missing", "severity": "note"})
    store.observations.set_circuits(observation, [circuit_id])
    person = store.people.add("Ann Field", "qualified")
    boss = store.people.add("Bo Senior", "supervisor", DEMO_PIN)
    store.review.submit(job_id, person)
    store.review.approve(job_id, boss, DEMO_PIN, reasons_for(store, job_id))
    new_id = store.review.open_revision(job_id, "client asked for a re-test", person)
    new_circuit = store.circuits.of_board(store.boards.of_job(new_id)[0]["id"])[0]["id"]
    copied = store.observations.of_job(new_id)[0]
    assert copied["circuit_ids"] == [new_circuit] and copied["fields"]["finding"]["raw"] == "Label missing"
    assert store.instruments.of_job(new_id)[0]["fields"]["serial"]["raw"] == "IR-7"
    assert store.jobs.get(new_id)["fields"]["limitations"]["raw"] == "Loft not accessible"
    assert store.observations.of_job(job_id)[0]["circuit_ids"] == [circuit_id]


def test_a_store_written_by_the_previous_release_opens_with_all_it_held(tmp_path: Path) -> None:
    """tests/fixtures/store-schema5.sqlite.gz was written by the release before this schema."""
    (tmp_path / STORE_FILE).write_bytes(gzip.decompress((FIXTURES / "store-schema5.sqlite.gz").read_bytes()))
    with Store.open(tmp_path) as store:
        assert store.backup_path is not None and "-v5-" in store.backup_path.name
        assert store.db.conn.execute("PRAGMA user_version").fetchone() == (SCHEMA_VERSION,)
        jobs = sorted(store.jobs.all(), key=lambda j: j["id"])
        assert [(j["client_ref"], j["status"]) for j in jobs] == [("TY-2026-118", "draft"),
                                                                  ("TY-2026-118", "approved")]
        draft, approved = (j["id"] for j in jobs)
        boards = store.boards.of_job(approved)
        assert [b["designation"] for b in boards] == ["DB-1", "DB-2", "DB-3"]
        assert boards[2]["fields"]["ze"]["raw"] == "48 Ω" and boards[2]["fields"]["ra"]["raw"] == ""
        circuits = [c for b in boards for c in store.circuits.of_board(b["id"])]
        assert len(circuits) == 22
        office = store.circuits.get(circuits[1]["id"])
        assert office["fields"]["zs"] == {"raw": "710 mΩ", "value": 0.71, "error": None}
        assert office["fields"]["polarity"] == {"raw": "", "value": None, "error": None}
        assert office["assessment"]["calc_version"] and office["verdict"] in ("pass", "fail", "not-shown")
        rcbo = store.circuits.of_board(store.boards.of_job(draft)[0]["id"])[-1]
        fields = store.circuits.get(rcbo["id"])["fields"]
        assert (fields["device_kind"]["raw"], fields["device_kind"]["value"]) == ("rcbo", "rcbo")
        assert store.instruments.of_job(approved) == [] and store.observations.of_job(approved) == []
        assert store.jobs.overall(approved).outcome == "unsatisfactory"
        audit = store.jobs.audit(approved)
        assert any(a["field"] == "status" and a["new"] == "approved" for a in audit)
        store.observations.add(draft, {"finding": "recorded after the update", "severity": "note"})
        with pytest.raises(ReadOnlyError):
            store.observations.add(approved, {"finding": "too late"})


def test_a_signed_store_of_the_previous_release_keeps_its_approvals(tmp_path: Path) -> None:
    """tests/fixtures/store-schema6.sqlite.gz: approved and signed before the test record came in; the
    new blank fields leave the signed parts as they were."""
    (tmp_path / STORE_FILE).write_bytes(gzip.decompress((FIXTURES / "store-schema6.sqlite.gz").read_bytes()))
    with Store.open(tmp_path) as store:
        assert store.backup_path is not None and "-v6-" in store.backup_path.name
        report = store.integrity.check()
        assert report.ok and report.broken == {}
        assert report.unverified == {2: "Ines Okafor is not enrolled by the firm"}
        approved = store.jobs.get(2)
        assert approved["status"] == "approved"
        assert approved["fields"]["purpose"] == {"raw": "", "value": None, "error": None}
        store.instruments.add(1, {"name": "meter added after the update"})
        assert store.integrity.check().ok
