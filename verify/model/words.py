"""Word arithmetic over bit lists, made of gates with a ``GateBuilder``.

A word is a list of nets, least significant bit first. Every function here takes operands that
the caller has already brought to the width it wants (these functions never extend or truncate
an operand on their own, except where a docstring says so) and returns nets made with ``b``, so
that the builder's folding applies. Signedness only matters where a docstring says it does:
addition, subtraction and multiplication modulo 2**width are the same for both readings.
"""

from __future__ import annotations

from typing import Sequence

from verify.model.builder import GateBuilder
from verify.model.netlist import CONST0, CONST1

Word = list[str]


def add(b: GateBuilder, x: Sequence[str], y: Sequence[str], cin: str = CONST0) -> tuple[Word, str]:
    """x + y + cin as a ripple of full adders: (sum, carry out).

    x and y must have the same width n; the sum has n bits (the sum modulo 2**n, right for both
    signed and unsigned readings) and the carry out is bit n of the unsigned sum.
    """
    if len(x) != len(y):
        raise ValueError(f"add: operand widths differ ({len(x)} and {len(y)})")
    consts = (CONST0, CONST1)
    if cin in consts and all(v in consts for v in x) and all(v in consts for v in y):
        # every bit known: the sum of the integers (what the gates would fold to, made faster)
        n = len(x)
        total = _value(x) + _value(y) + (cin == CONST1)
        return [CONST1 if total >> i & 1 else CONST0 for i in range(n)], \
            CONST1 if total >> n & 1 else CONST0
    return b.add(list(x), list(y), cin)


def _value(x: Sequence[str]) -> int:
    return sum(1 << i for i, v in enumerate(x) if v == CONST1)


def subtract(b: GateBuilder, x: Sequence[str], y: Sequence[str]) -> tuple[Word, str]:
    """x - y as x + ~y + 1: (difference modulo 2**n, carry out).

    Same widths n for both operands. The carry out is 1 exactly when x >= y read as unsigned
    numbers (no borrow).
    """
    return add(b, x, [b.not_(v) for v in y], CONST1)


def negate(b: GateBuilder, x: Sequence[str]) -> Word:
    """-x modulo 2**n (two's complement), n = len(x)."""
    return add(b, [b.not_(v) for v in x], [CONST0] * len(x), CONST1)[0]


def increment(b: GateBuilder, x: Sequence[str]) -> Word:
    """x + 1 modulo 2**n."""
    return add(b, x, [CONST0] * len(x), CONST1)[0]


def decrement(b: GateBuilder, x: Sequence[str]) -> Word:
    """x - 1 modulo 2**n (adds the all-ones word)."""
    return add(b, x, [CONST1] * len(x), CONST0)[0]


def equal(b: GateBuilder, x: Sequence[str], y: Sequence[str]) -> str:
    """One net: 1 when the two same-width words are equal bit for bit (sign does not matter)."""
    diff = [b.xor_(p, q) for p, q in zip(x, y)]
    return b.not_(b.or_(*diff)) if diff else CONST1


def equal_const(b: GateBuilder, x: Sequence[str], value: int) -> str:
    """One net: 1 when x equals the low len(x) bits of ``value`` (two's complement for < 0)."""
    terms = [v if (value >> i) & 1 else b.not_(v) for i, v in enumerate(x)]
    return b.and_(*terms) if terms else CONST1


def compare(b: GateBuilder, op: str, x: Sequence[str], y: Sequence[str], signed: bool) -> str:
    """One net holding ``x op y`` for op in ``==``, ``!=``, ``<``, ``<=``, ``>``, ``>=``.

    Same widths for both operands. With ``signed`` both are read as two's complement numbers
    (the sign bits are flipped, which maps signed order onto unsigned order), else as unsigned.
    """
    if op == "==":
        return equal(b, x, y)
    if op == "!=":
        return b.not_(equal(b, x, y))
    x, y = list(x), list(y)
    if signed and x:
        x = x[:-1] + [b.not_(x[-1])]
        y = y[:-1] + [b.not_(y[-1])]
    if op in (">=", "<"):
        _, ge = subtract(b, x, y)  # carry out of x - y: x >= y
        return ge if op == ">=" else b.not_(ge)
    if op in ("<=", ">"):
        _, le = subtract(b, y, x)  # y >= x
        return le if op == "<=" else b.not_(le)
    raise ValueError(f"compare: unknown operator {op!r}")


def shift_const(x: Sequence[str], n: int, *, left: bool, fill: str = CONST0) -> Word:
    """x shifted by the constant n >= 0, keeping the width: left shifts bring in 0, right shifts
    bring in ``fill`` (CONST0 for a logical shift, the sign bit for an arithmetic one)."""
    w = len(x)
    x = list(x)
    if n >= w:
        return [CONST0] * w if left else [fill] * w
    if left:
        return [CONST0] * n + x[:w - n]
    return x[n:] + [fill] * n


def shift(b: GateBuilder, x: Sequence[str], amount: Sequence[str], *, left: bool,
          fill: str = CONST0) -> Word:
    """x shifted by a variable ``amount`` (an unsigned word of any width) as a barrel shifter;
    the result has the width of x. Shifting by the width of x or more gives all 0 (left) or all
    ``fill`` (right): the same rule as ``shift_const``."""
    w = len(x)
    cur = list(x)
    big = []
    for j, s in enumerate(amount):
        step = 1 << j
        if step >= w:
            big.append(s)
            continue
        shifted = shift_const(cur, step, left=left, fill=fill)
        cur = [b.mux(s, d0, d1) for d0, d1 in zip(cur, shifted)]
    if big:
        over = b.or_(*big)
        cur = [b.mux(over, d, CONST0 if left else fill) for d in cur]
    return cur


def multiply(b: GateBuilder, x: Sequence[str], y: Sequence[str]) -> Word:
    """x * y modulo 2**n with n = len(x) (shift-and-add; y may be of any width, bits of y at or
    above n do not affect the result). The low n bits of a product are the same for signed and
    unsigned operands, so sign does not matter here. Known-zero low bits of x and constant-zero
    bits of y are skipped, so a product of shifted words costs what its live bits cost."""
    n = len(x)
    xs = list(x)
    tz = 0  # known-zero low bits of x: the product has them too
    while tz < n and xs[tz] == CONST0:
        tz += 1
    acc = [CONST0] * n
    for i, yi in enumerate(y):
        if i + tz >= n:
            break
        if yi == CONST0:
            continue
        lo = i + tz
        partial = [b.and_(yi, xj) for xj in xs[tz:n - i]]
        top, _ = add(b, acc[lo:], partial)
        acc[lo:] = top
    return acc
