"""Event-driven simulation of one input transition under a delay model (transport delay).

Semantics: transport delay. Every change on a gate input at time ``t`` evaluates the gate on the
values its inputs hold at ``t`` and schedules that value on its output at ``t + d``; nothing is
swallowed, so pulses shorter than a gate's delay travel on (glitches included). A net changes
only when a scheduled value differs from the one it holds. Zero-delay gates (``buf``) settle in
the same time step, in order.

Before time 0 the circuit rests in the steady state of the ``before`` vector; at time 0 the inputs
switch to ``after``. With ``before=None`` every net holds an unknown value (``None``, written
``x`` in a VCD) before time 0, the floating-mode assumption: a gate output is known as soon as its
known inputs determine it (the op table's settle rule), so an output becomes known exactly at its
floating-mode settle time for ``after``.
"""

from __future__ import annotations

import heapq
from dataclasses import dataclass
from typing import Mapping

from verify.model import graph
from verify.model.netlist import Netlist
from verify.model.ops import OPS


@dataclass
class Waveform:
    design: Netlist
    initial: dict[str, int | None]  # net -> value before time 0
    changes: list[tuple[int, str, int | None]]  # (time in ticks, net, new value), time order
    final: dict[str, int | None]

    def last_change(self, nets) -> int:
        """The time of the last change on any of ``nets`` (0 if none changes)."""
        want = set(nets)
        return max((t for t, n, _ in self.changes if n in want), default=0)

    def value_at(self, net: str, t: int) -> int | None:
        """The value ``net`` holds from time ``t`` on (after the changes at ``t``)."""
        v = self.initial[net]
        for when, n, value in self.changes:
            if when > t:
                break
            if n == net:
                v = value
        return v


def input_values(design: Netlist, vector: Mapping[str, int] | None) -> dict[str, int | None]:
    out: dict[str, int | None] = {}
    for p in design.inputs:
        for i, b in enumerate(p.bits):
            out[b] = None if vector is None else int(vector.get(p.name, 0)) >> i & 1
    return out


def _eval(op_name: str, vals: list[int | None]) -> int | None:
    op = OPS[op_name]
    if all(v is not None for v in vals):
        return op.bit(vals)
    if op.determined([v is not None for v in vals], [v or 0 for v in vals]):
        return op.bit([v or 0 for v in vals])
    return None


def steady(design: Netlist, vector: Mapping[str, int] | None) -> dict[str, int | None]:
    """Every net's value when ``vector`` has been applied for a long time (None: unknown)."""
    value: dict[str, int | None] = {"0": 0, "1": 1, **input_values(design, vector)}
    for g in design.ordered_gates:
        value[g.output] = _eval(g.op, [value[i] for i in g.inputs]) if vector is not None \
            else (OPS[g.op].bit([]) if not g.inputs else None)
    return value


def simulate(design: Netlist, delay: Mapping[str, int], after: Mapping[str, int],
             before: Mapping[str, int] | None = None) -> Waveform:
    """The waveform of the transition ``before`` -> ``after`` at time 0 (see the module doc).

    ``delay`` maps each gate's output net to its delay in ticks.
    """
    value = steady(design, before)
    initial = dict(value)
    users = graph.readers(design)
    seq = 0
    queue: list[tuple[int, int, str, int | None]] = []
    for b, v in input_values(design, after).items():
        queue.append((0, seq, b, v))
        seq += 1
    heapq.heapify(queue)
    changes: list[tuple[int, str, int | None]] = []
    while queue:
        now = queue[0][0]
        batch: dict[str, int | None] = {}
        while queue and queue[0][0] == now:
            _, _, net, v = heapq.heappop(queue)
            batch[net] = v  # a later event at the same time replaces an earlier one
        touched: dict[int, object] = {}
        for net, v in batch.items():
            if value[net] != v:
                value[net] = v
                changes.append((now, net, v))
                for g in users.get(net, ()):
                    touched[id(g)] = g
        for g in touched.values():
            out = _eval(g.op, [value[i] for i in g.inputs])
            heapq.heappush(queue, (now + delay[g.output], seq, g.output, out))
            seq += 1
    return Waveform(design, initial, changes, dict(value))


def settle_time(wave: Waveform, nets) -> int:
    """When the last of ``nets`` reached its final value (0 if none changed)."""
    return wave.last_change(nets)
