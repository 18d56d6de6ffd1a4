"""The office's commands: `office init`, `office enrol`, `verify`; typed errors become one line here.

Exit codes: 0 done (or verified); 2 the command cannot run (no firm key, a weak passphrase, a file
that cannot be read); 3 the bundle does not verify.
"""

from __future__ import annotations

import sys
from pathlib import Path

from mobile_app.office.check import verify_bundle
from mobile_app.office.errors import NotVerifiedError, OfficeError
from mobile_app.office.folder import FIRM_KEY, ROSTER, enrol, init_office
from mobile_app.signing import SigningError
from mobile_app.signing.ed25519 import key_id

PROG = "python -m mobile_app"


def _fail(message: object, code: int = 2) -> int:
    print(f"{PROG}: {message}", file=sys.stderr)
    return code


def read_passphrase(path: Path) -> str:
    """The passphrase in a file: its text without the line end(s) after it."""
    return path.read_text(encoding="utf-8").rstrip("\r\n")


def cli_office_init(folder: Path) -> int:
    """`office init --dir D`: make the firm's key pair."""
    try:
        public_key = init_office(folder)
    except (OfficeError, SigningError, OSError) as error:
        return _fail(error)
    print(f"firm key {key_id(public_key)} made; devices pin {folder / ROSTER / FIRM_KEY}")
    return 0


def cli_office_enrol(name: str, folder: Path, passphrase_file: Path, valid_days: int) -> int:
    """`office enrol NAME --dir D --passphrase-file F`: enrol a supervisor."""
    try:
        passphrase = read_passphrase(passphrase_file)
    except (OSError, UnicodeDecodeError) as error:
        return _fail(f"cannot read the passphrase file {passphrase_file} ({error})")
    try:
        enrolment = enrol(folder, name, passphrase, valid_days)
    except (OfficeError, SigningError, OSError) as error:
        return _fail(error)
    entry = enrolment.entry
    print(f"enrolled {entry.name} until {entry.valid_to.isoformat()}: roster entry "
          f"{enrolment.entry_path}; sealed key for their device {enrolment.sealed_key_path}")
    return 0


def cli_verify(bundle_dir: Path, office_dir: Path) -> int:
    """`verify BUNDLE --office D`: exit 0 and "approved by NAME at TIME, verified", or exit 3 and
    what failed."""
    try:
        verified = verify_bundle(bundle_dir, office_dir)
    except NotVerifiedError as error:
        print(str(error))
        return 3
    except OfficeError as error:
        return _fail(error)
    print(verified.line())
    return 0
