"""Exhaustive engine: simulate every combination of every input bit against the spec's reference.

Vector number v sets input bit k (``design.input_bits`` order) to bit k of v. The design and the
spec's bit-level reference run side by side (``sim.Miter``) on numpy uint64 words, 64 vectors per
word, 2^18 vectors per chunk; the low 18 input bits are fixed patterns inside a chunk and the
higher bits are constant over a chunk.
"""

from __future__ import annotations

import time

import numpy as np

from verify.engines import Options, confirmed, stopped
from verify.model.result import EngineOutcome
from verify.sim import miter_of

CHUNK_BITS = 18  # 2^18 vectors = 4096 words of 64 bits per chunk
_ALL = np.uint64(0xFFFFFFFFFFFFFFFF)
_LOW_PATTERNS = [0xAAAAAAAAAAAAAAAA, 0xCCCCCCCCCCCCCCCC, 0xF0F0F0F0F0F0F0F0,
                 0xFF00FF00FF00FF00, 0xFFFF0000FFFF0000, 0xFFFFFFFF00000000]


def int_pattern(k: int, count: int) -> int:
    """A Python-int word over ``count`` vectors (a power of two) holding bit k of each index."""
    period = 1 << (k + 1)
    if period > count:
        return 0
    block = ((1 << (1 << k)) - 1) << (1 << k)
    return block * (((1 << count) - 1) // ((1 << period) - 1))


def shard_range(total: int, shard: tuple[int, int] | None) -> tuple[int, int]:
    """The vector indices [lo, hi) of shard (index from 1, count): disjoint, covering [0, total)."""
    if shard is None:
        return 0, total
    k, n = shard
    return (k - 1) * total // n, k * total // n


def run(design, spec, options: Options) -> EngineOutcome:
    n = design.input_width
    started = time.perf_counter()
    lo, hi = shard_range(1 << n, options.shard)
    if hi - lo > 1 << options.exhaustive_limit:  # the limit holds per shard
        part = f" (shard {options.shard[0]}/{options.shard[1]} holds {hi - lo:,})" \
            if options.shard else ""
        return EngineOutcome(
            "exhaustive", "skipped", 0.0,
            f"{n} input bits is 2^{n} vectors{part}, over the exhaustive limit of "
            f"2^{options.exhaustive_limit}",
            details={"input_bits": n, "limit_bits": options.exhaustive_limit})
    miter = miter_of(design, spec.reference())
    total = 1 << n
    found, done = (_scan_small if n <= 12 else _scan_chunks)(miter, n, lo, hi, options, started)
    seconds = time.perf_counter() - started
    rate = done / seconds if seconds > 0 else float("inf")
    details = {"input_bits": n, "vectors_per_second": round(rate),
               "gate_evaluations_per_second": round(rate * miter.gate_count)}
    if options.shard is not None:
        details["shard"] = {"index": options.shard[0], "count": options.shard[1],
                            "vectors": hi - lo, "first": lo, "last": hi - 1}
    part = f"vectors {lo:,}..{hi - 1:,} of the 2^{n}" if options.shard else f"all 2^{n} = {total:,} input combinations"
    if found is not None:
        cex = confirmed("exhaustive", design, spec, _vector(design, found))
        return EngineOutcome("exhaustive", "fail", seconds,
                             f"vector {found:,} of {part} gives a wrong output",
                             vectors=done, counterexample=cex, details=details)
    if done < hi - lo:
        return stopped("exhaustive", seconds, options, done, hi - lo, details)
    return EngineOutcome("exhaustive", "pass", seconds,
                         f"simulated {part}: every output equals the spec "
                         f"({rate:,.0f} vectors/s)", vectors=done, details=details)


def _vector(design, v: int) -> dict[str, int]:
    out, k = {}, 0
    for p in design.inputs:
        out[p.name] = (v >> k) & ((1 << p.width) - 1)
        k += p.width
    return out


def _scan_small(miter, n, lo, hi, options, started):
    """Up to 2^12 vectors: one Python-int word holds them all."""
    count = 1 << n
    mask = ((1 << hi) - 1) ^ ((1 << lo) - 1)
    words = [int_pattern(k, count) for k in range(n)]
    diff = miter.run(words, (1 << count) - 1) & mask
    if diff:
        return (diff & -diff).bit_length() - 1, hi - lo
    return None, hi - lo


def _scan_chunks(miter, n, lo, hi, options, started):
    cb = min(CHUNK_BITS, n)
    size = 1 << cb
    nwords = size // 64
    index = np.arange(nwords, dtype=np.uint64)
    low = [np.full(nwords, np.uint64(_LOW_PATTERNS[k])) for k in range(6)]
    low += [np.where((index >> np.uint64(k - 6)) & np.uint64(1), _ALL, np.uint64(0))
            for k in range(6, cb)]
    zero = np.uint64(0)
    done = 0
    first_chunk, last_chunk = lo // size, (hi - 1) // size
    for c in range(first_chunk, last_chunk + 1):
        words = low + [_ALL if (c >> (k - cb)) & 1 else zero for k in range(cb, n)]
        diff = np.broadcast_to(miter.run(words, _ALL), (nwords,))
        base = c * size
        a, b = max(lo, base), min(hi, base + size)
        if a != base or b != base + size:  # a shard edge cuts this chunk
            diff = diff & _range_mask(a - base, b - base, nwords)
        if diff.any():
            w = int(np.flatnonzero(diff)[0])
            word = int(diff[w])
            return base + 64 * w + (word & -word).bit_length() - 1, done + (b - a)
        done += b - a
        if options.progress:
            options.progress(done, hi - lo)
        if time.perf_counter() - started > options.timeout:
            return None, done
    return None, done


def _range_mask(a: int, b: int, nwords: int) -> np.ndarray:
    """uint64 words with bits [a, b) of the chunk set."""
    bits = np.zeros(nwords * 64, dtype=np.uint8)
    bits[a:b] = 1
    return np.packbits(bits, bitorder="little").view(np.uint64)
