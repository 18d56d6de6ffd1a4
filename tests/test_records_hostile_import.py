"""Hostile and malformed job documents: each gives the one-line DocumentError naming where it is wrong,
and the store it was imported into is left exactly as it was. Memory during an import stays within
4 times the document's size (measured with tracemalloc; figures in tests/bench_import.py).

The JSON rules are RFC 8259's (no NaN or Infinity, UTF-8 text); the limits are the project's own
(mobile_app/store/document_check.py, mobile_app/export/json_load.py).
"""

from __future__ import annotations

import copy
import hashlib
import json
import tracemalloc
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest
from approving import reasons_for
from bench_export import build_job

from mobile_app.export import import_job_json, job_json_bytes
from mobile_app.export.json_load import MAX_DOCUMENT_BYTES
from mobile_app.store import DocumentError, Store
from mobile_app.store.demo import create_demo_job
from mobile_app.store.document_check import MAX_DEPTH, MAX_TEXT_CHARS


@pytest.fixture(scope="module")
def exported(tmp_path_factory) -> dict[str, Any]:
    """The demo job (approved: with people, review, library device, audit) as a document."""
    folder = tmp_path_factory.mktemp("site")
    with Store.open(folder) as store:
        job_id = create_demo_job(store)
        people = {p["name"]: p["id"] for p in store.people.all()}
        store.review.submit(job_id, people["Rosa Quennell"])
        store.review.approve(job_id, people["Ines Okafor"], "2468", reasons_for(store, job_id))
        return json.loads(job_json_bytes(store.documents.export(job_id)))


@pytest.fixture(scope="module")
def office(tmp_path_factory):
    """A store that already holds a job, into which every malformed document is imported."""
    with Store.open(tmp_path_factory.mktemp("office")) as store:
        create_demo_job(store)
        yield store


def state(store: Store) -> str:
    """A digest of everything in the store's database."""
    return hashlib.sha256("\n".join(store.db.conn.iterdump()).encode()).hexdigest()


def at(path: str) -> Callable[[dict[str, Any]], tuple[Any, str]]:
    """(container, key) of a dotted path such as `boards.0.circuits.0.fields`."""
    def find(doc: dict[str, Any]) -> tuple[Any, str | int]:
        *parents, last = path.split(".")
        node: Any = doc
        for part in parents:
            node = node[int(part)] if part.isdigit() else node[part]
        return node, int(last) if last.isdigit() else last
    return find


def put(path: str, value: Any) -> Callable[[dict[str, Any]], None]:
    def change(doc: dict[str, Any]) -> None:
        node, key = at(path)(doc)
        node[key] = value
    return change


def drop(path: str) -> Callable[[dict[str, Any]], None]:
    def change(doc: dict[str, Any]) -> None:
        node, key = at(path)(doc)
        del node[key]
    return change


def nest(levels: int) -> Any:
    value: Any = 1
    for _ in range(levels):
        value = {"a": value}
    return value


C0 = "boards.0.circuits.0"
W0 = "boards[0].circuits[0]"
# (name, change to a good document, where the message must point, words it must hold)
CHANGES: list[tuple[str, Callable[[dict[str, Any]], None], str, str]] = [
    ("foreign schema", put("schema", "other"), "", "schema"),
    ("newer version", put("schema_version", 3), "", "schema_version 3"),
    ("version as text", put("schema_version", "1"), "", "schema_version '1'"),
    ("version as true", put("schema_version", True), "schema_version", "not true or false"),
    ("no job", drop("job"), "job", "is missing"),
    ("job a list", put("job", []), "job", "must be an object, not a list"),
    ("no boards", drop("boards"), "boards", "is missing"),
    ("boards an object", put("boards", {}), "boards", "must be a list, not an object"),
    ("board a string", put("boards.0", "DB1"), "boards[0]", "must be an object, not text"),
    ("board without fields", drop("boards.0.fields"), "boards[0].fields", "is missing"),
    ("circuits as text", put("boards.0.circuits", "many"), "boards[0].circuits", "must be a list"),
    ("circuit null", put(C0, None), W0, "must be an object, not null"),
    ("fields a list", put(f"{C0}.fields", []), f"{W0}.fields", "must be an object, not a list"),
    ("field as bare text", put(f"{C0}.fields.zs", "0.62"), f"{W0}.fields.zs", "must be an object"),
    ("raw a list", put(f"{C0}.fields.zs.raw", [0.62]), f"{W0}.fields.zs.raw",
     "must be text, a number or null, not a list"),
    ("raw overlong", put(f"{C0}.fields.zs.raw", "9" * (MAX_TEXT_CHARS + 1)), f"{W0}.fields.zs.raw",
     f"longer than {MAX_TEXT_CHARS}"),
    ("error a number", put(f"{C0}.fields.zs.error", 3), f"{W0}.fields.zs.error", "must be text or null"),
    ("assessment text", put(f"{C0}.assessment", "pass"), f"{W0}.assessment", "an object or null"),
    ("circuit id text", put(f"{C0}.id", "x"), f"{W0}.id", "must be a whole number or null"),
    ("updated_by a fraction", put(f"{C0}.updated_by", 1.5), f"{W0}.updated_by", "whole number"),
    ("verdict unknown", put(f"{C0}.verdict", "ok"), "circuit.verdict", "is not one of"),
    ("job without fields", drop("job.fields"), "job.fields", "is missing"),
    ("revision a fraction", put("job.revision", 1.5), "job.revision", "must be a whole number"),
    ("revision as text", put("job.revision", "2"), "job.revision", "must be a whole number"),
    ("revision zero", put("job.revision", 0), "job.revision", "is not a whole number from 1"),
    ("status unknown", put("job.status", "signed"), "job.status", "is not one of"),
    ("approved by nobody", put("job.approved_by", None), "approved job", "needs approved_by"),
    ("comment a number", put("job.review_comment", 7), "job.review_comment", "text or null"),
    ("person's role", put("people.0.role", "boss"), "people.role", "'boss'"),
    ("person's id text", put("people.0.id", "one"), "people[0].id", "whole number"),
    ("person unnamed", drop("people.0.name"), "people[0].name", "is missing"),
    ("points as text", put("library_devices.0.points", "many"), "library_devices[0].points",
     "must be a list"),
    ("a point of text", put("library_devices.0.points.0", ["a", 1]), "library_devices[0].points[0][0]",
     "must be a number"),
    ("audit time null", put("audit.0.when", None), "audit[0].when", "must be text, not null"),
    ("audit entry a number", put("audit.0", 5), "audit[0]", "must be an object, not a whole number"),
    ("audit without entity", drop("audit.0.entity"), "audit[0].entity", "is missing"),
    ("cautions as text", put("cautions", "careful"), "cautions", "must be a list"),
    ("a key of 300 characters", put("job." + "k" * 300, 1), "job", "not a name of at most 200"),
    ("a number key", put("job.fields", {1: {"raw": "x"}}), "job.fields", "not a name"),
    ("nested too deep", put("job.extra", nest(MAX_DEPTH + 5)), "job.extra.a.a", "nested deeper"),
    ("nested thousands deep", put("job.extra", nest(3000)), "job.extra.a.a", "nested deeper"),
    ("huge whole number", put("job.id", 10**30), "job.id", "beyond"),
    ("huge negative reading", put(f"{C0}.fields.zs.value", -1e300), f"{W0}.fields.zs.value", "beyond"),
    ("lone surrogate", put("job.fields.client_ref.raw", "A\ud800B"), "job.fields.client_ref.raw",
     "broken character"),
]
# (name, bytes from a good document's bytes, words the message must hold)
BYTES: list[tuple[str, Callable[[bytes], bytes], str]] = [
    ("not JSON", lambda good: b"{not json", "not valid JSON"),
    ("empty", lambda good: b"", "not valid JSON"),
    ("cut in half", lambda good: good[: len(good) // 2], "not valid JSON"),
    ("trailing garbage", lambda good: good + b" xyz", "not valid JSON: Extra data"),
    ("a list", lambda good: b"[1, 2]", "must be a JSON object"),
    ("a string", lambda good: b'"boardside-job"', "must be a JSON object"),
    ("NaN", lambda good: good.replace(b'"revision": 1', b'"revision": NaN', 1),
     "NaN is not a JSON number"),
    ("Infinity", lambda good: good.replace(b'"revision": 1', b'"revision": -Infinity', 1),
     "-Infinity is not a JSON number"),
    ("overflowing float", lambda good: good.replace(b'"revision": 1', b'"revision": 1e999', 1),
     "job.revision: is a number beyond"),
    ("5000 digits", lambda good: good.replace(b'"revision": 1', b'"revision": ' + b"9" * 5000, 1),
     "not valid JSON: Exceeds the limit"),
    ("not UTF-8", lambda good: good.replace(b"Tannery", b"T\xc3\x28nnery", 1), "not valid JSON"),
    ("UTF-16", lambda good: good.decode().encode("utf-16"), "not valid JSON: not UTF-8"),
    ("nested beyond the parser", lambda good: good.replace(
        b'"revision": 1', b'"revision": ' + b'{"a": ' * 3000 + b"1" + b"}" * 3000, 1),
     "not valid JSON: nested too deep"),
    ("over the size limit", lambda good: good[:-1] + b', "pad": "' + b"x" * MAX_DOCUMENT_BYTES + b'"}',
     "at most 32 MB can be imported"),
    ("a million empty objects", lambda good: b'{"x": [' + b"{}," * 1_000_000 + b"{}]}",
     "far more than a job document"),
    ("deep brackets", lambda good: b"[" * 100_000 + b"]" * 100_000, "far more than a job document"),
]


@pytest.mark.parametrize(("name", "change", "where", "words"), CHANGES, ids=[c[0] for c in CHANGES])
def test_a_malformed_document_is_refused_where_it_is_wrong(exported, office, name, change, where,
                                                           words) -> None:
    doc = copy.deepcopy(exported)
    change(doc)
    before = state(office)
    with pytest.raises(DocumentError) as caught:
        office.documents.import_(doc)
    message = str(caught.value)
    assert message.startswith("not a readable job document: ") and "\n" not in message
    assert where in message and words in message, message
    assert state(office) == before


@pytest.mark.parametrize(("name", "make", "words"), BYTES, ids=[b[0] for b in BYTES])
def test_malformed_bytes_are_refused_with_one_line(exported, office, name, make, words) -> None:
    data = make(json.dumps(exported, ensure_ascii=False).encode())
    before = state(office)
    with pytest.raises(DocumentError) as caught:
        import_job_json(office, data)
    message = str(caught.value)
    assert message.startswith("not a readable job document: ") and "\n" not in message
    assert words in message, message
    assert state(office) == before


def test_the_corpus_holds_at_least_44_malformed_documents() -> None:
    assert len(CHANGES) + len(BYTES) >= 44


def test_a_document_written_with_escapes_reads_the_same(exported, tmp_path: Path) -> None:
    """RFC 8259 section 7: "\\u00e9" and "é" are the same text."""
    escaped = json.dumps(exported, ensure_ascii=True).encode()
    plain = json.dumps(exported, ensure_ascii=False).encode()
    assert escaped != plain
    with Store.open(tmp_path) as store:
        ids = [import_job_json(store, escaped), import_job_json(store, plain)]
        docs = [store.documents.export(job_id) for job_id in ids]
    circuits = [[(c["fields"], c["assessment"]) for b in d["boards"] for c in b["circuits"]]
                for d in (*docs, exported)]
    assert circuits[0] == circuits[1] == circuits[2]
    assert any("Ω" in json.dumps(c, ensure_ascii=False) for c in circuits[0])


def test_memory_during_an_import_stays_within_4_times_the_document(tmp_path: Path) -> None:
    with Store.open(tmp_path / "site") as site:
        data = job_json_bytes(site.documents.export(build_job(site)))
    with Store.open(tmp_path / "office") as office:
        tracemalloc.start()
        try:
            import_job_json(office, data)
            _, peak = tracemalloc.get_traced_memory()
        finally:
            tracemalloc.stop()
    assert len(data) > 3_000_000  # a 500-circuit job
    assert peak <= 4 * len(data), f"{peak / len(data):.2f} times the document"
