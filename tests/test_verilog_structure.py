"""Long and deep designs load without changing the interpreter's recursion limit or stack size,
and word arithmetic in verify.model.words matches Python integers."""

from __future__ import annotations

import random
import sys
from pathlib import Path

import pytest

from verify.errors import InputError
from verify.formats import load
from verify.model import words
from verify.model.builder import GateBuilder
from verify.model.netlist import Port
from verify.sim import Simulator


def write(tmp_path: Path, name: str, text: str) -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


@pytest.mark.slow
def test_4096_bit_ripple_through_generate_loops_loads(tmp_path):
    n = 4096
    f = write(tmp_path, "rip.v", f"""module fa(input a, b, c, output s, co);
  assign s = a ^ b ^ c; assign co = (a & b) | (c & (a ^ b));
endmodule
module rip #(parameter N = {n}) (input [N-1:0] a, b, output [N:0] s);
  wire [N:0] c; assign c[0] = 1'b0;
  genvar i;
  for (i = 0; i < N; i = i + 1) begin : g
    fa u(.a(a[i]), .b(b[i]), .c(c[i]), .s(s[i]), .co(c[i+1]));
  end
  assign s[N] = c[N];
endmodule
""")
    limit = sys.getrecursionlimit()
    sim = Simulator(load([f]))
    assert sys.getrecursionlimit() == limit  # the reader leaves the process settings alone
    rng = random.Random(4096)
    for _ in range(3):
        a, b = rng.getrandbits(n), rng.getrandbits(n)
        assert sim.evaluate({"a": a, "b": b}) == {"s": a + b}  # Python integers


def test_20000_chained_assigns_load(tmp_path):
    m = 20000
    body = "".join(f"  assign w[{i + 1}] = w[{i}] ^ b[{i % 2}];\n" for i in range(m))
    f = write(tmp_path, "chain.v", f"module chain(input a, input [1:0] b, output y);\n"
              f"  wire [{m}:0] w;\n  assign w[0] = a;\n{body}  assign y = w[{m}];\nendmodule\n")
    sim = Simulator(load([f]))
    for a in (0, 1):
        for b in range(4):
            # each b bit is XORed in m/2 times (an even number): y is a (Python integers)
            assert sim.evaluate({"a": a, "b": b}) == {"y": a}


def _right_nested(depth: int) -> str:
    text = "b"
    for _ in range(depth):
        text = f"(a ^ {text})"  # right-nested: cannot be walked as a left chain
    return text


def test_moderate_nesting_loads_and_deep_nesting_is_refused(tmp_path):
    f = write(tmp_path, "ok.v", "module ok(input a, b, output y);\n"
              f"  assign y = {_right_nested(101)};\nendmodule\n")
    sim = Simulator(load([f]))
    for a in (0, 1):
        for b in (0, 1):
            assert sim.evaluate({"a": a, "b": b}) == {"y": b ^ a}  # a XORed 101 times (odd)
    f = write(tmp_path, "deep.v", "module deep(input a, b, output y);\n"
              f"  assign y = {_right_nested(3000)};\nendmodule\n")
    with pytest.raises(InputError, match="nested"):  # slang's limit or ours, one line either way
        load([f])


@pytest.mark.parametrize("width", [1, 5, 8])
def test_words_against_python_integers(width):
    b = GateBuilder(prefix="n", fold=False, share=False)
    x = [f"x[{i}]" for i in range(width)] if width > 1 else ["x"]
    y = [f"y[{i}]" for i in range(width)] if width > 1 else ["y"]
    k = [f"k[{i}]" for i in range(3)]
    mask = (1 << width) - 1
    outs = {"add": words.add(b, x, y)[0], "sub": words.subtract(b, x, y)[0],
            "neg": words.negate(b, x), "mul": words.multiply(b, x, y),
            "shl": words.shift(b, x, k, left=True), "shr": words.shift(b, x, k, left=False),
            "sra": words.shift(b, x, k, left=False, fill=x[-1])}
    cmps = ["==", "!=", "<", "<=", ">", ">="]
    for op in cmps:
        outs[f"u{op}"] = [words.compare(b, op, x, y, False)]
        outs[f"s{op}"] = [words.compare(b, op, x, y, True)]
    names = {o: f"o{i}" for i, o in enumerate(outs)}
    n = b.netlist("w", [Port("x", width), Port("y", width), Port("k", 3)],
                  {names[o]: bits for o, bits in outs.items()})
    sim = Simulator(n)

    def sgn(v):
        return v - (1 << width) if v >> (width - 1) & 1 else v
    import operator
    pyops = {"==": operator.eq, "!=": operator.ne, "<": operator.lt, "<=": operator.le,
             ">": operator.gt, ">=": operator.ge}
    rng = random.Random(width)
    for _ in range(200):
        xv, yv, kv = rng.getrandbits(width), rng.getrandbits(width), rng.getrandbits(3)
        got = sim.evaluate({"x": xv, "y": yv, "k": kv})
        # Python integers, masked to the width (two's complement for the signed readings)
        want = {"add": (xv + yv) & mask, "sub": (xv - yv) & mask, "neg": -xv & mask,
                "mul": (xv * yv) & mask, "shl": (xv << kv) & mask, "shr": xv >> kv,
                "sra": (sgn(xv) >> kv) & mask}
        for op in cmps:
            want[f"u{op}"] = int(pyops[op](xv, yv))
            want[f"s{op}"] = int(pyops[op](sgn(xv), sgn(yv)))
        assert {o: got[names[o]] for o in outs} == want
