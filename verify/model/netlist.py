"""The netlist model: single-bit gates between named ports.

This module is the ground floor of the package: it imports nothing else of the project except the
error type. Every input format produces a ``Netlist``; every engine consumes one.

Nets are strings. Bit ``i`` of a port ``p`` is the net ``p[i]`` (bit 0 is the least significant);
a 1-bit port's only bit is the bare name ``p``. The nets ``"0"`` and ``"1"`` are the constants.
Any other net is the output of exactly one gate.

Gate ops and what each means: ``verify.model.ops.OPS``, the one table. Graph walks (order, loops,
cones, depth): ``verify.model.graph``.
"""

from __future__ import annotations

import hashlib
import json
import re
from dataclasses import dataclass, field
from functools import cached_property
from typing import Iterable, Mapping

from verify.errors import NetlistError
from verify.model.graph import describe_loop, topological
from verify.model.ops import OPS, arity_text


#: the widest port accepted: far past any adder, and small enough that a typo is not a hang
MAX_PORT_WIDTH = 1 << 16

CONST0 = "0"
CONST1 = "1"
CONSTANTS = (CONST0, CONST1)

_BIT_REF = re.compile(r"^(?P<name>.+)\[(?P<index>-?\d+)\]$")


def bit_name(port: str, index: int, width: int) -> str:
    """The net name of bit ``index`` of a port of the given width."""
    return port if width == 1 else f"{port}[{index}]"


@dataclass(frozen=True)
class Port:
    """A named input or output of ``width`` bits."""

    name: str
    width: int

    @property
    def bits(self) -> list[str]:
        return [bit_name(self.name, i, self.width) for i in range(self.width)]

    def __str__(self) -> str:
        return self.name if self.width == 1 else f"{self.name}[{self.width - 1}:0]"


@dataclass(frozen=True)
class Gate:
    """One single-bit gate: its op, its input nets (in order), and the net it drives.

    ``source`` says where the gate came from (a Verilog file:line, a hierarchical instance path)
    for messages and diagnosis; it plays no part in equality.
    """

    op: str
    inputs: tuple[str, ...]
    output: str
    source: str | None = field(default=None, compare=False)

    def describe(self) -> str:
        where = f" ({self.source})" if self.source else ""
        return f"{self.output} = {self.op}({', '.join(self.inputs)}){where}"


@dataclass(frozen=True)
class Netlist:
    """A combinational circuit: input ports, output ports and the gates between them.

    Construct it, then call :meth:`validate` (readers do this) before handing it to an engine.
    """

    name: str
    inputs: tuple[Port, ...]
    outputs: tuple[Port, ...]
    gates: tuple[Gate, ...]
    #: where the design was read from, for messages only
    origin: str | None = field(default=None, compare=False)

    # ---- lookups -------------------------------------------------------------------------
    @cached_property
    def ports(self) -> dict[str, Port]:
        return {p.name: p for p in (*self.inputs, *self.outputs)}

    @cached_property
    def input_bits(self) -> list[str]:
        """Every input bit, ports in declaration order, each LSB first."""
        return [b for p in self.inputs for b in p.bits]

    @cached_property
    def output_bits(self) -> list[str]:
        return [b for p in self.outputs for b in p.bits]

    @cached_property
    def driver(self) -> dict[str, Gate]:
        """net -> the gate driving it (the last one if there are several: validate catches that)."""
        return {g.output: g for g in self.gates}

    @cached_property
    def ordered_gates(self) -> tuple[Gate, ...]:
        """Gates in an order where every gate comes after the gates driving its inputs."""
        order, leftover = topological(self.gates, set(self.input_bits) | set(CONSTANTS))
        if leftover:
            raise NetlistError(describe_loop(leftover), self.origin)
        return tuple(order)

    @cached_property
    def fanout(self) -> dict[str, int]:
        counts: dict[str, int] = {}
        for g in self.gates:
            for n in g.inputs:
                counts[n] = counts.get(n, 0) + 1
        for n in self.output_bits:
            counts[n] = counts.get(n, 0) + 1
        return counts

    def port(self, name: str) -> Port:
        return self.ports[name]

    def width(self, name: str) -> int:
        return self.ports[name].width

    @property
    def input_width(self) -> int:
        return sum(p.width for p in self.inputs)

    def content_hash(self) -> str:
        """sha256 of the canonical form: same structure, same hash, whatever file it came from."""
        canon = {
            "inputs": [[p.name, p.width] for p in self.inputs],
            "outputs": [[p.name, p.width] for p in self.outputs],
            "gates": sorted([g.output, g.op, list(g.inputs)] for g in self.gates),
        }
        text = json.dumps(canon, separators=(",", ":"), sort_keys=True)
        return hashlib.sha256(text.encode()).hexdigest()

    def summary(self) -> str:
        ins = ", ".join(str(p) for p in self.inputs)
        outs = ", ".join(str(p) for p in self.outputs)
        return f"{self.name}: inputs {ins}; outputs {outs}; {len(self.gates)} gates"

    # ---- the one validation pass ---------------------------------------------------------
    def validate(self) -> "Netlist":
        """Check the whole netlist; raise one NetlistError naming the first problem found.

        Checks: port names (duplicates, clashes with constants), known ops and their input
        counts, references to unknown nets or out-of-range port bits, more than one driver, a
        gate driving an input, undriven outputs, and combinational loops (the cycle is printed).
        Returns the netlist itself so that readers can write ``return Netlist(...).validate()``.
        """
        problems = list(self._problems())
        if problems:
            more = f" (and {len(problems) - 1} more problem{'s' if len(problems) > 2 else ''})"
            raise NetlistError(problems[0] + (more if len(problems) > 1 else ""), self.origin)
        self.ordered_gates  # noqa: B018 - raises on a loop
        return self

    def _problems(self) -> Iterable[str]:
        seen_ports: set[str] = set()
        for kind, ports in (("input", self.inputs), ("output", self.outputs)):
            for p in ports:
                if not p.name or not isinstance(p.name, str):
                    yield f"{kind} port with an empty name"
                elif p.name in seen_ports:
                    yield f"port '{p.name}' is declared more than once"
                elif p.name in CONSTANTS:
                    yield f"port name '{p.name}' is reserved for a constant"
                if not isinstance(p.width, int) or p.width < 1:
                    yield f"{kind} port '{p.name}' has width {p.width!r}; a width is a whole number >= 1"
                elif p.width > MAX_PORT_WIDTH:
                    yield (f"{kind} port '{p.name}' is {p.width:,} bits wide; the widest port "
                           f"supported is {MAX_PORT_WIDTH:,} bits")
                seen_ports.add(p.name)
        if not self.inputs:
            yield "the design has no input ports"
        if not self.outputs:
            yield "the design has no output ports"

        input_bits = set(self.input_bits)
        drivers: dict[str, Gate] = {}
        for g in self.gates:
            label = f"gate driving '{g.output}'" + (f" ({g.source})" if g.source else "")
            if g.op not in OPS:
                yield f"{label}: unknown op '{g.op}' (known: {', '.join(OPS)})"
            else:
                op, n = OPS[g.op], len(g.inputs)
                if not op.arity_ok(n):
                    yield (f"{label}: op '{g.op}' takes {arity_text(op)} "
                           f"input{'s' if op.min_inputs != 1 else ''}, got {n}")
            if g.output in CONSTANTS:
                yield f"{label}: a gate cannot drive the constant '{g.output}'"
            elif g.output in input_bits:
                yield f"{label}: '{g.output}' is an input bit and cannot be driven by a gate"
            elif g.output in self.ports and self.ports[g.output].width > 1:
                yield (f"{label}: '{g.output}' is the name of a {self.ports[g.output].width}-bit "
                       f"port; drive one bit ('{g.output}[0]') or give the net another name")
            elif g.output in drivers:
                first = drivers[g.output]
                yield (f"net '{g.output}' has more than one driver: "
                       f"{first.describe()} and {g.describe()}")
            else:
                bad = self._bad_port_bit(g.output)
                if bad:
                    yield f"{label}: {bad}"
                drivers[g.output] = g
        known = input_bits | set(drivers) | set(CONSTANTS)
        for g in self.gates:
            for k, n in enumerate(g.inputs):
                if n not in known:
                    bad = self._bad_port_bit(n)
                    label = f"input {k + 1} of the gate driving '{g.output}'"
                    if g.source:
                        label += f" ({g.source})"
                    if bad:
                        yield f"{label}: {bad}"
                    elif n in self.ports and self.ports[n].width > 1:
                        yield f"{label}: '{n}' is a {self.ports[n].width}-bit port; name one bit, e.g. '{n}[0]'"
                    else:
                        yield f"{label}: signal '{n}' is not driven by any gate and is not an input"
        for b in self.output_bits:
            if b not in drivers:
                yield f"output bit '{b}' is not driven by any gate"

    def _bad_port_bit(self, net: str) -> str | None:
        m = _BIT_REF.match(net)
        if not m or m["name"] not in self.ports:
            return None
        port, index = self.ports[m["name"]], int(m["index"])
        if port.width == 1:
            return None if index == 0 else f"'{net}': port '{port.name}' is 1 bit wide"
        if not 0 <= index < port.width:
            return f"'{net}': bit index {index} is out of range for port {port}"
        return None


def canonical_ref(ref: str, ports: Mapping[str, int]) -> str:
    """Normalize a reference: ``p[0]`` of a 1-bit port is the bare name ``p``."""
    m = _BIT_REF.match(ref)
    if m and ports.get(m["name"]) == 1 and int(m["index"]) == 0:
        return m["name"]
    return ref
