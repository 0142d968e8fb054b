"""What every internal signal of an adder should be: the reference functions of addition.

A spec is matched, by evaluating it on Python integers, against the form
``S = A + B + c`` where ``A`` and ``B`` are two input ports (each possibly inverted, ``B`` possibly
XORed with a 1-bit mode input, as in an adder/subtractor) and ``c`` is a constant or a 1-bit input
(possibly inverted); each output port must be a slice of ``S`` (``sum`` is bits 0..n-1, ``cout`` is
bit n, ``{cout, sum}`` is bits 0..n), the complement of a slice (the borrow out of ``a - b`` is the
inverted carry out of ``a + ~b + 1``) or the signed overflow flag. Subtraction ``a - b`` is
``a + ~b + 1``, so it gets the same model. Where no such form fits (three operands, a product, a
comparison), ``detect`` returns None and the diagnosis says so.

From the model's operands come the reference functions, as bit-parallel words over a set of
vectors (bit j of every word is vector j), for ``n``-bit operands (common practice, the textbook
names of carry-lookahead and prefix adders):

* ``p_i = A_i ^ B_i`` (propagate), ``g_i = A_i & B_i`` (generate), ``t_i = A_i | B_i``;
* ``c_i`` the carry into bit ``i`` (``c_0`` the carry-in, ``c_n`` the carry out), ``s_i`` the sum,
  ``p_i & c_i`` (the propagated carry of a full adder);
* for every bit range ``i > j``: ``G[i:j]`` and ``P[i:j]`` (group generate and propagate),
  ``G[i:j] | P[i:j]`` (the carry out of the range if its carry-in were 1) and the conditional sums
  ``s_i`` for a carry into bit ``j`` of 0 and of 1 (carry-select and conditional-sum adders);
* the signed overflow ``c_n ^ c_(n-1)``, and the complement of every function above.
"""

from __future__ import annotations

import random
from dataclasses import dataclass, field
from typing import Mapping

from verify.model.netlist import Netlist, bit_name


@dataclass(frozen=True)
class AdderModel:
    """``S = A + B + c`` over ``width`` bits, with ``A``/``B``/``c`` taken from input ports."""

    a: str
    b: str
    width: int
    a_inv: bool = False
    b_inv: bool = False
    b_xor: str | None = None  # a 1-bit input XORed into every bit of B (add/subtract)
    carry: str = "0"  # "0", "1" or a 1-bit input port
    carry_inv: bool = False
    #: output port -> ("slice", lowest bit of S), ("slice_inv", lo) for its complement (a borrow
    #: out), or ("overflow", 0)
    outputs: Mapping[str, tuple[str, int]] = field(default_factory=dict)
    widths: Mapping[str, int] = field(default_factory=dict)  # input port widths

    # ---- describing --------------------------------------------------------------------------
    def describe(self) -> str:
        a = f"~{self.a}" if self.a_inv else self.a
        b = f"~{self.b}" if self.b_inv else self.b
        if self.b_xor:
            b = f"({b} ^ {self.b_xor})"
        terms = [a, b]
        if self.carry == "1":
            terms.append("1")
        elif self.carry != "0":
            terms.append(f"~{self.carry}" if self.carry_inv else self.carry)
        return " + ".join(terms)

    def operand_names(self) -> tuple[str, str]:
        """Labels of the two operands as they enter the adder, e.g. ('a', '~b')."""
        a = f"~{self.a}" if self.a_inv else self.a
        b = f"~{self.b}" if self.b_inv else self.b
        if self.b_xor:
            b = f"{b}^{self.b_xor}"
        return a, b

    # ---- on integers -------------------------------------------------------------------------
    def operands(self, inputs: Mapping[str, int]) -> tuple[int, int, int]:
        """(A, B, c) as integers for one input vector."""
        n = self.width
        mask = (1 << n) - 1
        A = inputs.get(self.a, 0) & ((1 << self.widths.get(self.a, n)) - 1)
        B = inputs.get(self.b, 0) & ((1 << self.widths.get(self.b, n)) - 1)
        if self.a_inv:
            A ^= mask
        if self.b_inv:
            B ^= mask
        if self.b_xor and inputs.get(self.b_xor, 0) & 1:
            B ^= mask
        if self.carry in ("0", "1"):
            c = int(self.carry)
        else:
            c = (inputs.get(self.carry, 0) & 1) ^ int(self.carry_inv)
        return A, B, c

    def carries(self, inputs: Mapping[str, int]) -> list[int]:
        """c_0 .. c_n for one vector: the carry into each bit (c_n is the carry out)."""
        A, B, c = self.operands(inputs)
        out = [c]
        for i in range(self.width):
            x, y = A >> i & 1, B >> i & 1
            c = (x & y) | (c & (x ^ y))
            out.append(c)
        return out

    def outputs_of(self, inputs: Mapping[str, int]) -> dict[str, int]:
        """What the model says each matched output port is, for one vector."""
        A, B, c = self.operands(inputs)
        S = A + B + c
        cs = self.carries(inputs)
        out = {}
        for port, (kind, lo) in self.outputs.items():
            if kind == "overflow":
                out[port] = cs[self.width] ^ cs[self.width - 1]
            else:
                w = self.widths[port]
                out[port] = (S >> lo) & ((1 << w) - 1)
                if kind == "slice_inv":
                    out[port] ^= (1 << w) - 1
        return out


def detect(design: Netlist, spec, *, seed: int = 7, samples: int = 48) -> AdderModel | None:
    """The simplest ``A + B + c`` form that the spec equals on every sampled vector, or None.

    The spec's ``evaluate`` (Python integers) is the judge; corner vectors (0, all ones) and
    seeded random ones are tried.
    """
    ins = [p for p in design.inputs]
    widths = {p.name: p.width for p in (*design.inputs, *design.outputs)}
    multi = [p for p in ins if p.width > 1]
    single = [p for p in ins if p.width == 1]
    if not multi:
        return None
    if len(multi) == 1:  # one wide operand: A + b where b is a 1-bit port only makes sense as c
        return None
    rng = random.Random(seed)
    vectors = []
    for k in range(samples):
        v = {}
        for p in ins:
            top = (1 << p.width) - 1
            if k == 0:
                v[p.name] = 0
            elif k == 1:
                v[p.name] = top
            else:
                v[p.name] = rng.randint(0, top)
        vectors.append(v)
    try:
        expected = [spec.evaluate(v) for v in vectors]
    except Exception:  # a spec that cannot be evaluated on its own is not modeled
        return None
    out_ports = [p for p in design.outputs]
    for pa in multi:
        for pb in multi:
            if pa is pb:
                continue
            n = max(pa.width, pb.width)
            for a_inv, b_inv in ((False, False), (False, True), (True, False), (True, True)):
                for b_xor in [None] + [p.name for p in single]:
                    carries = [("0", False), ("1", False)]
                    carries += [(p.name, inv) for p in single for inv in (False, True)]
                    for carry, carry_inv in carries:
                        if b_xor is not None and (b_inv or carry == b_xor and carry_inv):
                            continue
                        model = AdderModel(pa.name, pb.name, n, a_inv, b_inv, b_xor, carry,
                                           carry_inv, {}, widths)
                        matched = _match_outputs(model, out_ports, vectors, expected)
                        if matched is not None:
                            return AdderModel(pa.name, pb.name, n, a_inv, b_inv, b_xor, carry,
                                              carry_inv, matched, widths)
    return None


def _match_outputs(model: AdderModel, outs, vectors, expected) -> dict | None:
    """Each output port as a slice of S or the overflow flag; None unless every port fits."""
    n = model.width
    sums, carries = [], []
    for v in vectors:
        A, B, c = model.operands(v)
        sums.append(A + B + c)
        carries.append(model.carries(v))
    matched: dict[str, tuple[str, int]] = {}
    for p in outs:
        mask = (1 << p.width) - 1
        found = None
        for lo in range(0, n + 1):
            if lo + p.width > n + 1:
                break
            if all((s >> lo) & mask == e[p.name] for s, e in zip(sums, expected)):
                found = ("slice", lo)
                break
        if found is None:  # the complement of a slice: a borrow out is the inverted carry out
            for lo in range(0, n + 1):
                if lo + p.width > n + 1:
                    break
                if all(((s >> lo) & mask) ^ mask == e[p.name] for s, e in zip(sums, expected)):
                    found = ("slice_inv", lo)
                    break
        if found is None and p.width == 1 and n > 1:
            if all(cs[n] ^ cs[n - 1] == e[p.name] for cs, e in zip(carries, expected)):
                found = ("overflow", 0)
        if found is None:
            return None
        matched[p.name] = found
    # the model must say something about the sum: at least one port holding bit 0 of S
    if not any(k == "slice" and lo == 0 for k, lo in matched.values()):
        return None
    return matched


#: widest operands for which the AND terms of prefix nodes (about n^3/6 of them) are tabulated
TERM_LIMIT = 64


# ---- reference functions as words -------------------------------------------------------------

@dataclass
class Table:
    """Reference functions as words over a vector set: word -> names, and name -> word."""

    mask: int
    by_word: dict[int, list[str]] = field(default_factory=dict)
    words: dict[str, int] = field(default_factory=dict)
    meaning: dict[str, str] = field(default_factory=dict)

    def add(self, name: str, word: int, meaning: str) -> None:
        if word == 0 or word == self.mask:
            return  # constant over these vectors: its signature identifies nothing
        self.words[name] = word
        self.meaning[name] = meaning
        self.by_word.setdefault(word, []).append(name)
        comp = word ^ self.mask
        self.by_word.setdefault(comp, []).append("~" + name)

    def matches(self, word: int) -> list[str]:
        return self.by_word.get(word, [])

    def matches_on(self, word: int, care: int, near: int | None = None, limit: int = 3,
                   scan: int = 24) -> list[str]:
        """Names of functions equal to ``word`` on the vectors set in ``care``.

        With ``near`` (the net's actual word), the first ``scan`` matches are ordered by how
        many vectors they differ from it in: the function the gate comes closest to first.
        """
        found: list[tuple[str, int]] = []
        w = word & care
        for name, f in self.words.items():
            if (f & care) == w:
                found.append((name, f))
            elif ((f ^ self.mask) & care) == w:
                found.append(("~" + name, f ^ self.mask))
            if len(found) >= (scan if near is not None else limit):
                break
        if near is not None:
            found.sort(key=lambda nf: bin(nf[1] ^ near).count("1"))
        return [n for n, _ in found[:limit]]

    def explain(self, name: str) -> str:
        base = name.lstrip("~")
        text = self.meaning.get(base, base)
        return f"not ({text})" if name.startswith("~") else text


def table(model: AdderModel, values: Mapping[str, int], mask: int) -> tuple[Table, dict]:
    """The reference functions over the vectors whose input words are in ``values``.

    Returns (table, words) where words holds the lists ``p``, ``g``, ``c``, ``s`` for later use.
    """
    n = model.width
    M = mask

    def port_bit(port: str, i: int) -> int:
        w = model.widths.get(port, n)
        if i >= w:
            return 0
        return values[bit_name(port, i, w)]

    A, B = [], []
    xor_word = values[model.b_xor] if model.b_xor else 0
    for i in range(n):
        x = port_bit(model.a, i) ^ (M if model.a_inv else 0)
        y = port_bit(model.b, i) ^ (M if model.b_inv else 0) ^ xor_word
        A.append(x)
        B.append(y)
    if model.carry == "0":
        c0 = 0
    elif model.carry == "1":
        c0 = M
    else:
        c0 = values[model.carry] ^ (M if model.carry_inv else 0)
    an, bn = model.operand_names()
    t = Table(M)
    p = [A[i] ^ B[i] for i in range(n)]
    g = [A[i] & B[i] for i in range(n)]
    c = [c0]
    for i in range(n):
        c.append(g[i] | (p[i] & c[i]))
    s = [p[i] ^ c[i] for i in range(n)]
    for i in range(n):
        t.add(f"p{i}", p[i], f"propagate of bit {i}: {an}[{i}] ^ {bn}[{i}]")
        t.add(f"g{i}", g[i], f"generate of bit {i}: {an}[{i}] & {bn}[{i}]")
        t.add(f"t{i}", A[i] | B[i], f"{an}[{i}] | {bn}[{i}]")
        if model.a_inv or model.b_inv or model.b_xor:
            t.add(f"A{i}", A[i], f"operand bit {an}[{i}]")
            t.add(f"B{i}", B[i], f"operand bit {bn}[{i}]")
    for i in range(n + 1):
        what = ("the carry-in" if i == 0 else "the carry out" if i == n
                else f"the carry into bit {i}")
        t.add(f"c{i}", c[i], what)
    for i in range(n):
        t.add(f"s{i}", s[i], f"sum bit {i}")
        t.add(f"pc{i}", p[i] & c[i], f"p{i} & c{i}, the carry bit {i} passes on")
    if n > 1:
        t.add("v", c[n] ^ c[n - 1], "signed overflow: c_n ^ c_(n-1)")
    groups: dict[tuple[int, int], tuple[int, int]] = {}
    for j in range(n):
        G, P = g[j], p[j]
        for i in range(j + 1, n):
            # conditional sums of bit i for a carry into bit j of 0 / 1
            t.add(f"s{i}|c{j}=0", p[i] ^ G, f"sum bit {i} if the carry into bit {j} were 0")
            t.add(f"s{i}|c{j}=1", p[i] ^ (G | P), f"sum bit {i} if the carry into bit {j} were 1")
            G = g[i] | (p[i] & G)
            P = p[i] & P
            t.add(f"G[{i}:{j}]", G, f"group generate of bits {i}..{j}")
            t.add(f"P[{i}:{j}]", P, f"group propagate of bits {i}..{j}")
            t.add(f"G1[{i}:{j}]", G | P,
                  f"carry out of bits {i}..{j} if the carry into bit {j} were 1")
            t.add(f"P[{i}:{j}]&c{j}", P & c[j], f"the carry-in of bit {j} passed through bits "
                                                 f"{i}..{j}")
            groups[(i, j)] = (G, P)
    if n <= TERM_LIMIT:
        # the AND term of a prefix or lookahead node: P[i:k] & G[k-1:j]
        for j in range(n):
            for k in range(j + 1, n):
                Gl = groups[(k - 1, j)][0] if k - 1 > j else g[j]
                for i in range(k, n):
                    Pu = groups[(i, k)][1] if i > k else p[k]
                    t.add(f"P[{i}:{k}]&G[{k - 1}:{j}]", Pu & Gl,
                          f"group propagate of bits {i}..{k} AND group generate of bits "
                          f"{k - 1}..{j}")
    return t, {"p": p, "g": g, "c": c, "s": s, "A": A, "B": B}
