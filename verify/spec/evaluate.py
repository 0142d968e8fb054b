"""Translation 1: Python integers, the ground truth.

Every node kind has one method giving its operands and a function of their values on unbounded
integers. :class:`Program` turns an expression into straight-line steps over numbered slots
(no closure calls nested as deep as the expression), and :func:`fold` applies one node's function
to constant operands (the resolver's constant folding).
"""

from __future__ import annotations

import operator
from typing import Callable, Mapping, Sequence

from verify.spec.syntax import (Binary, Cast, Concat, Index, Name, Node, Number, Repeat, Slice,
                                Ternary, Unary)
from verify.spec.walk import Visitor

Env = Mapping[str, int]

_INT_OPS: dict[str, Callable[[int, int], int]] = {
    "+": operator.add, "-": operator.sub, "*": operator.mul,
    "&": operator.and_, "|": operator.or_, "^": operator.xor,
    "~^": lambda x, y: ~(x ^ y),
    "<<": operator.lshift, "<<<": operator.lshift, ">>": operator.rshift, ">>>": operator.rshift,
    "<": lambda x, y: int(x < y), "<=": lambda x, y: int(x <= y),
    ">": lambda x, y: int(x > y), ">=": lambda x, y: int(x >= y),
    "==": lambda x, y: int(x == y), "!=": lambda x, y: int(x != y),
    "&&": lambda x, y: int(bool(x) and bool(y)), "||": lambda x, y: int(bool(x) or bool(y)),
}


class Meaning:
    """One method per node kind: (operand nodes, function of their integer values)."""

    def of(self, n: Node) -> tuple[Sequence[Node], Callable[..., int]]:
        return getattr(self, "meaning_" + type(n).__name__)(n)

    def meaning_Unary(self, n: Unary):
        op, m = n.op, (1 << n.arg.width) - 1
        fn = {
            "+": lambda x: x,
            "-": operator.neg,
            "~": operator.invert,
            "!": lambda x: int(x == 0),
            "&": lambda x: int(x & m == m),
            "~&": lambda x: int(x & m != m),
            "|": lambda x: int(x & m != 0),
            "~|": lambda x: int(x & m == 0),
            "^": lambda x: (x & m).bit_count() & 1,
            "~^": lambda x: 1 - ((x & m).bit_count() & 1),
        }[op]
        return (n.arg,), fn

    def meaning_Binary(self, n: Binary):
        return (n.left, n.right), _INT_OPS[n.op]

    def meaning_Ternary(self, n: Ternary):
        return (n.cond, n.then, n.other), lambda c, t, o: t if c else o

    def meaning_Concat(self, n: Concat):
        return n.parts, _concat([p.width for p in n.parts])

    def meaning_Repeat(self, n: Repeat):
        glue = _concat([p.width for p in n.parts])
        w = sum(p.width for p in n.parts)
        spread = ((1 << (w * n.times)) - 1) // ((1 << w) - 1)  # v * spread repeats v n.times
        return n.parts, lambda *xs: glue(*xs) * spread

    def meaning_Index(self, n: Index):
        if n.at is not None:
            at = n.at
            return (n.base,), lambda x: (x >> at) & 1
        return (n.base, n.index), lambda x, i: (x >> i) & 1

    def meaning_Slice(self, n: Slice):
        lsb, m = n.lsb, (1 << (n.msb - n.lsb + 1)) - 1
        return (n.base,), lambda x: (x >> lsb) & m

    def meaning_Cast(self, n: Cast):
        w = n.arg.width
        m = (1 << w) - 1
        if n.fn == "unsigned":
            return (n.arg,), lambda x: x & m
        half, full = 1 << (w - 1), 1 << w

        def signed(x: int) -> int:
            v = x & m
            return v - full if v >= half else v
        return (n.arg,), signed


def _concat(widths: Sequence[int]) -> Callable[..., int]:
    masks = [(w, (1 << w) - 1) for w in widths]

    def glue(*xs: int) -> int:
        acc = 0
        for (w, m), x in zip(masks, xs):
            acc = (acc << w) | (x & m)
        return acc
    return glue


_MEANING = Meaning()


def fold(n: Node) -> int:
    """The value of a node whose operands are resolved constants (lo == hi == value)."""
    if isinstance(n, Number):
        return n.value
    operands, fn = _MEANING.of(n)
    return fn(*(x.lo for x in operands))


class Program(Visitor):
    """An expression as straight-line steps: ``program(env) -> int``."""

    def __init__(self, root: Node):
        self.init: list[int] = []  # slot values before the run: constants (and 0 elsewhere)
        self.names: list[tuple[int, str]] = []  # (slot, port) loaded from env first
        self.steps: list[tuple[int, Callable[..., int], tuple[int, ...]]] = []
        self.out = self.visit(root)

    def slot(self, value: int = 0) -> int:
        self.init.append(value)
        return len(self.init) - 1

    def node(self, n: Node):
        if n.const:
            return self.slot(n.lo)
        if isinstance(n, Name):
            s = self.slot()
            self.names.append((s, n.name))
            return s
        return self.visit_operation(n)

    def visit_operation(self, n: Node):
        operands, fn = _MEANING.of(n)
        args = []
        for x in operands:
            args.append((yield x))
        s = self.slot()
        self.steps.append((s, fn, tuple(args)))
        return s

    def __call__(self, env: Env) -> int:
        v = self.init[:]
        for s, name in self.names:
            v[s] = env[name]
        for s, fn, args in self.steps:
            v[s] = fn(*[v[a] for a in args])
        return v[self.out]
