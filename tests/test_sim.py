"""The compiled simulator against truth tables and Python's integer addition."""

from __future__ import annotations

import itertools
import random

import numpy as np
import pytest

from tests.helpers import ripple
from verify.model.netlist import Gate, Netlist, Port
from verify.sim import Miter, Simulator, pack, unpack

# The meaning of each op, written out independently of verify/sim.py (common practice).
TRUTH = {
    "and": lambda xs: int(all(xs)),
    "or": lambda xs: int(any(xs)),
    "xor": lambda xs: sum(xs) % 2,
    "nand": lambda xs: 1 - int(all(xs)),
    "nor": lambda xs: 1 - int(any(xs)),
    "xnor": lambda xs: 1 - sum(xs) % 2,
    "not": lambda xs: 1 - xs[0],
    "buf": lambda xs: xs[0],
    "mux": lambda xs: xs[2] if xs[0] else xs[1],
    "maj": lambda xs: int(sum(xs) >= 2),
}


@pytest.mark.parametrize("op, arity", [(op, n) for op in ("and", "or", "xor", "nand", "nor", "xnor")
                                       for n in (2, 3, 4)] + [("not", 1), ("buf", 1), ("mux", 3), ("maj", 3)])
def test_every_op_matches_its_truth_table(op, arity):
    ins = tuple(Port(f"x{i}", 1) for i in range(arity))
    n = Netlist("t", ins, (Port("y", 1),), (Gate(op, tuple(p.name for p in ins), "y"),)).validate()
    sim = Simulator(n)
    rows = list(itertools.product((0, 1), repeat=arity))
    got = sim.evaluate_many([{f"x{i}": v for i, v in enumerate(r)} for r in rows])
    assert [g["y"] for g in got] == [TRUTH[op](list(r)) for r in rows]


def test_constants():
    n = Netlist("k", (Port("a", 1),), (Port("y", 2),),
                (Gate("const1", (), "y[0]"), Gate("and", ("a", "0"), "y[1]"))).validate()
    assert Simulator(n).evaluate({"a": 1}) == {"y": 1}


def test_full_adder_truth_table():
    # Full-adder truth table (common practice): sum = a xor b xor cin, cout = majority.
    table = {(0, 0, 0): (0, 0), (0, 0, 1): (1, 0), (0, 1, 0): (1, 0), (0, 1, 1): (0, 1),
             (1, 0, 0): (1, 0), (1, 0, 1): (0, 1), (1, 1, 0): (0, 1), (1, 1, 1): (1, 1)}
    sim = Simulator(ripple(1))
    for (a, b, c), (s, co) in table.items():
        assert sim.evaluate({"a": a, "b": b, "cin": c}) == {"sum": s, "cout": co}


@pytest.mark.parametrize("width", [1, 7, 64, 200])
def test_ripple_adds_like_python_integers(width):
    # Ground truth: Python's unbounded integer addition.
    rng = random.Random(width)
    sim = Simulator(ripple(width))
    vectors = [{"a": rng.getrandbits(width), "b": rng.getrandbits(width), "cin": rng.getrandbits(1)}
               for _ in range(300)]
    vectors += [{"a": 2 ** width - 1, "b": 1, "cin": 0}, {"a": 2 ** width - 1, "b": 2 ** width - 1, "cin": 1}]
    for v, out in zip(vectors, sim.evaluate_many(vectors)):
        total = v["a"] + v["b"] + v["cin"]
        assert out == {"sum": total % 2 ** width, "cout": total >> width}


def test_numpy_words_give_the_same_answers_as_python_ints():
    n = ripple(8)
    sim = Simulator(n)
    rng = np.random.default_rng(3)
    words = rng.integers(0, 2 ** 63, size=(len(n.input_bits), 16), dtype=np.uint64)
    outs = sim.run(list(words), np.uint64(2 ** 64 - 1))
    for k in range(16):
        ints = sim.run([int(w[k]) for w in words], 2 ** 64 - 1)
        assert [int(o[k]) for o in outs] == list(ints)


def test_pack_and_unpack_are_inverse():
    n = ripple(5)
    vectors = [{"a": i, "b": 31 - i, "cin": i % 2} for i in range(32)]
    words = pack(n, vectors)
    assert len(words) == 11
    ident = Netlist("id", n.inputs, (Port("y", 5),),
                    tuple(Gate("buf", (f"a[{i}]",), f"y[{i}]") for i in range(5))).validate()
    out = unpack(ident, Simulator(ident).run(words, 2 ** 32 - 1), 32)
    assert [o["y"] for o in out] == list(range(32))


def test_miter_flags_exactly_the_differing_vectors():
    good = ripple(4)
    gates = tuple(Gate("and", g.inputs[:2], g.output) if g.output == "cout" else g for g in good.gates)
    bad = Netlist("bad", good.inputs, good.outputs, gates).validate()
    miter = Miter(bad, good)
    vectors = [{"a": a, "b": b, "cin": c} for a in range(16) for b in range(16) for c in (0, 1)]
    diff = miter.run(pack(good, vectors), 2 ** len(vectors) - 1)
    for j, v in enumerate(vectors):
        a3, b3 = v["a"] >> 3, v["b"] >> 3
        carry3 = ((v["a"] & 7) + (v["b"] & 7) + v["cin"]) >> 3
        majority = (a3 & b3) | (carry3 & (a3 | b3))
        assert (diff >> j & 1) == int(majority != (a3 & b3))
