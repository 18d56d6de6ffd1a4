"""Signatures, canonical hashes, passphrase-protected keys, roster entries and people's names.

Pure Python (python-ecdsa for Ed25519, confusable_homoglyphs for lookalike names); no Flet, no
SQLite; the same code runs in the server and in the browser build. Public surface:

    canonical_bytes(value) -> bytes ; canonical_hash(value) -> hex      canonical.py (rules there)
    KeyPair(seed, public_key) ; generate_key_pair() ; key_pair_from_seed(seed)
    sign(seed, message) -> signature ; verify(public_key, message, signature, what)   ed25519.py
    KdfParams ; Derived ; new_params(iterations) ; parse_params(text) ; parse_derived(text)
    async derive(secret, params) -> bytes ; matches(derived, key) -> bool             kdf.py
    SealedKey ; check_passphrase(p) ; async protect(name, pair, p) ; async unlock(sealed, p)
    seal(...) / unseal(...) (the synchronous halves) ; sealed_from_dict(data)        sealed.py
    RosterEntry ; sign_entry(firm, name, public_key, valid_from, valid_to)
    verify_entry(entry, firm_key, at) ; entry_from_dict(data)                      roster.py
    approved_parts(doc) ; document_hash(parts) ; changed_parts(doc, parts) ; describe_part  content.py
    Approval ; sign_approval(...) ; verify_approval(a) ; approval_from_dict(data)  approval.py
    normalise_name(text) ; lookalike_keys(text) ; check_new_name(name, existing)    names.py

Errors (all SigningError and ValueError): KeyFormatError, BadSignatureError, WeakPassphraseError,
WrongPassphraseError, NameRefusedError (LookalikeNameError), RosterError.
"""

from mobile_app.signing.approval import Approval, approval_from_dict, sign_approval, verify_approval
from mobile_app.signing.canonical import canonical_bytes, canonical_hash
from mobile_app.signing.content import approved_parts, changed_parts, describe_part, document_hash
from mobile_app.signing.ed25519 import KeyPair, generate_key_pair, key_pair_from_seed, sign, verify
from mobile_app.signing.errors import (
    BadSignatureError,
    KeyFormatError,
    LookalikeNameError,
    NameRefusedError,
    RosterError,
    SigningError,
    WeakPassphraseError,
    WrongPassphraseError,
)
from mobile_app.signing.kdf import (
    Derived,
    KdfParams,
    derive,
    matches,
    new_params,
    parse_derived,
    parse_params,
)
from mobile_app.signing.names import check_new_name, lookalike_keys, normalise_name
from mobile_app.signing.roster import RosterEntry, entry_from_dict, sign_entry, verify_entry
from mobile_app.signing.sealed import (
    SealedKey,
    check_passphrase,
    protect,
    seal,
    sealed_from_dict,
    unlock,
    unseal,
)

__all__ = [
    "Approval",
    "BadSignatureError",
    "Derived",
    "KdfParams",
    "KeyFormatError",
    "KeyPair",
    "LookalikeNameError",
    "NameRefusedError",
    "RosterEntry",
    "RosterError",
    "SealedKey",
    "SigningError",
    "WeakPassphraseError",
    "WrongPassphraseError",
    "approval_from_dict",
    "approved_parts",
    "canonical_bytes",
    "canonical_hash",
    "changed_parts",
    "check_new_name",
    "check_passphrase",
    "derive",
    "describe_part",
    "document_hash",
    "entry_from_dict",
    "generate_key_pair",
    "key_pair_from_seed",
    "lookalike_keys",
    "matches",
    "new_params",
    "normalise_name",
    "parse_derived",
    "parse_params",
    "protect",
    "seal",
    "sealed_from_dict",
    "sign",
    "sign_approval",
    "sign_entry",
    "unlock",
    "unseal",
    "verify",
    "verify_approval",
    "verify_entry",
]
