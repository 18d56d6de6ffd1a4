"""Names of bundle folders and files that fit every common file system and WebDAV server.

The length budget (ASCII only, so characters and bytes are the same count):

    bundle folder name        <= 64   NAME_BUDGET (the `-2` ... `-999` of a second export included)
    file name in a bundle     <= 69   the folder name + ".json" / ".csv" / ".pdf"
    folder on the server      <= 81   the folder name + "-" + 16 hex digits of the bundle's hash
    path below the office     <= 151  folder on the server + "/" + file name

Why these numbers: a single name may hold 255 bytes on ext4, btrfs, XFS and APFS and 255 UTF-16
units on NTFS, exFAT and FAT32 long names; Nextcloud refuses names over 250 characters. The tighter
limit is a whole path on an office PC: Windows programs still meet MAX_PATH, 260 characters for
drive, folders and file together, and an office usually syncs the WebDAV folder into a folder of its
own (`C:\\Users\\<name>\\Nextcloud\\Jobs\\…`). 151 characters below the office folder leave about 100
for that folder (common practice: keep synced names well under MAX_PATH).

The name is made of a unique part that is always kept whole (`job<id>`, `rev<revision>`, the export
date and the `-N` counter) and a readable part (the client reference, a board's designation) that is
shortened to fit. Letters with accents are written without them (é → e, ł → l, ß → ss); letters of
other scripts (Greek, Cyrillic, CJK, …) and any other character are left out of the name, which
stays unique through its unique part. The full reference is in the bundle's JSON, CSV and PDF.
"""

from __future__ import annotations

import re
import unicodedata

NAME_BUDGET = 64
COUNTER_CHARS = len("-999")
BASE_BUDGET = NAME_BUDGET - COUNTER_CHARS
_NOT_NAME = re.compile(r"[^A-Za-z0-9]+")
# Latin letters that Unicode does not decompose into a base letter and a mark (from memory)
_LATIN_EXTRA = str.maketrans({
    "ß": "ss", "ẞ": "SS", "æ": "ae", "Æ": "AE", "œ": "oe", "Œ": "OE", "ø": "o", "Ø": "O",
    "ł": "l", "Ł": "L", "đ": "d", "Đ": "D", "ð": "d", "Ð": "D", "þ": "th", "Þ": "Th",
    "ı": "i", "ħ": "h", "Ħ": "H", "ŀ": "l", "Ŀ": "L",
})


def ascii_words(text: str) -> str:
    """`text` as ASCII letters and digits joined by single `-`: accents dropped (é → e), a few Latin
    letters spelt out (ß → ss, ł → l), every other character a separator."""
    decomposed = unicodedata.normalize("NFKD", text.translate(_LATIN_EXTRA))
    plain = "".join(ch for ch in decomposed if not unicodedata.combining(ch))
    return _NOT_NAME.sub("-", plain).strip("-")


def shorten(words: str, max_chars: int) -> str:
    """`words` cut to at most `max_chars`, at a `-` where one is near the end; no `-` at either end."""
    if len(words) <= max_chars:
        return words
    cut = words[:max_chars]
    near = cut.rfind("-")
    if near >= max_chars * 2 // 3:
        cut = cut[:near]
    return cut.strip("-")


def share(lengths: list[int], budget: int) -> list[int]:
    """How many characters each readable part may keep so that together they fit `budget`:
    short parts keep all they have, long ones are cut to one common length (water filling)."""
    if sum(lengths) <= budget:
        return list(lengths)
    cap = 0
    while sum(min(n, cap + 1) for n in lengths) <= budget:
        cap += 1
    return [min(n, cap) for n in lengths]


def fit_name(parts: list[tuple[str, bool]], budget: int = BASE_BUDGET) -> str:
    """Parts joined by `-`, each `(text, readable)`: unique parts (readable False) whole, readable
    ones written in ASCII words and shortened so the name fits `budget` characters; a part with
    nothing left is dropped."""
    texts = [ascii_words(text) if readable else text for text, readable in parts]
    fixed = sum(len(t) + 1 for (_, readable), t in zip(parts, texts, strict=True) if t and not readable)
    readable_at = [i for i, (_, readable) in enumerate(parts) if readable and texts[i]]
    room = max(0, budget - fixed - len(readable_at) + 1)
    for i, keep in zip(readable_at, share([len(texts[i]) for i in readable_at], room), strict=True):
        texts[i] = shorten(texts[i], keep)
    return "-".join(t for t in texts if t)[:budget]
