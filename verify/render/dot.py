"""The fan-in cone of one output bit as a Graphviz DOT graph, suspects and wrong nets highlighted.

Every gate of the cone is a box ``net / op`` with its value on the counterexample; input bits are
ellipses. The first suspect is filled red, the next ones pink; nets whose value on the
counterexample is wrong (they differ from the design with the first suspect repaired) are orange;
the output bit has a double border. Signals flow left to right.
"""

from __future__ import annotations

from typing import Iterable, Mapping

from verify.model.graph import cone
from verify.model.netlist import CONSTANTS, Netlist


def _q(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def cone_dot(design: Netlist, target: str, suspects: Iterable[str] = (),
             diverging: Iterable[str] = (), values: Mapping[str, int] | None = None) -> str:
    suspects = list(suspects)
    diverging = set(diverging)
    values = values or {}
    nets = cone(design, target)
    lines = [f"// adder-verify report (dot): fan-in cone of {target} in {design.name}",
             f"digraph {_q(design.name + ' cone of ' + target)} {{",
             "  rankdir=LR;",
             '  node [fontname="Helvetica", fontsize=10];',
             f"  label={_q(f'{design.name}: fan-in cone of {target}; red = first suspect, pink = next suspects, orange = wrong value on the counterexample')};",
             "  labelloc=t;"]
    for n in nets:
        g = design.driver.get(n)
        val = f" = {values[n]}" if n in values else ""
        attrs = []
        if g is None:
            attrs += ["shape=ellipse", f"label={_q(n + val)}"]
        else:
            label = f"{n}{val}\\n{g.op}"
            attrs += ["shape=box", "label=" + '"' + label.replace('"', '\\"') + '"']
            if g.source:
                attrs.append(f"tooltip={_q(g.source)}")
        style = []
        if n in suspects:
            style.append("filled")
            attrs.append('fillcolor="#e04040"' if n == suspects[0] else 'fillcolor="#f4a6a6"')
            attrs.append(f"xlabel={_q('suspect ' + str(suspects.index(n) + 1))}")
        elif n in diverging:
            style.append("filled")
            attrs.append('fillcolor="#f6b26b"')
        if n == target:
            attrs.append("peripheries=2")
        if style:
            attrs.append(f"style={_q(','.join(style))}")
        lines.append(f"  {_q(n)} [{', '.join(attrs)}];")
    for n in nets:
        g = design.driver.get(n)
        if g is None:
            continue
        for k, i in enumerate(g.inputs):
            if i in CONSTANTS:
                const = f"{n}::const{k}"
                lines.append(f"  {_q(const)} [shape=plaintext, label={_q(i)}];")
                lines.append(f"  {_q(const)} -> {_q(n)};")
                continue
            color = ' [color="#d05000", penwidth=2]' if i in diverging and n in diverging else ""
            lines.append(f"  {_q(i)} -> {_q(n)}{color};")
    lines.append("}")
    return "\n".join(lines) + "\n"
