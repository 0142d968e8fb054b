"""Random engine: seeded, reproducible, bit-parallel vectors aimed at the hard cases of addition.

Its outcome is always "tested N vectors", never a proof. Each batch holds thousands of vectors,
bit-sliced into Python integers and run through the design beside the spec's reference
(``sim.Miter``). The stream of vectors, for operands a, b (the widest inputs):

1. a sweep of propagate runs: for every start bit s and every length L, a XOR b is all ones over
   bits s..s+L-1 (a - b style: a equals b there), the bit below the run generates or kills, the
   rest is random; each with carry-in 0 and 1. When the sweep would take more than half the
   budget, runs are drawn at random instead (lengths spread evenly on a log scale);
2. then a mix, in eighths of a batch: random runs (2/8); two runs at once (1/8); a biased stream
   (3/8) where each vector draws a propagate probability from 1/2, 3/4, 15/16, 63/64 and every
   bit propagates with it, so long runs with holes and several runs at once are common; special
   values (0, all ones, 0101..., 1010..., the largest and smallest signed values, 1) in every
   pairing (1/8); and uniform vectors (1/8).

One-bit inputs (carry-in, mode bits) alternate 0 and 1 through the stream.
"""

from __future__ import annotations

import functools

import time
from dataclasses import replace

import numpy as np

from verify.engines import DEFAULT_VECTORS, Options, confirmed, stopped
from verify.model.result import EngineOutcome
from verify.sim import miter_of

_BITS_PER_BATCH = 1 << 22
#: propagate probabilities of the biased stream, one drawn per vector
PROPAGATE_ODDS = (0.5, 0.75, 15 / 16, 63 / 64)


def run(design, spec, options: Options) -> EngineOutcome:
    started = time.perf_counter()
    budget = options.vectors if options.vectors is not None else DEFAULT_VECTORS
    if design.input_width < 63 and 1 << design.input_width <= budget:
        # the whole input space fits the budget: every vector, once, is no longer a sample
        from verify.engines import exhaustive
        return exhaustive.run(design, spec, replace(options, exhaustive_limit=max(
            options.exhaustive_limit, design.input_width)))
    miter = miter_of(design, spec.reference())
    gen = VectorStream(design, options.seed, budget)
    done = 0
    details = {"seed": options.seed}
    for batch in gen.batches():
        k = batch.count
        diff = miter.run(batch.words, (1 << k) - 1)
        if diff:
            j = (diff & -diff).bit_length() - 1
            cex = confirmed("random", design, spec, batch.vector(j))
            done += j + 1
            seconds = time.perf_counter() - started
            details["vectors_per_second"] = round(done / seconds) if seconds else None
            details["found_by"] = batch.kind(j)
            return EngineOutcome("random", "fail", seconds,
                                 f"vector {done:,} (seed {options.seed}, {batch.kind(j)}) gives a "
                                 f"wrong output", vectors=done, counterexample=cex, details=details)
        done += k
        if options.progress:
            options.progress(done, budget)
        if time.perf_counter() - started > options.timeout:
            break
    seconds = time.perf_counter() - started
    details["vectors_per_second"] = round(done / seconds) if seconds else None
    details["mix"] = gen.mix
    if done < budget:
        return stopped("random", seconds, options, done, budget, details)
    return EngineOutcome("random", "pass", seconds,
                         f"tested {done:,} vector{'s' if done != 1 else ''} (seed {options.seed}): "
                         f"all outputs match; a "
                         f"sample, not a proof", vectors=done, details=details)


class Batch:
    def __init__(self, design, bits: dict[str, np.ndarray], kinds: np.ndarray,
                 run_s: np.ndarray | None = None, run_len: np.ndarray | None = None):
        self.design = design
        self.count = len(kinds)
        self._kinds = kinds  # 0 uniform, 1 propagate run, 2 special values
        self._run = (run_s, run_len)
        self._bits = bits
        self.words = []
        for p in design.inputs:
            m = bits[p.name]  # (width, count) of 0/1: row i is bit i of every vector
            packed = np.packbits(m, axis=1, bitorder="little")
            self.words.extend(int.from_bytes(row.tobytes(), "little") for row in packed)

    def kind(self, j: int) -> str:
        k = int(self._kinds[j])
        if k == 1:
            s, n = int(self._run[0][j]), int(self._run[1][j])
            return f"propagate run over bits {s}..{s + n - 1}"
        return {2: "special values", 3: "biased propagate", 4: "two propagate runs"}.get(
            k, "uniform")

    def vector(self, j: int) -> dict[str, int]:
        out = {}
        for p in self.design.inputs:
            row = self._bits[p.name][:, j]
            out[p.name] = int.from_bytes(np.packbits(row, bitorder="little").tobytes(), "little")
        return out


class VectorStream:
    """The engine's vectors, as batches of bit matrices, reproducible from the seed."""

    def __init__(self, design, seed: int, budget: int):
        self.design = design
        self.rng = np.random.default_rng(seed)
        self.budget = budget
        widest = max(p.width for p in design.inputs)
        self.operands = [p for p in design.inputs if p.width == widest and widest > 1]
        self.controls = [p for p in design.inputs if p not in self.operands]
        self.width = widest
        w = widest
        runs = w * (w + 1) // 2
        self.sweep = 4 * runs if self.operands and 4 * runs <= budget // 2 else 0
        total_bits = max(1, design.input_width)
        self.batch = int(min(16384, max(256, 1 << int(np.log2(max(1, _BITS_PER_BATCH // total_bits))))))
        self.mix: dict[str, int] = {}

    def batches(self):
        done = 0
        while done < self.budget:
            k = min(self.batch, self.budget - done)
            yield self._make(done, k)
            done += k

    # ---- one batch ------------------------------------------------------------------------
    def _make(self, start: int, k: int) -> Batch:
        rng = self.rng
        bits = {p.name: _random_bits(rng, p.width, k) for p in self.design.inputs}
        kinds = np.zeros(k, dtype=np.uint8)
        run_s = run_len = None
        index = np.arange(start, start + k)
        if self.operands:
            w = self.width
            in_sweep = index < self.sweep
            run_s = np.zeros(k, dtype=np.int64)
            run_len = np.zeros(k, dtype=np.int64)
            # the sweep: every (start, length) pair, 4 vectors each (carry below the run x cin)
            pair = index[in_sweep] // 4
            s, length = _pair_to_run(pair, w)
            run_s[in_sweep], run_len[in_sweep] = s, length
            # after the sweep, in blocks of an eighth of a batch: 2 random runs, 1 two runs at
            # once, 3 biased propagate, 1 special values, 1 uniform
            slot = ((index - self.sweep) * 8 // self.batch) % 8
            rand_run = ~in_sweep & (slot < 2)
            nr = int(rand_run.sum())
            if nr:
                length = np.minimum(w, np.exp(rng.uniform(0, np.log(w + 1), nr)).astype(np.int64))
                length = np.maximum(length, 1)
                run_s[rand_run] = rng.integers(0, w - length + 1)
                run_len[rand_run] = length
            is_run = in_sweep | rand_run
            self._runs(bits, is_run, run_s, run_len, index)
            special = ~in_sweep & (slot == 6)
            self._specials(bits, special)
            biased = ~in_sweep & (slot >= 3) & (slot <= 5)
            self._biased(bits, biased)
            two = ~in_sweep & (slot == 2)
            self._two_runs(bits, two)
            kinds[is_run] = 1
            kinds[special] = 2
            kinds[biased] = 3
            kinds[two] = 4
            self._count("propagate runs", int(is_run.sum()))
            self._count("special values", int(special.sum()))
            self._count("biased propagate", int(biased.sum()))
            self._count("two propagate runs", int(two.sum()))
            self._count("uniform", int(k - is_run.sum() - special.sum() - biased.sum()
                                       - two.sum()))
        else:
            self._count("uniform", k)
        for n, p in enumerate(self.controls):
            if p.width == 1 and n == 0:  # the carry-in (or a mode bit) alternates
                bits[p.name][0, :] = index % 2
        return Batch(self.design, bits, kinds, run_s, run_len)

    def _count(self, kind: str, n: int) -> None:
        if n:
            self.mix[kind] = self.mix.get(kind, 0) + n

    def _runs(self, bits, rows, s, length, index) -> None:
        """Rows flagged in ``rows`` get a propagate run over bits s..s+length-1."""
        span = _span(rows)
        if span is None:
            return
        rows, s, length, index = rows[span], s[span], length[span], index[span]
        cols = np.arange(self.width)[:, None]
        end = np.where(rows, s + length, s)  # rows without a run get an empty one
        mask = (cols >= s[None, :]) & (cols < end[None, :])  # (width, vectors in the span)
        a = bits[self.operands[0].name][:, span]
        if len(self.operands) == 1:  # one operand (an incrementer): a run of ones in a
            a |= mask.view(np.uint8)
            return
        b = bits[self.operands[1].name][:, span]
        subtract_style = (index // 2) % 2 == 1
        inv = (mask ^ subtract_style[None, :]).view(np.uint8)
        np.copyto(b, a ^ inv, where=rows[None, :])
        # the bit just below the run: generate (carry into the run) or kill, alternately
        sel = np.flatnonzero(rows & (s >= 1))
        below = s[sel] - 1
        gen = ((index[sel] % 4) < 2).astype(np.uint8)
        a[below, sel] = gen
        b[below, sel] = np.where(subtract_style[sel], 0, gen)

    def _set_propagate(self, bits, span: slice, rows: np.ndarray, p: np.ndarray) -> None:
        """In the flagged rows of ``span``, make a XOR b equal ``p`` (a (width, n) 0/1 matrix);
        a stays uniform, so where p is 0 each bit generates or kills at random. With one operand
        (an incrementer) a itself takes the pattern: a run of ones carries."""
        a = bits[self.operands[0].name][:, span]
        if len(self.operands) == 1:
            np.copyto(a, p, where=rows[None, :])
            return
        b = bits[self.operands[1].name][:, span]
        np.copyto(b, a ^ p, where=rows[None, :])

    def _biased(self, bits, rows) -> None:
        """Per vector, a propagate probability from 1/2, 3/4, 15/16, 63/64 and each bit
        propagating with it: long runs with holes, and several runs at once, are common."""
        span = _span(rows)
        if span is None:
            return
        n = span.stop - span.start
        q = np.array(PROPAGATE_ODDS)[self.rng.integers(0, len(PROPAGATE_ODDS), size=n)]
        p = (self.rng.random((self.width, n)) < q[None, :]).astype(np.uint8)
        self._set_propagate(bits, span, rows[span], p)

    def _two_runs(self, bits, rows) -> None:
        """Two propagate runs at once, starts and lengths drawn at random (log-spread lengths),
        the rest of the bits uniform."""
        span = _span(rows)
        if span is None:
            return
        n, w = span.stop - span.start, self.width
        cols = np.arange(w)[:, None]
        p = np.zeros((w, n), dtype=bool)
        for _ in range(2):
            length = np.maximum(1, np.minimum(w, np.exp(self.rng.uniform(0, np.log(w + 1), n))
                                              .astype(np.int64)))
            start = self.rng.integers(0, w - length + 1)
            p |= (cols >= start[None, :]) & (cols < (start + length)[None, :])
        a = bits[self.operands[0].name][:, span]
        keep = (self.rng.random((w, n)) < 0.5) & ~p  # outside the runs: uniform a XOR b
        self._set_propagate(bits, span, rows[span], (p | keep).astype(np.uint8) if
                            len(self.operands) > 1 else p.astype(np.uint8) | (a & ~p))

    def _specials(self, bits, rows) -> None:
        span = _span(rows)
        if span is None:
            return
        for p in self.operands:
            table = np.ascontiguousarray(_special_values(p.width).T)  # (width, kinds)
            pick = self.rng.integers(0, table.shape[1], size=span.stop - span.start)
            np.copyto(bits[p.name][:, span], np.take(table, pick, axis=1),
                      where=rows[None, span])


def _span(rows: np.ndarray) -> slice | None:
    """The smallest slice holding every flagged row (kinds come in blocks, so it is tight)."""
    idx = np.flatnonzero(rows)
    return slice(int(idx[0]), int(idx[-1]) + 1) if len(idx) else None


def _random_bits(rng, width: int, count: int) -> np.ndarray:
    """(width, count) uniform 0/1 bits, from random bytes (eight bits a byte)."""
    raw = np.frombuffer(rng.bytes(width * ((count + 7) // 8)), dtype=np.uint8)
    bits = np.unpackbits(raw.reshape(width, -1), axis=1, bitorder="little")
    return np.ascontiguousarray(bits[:, :count])


def _pair_to_run(pair: np.ndarray, w: int) -> tuple[np.ndarray, np.ndarray]:
    """Number every (start, length) run of a w-bit word; map numbers back to runs."""
    starts, lengths = _runs_of(w)
    return starts[pair], lengths[pair]


@functools.lru_cache(maxsize=16)
def _runs_of(w: int) -> tuple[np.ndarray, np.ndarray]:
    """(start, length) of every run of a w-bit word, numbered: built once per width."""
    starts = np.repeat(np.arange(w), np.arange(w, 0, -1))
    lengths = np.concatenate([np.arange(1, w - s + 1) for s in range(w)])
    return starts, lengths


def _special_values(w: int) -> np.ndarray:
    cols = np.arange(w)
    rows = [np.zeros(w), np.ones(w), cols % 2 == 0, cols % 2 == 1,
            cols < w - 1, cols == w - 1, cols == 0, cols >= w // 2]
    return np.array(rows, dtype=np.uint8)
