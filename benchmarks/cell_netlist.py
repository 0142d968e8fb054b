"""Write a synthesized-style cell-instance netlist of a ripple-carry adder over the cells of
tests/data/plain_cells.lib, and time reading it with the Liberty file.

    python benchmarks/cell_netlist.py [--width 1024] [--write FILE.v]

Per bit: g_n = NAND2(a, b), g = INV(g_n), x = XOR2(a, b), s = XOR2(x, c),
t = AOI21(x, c, g) = !(x c + g), c_next = INV(t); every fourth carry also goes through a pair of
inverters (a buffer, as synthesis inserts them). For 1,024 bits that is 6,657 cells.

Table (seconds, this machine, one run each):
- liberty: the netlist read with ``cells=[plain_cells.lib]`` (the Liberty file is parsed and its
  functions become cell modules);
- verilog models (baseline, same run): the same netlist read with the same cells written as a
  Verilog model file (what a user without --cells would give);
- check: ``verify.check`` on the loaded netlist (the default engine choice) and its verdict.
Each loaded netlist is also spot-checked against Python integer addition on random vectors.
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

LIB = ROOT / "tests" / "data" / "plain_cells.lib"


def adder_netlist(w: int, name: str = "ripple_cells") -> tuple[str, int]:
    """(Verilog text, number of cell instances) of a w-bit adder with carry in and out."""
    lines = ["// cell-instance netlist (generated)", "`timescale 1ns/1ps",
             f"module {name} (a, b, cin, s, cout);",
             f"  input [{w - 1}:0] a;", f"  input [{w - 1}:0] b;", "  input cin;",
             f"  output [{w - 1}:0] s;", "  output cout;",
             f"  wire [{w}:0] c;", f"  wire [{w - 1}:0] gn, g, x, t;"]
    body = []
    cells = 0

    def inst(cell: str, pins: dict[str, str]) -> None:
        nonlocal cells
        cells += 1
        conns = ", ".join(f".{p}({n})" for p, n in pins.items())
        body.append(f"  {cell} U{cells} ({conns});")

    body.append("  assign c[0] = cin;")
    for i in range(w):
        inst("PX_NAND2", {"A": f"a[{i}]", "B": f"b[{i}]", "Y": f"gn[{i}]"})
        inst("PX_INV", {"A": f"gn[{i}]", "Y": f"g[{i}]"})
        inst("PX_XOR2", {"A": f"a[{i}]", "B": f"b[{i}]", "Y": f"x[{i}]"})
        inst("PX_XOR2", {"A": f"x[{i}]", "B": f"c[{i}]", "Y": f"s[{i}]"})
        inst("PX_AOI21", {"A1": f"x[{i}]", "A2": f"c[{i}]", "B": f"g[{i}]", "Y": f"t[{i}]"})
        if i % 4 == 3:
            lines.append(f"  wire cb{i}, cbb{i};")
            inst("PX_INV", {"A": f"t[{i}]", "Y": f"cb{i}"})
            inst("PX_INV", {"A": f"cb{i}", "Y": f"cbb{i}"})
            inst("PX_INV", {"A": f"cbb{i}", "Y": f"c[{i + 1}]"})
        else:
            inst("PX_INV", {"A": f"t[{i}]", "Y": f"c[{i + 1}]"})
    body.append(f"  assign cout = c[{w}];")
    inst("PX_TIE0", {"Y": "unused_tie"})
    lines.append("  wire unused_tie;")
    return "\n".join(lines + body + ["endmodule", ""]), cells


def main() -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--width", type=int, default=1024)
    ap.add_argument("--write", help="also write the netlist to this file")
    args = ap.parse_args()
    from verify.check import check
    from verify.formats import load
    from verify.formats.liberty import read_liberty, verilog_models
    from verify.sim import Simulator
    w = args.width
    text, cells = adder_netlist(w)
    if args.write:
        Path(args.write).write_text(text)
    rng = random.Random(w)
    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        net = Path(tmp) / "netlist.v"
        net.write_text(text)
        models = Path(tmp) / "cells.v"
        models.write_text(verilog_models(read_liberty(LIB))[0])
        for label, kw, files in (("liberty", {"cells": [LIB]}, [net]),
                                 ("verilog models (baseline)", {}, [net, models])):
            t = time.perf_counter()
            n = load(files, **kw)
            dt = time.perf_counter() - t
            sim = Simulator(n)
            for _ in range(20):
                a, b, ci = rng.getrandbits(w), rng.getrandbits(w), rng.getrandbits(1)
                got = sim.evaluate({"a": a, "b": b, "cin": ci})
                want = a + b + ci  # Python integers
                assert got == {"s": want & ((1 << w) - 1), "cout": want >> w}, label
            rows.append((label, dt, len(n.gates)))
        t = time.perf_counter()
        res = check(load([net], cells=[LIB]))
        dt_check = time.perf_counter() - t
    print(f"{w}-bit ripple-carry adder, {cells:,} cell instances")
    print(f"{'read':<28}{'seconds':>9}{'gates':>9}")
    for label, dt, g in rows:
        print(f"{label:<28}{dt:>9.2f}{g:>9,}")
    print(f"{'check (load + check)':<28}{dt_check:>9.2f}   verdict: {res.verdict}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
