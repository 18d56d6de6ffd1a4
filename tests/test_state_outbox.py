"""The outbox screen's state: export an approved job into the outbox and list it, without Flet."""

from __future__ import annotations

from pathlib import Path

from mobile_app.state import JobsList, ReviewState
from mobile_app.state.outbox import OutboxState
from mobile_app.store import Store


def test_export_queues_and_lists(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        job_id = JobsList(store).new_job("Outbox test")
        review = ReviewState(store, job_id)
        review.add_supervisor("Ann", "135790")
        review.submit("Sam")
        review.approve("Ann", "135790")
        outbox = OutboxState(store)
        assert outbox.summary() == "0 waiting · 0 sent"
        message = outbox.export_job(job_id)
        assert message.startswith("Exported ")
        rows = outbox.rows()
        assert len(rows) == 1 and not rows[0].sent
        assert "job " + str(job_id) in rows[0].detail
        assert outbox.summary() == "1 waiting · 0 sent"


def test_send_now_without_office_folder_says_so(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        assert OutboxState(store).send_now().startswith("Not sent: ")


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
            review.approve("Ann", "135790")
            outbox = OutboxState(store)
            outbox.export_job(job_id)
            assert SettingsState(store).save_office(server.url, server.user, server.password) == (
                "Office folder saved")
            assert outbox.send_now() == "1 sent, 0 waiting"
            rows = outbox.rows()
            assert rows[0].sent and "sent " in rows[0].detail and rows[0].detail.endswith(" UTC")
    finally:
        server.stop()
