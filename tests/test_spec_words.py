"""The word operations of verify/spec/to_gates.py against Python integers, exhaustively at small
widths (source: Python's own integer arithmetic and comparisons)."""

from __future__ import annotations

import itertools

import pytest

from verify.model.builder import GateBuilder
from verify.model.netlist import CONST0, Port
from verify.spec import to_gates
from tests.test_spec import simulate


def build(width: int, swidth: int, make):
    """A netlist with inputs x, y (width bits) and s (swidth bits) and outputs from make()."""
    b = GateBuilder("w_", fold=True)
    ins = (Port("x", width), Port("y", width), Port("s", swidth))
    x, y, s = (list(p.bits) for p in ins)
    outs = {name: bits for name, bits in make(b, x, y, s).items()}
    ports = {name: bits if isinstance(bits, list) else [bits] for name, bits in outs.items()}
    return b.netlist("words", ins, ports)


def signed(v: int, w: int) -> int:
    return v - (1 << w) if v >> (w - 1) else v


@pytest.mark.parametrize("w", [1, 2, 3, 4])
def test_word_operations_match_python_integers(w):
    n = 2 * w  # product and shift results kept at 2w bits

    def make(b, x, y, s):
        total, carry = to_gates.add(b, x, y, s[0])
        diff, nob = to_gates.subtract(b, x, y)
        return {"sum": total, "carry": carry, "diff": diff, "nob": nob,
                "ult": to_gates.less_than(b, x, y, signed=False),
                "slt": to_gates.less_than(b, x, y, signed=True),
                "eq": to_gates.equal(b, x, y),
                "shl": to_gates.shift_left(b, x, s, n),
                "shr": to_gates.shift_right(b, x, s, CONST0),
                "sra": to_gates.shift_right(b, x, s, x[-1]),
                "mul": to_gates.multiply(b, x, y, n)}
    net = build(w, 3, make)
    m = (1 << w) - 1
    for x, y, s in itertools.product(range(1 << w), range(1 << w), range(8)):
        got = simulate(net, {"x": x, "y": y, "s": s})
        assert got["sum"] == (x + y + (s & 1)) & m and got["carry"] == (x + y + (s & 1)) >> w
        assert got["diff"] == (x - y) & m and got["nob"] == int(x >= y)
        assert got["ult"] == int(x < y) and got["slt"] == int(signed(x, w) < signed(y, w))
        assert got["eq"] == int(x == y)
        assert got["shl"] == (x << s) % (1 << n)
        assert got["shr"] == x >> s and got["sra"] == (signed(x, w) >> s) & m
        assert got["mul"] == (x * y) % (1 << n)
