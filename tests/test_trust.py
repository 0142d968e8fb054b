"""The report says only what was established: repairs, permutations, suspect lists, the trace,
corner cases of the vector budget and shards, and the strength of a sample."""

from __future__ import annotations

import random
from pathlib import Path

import pytest
import z3

import verify
from tests.support import faults as injector
from verify import spec as specmod
from verify.diagnosis import explain
from verify.diagnosis.suspects import analyse
from verify.formats import load
from verify.library import architectures
from verify.model.netlist import Gate, Netlist
from verify.model.result import Counterexample, Verdict
from verify.sim import Simulator

ADD = "{cout, sum} = a + b + cin"
BROKEN = sorted((Path(__file__).resolve().parent.parent / "designs" / "broken").glob("*"))


def _adds(design: Netlist, vectors) -> bool:
    """The design adds on these vectors, checked against Python integers (common practice)."""
    w = design.port("sum").width
    for v, out in zip(vectors, Simulator(design).evaluate_many(vectors)):
        total = v["a"] + v["b"] + v.get("cin", 0)
        if out["sum"] != total % (1 << w) or out["cout"] != total >> w:
            return False
    return True


def _z3_adds(design: Netlist) -> bool:
    """z3 bit-vector arithmetic (outside the project's engines): sum/cout equal a + b + cin."""
    w = design.port("sum").width
    term = {"0": z3.BoolVal(False), "1": z3.BoolVal(True)}
    a, b, c = z3.BitVec("a", w), z3.BitVec("b", w), z3.BitVec("cin", 1)
    for i in range(w):
        term[f"a[{i}]"] = z3.Extract(i, i, a) == 1
        term[f"b[{i}]"] = z3.Extract(i, i, b) == 1
    term["cin"] = c == 1
    ops = {"and": z3.And, "or": z3.Or, "xor": lambda *x: _xor(x), "not": z3.Not,
           "buf": lambda x: x, "nand": lambda *x: z3.Not(z3.And(*x)),
           "nor": lambda *x: z3.Not(z3.Or(*x)), "xnor": lambda *x: z3.Not(_xor(x)),
           "mux": lambda s, d0, d1: z3.If(s, d1, d0),
           "maj": lambda x, y, q: z3.Or(z3.And(x, y), z3.And(x, q), z3.And(y, q)),
           "const0": lambda: z3.BoolVal(False), "const1": lambda: z3.BoolVal(True)}
    for g in design.ordered_gates:
        term[g.output] = ops[g.op](*[term[i] for i in g.inputs])
    total = z3.ZeroExt(1, a) + z3.ZeroExt(1, b) + z3.ZeroExt(w, c)
    s = z3.Solver()
    bits = [term[f"sum[{i}]"] != (z3.Extract(i, i, total) == 1) for i in range(w)]
    s.add(z3.Or(*bits, term["cout"] != (z3.Extract(w, w, total) == 1)))
    return s.check() == z3.unsat


def _xor(xs):
    r = xs[0]
    for x in xs[1:]:
        r = z3.Xor(r, x)
    return r


def _failing(design, spec, seed=1):
    return injector.find_failure(design, spec, random.Random(seed))


# ---- repairs -----------------------------------------------------------------------------------

def test_carry_skip_repair_adds_the_missing_input_and_is_proven():
    d = load(BROKEN[[p.name for p in BROKEN].index("larkspur_add16_carry_skip_missing_propagate.json")])
    spec = specmod.parse(ADD, d)
    an = analyse(d, spec, [_failing(d, spec)], establish=True)
    top = an.suspects[0]
    assert top.net == "P_7_4" and top.repair["established_by"] == "proven"
    # the old report disabled the skip (input from 0); the missing propagate bit is p6
    assert top.repair["change"] == "this and gate is missing an input: p6"
    fixed = next(c for c in top.changes if c.text == top.repair["change"]).apply(d)
    assert _z3_adds(fixed)
    assert "should carry" not in top.why


def test_a_fault_at_one_operand_value_is_never_called_fixed_on_a_sample():
    # 64-bit ripple adder whose sum[5] flips only when a == K (one value in 2^64): the sample
    # shows one failing vector, and any change fitting the sample must be proven before it is
    # offered as a fix
    d = architectures.generate("ripple", 64)
    K = 0x0123_4567_89AB_CDEF
    lits, extra = [], []
    for i in range(64):
        if K >> i & 1:
            lits.append(f"a[{i}]")
        else:
            extra.append(Gate("not", (f"a[{i}]",), f"na{i}"))
            lits.append(f"na{i}")
    hit = [Gate("and", tuple(lits[k:k + 16]), f"h{k}") for k in range(0, 64, 16)]
    t = d.driver["sum[5]"]
    gates = [g for g in d.gates if g is not t] + extra + hit + [
        Gate("and", tuple(h.output for h in hit), "hit"), Gate(t.op, t.inputs, "s5_orig"),
        Gate("xor", ("s5_orig", "hit"), "sum[5]")]
    bad = Netlist("one_value", d.inputs, d.outputs, tuple(gates)).validate()
    spec = specmod.parse(ADD, bad)
    cex = Counterexample({"a": K, "b": 3, "cin": 0}, {}, {})
    f = explain.explain(bad, spec, cex.inputs)
    assert f["suspects"]
    for s in f["suspects"]:
        r = s.get("repair")
        if r is not None:
            assert r["established_by"] in ("proven", "exhaustive", "sampled")
        if "meet the spec" in s["why"]:
            assert r and r["established_by"] in ("proven", "exhaustive")
        assert "fixes it" not in s["why"]


def test_swapped_sum_bits_are_named_in_one_line_and_no_gate_is_blamed():
    d = load(BROKEN[[p.name for p in BROKEN].index("larkspur_add8_swapped_sum_bits.v")])
    spec = specmod.parse(ADD, d)
    cex = _failing(d, spec)
    f = explain.explain(d, spec, cex)
    assert f["permutation"]["established_by"] == "exhaustive"
    lines = explain.render_text(d, spec, Counterexample(cex, spec.evaluate(cex),
                                                        Simulator(d).evaluate(cex)), f)
    assert any(x.startswith("sum[3] and sum[4] are swapped: putting them back") for x in lines)
    assert f["suspects"] == [] and f["trace"] == []
    # the renaming it names makes an adder: Python integers over every input (2^17)
    fixed = load(BROKEN[[p.name for p in BROKEN].index("larkspur_add8_swapped_sum_bits.v")])
    ren = {"sum[3]": "sum[4]", "sum[4]": "sum[3]"}
    gates = tuple(Gate(g.op, tuple(ren.get(i, i) for i in g.inputs), ren.get(g.output, g.output))
                  for g in fixed.gates)
    fixed = Netlist("f", fixed.inputs, fixed.outputs, gates).validate()
    assert _adds(fixed, [{"a": a, "b": b, "cin": c} for a in range(0, 256, 3)
                         for b in range(0, 256, 5) for c in (0, 1)])


def test_swapped_operand_bits_are_named():
    d = architectures.generate("ripple", 8)
    ren = {"a[2]": "a[5]", "a[5]": "a[2]"}
    bad = Netlist("op_swap", d.inputs, d.outputs, tuple(
        Gate(g.op, tuple(ren.get(i, i) for i in g.inputs), g.output) for g in d.gates)).validate()
    spec = specmod.parse(ADD, bad)
    f = explain.explain(bad, spec, {"a": 4, "b": 0, "cin": 0})
    assert f["permutation"] and f["permutation"]["established_by"] == "exhaustive"
    assert "a[2] and a[5] are swapped" in f["permutation"]["change"]


# ---- suspect lists and the trace never contradict themselves ------------------------------------

def _consistent(design, spec, cex) -> None:
    an = analyse(design, spec, [cex], establish=True, top=5)
    from verify.diagnosis.explain import _findings
    ins = {p.name: cex[p.name] for p in design.inputs}
    f = _findings(an, Counterexample(ins, spec.evaluate(ins), Simulator(design).evaluate(ins)))
    nets = [s["net"] for s in f["suspects"]]
    assert len(nets) == len(set(nets)), nets
    scores = [s["score"] for s in f["suspects"]]
    assert scores == sorted(scores, reverse=True), scores
    if f["trace"] and an.table is not None:
        first = f["trace"][0]["net"]
        assert not an.table.matches(an.values[first]), first  # it breaks from every reference
    said_none = {f"c{r['bit']}" for r in (f["bits"] or {}).get("rows", []) if "carry_net" not in r}
    for s in f["suspects"]:
        assert not {x.lstrip("~") for x in s["behaves_like"]} & said_none, s
        assert "should carry" not in s["why"]
        r = s.get("repair")
        if r and r["established_by"] in ("exhaustive", "proven"):
            c = next(c for c in an.suspects if c.net == s["net"])
            chosen = [x for x in c.changes if x.text == r["change"]]
            if chosen and design.port("sum").width <= 6:
                fixed = chosen[0].apply(design)
                w = design.port("sum").width
                assert _adds(fixed, [{"a": a, "b": b, "cin": k} for a in range(1 << w)
                                     for b in range(1 << w) for k in (0, 1)])


def test_every_shipped_broken_design_gives_a_consistent_report():
    assert len(BROKEN) >= 5
    from verify.check import resolve_spec
    for path in BROKEN:
        d = load(path)
        r = verify.check(d, engine="random", shrink=False)
        assert r.counterexample is not None, path
        _consistent(d, resolve_spec(d, None), r.counterexample.inputs)


@pytest.mark.parametrize("count", [pytest.param(40, id="sample"),
                                   pytest.param(300, id="many", marks=pytest.mark.slow)])
def test_injected_faults_give_consistent_reports(count):
    rng = random.Random(11)
    made = tries = 0
    while made < count and tries < count * 5:
        tries += 1
        arch = rng.choice(injector.ARCHS)
        d = architectures.generate(arch, rng.choice([4, 5]))
        got = injector.inject(d, rng.choice(injector.KINDS + ["dropped-input"]), rng)
        if got is None:
            continue
        spec = specmod.parse(ADD, got[0])
        cex = injector.find_failure(got[0], spec, rng)
        if cex is None:
            continue
        made += 1
        _consistent(got[0], spec, cex)
    assert made >= count * 0.8


# ---- corner cases of the budget and shards ------------------------------------------------------

def test_auto_honours_vectors():
    d = architectures.generate("ripple", 32)
    r = verify.check(d, ADD, vectors=50_000)
    assert r.engines[0].engine == "random" and r.engines[0].vectors == 50_000


def test_a_space_that_fits_the_budget_is_exhaustive_and_not_called_a_sample():
    d = architectures.generate("ripple", 1, cin=False)  # 2 input bits
    r = verify.check(d, "{cout, sum} = a + b", engine="random")
    assert r.verdict is Verdict.EXHAUSTIVE and "sample" not in r.coverage


def test_the_exhaustive_limit_applies_per_shard():
    d = architectures.generate("ripple", 12)  # 25 input bits
    r = verify.check(d, ADD, engine="exhaustive", exhaustive_limit=20, shard=(1, 32))
    assert r.engines[0].status == "pass" and r.shard.vectors == 2 ** 25 // 32
    r = verify.check(d, ADD, engine="exhaustive", exhaustive_limit=20, shard=(1, 16))
    assert r.engines[0].status == "skipped"  # 2^21 vectors a shard: over 2^20


# ---- strength of a sample ---------------------------------------------------------------------

def test_strength_reports_caught_fraction_and_lists_misses():
    d = architectures.generate("kogge-stone", 24)
    r = verify.check(d, ADD, engine="random", vectors=3000, strength=40, seed=2)
    s = r.strength
    assert s["faults"] >= 30 and 0 <= s["caught"] <= s["faults"]
    assert s["fraction"] == pytest.approx(s["caught"] / s["faults"], abs=1e-6)
    assert s["missed_count"] == s["faults"] - s["caught"]
    assert "not a proof" in s["note"]
    assert r.to_json()["strength"] == s


def test_strength_misses_what_a_tiny_sample_cannot_see():
    # 2 vectors on a 32-bit adder cannot set most nets both ways: a fault stuck at the value a
    # net had on both vectors is missed, and listed
    d = architectures.generate("ripple", 32)
    s = verify.check(d, ADD, engine="random", vectors=2, strength=60, seed=1).strength
    assert s["caught"] < s["faults"] and s["missed"]


def test_manifest_key_strength_reaches_the_record(tmp_path):
    from verify.formats.json_netlist import dumps
    from verify.manifest import runner
    (tmp_path / "add.json").write_text(dumps(architectures.generate("ripple", 24)))
    (tmp_path / "verify.toml").write_text(
        '[[design]]\nname = "add"\nsources = ["add.json"]\nspec = "{cout, sum} = a + b + cin"\n'
        'method = "random"\nrequire = "tested"\nvectors = 2000\nstrength = 25\n')
    summary = runner.run(tmp_path / "verify.toml", use_cache=False)
    s = summary.records[0].strength
    assert s["faults"] >= 20 and s["caught"] + s["missed_count"] == s["faults"]
    (tmp_path / "verify.toml").write_text(
        '[[design]]\nname = "add"\nsources = ["add.json"]\nspec = "sum = a"\nstrength = 0\n')
    with pytest.raises(verify.errors.InputError, match="strength"):
        runner.load_manifest(tmp_path / "verify.toml")


def test_cli_strength_prints_an_estimate_not_a_proof(tmp_path):
    from click.testing import CliRunner
    from verify.cli.main import cli
    from verify.formats.json_netlist import dumps
    (tmp_path / "add.json").write_text(dumps(architectures.generate("ripple", 20)))
    got = CliRunner().invoke(cli, ["check", str(tmp_path / "add.json"), "--engine", "random",
                                   "--vectors", "3000", "--strength", "20", "--no-log"])
    assert got.exit_code == 0, got.output
    line = next(x for x in got.output.splitlines() if x.startswith("strength:"))
    assert "injected single faults" in line and "not a proof" in line


@pytest.mark.parametrize("change,words", [
    (lambda d: d["inputs"].update({"q, r": 1}), "not an identifier"),
    (lambda d: d.update(name="add\n`include \"x\""), "control character"),
    (lambda d: d["gates"][0].update(out="n 1"), "space or control"),
    (lambda d: d["gates"][0].update({"in": ["a[0]"] * 2000}), "a gate takes at most"),
])
def test_json_reader_refuses_names_a_writer_cannot_write(change, words):
    import json
    from verify.errors import InputError
    from verify.formats import json_netlist
    d = json.loads(json_netlist.dumps(architectures.generate("ripple", 2)))
    change(d)
    with pytest.raises(InputError, match=words):
        json_netlist.parse(json.dumps(d), "d.json")
