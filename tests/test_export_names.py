"""Bundle names fit every common file system and WebDAV server, however long the job's reference.

Budgets (see mobile_app/export/names.py): 255 bytes per name on ext4, APFS, NTFS; Windows MAX_PATH
260 characters for a whole path on the office PC (from memory).
"""

from __future__ import annotations

import hashlib
from pathlib import Path

import pytest
from sync_server import DavServer, tree_hashes

from mobile_app.export import export_bundle
from mobile_app.export.bundle import bundle_base_name
from mobile_app.export.names import NAME_BUDGET, fit_name, share, shorten
from mobile_app.store import Store
from mobile_app.sync import SyncTarget, sync_once
from mobile_app.sync.outbox import Outbox

# 300 characters of reference and board name between them, Latin with accents, Greek, Cyrillic, CJK
REFERENCE = ("Société Générale d'Électricité — Ζώνη Βιομηχανίας — Київська Промислова Зона — "
             "東京第三工場 — Łódź Straße Ørsted Þórsmörk " * 3)[:200]
BOARD = ("Tableau général basse tension — Πίνακας διανομής — Щит розподільчий — 配電盤 " * 2)[:100]
MAX_PATH_BELOW_OFFICE = 151


def test_the_readable_part_is_shortened_and_the_unique_part_kept() -> None:
    assert len(REFERENCE) + len(BOARD) == 300
    doc = {"exported_at": "2026-12-02T07:00:00+00:00", "job": {"id": 123456, "revision": 12,
                                                              "client_ref": REFERENCE}}
    name = bundle_base_name(doc, BOARD)
    assert len(name) <= NAME_BUDGET - len("-999")
    assert name == "job123456-Societe-Gener-rev12-board-Tableau-gener-2026-12-02"
    assert name.isascii() and "--" not in name


def test_names_of_other_scripts_alone_keep_their_unique_part() -> None:
    doc = {"exported_at": "2026-12-02T07:00:00+00:00",
           "job": {"id": 7, "revision": 1, "client_ref": "Ζώνη Βιομηχανίας"}}
    assert bundle_base_name(doc, "Щит") == "job7-rev1-board-unnamed-2026-12-02"


@pytest.mark.parametrize(("lengths", "budget", "expected"), [
    ([10, 5], 20, [10, 5]),
    ([100, 5], 20, [15, 5]),
    ([100, 100], 20, [10, 10]),
    ([3, 100, 100], 21, [3, 9, 9]),
])
def test_long_parts_are_cut_to_one_length_short_ones_kept(lengths, budget, expected) -> None:
    assert share(lengths, budget) == expected


def test_shortening_prefers_a_word_boundary_near_the_end() -> None:
    assert shorten("Tannery-Yard-Harlow", 15) == "Tannery-Yard"
    assert shorten("Tanneryyardharlow", 10) == "Tanneryyar"
    assert fit_name([("job1", False), ("x" * 500, True), ("2026-12-02", False)], 30) == (
        "job1-" + "x" * 14 + "-2026-12-02")


@pytest.fixture
def dav(tmp_path):
    server = DavServer(tmp_path / "server", tmp_path / "requests.log")
    yield server
    server.stop()


def test_a_300_character_reference_and_board_name_reach_the_office_whole(tmp_path: Path, dav) -> None:
    store = Store.open(tmp_path / "data")
    job_id = store.jobs.create({"client_ref": REFERENCE, "system": "TN-C-S"})
    board_id = store.boards.add(job_id, BOARD)
    store.circuits.add(board_id, "1", "Ring final")
    outbox = Outbox(store.db)
    bundles = [export_bundle(store, job_id, tmp_path / "exports", board_id=board_id)
               for _ in range(3)]  # the second and third take -2 and -3
    ids = [outbox.enqueue(b.path, job_id, 1) for b in bundles]
    assert [b.name[-2:] for b in bundles[1:]] == ["-2", "-3"]
    for bundle in bundles:
        assert len(bundle.name) <= NAME_BUDGET
        assert all(len(p.name) <= NAME_BUDGET + len(".json") for p in bundle.path.iterdir())
    dav.start()
    report = sync_once(store, SyncTarget(dav.url, dav.user, dav.password), force=True)
    assert report.sent == ids and report.error is None
    office = dav.root / "office"
    for entry_id, bundle in zip(ids, bundles, strict=True):
        row = outbox.get(entry_id)
        assert row["status"] == "sent" and row["remote_path"].startswith(bundle.name)
        local = {p.name: hashlib.sha256(p.read_bytes()).hexdigest() for p in bundle.path.iterdir()}
        assert tree_hashes(office / row["remote_path"]) == local  # the same names, byte-identical
    paths = [str(p.relative_to(office)) for p in office.rglob("*") if p.is_file()]
    assert len(paths) == 12 and max(map(len, paths)) <= MAX_PATH_BELOW_OFFICE
    assert all(".c" != Path(p).name[:2] and Path(p).suffix in (".json", ".csv", ".pdf") for p in paths)
    store.close()
