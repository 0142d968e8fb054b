"""Shrinking a counterexample to a small one, with hypothesis's shrinker.

The failing vector is handed to hypothesis as a stored example of a property ("the design's
outputs equal the spec"); hypothesis replays it and shrinks it toward smaller operands, keeping
only candidates that still fail. Each candidate is checked by simulating the design beside the
spec's reference; the final one is re-checked against the spec on Python integers. A time limit
bounds the work: past it, no further candidate is accepted.
"""

from __future__ import annotations

import time

from hypothesis import HealthCheck, Phase, find, settings
from hypothesis import strategies as st
from hypothesis.database import InMemoryExampleDatabase, choices_to_bytes
from hypothesis.errors import NoSuchExample

from verify.engines import confirm
from verify.result import Counterexample
from verify.sim import Miter, pack

_KEY = b"adder-verify-shrink"


def shrink(design, spec, cex: Counterexample, *, seconds: float = 5.0,
           miter: Miter | None = None) -> Counterexample:
    """A failing vector no larger than ``cex`` (usually much smaller)."""
    miter = miter or Miter(design, spec.reference())
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
    smaller = _clear_bits(fails, list(smaller))
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
