"""Constructs found in real adders: assignment patterns, inner inout ports used one way,
if/else-if chains and case statements complete in two-valued logic, --param with enum members
and strings; notes for what is ignored and for front-end warnings that can change meaning."""

from __future__ import annotations

import itertools
from pathlib import Path

import pytest

from verify.errors import InputError
from verify.formats import load
from verify.formats.notes import collect
from verify.sim import Simulator
from tests.test_verilog_harness import HAVE_IVERILOG, simulate

needs_iverilog = pytest.mark.skipif(not HAVE_IVERILOG, reason="iverilog/vvp not installed")


def write(tmp_path: Path, name: str, text: str) -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


_PATTERNS = """module pat(input [7:0] a, input [3:0] b, output [7:0] y1, output [7:0] y2,
           output [7:0] y3, output [15:0] y4, output [7:0] y5);
  typedef struct packed { logic [3:0] hi; logic [3:0] lo; } pair_t;
  logic [7:0] arr [0:1];
  assign arr = '{a, ~a};
  assign y1 = '{default: '0};
  pair_t p;
  assign p = '{hi: b, lo: 4'h5};
  assign y2 = p;
  assign y3 = arr[1];
  logic [1:0][7:0] q;
  assign q = '{1: a, default: 8'hF0};
  assign y4 = q;
  assign y5 = '{8{1'b1}};
endmodule
"""


def test_assignment_patterns_default_positional_by_index_and_replicated(tmp_path):
    sim = Simulator(load([write(tmp_path, "pat.sv", _PATTERNS)]))
    for a in (0, 0x3C, 0xFF, 0x81):
        for b in (0, 0xA, 0xF):
            # IEEE 1800 10.9 (from memory): the first element of a pattern is the leftmost one;
            # expected values computed with Python integers
            assert sim.evaluate({"a": a, "b": b}) == {
                "y1": 0, "y2": b << 4 | 5, "y3": ~a & 0xFF, "y4": a << 8 | 0xF0, "y5": 0xFF}


def test_assignment_pattern_in_a_block(tmp_path):
    f = write(tmp_path, "pb.sv", """module pb(input [3:0] a, input s, output logic [3:0] y);
  always_comb begin
    y = '{default: 1'b0};
    if (s) y = a;
  end
endmodule
""")
    sim = Simulator(load([f]))
    assert all(sim.evaluate({"a": a, "s": s}) == {"y": a if s else 0}
               for a in range(16) for s in (0, 1))  # Python integers


_LEAF = """module leaf(inout x, inout z, output y);
  assign y = ~x;
  assign z = x;
endmodule
"""


def test_inner_inout_ports_used_one_way_become_input_and_output(tmp_path):
    f = write(tmp_path, "io.v", _LEAF + """module top(input a, output y, output w);
  wire z;
  leaf u(.x(a), .z(z), .y(y));
  assign w = z;
endmodule
""")
    with collect() as notes:
        sim = Simulator(load([f]))
    assert [sim.evaluate({"a": a}) for a in (0, 1)] == [{"y": 1, "w": 0}, {"y": 0, "w": 1}]
    text = [str(n) for n in notes]
    assert any("io.v:7" in t and "'x'" in t and "treated as an input" in t for t in text)
    assert any("'z'" in t and "treated as an output" in t for t in text)


def test_inout_driven_from_both_sides_is_refused(tmp_path):
    f = write(tmp_path, "io2.v", _LEAF + """module top(input a, b, output y, output w);
  wire z;
  assign z = b;
  leaf u(.x(a), .z(z), .y(y));
  assign w = z;
endmodule
""")
    with pytest.raises(InputError, match=r"'z' has more than one driver"):
        load([f])


def test_inout_passed_on_to_another_inout_is_refused(tmp_path):
    f = write(tmp_path, "io3.v", _LEAF + """module mid(inout m, output y);
  wire z;
  leaf v(.x(m), .z(z), .y(y));
endmodule
module top(input a, output y);
  wire n = a;
  mid u(.m(n), .y(y));
endmodule
""")
    with pytest.raises(InputError, match=r"port 'm' of module 'mid' is inout"):
        load([f])


_CHAIN = """module chain(input c, input [1:0] s, input [3:0] a, b,
             output reg [3:0] y, output reg [3:0] z);
  always @* begin
    if (c == 1'b1) y = a;
    else if (c == 1'b0) y = b;
  end
  always @* begin
    if (s == 2'd0) z = a;
    else if (s == 2'd1) z = b;
    else if (s[1] & s[0]) z = a | b;
    else if (s == 2'b10) z = a & b;
  end
endmodule
"""


@needs_iverilog
def test_complete_if_chains_are_not_latches_and_match_icarus(tmp_path):
    f = write(tmp_path, "chain.v", _CHAIN)
    with collect() as notes:
        n = load([f])
    assert any("two-valued logic" in str(x) and "chain.v:5" in str(x) for x in notes)
    vecs = [{"c": c, "s": s, "a": a, "b": b} for c in (0, 1) for s in range(4)
            for a in (0, 5, 12, 15) for b in (0, 3, 10)]
    ours = Simulator(n).evaluate_many(vecs)
    ref = simulate([f], "chain", {"c": 1, "s": 2, "a": 4, "b": 4}, {"y": 4, "z": 4}, vecs)
    assert ours == ref  # Icarus Verilog, an event-driven simulator


def test_complete_case_on_a_computed_selector(tmp_path):
    f = write(tmp_path, "cs.sv", """module cs(input [1:0] s, input [3:0] a, b, output logic [3:0] z);
  always_comb begin
    case (1'b1)
      s == 2'd0: z = a;
      s == 2'd1: z = b;
      s[1]: z = a ^ b;
    endcase
  end
endmodule
""")
    sim = Simulator(load([f]))
    for s, a, b in itertools.product(range(4), range(16), (0, 9)):
        want = a if s == 0 else b if s == 1 else a ^ b  # Python integers
        assert sim.evaluate({"s": s, "a": a, "b": b}) == {"z": want}


def test_an_incomplete_chain_is_still_a_latch(tmp_path):
    f = write(tmp_path, "lat.v", """module lat(input [1:0] s, input [3:0] a, output reg [3:0] y);
  always @* begin
    if (s == 2'd0) y = a;
    else if (s == 2'd1) y = ~a;
    else if (s == 2'd2) y = 4'd0;
  end
endmodule
""")
    with pytest.raises(InputError, match="implies a latch"):
        load([f])


_MODES = """typedef enum logic [1:0] {FAST, SMALL, ODD} mode_t;
module modes #(parameter string NAME = "plain", parameter mode_t MODE = FAST)
              (input [3:0] a, b, output [4:0] y);
  assign y = (MODE == SMALL) ? a + b : (MODE == ODD ? a - b : a + b + (NAME == "carry"));
endmodule
"""


def test_param_takes_enum_members_and_strings(tmp_path):
    f = write(tmp_path, "modes.sv", _MODES)
    cases = [({}, lambda a, b: a + b), ({"MODE": "SMALL"}, lambda a, b: a + b),
             ({"MODE": "ODD"}, lambda a, b: (a - b) & 31),
             ({"NAME": "carry"}, lambda a, b: a + b + 1),
             ({"NAME": '"carry"'}, lambda a, b: a + b + 1),
             ({"NAME": "other"}, lambda a, b: a + b)]
    for params, fn in cases:
        sim = Simulator(load([f], params=params))
        for a, b in itertools.product(range(16), (0, 7, 15)):
            assert sim.evaluate({"a": a, "b": b}) == {"y": fn(a, b)}, params  # Python integers
    with pytest.raises(InputError, match="NOPE"):
        load([f], params={"MODE": "NOPE"})


def test_meaningful_front_end_warnings_are_notes_with_file_and_line(tmp_path):
    f = write(tmp_path, "warn.v", """module inner(input [3:0] x, output [3:0] y);
  assign y = x;
endmodule
module warn(input [7:0] a, output [3:0] y, output [3:0] z);
  wire [3:0] t;
  assign t = a;
  inner u(.x(a), .y(y));
  inner v(.y(z));
endmodule
""")
    with collect() as notes:
        with pytest.raises(InputError, match="never driven|floats"):
            load([f])  # the unconnected input of v floats and reaches z
    text = [str(n) for n in notes]
    assert any("warn.v:6" in t and "truncat" in t for t in text), text
    assert any("warn.v:7" in t and "truncat" in t.lower() for t in text), text
    assert any("warn.v:8" in t and "no connection" in t for t in text), text
    assert len(text) == len(set(text))  # once each


def test_post_synthesis_netlist_with_vendor_cell_models(tmp_path):
    cells = write(tmp_path, "cells.v", """`suppress_faults
`enable_portfaults
`celldefine
`delay_mode_path
module XO2 (Y, A, B);
  output Y; input A, B;
  xor #1 (Y, A, B);
  specify
    specparam tpd = 0.1;
    (A => Y) = (tpd, tpd);
    (B => Y) = (0.1, 0.1);
    $width(posedge A, 0.1);
  endspecify
endmodule
primitive u_maj (y, a, b, c);
  output y; input a, b, c;
  table
    1 1 ? : 1;  1 ? 1 : 1;  ? 1 1 : 1;
    0 0 ? : 0;  0 ? 0 : 0;  ? 0 0 : 0;
  endtable
endprimitive
module MJ3 (Y, A, B, C);
  output Y; input A, B, C;
  u_maj (Y, A, B, C);
endmodule
`endcelldefine
`nosuppress_faults
`disable_portfaults
""")
    net = write(tmp_path, "net.v", """`timescale 1ns/1ps
module fa(input a, b, ci, output s, co);
  wire x;
  XO2 u1 (.Y(x), .A(a), .B(b));
  XO2 u2 (.Y(s), .A(x), .B(ci));
  MJ3 u3 (.Y(co), .A(a), .B(b), .C(ci));
endmodule
""")
    with collect() as notes:
        sim = Simulator(load([net, cells]))
    for a, b, c in itertools.product((0, 1), repeat=3):
        assert sim.evaluate({"a": a, "b": b, "ci": c}) == {"s": a ^ b ^ c, "co": int(a + b + c >= 2)}
    text = " | ".join(str(n) for n in notes)
    assert "`suppress_faults" in text and "timescale" in text and "specify" in text
    assert "delays" in text


def test_unpacked_array_parameters_indexed_by_loop_variables(tmp_path):
    f = write(tmp_path, "parr.sv", """module parr(input [3:0] a, output logic [3:0] y);
  typedef enum logic [1:0] {W_P, B_P, G_P} proc_t;
  localparam proc_t P [2][2] = '{'{W_P, B_P}, '{G_P, W_P}};
  localparam logic [3:0] K [0:1] = '{4'd3, 4'd9};
  always_comb begin
    for (int i = 0; i < 2; i++) y[i] = (P[i][1] == W_P) ? a[i] : ~a[i];
    for (int i = 2; i < 4; i++) y[i] = K[i-2][i] ^ a[i];
  end
endmodule
""")
    sim = Simulator(load([f]))
    for a in range(16):
        # worked by hand from the declarations: P[0][1] = B_P, P[1][1] = W_P; K[0] = 3 has bit 2
        # clear, K[1] = 9 has bit 3 set; so bits 0 and 3 are inverted (Python integers)
        assert sim.evaluate({"a": a}) == {"y": a ^ 0b1001}


def test_initial_block_with_only_system_tasks_is_ignored_with_a_note(tmp_path):
    f = write(tmp_path, "dump.v", """module dump(input a, b, output y);
  assign y = a ^ b;
  initial begin
    $dumpfile("dump.vcd");
    $dumpvars(0, dump);
  end
endmodule
""")
    with collect() as notes:
        sim = Simulator(load([f]))
    assert all(sim.evaluate({"a": a, "b": b}) == {"y": a ^ b} for a in (0, 1) for b in (0, 1))
    assert any("dump.v:3" in str(n) and "initial block" in str(n) for n in notes)
    g = write(tmp_path, "init.v", "module init(input a, output reg y);\n  initial y = a;\nendmodule\n")
    with pytest.raises(InputError, match="initial block"):
        load([g])


def test_path_condition_check_against_brute_force():
    from verify.formats.verilog.coverage import impossible
    from verify.model.builder import GateBuilder
    b = GateBuilder(prefix="n", fold=False, share=False)
    x, y, z = "x", "y", "z"
    cases = [
        ([x, b.not_(x)], lambda x, y, z: x and not x),
        ([b.xor_(x, y), b.not_(b.or_(x, y))], lambda x, y, z: (x != y) and not (x or y)),
        ([b.mux(x, y, z), b.not_(y), b.not_(z)], lambda x, y, z: (z if x else y) and not y and not z),
        ([b.maj(x, y, z), b.not_(b.and_(x, y))], lambda x, y, z: (x + y + z >= 2) and not (x and y)),
        ([b.or_(x, y), b.not_(x)], lambda x, y, z: (x or y) and not x),
    ]
    for lits, fn in cases:
        # brute force over the three inputs with Python booleans
        possible = any(fn(*v) for v in itertools.product((False, True), repeat=3))
        assert impossible(b, lits) == (not possible)
