"""The random engine against HARD faults: faults a tiny fraction of inputs shows (below 2^-12,
counted exactly with a BDD in tests/support/hard_faults.py), at 64 bits and the default budget."""

from __future__ import annotations

import pytest

from tests.support.hard_faults import HARD, SPEC, failing_fraction, hard_faults
from verify import spec as specmod
from verify.engines import Options, randomized
from verify.engines.randomized import VectorStream
from verify.library import architectures


def _killed(faults, seed: int) -> float:
    hit = 0
    for f, _ in faults:
        out = randomized.run(f.design, specmod.parse(SPEC, f.design), Options(seed=seed))
        hit += out.status == "fail"
        if out.status == "fail":  # the engine's counterexample, checked on Python integers
            cex = out.counterexample
            total = cex.inputs["a"] + cex.inputs["b"] + cex.inputs["cin"]
            assert (cex.actual["sum"], cex.actual["cout"]) != (total % 2 ** 64, total >> 64)
    return hit / len(faults)


def test_hard_faults_are_hard_and_real():
    faults = hard_faults(64, seed=3, per_kind=1)
    assert {f.kind for f, _ in faults} == {"skip-missing-propagate", "lookahead-missing-propagate",
                                           "select-wrong-carry", "field-match"}
    for f, frac in faults:
        assert 0 < frac < HARD, f.where


def test_bdd_fraction_matches_a_hand_count():
    # a 4-bit ripple adder with sum[0] stuck at 0 is wrong exactly when a0 ^ b0 ^ cin = 1: half of
    # all inputs (common practice: the parity of three fair bits)
    from verify.model.netlist import Gate, Netlist
    d = architectures.generate("ripple", 4)
    g = d.driver["sum[0]"]
    bad = Netlist("s0", d.inputs, d.outputs, tuple(Gate("const0", (), g.output) if x is g else x
                                                   for x in d.gates)).validate()
    assert failing_fraction(bad, specmod.parse(SPEC, bad)) == 0.5


def test_a_sample_of_hard_faults_is_killed_at_the_default_budget():
    faults = hard_faults(64, seed=1, per_kind=1)
    for seed in (1, 2):
        assert _killed(faults, seed) >= 0.99


@pytest.mark.slow
def test_hard_faults_killed_for_every_one_of_20_seeds():
    faults = hard_faults(64, seed=1, per_kind=6)
    assert len(faults) >= 20
    for seed in range(1, 21):
        assert _killed(faults, seed) >= 0.99, seed


def test_the_stream_is_reproducible_and_biased():
    d = architectures.generate("ripple", 64)
    a = [b.words for b in VectorStream(d, 5, 40_000).batches()]
    b = [b.words for b in VectorStream(d, 5, 40_000).batches()]
    assert a == b
    # long propagate runs with one hole: common in the biased part, about never in uniform bits
    stream = VectorStream(d, 5, 100_000)
    holes = 0
    for batch in stream.batches():
        for j in range(0, batch.count, 7):
            v = batch.vector(j)
            p = v["a"] ^ v["b"]
            holes += bin(p).count("1") == 63  # a 64-bit run with one hole
    assert holes >= 50  # uniform bits would give 100,000/7 * 64/2^64: about none
    assert stream.mix.get("biased propagate", 0) > 0 and stream.mix.get("two propagate runs", 0) > 0
