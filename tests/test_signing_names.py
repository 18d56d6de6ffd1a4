"""People's names: NFKC, invisible characters refused, lookalikes of a recorded name refused."""

from __future__ import annotations

import pytest

from mobile_app.signing import LookalikeNameError, NameRefusedError, check_new_name, normalise_name

RECORDED = ["Ines Okafor", "Rosa Quennell", "Tomasz Brill"]


@pytest.mark.parametrize(("typed", "normal"), [
    ("  Ines   Okafor ", "Ines Okafor"),
    ("Ines\u00a0Okafor", "Ines Okafor"),             # no-break space (Zs) is a space
    ("Ines\u3000Okafor", "Ines Okafor"),             # ideographic space, NFKC (UAX #15)
    ("\uff29nes Okafor", "Ines Okafor"),             # fullwidth I, NFKC compatibility mapping
    ("Jose\u0301 O'Neil", "Jos\u00e9 O'Neil"),       # NFKC composes e + combining acute
    ("Anne-Marie Dubois", "Anne-Marie Dubois"),
    ("山田 太郎", "山田 太郎"),
    ("Ιωάννης Παπαδόπουλος", "Ιωάννης Παπαδόπουλος"),
])
def test_names_take_one_normal_form(typed, normal):
    assert normalise_name(typed) == normal


@pytest.mark.parametrize("typed", [
    "Ines\u200bOkafor",       # zero-width space (Cf)
    "Ines Okafor\u200d",      # zero-width joiner (Cf)
    "Ines \u202eOkafor",      # right-to-left override (Cf)
    "Ines\u00adOkafor",       # soft hyphen (Cf)
    "Ines\u2060Okafor",       # word joiner (Cf)
    "Ines\ufeffOkafor",       # byte-order mark (Cf)
    "Ines\u3164Okafor",       # Hangul filler: a letter that draws nothing (Default_Ignorable)
    "Ines\u034fOkafor",       # combining grapheme joiner (Default_Ignorable)
    "Ines\ufe0fOkafor",       # variation selector (Default_Ignorable)
    "Ines\x07Okafor",         # control character (Cc)
    "Ines\u2028Okafor",       # line separator (Zl)
    "Ines\ue000Okafor",       # private use (Co)
])
def test_invisible_and_control_characters_are_refused(typed):
    with pytest.raises(NameRefusedError, match="invisible or control character"):
        normalise_name(typed)


def test_what_python_calls_unprintable_is_refused_or_a_space():
    # Python's str.isprintable() is false for categories Cc, Cf, Cs, Co, Cn, Zl, Zp and Zs other than
    # the space: each such character is either refused in a name or read as a plain space.
    for code in list(range(0x0, 0x3000)) + list(range(0xFE00, 0xFFFF)):
        char = chr(code)
        if char.isprintable():
            continue
        try:
            name = normalise_name(f"Ines{char}Okafor")
        except NameRefusedError:
            continue
        assert name in ("Ines Okafor", "InesOkafor") or char.isspace(), hex(code)


@pytest.mark.parametrize("typed", ["", "   ", "\u3000", "x" * 81])
def test_blank_or_overlong_names_are_refused(typed):
    with pytest.raises(NameRefusedError):
        normalise_name(typed)


@pytest.mark.parametrize("typed", [
    "Ines Ok\u0430for",        # Cyrillic small a among Latin letters
    "\u0406nes Okafor",        # Cyrillic capital Byelorussian-Ukrainian I
    "Ines Okaf\u03bfr",        # Greek small omicron
])
def test_names_mixing_scripts_are_refused(typed):
    # Unicode TR39 section 5.2: Latin with Cyrillic or Greek is beyond "Highly Restrictive".
    with pytest.raises(NameRefusedError, match="mixes scripts"):
        normalise_name(typed)


@pytest.mark.parametrize("typed", [
    "Ines Okafor",
    "ines okafor",             # the same name in other case
    "Ines  Okafor",            # another space
    "Ines 0kafor",             # digit zero for O (TR39 confusables: 0 → O)
    "lnes Okafor",             # small L for capital I (TR39: I → l)
    "Ines Okaf\u1d0fr",        # Latin letter small capital O
    "\uff29nes Okafor",        # fullwidth I (NFKC)
])
def test_a_new_name_that_looks_like_a_recorded_one_is_refused(typed):
    with pytest.raises(LookalikeNameError, match="looks the same as 'Ines Okafor'"):
        check_new_name(typed, RECORDED)


def test_rn_and_m_look_alike():
    # TR39 confusables.txt maps "m" to "rn".
    with pytest.raises(LookalikeNameError):
        check_new_name("Mima Rose", ["Mirna Rose"])


@pytest.mark.parametrize("typed", ["Ines Okafor-Brill", "Inés Okafor", "Ian Okafor", "Rosa Quenell"])
def test_names_that_differ_to_the_eye_are_accepted(typed):
    assert check_new_name(typed, RECORDED) == normalise_name(typed)


def test_a_recorded_name_from_before_these_rules_still_compares():
    with pytest.raises(LookalikeNameError):
        check_new_name("Ines Okafor", ["Ines Oka\u200bfor"])
