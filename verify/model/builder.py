"""Building netlists from code: one gate per call, with optional constant folding and sharing.

Used by everything that makes gates rather than reading them: the spec's bit-level reference,
the reference architectures and the Verilog translation. Words are lists of nets, LSB first.
"""

from __future__ import annotations

from typing import Iterable, Mapping, Sequence

from verify.model.ops import OPS
from verify.model.netlist import CONST0, CONST1, Gate, Netlist, Port

Word = list[str]


class GateBuilder:
    """Accumulates gates and hands out fresh net names.

    ``fold`` simplifies gates with constant or repeated inputs (and(x, 0) is 0, xor(x, x) is 0,
    not(not x) is x, ...) and ``share`` reuses an existing gate with the same op and inputs.
    Reference architectures turn both off so that their structure is exactly the published one.
    """

    def __init__(self, prefix: str = "n", *, fold: bool = True, share: bool = True):
        self.prefix = prefix
        self.fold = fold
        self.share = share
        self.gates: list[Gate] = []
        self._ops: dict[str, Gate] = {}
        self._seen: dict[tuple[str, tuple[str, ...]], str] = {}
        self._count = 0
        self.source: str | None = None  # attached to every gate made while set

    # ---- single gates --------------------------------------------------------------------
    def fresh(self) -> str:
        self._count += 1
        return f"{self.prefix}{self._count}"

    def gate(self, op: str, *inputs: str, out: str | None = None, keep: bool = False) -> str:
        """Add a gate (or fold it away) and return the net holding its value.

        ``keep``: add it as written, neither folded nor shared (a library cell's output buffer,
        which must stay one gate so that the cell keeps its place in the netlist)."""
        inputs = tuple(inputs)
        if self.fold and out is None and not keep:
            folded = self._fold(op, inputs)
            if folded is not None:
                return folded
        key = (op, tuple(sorted(inputs)) if op in _SYMMETRIC else inputs)
        shared = self.share and not keep
        if shared and out is None and key in self._seen:
            return self._seen[key]
        net = out if out is not None else self.fresh()
        g = Gate(op, inputs, net, self.source)
        self.gates.append(g)
        self._ops[net] = g
        if shared:
            self._seen.setdefault(key, net)
        return net

    def not_(self, a: str) -> str:
        return self.gate("not", a)

    def and_(self, *xs: str) -> str:
        return self._nary("and", xs)

    def or_(self, *xs: str) -> str:
        return self._nary("or", xs)

    def xor_(self, *xs: str) -> str:
        return self._nary("xor", xs)

    def mux(self, sel: str, d0: str, d1: str) -> str:
        """d1 when sel is 1, else d0."""
        return self.gate("mux", sel, d0, d1)

    def maj(self, a: str, b: str, c: str) -> str:
        return self.gate("maj", a, b, c)

    def _nary(self, op: str, xs: Sequence[str]) -> str:
        xs = list(xs)
        if not xs:
            return {"and": CONST1, "or": CONST0, "xor": CONST0}[op]
        if len(xs) == 1:
            return xs[0]
        if self.fold:  # keep it two-input so that folding and sharing can see every pair
            acc = xs[0]
            for x in xs[1:]:
                acc = self.gate(op, acc, x)
            return acc
        return self.gate(op, *xs)

    def _fold(self, op: str, ins: tuple[str, ...]) -> str | None:
        consts = {CONST0, CONST1}
        if op == "buf":
            return ins[0]
        if op == "not":
            a = ins[0]
            if a in consts:
                return CONST1 if a == CONST0 else CONST0
            g = self._ops.get(a)
            if g is not None and g.op == "not":
                return g.inputs[0]
            return None
        if all(i in consts for i in ins):  # every input known: the table gives the value
            return CONST1 if OPS[op].bit([int(i == CONST1) for i in ins]) else CONST0
        if op in ("and", "or", "xor") and len(ins) == 2:
            a, b = ins
            if op == "and":
                if CONST0 in ins:
                    return CONST0
                if a == CONST1:
                    return b
                if b == CONST1 or a == b:
                    return a
            elif op == "or":
                if CONST1 in ins:
                    return CONST1
                if a == CONST0:
                    return b
                if b == CONST0 or a == b:
                    return a
            else:
                if a == b:
                    return CONST0
                if a == CONST0:
                    return b
                if b == CONST0:
                    return a
                if a == CONST1:
                    return self.not_(b)
                if b == CONST1:
                    return self.not_(a)
            return None
        if op == "mux":
            s, d0, d1 = ins
            if s == CONST0 or d0 == d1:
                return d0
            if s == CONST1:
                return d1
            if d0 == CONST0 and d1 == CONST1:
                return s
            if d0 == CONST0:
                return self.and_(s, d1)
            if d1 == CONST1:
                return self.or_(s, d0)
            return None
        if op == "maj":
            a, b, c = ins
            for x, y, z in ((a, b, c), (b, c, a), (c, a, b)):
                if x == CONST0:
                    return self.and_(y, z)
                if x == CONST1:
                    return self.or_(y, z)
                if y == z:
                    return y
            return None
        return None

    # ---- words ---------------------------------------------------------------------------
    def full_add(self, a: str, b: str, c: str) -> tuple[str, str]:
        """(sum, carry) of three bits."""
        return self.xor_(self.xor_(a, b), c), self.maj(a, b, c)

    def add(self, a: Word, b: Word, cin: str = CONST0) -> tuple[Word, str]:
        """Ripple addition of two equal-width words: (sum bits, carry out)."""
        assert len(a) == len(b)
        out: Word = []
        c = cin
        for x, y in zip(a, b):
            s, c = self.full_add(x, y, c)
            out.append(s)
        return out, c

    # ---- finishing -----------------------------------------------------------------------
    def netlist(self, name: str, inputs: Iterable[Port], outputs: Mapping[str, Word],
                origin: str | None = None, *, prune: bool = True) -> Netlist:
        """Turn the gates made so far into a validated Netlist.

        ``outputs`` maps each output port name to its bits (LSB first). Where an output bit's value
        is the output of a gate used for nothing else, that gate drives the port bit directly;
        otherwise (an input, a constant, a net shared by two output bits) a buf connects it.
        """
        ports = [Port(n, len(bits)) for n, bits in outputs.items()]
        want: dict[str, str] = {}  # port bit -> net with its value
        for p in ports:
            for pb, net in zip(p.bits, outputs[p.name]):
                want[pb] = net
        uses: dict[str, int] = {}
        for net in want.values():
            uses[net] = uses.get(net, 0) + 1
        rename: dict[str, str] = {}
        extra: list[Gate] = []
        for pb, net in want.items():
            if net == pb:
                continue
            if net in self._ops and uses[net] == 1 and net not in rename and net not in want:
                rename[net] = pb
            elif net == CONST0 or net == CONST1:
                extra.append(Gate("const1" if net == CONST1 else "const0", (), pb, self.source))
            else:
                extra.append(Gate("buf", (net,), pb, self.source))
        def r(n: str) -> str:
            return rename.get(n, n)
        kept = _live(self.gates, want.values()) if prune else self.gates
        gates = [Gate(g.op, tuple(r(i) for i in g.inputs), r(g.output), g.source) for g in kept]
        extra = [Gate(g.op, tuple(r(i) for i in g.inputs), g.output, g.source) for g in extra]
        return Netlist(name, tuple(inputs), tuple(ports), tuple(gates + extra), origin).validate()


def _live(gates: list[Gate], roots: Iterable[str]) -> list[Gate]:
    """The gates in the fan-in of ``roots``, in their original order."""
    driver = {g.output: g for g in gates}
    live: set[str] = set()
    stack = [n for n in roots if n in driver]
    while stack:
        n = stack.pop()
        if n in live:
            continue
        live.add(n)
        stack.extend(i for i in driver[n].inputs if i in driver and i not in live)
    return [g for g in gates if g.output in live]


_SYMMETRIC = {"and", "or", "xor", "nand", "nor", "xnor", "maj"}

