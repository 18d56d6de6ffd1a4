"""Whether the PDF's libraries can be imported yet: the seam the browser build fills.

In the server form fpdf2 and the fonts are installed, so `await ready()` returns at once. The static
build in the browser carries them in an archive of their own that the page loads on the first export
only (so start-up never pays for them); its entry installs that loading with `use_loader`, and a
screen awaits `ready()` before it exports. `ready()` raises ExportError when they cannot be had.
"""

from __future__ import annotations

from collections.abc import Awaitable, Callable

_installed: list[Callable[[], Awaitable[None]]] = []


def use_loader(loader: Callable[[], Awaitable[None]]) -> None:
    """Install what makes the PDF's libraries importable (the browser entry does)."""
    _installed.clear()
    _installed.append(loader)


async def ready() -> None:
    """Make sure an export can import fpdf2 and find the fonts (ExportError if it cannot)."""
    if _installed:
        await _installed[-1]()
