"""The office side: the firm's key, enrolling supervisors, and checking the bundles devices send.

    init_office(folder) -> firm public key          folder.py (layout there)
    enrol(folder, name, passphrase, valid_days=365) -> Enrolment(entry, entry_path, sealed_key_path)
    firm_public_key(path) -> bytes ; roster_entries(roster_dir, firm_key) -> [RosterEntry]
    verify_bundle(bundle_dir, office_dir) -> Verified(supervisor, approved_at)   check.py
    cli_office_init, cli_office_enrol, cli_verify                                cli.py

Errors: OfficeError; OfficeFolderError (an OSError), NotVerifiedError (kind, detail).
"""

from mobile_app.office.check import Verified, verify_bundle
from mobile_app.office.errors import NotVerifiedError, OfficeError, OfficeFolderError
from mobile_app.office.folder import Enrolment, enrol, firm_public_key, init_office, roster_entries

__all__ = [
    "Enrolment",
    "NotVerifiedError",
    "OfficeError",
    "OfficeFolderError",
    "Verified",
    "enrol",
    "firm_public_key",
    "init_office",
    "roster_entries",
    "verify_bundle",
]
