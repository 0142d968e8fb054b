"""Rebuild the generated files of the Larkspur adder library (see README.md in this folder).

    python designs/regenerate.py          # rewrite every generated file
    python designs/regenerate.py --check  # exit 1 if a file on disk differs from what it would write

The hand-written Verilog files (larkspur_add8_behavioral.v, larkspur_add_rca_generate.v) are not
touched. Every file is a pure function of the code in verify/architectures.py and the mistakes
listed below, so running this twice writes the same bytes.
"""

from __future__ import annotations

import json
import sys
from dataclasses import dataclass
from pathlib import Path
from typing import Callable

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))

from verify.library.architectures import generate  # noqa: E402
from verify.formats import json_netlist  # noqa: E402
from verify.formats.verilog import writer as verilog_writer  # noqa: E402
from verify.model.netlist import Gate, Netlist  # noqa: E402


@dataclass(frozen=True)
class Design:
    path: str  # relative to this folder
    arch: str
    width: int
    params: dict
    overflow: bool = False
    note: str = ""
    mistake: Callable[[Netlist], Netlist] | None = None


# ---- the wiring mistakes (each one a small edit of a correct generated design) ---------------

def rewire(netlist: Netlist, gate_output: str, old: str, new: str | None) -> Netlist:
    """Replace input ``old`` of the gate driving ``gate_output`` by ``new`` (or drop it)."""
    gates, hit = [], False
    for g in netlist.gates:
        if g.output == gate_output:
            assert old in g.inputs, (gate_output, old, g.inputs)
            ins = tuple(x for x in (new if x == old else x for x in g.inputs) if x is not None)
            g, hit = Gate(g.op, ins, g.output, g.source), True
        gates.append(g)
    assert hit, gate_output
    return Netlist(netlist.name, netlist.inputs, netlist.outputs, tuple(gates)).validate()


def swap_outputs(netlist: Netlist, x: str, y: str) -> Netlist:
    swap = {x: y, y: x}
    gates = [Gate(g.op, tuple(swap.get(i, i) for i in g.inputs), swap.get(g.output, g.output),
                  g.source) for g in netlist.gates]
    return Netlist(netlist.name, netlist.inputs, netlist.outputs, tuple(gates)).validate()


def wrong_predecessor(n: Netlist) -> Netlist:
    # node G[11:4] (level 3) should combine G[11:8] with column 7's G[7:4]; the generator's loop
    # was off by one and took column 6's G[6:3] (and P[6:3]): bit 7 drops out of the group
    n = rewire(n, "G_11_4_t", "G_7_4", "G_6_3")
    return rewire(n, "P_11_4", "P_7_4", "P_6_3")


def swapped_sum_bits(n: Netlist) -> Netlist:
    return swap_outputs(n, "sum[3]", "sum[4]")


def select_wrong_block_carry(n: Netlist) -> Netlist:
    # the carry-out multiplexer of block [11:8] is driven by c4 (two blocks down), not c8
    return rewire(n, "c12", "c8", "c4")


def skip_missing_propagate(n: Netlist) -> Netlist:
    # the skip condition of block [7:4] ANDs p4, p5 and p7 only: p6 was left out
    return rewire(n, "P_7_4", "p6", None)


def overflow_wrong_carries(n: Netlist) -> Netlist:
    # v must be c8 ^ c7 (carry out of, and carry into, the sign bit); this one uses c7 ^ c6
    # both inputs at once, by position: rewiring one at a time turned (cout, c7) into (c6, c6)
    gates = tuple(Gate(g.op, ("c7", "c6"), g.output, g.source) if g.output == "v" else g
                  for g in n.gates)
    return Netlist(n.name, n.inputs, n.outputs, gates).validate()


DESIGNS = [
    # correct ones
    Design("larkspur_add8_ripple.json", "ripple", 8, {},
           note="8-bit ripple-carry adder: the sensor-frame counter and the reference for the rest"),
    Design("larkspur_add8_ripple_maj.v", "ripple-maj", 8, {},
           note="8-bit ripple-carry adder with majority-gate carries, as structural Verilog"),
    Design("larkspur_acc16_kogge_stone.json", "kogge-stone", 16, {},
           note="16-bit Kogge-Stone accumulator adder of the fusion filter"),
    Design("larkspur_acc16_brent_kung.v", "brent-kung", 16, {},
           note="16-bit Brent-Kung accumulator adder (the low-area variant), structural Verilog"),
    Design("larkspur_add12_carry_select.json", "carry-select", 12, {"sizes": "growing", "block": 2},
           note="12-bit carry-select adder, growing blocks 2,2,3,4,1, for the radar range bins"),
    Design("larkspur_add24_carry_skip.json", "carry-skip", 24, {"sizes": "variable"},
           note="24-bit carry-skip adder, variable blocks 1,2,3,4,5,4,3,2, fixed-point mantissas"),
    Design("larkspur_add16_cla.json", "carry-lookahead", 16, {"block": 4},
           note="16-bit two-level carry-lookahead adder (4-bit lookahead units)"),
    Design("larkspur_acc32_sklansky.json", "sklansky", 32, {}, overflow=True,
           note="32-bit Sklansky timestamp adder with signed overflow flag v"),
    Design("larkspur_add20_han_carlson.v", "han-carlson", 20, {},
           note="20-bit Han-Carlson adder (a width that is not a power of two)"),
    # broken on purpose
    Design("broken/larkspur_acc16_kogge_stone_wrong_predecessor.json", "kogge-stone", 16, {},
           note="prefix node G[11:4] fed from the wrong predecessor: column 6 (G[6:3], P[6:3]) "
                "instead of column 7 (G[7:4], P[7:4])",
           mistake=wrong_predecessor),
    Design("broken/larkspur_add8_swapped_sum_bits.v", "ripple", 8, {},
           note="sum bits 3 and 4 swapped at the output", mistake=swapped_sum_bits),
    Design("broken/larkspur_add16_carry_select_wrong_block_carry.json", "carry-select", 16,
           {"block": 4},
           note="the carry-out multiplexer of block [11:8] selects by c4 instead of c8",
           mistake=select_wrong_block_carry),
    Design("broken/larkspur_add16_carry_skip_missing_propagate.json", "carry-skip", 16,
           {"block": 4},
           note="the skip condition of block [7:4] misses propagate bit p6",
           mistake=skip_missing_propagate),
    Design("broken/larkspur_add8_overflow_wrong_carries.json", "carry-lookahead", 8, {"block": 4},
           overflow=True,
           note="overflow flag v taken from c7 ^ c6 instead of c8 ^ c7 (sum and cout are right)",
           mistake=overflow_wrong_carries),
]


def design_name(d: Design) -> str:
    return Path(d.path).stem


def build(d: Design) -> Netlist:
    n = generate(d.arch, d.width, overflow=d.overflow, name=design_name(d), **d.params)
    return d.mistake(n) if d.mistake else n


def render(d: Design) -> str:
    n = build(d)
    what = ("BROKEN ON PURPOSE: " if d.mistake else "") + d.note
    origin = (f"generated by designs/regenerate.py: adder-verify generate {d.arch} --width {d.width}"
              + "".join(f" --{k} {v}" for k, v in d.params.items())
              + (" --overflow" if d.overflow else ""))
    if d.path.endswith(".json"):
        text = json_netlist.dumps(n)
        comment = json.dumps(f"{what}. {origin}")
        assert text.startswith("{")
        return '{"comment": ' + comment + ", " + text[1:]
    return f"// {what}.\n// {origin}\n" + verilog_writer.dumps(n)


def main(argv: list[str]) -> int:
    check = "--check" in argv
    stale = []
    for d in DESIGNS:
        path = HERE / d.path
        text = render(d)
        if check:
            if not path.exists() or path.read_text(encoding="utf-8") != text:
                stale.append(d.path)
            continue
        path.parent.mkdir(parents=True, exist_ok=True)
        path.write_text(text, encoding="utf-8")
        print(f"wrote designs/{d.path}")
    if stale:
        print("out of date: " + ", ".join(stale) + " (run python designs/regenerate.py)")
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
