"""Names, widths and signedness against the design: the checked, annotated syntax tree.

The resolver gives every node its Verilog self-determined width and an exact integer interval
``[lo, hi]`` (signedness is carried by the interval: a node may be negative exactly when lo < 0).
Widths are bounded here, before any translation does work: a value over :data:`MAX_BITS`, a
product over :data:`MAX_PRODUCT_BITS`, a replication or a shift too wide is refused with its
place in the text.
"""

from __future__ import annotations

import dataclasses
from typing import Sequence

from verify.errors import SpecError
from verify.model.netlist import Netlist
from verify.spec.evaluate import fold
from verify.spec.syntax import (MAX_BITS, MAX_DEPTH, MAX_PRODUCT_BITS, UNSIZED_WIDTH, Binary, Cast,
                                Concat, Equation, Index, Name, Node, Number, Repeat, Slice, Target,
                                Ternary, Unary, error, location, too_deep)
from verify.spec.walk import Visitor


# ==== interval helpers =======================================================================

def _sbits(x: int) -> int:
    """Bits that hold x in two's complement (at least 1)."""
    return (x.bit_length() if x >= 0 else (~x).bit_length()) + 1


def signed_width(lo: int, hi: int) -> int:
    """The fewest bits whose two's complement holds every value in [lo, hi]."""
    return max(_sbits(lo), _sbits(hi))


def _bitwise_interval(op: str, a: Node, b: Node) -> tuple[int, int]:
    if op == "&":
        if a.lo >= 0 and b.lo >= 0:
            return 0, min(a.hi, b.hi)
        if a.lo >= 0:
            return 0, a.hi
        if b.lo >= 0:
            return 0, b.hi
    elif a.lo >= 0 and b.lo >= 0:  # | ^ of non-negative values
        top = (1 << max(a.hi.bit_length(), b.hi.bit_length())) - 1
        return (max(a.lo, b.lo) if op == "|" else 0), top
    s = max(signed_width(a.lo, a.hi), signed_width(b.lo, b.hi))
    return -(1 << (s - 1)), (1 << (s - 1)) - 1


def bit_text(port: str, bit: int, width: int) -> str:
    return port if width == 1 else f"{port}[{bit}]"


def ranges_text(port: str, width: int, bits: Sequence[int]) -> list[str]:
    """['sum[3:2]', 'sum[0]'] for bits 0, 2, 3 of sum; ['cout'] for a whole port."""
    if not bits:
        return []
    if len(bits) == width:
        return [port]
    runs: list[tuple[int, int]] = []
    for b in sorted(bits):
        if runs and runs[-1][1] == b - 1:
            runs[-1] = (runs[-1][0], b)
        else:
            runs.append((b, b))
    return [f"{port}[{hi}]" if lo == hi else f"{port}[{hi}:{lo}]" for lo, hi in reversed(runs)]


def _wide(node_pos: int, text: str, what: str, need: int, limit: int) -> SpecError:
    return error(text, node_pos, f"{what} could need {need:,} bits; the limit is {limit:,}")


# ==== resolver ===============================================================================

class Resolver(Visitor):
    """Checks a parsed spec against the design and annotates every node."""

    def __init__(self, text: str, design: Netlist):
        self.text = text
        self.design = design
        self.inputs = {p.name: p.width for p in design.inputs}
        self.outputs = {p.name: p.width for p in design.outputs}
        self.defined: dict[str, dict[int, int]] = {p: {} for p in self.outputs}  # bit -> pos
        self.used: set[str] = set()
        self.depth = 0

    def error(self, pos: int, message: str) -> SpecError:
        return error(self.text, pos, message)

    def ports_text(self) -> str:
        return (f"inputs: {', '.join(self.inputs) or 'none'}; "
                f"outputs: {', '.join(self.outputs) or 'none'}")

    def unknown(self, pos: int, name: str) -> SpecError:
        return self.error(pos, f"'{name}' is not a port of {self.design.name} "
                               f"({self.ports_text()})")

    # ---- equations
    def equation(self, eq: Equation) -> Equation:
        targets = tuple(self.target(t) for t in eq.targets)
        rhs = self.visit(eq.rhs)  # before the bits count as defined: no output stands for itself
        for t in targets:
            for bit in range(t.lsb, t.msb + 1):
                first = self.defined[t.port].get(bit)
                if first is not None:
                    raise self.error(t.pos, f"{bit_text(t.port, bit, self.outputs[t.port])} is "
                                            f"defined twice (first at {location(self.text, first)})")
                self.defined[t.port][bit] = t.pos
        return dataclasses.replace(eq, targets=targets, rhs=rhs)

    def target(self, t: Target) -> Target:
        if t.port in self.inputs:
            raise self.error(t.pos, f"'{t.port}' is an input of {self.design.name}; the left side "
                                    f"names outputs ({', '.join(self.outputs)})")
        if t.port not in self.outputs:
            raise self.unknown(t.pos, t.port)
        w = self.outputs[t.port]
        if t.msb_expr is None:
            return dataclasses.replace(t, msb=w - 1, lsb=0)
        msb = self.constant(t.msb_expr, "a bit index on the left side")
        lsb = msb if t.lsb_expr is None else self.constant(t.lsb_expr, "a bit index on the left side")
        self.check_select(t.pos, t.port, w, msb, lsb)
        return dataclasses.replace(t, msb=msb, lsb=lsb)

    def check_select(self, pos: int, port: str, w: int, msb: int, lsb: int) -> None:
        sel = f"{port}[{msb}]" if msb == lsb else f"{port}[{msb}:{lsb}]"
        if msb < lsb:
            raise self.error(pos, f"{sel}: write a part-select high bit first ({port}[{lsb}:{msb}])")
        if lsb < 0:
            raise self.error(pos, f"{sel}: a bit index cannot be negative")
        if msb >= w:
            whole = port if w == 1 else f"{port}[{w - 1}:0]"
            raise self.error(pos, f"{sel} selects bits outside {whole} ({w} bit{'s' if w > 1 else ''})")

    def constant(self, node: Node, what: str) -> int:
        r = self.visit(node)
        if not r.const:
            raise self.error(node.pos, f"{what} must be a constant")
        return r.lo

    def finish(self) -> None:
        missing = []
        for port, w in self.outputs.items():
            bits = [b for b in range(w) if b not in self.defined[port]]
            missing += ranges_text(port, w, bits)
        if missing:
            raise SpecError(f"the spec leaves outputs undefined: {', '.join(missing)} (every "
                            f"output bit of {self.design.name} needs exactly one equation)",
                            where="spec")

    # ---- expressions
    def node(self, node: Node):
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise too_deep(self.text, node.pos)
        r = yield from getattr(self, "visit_" + type(node).__name__)(node)
        self.depth -= 1
        if r.const and not isinstance(r, Number):
            value = fold(r)
            r = dataclasses.replace(r, lo=value, hi=value)
        need = signed_width(r.lo, r.hi)
        if need > MAX_BITS:
            raise _wide(node.pos, self.text, "this value", need, MAX_BITS)
        return r

    def _set(self, node: Node, width: int, lo: int, hi: int, const: bool, **changes) -> Node:
        return dataclasses.replace(node, width=width, lo=lo, hi=hi, const=const, **changes)

    def visit_Number(self, n: Number):
        return self._set(n, n.size or UNSIZED_WIDTH, n.value, n.value, True)
        yield  # pragma: no cover - a generator like every visit method here

    def visit_Name(self, n: Name):
        if n.name in self.inputs:
            w = self.inputs[n.name]
            self.used.add(n.name)
            return self._set(n, w, 0, (1 << w) - 1, False)
        if n.name in self.outputs:
            w = self.outputs[n.name]
            undefined = [b for b in range(w) if b not in self.defined[n.name]]
            if undefined:
                bits = ", ".join(ranges_text(n.name, w, undefined))
                raise self.error(n.pos, f"output '{n.name}' is used before it is defined ({bits} "
                                        "not defined by an earlier equation)")
            return self._set(n, w, 0, (1 << w) - 1, False, is_output=True)
        raise self.unknown(n.pos, n.name)
        yield  # pragma: no cover

    def visit_Unary(self, n: Unary):
        a = yield n.arg
        op = n.op
        if op == "+":
            lo, hi, w = a.lo, a.hi, a.width
        elif op == "-":
            lo, hi, w = -a.hi, -a.lo, a.width
        elif op == "~":
            lo, hi, w = -a.hi - 1, -a.lo - 1, a.width
        else:  # ! and the reductions
            lo, hi, w = 0, 1, 1
        return self._set(n, w, lo, hi, a.const, arg=a)

    def visit_Binary(self, n: Binary):
        a = yield n.left
        b = yield n.right
        op, w = n.op, max(a.width, b.width)
        if op == "+":
            lo, hi = a.lo + b.lo, a.hi + b.hi
        elif op == "-":
            lo, hi = a.lo - b.hi, a.hi - b.lo
        elif op == "*":
            need = signed_width(a.lo, a.hi) + signed_width(b.lo, b.hi)
            if need > MAX_PRODUCT_BITS and not (a.lo == a.hi == 0 or b.lo == b.hi == 0):
                raise _wide(n.pos, self.text, "this product", need, MAX_PRODUCT_BITS)
            corners = (a.lo * b.lo, a.lo * b.hi, a.hi * b.lo, a.hi * b.hi)
            lo, hi = min(corners), max(corners)
        elif op in ("&", "|", "^"):
            lo, hi = _bitwise_interval(op, a, b)
        elif op == "~^":
            xlo, xhi = _bitwise_interval("^", a, b)
            lo, hi = -xhi - 1, -xlo - 1
        elif op in ("<<", "<<<", ">>", ">>>"):
            if b.lo < 0:
                raise self.error(b.pos, f"the shift amount may be negative (it ranges over "
                                        f"[{b.lo}, {b.hi}]); wrap it in $unsigned(...)")
            w = a.width
            if op in ("<<", "<<<"):
                if (a.lo, a.hi) != (0, 0) and signed_width(a.lo, a.hi) + b.hi > MAX_BITS:
                    raise self.error(n.pos, f"a shift by up to {b.hi:,} would need more than "
                                            f"{MAX_BITS:,} bits")
                corners = [x << s for x in (a.lo, a.hi) for s in (b.lo, b.hi)]
            else:
                cap = signed_width(a.lo, a.hi)  # shifting further only repeats the sign
                corners = [x >> min(s, cap) for x in (a.lo, a.hi) for s in (b.lo, b.hi)]
            lo, hi = min(corners), max(corners)
        else:  # comparisons and logical
            lo, hi, w = 0, 1, 1
        return self._set(n, w, lo, hi, a.const and b.const, left=a, right=b)

    def visit_Ternary(self, n: Ternary):
        c = yield n.cond
        t = yield n.then
        o = yield n.other
        if c.const:  # only the branch taken matters
            pick = t if c.lo else o
            return self._set(n, max(t.width, o.width), pick.lo, pick.hi,
                             pick.const, cond=c, then=t, other=o)
        return self._set(n, max(t.width, o.width), min(t.lo, o.lo), max(t.hi, o.hi),
                         False, cond=c, then=t, other=o)

    def visit_Concat(self, n: Concat):
        parts = []
        for p in n.parts:
            parts.append((yield p))
        w = sum(p.width for p in parts)
        if w > MAX_BITS:
            raise _wide(n.pos, self.text, "this concatenation", w, MAX_BITS)
        return self._set(n, w, 0, (1 << w) - 1, all(p.const for p in parts), parts=tuple(parts))

    def visit_Repeat(self, n: Repeat):
        count = yield n.count
        if not count.const:
            raise self.error(n.count.pos, "a replication count must be a constant")
        if count.lo < 1:
            raise self.error(n.count.pos, f"a replication count must be positive, got {count.lo}")
        parts = []
        for p in n.parts:
            parts.append((yield p))
        w = count.lo * sum(p.width for p in parts)
        if w > MAX_BITS:
            raise self.error(n.pos, f"this replication is {w:,} bits wide; the limit is {MAX_BITS:,}")
        return self._set(n, w, 0, (1 << w) - 1, all(p.const for p in parts),
                         count=count, parts=tuple(parts), times=count.lo)

    def visit_Index(self, n: Index):
        base = yield n.base
        idx = yield n.index
        at = None
        if idx.const:
            at = idx.lo
            if isinstance(base, Name):
                self.check_select(n.base.pos, base.name, base.width, at, at)
            elif at < 0:
                raise self.error(n.index.pos, f"bit index {at} is negative")
        elif idx.lo < 0:
            raise self.error(n.index.pos, f"the bit index may be negative (it ranges over "
                                          f"[{idx.lo}, {idx.hi}]); wrap it in $unsigned(...)")
        return self._set(n, 1, 0, 1, base.const and idx.const, base=base, index=idx, at=at)

    def visit_Slice(self, n: Slice):
        base = yield n.base
        bounds = []
        for e in (n.msb_expr, n.lsb_expr):
            r = yield e
            if not r.const:
                raise self.error(e.pos, "a part-select bound must be a constant")
            bounds.append(r.lo)
        msb, lsb = bounds
        if isinstance(base, Name):
            self.check_select(n.base.pos, base.name, base.width, msb, lsb)
        elif msb < lsb or lsb < 0:
            raise self.error(n.pos, f"part-select [{msb}:{lsb}] must be [high:low] with low >= 0")
        w = msb - lsb + 1
        if w > MAX_BITS:
            raise _wide(n.pos, self.text, "this part-select", w, MAX_BITS)
        return self._set(n, w, 0, (1 << w) - 1, base.const, base=base, msb=msb, lsb=lsb)

    def visit_Cast(self, n: Cast):
        a = yield n.arg
        w = a.width
        if n.fn == "signed":
            lo, hi = -(1 << (w - 1)), (1 << (w - 1)) - 1
        else:
            lo, hi = 0, (1 << w) - 1
        if lo <= a.lo and a.hi <= hi:  # the value already fits: the cast leaves it unchanged
            lo, hi = a.lo, a.hi
        return self._set(n, w, lo, hi, a.const, arg=a)
