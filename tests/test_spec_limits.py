"""The spec package under deep nesting, hostile widths and very wide ports, and the z3 form of
subtraction.

Outside references, named beside each check: Python's own integers; z3's own bit-vector
arithmetic (bvsub, bvneg); a small per-vector gate evaluator in tests/test_spec.py (independent
of verify/sim.py).
"""

from __future__ import annotations

import random
import subprocess
import sys
import time
from pathlib import Path

import pytest
import z3

from verify.errors import SpecError
from verify.model.netlist import MAX_PORT_WIDTH
from verify.spec import MAX_BITS, MAX_DEPTH, parse
from tests.test_spec import design, simulate

ROOT = Path(__file__).resolve().parents[1]


def refusal(text: str, d) -> str:
    with pytest.raises(SpecError) as info:
        parse(text, d)
    msg = str(info.value)
    assert "\n" not in msg and msg.startswith("spec: ")
    return msg


# ---- deep nesting: refused by depth, never a RecursionError ------------------------------------

D8 = design({"a": 8, "b": 8}, {"y": 32})


@pytest.mark.parametrize("text", [
    "y = " + "(" * 5000 + "a" + ")" * 5000,
    "y = " + " + ".join(["a"] * 5000),
    "y = " + "".join(f"a + (" for _ in range(5000)) + "b" + ")" * 5000,
    "y = " + "~" * 5000 + "a",
    "y = " + "a ? b : " * 5000 + "a",
    "y = " + "{" * 5000 + "a" + "}" * 5000,
    "y = " + "$signed(" * 5000 + "a" + ")" * 5000,
    "y = a" + "[0]" * 5000,
])
def test_deep_nesting_is_refused_with_one_line_naming_the_depth(text):
    t = time.perf_counter()
    msg = refusal(text, D8)
    assert f"nested more than {MAX_DEPTH} levels deep" in msg
    assert time.perf_counter() - t < 5  # generous floor; the bench figure is ~0.1 s


_NO_RECURSION = r"""
import pickle, sys, z3
from verify.model.netlist import Netlist, Port
from verify.spec import parse
d = Netlist("deep", (Port("a", 8), Port("b", 8)), (Port("y", 20), Port("z", 8)), ())
chain = "y = " + "".join(f"a + (" for _ in range(900)) + "b" + ")" * 900
nest = "z = " + "~(" * 450 + "a ^ b" + ")" * 450
sys.setrecursionlimit(150)   # far below the nesting: only an explicit stack can cope
spec = parse(chain + "; " + nest, d)
out = spec.evaluate({"a": 3, "b": 5})
ref = spec.reference()
terms = spec.to_z3({"a": z3.BitVecVal(3, 8), "b": z3.BitVecVal(5, 8)})
again = pickle.loads(pickle.dumps(spec))
print(out["y"], out["z"], len(ref.gates) > 0, z3.simplify(terms["y"]).as_long(),
      again.evaluate({"a": 3, "b": 5}) == out, spec.text == parse(spec.text, d).text)
"""


def test_nesting_below_the_limit_needs_no_python_recursion():
    run = subprocess.run([sys.executable, "-c", _NO_RECURSION], capture_output=True, text=True,
                         cwd=ROOT, env={"PYTHONPATH": str(ROOT), "PATH": "/usr/bin:/bin"},
                         timeout=300)
    assert run.returncode == 0, run.stderr[-2000:]
    y, z, has_gates, y_z3, same, text_ok = run.stdout.split()
    # Python integers: 900 * 3 + 5; ~ applied 450 times (an even count) leaves 3 ^ 5
    assert int(y) == 900 * 3 + 5 and int(z) == 3 ^ 5
    assert int(y_z3) == 900 * 3 + 5
    assert has_gates == same == text_ok == "True"


# ---- hostile widths: refused or done quickly --------------------------------------------------

def test_a_product_of_wide_shifts_is_handled_quickly_and_exactly():
    d = design({"a": 32, "b": 32}, {"y": 4100})
    t = time.perf_counter()
    spec = parse("y = (a << 2000) * (b << 2000)", d)
    ref = spec.reference()
    a, b = 0xDEADBEEF, 0x12345679
    terms = spec.to_z3({"a": z3.BitVecVal(a, 32), "b": z3.BitVecVal(b, 32)})
    assert time.perf_counter() - t < 5  # generous; measured ~0.1 s
    want = (a << 2000) * (b << 2000) % (1 << 4100)  # Python integers
    assert spec.evaluate({"a": a, "b": b}) == {"y": want}
    assert simulate(ref, {"a": a, "b": b}) == {"y": want}
    assert z3.simplify(terms["y"]).as_long() == want


def test_a_too_wide_product_is_refused_before_any_work():
    d = design({"a": 32, "b": 32}, {"y": 64})
    t = time.perf_counter()
    msg = refusal("y = (a << 9000) * b", d)
    assert "this product could need" in msg and "the limit is 8,192" in msg
    assert time.perf_counter() - t < 1


@pytest.mark.parametrize("text, fragment", [
    ("y = {100000{a}}", "this replication is 800,000 bits wide"),
    ("y = {99999999999999999999{a[0]}}", "this replication is"),
    ("y = a << b", None),  # fine: b is 8 bits
    ("y = a << {b, b, b}", "would need more than"),
    ("y = a << 99999999999999", "would need more than"),
    ("y = {" + ", ".join(["{60000{a[0]}}"] * 3) + "}", "this concatenation could need 180,000 bits"),
])
def test_huge_replications_and_shift_amounts_are_bounded(text, fragment):
    t = time.perf_counter()
    if fragment is None:
        spec = parse(text, D8)
        assert spec.evaluate({"a": 3, "b": 7}) == {"y": (3 << 7) % (1 << 32)}  # Python integers
    else:
        assert fragment in refusal(text, D8)
    assert time.perf_counter() - t < 1


def test_a_wide_replication_of_one_bit_is_quick_in_every_translation():
    d = design({"a": 1}, {"y": 65_536})
    t = time.perf_counter()
    spec = parse("y = {65536{a}}", d)
    ref = spec.reference()
    term = spec.to_z3({"a": z3.BitVecVal(1, 1)})["y"]
    assert time.perf_counter() - t < 5  # measured ~0.05 s
    assert spec.evaluate({"a": 1}) == {"y": (1 << 65_536) - 1}  # Python integers
    assert term.size() == 65_536 and z3.simplify(z3.BVRedAnd(term)).as_long() == 1  # all ones
    assert simulate(ref, {"a": 1}) == {"y": (1 << 65_536) - 1}


def test_the_gate_budget_is_charged_before_the_gates_are_made(monkeypatch):
    import verify.spec.to_gates as to_gates
    monkeypatch.setattr(to_gates, "MAX_REFERENCE_GATES", 20_000)
    d = design({"a": 32, "b": 32}, {"y": 64})
    spec = parse("y = (a * b) * (a * b) * (a * b)", d)
    with pytest.raises(SpecError, match=r"column \d+: this product is \d+ bits wide; as gates the "
                                        r"spec would take over 20,000 gates") as info:
        spec.reference()
    assert "\n" not in str(info.value)
    small = parse("y = a * b", d).reference()  # 1,024 and-gates and their adders: in budget
    v = {"a": 0xFFFF0001, "b": 0x12345}
    assert simulate(small, v) == {"y": 0xFFFF0001 * 0x12345}  # Python integers


@pytest.mark.slow
def test_the_gate_reference_is_refused_when_it_would_be_too_large():
    d = design({"a": 32, "b": 32}, {"y": 64})
    spec = parse("y = " + "*".join(["a", "b"] * 18), d)  # a product 1,152 bits wide
    t = time.perf_counter()
    with pytest.raises(SpecError, match="as gates the spec would take over"):
        spec.reference()
    assert time.perf_counter() - t < 120  # bounded by the gate budget (~20 s here)
    v = {"a": 3, "b": 5}
    assert spec.evaluate(v) == {"y": 15 ** 18 % (1 << 64)}  # Python integers


# ---- wide ports: the limit is the netlist's port limit, not 4,096 ------------------------------

def test_the_width_limit_covers_the_netlist_port_limit():
    # a full-width adder's result, and two widest ports side by side, both fit
    assert MAX_BITS >= 2 * MAX_PORT_WIDTH


def test_a_4096_bit_adder_spec_builds_its_reference_and_evaluates():
    n = 4096
    d = design({"a": n, "b": n, "cin": 1}, {"sum": n, "cout": 1}, "wide")
    spec = parse("{cout, sum} = a + b + cin", d)  # needs 4,097 bits
    ref = spec.reference()
    assert sorted({g.op for g in ref.gates}) == ["maj", "xor"]
    rng = random.Random(4096)
    vecs = [{"a": (1 << n) - 1, "b": 0, "cin": 1}, {"a": (1 << n) - 1, "b": (1 << n) - 1, "cin": 1}]
    vecs += [{"a": rng.getrandbits(n), "b": rng.getrandbits(n), "cin": rng.getrandbits(1)}
             for _ in range(3)]
    for v in vecs:
        total = v["a"] + v["b"] + v["cin"]  # Python integers
        want = {"sum": total % (1 << n), "cout": total >> n}
        assert spec.evaluate(v) == want
        assert simulate(ref, v) == want


def test_a_65536_bit_port_spec_evaluates():
    n = MAX_PORT_WIDTH
    d = design({"a": n, "b": n}, {"s": n + 1}, "widest")
    spec = parse("s = a + b", d)
    a, b = (1 << n) - 1, 12345
    assert spec.evaluate({"a": a, "b": b}) == {"s": a + b}  # Python integers


# ---- z3: subtraction as addition of the complement ----------------------------------------------

def test_z3_subtraction_and_negation_equal_z3s_own_at_16_bits():
    d = design({"a": 16, "b": 16}, {"d": 16, "n": 16, "w": 17})
    spec = parse("d = a - b; n = -a; w = $signed(a) - $signed(b)", d)
    a, b = z3.BitVec("a", 16), z3.BitVec("b", 16)
    t = spec.to_z3({"a": a, "b": b})
    text = " ".join(x.sexpr() for x in t.values())
    assert "bvsub" not in text and "bvneg" not in text and "bvmul" not in text
    # Source: z3's own bvsub and bvneg; the 17-bit signed difference by sign extension
    want_w = z3.SignExt(1, a) - z3.SignExt(1, b)
    solver = z3.Solver()
    solver.add(z3.Or(t["d"] != a - b, t["n"] != -a, t["w"] != want_w))
    assert solver.check() == z3.unsat


def test_an_adder_subtractor_is_proven_quickly_at_32_bits():
    from verify.engines.smt import design_terms
    from verify.formats import load
    d = load(ROOT / "tests/verilog/larkspur_addsub.v", top="larkspur_addsub", params={"W": 32})
    spec = parse("res = sub ? a - b : a + b; cout = sub ? a >= b : a + b > 32'hffffffff;"
                 "ovf = (sub ? $signed(a) - $signed(b) : $signed(a) + $signed(b)) != $signed(res)",
                 d)
    ins = {p.name: z3.BitVec(p.name, p.width) for p in d.inputs}
    got, want = design_terms(d, ins), spec.to_z3(ins)
    solver = z3.SolverFor("QF_BV")
    solver.set("timeout", 60_000)
    solver.add(z3.Or(*[got[p.name] != want[p.name] for p in d.outputs]))
    t = time.perf_counter()
    assert solver.check() == z3.unsat
    assert time.perf_counter() - t < 20  # generous floor; benchmarks/bench_spec_z3.py: ~0.1 s


@pytest.mark.parametrize("text", [
    "y = ($signed(a) << 3) * $signed(b)", "y = (a << 2) * ($signed(b) << 1 << 2)",
    "y = ($signed(a) - 7 << 4) * (b << s)", "y = (($signed(a) << 20) * ($signed(b) << 10)) >> 25",
    "y = (a << 30) * b", "y = -((a << 1) * (b << 1))",
])
def test_products_of_shifted_values_agree_in_all_three_translations(text):
    from tests.test_spec import z3_values
    d = design({"a": 5, "b": 4, "s": 2}, {"y": 24})
    spec = parse(text, d)
    ref = spec.reference()
    rng = random.Random(text)
    for _ in range(60):
        v = {"a": rng.getrandbits(5), "b": rng.getrandbits(4), "s": rng.getrandbits(2)}
        want = spec.evaluate(v)  # Python integers, the ground truth
        assert z3_values(spec, d, v) == want, v
        assert simulate(ref, v) == want, v
