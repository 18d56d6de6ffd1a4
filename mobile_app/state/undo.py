"""Deleting with a way back: the deletions made on one screen, undoable until the screen is left.

The store records each deletion in the audit trail and hands back what it took away (`Removed`);
this trail keeps those for the screen that made them. `enter(route)` is called for every screen
shown: a different route forgets them (undo ends when the screen is left), the same one keeps them.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from mobile_app.store import StoreError
from mobile_app.store.removals import Removed

KINDS: tuple[str, ...] = ("circuit", "board", "job", "curve")


@dataclass(frozen=True)
class Done:
    """What an action did: done or not, and the words to show."""

    ok: bool
    message: str


@dataclass
class UndoTrail:
    """The deletions of the screen now shown, newest last."""

    store: Any
    by: int | None = None
    route: str | None = None
    removed: list[Removed] = field(default_factory=list)

    def enter(self, route: str) -> None:
        """A screen is shown: a different one than before ends the undo of what was deleted."""
        path = route.split("?", 1)[0]
        if path != self.route:
            self.removed.clear()
            self.route = path

    def delete(self, kind: str, item_id: int) -> Done:
        """Delete a circuit, board, draft job or saved curve (recorded in the audit trail); it can be
        undone from this screen."""
        remove = getattr(self.store.removals, kind) if kind in KINDS else None
        if remove is None:
            return Done(False, f"Nothing called {kind} can be deleted")
        try:
            removed = remove(item_id, by=self.by)
        except StoreError as exc:
            return Done(False, f"Not deleted: {exc}")
        self.removed.append(removed)
        return Done(True, f"Deleted {removed.label}")

    @property
    def offer(self) -> str | None:
        """`Deleted circuit 3 · Kiln` for the undo bar, or None when there is nothing to undo."""
        return f"Deleted {self.removed[-1].label}" if self.removed else None

    def undo(self) -> Done:
        """Put back the last deletion of this screen."""
        if not self.removed:
            return Done(False, "Nothing to undo")
        removed = self.removed[-1]
        try:
            self.store.removals.restore(removed, by=self.by)
        except StoreError as exc:
            return Done(False, f"Not put back: {exc}")
        self.removed.pop()
        return Done(True, f"Put back {removed.label}")
