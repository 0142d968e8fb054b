"""Canonical spec text: the equations printed back with minimal, clarifying parentheses."""

from __future__ import annotations

from typing import Mapping

from verify.spec.syntax import (BINARY_PREC, SIMPLE_NAME, Binary, Cast, Concat, Equation, Index,
                                Name, Node, Number, Repeat, Slice, Target, Ternary, Unary)
from verify.spec.walk import Visitor

_PRINT_PREC = {**BINARY_PREC, "?": 0}
_ARITH = {"+", "-", "*"}


def name_text(name: str) -> str:
    return name if SIMPLE_NAME.match(name) else f"\\{name} "


class Printer(Visitor):
    """Canonical text: minimal parentheses, plus clarifying ones around a binary operand of a
    different precedence under a comparison, bitwise or logical operator."""

    def visit_Number(self, n: Number) -> str:
        return n.text

    def visit_Name(self, n: Name) -> str:
        return name_text(n.name)

    def visit_Unary(self, n: Unary):
        inner = yield n.arg
        if isinstance(n.arg, (Binary, Ternary, Unary)):
            inner = f"({inner})"
        return f"{n.op}{inner}"

    @staticmethod
    def operand(child: Node, text: str, parent_op: str, right: bool) -> str:
        if isinstance(child, Ternary):
            return f"({text})"
        if isinstance(child, Binary):
            pp, cp = _PRINT_PREC[parent_op], _PRINT_PREC[child.op]
            if cp < pp or (cp == pp and right):
                return f"({text})"
            if parent_op not in _ARITH and cp != pp:
                return f"({text})"
        return text

    def visit_Binary(self, n: Binary):
        left = self.operand(n.left, (yield n.left), n.op, False)
        right = self.operand(n.right, (yield n.right), n.op, True)
        return f"{left} {n.op} {right}"

    def visit_Ternary(self, n: Ternary):
        c = yield n.cond
        if isinstance(n.cond, Ternary):
            c = f"({c})"
        then = yield n.then
        other = yield n.other
        return f"{c} ? {then} : {other}"

    def items(self, parts):
        out = []
        for p in parts:
            out.append((yield p))
        return ", ".join(out)

    def visit_Concat(self, n: Concat):
        return "{" + (yield from self.items(n.parts)) + "}"

    def visit_Repeat(self, n: Repeat):
        count = yield n.count
        return "{" + count + "{" + (yield from self.items(n.parts)) + "}}"

    def base(self, node: Node):
        text = yield node
        if isinstance(node, (Name, Concat, Repeat, Cast, Index, Slice)):
            return text
        return f"({text})"

    def visit_Index(self, n: Index):
        base = yield from self.base(n.base)
        return f"{base}[{(yield n.index)}]"

    def visit_Slice(self, n: Slice):
        base = yield from self.base(n.base)
        msb = yield n.msb_expr
        lsb = yield n.lsb_expr
        return f"{base}[{msb}:{lsb}]"

    def visit_Cast(self, n: Cast):
        return f"${n.fn}({(yield n.arg)})"

    def target(self, t: Target, widths: Mapping[str, int]) -> str:
        name = name_text(t.port)
        if t.lsb == 0 and t.msb == widths[t.port] - 1:
            return name
        return f"{name}[{t.msb}]" if t.msb == t.lsb else f"{name}[{t.msb}:{t.lsb}]"

    def equation(self, eq: Equation, widths: Mapping[str, int]) -> str:
        ts = [self.target(t, widths) for t in eq.targets]
        lhs = ts[0] if len(ts) == 1 else "{" + ", ".join(ts) + "}"
        return f"{lhs} = {self.visit(eq.rhs)}"
