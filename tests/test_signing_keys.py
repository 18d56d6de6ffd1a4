"""Ed25519 keys, signatures and verification, checked against RFC 8032's own test vectors."""

from __future__ import annotations

import pytest

from mobile_app.signing import (
    BadSignatureError,
    KeyFormatError,
    generate_key_pair,
    key_pair_from_seed,
    sign,
    verify,
)

# RFC 8032 section 7.1, "Test Vectors for Ed25519": TEST 1, TEST 2, TEST 3 and TEST SHA(abc)
# (secret key, public key, message, signature), all hex.
RFC8032_7_1 = [
    ("9d61b19deffd5a60ba844af492ec2cc44449c5697b326919703bac031cae7f60",
     "d75a980182b10ab7d54bfed3c964073a0ee172f3daa62325af021a68f707511a",
     "",
     "e5564300c360ac729086e2cc806e828a84877f1eb8e5d974d873e065224901555fb8821590a33bacc61e39701cf9b46b"
     "d25bf5f0595bbe24655141438e7a100b"),
    ("4ccd089b28ff96da9db6c346ec114e0f5b8a319f35aba624da8cf6ed4fb8a6fb",
     "3d4017c3e843895a92b70aa74d1b7ebc9c982ccf2ec4968cc0cd55f12af4660c",
     "72",
     "92a009a9f0d4cab8720e820b5f642540a2b27b5416503f8fb3762223ebdb69da085ac1e43e15996e458f3613d0f11d8c"
     "387b2eaeb4302aeeb00d291612bb0c00"),
    ("c5aa8df43f9f837bedb7442f31dcb7b166d38535076f094b85ce3a2e0b4458f7",
     "fc51cd8e6218a1a38da47ed00230f0580816ed13ba3303ac5deb911548908025",
     "af82",
     "6291d657deec24024827e69c3abe01a30ce548a284743a445e3680d7db5ac3ac18ff9b538d16f290ae67f760984dc659"
     "4a7c15e9716ed28dc027beceea1ec40a"),
    ("833fe62409237b9d62ec77587520911e9a759cec1d19755b7da901b96dca3d42",
     "ec172b93ad5e563bf4932c70e1245034c35467ef2efd4d64ebf819683467e2bf",
     "ddaf35a193617abacc417349ae20413112e6fa4e89a97ea20a9eeee64b55d39a2192992a274fc1a836ba3c23a3feebbd"
     "454d4423643ce80e2a9ac94fa54ca49f",
     "dc2a4459e7369633a52b1bf277839a00201009a3efbf3ecb69bea2186c26b58909351fc9ac90b3ecfdfbc7c66431e030"
     "3dca179c138ac17ad9bef1177331a704"),
]
# The order L of the Ed25519 group (RFC 8032 section 5.1).
GROUP_ORDER = 2**252 + 27742317777372353535851937790883648493


@pytest.mark.parametrize(("secret", "public", "message", "signature"), RFC8032_7_1)
def test_public_key_and_signature_match_rfc8032(secret, public, message, signature):
    pair = key_pair_from_seed(bytes.fromhex(secret))
    assert pair.public_key.hex() == public  # RFC 8032 7.1
    assert sign(pair.seed, bytes.fromhex(message)).hex() == signature  # RFC 8032 7.1
    verify(bytes.fromhex(public), bytes.fromhex(message), bytes.fromhex(signature))


@pytest.mark.parametrize(("secret", "public", "message", "signature"), RFC8032_7_1)
def test_a_changed_message_or_signature_is_refused(secret, public, message, signature):
    key, sig = bytes.fromhex(public), bytearray(bytes.fromhex(signature))
    with pytest.raises(BadSignatureError, match="bad signature on the record"):
        verify(key, bytes.fromhex(message) + b"\x00", bytes(sig), "record")
    sig[10] ^= 0x01
    with pytest.raises(BadSignatureError):
        verify(key, bytes.fromhex(message), bytes(sig))


def test_a_signature_with_s_plus_the_group_order_is_refused():
    # RFC 8032 5.1.7: S must be below L, or one signature would have a second valid form.
    secret, public, message, signature = RFC8032_7_1[0]
    sig = bytes.fromhex(signature)
    s = int.from_bytes(sig[32:], "little") + GROUP_ORDER
    forged = sig[:32] + s.to_bytes(32, "little")
    with pytest.raises(BadSignatureError):
        verify(bytes.fromhex(public), bytes.fromhex(message), forged)


def test_a_public_key_off_the_curve_or_of_the_wrong_size_is_a_format_error():
    with pytest.raises(KeyFormatError, match="not a point"):
        verify(b"\x02" * 32, b"", b"\x00" * 64)
    with pytest.raises(KeyFormatError, match="must be 32 bytes"):
        verify(b"\x02" * 31, b"", b"\x00" * 64)


def test_new_pairs_differ_sign_deterministically_and_hide_the_seed():
    one, two = generate_key_pair(), generate_key_pair()
    assert one.seed != two.seed and one.public_key != two.public_key
    assert sign(one.seed, b"job 12") == sign(one.seed, b"job 12")
    with pytest.raises(BadSignatureError):
        verify(two.public_key, b"job 12", sign(one.seed, b"job 12"))
    assert one.seed.hex() not in repr(one)
