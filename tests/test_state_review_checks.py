"""The review and settings screens' state without Flet: submitting needs a name; what fails or is
open is listed first and each needs a reason to approve; returning needs the PIN (or passphrase);
the office's roster is loaded from its folder or a file (the firm key pinned once) and a supervisor's
key installed, so the enrolled supervisor approves with the passphrase."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from mobile_app.office.folder import enrol, init_office
from mobile_app.state import ReviewState, SettingsState
from mobile_app.state.integrity import IntegrityNotice
from mobile_app.state.jobs import JobsList
from mobile_app.state.undo import UndoTrail
from mobile_app.store import Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job

PASSPHRASE = "copper earth loop ninety"


@pytest.fixture
def store(tmp_path: Path):
    with Store.open(tmp_path / "device") as opened:
        yield opened


@pytest.fixture(scope="module")
def office(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("office") / "office"
    init_office(folder)
    enrol(folder, "Ines Okafor", PASSPHRASE)
    return folder


def test_submitting_needs_the_recorders_name(store):
    job_id = create_demo_job(store)
    review = ReviewState(store, job_id)
    blank = review.submit("   ")
    assert not blank.ok and blank.message == "Enter your name: the record keeps who recorded the job"
    assert review.status == "draft"
    assert review.submit("Tomasz Brill").ok
    assert store.jobs.get(job_id)["submitted_by"] == next(
        p["id"] for p in store.people.all() if p["name"] == "Tomasz Brill")


def test_failing_and_open_items_first_each_with_its_reason(store):
    job_id = create_demo_job(store)
    review = ReviewState(store, job_id)
    review.submit("Tomasz Brill")
    items = review.items()
    assert items[0].kind == "Fails" and {i.kind for i in items} >= {"Fails", "Not shown", "Observation"}
    reasons = {i.key: "Agreed with the client: remedial work ordered" for i in items[:-1]}
    refused = review.approve("Ines Okafor", DEMO_PIN, reasons)
    assert not refused.ok
    assert refused.message == "Write a reason for each item listed above: 1 without one"
    reasons[items[-1].key] = "Noted for the next inspection"
    assert review.approve("Ines Okafor", DEMO_PIN, reasons).ok
    given = review.reasons_given()
    assert given[-1] == (items[-1].what, "Noted for the next inspection") and len(given) == len(items)
    assert any(f"approved with {items[-1].what}, because: Noted" in line for line in review.history(limit=99))


def test_returning_to_draft_needs_the_pin(store):
    job_id = create_demo_job(store)
    review = ReviewState(store, job_id)
    review.submit("Tomasz Brill")
    no_pin = review.return_to_draft("Ines Okafor", "Measure Zs on circuit 6 again")
    assert not no_pin.ok and no_pin.message == "Enter the supervisor's PIN (or passphrase) to return the job"
    wrong = review.return_to_draft("Ines Okafor", "Measure Zs on circuit 6 again", "1111")
    assert not wrong.ok and wrong.message.startswith("PIN not accepted: wrong PIN")
    assert review.return_to_draft("Ines Okafor", "Measure Zs on circuit 6 again", DEMO_PIN).ok
    assert review.status == "draft" and review.comment == "Measure Zs on circuit 6 again"


def test_the_roster_folder_pins_the_firm_key_and_the_key_file_lets_the_passphrase_approve(store, office):
    settings = SettingsState(store)
    assert settings.firm_key_text().startswith("No firm key pinned yet")
    assert settings.load_roster("") == "Not loaded: enter the roster folder or file"
    assert settings.load_roster(str(office / "nowhere")).endswith("is not a folder or file on this device")
    assert settings.load_roster(str(office / "roster")) == "Enrolled by the office: Ines Okafor"
    assert settings.firm_key_text().startswith("Firm key pinned: ")
    assert settings.supervisors_text() == "Ines Okafor (enrolled by the office)"
    key_file = next((office / "keys").glob("Ines-Okafor-*.json"))
    assert settings.install_key(str(key_file)) == (
        "Key of Ines Okafor installed: Ines Okafor approves with the passphrase")
    job_id = create_demo_job(store)
    review = ReviewState(store, job_id)
    review.submit("Tomasz Brill")
    reasons = {i.key: "Accepted by the client in writing" for i in review.items()}
    outcome = review.approve("Ines Okafor", PASSPHRASE, reasons)
    assert outcome.ok and outcome.message == "Approved by Ines Okafor"
    assert IntegrityNotice(store).mark(job_id) is None  # verified: no mark


def test_one_file_of_the_roster_and_another_firms_key(store, office, tmp_path):
    settings = SettingsState(store)
    assert settings.load_roster(str(office / "roster" / "firm-key.json")) == "Firm key pinned"
    entry = next(p for p in (office / "roster").glob("*.json") if p.name != "firm-key.json")
    assert settings.load_roster(str(entry)) == "Enrolled by the office: Ines Okafor"
    other = tmp_path / "other-office"
    init_office(other)
    refused = settings.load_roster(str(other / "roster" / "firm-key.json"))
    assert refused == "Not loaded: another firm key is already pinned on this device"
    broken = tmp_path / "broken.json"
    broken.write_text("{not json", encoding="utf-8")
    assert settings.install_key(str(broken)).startswith("Not installed: broken.json cannot be read")
    assert json.loads((office / "roster" / "firm-key.json").read_text())  # left as it was


def test_a_draft_job_deleted_from_the_list_comes_back_on_undo(store):
    jobs = JobsList(store)
    job_id = jobs.new_job("To delete")
    undo = UndoTrail(store)
    undo.enter("/")
    assert undo.delete("job", job_id).message == "Deleted job To delete"
    assert job_id not in [row.id for row in jobs.rows()]
    assert undo.undo().message == "Put back job To delete"
    assert job_id in [row.id for row in jobs.rows()]


def test_submit_starts_with_the_name_this_device_records_under(store):
    from mobile_app.state.recorder import Recorder

    job_id = JobsList(store).new_job("Named")
    assert ReviewState(store, job_id).recorder_name == ""
    Recorder(store).set("Sam Hale")
    review = ReviewState(store, job_id)
    assert review.recorder_name == "Sam Hale"
    assert review.submit(review.recorder_name).ok
    assert store.jobs.get(job_id)["status"] == "submitted"


def test_the_heading_counts_the_items_in_words():
    from mobile_app.state.review import check_first

    assert check_first(1) == "Check first: 1 item fails or is open"
    assert check_first(4) == "Check first: 4 items fail or are open"
