"""BDD engine: both netlists as reduced ordered binary decision diagrams, compared output by output.

An independent complete method beside the sweeping engine and z3. Every gate of the design and of
the spec's reference netlist becomes a BDD (CUDD through the ``dd`` package, ``dd.cudd``), the gate
meaning taken from ``OPS[op].evaluate`` with BDDs as words. Two functions are equal exactly when
their reduced ordered BDDs are the same node, so an output bit is proven when the design's and the
reference's BDDs coincide; otherwise any assignment of their XOR is a counterexample (re-simulated).

The variable order decides the size: for an addition the operand bits are interleaved (x_i next to
y_i), one-bit inputs come first, and the most-significant-first order is tried before the
least-significant-first one. Past the node limit (``MAX_NODES`` live nodes) or the CPU-time limit
the outcome is undecided, never a pass.
"""

from __future__ import annotations

import time

from verify.engines import Options, confirmed
from verify.engines.cases import find_addition
from verify.model.netlist import CONST0, CONST1
from verify.model.ops import OPS
from verify.model.result import EngineOutcome

#: live BDD nodes allowed before an order is given up
MAX_NODES = 4_000_000
#: bytes CUDD may use: one operation that blows up stops here (checks run between gates)
MAX_MEMORY = 768 * 2 ** 20
_CHECK_EVERY = 128


class _Limit(Exception):
    def __init__(self, why: str):
        super().__init__(why)
        self.why = why


class _Node:
    """A BDD with the word operators ``OPS`` expressions use (&, |, ^)."""

    __slots__ = ("f", "bdd")

    def __init__(self, bdd, f):
        self.bdd, self.f = bdd, f

    def __and__(self, o):
        return _Node(self.bdd, self.f & o.f)

    def __or__(self, o):
        return _Node(self.bdd, self.f | o.f)

    def __xor__(self, o):
        return _Node(self.bdd, self.bdd.apply("xor", self.f, o.f))


def _manager():
    try:
        from dd import cudd
        return cudd.BDD(), "dd.cudd"
    except ImportError:  # pragma: no cover - the venv has CUDD
        from dd import autoref
        return autoref.BDD(), "dd.autoref"


def orders(design, spec) -> list[tuple[str, list[str]]]:
    """Candidate variable orders (name, input bits first to last)."""
    add = find_addition(design, spec, {})
    ones = [b for p in design.inputs if p.width == 1 for b in p.bits]
    if add is not None:
        xs = design.ports[add.x[0]].bits
        ys = design.ports[add.y[0]].bits
        pairs = [b for i in range(add.width) for b in (xs[i], ys[i])]
        rest = [b for b in design.input_bits if b not in set(pairs) and b not in set(ones)]
        msb = [b for i in reversed(range(add.width)) for b in (xs[i], ys[i])]
        return [("interleaved, most significant first", ones + rest + msb),
                ("interleaved, least significant first", ones + rest + pairs)]
    # no addition found: interleave every port by bit index
    width = max((p.width for p in design.inputs), default=0)
    bits = {p.name: list(p.bits) for p in design.inputs}
    lsb = [bits[p.name][i] for i in range(width) for p in design.inputs if i < p.width]
    return [("by bit index, most significant first", list(reversed(lsb))),
            ("by bit index, least significant first", lsb)]


def _build(bdd, netlist, var, prefix, deadline, limit, out: dict) -> None:
    true = _Node(bdd, bdd.true)
    value = {CONST0: _Node(bdd, bdd.false), CONST1: true, **var}
    last_use: dict[str, int] = {}
    gates = netlist.ordered_gates
    keep = set(netlist.output_bits)
    for k, g in enumerate(gates):
        for i in g.inputs:
            last_use[i] = k
    for k, g in enumerate(gates):
        res = OPS[g.op].evaluate([value[i] for i in g.inputs], true)
        if isinstance(res, int):  # a constant op evaluates to a plain 0 or the mask
            res = true if res else _Node(bdd, bdd.false)
        value[g.output] = res
        for i in set(g.inputs):
            if last_use.get(i) == k and i not in keep and i not in var:
                value.pop(i, None)  # drop BDDs nobody reads any more, so CUDD can free them
        if k % _CHECK_EVERY == 0:
            if time.process_time() > deadline:
                raise _Limit("time")
            if len(bdd) > limit:
                raise _Limit("nodes")
    for b in netlist.output_bits:
        out[prefix + b] = value[b]


def run(design, spec, options: Options) -> EngineOutcome:
    started_wall, started = time.perf_counter(), time.process_time()
    deadline = started + options.timeout
    reference = spec.reference()
    tried = []
    for name, order in orders(design, spec):
        bdd, package = _manager()
        try:
            bdd.configure(reordering=False, max_memory=MAX_MEMORY)
        except Exception:  # pragma: no cover - autoref has no memory option
            bdd.configure(reordering=False)
        names = [f"v{k}" for k in range(len(order))]
        bdd.declare(*names)
        var = {b: _Node(bdd, bdd.var(n)) for b, n in zip(order, names)}
        built: dict = {}
        try:
            _build(bdd, design, var, "d:", deadline, MAX_NODES, built)
            _build(bdd, reference, var, "r:", deadline, MAX_NODES, built)
        except (_Limit, RuntimeError, MemoryError) as stop:
            why = stop.why if isinstance(stop, _Limit) else "memory"
            tried.append(f"{name}: " + {"time": "CPU-time limit", "nodes": "node limit",
                                        "memory": "memory limit"}[why])
            del built, var
            if why == "time":
                break
            continue
        details = {"package": package, "order": name, "nodes": len(bdd), "time": "cpu",
                   "cpu_seconds": round(time.process_time() - started, 6)}
        for b in design.output_bits:
            diff = bdd.apply("xor", built["d:" + b].f, built["r:" + b].f)
            if diff != bdd.false:
                pick = bdd.pick(diff)
                at = {bit: int(pick.get(n, False)) for bit, n in zip(order, names)}
                inputs = {p.name: sum(at.get(x, 0) << i for i, x in enumerate(p.bits))
                          for p in design.inputs}
                cex = confirmed("bdd", design, spec, inputs)
                return EngineOutcome("bdd", "fail", time.perf_counter() - started_wall,
                                     f"output bit {b}: the design's BDD differs from the spec's "
                                     f"({name} order); the difference gives this input",
                                     counterexample=cex, details=details)
        return EngineOutcome("bdd", "pass", time.perf_counter() - started_wall,
                             f"every output bit's BDD equals the spec's ({len(bdd):,} live nodes, "
                             f"{name} order, {package})", details=details)
    return EngineOutcome("bdd", "undecided", time.perf_counter() - started_wall,
                         "no BDD finished within the limits (" + "; ".join(tried) + ")",
                         details={"package": "dd", "tried": tried, "time": "cpu",
                                  "node_limit": MAX_NODES})
