"""Translation 3: z3 word-level bit-vector terms.

Every node becomes a z3 BitVec read as signed, exactly ``signed_width(lo, hi)`` bits wide.

Subtraction and negation are written as addition of the complement plus one (``x + ~y + 1``,
``~x + 1``), never as z3's ``bvsub``/``bvneg``: z3 rewrites those into a multiplication by -1,
and proving such a term against a real adder-subtractor took 40-60 s at 32 bits where the
complement form takes well under a second. The function is bit-for-bit the same.
A product of a constant left shift, ``(x << k) * y``, is computed as ``(x * y) << k``, so known
zero low bits never reach z3's multiplier.
"""

from __future__ import annotations

import operator
import types
from functools import reduce
from typing import Any, Mapping, Sequence

from verify.spec.resolve import signed_width
from verify.spec.syntax import (Binary, Cast, Concat, Index, Name, Node, Number, Repeat, Slice,
                                Ternary, Unary)
from verify.spec.walk import Visitor

_COMPARE = {"<": operator.lt, "<=": operator.le, ">": operator.gt, ">=": operator.ge,
            "==": operator.eq, "!=": operator.ne}
_WORD = {"+": operator.add, "&": operator.and_, "|": operator.or_, "^": operator.xor}


def _shifted(node: Node) -> tuple[Node, int]:
    """(core, k) with node == core * 2^k exactly: k sums the constant left shifts on top
    (no bits are lost: the spec's arithmetic is unbounded)."""
    k = 0
    while (isinstance(node, Binary) and node.op in ("<<", "<<<") and node.right.const
           and not node.const):
        k += node.right.lo
        node = node.left
    return node, k


class Z3Compiler(Visitor):
    """Each node becomes a z3 BitVec read as signed, exactly signed_width(lo, hi) bits wide."""

    def __init__(self, env: Mapping[str, Any]):
        import z3
        self.z3 = z3
        self.env = env  # port -> unsigned BitVec at the port width

    def fit(self, x, n: int):
        """The low n bits of x's value (sign-extending a narrower x)."""
        z3, w = self.z3, x.size()
        if w == n:
            return x
        if w < n:
            return z3.SignExt(n - w, x)
        return z3.Extract(n - 1, 0, x)

    def flag(self, cond):
        z3 = self.z3
        return z3.If(cond, z3.BitVecVal(1, 2), z3.BitVecVal(0, 2))

    def unsigned(self, x):
        return self.z3.ZeroExt(1, x)

    def minus(self, x, y):
        """x - y at x's width, as x + ~y + 1 (see the module note)."""
        return x + ~y + self.z3.BitVecVal(1, x.size())

    def node(self, node: Node):
        size = signed_width(node.lo, node.hi)
        if node.const:
            return self.z3.BitVecVal(node.lo, size)
        return self._fitted(node, size)

    def _fitted(self, node: Node, size: int):
        r = getattr(self, "visit_" + type(node).__name__)(node)
        if isinstance(r, types.GeneratorType):
            r = yield from r
        return self.fit(r, size)

    def visit_Number(self, n: Number):  # pragma: no cover - constants return early
        return self.z3.BitVecVal(n.value, signed_width(n.value, n.value))

    def visit_Name(self, n: Name):
        return self.unsigned(self.env[n.name])

    def visit_Unary(self, n: Unary):
        z3, op = self.z3, n.op
        a = yield n.arg
        size = signed_width(n.lo, n.hi)
        if op == "+":
            return a
        if op == "-":  # ~a + 1
            x = self.fit(a, size)
            return ~x + z3.BitVecVal(1, size)
        if op == "~":
            return ~self.fit(a, size)
        if op == "!":
            return self.flag(a == 0)
        low = self.fit(a, n.arg.width)
        if op in ("&", "~&"):
            r = z3.BVRedAnd(low)
        elif op in ("|", "~|"):
            r = z3.BVRedOr(low)
        else:
            r = reduce(operator.xor, [z3.Extract(i, i, low) for i in range(low.size())])
        return self.unsigned(~r if op.startswith("~") else r)

    def visit_Binary(self, n: Binary):
        z3, op = self.z3, n.op
        size = signed_width(n.lo, n.hi)
        if op == "*":
            return (yield from self.product(n, size))
        a = yield n.left
        b = yield n.right
        if op in _COMPARE:
            m = max(a.size(), b.size())
            x, y = self.fit(a, m), self.fit(b, m)
            return self.flag(_COMPARE[op](x, y))  # z3's < on bit-vectors is bvslt (signed)
        if op in ("&&", "||"):
            both = (z3.And if op == "&&" else z3.Or)(a != 0, b != 0)
            return self.flag(both)
        if op in ("+", "-", "&", "|", "^", "~^"):
            x, y = self.fit(a, size), self.fit(b, size)
            if op == "-":
                return self.minus(x, y)
            if op == "~^":
                return ~(x ^ y)
            return _WORD[op](x, y)
        if op in ("<<", "<<<"):
            w = max(size, b.size())
            return self.fit(self.fit(a, w) << self.fit(b, w), size)  # bvshl
        if op in (">>", ">>>"):
            w = max(a.size(), b.size())
            return self.fit(self.fit(a, w) >> self.fit(b, w), size)  # z3's >> is bvashr
        raise AssertionError(op)  # pragma: no cover

    def product(self, n: Binary, size: int):
        """x * y, with constant left shifts of either factor moved out of the multiplier."""
        (left, i), (right, j) = _shifted(n.left), _shifted(n.right)
        a = yield left
        b = yield right
        k = i + j
        core = max(size - k, 1)
        x, y = self.fit(a, core), self.fit(b, core)
        p = x * y
        if k == 0:
            return p
        if k >= size:
            return self.z3.BitVecVal(0, size)
        return self.z3.Concat(self.fit(p, size - k), self.z3.BitVecVal(0, k))

    def visit_Ternary(self, n: Ternary):
        z3 = self.z3
        size = signed_width(n.lo, n.hi)
        c = yield n.cond
        t = yield n.then
        o = yield n.other
        return z3.If(c != 0, self.fit(t, size), self.fit(o, size))

    def concat(self, parts: Sequence[Node]):
        pieces = []
        for p in parts:
            pieces.append(self.fit((yield p), p.width))
        return pieces[0] if len(pieces) == 1 else self.z3.Concat(*pieces)

    def visit_Concat(self, n: Concat):
        return self.unsigned((yield from self.concat(n.parts)))

    def visit_Repeat(self, n: Repeat):
        one = yield from self.concat(n.parts)
        return self.unsigned(self.repeat(one, n.times))

    def repeat(self, one, times: int):
        """``times`` copies of one side by side, by doubling (a term of size log(times))."""
        out, power = None, one
        while times:
            if times & 1:
                out = power if out is None else self.z3.Concat(power, out)
            times >>= 1
            if times:
                power = self.z3.Concat(power, power)
        return out

    def visit_Index(self, n: Index):
        z3 = self.z3
        base = yield n.base
        if n.at is not None:
            x = self.fit(base, max(base.size(), n.at + 1))
            return self.unsigned(z3.Extract(n.at, n.at, x))
        idx = yield n.index
        w = max(base.size(), idx.size())
        return self.unsigned(z3.Extract(0, 0, self.fit(base, w) >> self.fit(idx, w)))

    def visit_Slice(self, n: Slice):
        base = yield n.base
        x = self.fit(base, max(base.size(), n.msb + 1))
        return self.unsigned(self.z3.Extract(n.msb, n.lsb, x))

    def visit_Cast(self, n: Cast):
        low = self.fit((yield n.arg), n.arg.width)
        return low if n.fn == "signed" else self.unsigned(low)
