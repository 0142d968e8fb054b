"""Value change dump (IEEE 1364 VCD) files of input vectors run through a design.

One vector per time step: time ``k`` holds vector ``k`` (``$timescale 1 ns``; the file ends with
one more time step so that viewers show the last vector for its full step). The top scope is the
design's name. Ports are vector variables (``a [7:0]``); internal nets are 1-bit variables, put in
nested scopes by the dots of their hierarchical names (``u3.fa.t`` is ``t`` in scope ``u3.fa``),
with a bit index written as a VCD bit select (``G [3]``). A scope ``spec`` beside the ports holds
what the spec expects of each output and ``fails``, 1 in the steps where some output differs.

``write(path, design, vectors, expected=...)`` simulates the vectors (bit-parallel) and writes the
file; ``dumps`` returns the text.
"""

from __future__ import annotations

import datetime as _dt
import re
from pathlib import Path
from typing import Mapping, Sequence

from verify.model.netlist import Netlist
from verify.sim import Simulator, pack

_BIT = re.compile(r"^(?P<name>.+)\[(?P<index>-?\d+)\]$")
SPEC_SCOPE = "spec"


def _code(k: int) -> str:
    """Short identifier code k in printable ASCII 33..126 (base 94)."""
    out = ""
    k += 1
    while k:
        k -= 1
        out += chr(33 + k % 94)
        k //= 94
    return out


def _clean(name: str) -> str:
    return re.sub(r"\s+", "_", name) or "_"


class _Var:
    def __init__(self, code: str, width: int, ref: str, net_bits: list[str] | None,
                 values: list[int]):
        self.code = code
        self.width = width
        self.ref = ref  # "a [7:0]", "G [3]", "p"
        self.values = values  # one int per time step

    def change(self, v: int) -> str:
        if self.width == 1:
            return f"{v & 1}{self.code}"
        return f"b{v:b} {self.code}"


def dumps(design: Netlist, vectors: Sequence[Mapping[str, int]], *,
          expected: Sequence[Mapping[str, int]] | None = None, internal: bool = True,
          comment: str | None = None, date: str | None = None) -> str:
    """The VCD text for ``vectors`` run through ``design``.

    ``expected`` (one {output port: int} per vector, from the spec) adds the ``spec`` scope.
    ``internal=False`` leaves out the internal nets.
    """
    from verify import __version__

    count = len(vectors)
    if count == 0:
        raise ValueError("a waveform needs at least one vector")
    sim = Simulator(design)
    words = pack(design, vectors)
    nets = sim.run_all(words, (1 << count) - 1)

    def bits_of(word: int) -> list[int]:
        return [word >> j & 1 for j in range(count)]

    def port_values(port) -> list[int]:
        out = [0] * count
        for i, b in enumerate(port.bits):
            w = nets[b]
            for j in range(count):
                if w >> j & 1:
                    out[j] |= 1 << i
        return out

    tree: dict = {"vars": [], "scopes": {}}
    k = 0

    def add(scope_path: list[str], width: int, ref: str, values: list[int]) -> None:
        nonlocal k
        node = tree
        for s in scope_path:
            node = node["scopes"].setdefault(s, {"vars": [], "scopes": {}})
        node["vars"].append(_Var(_code(k), width, ref, None, values))
        k += 1

    top = _clean(design.name)
    for p in (*design.inputs, *design.outputs):
        ref = _clean(p.name) + (f" [{p.width - 1}:0]" if p.width > 1 else "")
        add([top], p.width, ref, port_values(p))
    if internal:
        port_bits = set(design.input_bits) | set(design.output_bits)
        for g in design.ordered_gates:
            if g.output in port_bits:
                continue
            parts = g.output.split(".")
            scope, leaf = [top, *[_clean(x) for x in parts[:-1] if x]], parts[-1]
            m = _BIT.match(leaf)
            ref = f"{_clean(m['name'])} [{m['index']}]" if m else _clean(leaf)
            add(scope, 1, ref, bits_of(nets[g.output]))
    if expected is not None:
        if len(expected) != count:
            raise ValueError("expected needs one entry per vector")
        fails = [0] * count
        for p in design.outputs:
            vals = [int(e[p.name]) for e in expected]
            ref = _clean(p.name) + (f" [{p.width - 1}:0]" if p.width > 1 else "")
            add([top, SPEC_SCOPE], p.width, ref, vals)
        actual = {p.name: port_values(p) for p in design.outputs}
        for j, e in enumerate(expected):
            fails[j] = int(any(actual[p.name][j] != int(e[p.name]) for p in design.outputs))
        add([top, SPEC_SCOPE], 1, "fails", fails)

    lines = [f"$date {date or _dt.datetime.now(_dt.timezone.utc).strftime('%Y-%m-%d %H:%M:%S UTC')} $end",
             f"$version adder-verify {__version__} $end",
             "$comment adder-verify report (vcd) $end"]
    if comment:
        lines.append(f"$comment {comment.replace('$end', '(end)')} $end")
    for j, v in enumerate(vectors):
        ins = ", ".join(f"{p.name}={int(v.get(p.name, 0))}" for p in design.inputs)
        lines.append(f"$comment step {j}: {ins} $end")
    lines.append("$timescale 1 ns $end")
    all_vars: list[_Var] = []

    def emit(name: str, node: dict) -> None:
        lines.append(f"$scope module {name} $end")
        for var in node["vars"]:
            lines.append(f"$var wire {var.width} {var.code} {var.ref} $end")
            all_vars.append(var)
        for sub, child in node["scopes"].items():
            emit(sub, child)
        lines.append("$upscope $end")

    for name, node in tree["scopes"].items():
        emit(name, node)
    lines.append("$enddefinitions $end")
    lines.append("#0")
    lines.append("$dumpvars")
    lines.extend(var.change(var.values[0]) for var in all_vars)
    lines.append("$end")
    for j in range(1, count):
        changes = [var.change(var.values[j]) for var in all_vars if var.values[j] != var.values[j - 1]]
        lines.append(f"#{j}")
        lines.extend(changes)
    lines.append(f"#{count}")
    return "\n".join(lines) + "\n"


def write(path: str | Path, design: Netlist, vectors: Sequence[Mapping[str, int]], **kw) -> Path:
    """Write ``dumps(design, vectors, **kw)`` to ``path`` (folders made as needed)."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(dumps(design, vectors, **kw), encoding="ascii", errors="replace")
    return path
