"""The three engines and auto mode: agreement, counterexamples, and honest verdicts."""

from __future__ import annotations

from pathlib import Path

import z3
import pytest

import verify
from tests.helpers import array_multiplier, rewire, ripple, skip_fault
from verify.check import resolve_spec
from verify.engines import Options, exhaustive, randomized, smt
from verify.model.netlist import Gate, Netlist
from verify.model.result import Verdict
from verify.sim import Simulator
from verify.spec import parse

ADD = "{cout, sum} = a + b + cin"


def assert_really_wrong(design, cex):
    """A counterexample must re-simulate as wrong against Python integer addition."""
    out = Simulator(design).evaluate(cex.inputs)
    w = design.width("sum")
    total = cex.inputs["a"] + cex.inputs["b"] + cex.inputs.get("cin", 0)  # Python integers
    assert (out["sum"], out["cout"]) != (total % 2 ** w, total >> w)
    assert cex.actual == out
    assert cex.expected == {"sum": total % 2 ** w, "cout": total >> w}


@pytest.mark.parametrize("width", [1, 3, 8, 12])
def test_engines_agree_on_a_correct_adder(width):
    d = ripple(width)
    spec = parse(ADD, d)
    outcomes = [e.run(d, spec, Options()) for e in (exhaustive, smt, randomized)]
    assert [o.status for o in outcomes] == ["pass", "pass", "pass"]
    assert outcomes[0].vectors == 2 ** (2 * width + 1)


@pytest.mark.parametrize("fault", ["xor-to-or", "wrong-carry-source", "swap-inputs"])
def test_engines_agree_on_a_wrong_adder(fault):
    d = ripple(6)
    g = next(g for g in d.gates if g.output == "sum[3]")
    if fault == "xor-to-or":
        bad = rewire(d, "sum[3]", op="or")
    elif fault == "wrong-carry-source":
        bad = rewire(d, "sum[3]", inputs=(g.inputs[0], "cin"))
    else:
        cg = next(x for x in d.gates if x.output == "cout")
        bad = rewire(d, "cout", inputs=(cg.inputs[0], cg.inputs[0], cg.inputs[2]))
    spec = parse(ADD, bad)
    for engine in (exhaustive, smt, randomized):
        o = engine.run(bad, spec, Options())
        assert o.status == "fail", (engine, o)
        assert_really_wrong(bad, o.counterexample)


def test_default_random_budget_finds_a_fault_needing_16_propagating_bits():
    # The fault only shows when bits 20..35 of a 64-bit adder all propagate and a carry enters.
    d = skip_fault(64, 20, 36)
    for seed in range(1, 6):
        o = randomized.run(d, parse(ADD, d), Options(seed=seed))
        assert o.status == "fail", seed
        cex = o.counterexample
        p = cex.inputs["a"] ^ cex.inputs["b"]
        assert (p >> 20) & 0xFFFF == 0xFFFF
        assert_really_wrong(d, cex)


def test_random_engine_is_reproducible_from_its_seed():
    d = skip_fault(64, 20, 36)
    spec = parse(ADD, d)
    a = randomized.run(d, spec, Options(seed=7))
    b = randomized.run(d, spec, Options(seed=7))
    assert a.counterexample == b.counterexample and a.vectors == b.vectors


def test_uniform_vectors_alone_would_almost_never_hit_that_fault():
    # Sanity of the test above: 2^-17 per uniform vector (16 propagates and a carry in).
    d = skip_fault(64, 20, 36)
    spec = parse(ADD, d)
    import random as _r
    rng = _r.Random(0)
    sim = Simulator(d)
    hits = 0
    for _ in range(2000):
        v = {"a": rng.getrandbits(64), "b": rng.getrandbits(64), "cin": rng.getrandbits(1)}
        hits += sim.evaluate(v) != spec.evaluate(v)
    assert hits == 0


def test_smt_agrees_with_z3s_own_addition():
    # Outside reference: z3's own bit-vector addition, written here as a plain miter.
    d = ripple(16)
    a, b, c = z3.BitVec("a", 16), z3.BitVec("b", 16), z3.BitVec("cin", 1)
    total = z3.ZeroExt(1, a) + z3.ZeroExt(1, b) + z3.ZeroExt(16, c)
    got = smt.design_terms(d, {"a": a, "b": b, "cin": c})
    s = z3.Solver()
    s.add(z3.Or(got["sum"] != z3.Extract(15, 0, total), got["cout"] != z3.Extract(16, 16, total)))
    assert s.check() == z3.unsat
    assert smt.run(d, parse(ADD, d), Options()).status == "pass"


def test_a_solver_timeout_is_undecided_never_a_pass():
    d = array_multiplier(14)
    o = smt.run(d, parse("p = b * a", d), Options(timeout=0.05))
    assert o.status == "undecided"
    assert "limit" in o.evidence or "unknown" in o.evidence
    r = verify.check(d, "p = b * a", engine="smt", timeout=0.05)
    assert r.verdict is Verdict.UNDECIDED and not r.ok and r.exit_code == 3


def test_auto_is_undecided_when_its_complete_engine_gives_no_answer():
    d = array_multiplier(14)  # 28 input bits: over the exhaustive limit below, so auto tries
    r = verify.check(d, "p = a * b", timeout=0.05, exhaustive_limit=20)  # sweep, bdd, smt
    assert [e.engine for e in r.engines] == ["random", "sweep", "bdd", "smt"]
    # random may itself stop at so short a limit on a loaded machine; it can never pass the design
    assert r.engines[0].status in ("pass", "undecided")
    assert all(e.status == "undecided" for e in r.engines[1:])
    assert r.verdict is Verdict.UNDECIDED and r.exit_code == 3


def test_exhaustive_refuses_a_space_over_its_limit():
    d = ripple(16)
    o = exhaustive.run(d, parse(ADD, d), Options(exhaustive_limit=20))
    assert o.status == "skipped" and "over the exhaustive limit" in o.evidence
    r = verify.check(d, ADD, engine="exhaustive", exhaustive_limit=20)
    assert r.verdict is Verdict.UNDECIDED


def test_exhaustive_finds_a_fault_in_the_last_vector_of_a_chunked_space():
    # 10-bit operands + cin = 21 input bits: chunked numpy path; the only failing input is the
    # very last vector (all ones), so every chunk must really be covered.
    d = ripple(10)
    g = next(g for g in d.gates if g.output == "cout")
    allones = [f"a[{i}]" for i in range(10)] + [f"b[{i}]" for i in range(10)] + ["cin"]
    gates = [gg for gg in d.gates if gg.output != "cout"]
    gates += [Gate("maj", g.inputs, "c_ok"), Gate("and", tuple(allones), "every"),
              Gate("xor", ("c_ok", "every"), "cout")]
    bad = Netlist("last_vector_bug", d.inputs, d.outputs, tuple(gates)).validate()
    o = exhaustive.run(bad, parse(ADD, bad), Options())
    assert o.status == "fail"
    assert o.counterexample.inputs == {"a": 1023, "b": 1023, "cin": 1}


def test_verdicts_say_what_they_cover():
    d = ripple(4)
    r = verify.check(d, ADD)
    assert r.verdict is Verdict.EXHAUSTIVE and r.ok and "2^9" in r.coverage
    r = verify.check(d, ADD, engine="smt")
    assert r.verdict is Verdict.PROVEN and r.ok
    # 2^9 vectors fit a budget of 1,000: every input is simulated once, so it is exhaustive
    r = verify.check(d, ADD, engine="random", vectors=1000)
    assert r.verdict is Verdict.EXHAUSTIVE and r.ok
    d = ripple(12)
    r = verify.check(d, ADD, engine="random", vectors=1000)
    assert r.verdict is Verdict.TESTED and r.ok and "not a proof" in r.coverage
    r = verify.check(d, ADD, engine="random", vectors=1000, require="complete")
    assert r.verdict is Verdict.TESTED and not r.ok and r.exit_code == 3


def test_a_failure_is_shrunk_to_a_small_counterexample():
    d = skip_fault(64, 20, 36)
    r = verify.check(d, ADD, engine="random")
    assert r.verdict is Verdict.FAIL and r.exit_code == 1
    cex = r.counterexample
    assert_really_wrong(d, cex)
    found = r.found_counterexample.inputs
    bits = lambda v: sum(bin(x).count("1") for x in v.values())  # noqa: E731
    assert bits(cex.inputs) < bits(found)
    # at the most: 16 propagating bits, and a carry rippling from cin through bits 0..19
    assert bits(cex.inputs) <= 37


def test_json_of_a_result_has_the_promised_keys():
    d = rewire(ripple(4), "sum[2]", op="or")
    data = verify.check(d, ADD).to_json()
    assert data["ok"] is False and data["verdict"] == "fail"
    assert {"engine", "status", "seconds"} <= set(data["engines"][0])
    assert set(data["counterexample"]) >= {"inputs", "expected", "actual"}


def test_a_passing_shard_is_only_a_part_never_the_exhaustive_verdict():
    d = ripple(8)
    r = verify.check(d, ADD, engine="exhaustive", shard=(2, 4))
    assert r.verdict is Verdict.TESTED and r.exit_code == 0
    assert r.shard.vectors == 2 ** 17 // 4
    assert "adder-verify merge" in r.coverage
    assert verify.check(d, ADD, engine="exhaustive", shard=(2, 4), require="complete").exit_code == 3
    assert verify.check(d, ADD, engine="exhaustive", shard=(1, 1)).verdict is Verdict.EXHAUSTIVE


_ROOT = Path(__file__).resolve().parents[1] / "designs"
DESIGNS = sorted(p for p in _ROOT.rglob("*") if p.suffix in (".json", ".v", ".sv")
                 and not any(part.startswith(".") for part in p.relative_to(_ROOT).parts))


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: p.name)
def test_every_engine_agrees_on_every_shipped_design(path):
    d = verify.load(path)
    spec = resolve_spec(d)
    engines = [smt, randomized] + ([exhaustive] if d.input_width <= 26 else [])
    outcomes = {e.__name__.rsplit(".", 1)[-1]: e.run(d, spec, Options()) for e in engines}
    statuses = {o.status for o in outcomes.values()}
    assert len(statuses) == 1, (path, {k: o.status for k, o in outcomes.items()})
    assert statuses == ({"fail"} if "broken" in path.parts else {"pass"})
    for o in outcomes.values():
        if o.counterexample is not None:  # re-simulates as wrong, against the spec on integers
            assert Simulator(d).evaluate(o.counterexample.inputs) == o.counterexample.actual
            assert spec.evaluate(o.counterexample.inputs) == o.counterexample.expected
            assert o.counterexample.actual != o.counterexample.expected
