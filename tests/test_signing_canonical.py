"""The canonical form of a document and what an approval covers in it."""

from __future__ import annotations

import copy
import json
import math

import pytest

from mobile_app.signing import KeyFormatError, approved_parts, canonical_bytes, canonical_hash, changed_parts
from mobile_app.signing.canonical import sha256_hex


def test_sha256_is_fips_180s():
    # FIPS 180-2 Appendix B.1: SHA-256("abc").
    assert sha256_hex(b"abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"


def test_canonical_json_sorts_keys_drops_spaces_and_keeps_text_as_utf8():
    value = {"zs": 0.62, "b": [1, 2.0, 1e-05, None, True], "a": {"y": "Ω", "x": "\u00e9\n"}}
    expected = '{"a":{"x":"\u00e9\\n","y":"Ω"},"b":[1,2.0,1e-05,null,true],"zs":0.62}'
    assert canonical_bytes(value) == expected.encode("utf-8")
    assert canonical_hash(value) == sha256_hex(expected.encode("utf-8"))


def test_key_order_and_a_json_round_trip_do_not_change_the_hash():
    value = {"b": {"d": 0.1 + 0.2, "c": 3}, "a": [1.5, "x"]}
    reordered = {"a": [1.5, "x"], "b": {"c": 3, "d": 0.1 + 0.2}}
    assert canonical_hash(value) == canonical_hash(reordered) == canonical_hash(json.loads(json.dumps(value)))


@pytest.mark.parametrize("value", [{"x": math.nan}, {"x": math.inf}, {"x": b"bytes"}])
def test_what_json_cannot_hold_exactly_is_refused(value):
    with pytest.raises(KeyFormatError):
        canonical_bytes(value)


DOC = {
    "schema": "boardside-job", "schema_version": 1, "exported_at": "2026-12-02T07:15:03+00:00",
    "job": {"id": 12, "revision": 1, "status": "approved", "client_ref": "W-1", "approved_by": "Ines Okafor",
            "approved_at": "2026-12-02T07:00:00+00:00", "recorded_by": "Tomasz Brill"},
    "boards": [{"id": 3, "designation": "DB1", "fields": {}, "circuits": [
        {"id": 7, "number": "1", "fields": {"zs": {"raw": "0.62", "value": 0.62, "error": None},
                                            "library_device_id": {"raw": "4", "value": 4, "error": None}},
         "verdict": "pass", "updated_by": 2},
        {"id": 8, "number": "2", "fields": {"zs": {"raw": "0.41", "value": 0.41, "error": None}},
         "verdict": "pass", "updated_by": 2},
    ]}],
    "library_devices": [{"id": 4, "name": "Incomer", "points": [[100, 10], [1000, 0.1]]}],
    "people": [{"id": 2, "name": "Tomasz Brill", "role": "apprentice"}],
    "audit": [{"id": 1, "what": "created"}],
}


def test_parts_name_what_changed():
    approved = approved_parts(DOC)
    assert list(approved) == ["job", "boards/0", "boards/0/circuits/0", "boards/0/circuits/1"]
    changed = copy.deepcopy(DOC)
    changed["boards"][0]["circuits"][1]["fields"]["zs"]["value"] = 0.35
    assert changed_parts(changed, approved) == ["board DB1 circuit 2"]
    changed["boards"][0]["circuits"][1]["verdict"] = "fail"
    changed["job"]["client_ref"] = "W-2"
    assert changed_parts(changed, approved) == ["the job", "board DB1 circuit 2"]


def test_local_ids_export_times_and_the_audit_trail_are_not_covered():
    renumbered = copy.deepcopy(DOC)
    renumbered["job"]["id"] = 99
    renumbered["boards"][0]["id"] = 31
    renumbered["boards"][0]["circuits"][0]["id"] = 71
    renumbered["boards"][0]["circuits"][0]["fields"]["library_device_id"]["value"] = 40
    renumbered["library_devices"][0]["id"] = 40
    renumbered["people"][0]["id"] = 20
    renumbered["boards"][0]["circuits"][0]["updated_by"] = 20
    renumbered["boards"][0]["circuits"][1]["updated_by"] = 20
    renumbered["exported_at"] = "2027-01-01T00:00:00+00:00"
    renumbered["audit"].append({"id": 2, "what": "exported"})
    assert approved_parts(renumbered) == approved_parts(DOC)


def test_the_library_curve_a_circuit_uses_and_who_changed_it_are_covered():
    other_curve = copy.deepcopy(DOC)
    other_curve["library_devices"][0]["points"] = [[100, 5], [1000, 0.05]]
    assert changed_parts(other_curve, approved_parts(DOC)) == ["board DB1 circuit 1"]
    other_person = copy.deepcopy(DOC)
    other_person["people"][0]["name"] = "Rosa Quennell"
    assert changed_parts(other_person, approved_parts(DOC)) == ["board DB1 circuit 1", "board DB1 circuit 2"]


def test_a_removed_circuit_is_named():
    shorter = copy.deepcopy(DOC)
    del shorter["boards"][0]["circuits"][1]
    assert changed_parts(shorter, approved_parts(DOC)) == ["board DB1 circuit 2 (removed)"]
