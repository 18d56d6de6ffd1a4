"""The outbox screen's state: export an approved job into the outbox and list it, without Flet; with
no office folder it says so and names no next try; a second export of a revision replaces the waiting
one; a sent export says when and where it went."""

from __future__ import annotations

from pathlib import Path

from approving import reasons_for

from mobile_app.state import JobsList, ReviewState
from mobile_app.state.outbox import OutboxState
from mobile_app.store import Store


def test_export_queues_and_lists(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        job_id = JobsList(store).new_job("Outbox test")
        review = ReviewState(store, job_id)
        review.add_supervisor("Ann", "135790")
        review.submit("Sam")
        review.approve("Ann", "135790", reasons_for(store, job_id))
        outbox = OutboxState(store)
        assert outbox.summary() == "0 waiting · 0 sent"
        message = outbox.export_job(job_id)
        assert message.startswith("Exported ")
        rows = outbox.rows()
        assert len(rows) == 1 and not rows[0].sent
        assert "job " + str(job_id) in rows[0].detail
        assert outbox.summary() == "1 waiting · 0 sent"


def _approved(store: Store, name: str) -> int:
    job_id = JobsList(store).new_job(name)
    review = ReviewState(store, job_id)
    review.add_supervisor("Ann", "135790")
    review.submit("Sam")
    review.approve("Ann", "135790", reasons_for(store, job_id))
    return job_id


def test_without_an_office_folder_it_says_so_plainly(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        outbox = OutboxState(store)
        assert outbox.send_now() == "Nothing waits to be sent"
        outbox.export_job(_approved(store, "No folder"))
        assert not outbox.configured and outbox.notice == "No office folder set"
        message = outbox.send_now()
        assert message == "Not sent: no office folder set. Set the office folder in Settings first."
        row = outbox.rows()[0]
        text = " ".join(row.lines)
        assert "waits for an office folder" in text
        assert "next try" not in text and "sync_url" not in text and "sync_url" not in message
        assert "UTC" not in row.when or row.when.endswith("UTC")  # local time, its zone named


def test_a_second_export_of_a_revision_replaces_the_waiting_one(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        job_id = _approved(store, "Twice")
        outbox = OutboxState(store)
        assert outbox.export_job(job_id).endswith("to the outbox")
        first = outbox.rows()[0].id
        message = outbox.export_job(job_id)
        assert message.endswith("it replaces this revision's export that was waiting")
        rows = outbox.rows()
        assert len(rows) == 1 and rows[0].id != first and outbox.summary() == "1 waiting · 0 sent"
        replaced = outbox.outbox.get(first)
        assert replaced["status"] == "replaced" and replaced["replaced_by"] == rows[0].id
        other = _approved(store, "Another job")
        outbox.export_job(other)
        assert outbox.summary() == "2 waiting · 0 sent"


def test_send_now_to_a_real_webdav_folder(tmp_path: Path) -> None:
    from sync_server import DavServer

    from mobile_app.state import SettingsState

    server = DavServer(tmp_path / "server", tmp_path / "requests.log").start()
    try:
        with Store.open(tmp_path / "data") as store:
            job_id = JobsList(store).new_job("Sync test")
            review = ReviewState(store, job_id)
            review.add_supervisor("Ann", "135790")
            review.submit("Sam")
            review.approve("Ann", "135790", reasons_for(store, job_id))
            outbox = OutboxState(store)
            outbox.export_job(job_id)
            assert SettingsState(store).save_office(server.url, server.user, server.password) == (
                "Office folder saved")
            assert outbox.configured and outbox.notice is None
            assert outbox.send_now() == "1 sent, 0 waiting"
            rows = outbox.rows()
            remote = outbox.outbox.get(rows[0].id)["remote_path"]
            assert rows[0].sent and rows[0].when.startswith("sent ")
            assert rows[0].where == f"{server.url.rstrip('/')}/{remote}/"
            assert (server.root / "office" / remote).is_dir()  # where it says it went
            outbox.export_job(job_id)  # exported again after it was sent: a new export waits
            assert outbox.summary() == "1 waiting · 1 sent"
    finally:
        server.stop()
