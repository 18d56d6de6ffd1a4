"""An approval: a supervisor's signature over the canonical hash of one job revision.

The form (JSON, one object):

    {"schema": "boardside-approval", "schema_version": 1,
     "document_sha256": "<64 hex: canonical_hash of parts>",
     "parts": {"job": "<64 hex>", "boards/0": "...", "boards/0/circuits/0": "...", ...},
     "revision": 1, "supervisor": "Ines Okafor", "public_key": "<64 hex>",
     "approved_at": "<ISO-8601 UTC>", "audit_head": "<64 hex, or null>",
     "signature": "<128 hex>"}

`parts` maps each part of the job document to its hash (content.py), so a check names what changed.
`signature` is the supervisor's Ed25519 signature (RFC 8032) of the canonical JSON of the object
without `signature`. `audit_head` is the hash of the job's audit chain at approval, so the approval
commits to the trail that led to it. Who the key belongs to is a separate question, answered by the
firm's roster entry for `public_key` (roster.py); an approval by a key the firm never enrolled is
*unverified*.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any

from mobile_app.signing import ed25519
from mobile_app.signing.canonical import canonical_bytes, check_form
from mobile_app.signing.content import approved_parts, document_hash
from mobile_app.signing.errors import BadSignatureError, KeyFormatError

SCHEMA = "boardside-approval"
SCHEMA_VERSION = 1


@dataclass(frozen=True)
class Approval:
    """A signed approval of one revision (module docstring)."""

    document_sha256: str
    parts: dict[str, str]
    revision: int
    supervisor: str
    public_key: bytes
    approved_at: str
    audit_head: str | None
    signature: bytes = b""

    def signed_fields(self) -> dict[str, Any]:
        """The fields the supervisor signs (everything but the signature)."""
        return {
            "schema": SCHEMA,
            "schema_version": SCHEMA_VERSION,
            "document_sha256": self.document_sha256,
            "parts": self.parts,
            "revision": self.revision,
            "supervisor": self.supervisor,
            "public_key": self.public_key.hex(),
            "approved_at": self.approved_at,
            "audit_head": self.audit_head,
        }

    def to_dict(self) -> dict[str, Any]:
        """The file form (module docstring)."""
        return {**self.signed_fields(), "signature": self.signature.hex()}


def sign_approval(pair: ed25519.KeyPair, supervisor: str, doc: dict[str, Any], approved_at: str,
                  audit_head: str | None) -> Approval:
    """An approval of the job document `doc` (its parts, content.py), signed with `pair`."""
    parts = approved_parts(doc)
    revision = int((doc.get("job") or {}).get("revision") or 1)
    unsigned = Approval(document_hash(parts), parts, revision, supervisor, pair.public_key, approved_at,
                        audit_head)
    signature = ed25519.sign(pair.seed, canonical_bytes(unsigned.signed_fields()))
    return replace(unsigned, signature=signature)


def verify_approval(approval: Approval) -> None:
    """Check the approval's signature against its own public key (BadSignatureError if it fails).

    This says the holder of `public_key` signed it; the roster entry says who that is.
    """
    if document_hash(approval.parts) != approval.document_sha256:
        raise BadSignatureError("approval")
    ed25519.verify(approval.public_key, canonical_bytes(approval.signed_fields()), approval.signature,
                   "approval")


def _hex64(what: str, value: object) -> str:
    if not isinstance(value, str) or len(value) != 64 or value.strip("0123456789abcdef"):
        raise KeyFormatError(what, "must be 64 lower-case hex digits")
    return value


def approval_from_dict(data: Any) -> Approval:
    """Read the file form; KeyFormatError for anything this version does not read."""
    check_form(data, SCHEMA, SCHEMA_VERSION, "approval")
    revision, supervisor, approved_at = data.get("revision"), data.get("supervisor"), data.get("approved_at")
    if not isinstance(revision, int) or isinstance(revision, bool) or revision < 1:
        raise KeyFormatError("approval", "revision must be a whole number from 1")
    if not isinstance(supervisor, str) or not isinstance(approved_at, str):
        raise KeyFormatError("approval", "supervisor and approved_at must be text")
    head, parts = data.get("audit_head"), data.get("parts")
    if not isinstance(parts, dict) or not all(isinstance(k, str) for k in parts):
        raise KeyFormatError("approval", "parts must map part names to hashes")
    return Approval(
        document_sha256=_hex64("approval document_sha256", data.get("document_sha256")),
        parts={key: _hex64(f"approval part {key}", value) for key, value in parts.items()},
        revision=revision,
        supervisor=supervisor,
        public_key=ed25519.key_from_hex("public key", data.get("public_key"), ed25519.PUBLIC_KEY_BYTES),
        approved_at=approved_at,
        audit_head=None if head is None else _hex64("approval audit_head", head),
        signature=ed25519.key_from_hex("signature", data.get("signature"), ed25519.SIGNATURE_BYTES),
    )
