"""Who records on this device: the name given once (on a new job), kept in the settings, and the
person every save of the walk is recorded under."""

from __future__ import annotations

from typing import Any

from mobile_app.store import NotFoundError

SETTING = "recorder_id"


class Recorder:
    """The person recording on this device (`person_id`, `name`), set by name."""

    def __init__(self, store: Any) -> None:
        self.store = store

    @property
    def person_id(self) -> int | None:
        """The recorder's person id, or None when no name was given (or the person is gone)."""
        value = self.store.settings.get(SETTING)
        if value is None:
            return None
        try:
            self.store.people.get(int(value))
        except (NotFoundError, ValueError, TypeError):
            return None
        return int(value)

    @property
    def name(self) -> str:
        """The recorder's name, blank when none was given."""
        person_id = self.person_id
        return "" if person_id is None else str(self.store.people.get(person_id)["name"])

    def set(self, name: str) -> int | None:
        """Record as `name` from now on (the person is added, as qualified, the first time); a blank
        name leaves the recorder as it was."""
        wanted = " ".join(name.split())
        if not wanted:
            return self.person_id
        for person in self.store.people.all():
            if person["name"].strip().casefold() == wanted.casefold():
                self.store.settings.set(SETTING, int(person["id"]))
                return int(person["id"])
        person_id = int(self.store.people.add(wanted, "qualified"))
        self.store.settings.set(SETTING, person_id)
        return person_id
