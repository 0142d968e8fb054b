"""Reading Verilog: elaboration through pyslang plus the translation into the netlist model.

    python benchmarks/bench_verilog.py [--width 1024]

- flat: a generated 1024-bit Kogge-Stone adder, written the way a generator emits it (one wire
  and one assign per prefix node, about 24,600 statements), read from a file: seconds for slang
  (parse + elaborate + diagnostics) beside seconds for the whole load (slang + translation);
- cells: the same adder from a generator that instantiates one small module per black cell
  (about 9,200 instances), the same two figures;
- generate: the same adder as a parameterized generate-loop module (tests/verilog/larkspur_ks.sv
  with W=1024), the same two figures;
- sweep: larkspur_ks.sv at W=8,16,32,64: the first load (parses the file) beside the later ones
  (the syntax tree is reused, only elaboration and translation run again).

Target (the issue's): the 1024-bit loads take under 10 s on this machine. Each loaded design is
spot-checked against Python integer addition on random vectors so that a fast wrong answer cannot
pass. The script exits 1 if the target is missed.
"""

from __future__ import annotations

import argparse
import random
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from verify.formats.verilog import reader as verilog  # noqa: E402
from verify.sim import Simulator  # noqa: E402

TARGET_S = 10.0


def flat_kogge_stone(w: int, name: str = "larkspur_ks_flat") -> str:
    """Generator-style flat Verilog of a w-bit Kogge-Stone adder with carry in."""
    levels = max(1, (w - 1).bit_length())
    out = [f"// generated: {w}-bit Kogge-Stone, {levels} prefix levels",
           f"module {name} (input [{w - 1}:0] a, input [{w - 1}:0] b, input cin,",
           f"  output [{w - 1}:0] sum, output cout);"]
    for i in range(w):
        out.append(f"  wire g0_{i} = a[{i}] & b[{i}];")
        out.append(f"  wire p0_{i} = a[{i}] ^ b[{i}];")
    for lv in range(levels):
        d = 1 << lv
        for i in range(w):
            if i >= d:
                out.append(f"  wire g{lv + 1}_{i} = g{lv}_{i} | (p{lv}_{i} & g{lv}_{i - d});")
                out.append(f"  wire p{lv + 1}_{i} = p{lv}_{i} & p{lv}_{i - d};")
            else:
                out.append(f"  wire g{lv + 1}_{i} = g{lv}_{i};")
                out.append(f"  wire p{lv + 1}_{i} = p{lv}_{i};")
    for i in range(w):
        out.append(f"  wire c{i + 1} = g{levels}_{i} | (p{levels}_{i} & cin);")
    out.append("  wire c0 = cin;")
    for i in range(w):
        out.append(f"  assign sum[{i}] = p0_{i} ^ c{i};")
    out.append(f"  assign cout = c{w};")
    out.append("endmodule")
    return "\n".join(out) + "\n"


def cell_kogge_stone(w: int, name: str = "larkspur_ks_cells") -> str:
    """The same adder from a generator that instantiates one cell module per black node."""
    levels = max(1, (w - 1).bit_length())
    out = ["module larkspur_black (input gi, pi, gj, pj, output go, po);",
           "  assign go = gi | (pi & gj);", "  assign po = pi & pj;", "endmodule",
           f"module {name} (input [{w - 1}:0] a, b, input cin, output [{w - 1}:0] sum, output cout);",
           f"  wire [{w - 1}:0] g0 = a & b, p0 = a ^ b;"]
    for lv in range(levels):
        d = 1 << lv
        out.append(f"  wire [{w - 1}:0] g{lv + 1}, p{lv + 1};")
        for i in range(w):
            if i >= d:
                out.append(f"  larkspur_black u{lv}_{i} (.gi(g{lv}[{i}]), .pi(p{lv}[{i}]), "
                           f".gj(g{lv}[{i - d}]), .pj(p{lv}[{i - d}]), .go(g{lv + 1}[{i}]), "
                           f".po(p{lv + 1}[{i}]));")
            else:
                out.append(f"  assign g{lv + 1}[{i}] = g{lv}[{i}];")
                out.append(f"  assign p{lv + 1}[{i}] = p{lv}[{i}];")
    out.append(f"  wire [{w}:0] c = {{g{levels} | (p{levels} & {{{w}{{cin}}}}), cin}};")
    out.append(f"  assign sum = p0 ^ c[{w - 1}:0];")
    out.append(f"  assign cout = c[{w}];")
    out.append("endmodule")
    return "\n".join(out) + "\n"


def slang_only(paths, params) -> float:
    """Baseline: what pyslang alone takes (parse, elaborate, collect diagnostics)."""
    import pyslang
    verilog._TREE_CACHE.clear()
    t = time.perf_counter()
    sm, trees, _ = verilog._parse(pyslang, paths, [], {})
    comp = verilog._elaborate(pyslang, trees, None, params)
    comp.getRoot()
    verilog._diagnostics(pyslang, comp, sm, verilog.Locator(sm, paths))
    return time.perf_counter() - t


def full_load(paths, params):
    verilog._TREE_CACHE.clear()
    t = time.perf_counter()
    n = verilog.load(paths, top=None, params=params, include_dirs=[], defines={})
    return n, time.perf_counter() - t


def spot_check(n, w: int, count: int = 64) -> None:
    rng = random.Random(w)
    vecs = [{"a": rng.getrandbits(w), "b": rng.getrandbits(w), "cin": rng.getrandbits(1)}
            for _ in range(count)]
    vecs += [{"a": (1 << w) - 1, "b": 0, "cin": 1}, {"a": (1 << w) - 1, "b": (1 << w) - 1, "cin": 1}]
    for v, got in zip(vecs, Simulator(n).evaluate_many(vecs)):
        t = v["a"] + v["b"] + v["cin"]  # Python integers
        if got != {"sum": t & ((1 << w) - 1), "cout": t >> w}:
            raise SystemExit(f"wrong result from {n.name} on {v}")


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--width", type=int, default=1024)
    args = ap.parse_args()
    w = args.width
    ok = True
    with tempfile.TemporaryDirectory() as tmp:
        flat = Path(tmp) / "larkspur_ks_flat.v"
        flat.write_text(flat_kogge_stone(w))
        statements = flat.read_text().count(";")
        base = slang_only([flat], {})
        n, secs = full_load([flat], {})
        spot_check(n, w)
        held = secs < TARGET_S
        ok &= held
        print(f"flat {w}-bit Kogge-Stone ({statements} statements, {len(n.gates)} gates): "
              f"load {secs:.2f} s (slang alone {base:.2f} s, translation {secs - base:.2f} s); "
              f"target < {TARGET_S:.0f} s: {'held' if held else 'MISSED'}")
        cells = Path(tmp) / "larkspur_ks_cells.v"
        text = cell_kogge_stone(w)
        cells.write_text(text)
        instances = text.count("larkspur_black u")
        base = slang_only([cells], {})
        n, secs = full_load([cells], {})
        spot_check(n, w)
        held = secs < TARGET_S
        ok &= held
        print(f"cell-instance {w}-bit Kogge-Stone ({instances} instances, {len(n.gates)} gates): "
              f"load {secs:.2f} s (slang alone {base:.2f} s, translation {secs - base:.2f} s); "
              f"target < {TARGET_S:.0f} s: {'held' if held else 'MISSED'}")
    gen = ROOT / "tests" / "verilog" / "larkspur_ks.sv"
    base = slang_only([gen], {"W": w})
    n, secs = full_load([gen], {"W": w})
    spot_check(n, w)
    held = secs < TARGET_S
    ok &= held
    print(f"generate-loop {w}-bit Kogge-Stone ({len(n.gates)} gates): load {secs:.2f} s "
          f"(slang alone {base:.2f} s, translation {secs - base:.2f} s); "
          f"target < {TARGET_S:.0f} s: {'held' if held else 'MISSED'}")
    verilog._TREE_CACHE.clear()
    times = []
    for sw in (8, 16, 32, 64):
        t = time.perf_counter()
        n = verilog.load([gen], top=None, params={"W": sw}, include_dirs=[], defines={})
        times.append(time.perf_counter() - t)
        spot_check(n, sw)
    print("sweep W=8,16,32,64: " + ", ".join(f"{t * 1000:.0f} ms" for t in times)
          + f" (first load parses the file; the rest reuse its syntax tree)")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
