"""Shrinking stops at its time limit without turning a counterexample into a crash.

Found while checking thousands of candidates on a loaded machine: the limit passed between
hypothesis's first failing call and its replay, and hypothesis raised FlakyFailure out of
``verify.check``.
"""

from __future__ import annotations

import itertools
import types

from tests.test_shards import one_wrong_vector
from verify.engines import shrink as shrinking
from verify.engines.exhaustive import _vector
from verify.engines import confirm
from verify.spec import parse


def test_time_limit_passing_during_the_replay_keeps_the_found_vector(monkeypatch):
    design = one_wrong_vector(4, 300)  # wrong on vector 300 only (tests.test_shards)
    spec = parse("{cout, sum} = a + b + cin", design)
    cex = confirm(design, spec, _vector(design, 300))
    assert cex is not None
    clock = itertools.count()  # each reading of the clock is one second later
    monkeypatch.setattr(shrinking, "time", types.SimpleNamespace(perf_counter=lambda: next(clock)))
    # deadline at 0 + 3: the first two checks of the vector fail, later ones are past the limit
    small = shrinking.shrink(design, spec, cex, seconds=3)
    inputs = small.inputs
    # the only wrong vector is 300 (bit k of 300 is input bit k: a LSB first, then b, then cin)
    assert inputs["a"] + (inputs["b"] << 4) + (inputs["cin"] << 8) == 300
    # the spec on Python integers: 300 is a=12, b=2, cin=1, so the sum is 15
    assert small.expected["sum"] == (12 + 2 + 1) % 16 and small.actual != small.expected
