"""The jobs screen's notice of a store altered outside the app, on a real store file."""

from __future__ import annotations

import sqlite3
from pathlib import Path

from approving import reasons_for

from mobile_app.state.integrity import IntegrityNotice
from mobile_app.store import Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job


def test_a_status_set_to_approved_in_the_file_is_announced_and_marked(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        job_id = create_demo_job(store)
        signed = create_demo_job(store)
        people = {p["name"]: p["id"] for p in store.people.all()}
        store.review.submit(signed, people["Rosa Quennell"])
        store.review.approve(signed, people["Ines Okafor"], DEMO_PIN, reasons_for(store, signed))
        notice = IntegrityNotice(store)
        assert notice.banner is None and notice.mark(job_id) is None
        assert notice.mark(signed) == "unverified: Ines Okafor is not enrolled by the firm"
        path = store.path
    conn = sqlite3.connect(path)
    conn.execute("UPDATE jobs SET status = 'approved' WHERE id = ?", (job_id,))
    conn.commit()
    conn.close()
    with Store.open(tmp_path) as store:
        notice = IntegrityNotice(store)
        expected = f"This store was altered: approved job {job_id} no longer matches its approval."
        assert notice.banner == expected
        assert notice.mark(job_id) == "altered: approved without a signature"


def test_a_pending_notice_says_nothing_until_it_checks(tmp_path: Path) -> None:
    """The browser build's first jobs list is sent before the check: nothing is said until `check`
    runs, then the same banner and mark as a notice that checked at once."""
    with Store.open(tmp_path) as store:
        job_id = create_demo_job(store)
        path = store.path
    conn = sqlite3.connect(path)
    conn.execute("UPDATE jobs SET status = 'approved' WHERE id = ?", (job_id,))
    conn.commit()
    conn.close()
    with Store.open(tmp_path) as store:
        pending = IntegrityNotice.pending(store)
        assert pending.banner is None and pending.mark(job_id) is None
        assert not pending.check().ok
        assert pending.banner == IntegrityNotice(store).banner
        assert pending.mark(job_id) == "altered: approved without a signature"
