"""Translation 2: the spec as gates (the reference netlist), through GateBuilder.

Word-level operations go through the module-level functions below (add, subtract, less_than,
equal, shift_left, shift_right, multiply), so that one place decides how a word operation
becomes gates. Words are lists of nets, LSB first, of equal width where two are given.
"""

from __future__ import annotations

import types
from typing import Callable, Mapping, NamedTuple, Sequence

from verify.errors import SpecError
from verify.model import words
from verify.model.builder import GateBuilder
from verify.model.netlist import CONST0, CONST1
from verify.spec.resolve import signed_width
from verify.spec.syntax import (MAX_PRODUCT_GATES, MAX_REFERENCE_GATES, MAX_SHIFT_GATES, Binary,
                                Cast, Concat, Index, Name, Node, Number, Repeat, Slice, Ternary,
                                Unary, location)
from verify.spec.walk import Visitor

Word = list[str]
_CONSTS = (CONST0, CONST1)


# ==== word operations: the one place a word operation becomes gates ==========================

def add(b: GateBuilder, x: Word, y: Word, cin: str = CONST0) -> tuple[Word, str]:
    """x + y + cin over equal-width words: (the low len(x) bits, the carry out)."""
    return words.add(b, x, y, cin)


def subtract(b: GateBuilder, x: Word, y: Word) -> tuple[Word, str]:
    """x - y over equal-width words, as x + ~y + 1: (the low len(x) bits, the carry out, which
    is 1 exactly when unsigned x >= y)."""
    return words.subtract(b, x, y)


def less_than(b: GateBuilder, x: Word, y: Word, signed: bool) -> str:
    """1 when x < y, both words of equal width, read as two's complement when ``signed``
    (else unsigned)."""
    return words.compare(b, "<", x, y, signed)


def equal(b: GateBuilder, x: Word, y: Word) -> str:
    """1 when the equal-width words x and y are the same."""
    return words.equal(b, x, y)


def shift_left(b: GateBuilder, x: Word, s: Word, n: int) -> Word:
    """The low n bits of x << s (x extended with zeros above), s unsigned; a barrel shifter."""
    return words.shift(b, list(x[:n]) + [CONST0] * (n - len(x)), s, left=True)


def shift_right(b: GateBuilder, x: Word, s: Word, fill: str = CONST0) -> Word:
    """x >> s at len(x) bits, s unsigned; vacated bits take ``fill`` (CONST0 for a logical
    shift, the sign bit for an arithmetic one)."""
    return words.shift(b, x, s, left=False, fill=fill)


def multiply(b: GateBuilder, x: Word, y: Word, n: int) -> Word:
    """The low n bits of x * y (the low n bits of a product are the same read signed or
    unsigned)."""
    return words.multiply(b, list(x[:n]) + [CONST0] * (n - len(x)), y)


# ==== values ================================================================================

class Bits(NamedTuple):
    """An exact integer as nets: value = sum(bits[i] * 2^i) - ext * 2^len(bits).

    Bit i of the infinite two's complement is bits[i] below len(bits) and ext above.
    """

    bits: tuple[str, ...]
    ext: str = CONST0

    def bit(self, i: int) -> str:
        return self.bits[i] if i < len(self.bits) else self.ext

    def low(self, n: int) -> list[str]:
        if n <= len(self.bits):
            return list(self.bits[:n])
        return list(self.bits) + [self.ext] * (n - len(self.bits))


def const_bits(v: int) -> Bits:
    n = v.bit_length() if v >= 0 else signed_width(v, v) - 1
    return Bits(tuple(CONST1 if v >> i & 1 else CONST0 for i in range(n)),
                CONST1 if v < 0 else CONST0)


def _from_low(low: Sequence[str]) -> Bits:
    """Bits from the low N bits of a value known (by its node's interval) to fit N signed bits."""
    return Bits(tuple(low[:-1]), low[-1])


def _trim(v: Bits, node: Node) -> Bits:
    """The same value in as few bits as node's interval allows (the interval is exact)."""
    if node.lo >= 0:
        return Bits(tuple(v.low(node.hi.bit_length())), CONST0)
    return _from_low(v.low(signed_width(node.lo, node.hi)))


# ==== the translation ========================================================================

class GateCompiler(Visitor):
    """Each node becomes a Bits value, trimmed to the width its interval needs."""

    def __init__(self, b: GateBuilder, env: Mapping[str, Bits], text: str = ""):
        self.b = b
        self.env = env
        self.text = text  # for error locations
        self.budget = MAX_REFERENCE_GATES  # gates still allowed, charged before each word op

    def spend(self, n: Node, gates: int, what: str) -> None:
        """Charge an operation's gate count before making it: refuse once over the budget."""
        self.budget -= gates
        if self.budget < 0:
            raise self.refuse(n, f"{what}; as gates the spec would take over "
                                 f"{MAX_REFERENCE_GATES:,} gates")

    def refuse(self, n: Node, message: str) -> SpecError:
        return SpecError(f"{location(self.text, n.pos)}: {message}", where="spec")

    def node(self, n: Node):
        if n.const:
            return const_bits(n.lo)
        return self._trimmed(n)

    def _trimmed(self, n: Node):
        r = getattr(self, "visit_" + type(n).__name__)(n)
        if isinstance(r, types.GeneratorType):
            r = yield from r
        return _trim(r, n)

    def any_(self, v: Bits) -> str:
        return self.b.or_(*v.bits, v.ext)

    def less(self, a: Node, b: Node):
        """1 when a < b (exact integers)."""
        if a.hi < b.lo:
            return CONST1
        if a.lo >= b.hi:
            return CONST0
        n = signed_width(a.lo - b.hi, a.hi - b.lo) - 1  # both fit n + 1 signed bits
        n = max(n, signed_width(a.lo, a.hi), signed_width(b.lo, b.hi))
        x = yield a
        y = yield b
        self.spend(a, 4 * n, f"this comparison is {n:,} bits wide")
        return less_than(self.b, x.low(n), y.low(n), signed=True)

    def add_chain(self, n: Binary, size: int):
        """Low ``size`` bits of a chain of additions, one ripple per term; a 0/1 term (a carry-in)
        rides in as the carry of the first ripple. Modulo 2^size the partial sums may wrap: the
        final low bits are still exact."""
        terms: list[Node] = []
        todo: list[Node] = [n]
        while todo:  # left to right, without recursion
            node = todo.pop()
            if isinstance(node, Binary) and node.op == "+" and not node.const:
                todo += [node.right, node.left]
            else:
                terms.append(node)
        at = next((k for k, t in enumerate(terms) if t.lo >= 0 and t.hi <= 1 and not t.const), None)
        cin = CONST0
        if at is not None:
            carry = terms.pop(at)
            cin = (yield carry).bit(0)
        self.spend(n, 3 * size * max(len(terms) - 1, 1), f"this sum is {size:,} bits wide")
        acc = (yield terms[0]).low(size)
        for t in terms[1:] or [None]:
            addend = (yield t).low(size) if t is not None else [CONST0] * size
            acc, _ = add(self.b, acc, addend, cin)
            cin = CONST0
        return acc

    def bitwise(self, op: Callable[..., str], a: Bits, b: Bits) -> Bits:
        n = max(len(a.bits), len(b.bits))
        return Bits(tuple(op(x, y) for x, y in zip(a.low(n), b.low(n))), op(a.ext, b.ext))

    # ---- node kinds
    def visit_Number(self, n: Number) -> Bits:  # pragma: no cover - constants return early
        return const_bits(n.value)

    def visit_Name(self, n: Name) -> Bits:
        return self.env[n.name]

    def visit_Unary(self, n: Unary):
        a, op, b = (yield n.arg), n.op, self.b
        if op == "+":
            return a
        if op == "-":  # 0 - a, as ~a + 1
            size = signed_width(n.lo, n.hi)
            self.spend(n, 4 * size, f"this negation is {size:,} bits wide")
            return _from_low(subtract(b, [CONST0] * size, a.low(size))[0])
        if op == "~":
            return Bits(tuple(b.not_(x) for x in a.bits), b.not_(a.ext))
        if op == "!":
            return Bits((b.not_(self.any_(a)),))
        low = a.low(n.arg.width)
        red = {"&": b.and_, "~&": b.and_, "|": b.or_, "~|": b.or_, "^": b.xor_, "~^": b.xor_}[op]
        r = red(*low)
        return Bits((b.not_(r) if op.startswith("~") else r,))

    def visit_Binary(self, n: Binary):
        op, b = n.op, self.b
        if op in ("<", ">", "<=", ">="):
            x, y = (n.left, n.right) if op in ("<", ">=") else (n.right, n.left)
            lt = yield from self.less(x, y)
            return Bits((lt if op in ("<", ">") else b.not_(lt),))
        if op in ("&&", "||"):
            x, y = self.any_((yield n.left)), self.any_((yield n.right))
            return Bits((b.and_(x, y) if op == "&&" else b.or_(x, y),))
        size = signed_width(n.lo, n.hi)
        if op == "+":
            return _from_low((yield from self.add_chain(n, size)))
        x = yield n.left
        y = yield n.right
        if op == "-":
            self.spend(n, 4 * size, f"this difference is {size:,} bits wide")
            return _from_low(subtract(b, x.low(size), y.low(size))[0])
        if op == "*":
            xs, ys = x.low(size), y.low(size)
            cost = sum(v not in _CONSTS for v in xs) * sum(v not in _CONSTS for v in ys)
            if cost > MAX_PRODUCT_GATES:
                raise self.refuse(n, f"this product is {size} bits wide; as gates it would take "
                                     f"over {MAX_PRODUCT_GATES:,} and-gates")
            self.spend(n, 5 * cost, f"this product is {size} bits wide")
            return _from_low(multiply(b, xs, ys, size))
        if op in ("==", "!="):
            m = max(len(x.bits), len(y.bits)) + 1
            same = equal(b, x.low(m), y.low(m))
            return Bits((same if op == "==" else b.not_(same),))
        if op == "&":
            return self.bitwise(b.and_, x, y)
        if op == "|":
            return self.bitwise(b.or_, x, y)
        if op == "^":
            return self.bitwise(b.xor_, x, y)
        if op == "~^":
            return self.bitwise(lambda p, q: b.not_(b.xor_(p, q)), x, y)
        if op in ("<<", "<<<"):
            if n.right.const:
                return Bits((CONST0,) * n.right.lo + x.bits, x.ext)
            if size * len(y.bits) > MAX_SHIFT_GATES:
                raise self.refuse(n, f"this shift is {size:,} bits wide by a {len(y.bits)}-bit "
                                     f"amount; as gates it would take over "
                                     f"{MAX_SHIFT_GATES:,} multiplexers")
            self.spend(n, size * len(y.bits), f"this shift is {size:,} bits wide")
            return _from_low(shift_left(b, x.low(size), list(y.bits), size))
        if op in (">>", ">>>"):
            if n.right.const:
                return Bits(x.bits[n.right.lo:], x.ext)
            if len(x.bits) * len(y.bits) > MAX_SHIFT_GATES:
                raise self.refuse(n, f"this shift is {len(x.bits):,} bits wide by a "
                                     f"{len(y.bits)}-bit amount; as gates it would take over "
                                     f"{MAX_SHIFT_GATES:,} multiplexers")
            self.spend(n, len(x.bits) * len(y.bits), f"this shift is {len(x.bits):,} bits wide")
            return Bits(tuple(shift_right(b, list(x.bits), list(y.bits), x.ext)), x.ext)
        raise AssertionError(op)  # pragma: no cover

    def visit_Ternary(self, n: Ternary):
        if n.cond.const:
            return (yield (n.then if n.cond.lo else n.other))
        c = self.any_((yield n.cond))
        t = yield n.then
        o = yield n.other
        size = signed_width(n.lo, n.hi)
        self.spend(n, size, f"this choice is {size:,} bits wide")
        return _from_low([self.b.mux(c, q, p) for p, q in zip(t.low(size), o.low(size))])

    def concat(self, parts: Sequence[Node]):
        out: list[str] = []
        for p in reversed(parts):
            out += (yield p).low(p.width)
        return out

    def visit_Concat(self, n: Concat):
        return Bits(tuple((yield from self.concat(n.parts))))

    def visit_Repeat(self, n: Repeat):
        return Bits(tuple((yield from self.concat(n.parts)) * n.times))

    def visit_Index(self, n: Index):
        base = yield n.base
        if n.at is not None:
            return Bits((base.bit(n.at),))
        idx = yield n.index
        if len(base.bits) * len(idx.bits) > MAX_SHIFT_GATES:
            raise self.refuse(n, f"this bit select over {len(base.bits):,} bits would take over "
                                 f"{MAX_SHIFT_GATES:,} multiplexers")
        self.spend(n, len(base.bits) * len(idx.bits), "this bit select")
        return Bits((shift_right(self.b, list(base.bits), list(idx.bits), base.ext)[0]
                     if base.bits else base.ext,))

    def visit_Slice(self, n: Slice):
        base = yield n.base
        return Bits(tuple(base.bit(i) for i in range(n.lsb, n.msb + 1)))

    def visit_Cast(self, n: Cast):
        low = (yield n.arg).low(n.arg.width)
        return _from_low(low) if n.fn == "signed" else Bits(tuple(low))
