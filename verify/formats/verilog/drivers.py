"""Drivers and finishing: which value drives each placeholder net, and the final netlist.

Every Verilog net or variable bit gets a *placeholder* net named after it; a continuous
assignment, a port connection or the end of a combinational block *drives* the placeholder with
the net holding its value. At the end, each gate output that a placeholder names is renamed after
it, every other placeholder is replaced by its value, and the output ports are connected.
"""

from __future__ import annotations

import re

from verify.errors import InputError, NetlistError
from verify.model.builder import GateBuilder
from verify.model.netlist import Gate, Port
from verify.formats.verilog.common import _CONSTS


MAX_GATES = 500_000  # gates made while translating (before unused ones are dropped)
MAX_SIGNAL_BITS = 1 << 20  # bits in one signal
MAX_EXPRESSION_BITS = 1 << 17  # bits in one expression's value: twice the widest port
MAX_TOTAL_BITS = 1 << 23  # bits in all signals together


class _Builder(GateBuilder):
    """GateBuilder that keeps Verilog's x semantics while folding.

    Every fold GateBuilder makes is also right for an x input (x & 0 is 0, x | 1 is 1, ~~x is x,
    s ? d : d is d) except one: a ^ a is x, not 0, when a is x. Nets that carry an x (the x
    literals and every gate fed by one) are tracked, and for them that fold is not made, so that
    the check for x reaching an output sees exactly what a simulator would.
    """

    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        self.tainted: set[str] = set()

    def gate(self, op: str, *inputs: str, out: str | None = None, keep: bool = False) -> str:
        if len(self.gates) >= MAX_GATES:
            raise InputError(f"the design translates into more than {MAX_GATES:,} gates; refused "
                             f"as too large", self.source)
        tainted = self.tainted
        hit = any(i in tainted for i in inputs)
        if hit and op in ("xor", "xnor") and len(set(inputs)) < len(inputs):
            net = out if out is not None else self.fresh()
            g = Gate(op, tuple(inputs), net, self.source)
            self.gates.append(g)
            tainted.add(net)
            return net
        before = len(self.gates)
        net = super().gate(op, *inputs, out=out, keep=keep)
        if hit and len(self.gates) > before and self.gates[-1].output == net:
            tainted.add(net)
        return net



class Drivers:
    """Placeholder -> value bookkeeping and the final netlist."""

    def res(self, net: str) -> str:
        seen = 0
        alias = self.alias
        while net in alias:
            net = alias[net]
            seen += 1
            if seen > 1_000_000:  # pragma: no cover - drive() prevents cycles
                break
        return net

    def drive(self, p: str, v: str, where: str | None, block_key=None) -> None:
        """Drive placeholder ``p`` with ``v``; ``block_key``: the signal, when the driver is the end
        of a procedural block."""
        if p not in self.placeholders:
            if p in _CONSTS:
                raise self.fail("cannot assign to a supply net", where=where)
            raise self.fail(f"'{p}' is an input port of the top module and cannot be assigned",
                            where=where)
        v = self.res(v)
        if v == p:
            raise self.fail(f"combinational loop: '{p}' is assigned a value that depends only on "
                            f"itself", where=where)
        if p in self.alias:
            # a second driver: every one is recorded and the design refused at the end, in any
            # source order and whether or not the net reaches an output
            first = self.block_drives.get(p)
            self.conflicts.setdefault(p, [(self.alias_where.get(p), first)]).append(
                (where, block_key))
            return
        if block_key is not None:
            self.block_drives[p] = block_key
        self.alias[p] = v
        self.alias_where[p] = where

    def xbit(self, where: str | None, what: str = "an x or z value") -> str:
        self._xcount += 1
        n = f"$x{self._xcount}"
        self.b.tainted.add(n)
        self.xnets[n] = f"{what}"
        self.sig_where[n] = where
        return n


    # ==== finishing =====================================================================
    def multiple_drivers(self) -> InputError | None:
        """The error for nets with more than one driver, naming the first such net (in source
        order) and where each of its drivers is; None when every net has at most one."""
        conflicts = {}
        for net, drivers in self.conflicts.items():
            keys = {k for _, k in drivers}
            if None not in keys and not keys & self.outside_reads and not keys & self.port_keys:
                # only procedural blocks write it, each before reading it, and nothing reads its
                # module-level value, not even through a port (a loop index shared by several
                # blocks): no ambiguity
                continue
            conflicts[net] = [w for w, _ in drivers]
        if not conflicts:
            return None
        net, wheres = next(iter(conflicts.items()))
        listed = ", ".join(w or "?" for w in wheres)
        more = len(conflicts) - 1
        tail = f" (and {more} more net{'s' if more > 1 else ''} with several drivers)" if more else ""
        return self.fail(f"net '{net}' has more than one driver ({len(wheres)}: {listed}); a "
                         f"net must have exactly one{tail}", where=wheres[0] or self.origin)

    def finish(self, name: str, inputs: list[Port], out_ports: list[tuple[str, list[str]]]):
        err = self.multiple_drivers()
        if err is not None:
            raise err
        res = self.res
        gates = self.b.gates
        driver = {g.output: g for g in gates}
        # 1. nothing undefined may reach an output
        seen: set[str] = set()
        for pname, bits in out_ports:
            for pb in bits:
                stack = [pb]
                while stack:
                    n = stack.pop()
                    if n in seen:
                        continue
                    seen.add(n)
                    if n in self.alias:
                        stack.append(self.alias[n])
                        continue
                    if n in self.xnets:
                        raise self.fail(f"{self.xnets[n]} can reach output '{pb}'; a checkable "
                                        f"design is 0/1 everywhere", where=self.sig_where.get(n))
                    g = driver.get(n)
                    if g is not None:
                        stack.extend(g.inputs)
                    elif n in self.placeholders:
                        if n == pb:
                            raise self.fail(f"output '{pb}' is never assigned (it floats at z)",
                                            where=self.sig_where.get(n))
                        raise self.fail(f"net '{n}' is never driven (it floats at z) and reaches "
                                        f"output '{pb}'", where=self.sig_where.get(n))
        # 2. name gate outputs after the nets they drive: output ports first
        rename: dict[str, str] = {}
        order = [pb for _, bits in out_ports for pb in bits]
        order += list(self.placeholders)
        for p in order:
            v = res(p)
            if v != p and v in seen and v in driver and v not in rename and v.startswith("$"):
                rename[v] = p

        def r(n: str) -> str:
            n = res(n)
            return rename.get(n, n)

        out = GateBuilder(prefix="$", fold=False, share=False)
        for g in gates:
            if g.output not in seen:
                continue
            out.source = g.source
            out.gate(g.op, *[r(i) for i in g.inputs], out=r(g.output))
        outputs = {pname: [r(pb) for pb in bits] for pname, bits in out_ports}
        out.source = None
        try:
            return out.netlist(name, inputs, outputs, self.origin)
        except NetlistError as err:
            msg = err.message
            if msg.startswith("combinational loop"):
                m = re.search(r"\(([^;()]+?)(?: [^;()]*)?[;)]", msg)
                raise InputError(msg.replace("combinational loop", "combinational loop through "
                                             "Verilog nets", 1),
                                 m.group(1) if m else self.origin) from None
            raise


