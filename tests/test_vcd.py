"""VCD waveforms: round trips through a parser written here, through vcdvcd (a VCD parser from
PyPI) and against a VCD that Icarus Verilog writes for the same design and vectors.

Outside checks: Python integer addition for the port values, vcdvcd's reading of the file, and
iverilog/vvp's own simulation and $dumpvars output (IEEE 1364 value change dump).
"""

from __future__ import annotations

import random
import re
import shutil
import subprocess

import pytest

from tests.helpers import rewire, ripple
from verify.library import architectures
from verify.render import vcd
from verify.formats.verilog import writer as verilog_writer
from verify.sim import Simulator, pack


def parse_vcd(text: str) -> tuple[dict[str, int], dict[str, list[tuple[int, int]]]]:
    """A small VCD reader: ({full name: width}, {full name: [(time, value), ...]}).

    Names are scope path and reference joined by dots, a bit select or range kept as written
    without the space (``top.a[3:0]``, ``top.G[3]``).
    """
    tokens = text.split()
    scopes: list[str] = []
    widths: dict[str, int] = {}
    by_code: dict[str, list[str]] = {}
    k = 0
    while k < len(tokens):
        t = tokens[k]
        if t == "$scope":
            scopes.append(tokens[k + 2])
            k = tokens.index("$end", k) + 1
        elif t == "$upscope":
            scopes.pop()
            k += 2
        elif t == "$var":
            end = tokens.index("$end", k)
            _, width, code, *ref = tokens[k + 1:end]
            name = ".".join(scopes + ["".join(ref)])
            widths[name] = int(width)
            by_code.setdefault(code, []).append(name)
            k = end + 1
        elif t == "$enddefinitions":
            k = tokens.index("$end", k) + 1
            break
        elif t.startswith("$"):
            k = tokens.index("$end", k) + 1
        else:
            raise AssertionError(f"unexpected token {t!r} in the header")
    changes: dict[str, list[tuple[int, int]]] = {n: [] for n in widths}
    time = 0
    while k < len(tokens):
        t = tokens[k]
        k += 1
        if t.startswith("#"):
            time = int(t[1:])
        elif t in ("$dumpvars", "$end", "$dumpall", "$dumpon", "$dumpoff"):
            continue
        elif t[0] in "bB":
            value, code = t[1:], tokens[k]
            k += 1
            for n in by_code[code]:
                changes[n].append((time, int(value.replace("x", "0").replace("z", "0"), 2)))
        elif t[0] in "01xzXZ":
            for n in by_code[t[1:]]:
                changes[n].append((time, 1 if t[0] == "1" else 0))
        else:
            raise AssertionError(f"unexpected token {t!r} in the changes")
    return widths, changes


def value_at(changes: list[tuple[int, int]], time: int) -> int:
    v = None
    for t, x in changes:
        if t <= time:
            v = x
    assert v is not None, f"no value by time {time}"
    return v


def _vectors(width: int, count: int, seed: int = 3) -> list[dict[str, int]]:
    rng = random.Random(seed)
    return [{"a": rng.getrandbits(width), "b": rng.getrandbits(width), "cin": rng.getrandbits(1)}
            for _ in range(count)]


def test_round_trip_ports_and_internal_nets():
    d = ripple(4, name="larkspur_add4")
    vectors = _vectors(4, 24)
    expected = [{"sum": (v["a"] + v["b"] + v["cin"]) % 16, "cout": (v["a"] + v["b"] + v["cin"]) >> 4}
                for v in vectors]  # Python integers
    widths, ch = parse_vcd(vcd.dumps(d, vectors, expected=expected))
    assert widths["larkspur_add4.a[3:0]"] == 4 and widths["larkspur_add4.cin"] == 1
    nets = Simulator(d).run_all(pack(d, vectors), (1 << len(vectors)) - 1)
    internal = [g.output for g in d.gates if g.output not in d.output_bits]
    assert internal and all(f"larkspur_add4.{n}" in widths for n in internal)
    for j, v in enumerate(vectors):
        total = v["a"] + v["b"] + v["cin"]
        assert value_at(ch["larkspur_add4.a[3:0]"], j) == v["a"]
        assert value_at(ch["larkspur_add4.b[3:0]"], j) == v["b"]
        assert value_at(ch["larkspur_add4.cin"], j) == v["cin"]
        assert value_at(ch["larkspur_add4.sum[3:0]"], j) == total % 16
        assert value_at(ch["larkspur_add4.cout"], j) == total >> 4
        assert value_at(ch["larkspur_add4.spec.sum[3:0]"], j) == total % 16
        assert value_at(ch["larkspur_add4.spec.fails"], j) == 0
        for n in internal:
            assert value_at(ch[f"larkspur_add4.{n}"], j) == nets[n] >> j & 1
    # one time step past the last vector, so the last one shows for a full step
    assert max(int(t[1:]) for t in re.findall(r"^#\d+$", vcd.dumps(d, vectors), re.M)) == 24


def test_fails_marks_the_wrong_steps():
    bad = rewire(ripple(4), "sum[2]", op="or")
    vectors = _vectors(4, 40, seed=9)
    expected = [{"sum": (v["a"] + v["b"] + v["cin"]) % 16, "cout": (v["a"] + v["b"] + v["cin"]) >> 4}
                for v in vectors]
    _, ch = parse_vcd(vcd.dumps(bad, vectors, expected=expected))
    actual = Simulator(bad).evaluate_many(vectors)
    marks = [value_at(ch[f"{bad.name}.spec.fails"], j) for j in range(len(vectors))]
    assert marks == [int(a != e) for a, e in zip(actual, expected)]
    assert 0 < sum(marks) < len(marks)


def test_hierarchical_names_become_scopes(tmp_path):
    from verify.formats import load

    src = tmp_path / "larkspur_fa2.v"
    src.write_text("""
module fa(input a, input b, input ci, output s, output co);
  wire p = a ^ b;
  assign s = p ^ ci;
  assign co = (a & b) | (p & ci);
endmodule
module larkspur_fa2(input [1:0] a, input [1:0] b, input cin, output [1:0] sum, output cout);
  wire c1;
  fa u0(.a(a[0]), .b(b[0]), .ci(cin), .s(sum[0]), .co(c1));
  fa u1(.a(a[1]), .b(b[1]), .ci(c1), .s(sum[1]), .co(cout));
endmodule
""")
    d = load(src)
    vectors = _vectors(2, 8)
    text = vcd.dumps(d, vectors)
    assert "$scope module u0 $end" in text and "$scope module u1 $end" in text
    widths, ch = parse_vcd(text)
    assert "larkspur_fa2.u0.p" in widths and "larkspur_fa2.u1.p" in widths
    for j, v in enumerate(vectors):
        assert value_at(ch["larkspur_fa2.u1.p"], j) == (v["a"] >> 1 ^ v["b"] >> 1) & 1


def test_many_nets_get_distinct_codes_and_bit_selects():
    d = architectures.generate("kogge-stone", 16)
    text = vcd.dumps(d, _vectors(16, 5))
    codes = re.findall(r"^\$var wire \d+ (\S+) ", text, re.M)
    assert len(codes) > 94 and len(set(codes)) == len(codes)  # past one character of codes
    widths, _ = parse_vcd(text)
    assert "kogge_stone16.G_14_0" in widths
    # an internal bus bit is written as a bit select
    from verify.model.netlist import Gate, Netlist, Port
    d = Netlist("larkspur_and2", (Port("a", 2),), (Port("y", 1),),
                (Gate("not", ("a[0]",), "t[0]"), Gate("not", ("a[1]",), "t[1]"),
                 Gate("nor", ("t[0]", "t[1]"), "y"))).validate()
    text = vcd.dumps(d, [{"a": 3}, {"a": 1}])
    assert "$var wire 1 " in text and " t [1] $end" in text
    widths, ch = parse_vcd(text)
    assert [value_at(ch["larkspur_and2.t[1]"], j) for j in (0, 1)] == [0, 1]
    assert [value_at(ch["larkspur_and2.y"], j) for j in (0, 1)] == [1, 0]  # y = a0 & a1


def test_vcdvcd_reads_the_same_values(tmp_path):
    vcdvcd = pytest.importorskip("vcdvcd")
    d = ripple(4, name="larkspur_add4")
    vectors = _vectors(4, 12)
    path = vcd.write(tmp_path / "w.vcd", d, vectors)
    parsed = vcdvcd.VCDVCD(str(path))
    assert "larkspur_add4.a[3:0]" in parsed.signals
    a = parsed["larkspur_add4.a[3:0]"]
    s = parsed["larkspur_add4.sum[3:0]"]
    for j, v in enumerate(vectors):
        assert int(a[j], 2) == v["a"]
        assert int(s[j], 2) == (v["a"] + v["b"] + v["cin"]) % 16  # Python integers


@pytest.mark.skipif(not (shutil.which("iverilog") and shutil.which("vvp")),
                    reason="Icarus Verilog is not installed")
def test_ports_agree_with_the_vcd_icarus_writes(tmp_path):
    d = architectures.generate("brent-kung", 6, name="larkspur_add6_bk")
    vectors = _vectors(6, 16, seed=11)
    ours = parse_vcd(vcd.dumps(d, vectors, internal=False))[1]
    lines = ["`timescale 1ns/1ns", "module tb;", "  reg [5:0] a, b; reg cin;",
             "  wire [5:0] sum; wire cout;",
             "  larkspur_add6_bk dut(.a(a), .b(b), .cin(cin), .sum(sum), .cout(cout));",
             "  initial begin", '    $dumpfile("ivl.vcd"); $dumpvars(1, tb);']
    for j, v in enumerate(vectors):
        delay = "" if j == 0 else "#1 "
        lines.append(f"    {delay}a = {v['a']}; b = {v['b']}; cin = {v['cin']};")
    lines += ["    #1 $finish;", "  end", "endmodule"]
    (tmp_path / "tb.v").write_text("\n".join(lines) + "\n")
    (tmp_path / "dut.v").write_text(verilog_writer.dumps(d))
    subprocess.run(["iverilog", "-o", "sim", "tb.v", "dut.v"], cwd=tmp_path, check=True,
                   capture_output=True)
    subprocess.run(["vvp", "-n", "sim"], cwd=tmp_path, check=True, capture_output=True)
    _, theirs = parse_vcd((tmp_path / "ivl.vcd").read_text())
    for port, ref in (("a", "a[5:0]"), ("b", "b[5:0]"), ("cin", "cin"), ("sum", "sum[5:0]"),
                      ("cout", "cout")):
        for j in range(len(vectors)):
            assert value_at(ours[f"larkspur_add6_bk.{ref}"], j) == \
                value_at(theirs[f"tb.{ref}"], j), (port, j)


def test_a_waveform_needs_a_vector():
    with pytest.raises(ValueError):
        vcd.dumps(ripple(2), [])
