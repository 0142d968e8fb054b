"""Nets with several drivers are refused in every source order, naming every driver; duplicate
module definitions are refused; Icarus Verilog shows such a design really is broken."""

from __future__ import annotations

import re
from pathlib import Path

import pytest

from verify.errors import InputError
from verify.formats import load
from tests.test_verilog_harness import HAVE_IVERILOG, simulate

needs_iverilog = pytest.mark.skipif(not HAVE_IVERILOG, reason="iverilog/vvp not installed")


def write(tmp_path: Path, name: str, text: str) -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


# a 4-bit ripple-carry adder written with generate/propagate; LEFTOVER is a stray second driver
# of c[2] placed at different points of the source
_RIPPLE = """module rca4(input [3:0] a, b, output [4:0] s);
  wire [3:0] g = a & b;
  wire [3:0] p = a ^ b;
  wire [4:0] c;
  assign c[0] = 1'b0;
{before}  assign c[1] = g[0] | (p[0] & c[0]);
{middle}  assign c[2] = g[1] | (p[1] & c[1]);
  assign s[1:0] = p[1:0] ^ c[1:0];
{after}  assign c[3] = g[2] | (p[2] & c[2]);
  assign c[4] = g[3] | (p[3] & c[3]);
  assign s[3:2] = p[3:2] ^ c[3:2];
  assign s[4] = c[4];
endmodule
"""
_LEFTOVER = "  assign c[2] = g[1];\n"


def _ripple(position: str) -> str:
    parts = {"before": "", "middle": "", "after": ""}
    parts[position] = _LEFTOVER
    return _RIPPLE.format(**parts)


def _lines_named(err: InputError, name: str) -> set[int]:
    return {int(m) for m in re.findall(rf"{re.escape(name)}:(\d+)", str(err))}


@pytest.mark.parametrize("position, leftover_line", [
    ("before", 6),   # second driver, then the real driver, then readers (reader/driver/driver)
    ("middle", 7),   # stray driver just before the real one
    ("after", 9),    # driver, reader (s[1:0] and c[3] read c[2]), second driver
])
def test_second_driver_is_refused_in_every_order(tmp_path, position, leftover_line):
    f = write(tmp_path, "rca.v", _ripple(position))
    with pytest.raises(InputError, match=r"net 'c\[2\]' has more than one driver") as ei:
        load([f])
    real = 8 if position == "before" else (8 if position == "middle" else 7)
    # both drivers are named with their lines (counted by hand in _RIPPLE)
    assert _lines_named(ei.value, "rca.v") >= {leftover_line, real}


def test_driver_reader_driver_with_the_reader_first_in_another_module(tmp_path):
    # the reader comes before both drivers in the source
    f = write(tmp_path, "rd.v", """module rd(input a, b, output y);
  wire w;
  assign y = ~w;
  assign w = a;
  assign w = b;
endmodule
""")
    with pytest.raises(InputError, match=r"'w' has more than one driver \(2: .*rd\.v:4.*rd\.v:5"):
        load([f])


_CHILD = "module inv(input x, output y);\n  assign y = ~x;\nendmodule\n"


def test_two_instances_driving_one_wire(tmp_path):
    f = write(tmp_path, "two.v", _CHILD + """module two(input a, b, output y);
  wire w;
  inv u1(.x(a), .y(w));
  inv u2(.x(b), .y(w));
  assign y = w;
endmodule
""")
    with pytest.raises(InputError, match=r"'w' has more than one driver \(2: .*two\.v:6.*two\.v:7"):
        load([f])


def test_assign_and_instance(tmp_path):
    f = write(tmp_path, "ai.v", _CHILD + """module ai(input a, b, output y);
  wire w;
  assign w = a & b;
  inv u1(.x(a), .y(w));
  assign y = w;
endmodule
""")
    with pytest.raises(InputError, match=r"'w' has more than one driver \(2: .*ai\.v:6.*ai\.v:7"):
        load([f])


def test_assign_and_always(tmp_path):
    f = write(tmp_path, "aa.sv", """module aa(input a, b, output logic y);
  always_comb y = a | b;
  assign y = a & b;
endmodule
""")
    with pytest.raises(InputError, match=r"'y' has more than one driver"):
        load([f])


def test_primitive_and_assign(tmp_path):
    f = write(tmp_path, "pa.v", """module pa(input a, b, output y);
  wire w;
  and g1(w, a, b);
  assign w = a;
  assign y = w;
endmodule
""")
    with pytest.raises(InputError, match=r"'w' has more than one driver \(2: .*pa\.v:3.*pa\.v:4"):
        load([f])


def test_a_net_that_reaches_no_output_is_refused_too(tmp_path):
    f = write(tmp_path, "dead.v", """module dead(input a, b, output y);
  wire unused;
  assign unused = a;
  assign unused = b;
  assign y = a ^ b;
endmodule
""")
    with pytest.raises(InputError, match=r"'unused' has more than one driver"):
        load([f])


def test_duplicate_module_definitions_across_files(tmp_path):
    one = write(tmp_path, "one.v", _CHILD + "module top(input a, output y);\n  inv u(.x(a), .y(y));\n"
                "endmodule\n")
    two = write(tmp_path, "two.v", "module inv(input x, output y);\n  assign y = x;\nendmodule\n")
    with pytest.raises(InputError, match=r"'inv' is defined twice: at .*one\.v:1:8 and at .*two\.v:1:8"):
        load([one, two])
    with pytest.raises(InputError, match=r"'inv' is defined twice: at .*two\.v:1:8 and at .*one\.v:1:8"):
        load([two, one])


@needs_iverilog
def test_icarus_shows_the_doubly_driven_adder_is_broken(tmp_path):
    # outside reference: an event-driven simulator resolves the two drivers of c[2]; wherever
    # they disagree the wire is x, so the sum is not a + b for some inputs
    f = write(tmp_path, "rca.v", _ripple("after"))
    vecs = [{"a": a, "b": b} for a in range(16) for b in range(16)]
    got = simulate([f], "rca4", {"a": 4, "b": 4}, {"s": 5}, vecs)
    wrong = [v for v, r in zip(vecs, got) if r["s"] != v["a"] + v["b"]]
    assert wrong, "expected Icarus Verilog to show wrong or unknown sums"
    # the same design without the stray line is a correct adder under Icarus Verilog
    g = write(tmp_path, "ok.v", _RIPPLE.format(before="", middle="", after=""))
    good = simulate([g], "rca4", {"a": 4, "b": 4}, {"s": 5}, vecs)
    assert all(r["s"] == v["a"] + v["b"] for v, r in zip(vecs, good))  # Python integers


def test_an_output_written_by_two_blocks_is_refused(tmp_path):
    # each block writes y before reading it, but the port itself is read by whoever uses it
    f = write(tmp_path, "two_blocks.v", """module tb2(input a, b, output reg y);
  always @* y = a & b;
  always @* y = a | b;
endmodule
""")
    with pytest.raises(InputError, match=r"'y' has more than one driver"):
        load([f])
    g = write(tmp_path, "inner.v", """module inner(input a, b, output reg y);
  always @* y = a & b;
  always @* y = a | b;
endmodule
module outer(input a, b, output z);
  inner u(.a(a), .b(b), .y(z));
endmodule
""")
    with pytest.raises(InputError, match=r"'u\.y' has more than one driver"):
        load([g])
