"""People's names: one normal form, no invisible characters, no new name that looks like an old one.

- `normalise_name`: Unicode NFKC (UAX #15), every kind of space made a plain space, runs of spaces
  made one, none at the ends (as RFC 8266 section 2.2 does for nicknames); a name holding a control,
  format, private-use, unassigned or other invisible character is refused, as is one that mixes
  scripts beyond those Unicode TR39 section 5.2 allows together ("Highly Restrictive": Latin with Han
  and Japanese or Korean scripts), since a Cyrillic "а" among Latin letters only serves to deceive.
- `lookalike_keys`: what a name looks like: its skeletons, each character replaced by its prototype
  among confusable characters (Unicode TR39 section 4, confusables.txt, as shipped by
  confusable_homoglyphs). Two names that share a key look the same to a reader.
- `check_new_name`: the normal form of a new name, refused if its key is that of a name already there.
"""

from __future__ import annotations

import functools
import re
import unicodedata
from collections.abc import Iterable

from mobile_app.signing.errors import LookalikeNameError, NameRefusedError

MAX_NAME_CHARS = 80
_REFUSED_CATEGORIES = {"Cc", "Cf", "Co", "Cs", "Cn", "Zl", "Zp"}
# Default_Ignorable_Code_Point characters outside category Cf (Unicode DerivedCoreProperties.txt;
# from memory): they draw nothing, so a name holding one looks like the name without it.
_INVISIBLE = frozenset(
    [0x034F, 0x115F, 0x1160, 0x17B4, 0x17B5, 0x180B, 0x180C, 0x180D, 0x180F, 0x3164, 0xFFA0, 0x2800]
    + list(range(0xFE00, 0xFE10))
    + list(range(0xE0100, 0xE01F0))
)
_SPACES = re.compile(r"\s+")
_COMMON_SCRIPTS = {"COMMON", "INHERITED"}
_ALLOWED_TOGETHER = (
    {"LATIN", "HAN", "HIRAGANA", "KATAKANA"},
    {"LATIN", "HAN", "BOPOMOFO"},
    {"LATIN", "HAN", "HANGUL"},
)


def _char_name(char: str) -> str:
    return f"U+{ord(char):04X} {unicodedata.name(char, '')}".rstrip()


def _invisible(char: str) -> bool:
    return unicodedata.category(char) in _REFUSED_CATEGORIES or ord(char) in _INVISIBLE


def _spaced(text: str) -> str:
    """Every kind of space made one plain space, none at the ends."""
    return _SPACES.sub(" ", "".join(" " if unicodedata.category(c) == "Zs" else c for c in text)).strip()


def normalise_name(text: str) -> str:
    """The normal form of a person's name (module docstring); NameRefusedError naming the problem."""
    if not isinstance(text, str):
        raise NameRefusedError(repr(text), "a name must be text")
    nfkc = unicodedata.normalize("NFKC", text)
    for char in nfkc:
        if _invisible(char):
            raise NameRefusedError(text, f"holds an invisible or control character ({_char_name(char)})")
    name = _spaced(nfkc)
    if not name:
        raise NameRefusedError(text, "a name cannot be blank")
    if len(name) > MAX_NAME_CHARS:
        raise NameRefusedError(text, f"at most {MAX_NAME_CHARS} characters")
    _check_scripts(text, name)
    return name


def _check_scripts(text: str, name: str) -> None:
    from confusable_homoglyphs import categories

    scripts = {categories.alias(char) for char in name} - _COMMON_SCRIPTS
    if len(scripts) > 1 and not any(scripts <= allowed for allowed in _ALLOWED_TOGETHER):
        raise NameRefusedError(text, f"mixes scripts ({', '.join(sorted(s.title() for s in scripts))})")


def _visible(text: str) -> str:
    """Text without its marks of direction (confusables data wraps right-to-left characters in them)."""
    return text.replace("\u200e", "").replace("\u200f", "")


@functools.cache
def _prototypes() -> dict[str, str]:
    """Each confusable character → its prototype (Unicode TR39 section 4, confusables.txt).

    confusable_homoglyphs keeps the table both ways: a source character lists its one prototype, a
    prototype lists its sources. Where two characters list only each other, either may be the
    prototype; the smaller code point is taken, which is all an equality test needs.
    """
    from confusable_homoglyphs import confusables

    data = {_visible(key): [_visible(glyph["c"]) for glyph in glyphs]
            for key, glyphs in confusables.confusables_data.items()}
    table: dict[str, str] = {}
    for char, glyphs in data.items():
        if len(char) != 1 or len(glyphs) != 1:
            continue
        target = glyphs[0]
        table[char] = min(char, target) if data.get(target) == [char] else target
    return {char: _resolve(table, char) for char in table}


def _resolve(table: dict[str, str], char: str) -> str:
    """Follow prototypes until one stands for itself (a few steps at most)."""
    seen = {char}
    target = table[char]
    while len(target) == 1 and table.get(target, target) != target and target not in seen:
        seen.add(target)
        target = table[target]
    return target


def _skeleton(text: str) -> str:
    """TR39 section 4's skeleton: NFD, each character by its prototype, NFD again."""
    table = _prototypes()
    return unicodedata.normalize(
        "NFD", "".join(table.get(char, char) for char in unicodedata.normalize("NFD", text))
    )


def lookalike_keys(name: str) -> frozenset[str]:
    """What `name` looks like, as its skeletons (TR39 section 4), case-folded after mapping, taken
    both with its case (capital I looks like small l) and case-folded first (O, o and 0 alike).

    NFKC, invisible characters dropped and spaces made one first; it takes any text, so names
    recorded before these rules still compare. Two names that share a key look the same.
    """
    visible = _spaced("".join(c for c in unicodedata.normalize("NFKC", name) if not _invisible(c)))
    return frozenset({_skeleton(visible).casefold(), _skeleton(visible.casefold()).casefold()})


def check_new_name(name: str, existing: Iterable[str]) -> str:
    """The normal form of `name`; LookalikeNameError if it looks the same as one of `existing`."""
    clean = normalise_name(name)
    keys = lookalike_keys(clean)
    for other in existing:
        if lookalike_keys(other) & keys:
            raise LookalikeNameError(clean, other)
    return clean
