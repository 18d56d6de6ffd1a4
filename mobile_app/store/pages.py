"""Reading rows straight from the pages of an SQLite file, for what SQLite itself refuses to read.

Follows the file format as SQLite documents it ("Database File Format", sqlite.org/fileformat2.html,
sections 1.3 the header, 1.5 the freelist, 1.6 b-tree pages, 2.1 records). A damaged page costs only
the rows on it: a table's tree is walked from its root as far as its pages read, and every other
table leaf page (a child of a damaged interior page) is read too, unless the freelist says it is
free. A page whose header is damaged is searched cell by cell for records that fit the table
(`carve`). A row whose overflow chain breaks keeps the columns that lie wholly in the bytes that
could be read and reports the rest as missing. Nothing here writes; pure Python (no extension).
"""

from __future__ import annotations

import struct
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field

HEADER = b"SQLite format 3\x00"
LEAF_TABLE, INTERIOR_TABLE, LEAF_INDEX, INTERIOR_INDEX = 13, 5, 10, 2
ENCODINGS = {1: "utf-8", 2: "utf-16-le", 3: "utf-16-be"}
MISSING = object()  # a column whose bytes could not be read


class PageError(Exception):
    """A page or cell that does not read as the file format says."""


@dataclass(frozen=True)
class Layout:
    """The file's page size, usable bytes per page, text encoding and number of pages present."""

    page_size: int
    usable: int
    encoding: str
    pages: int


def layout_of(data: bytes, default_page_size: int = 4096) -> Layout:
    """The layout from the 100-byte header (section 1.3), or the default page size if it is damaged."""
    page_size, reserved, encoding = default_page_size, 0, 1
    if data[:16] == HEADER and len(data) >= 100:
        raw = struct.unpack(">H", data[16:18])[0]
        size = 65536 if raw == 1 else raw
        if 512 <= size <= 65536 and size & (size - 1) == 0:
            page_size, reserved = size, data[20]
        encoding = struct.unpack(">I", data[56:60])[0]
    return Layout(page_size, page_size - reserved, ENCODINGS.get(encoding, "utf-8"),
                  len(data) // page_size)


def page_bytes(data: bytes, layout: Layout, number: int) -> bytes | None:
    """Page `number` (from 1), or None when the file ends before it."""
    if not 1 <= number <= layout.pages:
        return None
    start = (number - 1) * layout.page_size
    return data[start:start + layout.page_size]


def varint(buf: bytes, at: int) -> tuple[int, int]:
    """The variable-length integer at `at` (section 1.6: 1 to 9 bytes) and the offset after it."""
    value = 0
    for i in range(8):
        if at + i >= len(buf):
            raise PageError("a number runs past the end of the page")
        byte = buf[at + i]
        value = (value << 7) | (byte & 0x7F)
        if byte < 0x80:
            return value, at + i + 1
    if at + 8 >= len(buf):
        raise PageError("a number runs past the end of the page")
    return (value << 8) | buf[at + 8], at + 9


def freelist(data: bytes, layout: Layout) -> set[int]:
    """Pages on the freelist (section 1.5): trunk pages and the leaves they list."""
    free: set[int] = set()
    if data[:16] != HEADER or len(data) < 40:
        return free
    trunk = struct.unpack(">I", data[32:36])[0]
    while trunk and trunk not in free:
        page = page_bytes(data, layout, trunk)
        if page is None:
            break
        free.add(trunk)
        count = struct.unpack(">I", page[4:8])[0]
        if count > (layout.usable - 8) // 4:
            break
        free.update(struct.unpack(f">{count}I", page[8:8 + 4 * count]))
        trunk = struct.unpack(">I", page[:4])[0]
    return free


def _header_at(number: int) -> int:
    """Where a page's b-tree header starts: after the file header on page 1."""
    return 100 if number == 1 else 0


def page_kind(data: bytes, layout: Layout, number: int) -> int | None:
    """The b-tree page type byte (2, 5, 10, 13), or None for anything else or a missing page."""
    page = page_bytes(data, layout, number)
    if page is None:
        return None
    kind = page[_header_at(number)]
    return kind if kind in (LEAF_TABLE, INTERIOR_TABLE, LEAF_INDEX, INTERIOR_INDEX) else None


def _cell_offsets(page: bytes, start: int, interior: bool) -> list[int]:
    """The cell pointer array of a b-tree page, each offset checked to lie inside the page."""
    count = struct.unpack(">H", page[start + 3:start + 5])[0]
    first = start + (12 if interior else 8)
    if first + 2 * count > len(page):
        raise PageError("more cells than the page can hold")
    offsets = list(struct.unpack(f">{count}H", page[first:first + 2 * count]))
    if any(not first + 2 * count <= o < len(page) for o in offsets):
        raise PageError("a cell lies outside its page")
    return offsets


@dataclass
class Tree:
    """What a walk of one table's b-tree found: its leaf pages, all its pages, the pages it could not
    read (referenced but damaged or missing)."""

    leaves: list[int] = field(default_factory=list)
    pages: set[int] = field(default_factory=set)
    damaged: list[int] = field(default_factory=list)


def walk_table(data: bytes, layout: Layout, root: int) -> Tree:
    """The pages of the table b-tree rooted at `root`, as far as they read (no recursion)."""
    tree, todo = Tree(), [root]
    while todo:
        number = todo.pop()
        if number in tree.pages:
            continue
        tree.pages.add(number)
        kind = page_kind(data, layout, number)
        if kind == LEAF_TABLE:
            tree.leaves.append(number)
            continue
        if kind != INTERIOR_TABLE:
            tree.damaged.append(number)
            continue
        page = page_bytes(data, layout, number) or b""
        start = _header_at(number)
        try:
            children = [struct.unpack(">I", page[o:o + 4])[0]
                        for o in _cell_offsets(page, start, interior=True)]
        except (PageError, struct.error):
            tree.damaged.append(number)
            continue
        children.append(struct.unpack(">I", page[start + 8:start + 12])[0])
        todo.extend(reversed(children))
    return tree


def table_leaves(data: bytes, layout: Layout) -> list[int]:
    """Every page that reads as a table leaf page."""
    return [n for n in range(1, layout.pages + 1) if page_kind(data, layout, n) == LEAF_TABLE]


@dataclass(frozen=True)
class Row:
    """One row read from a page: its rowid, its values (MISSING where the bytes were lost), the page."""

    rowid: int
    values: tuple[object, ...]
    page: int

    @property
    def whole(self) -> bool:
        return MISSING not in self.values


def local_size(layout: Layout, size: int) -> int:
    """How many bytes of a table leaf cell's payload of `size` bytes lie on its page (section 1.6)."""
    most = layout.usable - 35
    if size <= most:
        return size
    least = ((layout.usable - 12) * 32 // 255) - 23
    local = least + (size - least) % (layout.usable - 4)
    return local if local <= most else least


def _payload(data: bytes, layout: Layout, page: bytes, at: int, size: int) -> tuple[bytes, int]:
    """A cell's payload from `at` on the page and its overflow chain (section 1.6), and how many
    bytes of it could be trusted (all of them unless the chain broke)."""
    usable = layout.usable
    local = local_size(layout, size)
    if local == size:
        if at + size > len(page):
            raise PageError("a cell runs past the end of its page")
        return page[at:at + size], size
    if at + local + 4 > len(page):
        raise PageError("a cell runs past the end of its page")
    parts, got = [page[at:at + local]], local
    trusted = local
    following = struct.unpack(">I", page[at + local:at + local + 4])[0]
    seen: set[int] = set()
    while got < size:
        over = page_bytes(data, layout, following) if following not in seen else None
        if over is None:
            break
        seen.add(following)
        chunk = over[4:usable][: size - got]
        parts.append(chunk)
        got += len(chunk)
        following = struct.unpack(">I", over[:4])[0]
        if got < size and (following == 0 or following > layout.pages):
            break  # the chain breaks here: this page's bytes cannot be trusted either
        trusted = got
    return b"".join(parts), (size if got >= size else trusted)


def decode_record(payload: bytes, size: int, trusted: int, encoding: str,
                  columns: int | None = None) -> tuple[object, ...]:
    """The values of a record of `size` bytes (section 2.1); MISSING for a value not wholly in the
    trusted bytes. The header's types must add up to the size. With `columns`, a record of another
    number of columns is refused early (searching a page)."""
    header_size, at = varint(payload, 0)
    if not 1 <= header_size <= min(trusted, len(payload), size):
        raise PageError("a record's header is damaged")
    if columns is not None and not columns <= header_size - 1 <= 9 * columns:
        raise PageError("a record of another table")
    kinds, widths, total = [], [], header_size
    while at < header_size:
        kind, at = varint(payload, at)
        kinds.append(kind)
        widths.append(_width(kind))
        total += widths[-1]
        if total > size or (columns is not None and len(kinds) > columns):
            raise PageError("a record's header does not match its size")
    if at != header_size or total != size:
        raise PageError("a record's header does not match its size")
    values: list[object] = []
    body = header_size
    for kind, width in zip(kinds, widths, strict=True):
        end = body + width
        if end > trusted:
            values.append(MISSING)
        else:
            values.append(_value(kind, payload[body:end], encoding))
        body = end
    return tuple(values)


_INT_WIDTHS = {1: 1, 2: 2, 3: 3, 4: 4, 5: 6, 6: 8}


def _width(kind: int) -> int:
    """Bytes a value of this serial type takes in a record's body."""
    if kind in _INT_WIDTHS:
        return _INT_WIDTHS[kind]
    if kind == 7:
        return 8
    if kind in (0, 8, 9):
        return 0
    if kind in (10, 11):
        raise PageError("a reserved serial type")
    return (kind - 12) // 2 if kind % 2 == 0 else (kind - 13) // 2


def _value(kind: int, raw: bytes, encoding: str) -> object:
    """One value of a record's body."""
    if kind == 0:
        return None
    if kind in _INT_WIDTHS:
        return int.from_bytes(raw, "big", signed=True)
    if kind == 7:
        return struct.unpack(">d", raw)[0]
    if kind in (8, 9):
        return kind - 8
    if kind % 2 == 0:
        return bytes(raw)
    try:
        return raw.decode(encoding)
    except UnicodeDecodeError as error:
        raise PageError("a text value is not valid text") from error


def read_cell(data: bytes, layout: Layout, page: bytes, at: int, number: int,
              columns: int | None = None) -> tuple[Row, int]:
    """The table leaf cell at `at`: its row and the offset just past its local part (with
    `columns`, only a record of that many columns)."""
    size, cursor = varint(page, at)
    rowid, cursor = varint(page, cursor)
    if rowid >= 1 << 63:
        rowid -= 1 << 64
    payload, trusted = _payload(data, layout, page, cursor, size)
    local = local_size(layout, size)
    end = cursor + local + (0 if local == size else 4)
    return Row(rowid, decode_record(payload, size, trusted, layout.encoding, columns), number), end


def leaf_rows(data: bytes, layout: Layout, number: int) -> tuple[list[Row], int]:
    """The rows of a table leaf page, and how many of its cells could not be read."""
    page = page_bytes(data, layout, number) or b""
    try:
        offsets = _cell_offsets(page, _header_at(number), interior=False)
    except (PageError, struct.error):
        return [], 1
    rows, broken = [], 0
    for at in offsets:
        try:
            rows.append(read_cell(data, layout, page, at, number)[0])
        except (PageError, struct.error):
            broken += 1
    return rows, broken


def carve(data: bytes, layout: Layout, number: int, columns: int,
          fits: Callable[[tuple[object, ...]], bool]) -> Iterator[Row]:
    """Rows found in a page whose header is damaged, by trying a cell at every offset: a cell is
    taken when its record of `columns` values decodes and `fits` the table; the search goes on
    after it."""
    page = page_bytes(data, layout, number) or b""
    at = _header_at(number) + 8
    while at < len(page) - 3:
        try:
            row, end = read_cell(data, layout, page, at, number, columns)
        except (PageError, struct.error, OverflowError):
            at += 1
            continue
        if row.whole and fits(row.values) and end > at:
            yield row
            at = end
        else:
            at += 1
