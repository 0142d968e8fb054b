"""Translation 1: Python integers, the ground truth.

Each expression becomes one compiled Python function of the input values: straight-line code,
one statement per node (no nesting as deep as the expression, so nothing recurses when it runs),
written by a visitor with one method per node kind. Every value is an unbounded Python integer;
widths only enter where Verilog semantics need them (masks for reductions, concatenation,
part-selects and casts).
"""

from __future__ import annotations

import dataclasses
from typing import Any, Callable, Mapping

from verify.spec.syntax import (Binary, Cast, Concat, Index, Name, Node, Number, Repeat, Slice,
                                Ternary, Unary)
from verify.spec.walk import Visitor

Env = Mapping[str, int]

_INFIX = {"+": "+", "-": "-", "*": "*", "&": "&", "|": "|", "^": "^",
          "<<": "<<", "<<<": "<<", ">>": ">>", ">>>": ">>"}
_COMPARE = {"<", "<=", ">", ">=", "==", "!="}


class Program(Visitor):
    """An expression as a compiled function ``program(env) -> int``."""

    def __init__(self, root: Node):
        self.lines: list[str] = []
        self.consts: dict[str, Any] = {}
        out = self.visit(root)
        body = "\n".join(f"    {line}" for line in self.lines)
        source = f"def program(e):\n{body}\n    return {out}\n" if body else \
            f"def program(e):\n    return {out}\n"
        scope: dict[str, Any] = dict(self.consts)
        exec(compile(source, "<spec>", "exec"), scope)  # noqa: S102 - our own generated code
        self.run: Callable[[Env], int] = scope["program"]

    def __call__(self, env: Env) -> int:
        return self.run(env)

    # ---- code helpers
    def const(self, value: int) -> str:
        name = f"k{len(self.consts)}"
        self.consts[name] = value
        return name

    def assign(self, expr: str) -> str:
        var = f"v{len(self.lines)}"
        self.lines.append(f"{var} = {expr}")
        return var

    def node(self, n: Node):
        if n.const:
            return self.const(n.lo)
        if isinstance(n, Name):
            return self.assign(f"e[{n.name!r}]")
        return self._statement(n)

    def _statement(self, n: Node):
        expr = yield from getattr(self, "visit_" + type(n).__name__)(n)
        return self.assign(expr)

    # ---- node kinds: each returns the Python expression of its value
    def visit_Number(self, n: Number):  # pragma: no cover - constants return early
        return self.const(n.value)
        yield

    def visit_Unary(self, n: Unary):
        x = yield n.arg
        op, m = n.op, self.const((1 << n.arg.width) - 1)
        return {
            "+": x, "-": f"-{x}", "~": f"~{x}", "!": f"int({x} == 0)",
            "&": f"int({x} & {m} == {m})", "~&": f"int({x} & {m} != {m})",
            "|": f"int({x} & {m} != 0)", "~|": f"int({x} & {m} == 0)",
            "^": f"({x} & {m}).bit_count() & 1", "~^": f"1 - (({x} & {m}).bit_count() & 1)",
        }[op]

    def visit_Binary(self, n: Binary):
        x = yield n.left
        y = yield n.right
        op = n.op
        if op in _INFIX:
            return f"{x} {_INFIX[op]} {y}"
        if op in _COMPARE:
            return f"int({x} {op} {y})"
        if op == "~^":
            return f"~({x} ^ {y})"
        if op == "&&":
            return f"1 if {x} and {y} else 0"
        if op == "||":
            return f"1 if {x} or {y} else 0"
        raise AssertionError(op)  # pragma: no cover

    def visit_Ternary(self, n: Ternary):
        c = yield n.cond
        t = yield n.then
        o = yield n.other
        return f"{t} if {c} else {o}"

    def glue(self, parts):
        """The parts side by side, each at its own width (one statement per part)."""
        acc = None
        for p in parts:
            x = yield p
            piece = f"({x} & {self.const((1 << p.width) - 1)})"
            acc = self.assign(piece if acc is None else f"({acc} << {p.width}) | {piece}")
        return acc

    def visit_Concat(self, n: Concat):
        return (yield from self.glue(n.parts))

    def visit_Repeat(self, n: Repeat):
        one = yield from self.glue(n.parts)
        w = sum(p.width for p in n.parts)
        spread = ((1 << (w * n.times)) - 1) // ((1 << w) - 1)  # v * spread repeats v n.times
        return f"{one} * {self.const(spread)}"

    def visit_Index(self, n: Index):
        x = yield n.base
        if n.at is not None:
            return f"({x} >> {n.at}) & 1"
        i = yield n.index
        return f"({x} >> {i}) & 1"

    def visit_Slice(self, n: Slice):
        x = yield n.base
        return f"({x} >> {n.lsb}) & {self.const((1 << (n.msb - n.lsb + 1)) - 1)}"

    def visit_Cast(self, n: Cast):
        x = yield n.arg
        w = n.arg.width
        low = self.assign(f"{x} & {self.const((1 << w) - 1)}")
        if n.fn == "unsigned":
            return low
        return f"{low} - {self.const(1 << w)} if {low} >> {w - 1} else {low}"


def fold(n: Node) -> int:
    """The value of a node whose operands are resolved constants (lo == hi == value)."""
    if isinstance(n, Number):
        return n.value
    if isinstance(n, Ternary):  # only the branch taken need be constant
        return (n.then if n.cond.lo else n.other).lo
    return Program(dataclasses.replace(n, const=False))({})
