"""Spec equations: what a design's outputs must equal.

A spec is one or more equations in Verilog expression syntax, separated by ``;``::

    {cout, sum} = a + b + cin
    sum = a + b; v = ($signed(a) + $signed(b)) != $signed(sum)

Meaning (exact):

* The right side is computed on unbounded Python integers. Ports are unsigned; ``$signed(x)``
  reads x as two's complement at x's self-determined width, ``$unsigned(x)`` reads its low bits at
  that width. The low bits that fit the left side are kept (value mod 2^L, split MSB first over a
  concatenation on the left).
* An identifier is an input port, or an output port completely defined by earlier equations (it
  stands for its specified value, unsigned at its port width).
* Every output bit of the design is defined exactly once over all equations.

Pipeline: a lexer with positions, a precedence-climbing parser to an immutable syntax tree, a
resolving pass that checks names against the design and gives every node its Verilog
self-determined width and an exact integer interval ``[lo, hi]``, then three translations, each a
visitor with one method per node kind: Python closures (the ground truth, :meth:`Spec.evaluate`),
gates (:meth:`Spec.reference`) and z3 word-level terms (:meth:`Spec.to_z3`).
"""

from __future__ import annotations

import dataclasses
import operator
import re
import sys
from contextlib import contextmanager
from dataclasses import dataclass, field
from functools import reduce
from typing import Any, Callable, Mapping, NamedTuple, Sequence

from verify.model.builder import GateBuilder
from verify.errors import SpecError
from verify.model.netlist import CONST0, CONST1, Netlist, Port

__all__ = ["Spec", "parse", "infer", "MAX_BITS"]

#: a gate-level or z3 value is refused when it would need more bits than this
MAX_BITS = 4096
#: the gate reference refuses a product that would take more and-gates than this
MAX_PRODUCT_GATES = 1_000_000
#: expressions nested deeper than this (a chain of 1000 additions, say) are refused
MAX_DEPTH = 1000
#: the self-determined width of an unsized literal (Verilog rule)
UNSIZED_WIDTH = 32


# ==== locations and errors ===================================================================

@contextmanager
def _deep():
    """Room for the recursive visitors on a deeply nested spec (up to MAX_DEPTH levels)."""
    old = sys.getrecursionlimit()
    if old < 20 * MAX_DEPTH:
        sys.setrecursionlimit(20 * MAX_DEPTH)
    try:
        yield
    finally:
        sys.setrecursionlimit(old)


def _location(text: str, pos: int) -> str:
    """'column N' (1-based, of the whole text), with the line too when the text has several."""
    if "\n" not in text:
        return f"column {pos + 1}"
    line = text.count("\n", 0, pos) + 1
    col = pos - (text.rfind("\n", 0, pos) + 1) + 1
    return f"line {line}, column {col}"


def _error(text: str, pos: int, message: str) -> SpecError:
    return SpecError(f"{_location(text, pos)}: {message}", where="spec")


# ==== lexer ==================================================================================

class Token(NamedTuple):
    kind: str  # name | sys | num | op | end
    text: str
    pos: int
    value: Any = None  # num: (value, size or None, signed)


_OPERATORS = sorted(
    ["<<<", ">>>", "===", "!==", "<<", ">>", "<=", ">=", "==", "!=", "&&", "||", "~&", "~|",
     "~^", "^~", "**", "+", "-", "*", "/", "%", "&", "|", "^", "~", "!", "<", ">", "?", ":",
     "(", ")", "[", "]", "{", "}", ",", ";", "="],
    key=len, reverse=True)
_IDENT = re.compile(r"[A-Za-z_][A-Za-z0-9_$]*")
_SYSNAME = re.compile(r"\$[A-Za-z0-9_$]*")
_DECIMAL = re.compile(r"[0-9][0-9_]*")
_BASED = re.compile(r"'([sS]?)([bBoOdDhH])?[ \t]*([0-9a-zA-Z_?]*)")
_BASES = {"b": (2, "binary"), "o": (8, "octal"), "d": (10, "decimal"), "h": (16, "hex")}
_SIMPLE_NAME = re.compile(r"^[A-Za-z_][A-Za-z0-9_$]*$")
_DIGITS = "0123456789"
_IDENT_START = set("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ_")
_DIGIT_VALUE = {d: int(d, 16) for d in "0123456789abcdefABCDEF"}


def _lex(text: str) -> list[Token]:
    tokens: list[Token] = []
    i, n = 0, len(text)
    while i < n:
        c = text[i]
        if c.isspace():
            i += 1
            continue
        if text.startswith("//", i):
            j = text.find("\n", i)
            i = n if j < 0 else j
            continue
        if text.startswith("/*", i):
            j = text.find("*/", i + 2)
            if j < 0:
                raise _error(text, i, "comment '/*' is never closed with '*/'")
            i = j + 2
            continue
        if c in _IDENT_START:
            m = _IDENT.match(text, i)
            tokens.append(Token("name", m.group(), i))
            i = m.end()
            continue
        if c == "\\":  # Verilog escaped identifier: up to the next white space
            j = i + 1
            while j < n and not text[j].isspace():
                j += 1
            if j == i + 1:
                raise _error(text, i, "'\\' must start an escaped name (\\name followed by a space)")
            tokens.append(Token("name", text[i + 1:j], i))
            i = j
            continue
        if c == "$":
            m = _SYSNAME.match(text, i)
            tokens.append(Token("sys", m.group(), i))
            i = m.end()
            continue
        if c in _DIGITS or c == "'":
            i = _lex_number(text, i, tokens)
            continue
        for op in _OPERATORS:
            if text.startswith(op, i):
                tokens.append(Token("op", op, i))
                i += len(op)
                break
        else:
            raise _error(text, i, f"unexpected character {c!r}")
    tokens.append(Token("end", "", n))
    return tokens


def _lex_number(text: str, start: int, tokens: list[Token]) -> int:
    """A plain decimal, or a [size]'[s]<base><digits> literal; returns the index after it."""
    size: int | None = None
    i = start
    if text[i] in _DIGITS:
        m = _DECIMAL.match(text, i)
        digits = m.group().replace("_", "")
        if len(digits) > MAX_BITS // 3:  # over 4096 bits whatever it is
            raise _error(text, start, f"number {m.group()[:20]}... is longer than {MAX_BITS} bits")
        i = m.end()
        j = i
        while j < len(text) and text[j] in " \t":
            j += 1
        if j >= len(text) or text[j] != "'":
            tokens.append(Token("num", m.group(), start, (int(digits), None, False)))
            return i
        size = int(digits)
        i = j
    m = _BASED.match(text, i)
    signed, base, digits = m.group(1), m.group(2), m.group(3)
    lexeme = text[start:m.end()]
    if not base:
        raise _error(text, i, f"expected a base letter (b, o, d or h) after \"'\" in {lexeme!r}")
    radix, base_name = _BASES[base.lower()]
    clean = digits.replace("_", "")
    if not clean:
        raise _error(text, start, f"literal {lexeme!r} has no digits")
    for k, d in enumerate(digits):
        if d.lower() in "xz?":
            raise _error(text, m.start(3) + k,
                         f"x/z digits are not supported in a spec value ({lexeme!r}): "
                         "a spec says which number each output must be")
        if d != "_" and _DIGIT_VALUE.get(d, 99) >= radix:
            raise _error(text, m.start(3) + k, f"{d!r} is not a {base_name} digit in {lexeme!r}")
    significant = len(clean.lstrip("0"))
    if (significant - 1) * {2: 1, 8: 3, 10: 3, 16: 4}[radix] > MAX_BITS:
        raise _error(text, start, f"literal {lexeme[:20]!r}... is longer than {MAX_BITS} bits")
    value = int(clean, radix)
    if len(lexeme) > 24:
        lexeme = lexeme[:20] + "..."
    if size is not None:
        if size > MAX_BITS:
            raise _error(text, start, f"literal {lexeme!r}: a size over {MAX_BITS} bits")
        if size < 1:
            raise _error(text, start, f"literal {lexeme!r}: a size must be at least 1")
        if value >= 1 << size:
            raise _error(text, start,
                         f"literal {lexeme!r}: "
                         f"{f'value {value}' if value.bit_length() <= 64 else 'the value'} "
                         f"does not fit in {size} bit"
                         f"{'s' if size != 1 else ''}")
    tokens.append(Token("num", lexeme, start, (value, size, bool(signed))))
    return m.end()


# ==== syntax tree ============================================================================

@dataclass(frozen=True)
class Node:
    """An expression node. ``pos`` is its 0-based offset in the spec text.

    The resolver fills the analysis fields: ``width`` (Verilog self-determined width), the exact
    interval ``[lo, hi]`` every value of the node lies in, and ``const`` (no port inside; then
    lo == hi is its value).
    """

    pos: int
    width: int = field(default=0, compare=False, kw_only=True)
    lo: int = field(default=0, compare=False, kw_only=True)
    hi: int = field(default=0, compare=False, kw_only=True)
    const: bool = field(default=False, compare=False, kw_only=True)


@dataclass(frozen=True)
class Number(Node):
    text: str
    value: int  # already read as two's complement for a signed literal
    size: int | None


@dataclass(frozen=True)
class Name(Node):
    name: str
    is_output: bool = False


@dataclass(frozen=True)
class Unary(Node):
    op: str
    arg: Node


@dataclass(frozen=True)
class Binary(Node):
    op: str
    left: Node
    right: Node


@dataclass(frozen=True)
class Ternary(Node):
    cond: Node
    then: Node
    other: Node


@dataclass(frozen=True)
class Concat(Node):
    parts: tuple[Node, ...]


@dataclass(frozen=True)
class Repeat(Node):
    count: Node
    parts: tuple[Node, ...]
    times: int = 0


@dataclass(frozen=True)
class Index(Node):
    base: Node
    index: Node
    at: int | None = None  # the constant index, when it is one


@dataclass(frozen=True)
class Slice(Node):
    base: Node
    msb_expr: Node
    lsb_expr: Node
    msb: int = 0
    lsb: int = 0


@dataclass(frozen=True)
class Cast(Node):
    fn: str  # signed | unsigned
    arg: Node


@dataclass(frozen=True)
class Target:
    """One piece of a left side: bits [msb:lsb] of an output port."""

    pos: int
    port: str
    msb_expr: Node | None = None
    lsb_expr: Node | None = None  # None with msb_expr set: a single-bit select
    msb: int = 0
    lsb: int = 0

    @property
    def width(self) -> int:
        return self.msb - self.lsb + 1


@dataclass(frozen=True)
class Equation:
    pos: int
    targets: tuple[Target, ...]  # MSB first, as written
    rhs: Node

    @property
    def width(self) -> int:
        return sum(t.width for t in self.targets)


# ==== parser =================================================================================

_BINARY_PREC = {
    "||": 1, "&&": 2, "|": 3, "^": 4, "~^": 4, "^~": 4, "&": 5,
    "==": 6, "!=": 6, "===": 6, "!==": 6, "<": 7, "<=": 7, ">": 7, ">=": 7,
    "<<": 8, ">>": 8, "<<<": 8, ">>>": 8, "+": 9, "-": 9, "*": 10, "/": 10, "%": 10, "**": 11,
}
_UNSUPPORTED = {"/": "division '/'", "%": "modulo '%'", "**": "power '**'"}
_SAME_AS = {"===": "==", "!==": "!=", "^~": "~^"}  # no x/z in a spec: these coincide
_UNARY = {"+", "-", "!", "~", "&", "~&", "|", "~|", "^", "~^", "^~"}


def _show(tok: Token) -> str:
    return "the end of the spec" if tok.kind == "end" else repr(tok.text)


class _Parser:
    def __init__(self, text: str):
        self.text = text
        self.tokens = _lex(text)
        self.i = 0

    # ---- token helpers
    def peek(self) -> Token:
        return self.tokens[self.i]

    def take(self) -> Token:
        tok = self.tokens[self.i]
        self.i += 1
        return tok

    def at(self, op: str) -> bool:
        tok = self.tokens[self.i]
        return tok.kind == "op" and tok.text == op

    def expect(self, op: str, message: str) -> Token:
        if not self.at(op):
            tok = self.peek()
            raise self.error(tok.pos, f"{message}, found {_show(tok)}")
        return self.take()

    def error(self, pos: int, message: str) -> SpecError:
        return _error(self.text, pos, message)

    def loc(self, pos: int) -> str:
        return _location(self.text, pos)

    # ---- grammar
    def equations(self) -> list[Equation]:
        out: list[Equation] = []
        while self.peek().kind != "end":
            if self.at(";"):
                self.take()
                continue
            start = self.peek().pos
            targets = self.lhs()
            tok = self.peek()
            if not self.at("="):
                if tok.kind == "op" and tok.text in ("<=", "=="):
                    raise self.error(tok.pos, f"expected '=' after the left side, found "
                                              f"{_show(tok)} (an equation is 'outputs = expression')")
                raise self.error(tok.pos, f"expected '=' after the left side, found {_show(tok)}")
            self.take()
            rhs = self.expr()
            tok = self.peek()
            if not (tok.kind == "end" or self.at(";")):
                raise self.error(tok.pos, f"unexpected {_show(tok)} after the expression "
                                          "(equations are separated by ';')")
            out.append(Equation(start, tuple(targets), rhs))
        if not out:
            raise SpecError("the spec has no equations (write e.g. '{cout, sum} = a + b + cin')",
                            where="spec")
        return out

    def lhs(self) -> list[Target]:
        if self.at("{"):
            brace = self.take()
            items = self.lhs()
            while self.at(","):
                self.take()
                items += self.lhs()
            self.expect("}", f"expected '}}' to close '{{' at {self.loc(brace.pos)}")
            return items
        tok = self.peek()
        if tok.kind != "name":
            raise self.error(tok.pos, f"expected an output port name on the left side, found "
                                      f"{_show(tok)}")
        self.take()
        if not self.at("["):
            return [Target(tok.pos, tok.text)]
        lb = self.take()
        first = self.expr()
        second = None
        if self.at(":"):
            self.take()
            second = self.expr()
        self.expect("]", f"expected ']' to close '[' at {self.loc(lb.pos)}")
        return [Target(tok.pos, tok.text, first, second)]

    def expr(self) -> Node:
        cond = self.binary(1)
        if self.at("?"):
            q = self.take()
            then = self.expr()
            self.expect(":", f"expected ':' to go with '?' at {self.loc(q.pos)}")
            other = self.expr()
            return Ternary(q.pos, cond, then, other)
        return cond

    def binary(self, min_prec: int) -> Node:
        left = self.unary()
        while True:
            tok = self.peek()
            prec = _BINARY_PREC.get(tok.text) if tok.kind == "op" else None
            if prec is None or prec < min_prec:
                return left
            if tok.text in _UNSUPPORTED:
                raise self.error(tok.pos, f"{_UNSUPPORTED[tok.text]} is not supported in a spec "
                                          "(supported: + - * bitwise, shifts, comparisons, ?:)")
            self.take()
            right = self.binary(prec + 1)
            left = Binary(tok.pos, _SAME_AS.get(tok.text, tok.text), left, right)

    def unary(self) -> Node:
        tok = self.peek()
        if tok.kind == "op" and tok.text in _UNARY:
            self.take()
            return Unary(tok.pos, _SAME_AS.get(tok.text, tok.text), self.unary())
        return self.postfix()

    def postfix(self) -> Node:
        node = self.primary()
        while self.at("["):
            lb = self.take()
            first = self.expr()
            if self.at(":"):
                self.take()
                second = self.expr()
                self.expect("]", f"expected ']' to close '[' at {self.loc(lb.pos)}")
                node = Slice(lb.pos, node, first, second)
            else:
                self.expect("]", f"expected ']' to close '[' at {self.loc(lb.pos)}")
                node = Index(lb.pos, node, first)
        return node

    def primary(self) -> Node:
        tok = self.peek()
        if tok.kind == "num":
            self.take()
            value, size, signed = tok.value
            if signed:
                w = size or UNSIZED_WIDTH
                if value >> (w - 1):
                    value -= 1 << w
            return Number(tok.pos, tok.text, value, size)
        if tok.kind == "name":
            self.take()
            return Name(tok.pos, tok.text)
        if tok.kind == "sys":
            self.take()
            if tok.text not in ("$signed", "$unsigned"):
                raise self.error(tok.pos, f"unknown system function '{tok.text}' "
                                          "(known: $signed, $unsigned)")
            lp = self.expect("(", f"expected '(' after '{tok.text}'")
            arg = self.expr()
            self.expect(")", f"expected ')' to close '(' at {self.loc(lp.pos)}")
            return Cast(tok.pos, tok.text[1:], arg)
        if self.at("("):
            lp = self.take()
            inner = self.expr()
            self.expect(")", f"expected ')' to close '(' at {self.loc(lp.pos)}")
            return inner
        if self.at("{"):
            lb = self.take()
            first = self.expr()
            if self.at("{"):  # replication {n{...}}
                inner_lb = self.take()
                parts = self.expr_list()
                self.expect("}", f"expected '}}' to close '{{' at {self.loc(inner_lb.pos)}")
                self.expect("}", f"expected '}}' to close '{{' at {self.loc(lb.pos)}")
                return Repeat(lb.pos, first, tuple(parts))
            parts = [first]
            while self.at(","):
                self.take()
                parts.append(self.expr())
            self.expect("}", f"expected '}}' to close '{{' at {self.loc(lb.pos)}")
            return Concat(lb.pos, tuple(parts))
        raise self.error(tok.pos, f"expected an expression, found {_show(tok)}")

    def expr_list(self) -> list[Node]:
        parts = [self.expr()]
        while self.at(","):
            self.take()
            parts.append(self.expr())
        return parts


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


def _low(x: int, w: int) -> int:
    return x & ((1 << w) - 1)


# ==== resolver: names, widths, intervals =====================================================

class _Resolver:
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
        return _error(self.text, pos, message)

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
                    raise self.error(t.pos, f"{_bit_text(t.port, bit, self.outputs[t.port])} is "
                                            f"defined twice (first at {_location(self.text, first)})")
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
            missing += _ranges_text(port, w, bits)
        if missing:
            raise SpecError(f"the spec leaves outputs undefined: {', '.join(missing)} (every "
                            f"output bit of {self.design.name} needs exactly one equation)",
                            where="spec")

    # ---- expressions
    def visit(self, node: Node) -> Node:
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise self.error(node.pos, f"the expression is nested more than {MAX_DEPTH} levels deep")
        try:
            r = getattr(self, "visit_" + type(node).__name__)(node)
        finally:
            self.depth -= 1
        if r.const and not isinstance(r, Number):
            value = _IntCompiler().visit(dataclasses.replace(r, const=False))({})
            r = dataclasses.replace(r, lo=value, hi=value)
        need = signed_width(r.lo, r.hi)
        if need > MAX_BITS:
            raise self.error(node.pos, f"this value could need {need} bits; the limit is {MAX_BITS}")
        return r

    def _set(self, node: Node, width: int, lo: int, hi: int, const: bool, **changes) -> Node:
        return dataclasses.replace(node, width=width, lo=lo, hi=hi, const=const, **changes)

    def visit_Number(self, n: Number) -> Node:
        return self._set(n, n.size or UNSIZED_WIDTH, n.value, n.value, True)

    def visit_Name(self, n: Name) -> Node:
        if n.name in self.inputs:
            w = self.inputs[n.name]
            self.used.add(n.name)
            return self._set(n, w, 0, (1 << w) - 1, False)
        if n.name in self.outputs:
            w = self.outputs[n.name]
            undefined = [b for b in range(w) if b not in self.defined[n.name]]
            if undefined:
                bits = ", ".join(_ranges_text(n.name, w, undefined))
                raise self.error(n.pos, f"output '{n.name}' is used before it is defined ({bits} "
                                        "not defined by an earlier equation)")
            return self._set(n, w, 0, (1 << w) - 1, False, is_output=True)
        raise self.unknown(n.pos, n.name)

    def visit_Unary(self, n: Unary) -> Node:
        a = self.visit(n.arg)
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

    def visit_Binary(self, n: Binary) -> Node:
        a, b = self.visit(n.left), self.visit(n.right)
        op, w = n.op, max(a.width, b.width)
        if op == "+":
            lo, hi = a.lo + b.lo, a.hi + b.hi
        elif op == "-":
            lo, hi = a.lo - b.hi, a.hi - b.lo
        elif op == "*":
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
                if b.hi > MAX_BITS and (a.lo, a.hi) != (0, 0):
                    raise self.error(n.pos, f"a shift by up to {b.hi} would need more than "
                                            f"{MAX_BITS} bits")
                corners = [x << s for x in (a.lo, a.hi) for s in (b.lo, b.hi)]
            else:
                cap = signed_width(a.lo, a.hi)  # shifting further only repeats the sign
                corners = [x >> min(s, cap) for x in (a.lo, a.hi) for s in (b.lo, b.hi)]
            lo, hi = min(corners), max(corners)
        else:  # comparisons and logical
            lo, hi, w = 0, 1, 1
        return self._set(n, w, lo, hi, a.const and b.const, left=a, right=b)

    def visit_Ternary(self, n: Ternary) -> Node:
        c, t, o = self.visit(n.cond), self.visit(n.then), self.visit(n.other)
        if c.const:  # only the branch taken matters
            pick = t if c.lo else o
            return self._set(n, max(t.width, o.width), pick.lo, pick.hi,
                             pick.const, cond=c, then=t, other=o)
        return self._set(n, max(t.width, o.width), min(t.lo, o.lo), max(t.hi, o.hi),
                         False, cond=c, then=t, other=o)

    def visit_Concat(self, n: Concat) -> Node:
        parts = tuple(self.visit(p) for p in n.parts)
        w = sum(p.width for p in parts)
        return self._set(n, w, 0, (1 << w) - 1, all(p.const for p in parts), parts=parts)

    def visit_Repeat(self, n: Repeat) -> Node:
        count = self.visit(n.count)
        if not count.const:
            raise self.error(n.count.pos, "a replication count must be a constant")
        if count.lo < 1:
            raise self.error(n.count.pos, f"a replication count must be positive, got {count.lo}")
        parts = tuple(self.visit(p) for p in n.parts)
        w = count.lo * sum(p.width for p in parts)
        if w > MAX_BITS:
            raise self.error(n.pos, f"this replication is {w} bits wide; the limit is {MAX_BITS}")
        return self._set(n, w, 0, (1 << w) - 1, all(p.const for p in parts),
                         count=count, parts=parts, times=count.lo)

    def visit_Index(self, n: Index) -> Node:
        base, idx = self.visit(n.base), self.visit(n.index)
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

    def visit_Slice(self, n: Slice) -> Node:
        base = self.visit(n.base)
        msb = self.constant(n.msb_expr, "a part-select bound")
        lsb = self.constant(n.lsb_expr, "a part-select bound")
        if isinstance(base, Name):
            self.check_select(n.base.pos, base.name, base.width, msb, lsb)
        elif msb < lsb or lsb < 0:
            raise self.error(n.pos, f"part-select [{msb}:{lsb}] must be [high:low] with low >= 0")
        w = msb - lsb + 1
        return self._set(n, w, 0, (1 << w) - 1, base.const, base=base, msb=msb, lsb=lsb)

    def visit_Cast(self, n: Cast) -> Node:
        a = self.visit(n.arg)
        w = a.width
        if n.fn == "signed":
            lo, hi = -(1 << (w - 1)), (1 << (w - 1)) - 1
        else:
            lo, hi = 0, (1 << w) - 1
        if lo <= a.lo and a.hi <= hi:  # the value already fits: the cast leaves it unchanged
            lo, hi = a.lo, a.hi
        return self._set(n, w, lo, hi, a.const, arg=a)


def _bit_text(port: str, bit: int, width: int) -> str:
    return port if width == 1 else f"{port}[{bit}]"


def _ranges_text(port: str, width: int, bits: Sequence[int]) -> list[str]:
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


# ==== translation 1: Python integers (the ground truth) ======================================

class _Visitor:
    def visit(self, node: Node):
        return getattr(self, "visit_" + type(node).__name__)(node)


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

Env = Mapping[str, int]


class _IntCompiler(_Visitor):
    """Each node becomes a closure env -> int on unbounded integers."""

    def visit(self, node: Node) -> Callable[[Env], int]:
        if node.const and not isinstance(node, Number):
            v = node.lo
            return lambda e: v
        return super().visit(node)

    def visit_Number(self, n: Number):
        v = n.value
        return lambda e: v

    def visit_Name(self, n: Name):
        return operator.itemgetter(n.name)

    def visit_Unary(self, n: Unary):
        f, op, w = self.visit(n.arg), n.op, n.arg.width
        m = (1 << w) - 1
        if op == "+":
            return f
        if op == "-":
            return lambda e: -f(e)
        if op == "~":
            return lambda e: ~f(e)
        if op == "!":
            return lambda e: int(f(e) == 0)
        if op == "&":
            return lambda e: int(f(e) & m == m)
        if op == "~&":
            return lambda e: int(f(e) & m != m)
        if op == "|":
            return lambda e: int(f(e) & m != 0)
        if op == "~|":
            return lambda e: int(f(e) & m == 0)
        if op == "^":
            return lambda e: (f(e) & m).bit_count() & 1
        if op == "~^":
            return lambda e: 1 - ((f(e) & m).bit_count() & 1)
        raise AssertionError(op)  # pragma: no cover

    def visit_Binary(self, n: Binary):
        f, g, fn = self.visit(n.left), self.visit(n.right), _INT_OPS[n.op]
        if n.op == "&&":
            return lambda e: int(bool(f(e)) and bool(g(e)))
        if n.op == "||":
            return lambda e: int(bool(f(e)) or bool(g(e)))
        return lambda e: fn(f(e), g(e))

    def visit_Ternary(self, n: Ternary):
        c, t, o = self.visit(n.cond), self.visit(n.then), self.visit(n.other)
        return lambda e: t(e) if c(e) else o(e)

    def _concat(self, parts: Sequence[Node]):
        fs = [(self.visit(p), p.width, (1 << p.width) - 1) for p in parts]

        def run(e: Env) -> int:
            acc = 0
            for f, w, m in fs:
                acc = (acc << w) | (f(e) & m)
            return acc
        return run

    def visit_Concat(self, n: Concat):
        return self._concat(n.parts)

    def visit_Repeat(self, n: Repeat):
        f = self._concat(n.parts)
        w = sum(p.width for p in n.parts)
        spread = sum(1 << (k * w) for k in range(n.times))  # v * spread repeats v
        return lambda e: f(e) * spread

    def visit_Index(self, n: Index):
        f = self.visit(n.base)
        if n.at is not None:
            at = n.at
            return lambda e: (f(e) >> at) & 1
        g = self.visit(n.index)
        return lambda e: (f(e) >> g(e)) & 1

    def visit_Slice(self, n: Slice):
        f, lsb, m = self.visit(n.base), n.lsb, (1 << (n.msb - n.lsb + 1)) - 1
        return lambda e: (f(e) >> lsb) & m

    def visit_Cast(self, n: Cast):
        f, w = self.visit(n.arg), n.arg.width
        m = (1 << w) - 1
        if n.fn == "unsigned":
            return lambda e: f(e) & m
        half, full = 1 << (w - 1), 1 << w

        def signed(e: Env) -> int:
            v = f(e) & m
            return v - full if v >= half else v
        return signed


# ==== translation 2: gates ===================================================================

class Bits(NamedTuple):
    """An exact integer as nets: value = sum(bits[i] * 2^i) - ext * 2^len(bits).

    Bit i of the infinite two's complement is bits[i] below len(bits) and ext above.
    """

    bits: tuple[str, ...]
    ext: str = CONST0

    def bit(self, i: int) -> str:
        return self.bits[i] if i < len(self.bits) else self.ext

    def low(self, n: int) -> list[str]:
        return [self.bit(i) for i in range(n)]


def _const_bits(v: int) -> Bits:
    n = v.bit_length() if v >= 0 else signed_width(v, v) - 1
    return Bits(tuple(CONST1 if v >> i & 1 else CONST0 for i in range(n)),
                CONST1 if v < 0 else CONST0)


class _GateCompiler(_Visitor):
    """Each node becomes a Bits value, trimmed to the width its interval needs."""

    def __init__(self, b: GateBuilder, env: Mapping[str, Bits], text: str = ""):
        self.b = b
        self.env = env
        self.text = text  # for error locations

    def visit(self, node: Node) -> Bits:
        if node.const:
            return _const_bits(node.lo)
        return self.trim(super().visit(node), node)

    @staticmethod
    def trim(v: Bits, node: Node) -> Bits:
        """The same value in as few bits as node's interval allows (the interval is exact)."""
        if node.lo >= 0:
            n = node.hi.bit_length()
            return Bits(tuple(v.low(n)), CONST0)
        n = signed_width(node.lo, node.hi)
        low = v.low(n)
        return Bits(tuple(low[:-1]), low[-1])

    def from_low(self, low: Sequence[str]) -> Bits:
        """Bits from the low N bits of a value known (by its node's interval) to fit N signed bits."""
        return Bits(tuple(low[:-1]), low[-1])

    def any_(self, v: Bits) -> str:
        return self.b.or_(*v.bits, v.ext)

    def sub(self, a: Bits, b: Bits, n: int) -> list[str]:
        out, _ = self.b.add(a.low(n), [self.b.not_(x) for x in b.low(n)], CONST1)
        return out

    def less(self, a: Node, b: Node) -> str:
        """1 when a < b: the sign of a - b."""
        if a.hi < b.lo:
            return CONST1
        if a.lo >= b.hi:
            return CONST0
        n = signed_width(a.lo - b.hi, a.hi - b.lo)
        return self.sub(self.visit(a), self.visit(b), n)[n - 1]

    def add_chain(self, n: Binary, size: int) -> list[str]:
        """Low ``size`` bits of a chain of additions, one ripple per term; a 0/1 term (a carry-in)
        rides in as the carry of the first ripple. Modulo 2^size the partial sums may wrap: the
        final low bits are still exact."""
        terms: list[Node] = []

        def flatten(node: Node) -> None:
            if isinstance(node, Binary) and node.op == "+" and not node.const:
                flatten(node.left)
                flatten(node.right)
            else:
                terms.append(node)
        flatten(n)
        carry = next((t for t in terms if t.lo >= 0 and t.hi <= 1 and not t.const), None)
        cin = CONST0
        if carry is not None:
            terms.remove(carry)
            cin = self.visit(carry).bit(0)
        acc = self.visit(terms[0]).low(size)
        for t in terms[1:] or [None]:
            addend = self.visit(t).low(size) if t is not None else [CONST0] * size
            acc, _ = self.b.add(acc, addend, cin)
            cin = CONST0
        return acc

    def bitwise(self, op: Callable[..., str], a: Bits, b: Bits) -> Bits:
        n = max(len(a.bits), len(b.bits))
        return Bits(tuple(op(x, y) for x, y in zip(a.low(n), b.low(n))), op(a.ext, b.ext))

    def shift_left(self, a: Bits, s: Bits, n: int) -> list[str]:
        """Low n bits of a << s (barrel shifter, s >= 0)."""
        w = a.low(n)
        for j, sj in enumerate(s.bits):
            k = 1 << j
            if k >= n:
                w = [self.b.and_(self.b.not_(sj), x) for x in w]
            else:
                w = [self.b.mux(sj, w[i], w[i - k] if i >= k else CONST0) for i in range(n)]
        return w

    def shift_right(self, a: Bits, s: Bits) -> Bits:
        """a >> s, arithmetic (floor), s >= 0."""
        m = len(a.bits)
        w = list(a.bits)
        far: list[str] = []
        for j, sj in enumerate(s.bits):
            k = 1 << j
            if k >= m:
                far.append(sj)
            else:
                w = [self.b.mux(sj, w[i], w[i + k] if i + k < m else a.ext) for i in range(m)]
        if far:
            big = self.b.or_(*far)
            w = [self.b.mux(big, x, a.ext) for x in w]
        return Bits(tuple(w), a.ext)

    # ---- node kinds
    def visit_Number(self, n: Number) -> Bits:  # pragma: no cover - constants return early
        return _const_bits(n.value)

    def visit_Name(self, n: Name) -> Bits:
        return self.env[n.name]

    def visit_Unary(self, n: Unary) -> Bits:
        a, op, b = self.visit(n.arg), n.op, self.b
        if op == "+":
            return a
        if op == "-":
            size = signed_width(n.lo, n.hi)
            return self.from_low(self.sub(Bits(()), a, size))
        if op == "~":
            return Bits(tuple(b.not_(x) for x in a.bits), b.not_(a.ext))
        if op == "!":
            return Bits((b.not_(self.any_(a)),))
        low = a.low(n.arg.width)
        red = {"&": b.and_, "~&": b.and_, "|": b.or_, "~|": b.or_, "^": b.xor_, "~^": b.xor_}[op]
        r = red(*low)
        return Bits((b.not_(r) if op.startswith("~") else r,))

    def visit_Binary(self, n: Binary) -> Bits:
        op, b = n.op, self.b
        if op in ("<", ">", "<=", ">="):
            x, y = (n.left, n.right) if op in ("<", ">=") else (n.right, n.left)
            lt = self.less(x, y)
            return Bits((lt if op in ("<", ">") else b.not_(lt),))
        if op in ("&&", "||"):
            x, y = self.any_(self.visit(n.left)), self.any_(self.visit(n.right))
            return Bits((b.and_(x, y) if op == "&&" else b.or_(x, y),))
        size = signed_width(n.lo, n.hi)
        if op == "+":
            return self.from_low(self.add_chain(n, size))
        x, y = self.visit(n.left), self.visit(n.right)
        if op == "-":
            return self.from_low(self.sub(x, y, size))
        if op == "*":
            xs, ys = x.low(size), y.low(size)
            cost = sum(v not in (CONST0, CONST1) for v in xs) * sum(v not in (CONST0, CONST1) for v in ys)
            if cost > MAX_PRODUCT_GATES:
                raise SpecError(f"{_location(self.text, n.pos)}: this product is {size} bits wide; "
                                f"as gates it would take over {MAX_PRODUCT_GATES:,} and-gates",
                                where="spec")
            acc = [CONST0] * size
            for i, yi in enumerate(ys):
                partial = [CONST0] * i + [b.and_(yi, xj) for xj in xs[:size - i]]
                acc, _ = b.add(acc, partial)
            return self.from_low(acc)
        if op in ("==", "!="):
            m = max(len(x.bits), len(y.bits)) + 1
            diff = b.or_(*(b.xor_(p, q) for p, q in zip(x.low(m), y.low(m))))
            return Bits((diff if op == "!=" else b.not_(diff),))
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
            return self.from_low(self.shift_left(x, y, size))
        if op in (">>", ">>>"):
            if n.right.const:
                return Bits(x.bits[n.right.lo:], x.ext)
            return self.shift_right(x, y)
        raise AssertionError(op)  # pragma: no cover

    def visit_Ternary(self, n: Ternary) -> Bits:
        if n.cond.const:
            return self.visit(n.then if n.cond.lo else n.other)
        c = self.any_(self.visit(n.cond))
        t, o = self.visit(n.then), self.visit(n.other)
        size = signed_width(n.lo, n.hi)
        return self.from_low([self.b.mux(c, q, p) for p, q in zip(t.low(size), o.low(size))])

    def concat(self, parts: Sequence[Node]) -> list[str]:
        out: list[str] = []
        for p in reversed(parts):
            out += self.visit(p).low(p.width)
        return out

    def visit_Concat(self, n: Concat) -> Bits:
        return Bits(tuple(self.concat(n.parts)))

    def visit_Repeat(self, n: Repeat) -> Bits:
        return Bits(tuple(self.concat(n.parts) * n.times))

    def visit_Index(self, n: Index) -> Bits:
        base = self.visit(n.base)
        if n.at is not None:
            return Bits((base.bit(n.at),))
        return Bits((self.shift_right(base, self.visit(n.index)).bit(0),))

    def visit_Slice(self, n: Slice) -> Bits:
        base = self.visit(n.base)
        return Bits(tuple(base.bit(i) for i in range(n.lsb, n.msb + 1)))

    def visit_Cast(self, n: Cast) -> Bits:
        low = self.visit(n.arg).low(n.arg.width)
        return self.from_low(low) if n.fn == "signed" else Bits(tuple(low))


# ==== translation 3: z3 word-level terms =====================================================

class _Z3Compiler(_Visitor):
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

    def visit(self, node: Node):
        size = signed_width(node.lo, node.hi)
        if node.const:
            return self.z3.BitVecVal(node.lo, size)
        return self.fit(super().visit(node), size)

    def visit_Number(self, n: Number):  # pragma: no cover - constants return early
        return self.z3.BitVecVal(n.value, signed_width(n.value, n.value))

    def visit_Name(self, n: Name):
        return self.unsigned(self.env[n.name])

    def visit_Unary(self, n: Unary):
        z3, op = self.z3, n.op
        a = self.visit(n.arg)
        size = signed_width(n.lo, n.hi)
        if op == "+":
            return a
        if op == "-":
            return -self.fit(a, size)
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
        a, b = self.visit(n.left), self.visit(n.right)
        size = signed_width(n.lo, n.hi)
        if op in ("<", "<=", ">", ">=", "==", "!="):
            m = max(a.size(), b.size())
            x, y = self.fit(a, m), self.fit(b, m)
            cmp = {"<": operator.lt, "<=": operator.le, ">": operator.gt, ">=": operator.ge,
                   "==": operator.eq, "!=": operator.ne}[op]
            return self.flag(cmp(x, y))  # z3's < on bit-vectors is bvslt (signed)
        if op in ("&&", "||"):
            both = (z3.And if op == "&&" else z3.Or)(a != 0, b != 0)
            return self.flag(both)
        if op in ("+", "-", "*", "&", "|", "^", "~^"):
            x, y = self.fit(a, size), self.fit(b, size)
            if op == "~^":
                return ~(x ^ y)
            return {"+": operator.add, "-": operator.sub, "*": operator.mul, "&": operator.and_,
                    "|": operator.or_, "^": operator.xor}[op](x, y)
        if op in ("<<", "<<<"):
            w = max(size, b.size())
            return self.fit(self.fit(a, w) << self.fit(b, w), size)  # bvshl
        if op in (">>", ">>>"):
            w = max(a.size(), b.size())
            return self.fit(self.fit(a, w) >> self.fit(b, w), size)  # z3's >> is bvashr
        raise AssertionError(op)  # pragma: no cover

    def visit_Ternary(self, n: Ternary):
        z3 = self.z3
        size = signed_width(n.lo, n.hi)
        c = self.visit(n.cond)
        return z3.If(c != 0, self.fit(self.visit(n.then), size), self.fit(self.visit(n.other), size))

    def concat(self, parts: Sequence[Node]):
        pieces = [self.fit(self.visit(p), p.width) for p in parts]
        return pieces[0] if len(pieces) == 1 else self.z3.Concat(*pieces)

    def visit_Concat(self, n: Concat):
        return self.unsigned(self.concat(n.parts))

    def visit_Repeat(self, n: Repeat):
        one = self.concat(n.parts)
        return self.unsigned(one if n.times == 1 else self.z3.Concat(*[one] * n.times))

    def visit_Index(self, n: Index):
        z3 = self.z3
        base = self.visit(n.base)
        if n.at is not None:
            x = self.fit(base, max(base.size(), n.at + 1))
            return self.unsigned(z3.Extract(n.at, n.at, x))
        idx = self.visit(n.index)
        w = max(base.size(), idx.size())
        return self.unsigned(z3.Extract(0, 0, self.fit(base, w) >> self.fit(idx, w)))

    def visit_Slice(self, n: Slice):
        base = self.visit(n.base)
        x = self.fit(base, max(base.size(), n.msb + 1))
        return self.unsigned(self.z3.Extract(n.msb, n.lsb, x))

    def visit_Cast(self, n: Cast):
        low = self.fit(self.visit(n.arg), n.arg.width)
        return low if n.fn == "signed" else self.unsigned(low)


# ==== canonical text =========================================================================

_PRINT_PREC = {**_BINARY_PREC, "?": 0}
_ARITH = {"+", "-", "*"}


def _name_text(name: str) -> str:
    return name if _SIMPLE_NAME.match(name) else f"\\{name} "


class _Printer(_Visitor):
    """Canonical text: minimal parentheses, plus clarifying ones around a binary operand of a
    different precedence under a comparison, bitwise or logical operator."""

    def visit_Number(self, n: Number) -> str:
        return n.text

    def visit_Name(self, n: Name) -> str:
        return _name_text(n.name)

    def visit_Unary(self, n: Unary) -> str:
        inner = self.visit(n.arg)
        if isinstance(n.arg, (Binary, Ternary, Unary)):
            inner = f"({inner})"
        return f"{n.op}{inner}"

    def operand(self, child: Node, parent_op: str, right: bool) -> str:
        text = self.visit(child)
        if isinstance(child, Ternary):
            return f"({text})"
        if isinstance(child, Binary):
            pp, cp = _PRINT_PREC[parent_op], _PRINT_PREC[child.op]
            if cp < pp or (cp == pp and right):
                return f"({text})"
            if parent_op not in _ARITH and cp != pp:
                return f"({text})"
        return text

    def visit_Binary(self, n: Binary) -> str:
        return f"{self.operand(n.left, n.op, False)} {n.op} {self.operand(n.right, n.op, True)}"

    def visit_Ternary(self, n: Ternary) -> str:
        c = self.visit(n.cond)
        if isinstance(n.cond, Ternary):
            c = f"({c})"
        return f"{c} ? {self.visit(n.then)} : {self.visit(n.other)}"

    def visit_Concat(self, n: Concat) -> str:
        return "{" + ", ".join(self.visit(p) for p in n.parts) + "}"

    def visit_Repeat(self, n: Repeat) -> str:
        return "{" + self.visit(n.count) + "{" + ", ".join(self.visit(p) for p in n.parts) + "}}"

    def base(self, node: Node) -> str:
        text = self.visit(node)
        if isinstance(node, (Name, Concat, Repeat, Cast, Index, Slice)):
            return text
        return f"({text})"

    def visit_Index(self, n: Index) -> str:
        return f"{self.base(n.base)}[{self.visit(n.index)}]"

    def visit_Slice(self, n: Slice) -> str:
        return f"{self.base(n.base)}[{self.visit(n.msb_expr)}:{self.visit(n.lsb_expr)}]"

    def visit_Cast(self, n: Cast) -> str:
        return f"${n.fn}({self.visit(n.arg)})"

    def target(self, t: Target, widths: Mapping[str, int]) -> str:
        name = _name_text(t.port)
        if t.lsb == 0 and t.msb == widths[t.port] - 1:
            return name
        return f"{name}[{t.msb}]" if t.msb == t.lsb else f"{name}[{t.msb}:{t.lsb}]"

    def equation(self, eq: Equation, widths: Mapping[str, int]) -> str:
        ts = [self.target(t, widths) for t in eq.targets]
        lhs = ts[0] if len(ts) == 1 else "{" + ", ".join(ts) + "}"
        return f"{lhs} = {self.visit(eq.rhs)}"


# ==== the Spec ===============================================================================

class Spec:
    """Parsed, checked equations for one design. Build with :func:`parse` or :func:`infer`."""

    def __init__(self, source: str, design: Netlist, equations: Sequence[Equation],
                 inputs_used: set[str], inferred: bool = False):
        self.source = source  # the text as the user wrote it
        self.design_name = design.name
        self.inputs: tuple[Port, ...] = design.inputs
        self.outputs: tuple[Port, ...] = design.outputs
        self.equations: tuple[Equation, ...] = tuple(equations)
        self.inputs_used: set[str] = set(inputs_used)
        self.inferred = inferred
        widths = {p.name: p.width for p in design.outputs}
        printer = _Printer()
        self.text: str = "; ".join(printer.equation(eq, widths) for eq in self.equations)
        compiler = _IntCompiler()
        self._int = [(compiler.visit(eq.rhs), eq.width, self._layout(eq)) for eq in self.equations]
        self._reference: Netlist | None = None

    @staticmethod
    def _layout(eq: Equation) -> list[tuple[str, int, int, int]]:
        """(port, lsb, width, offset in the equation's value) per target."""
        out, offset = [], eq.width
        for t in eq.targets:
            offset -= t.width
            out.append((t.port, t.lsb, t.width, offset))
        return out

    def __repr__(self) -> str:
        return f"Spec({self.text!r}{', inferred' if self.inferred else ''})"

    # closures do not pickle: send the equations, compile again on arrival (process pools)
    def __getstate__(self) -> dict[str, Any]:
        state = dict(self.__dict__)
        del state["_int"]
        return state

    def __setstate__(self, state: dict[str, Any]) -> None:
        self.__dict__.update(state)
        compiler = _IntCompiler()
        with _deep():
            self._int = [(compiler.visit(eq.rhs), eq.width, self._layout(eq))
                         for eq in self.equations]

    # ---- ground truth
    def evaluate(self, inputs: Mapping[str, int]) -> dict[str, int]:
        """Every output port's specified value (0 <= v < 2^width) for one input vector."""
        try:
            return self._evaluate(inputs)
        except RecursionError:  # a deeply nested spec: retry with room for it
            with _deep():
                return self._evaluate(inputs)

    def _evaluate(self, inputs: Mapping[str, int]) -> dict[str, int]:
        env: dict[str, int] = {}
        for p in self.inputs:
            if p.name in self.inputs_used:
                v = inputs[p.name]
                if not 0 <= v < 1 << p.width:
                    raise ValueError(f"input {p.name}={v} does not fit its {p.width} bits")
                env[p.name] = v
        outs = {p.name: 0 for p in self.outputs}
        for f, width, layout in self._int:
            v = f(env) & ((1 << width) - 1)
            for port, lsb, w, offset in layout:
                outs[port] |= ((v >> offset) & ((1 << w) - 1)) << lsb
                env[port] = outs[port]
        return outs

    # ---- gates
    def reference(self) -> Netlist:
        """The spec as gates, with the design's input and output ports (cached)."""
        if self._reference is None:
            with _deep():
                self._reference = self._build_reference()
        return self._reference

    def _build_reference(self) -> Netlist:
        names = {p.name for p in (*self.inputs, *self.outputs)}
        prefix = "ref_"
        while any(n.startswith(prefix) for n in names):
            prefix += "_"
        b = GateBuilder(prefix, fold=True)
        env: dict[str, Bits] = {p.name: Bits(tuple(p.bits)) for p in self.inputs}
        outs: dict[str, list[str]] = {p.name: [CONST0] * p.width for p in self.outputs}
        compiler = _GateCompiler(b, env, self.source)
        for eq, (_, width, layout) in zip(self.equations, self._int):
            value = compiler.visit(eq.rhs).low(width)
            for port, lsb, w, offset in layout:
                outs[port][lsb:lsb + w] = value[offset:offset + w]
                env[port] = Bits(tuple(outs[port]))
        return b.netlist(f"{self.design_name}_spec", self.inputs, outs,
                         origin=f"spec: {self.text}")

    # ---- z3
    def to_z3(self, inputs: Mapping[str, Any]) -> dict[str, Any]:
        """Each output port's specified value as a z3 BitVec of the port width (word-level)."""
        with _deep():
            return self._to_z3(inputs)

    def _to_z3(self, inputs: Mapping[str, Any]) -> dict[str, Any]:
        import z3
        env: dict[str, Any] = {}
        for p in self.inputs:
            if p.name in self.inputs_used:
                x = inputs[p.name]
                if x.size() != p.width:
                    raise ValueError(f"z3 input {p.name} is {x.size()} bits; the port is {p.width}")
                env[p.name] = x
        pieces: dict[str, list[tuple[int, Any]]] = {p.name: [] for p in self.outputs}
        compiler = _Z3Compiler(env)
        out: dict[str, Any] = {}
        for eq, (_, width, layout) in zip(self.equations, self._int):
            value = compiler.fit(compiler.visit(eq.rhs), width)
            for port, lsb, w, offset in layout:
                pieces[port].append((lsb, z3.Extract(offset + w - 1, offset, value)))
                parts = [x for _, x in sorted(pieces[port], key=lambda t: -t[0])]
                out[port] = parts[0] if len(parts) == 1 else z3.Concat(*parts)
                env[port] = out[port]
        return {p.name: out[p.name] for p in self.outputs}


def parse(text: str, design: Netlist, *, inferred: bool = False) -> Spec:
    """Parse and check spec equations against a design; every mistake is one SpecError."""
    if not isinstance(text, str):
        raise SpecError(f"a spec is text, got {type(text).__name__}", where="spec")
    with _deep():
        try:
            equations = _Parser(text).equations()
        except RecursionError:
            raise SpecError(f"the spec is nested more than {MAX_DEPTH} levels deep",
                            where="spec") from None
        resolver = _Resolver(text, design)
        resolved = [resolver.equation(eq) for eq in equations]
        resolver.finish()
        return Spec(text, design, resolved, resolver.used, inferred)


# ==== inference ==============================================================================

_CARRY_IN = {"cin", "ci", "c_in", "carry_in", "carryin", "cin0", "cy_in", "cyin"}
_CARRY_OUT = {"cout", "co", "c_out", "carry_out", "carryout", "c", "carry", "cy", "cy_out"}
_SUM = {"s", "sum", "sum0", "s0"}
_OVERFLOW = {"v", "ovf", "overflow", "ov", "vout", "ovfl"}
#: a lone 1-bit input with one of these names is not taken for a carry-in
_CONTROL = {"m", "mode", "sub", "subtract", "add_sub", "addsub", "op", "sel", "select", "s",
            "en", "enable", "neg", "inv", "invert", "ctrl", "cmd"}


def _looks(name: str, names: set[str]) -> bool:
    """Name match ignoring case and a direction prefix or suffix (i_cin, cin_i, o_sum, ...)."""
    n = name.lower()
    candidates = {n}
    for pre in ("i_", "o_", "in_", "out_"):
        if n.startswith(pre):
            candidates.add(n[len(pre):])
    for suf in ("_i", "_o"):
        if n.endswith(suf):
            candidates.add(n[:-len(suf)])
    return bool(candidates & names)


def _plist(ports: Sequence[Port]) -> str:
    return ", ".join(str(p) for p in ports)


def infer(design: Netlist) -> Spec:
    """The usual adder spec for a design, from its port names and widths.

    Refuses (SpecError naming the ports) when the ports do not tell which spec is meant.
    """
    def refuse(why: str) -> SpecError:
        return SpecError(f"cannot infer a spec for {design.name}: {why}; give one with --spec, "
                         "e.g. --spec '{cout, sum} = a + b + cin'", where="spec")

    wide = [p for p in design.inputs if p.width > 1]
    single = [p for p in design.inputs if p.width == 1]
    if len(wide) > 2:
        raise refuse(f"more than two multi-bit inputs ({_plist(wide)})")
    if len(wide) == 1:
        raise refuse(f"only one multi-bit input ({_plist(wide)}); an adder has two operands")
    if len(wide) == 2:
        a, b = wide
        if a.width != b.width:
            raise refuse(f"the two operands have different widths ({_plist(wide)})")
        n = a.width
        if len(single) > 1:
            raise refuse(f"several 1-bit inputs ({_plist(single)}) besides the operands "
                         f"{a.name}, {b.name}: cannot tell which is the carry-in")
        cin = single[0] if single else None
    else:
        n = 1
        if len(single) not in (2, 3):
            raise refuse(f"{len(single)} one-bit input{'s' if len(single) != 1 else ''} "
                         f"({_plist(single) or 'none'}); a 1-bit adder has 2 or 3")
        if len(single) == 2:
            (a, b), cin = single, None
        else:
            named = [p for p in single if _looks(p.name, _CARRY_IN)]
            if len(named) > 1:
                raise refuse(f"several inputs look like a carry-in ({_plist(named)})")
            cin = named[0] if named else single[2]
            a, b = [p for p in single if p is not cin]
    if cin is not None and not _looks(cin.name, _CARRY_IN) and _looks(cin.name, _CONTROL):
        raise refuse(f"the 1-bit input {cin.name} looks like a mode or control bit, not a "
                     "carry-in")

    outs = list(design.outputs)
    full = [p for p in outs if p.width == n + 1]
    summ = [p for p in outs if p.width == n] if n > 1 else []
    ones = [p for p in outs if p.width == 1]
    odd = [p for p in outs if p not in full and p not in summ and p not in ones]
    if odd:
        raise refuse(f"output{'s' if len(odd) > 1 else ''} {_plist(odd)} "
                     f"fit{'s' if len(odd) == 1 else ''} no adder shape for {n}-bit operands")
    terms = f"{_name_text(a.name)} + {_name_text(b.name)}" + (f" + {_name_text(cin.name)}" if cin else "")
    if full:
        if len(outs) > 1:
            raise refuse(f"a result of {n + 1} bits ({_plist(full)}) and other outputs "
                         f"({_plist([p for p in outs if p is not full[0]])})")
        return parse(f"{_name_text(full[0].name)} = {terms}", design, inferred=True)

    carry = [p for p in ones if _looks(p.name, _CARRY_OUT)]
    ovf = [p for p in ones if _looks(p.name, _OVERFLOW)]
    if n == 1:
        named_sum = [p for p in ones if _looks(p.name, _SUM)]
        if len(named_sum) != 1:
            raise refuse(f"the 1-bit outputs ({_plist(ones)}) do not tell which one is the sum "
                         "(name it s or sum, the carry c, co or cout)")
        summ = named_sum
        ones = [p for p in ones if p is not summ[0]]
    elif len(summ) != 1:
        raise refuse(f"expected one {n}-bit sum output, found {len(summ)} ({_plist(summ) or 'none'})")
    unknown = [p for p in ones if p not in carry and p not in ovf]
    if unknown:
        raise refuse(f"1-bit output{'s' if len(unknown) > 1 else ''} {_plist(unknown)} "
                     "named neither as a carry-out (cout, co, c_out, carry_out, c) nor as an "
                     "overflow (v, ovf, overflow, ov)")
    if len(carry) > 1:
        raise refuse(f"several outputs look like a carry-out ({_plist(carry)})")
    if len(ovf) > 1:
        raise refuse(f"several outputs look like an overflow flag ({_plist(ovf)})")
    s = _name_text(summ[0].name)
    lhs = f"{{{_name_text(carry[0].name)}, {s}}}" if carry else s
    text = f"{lhs} = {terms}"
    if ovf:
        signed_terms = f"$signed({_name_text(a.name)}) + $signed({_name_text(b.name)})"
        if cin:
            signed_terms += f" + {_name_text(cin.name)}"
        text += f"; {_name_text(ovf[0].name)} = ({signed_terms}) != $signed({s})"
    return parse(text, design, inferred=True)
