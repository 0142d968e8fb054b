"""The one home of graph walks over a netlist: order, loops, cones, arrival times.

Every walk here is iterative, so a 65,536-bit ripple chain needs no deep Python stack. The
netlist model (``Netlist.ordered_gates``) and every engine, analysis and renderer that needs an
order, a cone or a depth call these functions rather than walking gates themselves.
"""

from __future__ import annotations

import heapq
from typing import Callable, Iterable, Mapping, Sequence

CONSTANT_NETS = ("0", "1")


def topological(gates: Iterable, ready: set[str]) -> tuple[list, list]:
    """Kahn's algorithm over nets. Returns (ordered gates, gates left on or behind a loop).

    ``ready`` holds the nets known before any gate (inputs, constants). Ready gates are taken
    lowest index first, so a list already in order keeps its order.
    """
    gates = list(gates)
    waiting: dict[str, list[int]] = {}
    missing = [0] * len(gates)
    queue: list[int] = []
    for i, g in enumerate(gates):
        pending = {n for n in g.inputs if n not in ready}
        missing[i] = len(pending)
        for n in pending:
            waiting.setdefault(n, []).append(i)
        if not pending:
            queue.append(i)
    heapq.heapify(queue)
    order = []
    while queue:
        i = heapq.heappop(queue)
        g = gates[i]
        order.append(g)
        for j in waiting.pop(g.output, ()):
            missing[j] -= 1
            if missing[j] == 0:
                heapq.heappush(queue, j)
    placed = {id(g) for g in order}
    return order, [g for g in gates if id(g) not in placed]


def describe_loop(stuck: Sequence) -> str:
    """Find one cycle among gates that could not be ordered and print it in signal direction."""
    driver = {g.output: g for g in stuck}
    path: list[str] = []
    index: dict[str, int] = {}
    net: str | None = stuck[0].output
    while net is not None and net not in index:
        index[net] = len(path)
        path.append(net)
        net = next((n for n in driver[net].inputs if n in driver), None)
    cycle = path[index[net]:] + [net] if net is not None else path
    sources = [driver[n].source for n in cycle[:-1] if driver[n].source]
    where = f" ({'; '.join(dict.fromkeys(sources))})" if sources else ""
    # the walk followed inputs backwards; print it in the direction the signal flows
    return f"combinational loop: {' -> '.join(reversed(cycle))}{where}"


def fanin(driver: Mapping[str, object], targets: Iterable[str]) -> set[str]:
    """Every net in the fan-in of ``targets`` (themselves included), constants left out."""
    seen: set[str] = set()
    stack = list(targets)
    while stack:
        n = stack.pop()
        if n in seen or n in CONSTANT_NETS:
            continue
        seen.add(n)
        g = driver.get(n)
        if g is not None:
            stack.extend(g.inputs)
    return seen


def cone(netlist, target: str) -> list[str]:
    """Nets in the fan-in of ``target`` (itself included), inputs first, in topological order."""
    want = fanin(netlist.driver, [target])
    order = [b for b in netlist.input_bits if b in want]
    order += [g.output for g in netlist.ordered_gates if g.output in want]
    return order


def readers(netlist) -> dict[str, list]:
    """net -> the gates that read it, in topological order."""
    out: dict[str, list] = {}
    for g in netlist.ordered_gates:
        for n in dict.fromkeys(g.inputs):
            out.setdefault(n, []).append(g)
    return out


def arrival(netlist, delay: Callable[[object], float],
            start: Mapping[str, float] | None = None) -> tuple[dict[str, float], dict[str, str | None]]:
    """Longest-path arrival time of every net, and the input each took it through.

    ``delay(gate)`` is the gate's delay; inputs arrive at ``start`` (default 0) and constants at
    0. Returns (net -> time, net -> the gate input on its longest path, None at inputs).
    """
    time: dict[str, float] = {n: 0.0 for n in CONSTANT_NETS}
    time.update({n: 0.0 for n in netlist.input_bits})
    if start:
        time.update(start)
    came_from: dict[str, str | None] = {n: None for n in time}
    for g in netlist.ordered_gates:
        best, via = 0.0, None
        for i in g.inputs:
            if via is None or time[i] > best:
                best, via = time[i], i
        time[g.output] = best + delay(g)
        came_from[g.output] = via
    return time, came_from


def path_to(came_from: Mapping[str, str | None], net: str) -> list[str]:
    """The longest path recorded by ``arrival`` ending at ``net``, listed from its input."""
    path = [net]
    while came_from.get(path[-1]) is not None:
        path.append(came_from[path[-1]])
    return list(reversed(path))
