"""Spec text to syntax trees: limits, locations, the lexer, the node kinds and the parser.

Nothing here recurses on the depth of the text: the parser and every translation run as
generators on one explicit stack (:mod:`verify.spec.walk`), so a deeply nested spec costs memory, never
Python stack, and the process recursion limit is never touched. Nesting beyond
:data:`MAX_DEPTH` is refused with one SpecError naming the depth.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import Any, NamedTuple

from verify.errors import SpecError
from verify.model.netlist import MAX_PORT_WIDTH
from verify.spec.walk import run

#: the widest value anywhere in a spec: two of the widest ports side by side
MAX_BITS = 2 * MAX_PORT_WIDTH
#: a product whose value could need more bits than this is refused (gates and z3 grow as its square)
MAX_PRODUCT_BITS = 8192
#: the gate reference refuses a product that would take more and-gates than this
MAX_PRODUCT_GATES = 1_000_000
#: the gate reference refuses a variable shift that would take more multiplexers than this
MAX_SHIFT_GATES = 1_000_000
#: the gate reference is refused (SpecError) when its word operations would make more gates than
#: this; each operation is charged before it is made (GateBuilder makes some 30,000 gates/s)
MAX_REFERENCE_GATES = 1_000_000
#: expressions nested deeper than this (a chain of 1000 additions, say) are refused
MAX_DEPTH = 1000
#: decimal numbers longer than this are refused (write wide constants in hex)
MAX_DECIMAL_DIGITS = 4000
#: the self-determined width of an unsized literal (Verilog rule)
UNSIZED_WIDTH = 32


# ==== locations and errors ===================================================================

def location(text: str, pos: int) -> str:
    """'column N' (1-based, of the whole text), with the line too when the text has several."""
    if "\n" not in text:
        return f"column {pos + 1}"
    line = text.count("\n", 0, pos) + 1
    col = pos - (text.rfind("\n", 0, pos) + 1) + 1
    return f"line {line}, column {col}"


def error(text: str, pos: int, message: str) -> SpecError:
    return SpecError(f"{location(text, pos)}: {message}", where="spec")


def too_deep(text: str, pos: int) -> SpecError:
    return error(text, pos, f"the expression is nested more than {MAX_DEPTH} levels deep")


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
SIMPLE_NAME = re.compile(r"^[A-Za-z_][A-Za-z0-9_$]*$")
_DIGITS = "0123456789"
_IDENT_START = set("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ_")
_DIGIT_VALUE = {d: int(d, 16) for d in "0123456789abcdefABCDEF"}


def lex(text: str) -> list[Token]:
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
                raise error(text, i, "comment '/*' is never closed with '*/'")
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
                raise error(text, i, "'\\' must start an escaped name (\\name followed by a space)")
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
            raise error(text, i, f"unexpected character {c!r}")
    tokens.append(Token("end", "", n))
    return tokens


def _lex_number(text: str, start: int, tokens: list[Token]) -> int:
    """A plain decimal, or a [size]'[s]<base><digits> literal; returns the index after it."""
    size: int | None = None
    i = start
    if text[i] in _DIGITS:
        m = _DECIMAL.match(text, i)
        digits = m.group().replace("_", "")
        if len(digits) > MAX_DECIMAL_DIGITS:
            raise error(text, start, f"number {m.group()[:20]}... is longer than "
                                     f"{MAX_DECIMAL_DIGITS:,} decimal digits (write it in hex)")
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
        raise error(text, i, f"expected a base letter (b, o, d or h) after \"'\" in {lexeme!r}")
    radix, base_name = _BASES[base.lower()]
    clean = digits.replace("_", "")
    if not clean:
        raise error(text, start, f"literal {lexeme!r} has no digits")
    for k, d in enumerate(digits):
        if d.lower() in "xz?":
            raise error(text, m.start(3) + k,
                        f"x/z digits are not supported in a spec value ({lexeme!r}): "
                        "a spec says which number each output must be")
        if d != "_" and _DIGIT_VALUE.get(d, 99) >= radix:
            raise error(text, m.start(3) + k, f"{d!r} is not a {base_name} digit in {lexeme!r}")
    significant = len(clean.lstrip("0"))
    if (significant - 1) * {2: 1, 8: 3, 10: 3, 16: 4}[radix] > MAX_BITS:
        raise error(text, start, f"literal {lexeme[:20]!r}... is longer than {MAX_BITS} bits")
    if radix == 10 and significant > MAX_DECIMAL_DIGITS:
        raise error(text, start, f"literal {lexeme[:20]!r}... is longer than "
                                 f"{MAX_DECIMAL_DIGITS:,} decimal digits (write it in hex)")
    value = int(clean, radix)
    if len(lexeme) > 24:
        lexeme = lexeme[:20] + "..."
    if size is not None:
        if size > MAX_BITS:
            raise error(text, start, f"literal {lexeme!r}: a size over {MAX_BITS} bits")
        if size < 1:
            raise error(text, start, f"literal {lexeme!r}: a size must be at least 1")
        if value >= 1 << size:
            raise error(text, start,
                        f"literal {lexeme!r}: "
                        f"{f'value {value}' if value.bit_length() <= 64 else 'the value'} "
                        f"does not fit in {size} bit"
                        f"{'s' if size != 1 else ''}")
    tokens.append(Token("num", lexeme, start, (value, size, bool(signed))))
    return m.end()


# ==== syntax tree ============================================================================
# eq=False: nodes compare by identity, so no comparison or hash ever walks a deep tree.

@dataclass(frozen=True, eq=False)
class Node:
    """An expression node. ``pos`` is its 0-based offset in the spec text.

    The resolver fills the analysis fields: ``width`` (Verilog self-determined width), the exact
    interval ``[lo, hi]`` every value of the node lies in, and ``const`` (no port inside; then
    lo == hi is its value).
    """

    pos: int
    width: int = field(default=0, kw_only=True)
    lo: int = field(default=0, kw_only=True)
    hi: int = field(default=0, kw_only=True)
    const: bool = field(default=False, kw_only=True)


@dataclass(frozen=True, eq=False)
class Number(Node):
    text: str
    value: int  # already read as two's complement for a signed literal
    size: int | None


@dataclass(frozen=True, eq=False)
class Name(Node):
    name: str
    is_output: bool = False


@dataclass(frozen=True, eq=False)
class Unary(Node):
    op: str
    arg: Node


@dataclass(frozen=True, eq=False)
class Binary(Node):
    op: str
    left: Node
    right: Node


@dataclass(frozen=True, eq=False)
class Ternary(Node):
    cond: Node
    then: Node
    other: Node


@dataclass(frozen=True, eq=False)
class Concat(Node):
    parts: tuple[Node, ...]


@dataclass(frozen=True, eq=False)
class Repeat(Node):
    count: Node
    parts: tuple[Node, ...]
    times: int = 0


@dataclass(frozen=True, eq=False)
class Index(Node):
    base: Node
    index: Node
    at: int | None = None  # the constant index, when it is one


@dataclass(frozen=True, eq=False)
class Slice(Node):
    base: Node
    msb_expr: Node
    lsb_expr: Node
    msb: int = 0
    lsb: int = 0


@dataclass(frozen=True, eq=False)
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

BINARY_PREC = {
    "||": 1, "&&": 2, "|": 3, "^": 4, "~^": 4, "^~": 4, "&": 5,
    "==": 6, "!=": 6, "===": 6, "!==": 6, "<": 7, "<=": 7, ">": 7, ">=": 7,
    "<<": 8, ">>": 8, "<<<": 8, ">>>": 8, "+": 9, "-": 9, "*": 10, "/": 10, "%": 10, "**": 11,
}
_UNSUPPORTED = {"/": "division '/'", "%": "modulo '%'", "**": "power '**'"}
_SAME_AS = {"===": "==", "!==": "!=", "^~": "~^"}  # no x/z in a spec: these coincide
_UNARY = {"+", "-", "!", "~", "&", "~&", "|", "~|", "^", "~^", "^~"}


def _show(tok: Token) -> str:
    return "the end of the spec" if tok.kind == "end" else repr(tok.text)


class Parser:
    """Precedence climbing. The grammar methods are generators: ``node = yield self.expr()``
    parses a sub-expression on the explicit stack of :func:`run`."""

    def __init__(self, text: str):
        self.text = text
        self.tokens = lex(text)
        self.i = 0
        self.depth = 0

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
        return error(self.text, pos, message)

    def loc(self, pos: int) -> str:
        return location(self.text, pos)

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
            rhs = run(self.expr())
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
        items: list[Target] = []
        opened: list[Token] = []  # the '{' still open, innermost last
        while True:
            while self.at("{"):
                opened.append(self.take())
            items.append(self.target())
            while True:
                if opened and self.at(","):
                    self.take()
                    break
                if opened:
                    brace = opened.pop()
                    self.expect("}", f"expected '}}' to close '{{' at {self.loc(brace.pos)}")
                    continue
                return items

    def target(self) -> Target:
        tok = self.peek()
        if tok.kind != "name":
            raise self.error(tok.pos, f"expected an output port name on the left side, found "
                                      f"{_show(tok)}")
        self.take()
        if not self.at("["):
            return Target(tok.pos, tok.text)
        lb = self.take()
        first = run(self.expr())
        second = None
        if self.at(":"):
            self.take()
            second = run(self.expr())
        self.expect("]", f"expected ']' to close '[' at {self.loc(lb.pos)}")
        return Target(tok.pos, tok.text, first, second)

    def expr(self):
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise too_deep(self.text, self.peek().pos)
        cond = yield self.binary(1)
        if self.at("?"):
            q = self.take()
            then = yield self.expr()
            self.expect(":", f"expected ':' to go with '?' at {self.loc(q.pos)}")
            other = yield self.expr()
            cond = Ternary(q.pos, cond, then, other)
        self.depth -= 1
        return cond

    def binary(self, min_prec: int):
        left = yield self.unary()
        while True:
            tok = self.peek()
            prec = BINARY_PREC.get(tok.text) if tok.kind == "op" else None
            if prec is None or prec < min_prec:
                return left
            if tok.text in _UNSUPPORTED:
                raise self.error(tok.pos, f"{_UNSUPPORTED[tok.text]} is not supported in a spec "
                                          "(supported: + - * bitwise, shifts, comparisons, ?:)")
            self.take()
            right = yield self.binary(prec + 1)
            left = Binary(tok.pos, _SAME_AS.get(tok.text, tok.text), left, right)

    def unary(self):
        ops: list[Token] = []
        while self.peek().kind == "op" and self.peek().text in _UNARY:
            ops.append(self.take())
            if len(ops) + self.depth > MAX_DEPTH:
                raise too_deep(self.text, ops[-1].pos)
        node = yield self.postfix()
        for tok in reversed(ops):
            node = Unary(tok.pos, _SAME_AS.get(tok.text, tok.text), node)
        return node

    def postfix(self):
        node = yield self.primary()
        while self.at("["):
            lb = self.take()
            first = yield self.expr()
            if self.at(":"):
                self.take()
                second = yield self.expr()
                self.expect("]", f"expected ']' to close '[' at {self.loc(lb.pos)}")
                node = Slice(lb.pos, node, first, second)
            else:
                self.expect("]", f"expected ']' to close '[' at {self.loc(lb.pos)}")
                node = Index(lb.pos, node, first)
        return node

    def primary(self):
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
            arg = yield self.expr()
            self.expect(")", f"expected ')' to close '(' at {self.loc(lp.pos)}")
            return Cast(tok.pos, tok.text[1:], arg)
        if self.at("("):
            lp = self.take()
            inner = yield self.expr()
            self.expect(")", f"expected ')' to close '(' at {self.loc(lp.pos)}")
            return inner
        if self.at("{"):
            lb = self.take()
            first = yield self.expr()
            if self.at("{"):  # replication {n{...}}
                inner_lb = self.take()
                parts = yield self.expr_list()
                self.expect("}", f"expected '}}' to close '{{' at {self.loc(inner_lb.pos)}")
                self.expect("}", f"expected '}}' to close '{{' at {self.loc(lb.pos)}")
                return Repeat(lb.pos, first, tuple(parts))
            parts = [first]
            while self.at(","):
                self.take()
                parts.append((yield self.expr()))
            self.expect("}", f"expected '}}' to close '{{' at {self.loc(lb.pos)}")
            return Concat(lb.pos, tuple(parts))
        raise self.error(tok.pos, f"expected an expression, found {_show(tok)}")

    def expr_list(self):
        parts = [(yield self.expr())]
        while self.at(","):
            self.take()
            parts.append((yield self.expr()))
        return parts
