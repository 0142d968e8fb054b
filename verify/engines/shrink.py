"""Shrinking a counterexample to a small one, with hypothesis's shrinker.

The failing vector is handed to hypothesis as a stored example of a property ("the design's
outputs equal the spec"); hypothesis replays it and shrinks it toward smaller operands, keeping
only candidates that still fail. Each candidate is checked by simulating the design beside the
spec's reference; the final one is re-checked against the spec on Python integers. A time limit
bounds the work: past it, no further candidate is accepted.

After hypothesis: set bits are cleared one by one; every vector with 1, 2 or 3 set bits is tried
(while there are at most 40,000 of a count), so the fewest set bits win; then pairs of bits at one
position are cleared or moved down while (set bits, longest carry chain, operand size) decreases.
"""

from __future__ import annotations

import time

from hypothesis import HealthCheck, Phase, find, settings
from hypothesis import strategies as st
from hypothesis.database import InMemoryExampleDatabase, choices_to_bytes
from hypothesis.errors import Flaky, NoSuchExample

from verify.engines import confirm
from verify.model.result import Counterexample
from verify.sim import Miter, miter_of, pack

_KEY = b"adder-verify-shrink"


def shrink(design, spec, cex: Counterexample, *, seconds: float = 5.0,
           miter: Miter | None = None) -> Counterexample:
    """A failing vector no larger than ``cex`` (usually much smaller)."""
    miter = miter or miter_of(design, spec.reference())
    names = [p.name for p in design.inputs]
    deadline = time.perf_counter() + seconds

    def fails(values: tuple[int, ...]) -> bool:
        if time.perf_counter() > deadline:
            return False
        return bool(miter.run(pack(design, [dict(zip(names, values))]), 1))

    start = tuple(cex.inputs[n] for n in names)
    if not fails(start):  # pragma: no cover - the engines confirm before they report
        return cex
    db = InMemoryExampleDatabase()
    db.save(_KEY + b".secondary", choices_to_bytes(start))
    strategy = st.tuples(*[st.integers(0, (1 << p.width) - 1) for p in design.inputs])
    try:
        smaller = find(strategy, fails, database_key=_KEY,
                       settings=settings(database=db, phases=[Phase.reuse, Phase.shrink],
                                         max_examples=1, suppress_health_check=list(HealthCheck),
                                         deadline=None))
    except NoSuchExample:  # pragma: no cover - the deadline passed before the replay
        return cex
    except Flaky:  # the time limit passed during the replay: keep the vector as found
        return cex
    smaller = _clear_bits(fails, list(smaller))
    smaller = _polish(design, miter, _fewest_bits(design, miter, list(smaller), deadline),
                      deadline)
    found = confirm(design, spec, dict(zip(names, smaller)))
    return found if found is not None else cex


def _clear_bits(fails, values: list[int]) -> tuple[int, ...]:
    """Then the fewest set bits: try clearing each set bit in turn, keep it cleared if it still fails."""
    for k, v in enumerate(values):
        for i in range(v.bit_length() - 1, -1, -1):
            if values[k] >> i & 1:
                trial = values.copy()
                trial[k] &= ~(1 << i)
                if fails(tuple(trial)):
                    values = trial
    return tuple(values)


def _carry_chain(values: list[int], widths: list[int]) -> int:
    """Longest run of carries when the two widest inputs are added (0 with fewer than two)."""
    wide = sorted(range(len(values)), key=lambda k: -widths[k])[:2]
    if len(wide) < 2 or widths[wide[1]] < 2:
        return 0
    x, y = values[wide[0]], values[wide[1]]
    carries = (x + y) ^ x ^ y
    best = run = 0
    while carries:
        if carries & 1:
            run += 1
            best = max(best, run)
        else:
            run = 0
        carries >>= 1
    return best


def _fewest_bits(design, miter: Miter, values: list[int], deadline: float) -> list[int]:
    """A failing vector with the fewest set bits, by trying every vector with 1, 2, 3 set bits
    (while there are at most 40,000 of a count and fewer bits than ``values`` has)."""
    from itertools import combinations
    from math import comb

    names = [p.name for p in design.inputs]
    slots = [(k, i) for k, p in enumerate(design.inputs) for i in range(p.width)]
    have = sum(bin(v).count("1") for v in values)
    for count in range(1, min(have, 4)):
        if comb(len(slots), count) > 40_000 or time.perf_counter() > deadline:
            break
        cands = []
        for chosen in combinations(slots, count):
            t = [0] * len(values)
            for k, i in chosen:
                t[k] |= 1 << i
            cands.append(t)
        vecs = [dict(zip(names, c)) for c in cands]
        ok = miter.run(pack(design, vecs), (1 << len(vecs)) - 1)
        good = [c for j, c in enumerate(cands) if ok >> j & 1]
        if good:
            widths = [p.width for p in design.inputs]
            return min(good, key=lambda vs: (_carry_chain(vs, widths), sum(vs)))
    return values


def _polish(design, miter: Miter, values: list[int], deadline: float) -> tuple[int, ...]:
    """Smaller still, by (set bits, longest carry chain, operand size): clear a pair of bits at
    one position (a generate), or move a bit or such a pair one position down. All candidates of
    a round are simulated at once (bit-parallel); a round ends at the time limit."""
    names = [p.name for p in design.inputs]
    widths = [p.width for p in design.inputs]

    def key(vs: list[int]) -> tuple[int, int, int]:
        return (sum(bin(v).count("1") for v in vs), _carry_chain(vs, widths), sum(vs))

    best = key(values)
    for _ in range(4 * sum(widths)):
        if time.perf_counter() > deadline:
            break
        cands: list[list[int]] = []
        for k, v in enumerate(values):
            for i in range(widths[k]):
                if v >> i & 1 and i > 0 and not v >> (i - 1) & 1:  # one bit down
                    t = values.copy()
                    t[k] = v & ~(1 << i) | (1 << (i - 1))
                    cands.append(t)
                for m in range(k + 1, len(values)):
                    if i < widths[m] and v >> i & 1 and values[m] >> i & 1:
                        t = values.copy()  # clear the pair
                        t[k] &= ~(1 << i)
                        t[m] &= ~(1 << i)
                        cands.append(t)
                        if i > 0 and not (v >> (i - 1) & 1 or values[m] >> (i - 1) & 1):
                            t = t.copy()  # the pair one position down
                            t[k] |= 1 << (i - 1)
                            t[m] |= 1 << (i - 1)
                            cands.append(t)
        cands = [c for c in cands if key(c) < best]
        if not cands:
            break
        vecs = [dict(zip(names, c)) for c in cands]
        ok = miter.run(pack(design, vecs), (1 << len(vecs)) - 1)
        good = [c for j, c in enumerate(cands) if ok >> j & 1]
        if not good:
            break
        values = min(good, key=key)
        best = key(values)
    return tuple(values)
