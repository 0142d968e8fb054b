"""Run Verilog designs under Icarus Verilog (an independent simulator) for the cross-checks."""

from __future__ import annotations

import random
import shutil
import subprocess
import tempfile
from pathlib import Path
from typing import Mapping, Sequence

IVERILOG = shutil.which("iverilog")
VVP = shutil.which("vvp")
HAVE_IVERILOG = bool(IVERILOG and VVP)
CORPUS = Path(__file__).parent / "verilog"


def vectors(widths: Mapping[str, int], count: int, seed: int = 7) -> list[dict[str, int]]:
    """Corner vectors (all zeros, all ones, alternating, single bits) then random ones."""
    rng = random.Random(seed)
    out: list[dict[str, int]] = []
    names = list(widths)
    corners = []
    for pattern in ("zero", "ones", "alt", "alt2", "top"):
        v = {}
        for n in names:
            w = widths[n]
            full = (1 << w) - 1
            v[n] = {"zero": 0, "ones": full, "alt": 0x5555555555555555 & full,
                    "alt2": 0xAAAAAAAAAAAAAAAA & full, "top": 1 << (w - 1)}[pattern]
        corners.append(v)
    for n in names:  # one input at all ones, the others zero
        corners.append({m: ((1 << widths[m]) - 1 if m == n else 0) for m in names})
    out.extend(corners)
    while len(out) < count:
        out.append({n: rng.getrandbits(widths[n]) for n in names})
    return out[:count]


def simulate(files: Sequence[Path], top: str, inputs: Mapping[str, int],
             outputs: Mapping[str, int], vecs: Sequence[Mapping[str, int]],
             params: Mapping[str, int] | None = None) -> list[dict[str, int | None]]:
    """Simulate ``top`` with iverilog on each vector; None where an output bit is x or z."""
    params = dict(params or {})
    lines = ["`timescale 1ns/1ns", "module tb;"]
    for n, w in inputs.items():
        lines.append(f"  reg [{w - 1}:0] {n};")
    for n, w in outputs.items():
        lines.append(f"  wire [{w - 1}:0] {n};")
    pov = ""
    if params:
        pov = " #(" + ", ".join(f".{k}({v})" for k, v in params.items()) + ")"
    conns = ", ".join(f".{n}({n})" for n in [*inputs, *outputs])
    lines.append(f"  {top}{pov} dut ({conns});")
    lines.append("  initial begin")
    fmt = " ".join("%b" for _ in outputs)
    args = ", ".join(outputs)
    for v in vecs:
        assigns = " ".join(f"{n} = {inputs[n]}'d{v[n]};" for n in inputs)
        lines.append(f"    {assigns} #1 $display(\"{fmt}\", {args});")
    lines.append("    $finish;")
    lines.append("  end")
    lines.append("endmodule")
    with tempfile.TemporaryDirectory() as tmp:
        tb = Path(tmp) / "tb.sv"
        tb.write_text("\n".join(lines) + "\n")
        exe = Path(tmp) / "sim.vvp"
        cmd = [IVERILOG, "-g2012", "-o", str(exe), "-s", "tb", str(tb), *map(str, files)]
        r = subprocess.run(cmd, capture_output=True, text=True, timeout=120)
        if r.returncode != 0:
            raise RuntimeError(f"iverilog failed: {r.stderr or r.stdout}")
        r = subprocess.run([VVP, "-n", str(exe)], capture_output=True, text=True, timeout=120)
        if r.returncode != 0:
            raise RuntimeError(f"vvp failed: {r.stderr or r.stdout}")
    rows = [ln.split() for ln in r.stdout.splitlines()
            if ln.strip() and not ln.startswith(("VCD", "$finish")) and "finish" not in ln]
    out: list[dict[str, int | None]] = []
    for row in rows:
        d: dict[str, int | None] = {}
        for n, text in zip(outputs, row):
            d[n] = int(text, 2) if set(text) <= {"0", "1"} else None
        out.append(d)
    if len(out) != len(vecs):
        raise RuntimeError(f"expected {len(vecs)} lines from vvp, got {len(out)}: {r.stdout[:500]}")
    return out
