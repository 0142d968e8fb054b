"""The Verilog/SystemVerilog reader: the Larkspur corpus against Python integers and iverilog,
every supported construct, every refusal, width sweeps and round trips through the writer."""

from __future__ import annotations

import random
import re
from pathlib import Path

import pytest

import verify
from verify.errors import InputError
from verify.formats import load
from verify.formats.verilog import reader as verilog
from verify.formats.verilog import writer as verilog_writer
from verify.sim import Simulator

from tests.test_verilog_harness import CORPUS, HAVE_IVERILOG, simulate, vectors

needs_iverilog = pytest.mark.skipif(not HAVE_IVERILOG,
                                    reason="iverilog/vvp not installed: the cross-check against an "
                                           "independent simulator cannot run")


def corpus(name: str, **kw):
    return load([CORPUS / name], **kw)


def widths(n):
    return ({p.name: p.width for p in n.inputs}, {p.name: p.width for p in n.outputs})


def run(n, vecs):
    return Simulator(n).evaluate_many(vecs)


def write(tmp_path: Path, name: str, text: str) -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


# ---- the corpus against Python integer arithmetic ------------------------------------------

def _add(v, w):  # {cout, sum} = a + b + cin, from Python integers
    t = v["a"] + v["b"] + v.get("cin", 0)
    return {"sum": t & ((1 << w) - 1), "cout": t >> w}


ADDERS = [
    ("larkspur_rca_gates.v", {"W": 6}, 6),
    ("larkspur_cla16.v", {}, 16),
    ("larkspur_ks.sv", {"W": 16}, 16),
    ("larkspur_ks.sv", {"W": 13}, 13),  # not a power of two
    ("larkspur_comb_rca.sv", {"W": 7}, 7),
    ("larkspur_csel.sv", {"W": 12, "B": 3}, 12),
    ("larkspur_bk_comb.sv", {"W": 1}, 1),
    ("larkspur_bk_comb.sv", {"W": 5}, 5),
    ("larkspur_bk_comb.sv", {"W": 32}, 32),
]


@pytest.mark.parametrize("name,params,w", ADDERS)
def test_adders_match_python_integers(name, params, w):
    n = corpus(name, params=params)
    assert n.width("a") == w and n.width("sum") == w
    vecs = vectors(widths(n)[0], 400, seed=w)
    for v, got in zip(vecs, run(n, vecs)):
        assert got == _add(v, w), (name, v)  # Python integers


def test_adder_subtractor_matches_python_integers():
    n = corpus("larkspur_addsub.v", params={"W": 5})
    for a in range(32):
        for b in range(32):
            for sub in (0, 1):
                got = Simulator(n).evaluate({"a": a, "b": b, "sub": sub})
                t = a + ((b ^ 31) if sub else b) + sub
                sa, sbv = a - 32 * (a >> 4), b - 32 * (b >> 4)
                exact = sa - sbv if sub else sa + sbv  # signed value, Python integers
                assert got["res"] == t & 31 and got["cout"] == t >> 5
                assert got["ovf"] == int(not -16 <= exact <= 15)


def test_incrementer_and_three_operand_adder_exhaustive():
    inc = corpus("larkspur_inc.v", params={"W": 6})
    sim = Simulator(inc)
    for a in range(64):
        assert sim.evaluate({"a": a}) == {"y": (a + 1) & 63, "co": (a + 1) >> 6}  # Python ints
    add3 = corpus("larkspur_add3.sv", params={"W": 3})
    sim = Simulator(add3)
    for a in range(8):
        for b in range(8):
            for c in range(8):
                assert sim.evaluate({"a": a, "b": b, "c": c}) == {"sum": a + b + c}


def test_signed_flags_match_python_integers():
    n = corpus("larkspur_sadd_flags.sv", params={"W": 5})
    sim = Simulator(n)
    for a in range(32):
        for b in range(32):
            sa, sb = a - 32 * (a >> 4), b - 32 * (b >> 4)
            t = sa + sb
            sat = max(-16, min(15, t))
            got = sim.evaluate({"a": a, "b": b})
            assert got == {"sum": t & 31, "ovf": int(not -16 <= t <= 15), "sat": sat & 31,
                           "neg": int(t < 0), "lt": int(sa < sb)}, (sa, sb)


@pytest.mark.parametrize("name,spec", [
    ("larkspur_cla16.v", "{cout, sum} = a + b + cin"),
    ("larkspur_ks.sv", "{cout, sum} = a + b + cin"),
    ("larkspur_csel.sv", "{cout, sum} = a + b + cin"),
    ("larkspur_inc.v", "{co, y} = a + 1"),
])
def test_correct_designs_are_established_by_an_engine(name, spec):
    r = verify.check(corpus(name), spec)
    assert r.verdict in (verify.Verdict.PROVEN, verify.Verdict.EXHAUSTIVE), r.verdict


@pytest.mark.parametrize("name", ["larkspur_ks_bug.sv", "larkspur_rca_bug.v", "larkspur_csel_bug.sv"])
def test_wrong_designs_fail_with_a_real_counterexample(name):
    n = corpus(name)
    r = verify.check(n, "{cout, sum} = a + b + cin")
    assert r.verdict == verify.Verdict.FAIL
    ce = r.counterexample.inputs
    w = n.width("a")
    assert Simulator(n).evaluate(ce) != _add(ce, w)  # Python integers disagree with the design


# ---- the corpus against Icarus Verilog ----------------------------------------------------

CROSS = [
    ("larkspur_rca_gates.v", {"W": 5}), ("larkspur_rca_gates.v", {}), ("larkspur_cla16.v", {}),
    ("larkspur_ks.sv", {"W": 16}), ("larkspur_ks.sv", {"W": 11}), ("larkspur_ks_bug.sv", {}),
    ("larkspur_comb_rca.sv", {}), ("larkspur_csel.sv", {"W": 12, "B": 4}),
    ("larkspur_addsub.v", {}), ("larkspur_inc.v", {}), ("larkspur_add3.sv", {"W": 6}),
    ("larkspur_sadd_flags.sv", {}), ("larkspur_rca_bug.v", {}), ("larkspur_mix.sv", {}),
    ("larkspur_rules.sv", {}), ("larkspur_case_widths.sv", {}), ("larkspur_alu_pkg.sv", {}),
    ("larkspur_fields.sv", {}), ("larkspur_bk_comb.sv", {"W": 16}), ("larkspur_bk_comb.sv", {"W": 11}),
    ("larkspur_csel_bug.sv", {}), ("larkspur_addsub_bug.v", {}), ("larkspur_dyn_write.sv", {}),
]


@needs_iverilog
@pytest.mark.parametrize("name,params", CROSS)
def test_iverilog_gives_exactly_our_evaluation(name, params):
    n = corpus(name, params=params)
    ins, outs = widths(n)
    vecs = vectors(ins, 250, seed=len(name))
    ref = simulate([CORPUS / name], n.name, ins, outs, vecs, params)  # Icarus Verilog
    got = run(n, vecs)
    bad = [(v, r, g) for v, r, g in zip(vecs, ref, got) if r != g]
    assert not bad, bad[:2]


def test_rules_design_against_hand_values():
    """Width and sign rules, IEEE 1800-2017 11.6-11.8 (from memory), on one vector."""
    n = corpus("larkspur_rules.sv")
    got = Simulator(n).evaluate({"a": 15, "sb": 15, "c": 15})  # sb is -1
    assert got["carry_kept"] == 30          # the 5-bit context keeps the carry
    assert got["carry_lost"] == 15          # the shift happens at 5 bits too
    assert got["carry_cut"] == 14           # a concatenation operand is self-determined
    assert got["mixed"] == 30               # unsigned expression: -1 zero-extends to 15
    assert got["both_signed"] == 254        # -1 + -1 = -2 at 8 bits
    assert got["cmp_mixed"] == 0            # 15 < 15 unsigned
    assert got["ashr"] == 15 and got["ashr_u"] == 3
    assert got["prod"] == 225 and got["tern"] == 15
    got = Simulator(n).evaluate({"a": 2, "sb": 8, "c": 0})  # sb is -8
    assert got["cmp_mixed"] == 0 and got["cmp_signed"] == 1  # 8 < 2 unsigned; -8 < 2 signed
    assert got["ashr"] == 0b1110            # -8 >>> 2 = -2
    assert got["mixed"] == 10 and got["logic_ops"] == 0b01


# ---- names, ports and locations -----------------------------------------------------------

def test_hierarchical_names_and_sources():
    n = corpus("larkspur_rca_gates.v", params={"W": 4})
    nets = {g.output for g in n.gates}
    assert "bit_slice[1].odd.fa.p" in nets and "bit_slice[2].even.fa.p" in nets
    assert "c[2]" in nets  # the parent's carry names the child's output gate
    src = next(g.source for g in n.gates if g.output == "bit_slice[1].odd.fa.p")
    assert re.fullmatch(r".*larkspur_rca_gates\.v:6 bit_slice\[1\]\.odd\.fa", src), src


def test_two_dimensional_array_names():
    n = corpus("larkspur_ks.sv", params={"W": 8})
    nets = {g.output for g in n.gates}
    assert "g[2][5]" in nets and "p[1][3]" in nets


def test_ascending_port_range_bit0_is_the_least_significant(tmp_path):
    f = write(tmp_path, "asc.v", "module asc(input [0:3] a, output [0:3] y, output lsb);\n"
              "  assign y = a + 4'd1;\n  assign lsb = a[3];\nendmodule\n")
    n = load([f])
    assert n.width("a") == 4
    sim = Simulator(n)
    for a in range(16):  # Verilog reads [0:3] as a number with a[3] least significant
        assert sim.evaluate({"a": a}) == {"y": (a + 1) & 15, "lsb": a & 1}


def test_top_is_found_or_chosen(tmp_path):
    f = write(tmp_path, "two.v", "module one(input a, output y); assign y = a; endmodule\n"
              "module two(input a, output y); assign y = ~a; endmodule\n")
    with pytest.raises(InputError, match=r"several candidate top modules \(one, two\).*--top"):
        load([f])
    assert Simulator(load([f], top="two")).evaluate({"a": 0}) == {"y": 1}
    with pytest.raises(InputError):
        load([f], top="three")


def test_several_files_and_the_top_found_automatically(tmp_path):
    leaf = write(tmp_path, "leaf.v", "module leaf(input x, y, output z); assign z = x ^ y; endmodule\n")
    top = write(tmp_path, "top.v", "module top(input [1:0] a, output o);\n"
                "  leaf u (.x(a[0]), .y(a[1]), .z(o));\nendmodule\n")
    n = load([leaf, top])
    assert n.name == "top"
    assert [Simulator(n).evaluate({"a": a})["o"] for a in range(4)] == [0, 1, 1, 0]


# ---- parameters, defines, includes, sweeps ------------------------------------------------

def test_defines_and_include_dirs(tmp_path):
    inc = tmp_path / "inc"
    inc.mkdir()
    (inc / "larkspur_widths.vh").write_text("`define LARKSPUR_W 6\n")
    f = write(tmp_path, "d.v", '`include "larkspur_widths.vh"\n'
              "module d #(parameter W = `LARKSPUR_W) (input [W-1:0] a, output [W-1:0] y);\n"
              "`ifdef FLIP\n  assign y = ~a;\n`else\n  assign y = a;\n`endif\nendmodule\n")
    n = load([f], include_dirs=[str(inc)])
    assert n.width("a") == 6 and Simulator(n).evaluate({"a": 5}) == {"y": 5}
    n = load([f], include_dirs=[str(inc)], defines={"FLIP": None, "LARKSPUR_W": "3"})
    assert n.width("a") == 3 and Simulator(n).evaluate({"a": 5}) == {"y": 2}
    with pytest.raises(InputError, match=r"d\.v:1:\d+: .*larkspur_widths\.vh"):
        load([f])  # no include folder


def test_param_errors():
    with pytest.raises(InputError, match="has no parameter 'Q'.*parameters: W"):
        corpus("larkspur_ks.sv", params={"Q": 3})
    with pytest.raises(InputError, match="'L' is a localparam"):
        corpus("larkspur_ks.sv", params={"L": 3})


def test_width_sweep_parses_once_and_reelaborates(monkeypatch):
    from pyslang import syntax
    verilog._TREE_CACHE.clear()
    calls = []
    real = syntax.SyntaxTree.fromFile

    def counting(*a, **k):
        calls.append(a[0])
        return real(*a, **k)

    monkeypatch.setattr(syntax.SyntaxTree, "fromFile", counting)
    for w in (4, 8, 16, 32):
        n = corpus("larkspur_ks.sv", params={"W": w})
        assert n.width("sum") == w
        v = {"a": (1 << w) - 1, "b": 1, "cin": 1}
        assert Simulator(n).evaluate(v) == _add(v, w)  # Python integers
    assert len(calls) == 1


def test_edited_file_is_parsed_again(tmp_path):
    f = write(tmp_path, "e.v", "module e(input a, output y); assign y = a; endmodule\n")
    assert Simulator(load([f])).evaluate({"a": 1}) == {"y": 1}
    f.write_text("module e(input a, output y); assign y = ~a;   endmodule\n")
    assert Simulator(load([f])).evaluate({"a": 1}) == {"y": 0}


# ---- constructs ---------------------------------------------------------------------------

def _fn(tmp_path, body: str, ports: str, name: str = "t"):
    f = write(tmp_path, f"{name}.sv", f"module {name} ({ports});\n{body}\nendmodule\n")
    return load([f])


def test_full_case_with_x_default_is_accepted(tmp_path):
    n = _fn(tmp_path, """
  always_comb begin
    case (s)
      2'd0: y = a;  2'd1: y = b;  2'd2: y = a & b;  2'd3: y = a | b;
      default: y = 'x;
    endcase
  end""", "input logic [1:0] s, input logic [3:0] a, b, output logic [3:0] y")
    sim = Simulator(n)
    for s in range(4):
        for a in range(16):
            b = (a * 7) & 15
            assert sim.evaluate({"s": s, "a": a, "b": b})["y"] == [a, b, a & b, a | b][s]


def test_function_nonblocking_dynamic_index_and_unpacked_array(tmp_path):
    n = _fn(tmp_path, """
  function automatic logic [3:0] rotl(input logic [3:0] v, input int k);
    rotl = (v << k) | (v >> (4 - k));
  endfunction
  logic [3:0] tbl [0:3];
  assign tbl[0] = a; assign tbl[1] = ~a; assign tbl[2] = rotl(a, 1); assign tbl[3] = 4'h9;
  assign y = tbl[s];
  always @* z <= a ^ {2{s}};""", "input logic [1:0] s, input logic [3:0] a, output logic [3:0] y, "
                                  "output logic [3:0] z")
    sim = Simulator(n)
    for s in range(4):
        for a in range(16):
            rot = ((a << 1) | (a >> 3)) & 15
            assert sim.evaluate({"s": s, "a": a}) == {"y": [a, a ^ 15, rot, 9][s],
                                                      "z": a ^ (s | s << 2)}


def test_multiply_small_widths(tmp_path):
    n = _fn(tmp_path, "  assign p = a * b;\n  assign q = sa * sb;",
            "input [4:0] a, b, input signed [3:0] sa, sb, output [9:0] p, output signed [7:0] q")
    sim = Simulator(n)
    rng = random.Random(3)
    for _ in range(300):
        a, b, sa, sb = rng.getrandbits(5), rng.getrandbits(5), rng.getrandbits(4), rng.getrandbits(4)
        got = sim.evaluate({"a": a, "b": b, "sa": sa, "sb": sb})
        ia, ib = sa - 16 * (sa >> 3), sb - 16 * (sb >> 3)
        assert got == {"p": a * b, "q": (ia * ib) & 255}  # Python integers


def test_assign_to_concatenation_replication_and_part_selects(tmp_path):
    n = _fn(tmp_path, """
  wire [3:0] t = {2{a[1:0]}};
  assign {co, s} = a + b;
  assign r[7 -: 4] = a;
  assign r[0 +: 4] = t;""", "input [3:0] a, b, output co, output [3:0] s, output [7:0] r")
    sim = Simulator(n)
    for a in range(16):
        for b in range(16):
            assert sim.evaluate({"a": a, "b": b}) == {"co": (a + b) >> 4, "s": (a + b) & 15,
                                                      "r": (a << 4) | ((a & 3) * 5)}


# ---- refusals ------------------------------------------------------------------------------

REFUSALS = [
    ("seq.v", "module seq(input clk, input [3:0] a, output reg [3:0] q);\n"
              "  always @(posedge clk) q <= a;\nendmodule\n", r"seq\.v:2:\d+", "sequential logic"),
    ("ff.sv", "module ff(input logic clk, d, output logic q);\n  always_ff @(posedge clk) q <= d;\n"
              "endmodule\n", r"ff\.sv:2:3", "sequential logic"),
    ("latch.sv", "module latch(input logic en, input logic [3:0] a, output logic [3:0] q);\n"
                 "  always_comb begin\n    if (en) q = a;\n  end\nendmodule\n", r"latch\.sv:2:3",
     "not assigned on every path.*latch"),
    ("latch2.v", "module latch2(input [1:0] s, input a, output reg q);\n  always @* begin\n"
                 "    case (s) 2'b00: q = a; 2'b01: q = ~a; endcase\n  end\nendmodule\n",
     r"latch2\.v:2:3", "latch"),
    ("alatch.sv", "module alatch(input logic en, d, output logic q);\n"
                  "  always_latch if (en) q = d;\nendmodule\n", r"alatch\.sv:2:3", "latch"),
    ("xout.v", "module xout(input [3:0] a, output [3:0] y);\n  assign y = a[0] ? a : 4'bx;\n"
               "endmodule\n", r"xout\.v:2:25", "x or z value can reach output 'y"),
    ("zout.v", "module zout(input a, output y);\n  assign y = 1'bz;\nendmodule\n", r"zout\.v:2:14",
     "x or z"),
    ("inout.v", "module io(input [3:0] a, inout [3:0] bus, output [3:0] y);\n  assign y = a;\n"
                "endmodule\n", r"inout\.v:1:\d+", "inout"),
    ("tri.v", "module trig(input a, en, output y);\n  bufif1 b0 (y, a, en);\nendmodule\n",
     r"tri\.v:2:\d+", "tristate"),
    ("loop.v", "module loop(input a, b, output y);\n  wire t, u;\n  assign t = u & a;\n"
               "  assign u = t | b;\n  assign y = u;\nendmodule\n", r"loop\.v:\d+",
     "combinational loop"),
    ("self.v", "module selfl(input a, output y);\n  wire t;\n  assign t = t;\n  assign y = t & a;\n"
               "endmodule\n", r"self\.v:3:\d+", "combinational loop"),
    ("syntax.v", "module bad(input a, output y)\n  assign y = a;\nendmodule\n", r"syntax\.v:1:\d+",
     "expected ';'"),
    ("undecl.v", "module u(input a, output y);\n  assign y = nothing_here;\nendmodule\n",
     r"undecl\.v:2:14", "undeclared identifier"),
    ("while.sv", "module wh(input logic [3:0] a, output logic [3:0] y);\n  always_comb begin\n"
                 "    y = a;\n    while (y < 4) y = y + 1;\n  end\nendmodule\n", r"while\.sv:4:12",
     "while loop whose condition depends on a signal"),
    ("forever.sv", "module fe(input logic a, output logic y);\n  always_comb begin\n"
                   "    y = a;\n    forever y = ~y;\n  end\nendmodule\n", r"forever\.sv:4:5",
     "forever loop is not supported"),
    ("multi.v", "module multi(input a, b, output y);\n  assign y = a;\n  assign y = b;\nendmodule\n",
     r"multi\.v:2:10", "more than one driver"),
    ("undriven.v", "module und(input a, output y);\n  wire w;\n  assign y = a & w;\nendmodule\n",
     r"undriven\.v:2:8", "never driven"),
    ("sens.v", "module sens(input a, b, output reg y);\n  always @(a) y = a & b;\nendmodule\n",
     r"sens\.v:2:3", "sensitivity list does not name 'b'"),
    ("readfirst.sv", "module rf(input logic a, output logic y);\n  logic t;\n  always_comb begin\n"
                     "    y = t & a;\n    t = a;\n  end\nendmodule\n", r"readfirst\.sv:4:\d+",
     "read before"),
    ("div.v", "module dv(input [3:0] a, b, output [3:0] y);\n  assign y = a / b;\nendmodule\n",
     r"div\.v:2:14", "division"),
    ("init.v", "module it(input [3:0] a, output [3:0] y);\n  reg [3:0] r = 4'd3;\n"
               "  assign y = a + r;\nendmodule\n", r"init\.v:2:\d+", "initial value"),
    ("wand.v", "module wa(input a, b, output y);\n  wand w;\n  assign w = a;\n  assign w = b;\n"
               "  assign y = w;\nendmodule\n", r"wand\.v:2:\d+", "wand"),
    ("initial.v", "module ini(input a, output y);\n  assign y = a;\n  initial $display(\"hi\");\n"
                  "endmodule\n", r"initial\.v:3:\d+", "initial block"),
    ("noinputs.v", "module ni(output y);\n  assign y = 1'b1;\nendmodule\n", r"noinputs\.v:1:\d+",
     "no input ports"),
    ("struct.sv", "module st(input logic [7:0] a, output logic [3:0] y);\n"
                  "  typedef struct { logic [3:0] hi, lo; } pair_t;\n  pair_t p;\n"
                  "  assign p.hi = a[7:4];\n  assign y = p.hi;\nendmodule\n", r"struct\.sv:\d+:\d+",
     "member access on a value of type .*pair_t.*packed structs and unions only"),
]


@pytest.mark.parametrize("fname,text,where,what", REFUSALS, ids=[r[0] for r in REFUSALS])
def test_refusals_say_what_and_where(tmp_path, fname, text, where, what):
    f = write(tmp_path, fname, text)
    with pytest.raises(InputError) as info:
        load([f])
    err = info.value
    assert re.search(what, err.message), err.message
    assert err.where and re.fullmatch(r".*" + where, err.where), err.where


def test_unreachable_x_is_harmless(tmp_path):
    n = _fn(tmp_path, "  wire [3:0] unused = 4'bz;\n  assign y = a | (a & 4'bx & 4'b0);",
            "input [3:0] a, output [3:0] y")
    assert Simulator(n).evaluate({"a": 9}) == {"y": 9}


def test_complete_sensitivity_list_is_accepted(tmp_path):
    n = _fn(tmp_path, "  always @(a or b) y = a & b;", "input a, b, output reg y")
    assert [Simulator(n).evaluate({"a": a, "b": b})["y"] for a in (0, 1) for b in (0, 1)] == [0, 0, 0, 1]


# ---- round trips through the structural writer --------------------------------------------

@pytest.mark.parametrize("name,params", [("larkspur_rca_gates.v", {"W": 4}), ("larkspur_ks.sv", {"W": 8}),
                                         ("larkspur_mix.sv", {}), ("larkspur_sadd_flags.sv", {}),
                                         ("larkspur_bk_comb.sv", {"W": 9}),
                                         ("larkspur_dyn_write.sv", {})])
def test_round_trip_through_the_writer(tmp_path, name, params):
    n = corpus(name, params=params)
    from verify.formats import json_netlist
    again = json_netlist.parse(json_netlist.dumps(n), "round.json")
    assert again.content_hash() == n.content_hash()  # the JSON form keeps every gate
    text = verilog_writer.dumps(n)
    f = write(tmp_path, "round.v", text)
    back = load([f])
    assert widths(back) == widths(n)
    vecs = vectors(widths(n)[0], 200, seed=5)
    assert run(back, vecs) == run(n, vecs)
    if HAVE_IVERILOG:
        ins, outs = widths(n)
        assert simulate([f], back.name, ins, outs, vecs) == run(n, vecs)  # Icarus Verilog


# ---- more hierarchy and port styles -------------------------------------------------------

def test_module_instance_arrays_and_concatenations_in_connections(tmp_path):
    f = write(tmp_path, "iarr.v", """
module larkspur_fa1(input a, b, ci, output s, co);
  assign {co, s} = a + b + ci;
endmodule
module larkspur_swap(input [1:0] x, output [1:0] y);
  assign y = {x[0], x[1]};
endmodule
module iarr(input [3:0] a, b, input cin, output [3:0] s, output cout, output [3:0] y);
  wire [4:0] c;
  wire p, q;
  assign c[0] = cin;
  larkspur_fa1 u [3:0] (.a(a), .b(b), .ci(c[3:0]), .s(s), .co(c[4:1]));
  assign cout = c[4];
  larkspur_swap k (.x({a[1], a[0] ^ a[3]}), .y({p, q}));
  assign y = {a[3:2], p, q};
endmodule
""")
    n = load([f], top="iarr")
    sim = Simulator(n)
    for a in range(16):
        for b in range(16):
            for cin in (0, 1):
                t = a + b + cin  # Python integers
                swapped = ((a & 1) ^ (a >> 3)) << 1 | (a >> 1 & 1)
                assert sim.evaluate({"a": a, "b": b, "cin": cin}) == {
                    "s": t & 15, "cout": t >> 4, "y": (a & 12) | swapped}
    assert any(g.source and g.source.endswith(" u[2]") for g in n.gates)


def test_non_ansi_ports_supply_nets_and_multi_output_buf(tmp_path):
    f = write(tmp_path, "old.v", """
module old(a, b, y, z1, z2);
  input [3:0] a;
  input b;
  output [3:0] y;
  output z1, z2;
  supply1 vdd;
  supply0 gnd;
  assign y = a & {4{vdd}} | {4{gnd}};
  buf (z1, z2, b);
endmodule
""")
    n = load([f])
    assert [p.name for p in n.inputs] == ["a", "b"]
    for a in range(16):
        assert Simulator(n).evaluate({"a": a, "b": 1}) == {"y": a, "z1": 1, "z2": 1}


def test_system_functions_and_functions_reading_block_variables(tmp_path):
    f = write(tmp_path, "sysf.sv", """
module sysf #(parameter W = 8) (input logic [W-1:0] a, b, output logic [7:0] y, z,
                                 output logic [W-1:0] q);
  logic [W-1:0] t;
  function automatic logic [W-1:0] plus_t(input logic [W-1:0] v);
    plus_t = v + t;
  endfunction
  assign y = a + $clog2(W);
  assign z = $bits(a) + $size(b);
  always_comb begin
    t = a;
    q = plus_t(b);
  end
endmodule
""")
    sim = Simulator(load([f]))
    for a, b in [(5, 9), (255, 1), (0, 0), (128, 200)]:
        assert sim.evaluate({"a": a, "b": b}) == {"y": (a + 3) & 255, "z": 16, "q": (a + b) & 255}


def test_two_state_types_read_x_as_zero(tmp_path):
    # IEEE 1800 6.22.4 (from memory): a 4-state value assigned to a 2-state type maps x/z to 0
    n = _fn(tmp_path, "  bit [3:0] t;\n  assign t = 4'b1x0z;\n  assign y = a ^ t;",
            "input logic [3:0] a, output logic [3:0] y")
    assert Simulator(n).evaluate({"a": 0}) == {"y": 0b1000}


def test_edited_include_file_is_parsed_again(tmp_path):
    inc = tmp_path / "inc"
    inc.mkdir()
    header = inc / "w.vh"
    header.write_text("`define LW 4\n")
    f = write(tmp_path, "h.v", '`include "w.vh"\nmodule h(input [`LW-1:0] a, output [`LW-1:0] y);\n'
              "  assign y = a;\nendmodule\n")
    assert load([f], include_dirs=[str(inc)]).width("a") == 4
    header.write_text("`define LW 12\n")
    assert load([f], include_dirs=[str(inc)]).width("a") == 12


def test_case_width_and_sign_rules_against_hand_values():
    """IEEE 1800-2017 12.5 (from memory): case expressions extend to the widest, and sign-extend
    only when all are signed."""
    sim = Simulator(corpus("larkspur_case_widths.sv"))
    assert sim.evaluate({"a": 15, "s": 0}) == {"y": 0, "z": 0, "q": 2, "n": 4}
    assert sim.evaluate({"a": 7, "s": 6}) == {"y": 3, "z": 2, "q": 2, "n": 3}
    assert sim.evaluate({"a": 2, "s": 7}) == {"y": 0, "z": 0, "q": 3, "n": 1}  # s = -1 is 7 here


def test_sensitivity_list_is_checked_bit_by_bit(tmp_path):
    f = write(tmp_path, "part.v", "module part(input [1:0] a, output reg y);\n"
              "  always @(a[0]) y = a[0] & a[1];\nendmodule\n")
    with pytest.raises(InputError, match=r"does not name 'a\[1\]'"):
        load([f])
    f = write(tmp_path, "full.v", "module full(input [1:0] a, output reg y);\n"
              "  always @(a[0], a[1]) y = a[0] & a[1];\nendmodule\n")
    assert [Simulator(load([f])).evaluate({"a": a})["y"] for a in range(4)] == [0, 0, 0, 1]


def test_package_enum_case_and_inside(tmp_path):
    n = corpus("larkspur_alu_pkg.sv")
    sim = Simulator(n)
    for a in range(0, 64, 5):
        for b in range(0, 64, 7):
            for op in range(4):
                got = sim.evaluate({"a": a, "b": b, "op": op})
                want = [(a + b) & 63, (a - b) & 63, a & b, a | b][op]  # Python integers
                rev = int(format(a, "06b")[::-1], 2)
                assert got == {"y": want, "big": int(a >= 60), "r": rev ^ (b ^ 63)}
    n = _fn(tmp_path, "  assign y = a inside {4'd1, 4'd3, b};", "input [3:0] a, b, output y")
    sim = Simulator(n)
    assert all(sim.evaluate({"a": a, "b": b})["y"] == int(a in (1, 3, b))
               for a in range(16) for b in range(16))


def test_x_follows_verilog_semantics_through_folding(tmp_path):
    # IEEE 1364 4.1.10 truth tables (from memory): x & 0 = 0, x | 1 = 1, but x ^ x = x
    n = _fn(tmp_path, "  wire t = 1'bx;\n  assign y = (t & 1'b0) | (a & (t | 1'b1));",
            "input a, output y")
    assert [Simulator(n).evaluate({"a": a})["y"] for a in (0, 1)] == [0, 1]
    f = write(tmp_path, "xx.v", "module xx(input a, output y);\n  wire t = 1'bx;\n"
              "  assign y = a | (t ^ t);\nendmodule\n")
    with pytest.raises(InputError, match="x or z value can reach output 'y'"):
        load([f])


def test_while_loop_with_constant_bound(tmp_path):
    n = _fn(tmp_path, """
  always_comb begin
    int k;
    k = 0;
    y = 0;
    while (k < 4) begin
      y = y + (a[k] ? 4'd1 : 4'd0);
      k = k + 1;
    end
    do y = y + 1; while (0);
  end""", "input logic [3:0] a, output logic [3:0] y")
    sim = Simulator(n)
    assert all(sim.evaluate({"a": a})["y"] == bin(a).count("1") + 1 for a in range(16))


def test_packed_struct_fields_against_python_integers():
    sim = Simulator(corpus("larkspur_fields.sv"))
    for a in range(0, 256, 3):
        for b in range(16):
            hi, mid, lo = a >> 4, a >> 2 & 3, a & 3
            got = sim.evaluate({"a": a, "b": b})
            assert got == {"y": hi ^ (mid << 2 | lo), "z": b << 4 | lo,
                           "u": (a & 3) << 1 | (a >> 2 & 1)}


def test_brent_kung_written_procedurally_is_proven():
    r = verify.check(corpus("larkspur_bk_comb.sv", params={"W": 24}), "{cout, sum} = a + b + cin")
    assert r.verdict in (verify.Verdict.PROVEN, verify.Verdict.EXHAUSTIVE), r.verdict


def test_faulty_adder_subtractor_disagrees_with_python_integers():
    sim = Simulator(corpus("larkspur_addsub_bug.v", params={"W": 4}))
    wrong_res = wrong_ovf = 0
    for a in range(16):
        for b in range(16):
            for sub in (0, 1):
                got = sim.evaluate({"a": a, "b": b, "sub": sub})
                exact = (a - b) if sub else (a + b)
                sa, sb = a - 16 * (a >> 3), b - 16 * (b >> 3)
                sexact = (sa - sb) if sub else (sa + sb)
                wrong_res += got["res"] != exact & 15
                wrong_ovf += got["ovf"] != int(not -8 <= sexact <= 7)
    assert wrong_res == 256  # every subtraction is off by one (Python integers)
    assert wrong_ovf > 0


def test_writes_through_a_signal_index():
    sim = Simulator(corpus("larkspur_dyn_write.sv"))
    for s_ in range(8):
        for k in range(4):
            for a in range(16):
                m = [0, 1, 2]
                if k < 3:
                    m[k] = a & 3  # IEEE 1800 7.4.6 (from memory): an out-of-range write does nothing
                got = sim.evaluate({"s": s_, "k": k, "a": a})
                assert got == {"onehot": 1 << s_, "y": a ^ (1 << k), "mf": m[0] << 4 | m[1] << 2 | m[2]}


def test_deeply_nested_generated_expression(tmp_path):
    terms = " ^ ".join(f"a[{i}]" for i in range(3000))
    f = write(tmp_path, "deep.v", f"module deep(input [2999:0] a, output y);\n"
              f"  assign y = {terms};\nendmodule\n")
    sim = Simulator(load([f]))
    rng = random.Random(9)
    for _ in range(5):
        a = rng.getrandbits(3000)
        assert sim.evaluate({"a": a}) == {"y": bin(a).count("1") & 1}  # parity, Python integers


def test_signal_index_takes_only_the_values_it_can(tmp_path):
    # k*4 with a 1-bit k can only be 0 or 4: both parts are inside a[7:0], so no x is possible
    n = _fn(tmp_path, "  assign y = a[k*4 +: 4];", "input [7:0] a, input [0:0] k, output [3:0] y")
    assert [Simulator(n).evaluate({"a": 0xA5, "k": k})["y"] for k in (0, 1)] == [0x5, 0xA]
    # k*2 with a 2-bit k reaches a[9:6] for k = 3, two bits outside the range: x (IEEE 1800 11.5.1)
    f = write(tmp_path, "part.sv", "module part(input [7:0] a, input [1:0] k, output [3:0] y);\n"
              "  assign y = a[k*2 +: 4];\nendmodule\n")
    with pytest.raises(InputError, match="outside the declared range"):
        load([f])


def test_break_and_continue_against_python_integers():
    # (Icarus Verilog 11 has no break/continue, so this one is checked against Python only)
    sim = Simulator(corpus("larkspur_lzc.sv"))
    for a in range(256):
        ones = 0
        while ones < 8 and a >> ones & 1:
            ones += 1
        assert sim.evaluate({"a": a}) == {
            "lz": 8 - a.bit_length(), "cnt": sum(a >> i & 1 for i in range(8) if i != 3),
            "mask": (1 << ones) - 1, "found": int(ones < 8)}


def test_break_with_an_outside_loop_variable_is_refused(tmp_path):
    f = write(tmp_path, "outer.sv", "module outer(input logic [3:0] a, output logic [3:0] y);\n"
              "  integer i;\n  always_comb begin\n    y = 0;\n"
              "    for (i = 0; i < 4; i = i + 1) begin\n      if (a[i]) break;\n      y = y + 1;\n"
              "    end\n  end\nendmodule\n")
    with pytest.raises(InputError, match=r"outer\.sv:5:\d+: break depending on a signal"):
        load([f])


def test_shared_module_level_loop_index_is_accepted(tmp_path):
    f = write(tmp_path, "twoi.v", """
module twoi(input [3:0] a, b, output reg [3:0] x, output reg [3:0] y);
  integer i;
  always @* begin
    for (i = 0; i < 4; i = i + 1) x[i] = a[i] & b[i];
  end
  always @* begin
    for (i = 0; i < 4; i = i + 1) y[i] = a[i] | b[i];
  end
endmodule
""")
    sim = Simulator(load([f]))
    assert all(sim.evaluate({"a": a, "b": b}) == {"x": a & b, "y": a | b}
               for a in range(16) for b in range(16))


# A recursive conditional adder: radd instantiates itself under a generate-if, so slang finds no
# module that nobody instantiates and cannot pick a top on its own.
_RECURSIVE_ADDER = """\
module radd #(parameter W = 4) (input [W-1:0] a, b, input cin, output [W-1:0] sum, output cout);
  generate if (W == 1) begin : leaf
    assign {cout, sum} = a + b + cin;
  end else begin : split
    localparam L = W / 2;
    wire c;
    radd #(.W(L)) lo (.a(a[L-1:0]), .b(b[L-1:0]), .cin(cin), .sum(sum[L-1:0]), .cout(c));
    radd #(.W(W-L)) hi (.a(a[W-1:L]), .b(b[W-1:L]), .cin(c), .sum(sum[W-1:L]), .cout(cout));
  end endgenerate
endmodule
"""


def test_recursive_module_asks_for_top_and_works_with_it(tmp_path):
    p = write(tmp_path, "radd.sv", _RECURSIVE_ADDER)
    with pytest.raises(InputError) as e:
        load([p])
    msg = str(e.value)
    assert "every module is instantiated by another" in msg and "--top" in msg
    assert "(modules: radd)" in msg and "radd.sv" in msg
    assert "no module found" not in msg
    n = load([p], top="radd", params={"W": 5})
    vecs = [{"a": a, "b": b, "cin": c} for a in range(32) for b in range(32) for c in (0, 1)]
    assert run(n, vecs) == [_add(v, 5) for v in vecs]  # against Python integers


def test_file_without_modules_still_says_none_found(tmp_path):
    p = write(tmp_path, "pk.sv", "package pk; localparam int X = 1; endpackage\n")
    with pytest.raises(InputError, match="no module found in the given files"):
        load([p])
