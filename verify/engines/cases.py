"""Splitting a check into cases over one-bit control inputs, and spotting the addition in a spec.

A one-bit input that selects a mode (subtract, carry-in, enable) makes one function out of two.
``cases`` lists the assignments of such inputs to prove separately: in each case the input is a
constant, so an adder-subtractor ``s = sub ? a - b : a + b`` becomes two plain additions
(``a + b`` and ``a + ~b + 1``). The cases cover every value of the split inputs, so proving each
case proves the whole.

``find_addition`` looks for operands X, Y (two input ports, each possibly inverted) and a
carry-in (a constant or a one-bit input, possibly inverted) such that the spec's outputs hold the
bits of X + Y + cin, by evaluating the spec on Python integers. It is only a vocabulary for the
sweeping engine's cut points: nothing is taken as proven from it.
"""

from __future__ import annotations

import random
from dataclasses import dataclass
from itertools import product
from typing import Mapping

#: at most this many one-bit inputs are split (2^3 = 8 cases)
MAX_SPLIT = 3


@dataclass(frozen=True)
class Addition:
    width: int
    x: tuple[str, bool]  # (input port, inverted)
    y: tuple[str, bool]
    cin: tuple[str, bool] | int  # (one-bit input port, inverted) or a constant 0/1
    matched: int  # how many bits of the sum (0..width) the spec's outputs hold

    def describe(self) -> str:
        def t(o):
            return ("~" if o[1] else "") + o[0]
        c = str(self.cin) if isinstance(self.cin, int) else t(self.cin)
        return f"{t(self.x)} + {t(self.y)} + {c}"


def _sample(design, fixed: Mapping[str, int], count: int, seed: int) -> list[dict[str, int]]:
    rng = random.Random(seed)
    out = []
    for k in range(count):
        v = {}
        for p in design.inputs:
            if p.name in fixed:
                v[p.name] = fixed[p.name]
            elif k % 4 == 1 and p.width > 1:  # long carry chains: the other operand near ~this
                v[p.name] = rng.getrandbits(p.width) | 1
            else:
                v[p.name] = rng.getrandbits(p.width)
        if k % 4 == 1:
            wide = [p for p in design.inputs if p.width > 1 and p.name not in fixed]
            if len(wide) >= 2:
                a, b = wide[0], wide[1]
                v[b.name] = (~v[a.name] ^ (1 << rng.randrange(a.width))) & ((1 << b.width) - 1)
        out.append(v)
    return out


def find_addition(design, spec, fixed: Mapping[str, int], seed: int = 1) -> Addition | None:
    """The operands and carry-in whose sum best explains the spec's outputs, or None."""
    wide = [p for p in design.inputs if p.width > 1 and p.name not in fixed]
    ones = [p for p in design.inputs if p.width == 1 and p.name not in fixed]
    vectors = _sample(design, fixed, 48, seed)
    values = [spec.evaluate(v) for v in vectors]
    # one word per output bit: bit v of the word is that output bit's value in vector v
    held_words = set()
    for p in design.outputs:
        held_words.update(_columns([val[p.name] for val in values], p.width))
    best: Addition | None = None
    cins: list = [0, 1] + [(p.name, inv) for p in ones for inv in (False, True)]
    for i, xa in enumerate(wide):
        for xb in wide[i + 1:]:
            if xb.width != xa.width:
                continue
            n = xa.width
            mask = (1 << n) - 1
            for ia, ib, c in product((False, True), (False, True), cins):
                sums = []
                for v in vectors:
                    cv = c if isinstance(c, int) else (v[c[0]] ^ int(c[1]))
                    sums.append((v[xa.name] ^ (mask if ia else 0))
                                + (v[xb.name] ^ (mask if ib else 0)) + cv)
                score = sum(w in held_words for w in _columns(sums, n + 1))
                if score >= n and (best is None or score > best.matched):
                    best = Addition(n, (xa.name, ia), (xb.name, ib), c, score)
    return best


def _columns(numbers: list[int], width: int) -> list[int]:
    """Bit-slice: word k has bit v set when bit k of numbers[v] is set (k < width)."""
    rows = [format(x & ((1 << width) - 1), f"0{width}b") for x in numbers]
    # rows are MSB first; column k from the right is bit k; vector v is bit v of the word
    return [int("".join(col)[::-1], 2) for col in zip(*rows)][::-1]


def control_inputs(design, spec, seed: int = 1) -> tuple[list[str], Addition | None]:
    """One-bit inputs to split into cases, and the addition found with none split: no split when
    the spec is a plain sum with these inputs free (a carry-in then is part of the sum), else
    every one-bit input (up to ``MAX_SPLIT``)."""
    ones = [p.name for p in design.inputs if p.width == 1]
    whole = find_addition(design, spec, {}, seed)
    if not ones or len(ones) > MAX_SPLIT:
        return [], whole
    outputs = sum(p.width for p in design.outputs)
    if whole is not None and whole.matched >= min(outputs, whole.width + 1):
        return [], whole
    return ones, whole


def cases(names: list[str]) -> list[dict[str, int]]:
    """Every assignment of the named one-bit inputs (one empty case when there are none)."""
    return [dict(zip(names, bits)) for bits in product((0, 1), repeat=len(names))]
