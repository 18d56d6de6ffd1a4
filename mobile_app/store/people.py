"""People: who records, submits and approves jobs; supervisors' PINs, keys and wrong attempts.

A supervisor has a signing key (Ed25519, mobile_app.signing). One enrolled by the office has the key
of its roster entry, sealed under their passphrase (installed from the office's file); one added on
the device alone gets a key sealed under their PIN, whose approvals are *unverified*. A PIN gates
acts on the device (returning a job to draft, changing the PIN); approving unseals the key.

Every check of a PIN or passphrase is counted before it is made, in its own committed transaction
(so parallel attempts cannot race the counter), and a right one resets the count. After
MAX_WRONG_PINS wrong attempts the person is locked: no clock is read, so moving it changes nothing;
an enrolled supervisor unlocks with the passphrase.
"""

from __future__ import annotations

import json
from typing import Any

from mobile_app.signing import (
    KeyPair,
    NameRefusedError,
    SealedKey,
    WrongPassphraseError,
    check_new_name,
    generate_key_pair,
    seal,
    sealed_from_dict,
    unseal,
)
from mobile_app.signing.kdf import KdfParams, new_params
from mobile_app.store import pins
from mobile_app.store.core import Core, now_iso
from mobile_app.store.errors import InvalidValueError, LockedOutError, NotFoundError, PinError

ROLES = ("apprentice", "qualified", "supervisor")


class People:
    """The people known to a store (`store.people`)."""

    def __init__(self, core: Core) -> None:
        self.core = core

    def add(self, name: str, role: str, pin: pins.Secret | None = None, pin_params: KdfParams | None = None,
            key_params: KdfParams | None = None) -> int:
        """Add a person (role: apprentice, qualified or supervisor); a supervisor given a PIN gets a
        device key sealed under it. The name is normalised; a name that looks like one already
        recorded is refused (InvalidValueError). Where Python has no PBKDF2 (the browser) `pin` is
        the tuple of the PIN derived with `pin_params` (`pins.new_pin_params()`) and with `key_params`
        (`new_key_params()`), both awaited with `kdf.derive_for`."""
        if role not in ROLES:
            raise InvalidValueError("role", "must be one of: " + ", ".join(ROLES))
        try:
            clean = check_new_name(name, [p["name"] for p in self.all()])
        except NameRefusedError as error:
            raise InvalidValueError("name", error.problem) from error
        columns: dict[str, Any] = {}
        if pin is not None:
            columns = self._pin_columns(clean, pin, pin_params=pin_params or pins.new_pin_params(),
                                        key_params=key_params or pins.new_pin_params(), role=role)
        with self.core.write() as conn:
            person_id = self.core.insert(conn, "people", dict(name=clean, role=role, created_at=now_iso(),
                                                              **columns))
            self.core.audit(conn, None, None, "person", person_id, "role", None, role)
        return person_id

    @staticmethod
    def _pin_columns(name: str, pin: pins.Secret, pin_params: KdfParams, key_params: KdfParams,
                     role: str, pair: KeyPair | None = None) -> dict[str, Any]:
        """The PIN's verifier and, for a supervisor, a device key sealed under the PIN."""
        columns: dict[str, Any] = {"pin_hash": pins.pin_record(pin, pin_params)}
        if role == "supervisor":
            pair = pair or generate_key_pair()
            sealed = seal(name, pair, key_params, pins.derive(pin, key_params))
            columns.update(public_key=pair.public_key.hex(), sealed_key=json.dumps(sealed.to_dict()))
        return columns

    def set_pin(self, person_id: int, pin: pins.Secret, proof: pins.Secret | None = None,
                key_params: KdfParams | None = None) -> None:
        """Set or change a person's PIN. `proof` is the old PIN if one is set, else the passphrase
        of an enrolled supervisor (PinError without it); a supervisor added on the device with no PIN
        yet needs none. The device key of a supervisor not enrolled is sealed again under the new PIN
        (derived with `key_params`, from `new_key_params()`, when `pin` is already derived)."""
        person = self.get(person_id)
        pair = self._proven(person, proof)
        if isinstance(pin, str):
            pins.check_pin_format(pin)
        if person["roster_entry"] is not None:
            columns = {"pin_hash": pins.pin_record(pin, pins.new_pin_params())}
        else:
            columns = self._pin_columns(person["name"], pin, pins.new_pin_params(),
                                        key_params or pins.new_pin_params(), person["role"], pair)
        with self.core.write() as conn:
            assignments = ", ".join(f"{name} = ?" for name in columns)
            conn.execute(f"UPDATE people SET {assignments}, failed_pins = 0 WHERE id = ?",
                         (*columns.values(), person_id))
            self.core.audit(conn, None, person_id, "person", person_id, "pin", None, "changed")

    def _proven(self, person: dict[str, Any], proof: pins.Secret | None) -> KeyPair | None:
        """Check the proof `set_pin` needs (the old PIN, or an enrolled supervisor's passphrase);
        the device key it unlocks, if any."""
        sealed = self.sealed_key(person)
        enrolled = person["roster_entry"] is not None and sealed is not None
        if proof is None:
            if person["pin_hash"] is None and not enrolled:
                return None
            raise PinError(f"the current PIN or the passphrase of {person['name']} is needed")
        if enrolled and self._is_passphrase(proof, sealed):
            self.unlock_key(person["id"], proof)
            return None
        if person["pin_hash"] is None:
            raise PinError(f"the passphrase of {person['name']} is needed to set a PIN")
        self.check_pin(person["id"], proof)
        return self.unlock_key(person["id"], proof) if sealed is not None and not enrolled else None

    @staticmethod
    def _is_passphrase(proof: pins.Secret, sealed: SealedKey | None) -> bool:
        """A passphrase, not a PIN: derived with the sealed key's parameters, or text not all digits."""
        if isinstance(proof, str):
            return not proof.strip().isdigit()
        return sealed is not None and proof.params == sealed.params

    @staticmethod
    def new_key_params() -> KdfParams:
        """Fresh parameters for sealing a device key under a PIN (see `set_pin`)."""
        return new_params(pins.PIN_ITERATIONS)

    def pin_params(self, person_id: int) -> KdfParams:
        """What to derive a PIN with before `check_pin` (PinError if none is set)."""
        person = self.get(person_id)
        if person["pin_hash"] is None:
            raise PinError(f"no PIN is set for {person['name']}")
        return pins.stored_params(person["pin_hash"])

    def key_params(self, person_id: int) -> KdfParams:
        """What to derive a passphrase (or a device-only supervisor's PIN) with before unlocking
        the key (PinError if the person holds no key here)."""
        person = self.get(person_id)
        sealed = self.sealed_key(person)
        if sealed is None:
            raise PinError(f"no signing key for {person['name']} on this device")
        return sealed.params

    @staticmethod
    def sealed_key(person: dict[str, Any]) -> SealedKey | None:
        """The person's sealed key, or None."""
        return None if person["sealed_key"] is None else sealed_from_dict(json.loads(person["sealed_key"]))

    def check_pin(self, person_id: int, pin: pins.Secret, job_id: int | None = None) -> None:
        """Check a person's PIN, counted before it is checked; PinError / LockedOutError if wrong
        (recorded in the audit trail, of `job_id` when given)."""
        person = self._count_attempt(person_id)
        if person["pin_hash"] is None:
            self._reset(person_id)
            raise PinError(f"no PIN is set for {person['name']}")
        if not pins.pin_matches(pin, person["pin_hash"]):
            self._wrong(person, "wrong PIN", job_id)
        self._reset(person_id)

    def confirm(self, person_id: int, secret: pins.Secret, job_id: int | None = None) -> None:
        """Check that the person is present: their PIN, or an enrolled supervisor's passphrase."""
        person = self.get(person_id)
        sealed = self.sealed_key(person)
        if person["roster_entry"] is not None and sealed is not None and self._is_passphrase(secret, sealed):
            self.unlock_key(person_id, secret, job_id)
        else:
            self.check_pin(person_id, secret, job_id)

    def unlock_key(self, person_id: int, secret: pins.Secret, job_id: int | None = None) -> KeyPair:
        """The person's key pair, unsealed with their passphrase (or a device-only supervisor's PIN),
        counted before it is tried; PinError / LockedOutError if wrong."""
        person = self._count_attempt(person_id)
        sealed = self.sealed_key(person)
        if sealed is None:
            self._reset(person_id)
            if person["roster_entry"] is None:
                raise PinError(f"no PIN is set for {person['name']}")
            raise PinError(f"no signing key for {person['name']} on this device: install their key file")
        try:
            pair = unseal(sealed, pins.derive(secret, sealed.params))
        except WrongPassphraseError:
            self._wrong(person, "wrong passphrase" if person["roster_entry"] else "wrong PIN", job_id)
        self._reset(person_id)
        return pair

    def unlock(self, person_id: int, passphrase: pins.Secret) -> None:
        """Lift a lock-out with an enrolled supervisor's passphrase (PinError if wrong)."""
        person = self.get(person_id)
        sealed = self.sealed_key(person)
        if person["roster_entry"] is None or sealed is None:
            raise PinError(f"{person['name']} has no passphrase on this device")
        try:
            unseal(sealed, pins.derive(passphrase, sealed.params))
        except WrongPassphraseError as error:
            raise PinError("wrong passphrase") from error
        self._reset(person_id)

    def _count_attempt(self, person_id: int) -> dict[str, Any]:
        """Count one attempt before it is checked (committed); LockedOutError past the limit."""
        with self.core.write() as conn:
            person = self.get(person_id)
            if person["failed_pins"] >= pins.MAX_WRONG_PINS:
                raise _locked(person)
            conn.execute("UPDATE people SET failed_pins = failed_pins + 1 WHERE id = ?", (person_id,))
        return dict(person, failed_pins=person["failed_pins"] + 1)

    def _reset(self, person_id: int) -> None:
        with self.core.write() as conn:
            conn.execute("UPDATE people SET failed_pins = 0 WHERE id = ?", (person_id,))

    def _wrong(self, person: dict[str, Any], problem: str, job_id: int | None) -> None:
        """Record a wrong attempt (the count already holds it) and raise."""
        with self.core.write() as conn:
            if job_id is None:
                self.core.audit(conn, None, person["id"], "person", person["id"], "pin", None, problem)
            else:
                self.core.audit(conn, job_id, person["id"], "review", job_id, "pin", None, problem)
        if person["failed_pins"] >= pins.MAX_WRONG_PINS:
            raise _locked(person)
        raise PinError(problem, pins.MAX_WRONG_PINS - person["failed_pins"])

    def all(self) -> list[dict[str, Any]]:
        """Everyone known to the store: id, name, role, whether a PIN is set (never the hash), and
        whether the office enrolled them (`enrolled`)."""
        return self.core.query(
            "SELECT id, name, role, pin_hash IS NOT NULL AS has_pin, roster_entry IS NOT NULL AS enrolled"
            " FROM people ORDER BY name, id"
        )

    def get(self, person_id: int) -> dict[str, Any]:
        """One person's whole row (PIN hash, keys, attempt count), or NotFoundError."""
        row = self.core.one("SELECT * FROM people WHERE id = ?", (person_id,))
        if row is None:
            raise NotFoundError("person", person_id)
        return row


def _locked(person: dict[str, Any]) -> LockedOutError:
    return LockedOutError(person["name"], person["failed_pins"], person["roster_entry"] is not None)
