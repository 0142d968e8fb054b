"""Trust tests for the sweeping and BDD engines: they agree with z3 and with exhaustive simulation.

Ground truth is outside the new engines: exhaustive simulation on Python integers (the spec's
``evaluate``) at small widths, z3's word-level bit-vector arithmetic (``Spec.to_z3``) at larger
ones. A wrong design must never pass, and every failure must carry a counterexample that
re-simulates as a failure.
"""

from __future__ import annotations

import random
import subprocess
import sys

import pytest

import verify
from tests.helpers import array_multiplier
from verify.check import resolve_spec
from verify.engines import Options, bdd, confirm, exhaustive, smt, sweep
from verify.errors import EngineDisagreement, InputError
from verify.formats import load
from verify.library.architectures import ARCHITECTURES, generate
from verify.model.builder import GateBuilder
from verify.model.netlist import Gate, Netlist, Port
from verify.model.ops import OPS
from verify.model.result import Verdict
from verify.sim import Simulator

from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DESIGNS = sorted((ROOT / "designs").glob("*.json")) + sorted((ROOT / "designs").glob("*.v")) \
    + sorted((ROOT / "designs" / "broken").iterdir())


@pytest.fixture(autouse=True)
def _slow_only_when_asked(request):
    """Tests marked slow run only when the marker expression asks for them (-m slow)."""
    if request.node.get_closest_marker("slow") and \
            "slow" not in (request.config.getoption("markexpr") or "").replace("not slow", ""):
        pytest.skip("slow: run with -m slow")


def _truth(design, spec, width_limit=18, z3_seconds=60.0) -> str | None:
    """pass/fail from exhaustive simulation when the inputs are few, else from z3."""
    if design.input_width <= width_limit:
        return exhaustive.run(design, spec, Options(exhaustive_limit=width_limit)).status
    status = smt.run(design, spec, Options(timeout=z3_seconds)).status
    return status if status in ("pass", "fail") else None


def _agree(design, spec, truth: str, engines=(sweep, bdd)) -> list:
    outcomes = []
    for eng in engines:
        o = eng.run(design, spec, Options(timeout=60))
        assert o.status == truth, (design.name, eng.__name__, o.status, o.evidence)
        if o.status == "fail":
            # the counterexample re-simulates as a failure on the design and the integer spec
            assert confirm(design, spec, o.counterexample.inputs) is not None
        outcomes.append(o)
    return outcomes


@pytest.mark.parametrize("path", DESIGNS, ids=lambda p: p.name)
def test_new_engines_agree_with_z3_and_simulation_on_every_shipped_design(path):
    if path.suffix not in (".json", ".v"):
        pytest.skip("not a design")
    design = load(path)
    spec = resolve_spec(design, None)
    truth = _truth(design, spec)  # exhaustive simulation or z3 (outside the new engines)
    assert truth is not None
    assert truth == ("fail" if path.parent.name == "broken" else "pass")  # the folder says so
    _agree(design, spec, truth)


# ---- single-fault mutants -------------------------------------------------------------------

def mutate(design: Netlist, rng: random.Random) -> tuple[Netlist, str]:
    """One single fault: wrong op, wrong input net, inverted input, or a stuck net."""
    gates = list(design.ordered_gates)
    k = rng.randrange(len(gates))
    g = gates[k]
    kind = rng.choice(["op", "input", "invert", "stuck"])
    earlier = list(design.input_bits) + [x.output for x in gates[:k]]
    extra: list[Gate] = []
    if kind == "op":
        same = [o for o in OPS.values() if o.name != g.op and o.arity_ok(len(g.inputs))
                and o.min_inputs > 0]
        g2 = Gate(rng.choice(same).name, g.inputs, g.output, g.source)
    elif kind == "input" and g.inputs and len(earlier) > 1:
        pos = rng.randrange(len(g.inputs))
        choices = [n for n in earlier if n != g.inputs[pos]]
        ins = list(g.inputs)
        ins[pos] = rng.choice(choices)
        g2 = Gate(g.op, tuple(ins), g.output, g.source)
    elif kind == "invert" and g.inputs:
        pos = rng.randrange(len(g.inputs))
        inv = f"mutant_inv_{k}"
        extra.append(Gate("not", (g.inputs[pos],), inv, None))
        ins = list(g.inputs)
        ins[pos] = inv
        g2 = Gate(g.op, tuple(ins), g.output, g.source)
    else:
        kind = "stuck"
        g2 = Gate(rng.choice(["const0", "const1"]), (), g.output, g.source)
    new = gates[:k] + extra + [g2] + gates[k + 1:]
    return Netlist(design.name + "_mutant", design.inputs, design.outputs, tuple(new)).validate(), \
        f"{kind} at {g.output}"


def _mutants(count: int, widths, seed: int):
    rng = random.Random(seed)
    archs = sorted(ARCHITECTURES)
    for n in range(count):
        arch = archs[n % len(archs)]
        width = widths[n % len(widths)]
        base = generate(arch, width)
        yield arch, width, *mutate(base, rng)


def _run_mutants(count: int, widths, seed: int, z3_seconds: float) -> tuple[int, int, int]:
    wrong = decided = 0
    for arch, width, design, what in _mutants(count, widths, seed):
        spec = resolve_spec(design, None)
        truth = _truth(design, spec, z3_seconds=z3_seconds)
        if truth is None:
            continue  # z3 undecided: nothing outside the engines to compare with
        decided += 1
        wrong += truth == "fail"
        _agree(design, spec, truth)
    return count, decided, wrong


def test_a_sample_of_single_fault_mutants():
    # widths 4..8: exhaustive simulation is the truth; 12: z3
    count, decided, wrong = _run_mutants(150, (4, 5, 6, 8, 12), seed=7, z3_seconds=30)
    assert decided == count
    assert wrong > count // 3  # the sample holds real faults, not only harmless ones


@pytest.mark.slow
def test_two_thousand_single_fault_mutants():
    count, decided, wrong = _run_mutants(2000, (4, 6, 8, 16, 32, 64, 256), seed=11, z3_seconds=30)
    assert decided >= count * 0.9, (decided, count)
    assert wrong > count // 3


# ---- designs where candidate equivalences mislead ---------------------------------------------

def _ports(width):
    return [Port("a", width), Port("b", width), Port("cin", 1)]


def complemented_ripple(width: int) -> Netlist:
    """A ripple adder that carries the complement of the carry on odd bits (inverting cells)."""
    b = GateBuilder(fold=False, share=False)
    a, bb = Port("a", width).bits, Port("b", width).bits
    c, inverted, s = "cin", False, []
    for i in range(width):
        p = b.xor_(a[i], bb[i])
        s.append(b.not_(b.xor_(p, c)) if inverted else b.xor_(p, c))
        true_c = b.not_(c) if inverted else c
        nxt = b.maj(a[i], bb[i], true_c)
        inverted = i % 2 == 0
        c = b.not_(nxt) if inverted else nxt
    cout = b.not_(c) if inverted else c
    return b.netlist(f"compl{width}", _ports(width), {"sum": s, "cout": [cout]})


def ling_ripple(width: int) -> Netlist:
    """Ling pseudo-carries: H_i = g_i | t_{i-1} & H_{i-1} with t = a | b, c_{i+1} = t_i & H_i
    (H. Ling, 1981; from memory): no net carries the true carry except through t & H."""
    b = GateBuilder(fold=False, share=False)
    a, bb = Port("a", width).bits, Port("b", width).bits
    s = []
    h_prev, t_prev = "cin", "1"
    for i in range(width):
        g, p, t = b.and_(a[i], bb[i]), b.xor_(a[i], bb[i]), b.or_(a[i], bb[i])
        carry = h_prev if t_prev == "1" else b.and_(t_prev, h_prev)
        s.append(b.xor_(p, carry))
        h_prev = b.or_(g, carry if t_prev == "1" else b.and_(t_prev, h_prev))
        t_prev = t
    return b.netlist(f"ling{width}", _ports(width), {"sum": s, "cout": [b.and_(t_prev, h_prev)]})


def rare_wrong_carry(width: int, k: int = 5) -> Netlist:
    """A ripple adder whose carry into bit k is also forced when a[k-1:0] is all ones and
    b[k-1:0] all zeros with cin = 0 (the carry is then 0): matches the carry on nearly every
    random vector, so it is a false candidate, and the design is wrong."""
    b = GateBuilder(fold=False, share=False)
    a, bb = Port("a", width).bits, Port("b", width).bits
    c, s = "cin", []
    for i in range(width):
        if i == k:
            rare = b.and_(*a[:k], *[b.not_(x) for x in bb[:k]], b.not_("cin"))
            c = b.or_(c, rare)
        s.append(b.xor_(b.xor_(a[i], bb[i]), c))
        c = b.maj(a[i], bb[i], c)
    return b.netlist(f"rare{width}", _ports(width), {"sum": s, "cout": [c]})


def redundant_carry(width: int) -> Netlist:
    """A correct ripple adder with a redundant term on every carry: c | (g & p) (g & p is 0)."""
    b = GateBuilder(fold=False, share=False)
    a, bb = Port("a", width).bits, Port("b", width).bits
    c, s = "cin", []
    for i in range(width):
        g, p = b.and_(a[i], bb[i]), b.xor_(a[i], bb[i])
        s.append(b.xor_(p, c))
        c = b.or_(b.or_(g, b.and_(p, c)), b.and_(g, p))
    return b.netlist(f"redundant{width}", _ports(width), {"sum": s, "cout": [c]})


@pytest.mark.parametrize("build,width,truth", [
    (complemented_ripple, 8, "pass"), (complemented_ripple, 64, "pass"),
    (ling_ripple, 8, "pass"), (ling_ripple, 24, "pass"),
    (rare_wrong_carry, 8, "fail"), (rare_wrong_carry, 40, "fail"),
    (redundant_carry, 8, "pass"), (redundant_carry, 48, "pass"),
    (lambda w: generate("carry-select", w), 32, "pass"),
])
def test_misleading_candidates_do_not_fool_the_engines(build, width, truth):
    design = build(width)
    spec = resolve_spec(design, "{cout, sum} = a + b + cin")
    assert _truth(design, spec) == truth  # exhaustive simulation or z3
    _agree(design, spec, truth)


def test_no_internal_equivalence_falls_back_to_a_plain_miter_and_says_so():
    design = array_multiplier(7)
    spec = resolve_spec(design, "p = a * b")
    assert _truth(design, spec) == "pass"  # exhaustive simulation of 2^14 vectors
    o = sweep.run(design, spec, Options())
    assert o.status == "pass"
    assert o.details["internal_equivalences"] == 0 and o.details["solver_calls"] > 0
    assert "plain SAT miter" in o.evidence
    broken = Netlist("mul7_bad", design.inputs, design.outputs,
                     tuple(Gate("or", g.inputs, g.output, g.source) if k == 5 else g
                           for k, g in enumerate(design.ordered_gates))).validate()
    assert _truth(broken, resolve_spec(broken, "p = a * b")) == "fail"
    _agree(broken, resolve_spec(broken, "p = a * b"), "fail")


# ---- control inputs -----------------------------------------------------------------------------

def adder_subtractor(width: int) -> Netlist:
    """s = sub ? a - b : a + b with signed overflow v, as b ^ sub into a ripple with cin = sub."""
    b = GateBuilder(fold=False, share=False)
    a, bb = Port("a", width).bits, Port("b", width).bits
    y = [b.xor_(x, "sub") for x in bb]
    s, c, carries = [], "sub", []
    for i in range(width):
        carries.append(c)
        s.append(b.xor_(b.xor_(a[i], y[i]), c))
        c = b.maj(a[i], y[i], c)
    v = b.xor_(c, carries[-1])
    return b.netlist(f"addsub{width}", [Port("a", width), Port("b", width), Port("sub", 1)],
                     {"s": s, "v": [v]})


ADDSUB_SPEC = ("s = sub ? a - b : a + b; "
               "v = sub ? ($signed(a) - $signed(b)) != $signed(s) : ($signed(a) + $signed(b)) != $signed(s)")


def test_adder_subtractor_is_split_on_its_mode_input():
    design = adder_subtractor(8)
    spec = resolve_spec(design, ADDSUB_SPEC)
    assert _truth(design, spec) == "pass"  # exhaustive simulation of 2^17 vectors
    (o, _) = _agree(design, spec, "pass")
    assert o.details["split_inputs"] == ["sub"] and "2 cases over sub" in o.evidence


def test_64_bit_adder_subtractor_is_proven_by_auto():
    design = adder_subtractor(64)
    r = verify.check(design, ADDSUB_SPEC)
    assert r.verdict is Verdict.PROVEN, [e.evidence for e in r.engines]
    assert "sweep" in [e.engine for e in r.engines if e.status == "pass"]
    bad = Netlist("addsub_bad", design.inputs, design.outputs,
                  tuple(Gate("and", g.inputs, g.output) if g.output == design.driver[
                      design.ports["v"].bits[0]].output else g for g in design.gates)).validate()
    r = verify.check(bad, ADDSUB_SPEC, shrink=False)
    assert r.verdict is Verdict.FAIL
    assert confirm(bad, resolve_spec(bad, ADDSUB_SPEC), r.counterexample.inputs) is not None


# ---- portfolio, cross-check, scale ----------------------------------------------------------------

def test_auto_names_the_engine_that_proved_it():
    design = generate("kogge-stone", 64)
    r = verify.check(design)
    assert r.verdict is Verdict.PROVEN
    assert r.coverage.startswith("proven by internal-equivalence sweeping")
    data = r.to_json()
    sweep_json = next(e for e in data["engines"] if e["engine"] == "sweep")
    assert sweep_json["internal_equivalences"] > 64 and "largest_query_variables" in sweep_json


def test_cross_check_runs_a_second_engine_and_a_disagreement_is_an_internal_error(monkeypatch):
    design = generate("brent-kung", 32)
    r = verify.check(design, cross_check=True)
    assert r.verdict is Verdict.PROVEN
    assert {"sweep", "bdd"} <= {e.engine for e in r.engines if e.status == "pass"}

    from verify.model.result import EngineOutcome
    monkeypatch.setattr(bdd, "run", lambda d, s, o: EngineOutcome("bdd", "fail", 0.0, "planted"))
    with pytest.raises(EngineDisagreement) as err:
        verify.check(design, cross_check=True)
    assert not isinstance(err.value, InputError)
    assert err.value.first.status == "pass" and err.value.second.status == "fail"


def test_cli_takes_cross_check_and_new_engine_names():
    path = ROOT / "designs" / "larkspur_add16_cla.json"
    for engine in ("sweep", "bdd"):
        p = subprocess.run([sys.executable, "-m", "verify", "check", str(path), "--engine", engine,
                            "--cross-check", "--no-log"], capture_output=True, text=True, cwd=ROOT)
        assert p.returncode == 0, p.stderr
        assert "PROVEN" in p.stdout


def test_bdd_node_limit_gives_undecided_never_a_pass(monkeypatch):
    monkeypatch.setattr(bdd, "MAX_NODES", 10)
    monkeypatch.setattr(bdd, "_CHECK_EVERY", 1)
    o = bdd.run(generate("ripple", 16), resolve_spec(generate("ripple", 16), None), Options())
    assert o.status == "undecided" and "node limit" in o.evidence


def test_a_65536_gate_deep_chain_compiles_and_simulates():
    depth = 65536
    gates, prev = [], "x"
    for k in range(depth):
        out = f"n{k}" if k < depth - 1 else "y"
        gates.append(Gate("not", (prev,), out))
        prev = out
    chain = Netlist("chain", (Port("x", 1),), (Port("y", 1),), tuple(gates)).validate()
    sim = Simulator(chain)
    # an even number of inversions gives the input back (common practice)
    assert sim.evaluate({"x": 1}) == {"y": 1} and sim.evaluate({"x": 0}) == {"y": 0}


@pytest.mark.slow
def test_1024_bit_kogge_stone_is_proven_by_auto_within_the_default_limit():
    r = verify.check(generate("kogge-stone", 1024))
    assert r.verdict is Verdict.PROVEN, [e.evidence for e in r.engines]


@pytest.mark.slow
def test_3000_bit_ripple_no_longer_crashes_the_simulator():
    r = verify.check(generate("ripple", 3000), engine="random", vectors=1000)
    assert r.verdict is Verdict.TESTED


def test_an_engine_disagreement_on_the_command_line_exits_2_not_1(monkeypatch, capsys):
    from verify.cli.main import main
    from verify.model.result import EngineOutcome
    monkeypatch.setattr(bdd, "run", lambda d, s, o: EngineOutcome("bdd", "fail", 0.0, "planted"))
    with pytest.raises(SystemExit) as stop:
        main(["check", str(ROOT / "designs" / "larkspur_add16_cla.json"), "--engine", "sweep",
              "--cross-check", "--no-log"])
    assert stop.value.code == 2  # an internal error is never exit 1 (a failing design)
    assert "EngineDisagreement" in capsys.readouterr().err
