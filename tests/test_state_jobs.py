"""Jobs list, job screen, review, settings and the device library draft, without Flet."""

from __future__ import annotations

from pathlib import Path

import pytest
from approving import reasons_for

from mobile_app.state import CurveDraft, JobScreen, JobsList, ReviewState, SettingsState, Walk
from mobile_app.state.jobs import demo_if_empty, ensure_demo
from mobile_app.store import Store


@pytest.fixture
def store(tmp_path: Path):
    with Store.open(tmp_path) as opened:
        yield opened


def test_new_job_uses_settings_defaults_and_has_a_board(store) -> None:
    SettingsState(store).set("default_system", "TT")
    job = JobScreen(store, JobsList(store).new_job("Ref 7", "9 Quay"))
    supply = {f.spec.name: f for f in job.supply_fields()}
    assert supply["system"].raw == "TT"
    assert supply["u0"].parsed_text == "= 230 V"
    assert [b.designation for b in job.boards()] == ["DB1"]


def test_search_and_failing_counts(store) -> None:
    jobs = JobsList(store)
    job = JobScreen(store, jobs.new_job("Harbour office"))
    jobs.new_job("Bakery")
    walk = Walk(store, job.add_circuit(job.boards()[0].id))
    for name, raw in (("device_curve", "B"), ("device_rating", "32"), ("line_csa", "2.5"),
                      ("cpc_csa", "1.5"), ("zs", "2.0")):
        walk.set_field(name, raw)
    jobs.search = "harbour"
    rows = jobs.rows()
    assert [r.title for r in rows] == ["Harbour office"]
    assert rows[0].failing == 1 and rows[0].status_word == "Draft"
    assert rows[0].summary == "1 circuit · 1 failing"
    circuit = job.boards()[0].circuits[0]
    assert circuit.mark.word == "FAIL"


def test_job_field_error_keeps_text(store) -> None:
    job = JobScreen(store, JobsList(store).new_job("Supply test"))
    field = job.set_field("u0", "230 banana")
    assert field.raw == "230 banana"
    assert field.message is not None and field.message.startswith("U0: ")


def test_review_submit_wrong_pin_then_approve(store) -> None:
    job_id = JobsList(store).new_job("Review test")
    review = ReviewState(store, job_id)
    assert review.add_supervisor("Ann Supervisor", "135790").ok
    assert review.submit("Sam").ok
    assert review.status_word == "In review"
    assert [item.what for item in review.items()] == ["board DB1 has no circuit"]
    unanswered = review.approve("Ann Supervisor", "135790")
    assert not unanswered.ok
    assert unanswered.message == "Write a reason for each item listed above: 1 without one"
    reasons = reasons_for(store, job_id)
    wrong = review.approve("Ann Supervisor", "000000", reasons)
    assert not wrong.ok and wrong.message.startswith("PIN not accepted")
    assert not review.approve("Nobody", "135790", reasons).ok
    assert review.approve("ann supervisor", "135790", reasons).ok
    assert review.status == "approved"
    assert JobScreen(store, job_id).read_only
    assert any("Approved" in line for line in review.history())


def test_return_needs_a_comment(store) -> None:
    job_id = JobsList(store).new_job("Return test")
    review = ReviewState(store, job_id)
    review.add_supervisor("Ann", "135790")
    review.submit("Sam")
    assert review.return_to_draft("Ann", "  ", "135790").message.startswith("Say what needs changing")
    no_pin = review.return_to_draft("Ann", "Circuit 3 needs R1+R2")
    assert no_pin.message.startswith("Enter the supervisor's PIN")
    assert review.return_to_draft("Ann", "Circuit 3 needs R1+R2", "135790").ok
    assert review.status == "draft"


def test_settings_reject_bad_values_and_keep_text(store) -> None:
    settings = SettingsState(store)
    view = settings.set("final_circuit_max_a", "40")
    assert view.value == "40" and view.message == "final-circuit scope must be 32 or 63 A"
    assert settings.set("final_circuit_max_a", "63").message is None
    assert SettingsState(store).get("final_circuit_max_a") == "63"
    assert settings.save_office("http://office.example/dav", "me", "pw").startswith("Not saved")


def test_curve_draft_errors_and_preview(store) -> None:
    draft = CurveDraft(name="Test MCCB")
    draft.set_cell(0, "current", "200")
    draft.set_cell(0, "time", "100 s")
    draft.set_cell(1, "current", "1 kA")
    draft.set_cell(1, "time", "200 s")
    assert draft.problem() is not None and draft.problem().startswith("Times must fall")
    assert draft.preview() is None
    draft.set_cell(1, "time", "80 ms")
    draft.set_cell(2, "current", "lots")
    assert draft.problem() is not None and draft.problem().startswith("Point 3: Current")
    draft.set_cell(2, "current", "")
    assert draft.problem() is None
    assert draft.preview() is not None
    assert draft.save(store) is not None
    assert [d["name"] for d in store.library.all()] == ["Test MCCB"]


def test_demo_only_when_empty_and_found_again(store) -> None:
    first = demo_if_empty(store)
    assert first is not None
    assert demo_if_empty(store) is None
    assert ensure_demo(store) == first


def test_settings_check_supply_defaults(store) -> None:
    settings = SettingsState(store)
    view = settings.set("default_u0", "230 banana")
    assert view.message is not None and view.message.startswith("U0: ")
    assert settings.set("default_u0", "240 V").message is None
    assert settings.job_defaults()["u0"] == "240 V"


def test_sync_time_limits_are_settings_the_sync_reads(store) -> None:
    from mobile_app.sync import SyncLimits

    settings = SettingsState(store)
    assert (settings.get("sync_run_limit_s"), settings.get("sync_bundle_limit_s")) == ("600", "180")
    assert SyncLimits.of(store) == SyncLimits(run_s=600.0, bundle_s=180.0)  # the same defaults
    view = settings.set("sync_run_limit_s", "2")
    assert view.message == "a time limit is a number of seconds from 10 to 86400"
    assert settings.set("sync_bundle_limit_s", "45").message is None
    assert SyncLimits.of(store) == SyncLimits(run_s=600.0, bundle_s=45.0)


def test_library_rows_list_saved_curves(store) -> None:
    from mobile_app.state.library import library_rows

    store.library.add("MCCB 250", [(500.0, 20.0), (3000.0, 0.02)], rating_a=250.0)
    (row,) = library_rows(store)
    assert (row.name, row.detail) == ("MCCB 250", "2 points · In 250 A")


def test_returned_comment_and_new_revision(store) -> None:
    job_id = JobsList(store).new_job("Revision test")
    review = ReviewState(store, job_id)
    review.add_supervisor("Ann", "135790")
    review.submit("Sam")
    review.return_to_draft("Ann", "Add R1+R2 on circuit 2", "135790")
    assert review.comment == "Add R1+R2 on circuit 2"
    review.submit("Sam")
    review.approve("Ann", "000000", reasons_for(store, job_id))
    review.approve("Ann", "135790", reasons_for(store, job_id))
    assert any("PIN refused · Ann" in line for line in review.history())
    outcome, new_id = review.open_revision("  ", "Sam")
    assert not outcome.ok and new_id is None
    outcome, new_id = review.open_revision("Circuit 4 replaced", "Sam")
    assert outcome.ok and new_id is not None
    assert ReviewState(store, new_id).status == "draft"
    assert ReviewState(store, job_id).status == "approved"


def test_status_filter(store) -> None:
    jobs = JobsList(store)
    first = jobs.new_job("First")
    jobs.new_job("Second")
    review = ReviewState(store, first)
    review.submit("Sam")
    jobs.status = "submitted"
    assert [r.title for r in jobs.rows()] == ["First"]
    assert jobs.rows()[0].status_word == "In review"
    jobs.status = "draft"
    assert [r.title for r in jobs.rows()] == ["Second"]
    jobs.status = "all"
    assert len(jobs.rows()) == 2


def test_review_summary_counts(store) -> None:
    job_id = ensure_demo(store)
    summary = ReviewState(store, job_id).summary()
    assert summary.startswith("24 circuits · ") and "failing" in summary and "not shown" in summary


def test_a_damaged_store_is_announced_and_its_readable_jobs_recovered(tmp_path) -> None:
    from damage import overwrite_root_page

    from mobile_app.state.recovery import Recovery
    from mobile_app.store import Store
    from mobile_app.store.core import STORE_FILE
    from mobile_app.store.demo import create_demo_job

    with Store.open(tmp_path) as store:
        create_demo_job(store)
    overwrite_root_page(tmp_path / STORE_FILE, "audit")
    with Store.open(tmp_path) as store:
        recovery = Recovery(store.recovered)
        assert recovery.visible and "could not be read" in recovery.message
        assert store.jobs.all() == []
        said = recovery.recover(store)
        assert said.startswith("Recovered 1 job (24 circuits) from ") and said.endswith(".sqlite.")
        assert [job["client_ref"] for job in store.jobs.all()] == ["TY-2026-118"]
        assert not recovery.visible


def test_changing_the_final_circuit_scope_reassesses_draft_jobs(tmp_path) -> None:
    # A gG 40 A final circuit: beyond a 32 A scope it takes 5 s (IEC 60364-4-41 411.3.2.3, max Zs
    # 1.3 Ω, BS 7671:2018 Table 41.4); within a 63 A scope 0.4 s (Table 41.1, max Zs 0.75 Ω, Table 41.2).
    from mobile_app.state.settings import SettingsState
    from mobile_app.store import Store

    with Store.open(tmp_path) as store:
        job = store.jobs.create({"client_ref": "S-1", "system": "TN-S"})
        board = store.boards.add(job, "DB1")
        circuit = store.circuits.add(board, "1", "cooker")
        for name, raw in [("role", "final"), ("device_kind", "fuse-gg"), ("device_rating", "40"),
                          ("line_csa", "10"), ("cpc_csa", "4"), ("zs", "1.0")]:
            store.circuits.set_field(circuit, name, raw)
        settings = SettingsState(store)
        settings.set("final_circuit_max_a", "32")
        assert store.circuits.get(circuit)["assessment"]["disconnection_ok"] is True
        settings.set("final_circuit_max_a", "63")
        assert store.circuits.get(circuit)["verdict"] == "fail"


def test_a_big_job_folds_its_boards_with_their_counts(store) -> None:
    # common practice: a list of hundreds of rows is no way to find one; the folded board says
    # how many circuits it holds and how many fail or are not shown.
    from mobile_app.state.jobs import FOLD_OVER

    job = JobScreen(store, JobsList(store).new_job("Big"))
    board = job.boards()[0].id
    walk = Walk(store, job.add_circuit(board))
    for name, raw in (("device_curve", "B"), ("device_rating", "32"), ("line_csa", "2.5"),
                      ("cpc_csa", "1.5"), ("zs", "2.0")):
        walk.set_field(name, raw)
    with store.batch():
        for number in range(2, FOLD_OVER + 1):
            store.circuits.add(board, str(number))
    views = job.boards()
    assert views[0].summary == f"{FOLD_OVER} circuits · 1 failing · {FOLD_OVER - 1} not shown"
    assert not job.folds(views)
    store.circuits.add(board, str(FOLD_OVER + 1))
    assert job.folds(job.boards())
