"""Draw Boardside's icons (our own mark) as PNG files with the standard library only.

The mark: a petrol square with rounded corners, a white board outline with three breakers and
an amber tick below them.
Run `python tests/make_icons.py` to write the files into assets/ (kept out of assets/, which is served).
"""

from __future__ import annotations

import math
import struct
import zlib
from pathlib import Path

PETROL = (0x0E, 0x5A, 0x6B)
WHITE = (0xFF, 0xFF, 0xFF)
AMBER = (0xF2, 0xB7, 0x05)


def _segment_distance(px: float, py: float, ax: float, ay: float, bx: float, by: float) -> float:
    """Distance from a point to a segment (all in unit-square coordinates)."""
    dx, dy = bx - ax, by - ay
    t = max(0.0, min(1.0, ((px - ax) * dx + (py - ay) * dy) / (dx * dx + dy * dy)))
    return math.hypot(px - (ax + t * dx), py - (ay + t * dy))


def _rounded_box_distance(px: float, py: float, half: float, radius: float) -> float:
    """Signed distance to a rounded square centred at (0.5, 0.5)."""
    qx = abs(px - 0.5) - (half - radius)
    qy = abs(py - 0.5) - (half - radius)
    outside = math.hypot(max(qx, 0.0), max(qy, 0.0))
    return outside + min(max(qx, qy), 0.0) - radius


def _pixel(x: float, y: float, maskable: bool) -> tuple[int, int, int, int]:
    """Colour of one pixel centre in unit coordinates; `maskable` fills the whole square."""
    scale = 0.8 if maskable else 1.0
    u = 0.5 + (x - 0.5) / scale
    v = 0.5 + (y - 0.5) / scale
    if not maskable and _rounded_box_distance(x, y, 0.5, 0.18) > 0:
        return (0, 0, 0, 0)
    board = _rounded_box_distance(u, v, 0.30, 0.06)
    if abs(board) < 0.035:
        return (*WHITE, 255)
    if 0.29 <= v <= 0.39 and any(abs(u - centre) < 0.028 for centre in (0.38, 0.5, 0.62)):
        return (*WHITE, 255)
    tick = min(
        _segment_distance(u, v, 0.37, 0.58, 0.46, 0.67),
        _segment_distance(u, v, 0.46, 0.67, 0.64, 0.47),
    )
    if tick < 0.04:
        return (*AMBER, 255)
    return (*PETROL, 255)


def png_bytes(size: int, maskable: bool = False) -> bytes:
    """The mark as an RGBA PNG of `size`×`size` pixels."""
    raw = bytearray()
    for row in range(size):
        raw.append(0)
        for col in range(size):
            raw.extend(_pixel((col + 0.5) / size, (row + 0.5) / size, maskable))

    def chunk(kind: bytes, data: bytes) -> bytes:
        body = kind + data
        return struct.pack(">I", len(data)) + body + struct.pack(">I", zlib.crc32(body) & 0xFFFFFFFF)

    header = struct.pack(">IIBBBBB", size, size, 8, 6, 0, 0, 0)
    return (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", header)
            + chunk(b"IDAT", zlib.compress(bytes(raw), 9)) + chunk(b"IEND", b""))


def main() -> None:
    """Write every icon the web client and `flet build` look for."""
    here = Path(__file__).resolve().parents[1] / "assets"
    files = {
        "icon.png": (512, False),
        "favicon.png": (32, False),
        "icons/icon-192.png": (192, False),
        "icons/icon-512.png": (512, False),
        "icons/apple-touch-icon-192.png": (192, True),
        "icons/icon-maskable-192.png": (192, True),
        "icons/icon-maskable-512.png": (512, True),
        "icons/loading-animation.png": (192, False),
    }
    for name, (size, maskable) in files.items():
        (here / name).parent.mkdir(parents=True, exist_ok=True)
        (here / name).write_bytes(png_bytes(size, maskable))


if __name__ == "__main__":
    main()
