"""Write a netlist as structural Verilog (IEEE 1364-2005): gate primitives and simple assigns.

Nets get legal identifiers: port bits keep their port's name and index; internal nets are
declared as escaped identifiers only where their names are not already legal.
"""

from __future__ import annotations

import re

from verify.model.ops import OPS
from verify.model.netlist import CONST0, CONST1, Netlist

_IDENT = re.compile(r"^[A-Za-z_][A-Za-z0-9_$]*$")
_PORT_BIT = re.compile(r"^(?P<name>[A-Za-z_][A-Za-z0-9_$]*)\[(?P<index>\d+)\]$")
_PRIMITIVES = {"and", "or", "xor", "nand", "nor", "xnor", "not", "buf"}


def dumps(netlist: Netlist, module: str | None = None) -> str:
    module = module or _legal(netlist.name)
    ports = netlist.ports
    names: dict[str, str] = {}

    def ref(net: str) -> str:
        if net == CONST0:
            return "1'b0"
        if net == CONST1:
            return "1'b1"
        if net in names:
            return names[net]
        m = _PORT_BIT.match(net)
        if net in ports or (m and m["name"] in ports):
            names[net] = net
        elif _IDENT.match(net):
            names[net] = net
        else:
            names[net] = "\\" + net + " "  # escaped identifier, ends at the space
        return names[net]

    lines = [f"// written by adder-verify from '{netlist.name}': {len(netlist.gates)} gates",
             f"module {module} ("]
    decls = [f"  input  wire {_range(p.width)}{p.name}" for p in netlist.inputs]
    decls += [f"  output wire {_range(p.width)}{p.name}" for p in netlist.outputs]
    lines.append(",\n".join(decls))
    lines.append(");")
    outputs = set(netlist.output_bits)
    for g in netlist.ordered_gates:
        if g.output not in outputs:
            lines.append(f"  wire {ref(g.output)};")
    counts: dict[str, int] = {}
    for g in netlist.ordered_gates:
        out = ref(g.output)
        ins = [ref(i) for i in g.inputs]
        if g.op in _PRIMITIVES:
            counts[g.op] = counts.get(g.op, 0) + 1
            lines.append(f"  {g.op} g_{g.op}_{counts[g.op]} ({out}, {', '.join(ins)});")
        else:
            lines.append(f"  assign {out} = {OPS[g.op].verilog(ins)};")
    lines.append("endmodule")
    return "\n".join(lines) + "\n"


def _range(width: int) -> str:
    return "" if width == 1 else f"[{width - 1}:0] "


def _legal(name: str) -> str:
    s = re.sub(r"[^A-Za-z0-9_$]", "_", name)
    return s if _IDENT.match(s) else f"m_{s}"
