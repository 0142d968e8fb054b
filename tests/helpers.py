"""Small designs built in code for the tests (no file needed)."""

from __future__ import annotations

from verify.model.builder import GateBuilder
from verify.model.netlist import Gate, Netlist, Port


def ripple(width: int, *, cin: bool = True, name: str | None = None) -> Netlist:
    """A ripple-carry adder from full adders (xor sum, majority carry)."""
    b = GateBuilder(fold=False, share=False)
    a_bits, b_bits = Port("a", width).bits, Port("b", width).bits
    s, c = b.add(a_bits, b_bits, "cin" if cin else "0")
    inputs = [Port("a", width), Port("b", width)] + ([Port("cin", 1)] if cin else [])
    return b.netlist(name or f"ripple{width}", inputs, {"sum": s, "cout": [c]})


def rewire(netlist: Netlist, output: str, *, op: str | None = None,
           inputs: tuple[str, ...] | None = None) -> Netlist:
    """The same netlist with the gate driving ``output`` changed (a deliberate fault)."""
    gates = []
    for g in netlist.gates:
        if g.output == output:
            g = Gate(op or g.op, inputs if inputs is not None else g.inputs, g.output, g.source)
        gates.append(g)
    return Netlist(netlist.name + "_faulty", netlist.inputs, netlist.outputs, tuple(gates)).validate()


def skip_fault(width: int = 64, lo: int = 20, hi: int = 36) -> Netlist:
    """A ripple adder whose carry into bit ``hi`` is dropped only when bits lo..hi-1 all
    propagate and a carry enters bit lo: the fault a wrong skip path makes."""
    b = GateBuilder(fold=False, share=False)
    a, bb = Port("a", width).bits, Port("b", width).bits
    c, s, props, carries = "cin", [], [], []
    for i in range(width):
        p = b.xor_(a[i], bb[i])
        props.append(p)
        carries.append(c)
        if i == hi:
            every = b.and_(*props[lo:hi])
            dropped = b.and_(every, carries[lo])
            c = b.and_(c, b.not_(dropped))
        s.append(b.xor_(p, c))
        c = b.maj(a[i], bb[i], c)
    return b.netlist(f"skip_fault{width}", [Port("a", width), Port("b", width), Port("cin", 1)],
                     {"sum": s, "cout": [c]})


def array_multiplier(width: int) -> Netlist:
    """p = a * b by shift-and-add rows of ripple adders (a hard case for a solver)."""
    b = GateBuilder(fold=True, share=False)
    a_bits, b_bits = Port("a", width).bits, Port("b", width).bits
    acc = ["0"] * (2 * width)
    for j in range(width):
        row = ["0"] * j + [b.and_(x, b_bits[j]) for x in a_bits] + ["0"] * (width - j)
        acc, _ = b.add(acc, row)
    return b.netlist(f"mul{width}", [Port("a", width), Port("b", width)], {"p": acc})


#: prefix levels and node counts for n = 2^L, as tabulated in D. Harris, "A Taxonomy of Parallel
#: Prefix Networks" (2003), from memory: name -> (n, L) -> (levels, nodes)
HARRIS_2003 = {
    "serial-prefix": lambda n, L: (n - 1, n - 1),
    "sklansky": lambda n, L: (L, n // 2 * L),
    "kogge-stone": lambda n, L: (L, n * L - n + 1),
    "brent-kung": lambda n, L: (2 * L - 1, 2 * n - 2 - L),
    "han-carlson": lambda n, L: (L + 1, n // 2 * L),
}
