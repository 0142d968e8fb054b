"""Structure figures of a netlist: gate counts, logic depth, the longest path, fanout, prefix nodes.

``stats(netlist)`` returns a dict (the JSON of ``adder-verify shape --json``):

``gates``            op -> number of gates
``gate_count``       all gates
``depth``            logic depth in gate levels, the largest over the output bits
``depth_per_output`` output bit -> gate levels on its longest path from any input
``longest_path``     the nets of one longest path, from an input (or constant) to an output bit
``max_fanout``       the largest number of loads on one net (gate inputs, plus one per output
                     port bit it drives); ``max_fanout_net`` names that net
``prefix_nodes``     (prefix adders only) group generate/propagate nodes of the prefix network
``prefix_levels``    (prefix adders only) rows of the network holding those nodes
``prefix_depth``     (prefix adders only) the longest chain of prefix nodes, one node feeding the
                     next; it can be shorter than the rows (Brent-Kung: the first down-sweep node
                     sits beside the last up-sweep one but does not wait for it)

Counting rules: ``buf`` gates (plain connections) and constants add no level; every other gate
adds one, whatever its number of inputs. Prefix nodes are recognised by the gate sources the
generator writes (``"prefix level L node G[i:j]"``, see ``verify.library.architectures``), which a JSON
netlist keeps. Where those sources are missing (a design read back from Verilog) but the nets keep
the generator's names (``G_i_j``, ``G_i_j_t``, ``P_i_j``), nodes are grouped by name; the rows are
then not known and ``prefix_levels`` is the longest chain of nodes.
"""

from __future__ import annotations

import re
from typing import Any

from verify.model.graph import arrival, path_to
from verify.model.netlist import CONSTANTS, Netlist

_NO_LEVEL = {"buf", "const0", "const1"}
_PREFIX_SRC = re.compile(r"^prefix level (?P<level>\d+) node G\[(?P<hi>\d+):(?P<lo>\d+)\]$")
_PREFIX_NET = re.compile(r"^(?:G_(?P<gh>\d+)_(?P<gl>\d+)(?:_t)?|P_(?P<ph>\d+)_(?P<pl>\d+))$")


def stats(netlist: Netlist) -> dict[str, Any]:
    order = netlist.ordered_gates
    counts: dict[str, int] = {}
    for g in order:
        counts[g.op] = counts.get(g.op, 0) + 1

    level, came_from = arrival(netlist, lambda g: 0 if g.op in _NO_LEVEL else 1)
    per_output = {b: int(level[b]) for b in netlist.output_bits}
    deepest = max(netlist.output_bits, key=lambda b: per_output[b])  # first one on a tie
    path = path_to(came_from, deepest)

    fan = {n: k for n, k in netlist.fanout.items() if n not in CONSTANTS}
    if fan:
        ranked = [*netlist.input_bits, *(g.output for g in order)]
        top = max(fan.values())
        top_net = next(n for n in ranked if fan.get(n) == top)
    else:  # pragma: no cover - every validated netlist drives its outputs from something
        top, top_net = 0, None

    out: dict[str, Any] = {
        "design": netlist.name,
        "inputs": {p.name: p.width for p in netlist.inputs},
        "outputs": {p.name: p.width for p in netlist.outputs},
        "gate_count": len(order),
        "gates": dict(sorted(counts.items())),
        "depth": per_output[deepest],
        "deepest_output": deepest,
        "depth_per_output": per_output,
        "longest_path": path,
        "max_fanout": top,
        "max_fanout_net": top_net,
    }
    out.update(prefix_figures(netlist))
    return out


def prefix_figures(netlist: Netlist) -> dict[str, Any]:
    """prefix_nodes, prefix_levels, prefix_depth (empty dict when the design has no prefix nodes)."""
    node_of: dict[str, tuple[int, int]] = {}  # net -> (hi, lo) of the node driving it
    rows: dict[tuple[int, int], int] = {}
    for g in netlist.gates:
        m = _PREFIX_SRC.match(g.source or "")
        if m:
            key = (int(m["hi"]), int(m["lo"]))
            node_of[g.output] = key
            rows[key] = int(m["level"])
    by_name = False
    if not node_of:
        named = {}
        for g in netlist.gates:
            m = _PREFIX_NET.match(g.output)
            if m:
                named[g.output] = (int(m["gh"] or m["ph"]), int(m["gl"] or m["pl"]))
        # the generator's naming: an and-term G_i_j_t beside each G_i_j
        if any(n.endswith("_t") for n in named):
            node_of, by_name = named, True
            # an output bit that was a node's G keeps the port name: follow its inputs
            for g in netlist.gates:
                if g.output not in node_of and g.op == "or" and any(
                        i.endswith("_t") and i in node_of for i in g.inputs):
                    node_of[g.output] = next(node_of[i] for i in g.inputs if i in node_of
                                             and i.endswith("_t"))
    if not node_of:
        return {}
    driver = netlist.driver
    memo: dict[Any, int] = {}

    def unit(net: str) -> Any:
        return ("node", node_of[net]) if net in node_of else ("net", net)

    members: dict[Any, list[str]] = {}
    for n in node_of:
        members.setdefault(unit(n), []).append(n)

    def feeds(u: Any) -> list[Any]:
        """The units whose nets drive unit u's nets (u itself left out)."""
        out = []
        for n in members.get(u, [u[1]]):
            g = driver.get(n)
            for i in (g.inputs if g is not None else ()):
                if i in driver and unit(i) != u:
                    out.append(unit(i))
        return out

    # prefix nodes on the longest chain ending at each unit (itself included if it is a node),
    # by an explicit-stack depth-first walk: no recursion, however long the chain
    for root in members:
        stack = [root]
        while stack:
            u = stack[-1]
            if u in memo:
                stack.pop()
                continue
            todo = [v for v in feeds(u) if v not in memo]
            if todo:
                stack.extend(todo)
                continue
            memo[u] = max((memo[v] for v in feeds(u)), default=0) + (1 if u[0] == "node" else 0)
            stack.pop()
    depth = max(memo[u] for u in members)
    nodes = set(node_of.values())
    return {"prefix_nodes": len(nodes),
            "prefix_levels": depth if by_name else max(rows.values()),
            "prefix_depth": depth}


def format_text(s: dict[str, Any]) -> str:
    """The human-readable form printed by ``adder-verify shape``."""
    ins = ", ".join(f"{k}[{w - 1}:0]" if w > 1 else k for k, w in s["inputs"].items())
    outs = ", ".join(f"{k}[{w - 1}:0]" if w > 1 else k for k, w in s["outputs"].items())
    ops = ", ".join(f"{op} {k}" for op, k in sorted(s["gates"].items(), key=lambda x: (-x[1], x[0])))
    lines = [
        f"{s['design']}: inputs {ins}; outputs {outs}",
        f"  gates          {s['gate_count']} ({ops})",
        f"  logic depth    {s['depth']} gate levels (deepest output {s['deepest_output']})",
        f"  longest path   {' -> '.join(s['longest_path'])}",
        f"  largest fanout {s['max_fanout']} (net {s['max_fanout_net']})",
    ]
    if "prefix_nodes" in s:
        lines.append(f"  prefix nodes   {s['prefix_nodes']} in {s['prefix_levels']} levels "
                     f"(longest chain of nodes {s['prefix_depth']})")
    per = s["depth_per_output"]
    if len(per) > 1:
        lines.append("  depth per output bit: " + ", ".join(f"{b} {d}" for b, d in per.items()))
    return "\n".join(lines)
