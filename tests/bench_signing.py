"""Benchmark of the signing package and the offline guessing cost it implies: prints figures, asserts
nothing.

    python tests/bench_signing.py

Figures (medians of several runs, one core):
- one PBKDF2-HMAC-SHA256 derivation at the sealed key's iterations and at the PIN's;
- one offline guess at a sealed key: that derivation plus the public key of the result (what an
  attacker holding the file must compute per guess), against one bare SHA-256 as the baseline;
- Ed25519 sign and verify of a canonical document hash (python-ecdsa, pure Python);
- from the derivation alone (the attacker's cheapest part of a guess): the time to try every
  passphrase of the minimum length as a person would choose one (36 bits by NIST SP 800-63-1
  Appendix A's estimate for 20 characters; half the space on average), and the same for random
  choices (four words from a 7776-word list, 51.7 bits), on this machine's cores.
"""

from __future__ import annotations

import asyncio
import hashlib
import os
import statistics
import sys
import time
from collections.abc import Callable
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from mobile_app.signing import (  # noqa: E402
    canonical_hash,
    derive,
    generate_key_pair,
    key_pair_from_seed,
    new_params,
    sign,
    verify,
)
from mobile_app.signing.sealed import KEY_ITERATIONS, MIN_PASSPHRASE_CHARS  # noqa: E402

RUNS = 5
PIN_ITERATIONS = 600_000
YEAR_S = 365.25 * 24 * 3600
PERSON_CHOSEN_BITS = 36.0      # NIST SP 800-63-1 Appendix A, 20 characters chosen by a person
FOUR_WORDS_BITS = 4 * 12.925   # log2(7776) per word


def median_s(work: Callable[[], object], runs: int = RUNS) -> float:
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def years(bits: float, guess_s: float, cores: int) -> float:
    """Average years to find a secret among 2**bits, trying half the space, on `cores` cores."""
    return 2 ** (bits - 1) * guess_s / cores / YEAR_S


def main() -> None:
    cores = os.cpu_count() or 1
    key_params, pin_params = new_params(KEY_ITERATIONS), new_params(PIN_ITERATIONS)
    key_s = median_s(lambda: asyncio.run(derive("a passphrase of twenty", key_params)))
    pin_s = median_s(lambda: asyncio.run(derive("246813", pin_params)))
    seed = os.urandom(32)
    guess_s = median_s(lambda: key_pair_from_seed(
        bytes(a ^ b for a, b in zip(seed, asyncio.run(derive("a guess", key_params)), strict=True))))
    sha_s = median_s(lambda: hashlib.sha256(b"a guess").digest(), runs=1001)
    pair = generate_key_pair()
    message = canonical_hash({"job": {"zs": 0.62}}).encode()
    signature = sign(pair.seed, message)
    sign_s = median_s(lambda: sign(pair.seed, message), runs=21)
    verify_s = median_s(lambda: verify(pair.public_key, message, signature), runs=21)
    print(f"PBKDF2-HMAC-SHA256, {KEY_ITERATIONS:,} iterations (sealed key): {key_s * 1000:.0f} ms")
    print(f"PBKDF2-HMAC-SHA256, {PIN_ITERATIONS:,} iterations (PIN): {pin_s * 1000:.0f} ms")
    print(f"one offline guess at a sealed key: {guess_s * 1000:.0f} ms "
          f"({guess_s / sha_s:,.0f}x one SHA-256 of {sha_s * 1e6:.2f} µs)")
    print(f"Ed25519 sign: {sign_s * 1000:.1f} ms; verify: {verify_s * 1000:.1f} ms")
    print(f"minimum passphrase ({MIN_PASSPHRASE_CHARS} characters chosen by a person, "
          f"{PERSON_CHOSEN_BITS:.0f} bits): {years(PERSON_CHOSEN_BITS, key_s, cores):,.0f} years "
          f"on average on this machine's {cores} cores")
    print(f"four random words ({FOUR_WORDS_BITS:.1f} bits): "
          f"{years(FOUR_WORDS_BITS, key_s, cores):,.3g} years on {cores} cores")
    for digits in (4, 6):
        seconds = 10**digits / 2 * pin_s / cores
        print(f"a {digits}-digit PIN from its stored hash: {seconds / 60:,.1f} minutes on {cores} cores")


if __name__ == "__main__":
    main()
