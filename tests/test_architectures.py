"""Reference architectures: every one is an adder (checked against arithmetic outside this project)
and has the published structure (checked against published figures).

Oracles used here, none of them part of adder-verify:
- numpy integer addition over every input vector (exhaustive, widths 1..12), evaluated on the
  netlist by a small bit-parallel evaluator written in this file;
- z3's own bit-vector addition (``bvadd``), proved equal to the netlist's gates (widths 16..64);
- D. Harris, "A Taxonomy of Parallel Prefix Networks" (2003), for prefix node counts, rows and
  fanout (values from memory, as quoted in the issue).
"""

from __future__ import annotations

from functools import lru_cache
from math import log2

import numpy as np
import pytest
import z3

from tests.helpers import HARRIS_2003
from verify.library.architectures import ARCHITECTURES, PREFIX_SOURCE, generate, prefix_schedule
from verify.errors import InputError
from verify.model.netlist import Gate, Netlist, Port

ARCHS = list(ARCHITECTURES)
PREFIX = [a for a, spec in ARCHITECTURES.items() if spec.family == "prefix"]

# parameter variants beyond the defaults, so that every option is exercised
VARIANTS = [
    ("carry-lookahead", {"block": 2}),
    ("carry-lookahead", {"block": 3, "levels": 1}),
    ("carry-lookahead", {"block": 4, "levels": 1}),
    ("carry-skip", {"sizes": "variable"}),
    ("carry-skip", {"block": 3}),
    ("carry-select", {"sizes": "growing", "block": 2}),
    ("carry-select", {"block": 3}),
]


# ---- an evaluator independent of verify.sim: numpy words, one bit per vector -----------------

CHUNK_BITS = 22  # vectors per evaluation chunk: 2^22 (512 KiB per net)


def _pattern(k: int, nbits: int) -> np.ndarray:
    """Packed words whose bit j is bit k of j, for j in 0 .. 2^nbits - 1 (nbits >= 6)."""
    idx = np.arange(1 << nbits, dtype=np.uint32)
    bits = ((idx >> np.uint32(k)) & np.uint32(1)).astype(np.uint8)
    return np.packbits(bits, bitorder="little").view(np.uint64)


@lru_cache(maxsize=None)
def _patterns(nbits: int) -> tuple[np.ndarray, ...]:
    return tuple(_pattern(k, nbits) for k in range(nbits))


def _evaluate(netlist: Netlist, inputs: dict[str, np.ndarray], ones: np.ndarray) -> dict[str, np.ndarray]:
    vals: dict[str, np.ndarray] = {"0": np.zeros_like(ones), "1": ones}
    vals.update(inputs)
    last_use: dict[str, int] = {}
    order = netlist.ordered_gates
    for k, g in enumerate(order):
        for n in g.inputs:
            last_use[n] = k
    keep = set(netlist.output_bits) | set(inputs) | {"0", "1"}
    for k, g in enumerate(order):
        x = [vals[n] for n in g.inputs]
        op = g.op
        if op in ("and", "nand"):
            r = x[0].copy()
            for y in x[1:]:
                r &= y
        elif op in ("or", "nor"):
            r = x[0].copy()
            for y in x[1:]:
                r |= y
        elif op in ("xor", "xnor"):
            r = x[0].copy()
            for y in x[1:]:
                r ^= y
        elif op in ("not", "buf"):
            r = x[0].copy()
        elif op == "mux":
            r = (x[0] & x[2]) | (~x[0] & x[1])
        elif op == "maj":
            r = (x[0] & x[1]) | (x[0] & x[2]) | (x[1] & x[2])
        elif op == "const0":
            r = np.zeros_like(ones)
        elif op == "const1":
            r = ones.copy()
        else:  # pragma: no cover
            raise AssertionError(op)
        if op in ("nand", "nor", "xnor", "not"):
            r = ~r
        vals[g.output] = r
        for n in g.inputs:  # free what is no longer needed
            if last_use.get(n) == k and n not in keep:
                vals.pop(n, None)
    return {b: vals[b] for b in netlist.output_bits}


def _expected(width: int, cin: bool, base: int, nbits: int) -> dict[str, np.ndarray]:
    """Packed expected outputs from numpy integer addition (the oracle), vectors base.."""
    idx = np.arange(base, base + (1 << nbits), dtype=np.int64)
    m = (1 << width) - 1
    a, b = idx & m, (idx >> width) & m
    c = (idx >> (2 * width)) & 1 if cin else np.zeros_like(idx)
    total = a + b + c
    half = 1 << (width - 1)
    sa, sb = np.where(a >= half, a - (1 << width), a), np.where(b >= half, b - (1 << width), b)
    signed = sa + sb + c
    v = (signed < -half) | (signed > half - 1)  # signed overflow, by definition

    def pack(bits: np.ndarray) -> np.ndarray:
        return np.packbits(bits.astype(np.uint8), bitorder="little").view(np.uint64)

    out = {}
    for i in range(width):
        out["sum" if width == 1 else f"sum[{i}]"] = pack((total >> i) & 1)
    out["cout"] = pack((total >> width) & 1)
    out["v"] = pack(v)
    return out


@lru_cache(maxsize=None)
def _expected_chunks(width: int, cin: bool) -> tuple:
    nin = 2 * width + (1 if cin else 0)
    nbits = min(nin, CHUNK_BITS)
    return tuple(_expected(width, cin, base, max(nbits, 6))
                 for base in range(0, 1 << nin, 1 << nbits))


def exhaustive_mismatches(netlist: Netlist, width: int, cin: bool) -> list[str]:
    """Output bits that differ from integer addition on some input vector (every vector tried)."""
    nin = 2 * width + (1 if cin else 0)
    assert netlist.input_width == nin
    nbits = max(min(nin, CHUNK_BITS), 6)  # at least one 64-bit word; extra vectors repeat inputs
    pats = _patterns(nbits)
    ones = np.full(len(pats[0]), np.uint64(0xFFFF_FFFF_FFFF_FFFF))
    zeros = np.zeros_like(ones)
    bad: set[str] = set()
    step = 1 << min(nin, CHUNK_BITS)
    for chunk, base in enumerate(range(0, 1 << nin, step)):
        inputs = {}
        for k, net in enumerate(netlist.input_bits):
            if k < nbits and k < nin:
                inputs[net] = pats[k]
            else:
                inputs[net] = ones if (base >> k) & 1 else zeros
        got = _evaluate(netlist, inputs, ones)
        want = _expected_chunks(width, cin)[chunk]
        if nin < 6:  # vectors beyond 2^nin wrapped the low input bits only: compare 2^nin of them
            keep = np.uint64((1 << (1 << nin)) - 1)
            got = {k: v & keep for k, v in got.items()}
            want = {k: v & keep for k, v in want.items()}
        for name, arr in got.items():
            if not np.array_equal(arr, want[name]):
                bad.add(name)
    return sorted(bad)


# ---- z3: the netlist's gates against z3's own bit-vector addition ----------------------------

def smt_proves_adder(netlist: Netlist, width: int, cin: bool, timeout_ms: int = 60_000) -> bool:
    a, b = z3.BitVec("a", width), z3.BitVec("b", width)
    c = z3.BitVec("cin", 1)
    env: dict[str, z3.BoolRef] = {"0": z3.BoolVal(False), "1": z3.BoolVal(True)}
    for i in range(width):
        env["a" if width == 1 else f"a[{i}]"] = z3.Extract(i, i, a) == 1
        env["b" if width == 1 else f"b[{i}]"] = z3.Extract(i, i, b) == 1
    env["cin"] = c == 1
    for g in netlist.ordered_gates:
        x = [env[n] for n in g.inputs]
        op = g.op
        if op in ("and", "nand"):
            r = z3.And(*x)
        elif op in ("or", "nor"):
            r = z3.Or(*x)
        elif op in ("xor", "xnor"):
            r = x[0]
            for y in x[1:]:
                r = z3.Xor(r, y)
        elif op in ("not", "buf"):
            r = x[0]
        elif op == "mux":
            r = z3.If(x[0], x[2], x[1])
        elif op == "maj":
            r = z3.Or(z3.And(x[0], x[1]), z3.And(x[0], x[2]), z3.And(x[1], x[2]))
        elif op in ("const0", "const1"):
            r = z3.BoolVal(op == "const1")
        else:  # pragma: no cover
            raise AssertionError(op)
        env[g.output] = z3.Not(r) if op in ("nand", "nor", "xnor", "not") else r
    total = z3.ZeroExt(1, a) + z3.ZeroExt(1, b) + (z3.ZeroExt(width, c) if cin else 0)
    claims = [env["sum" if width == 1 else f"sum[{i}]"] == (z3.Extract(i, i, total) == 1)
              for i in range(width)]
    if "cout" in netlist.ports:
        claims.append(env["cout"] == (z3.Extract(width, width, total) == 1))
    if "v" in netlist.ports:
        # signed overflow: the exact sum of the signed values does not fit in width bits
        wide = z3.SignExt(2, a) + z3.SignExt(2, b) + (z3.ZeroExt(width + 1, c) if cin else 0)
        lo, hi = -(1 << (width - 1)), (1 << (width - 1)) - 1
        claims.append(env["v"] == z3.Or(wide < lo, wide > hi))
    s = z3.Solver()
    s.set("timeout", timeout_ms)
    s.add(z3.Not(z3.And(*claims)))
    return s.check() == z3.unsat


# ---- correctness -----------------------------------------------------------------------------

@pytest.mark.parametrize("arch", ARCHS)
def test_every_architecture_widths_1_to_12_exhaustive(arch):
    for width in range(1, 13):
        n = generate(arch, width, overflow=True)
        # oracle: numpy integer addition over all 2^(2w+1) vectors
        assert exhaustive_mismatches(n, width, cin=True) == [], (arch, width)


@pytest.mark.parametrize("arch,params", VARIANTS)
def test_parameter_variants_exhaustive(arch, params):
    for width in range(1, 11):
        n = generate(arch, width, overflow=True, **params)
        assert exhaustive_mismatches(n, width, cin=True) == [], (arch, params, width)


@pytest.mark.parametrize("arch", ARCHS)
def test_without_carry_in_or_carry_out(arch):
    for width in (1, 2, 3, 5, 8):
        n = generate(arch, width, cin=False, overflow=True)
        assert [p.name for p in n.inputs] == ["a", "b"]
        assert exhaustive_mismatches(n, width, cin=False) == [], (arch, width)
        n = generate(arch, width, cout=False)
        assert [p.name for p in n.outputs] == ["sum"]
        assert exhaustive_mismatches(n, width, cin=True) == [], (arch, width)


@pytest.mark.parametrize("arch", ARCHS)
def test_widths_16_32_64_by_smt(arch):
    for width in (16, 32, 64):
        n = generate(arch, width, overflow=True)
        assert smt_proves_adder(n, width, cin=True), (arch, width)  # oracle: z3 bvadd


def test_the_oracles_catch_a_wrong_adder():
    """The two checks above can fail: a Kogge-Stone with one node fed from the wrong position."""
    n = generate("kogge-stone", 8, overflow=True)
    gates = []
    for g in n.gates:
        if g.output == "G_5_2_t":  # G[5:2] = G[5:4] | P[5:4] & G[3:2]; feed G[2:1] instead
            g = type(g)(g.op, tuple("G_2_1" if x == "G_3_2" else x for x in g.inputs), g.output)
        gates.append(g)
    bad = Netlist(n.name, n.inputs, n.outputs, tuple(gates)).validate()
    assert exhaustive_mismatches(bad, 8, cin=True)
    assert not smt_proves_adder(bad, 8, cin=True)


def test_verilog_of_a_generated_adder_simulates_in_iverilog(tmp_path):
    """An independent simulator (iverilog) adds the same: Verilog '+' in a testbench."""
    import shutil
    import subprocess
    if not shutil.which("iverilog"):
        pytest.skip("iverilog not installed")
    from verify.formats.verilog.writer import dumps
    width = 6
    for arch in ("kogge-stone", "carry-select", "conditional-sum", "carry-lookahead"):
        n = generate(arch, width, overflow=True)
        (tmp_path / "dut.v").write_text(dumps(n, module="dut"))
        tb = f"""
module tb;
  reg [{width-1}:0] a, b; reg cin; wire [{width-1}:0] sum; wire cout, v;
  integer i, bad; reg [{width}:0] want; reg signed [{width+1}:0] sw;
  dut d(.a(a), .b(b), .cin(cin), .sum(sum), .cout(cout), .v(v));
  initial begin
    bad = 0;
    for (i = 0; i < {1 << (2 * width + 1)}; i = i + 1) begin
      {{cin, b, a}} = i; #1;
      want = a + b + cin;
      sw = $signed({{a[{width-1}], a}}) + $signed({{b[{width-1}], b}}) + $signed({{1'b0, cin}});
      if ({{cout, sum}} !== want || v !== (sw > {(1 << (width - 1)) - 1} || sw < -{1 << (width - 1)}))
        bad = bad + 1;
    end
    $display("mismatches %0d", bad);
  end
endmodule
"""
        (tmp_path / "tb.v").write_text(tb)
        subprocess.run(["iverilog", "-o", str(tmp_path / "sim"), str(tmp_path / "tb.v"),
                        str(tmp_path / "dut.v")], check=True)
        out = subprocess.run(["vvp", str(tmp_path / "sim")], capture_output=True, text=True,
                             check=True).stdout
        assert "mismatches 0" in out, (arch, out)


# ---- structure against published figures ---------------------------------------------------

def _prefix_nodes(n: Netlist) -> tuple[int, int]:
    labels = {g.source for g in n.gates if g.source and g.source.startswith("prefix level ")}
    levels = {int(s.split()[2]) for s in labels}
    return len(labels), max(levels, default=0)


# Harris (2003), from memory: (levels, nodes) for n = 2^L
HARRIS = HARRIS_2003


@pytest.mark.parametrize("arch", list(HARRIS))
@pytest.mark.parametrize("n", [4, 8, 16, 32, 64, 128])
def test_prefix_levels_and_nodes_match_harris_2003(arch, n):
    L = int(log2(n))
    want_levels, want_nodes = HARRIS[arch](n, L)  # D. Harris, "A Taxonomy of Parallel Prefix
    # Networks" (2003), from memory; counts cover the prefix nodes for the carries of an n-bit
    # network (our carry-in is folded into bit 0 first, so it adds no node)
    for cin in (True, False):
        nodes, levels = _prefix_nodes(generate(arch, n, cin=cin))
        assert (levels, nodes) == (want_levels, want_nodes), (arch, n, cin)


@pytest.mark.parametrize("n", [4, 8, 16, 32, 64, 128])
def test_sklansky_largest_fanout_is_half_plus_one(n):
    # Harris (2003), from memory: Sklansky fanout n/2 + 1 (G[n/2-1:0] drives n/2 nodes, plus the
    # sum bit it is the carry of)
    net = generate("sklansky", n)
    fan = net.fanout
    assert max(fan.values()) == n // 2 + 1
    assert fan[f"G_{n // 2 - 1}_0"] == n // 2 + 1


@pytest.mark.parametrize("n", [4, 8, 16, 32, 64])
def test_ladner_fischer_levels(n):
    # Harris (2003), from memory: Ladner-Fischer (Sklansky over odd positions) has log2 n + 1 levels
    assert _prefix_nodes(generate("ladner-fischer", n))[1] == int(log2(n)) + 1


@pytest.mark.parametrize("n", [4, 8, 16, 32, 64])
def test_kogge_stone_fanout_two_per_row(n):
    # Harris (2003), from memory: Kogge-Stone has fanout 2 (each column's value feeds its own
    # column's node and one node to the left, per row; finished columns pass straight down)
    most = 0
    for row in prefix_schedule("kogge-stone", n):
        reads: dict[int, int] = {}
        for i, j in row:
            reads[i] = reads.get(i, 0) + 1
            reads[j] = reads.get(j, 0) + 1
        most = max(most, *reads.values())
    assert most == 2
    # and Sklansky in the same terms reaches n/2 + 1 in its last row
    last = prefix_schedule("sklansky", n)[-1]
    assert sum(1 for _, j in last if j == n // 2 - 1) + 1 == n // 2 + 1


def test_prefix_schedules_reach_bit_zero_for_odd_widths():
    for arch in PREFIX:
        for n in range(1, 40):
            sched = prefix_schedule(arch, n)
            lo = list(range(n))
            for row in sched:
                new = list(lo)
                for i, j in row:
                    assert j == lo[i] - 1, (arch, n, i, j)
                    new[i] = lo[j]
                lo = new
            assert lo == [0] * n, (arch, n)


def test_serial_prefix_is_a_chain():
    n = generate("serial-prefix", 8)
    srcs = sorted({g.source for g in n.gates if g.source and g.source.startswith("prefix")})
    assert srcs == sorted(PREFIX_SOURCE.format(level=i, hi=i, lo=0) for i in range(1, 8))


def test_ripple_gate_counts():
    # common practice: a full adder of two half adders and an OR is 2 XOR, 2 AND, 1 OR
    n = generate("ripple", 8)
    ops = {}
    for g in n.gates:
        ops[g.op] = ops.get(g.op, 0) + 1
    assert ops == {"xor": 16, "and": 16, "or": 8}
    # without a carry-in bit 0 is a half adder (1 XOR, 1 AND)
    n = generate("ripple", 8, cin=False)
    assert len(n.gates) == 7 * 5 + 2
    m = generate("ripple-maj", 8)
    assert sorted(g.op for g in m.gates) == ["maj"] * 8 + ["xor"] * 16


def test_carry_select_and_skip_block_sizes():
    n = generate("carry-select", 12, sizes="growing", block=2)
    blocks = sorted({g.source.split(" adder")[0].split(" multiplexers")[0]
                     for g in n.gates if g.source and g.source.startswith("carry-select block")})
    # growing: 2, 2, 3, 4 (the last cut to 5 bits... 2+2+3 = 7, then 5 left, 4 then 1)
    assert blocks == sorted(["carry-select block [3:2]", "carry-select block [6:4]",
                             "carry-select block [10:7]", "carry-select block [11:11]"])
    n = generate("carry-skip", 16, sizes="variable")
    skips = sorted(g.source for g in n.gates if g.op == "mux")
    assert skips == sorted(f"carry-skip block [{hi}:{lo}] skip" for lo, hi in
                           [(0, 0), (1, 2), (3, 5), (6, 9), (10, 12), (13, 14), (15, 15)])
    n = generate("carry-skip", 10, sizes="3,3,4")
    assert len([g for g in n.gates if g.op == "mux"]) == 3


def test_net_names_use_the_trade_vocabulary():
    n = generate("kogge-stone", 8)
    nets = {g.output for g in n.gates}
    assert {"p3", "g3", "G_6_0", "G_3_0", "P_7_4", "cout"} <= nets
    c = generate("carry-lookahead", 16)
    nets = {g.output for g in c.gates}
    assert {"G_7_4", "P_7_4", "G_15_0", "c4", "c8", "c12"} <= nets


# ---- bad input -------------------------------------------------------------------------------

@pytest.mark.parametrize("call,words", [
    (lambda: generate("wallace", 8), ["unknown architecture", "wallace", "kogge-stone"]),
    (lambda: generate("ripple", 0), ["width", ">= 1"]),
    (lambda: generate("ripple", "eight"), ["width"]),
    (lambda: generate("ripple", 8, block=4), ["ripple", "no parameter 'block'"]),
    (lambda: generate("carry-skip", 8, levels=2), ["carry-skip", "levels"]),
    (lambda: generate("carry-skip", 8, sizes="3,3"), ["add up to 6", "width 8"]),
    (lambda: generate("carry-skip", 8, sizes="3,x,5"), ["comma-separated", "variable"]),
    (lambda: generate("carry-select", 8, sizes=[4, 0, 4]), [">= 1"]),
    (lambda: generate("carry-lookahead", 8, block=1), ["block", ">= 2"]),
    (lambda: generate("carry-lookahead", 8, levels=0), ["levels", ">= 1"]),
])
def test_bad_input_names_what_is_wrong(call, words):
    with pytest.raises(InputError) as e:
        call()
    for w in words:
        assert w in str(e.value)


def test_names_are_forgiving_about_underscores_and_case():
    assert generate("Kogge_Stone", 4).content_hash() == generate("kogge-stone", 4).content_hash()
    assert generate("carry-skip", 8, block="2").content_hash() == \
        generate("carry-skip", 8, block=2).content_hash()


# ---- the demo library in designs/ ------------------------------------------------------------

import importlib.util  # noqa: E402
import shutil  # noqa: E402
import subprocess  # noqa: E402
import sys  # noqa: E402
from pathlib import Path  # noqa: E402

DESIGNS = Path(__file__).resolve().parent.parent / "designs"


def _regenerate_module():
    spec = importlib.util.spec_from_file_location("larkspur_regenerate", DESIGNS / "regenerate.py")
    mod = importlib.util.module_from_spec(spec)
    sys.modules["larkspur_regenerate"] = mod  # dataclasses look their module up there
    spec.loader.exec_module(mod)
    return mod


def test_generated_designs_are_up_to_date_and_reproducible():
    mod = _regenerate_module()
    for d in mod.DESIGNS:
        assert (DESIGNS / d.path).read_text(encoding="utf-8") == mod.render(d), d.path
        assert mod.render(d) == mod.render(d)


def _design_files(suffix):
    return sorted(p for p in DESIGNS.rglob(f"*{suffix}")
                  if not any(part.startswith(".") for part in p.relative_to(DESIGNS).parts))


def _json_designs():
    return _design_files(".json")


@pytest.mark.parametrize("path", _json_designs(), ids=lambda p: p.name)
def test_json_designs_against_z3_arithmetic(path):
    n = json_netlist_parse(path)
    ok = smt_proves_adder(n, n.width("a"), cin=True)
    assert ok == ("broken" not in path.parts), path  # oracle: z3 bvadd


def json_netlist_parse(path):
    from verify.formats import json_netlist
    return json_netlist.parse(path.read_text(encoding="utf-8"), str(path))


def _iverilog_mismatches(files, top, width, tmp_path, vectors=4000):
    """Mismatches against Verilog '+' in iverilog (an independent simulator), on every vector for
    widths up to 8, else on corner vectors and $random ones."""
    exhaustive = width <= 8
    count = 1 << (2 * width + 1) if exhaustive else vectors
    tb = f"""
module tb;
  reg [{width-1}:0] a, b; reg cin; wire [{width-1}:0] sum; wire cout;
  integer i, bad; reg [{width}:0] want;
  {top} dut(.a(a), .b(b), .cin(cin), .sum(sum), .cout(cout));
  initial begin
    bad = 0;
    for (i = 0; i < {count}; i = i + 1) begin
      if ({1 if exhaustive else 0}) {{cin, b, a}} = i;
      else if (i < 4) begin a = (i & 1) ? -1 : 0; b = (i & 2) ? 0 : -1; cin = 1; end
      else begin a = $random; b = $random; cin = $random; end
      #1;
      want = a + b + cin;
      if ({{cout, sum}} !== want) bad = bad + 1;
    end
    $display("mismatches %0d", bad);
  end
endmodule
"""
    (tmp_path / "tb.v").write_text(tb)
    subprocess.run(["iverilog", "-g2005", "-o", str(tmp_path / "sim"), str(tmp_path / "tb.v"),
                    *map(str, files)], check=True)
    out = subprocess.run(["vvp", str(tmp_path / "sim")], capture_output=True, text=True,
                         check=True).stdout
    return int(out.split("mismatches")[1].split()[0])


@pytest.mark.parametrize("path", _design_files(".v"), ids=lambda p: p.name)
def test_verilog_designs_in_iverilog(path, tmp_path):
    if not shutil.which("iverilog"):
        pytest.skip("iverilog not installed")
    import re
    modules = re.findall(r"^module\s+(\w+)", path.read_text(), re.M)
    top = modules[-1]
    if "rca_generate" in path.name:
        for w in (4, 8, 16):
            src = tmp_path / f"w{w}.v"
            src.write_text(path.read_text().replace("parameter W = 16", f"parameter W = {w}"))
            assert _iverilog_mismatches([src], top, w, tmp_path) == 0
        return
    width = int(re.search(r"input\s+wire\s+\[(\d+):0\]\s+a", path.read_text())[1]) + 1
    bad = _iverilog_mismatches([path], top, width, tmp_path)
    if "broken" in path.parts:
        assert bad > 0, path
    else:
        assert bad == 0, path


def test_designs_through_the_check_api():
    """The project's own engines agree: every correct design proven or exhaustive, every broken
    one failing with a counterexample (re-simulated by the engine before it is reported)."""
    import verify
    files = _design_files(".json") + _design_files(".v")
    assert len(files) >= 13
    for f in files:
        r = verify.check(verify.load(f))
        if "broken" in f.parts:
            assert r.verdict.value == "fail", (f, r.verdict)
        else:
            assert r.verdict.value in ("proven", "exhaustive"), (f, r.verdict)


@pytest.mark.parametrize("arch", ARCHS)
def test_check_api_agrees(arch):
    """The project's engines on the same designs (the oracles above are the independent ones)."""
    import verify
    for width in (9, 12):
        r = verify.check(generate(arch, width, overflow=True), engine="exhaustive")
        assert r.verdict.value == "exhaustive", (arch, width, r.verdict)
    for width in (16, 32, 64):
        r = verify.check(generate(arch, width, overflow=True), engine="smt")
        assert r.verdict.value == "proven", (arch, width, r.verdict)
