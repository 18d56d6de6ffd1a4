"""Roster entries: the firm's signature over a supervisor's name, key and dates."""

from __future__ import annotations

import datetime
import json

import pytest

from mobile_app.signing import (
    BadSignatureError,
    KeyFormatError,
    RosterError,
    entry_from_dict,
    generate_key_pair,
    sign_entry,
    verify_entry,
)

START = datetime.datetime(2026, 12, 1, 8, 0, tzinfo=datetime.UTC)
END = START + datetime.timedelta(days=365)
DURING = START + datetime.timedelta(days=30)


@pytest.fixture(scope="module")
def firm():
    return generate_key_pair()


@pytest.fixture(scope="module")
def entry(firm):
    return sign_entry(firm, "  Ines\u3000Okafor ", generate_key_pair().public_key, START, END)


def test_an_entry_verifies_against_the_firm_key_within_its_dates(firm, entry):
    assert entry.name == "Ines Okafor"
    again = entry_from_dict(json.loads(json.dumps(entry.to_dict())))
    assert again == entry
    verify_entry(again, firm.public_key, DURING)


def test_outside_its_dates_it_does_not_hold(firm, entry):
    with pytest.raises(RosterError, match="not valid before"):
        verify_entry(entry, firm.public_key, START - datetime.timedelta(seconds=1))
    with pytest.raises(RosterError, match="expired"):
        verify_entry(entry, firm.public_key, END)


def test_another_firm_or_a_changed_field_is_refused(firm, entry):
    with pytest.raises(RosterError, match="another firm"):
        verify_entry(entry, generate_key_pair().public_key, DURING)
    for field, value in [("name", "Tomasz Brill"), ("valid_to", "2099-01-01T00:00:00+00:00"),
                         ("public_key", generate_key_pair().public_key.hex())]:
        forged = entry_from_dict(dict(entry.to_dict(), **{field: value}))
        with pytest.raises(BadSignatureError, match="roster entry"):
            verify_entry(forged, firm.public_key, DURING)


def test_an_entry_signed_by_someone_claiming_the_firm_key_is_refused(firm, entry):
    impostor = generate_key_pair()
    forged = sign_entry(impostor, "Tomasz Brill", impostor.public_key, START, END)
    claimed = entry_from_dict(dict(forged.to_dict(), firm_key=firm.public_key.hex()))
    with pytest.raises(BadSignatureError):
        verify_entry(claimed, firm.public_key, DURING)


def test_dates_must_run_forwards_and_carry_their_offset(firm):
    with pytest.raises(RosterError, match="after valid_from"):
        sign_entry(firm, "Ines Okafor", firm.public_key, END, START)
    with pytest.raises(KeyFormatError, match="UTC offset"):
        sign_entry(firm, "Ines Okafor", firm.public_key, START.replace(tzinfo=None), END)


def test_a_name_not_in_normal_form_is_not_read(entry):
    with pytest.raises(KeyFormatError, match="normal form"):
        entry_from_dict(dict(entry.to_dict(), name="Ines\u200bOkafor"))
