"""Reference adders by their published names, generated as gate netlists.

``generate(arch, width, cin=True, cout=True, overflow=False, **params)`` returns a validated
``Netlist`` with input ports ``a``, ``b`` (``width`` bits each) and ``cin`` (1 bit, unless
``cin=False``) and output ports ``sum`` (``width`` bits), ``cout`` (unless ``cout=False``) and
``v`` (signed overflow, only with ``overflow=True``). Any width from 1 up works for every
architecture; ``ARCHITECTURES`` lists the names, their parameters and the defaults.

Structure is the published one: the builder runs with folding and sharing off, so each gate here
is a gate of the textbook circuit. Nets carry the trade's names: ``p3``/``g3`` (bit propagate
and generate, ``p = a ^ b``, ``g = a & b``), ``c4`` (carry into bit 4; ``c{width}`` is the carry
out), ``G_7_4``/``P_7_4`` (group generate/propagate of bits 7..4).

Prefix adders (``serial-prefix``, ``sklansky``, ``kogge-stone``, ``brent-kung``, ``han-carlson``,
``ladner-fischer``): every gate of a prefix node has the source ``"prefix level L node G[i:j]"``
where ``L`` is the row of the published drawing the node sits in (rows without a node are left
out) and ``[i:j]`` is the span it produces. ``verify.library.shape`` reads these sources. Counting
convention: the carry-in is folded into bit 0 before the network (``g0_cin = g0 | p0 & cin``,
source ``"carry-in folded into g0"``, not a prefix node), so the network always has ``width``
positions and ``G_i_0`` is the carry into bit ``i+1`` (with the carry-in, where there is one).
Node counts then match the published tables for the ``width - 1`` nontrivial prefixes, the last
one being the carry out; a design built with ``cout=False`` has fewer nodes, since the nodes
that only lead to the carry out (the top column) are pruned. Gray cells (spans reaching bit 0) have no group-propagate gate.
"""

from __future__ import annotations

from contextlib import contextmanager
from dataclasses import dataclass
from math import ceil, log2
from typing import Any, Callable, Iterator, Sequence

from verify.model.builder import GateBuilder
from verify.errors import InputError
from verify.model.netlist import Netlist, Port, bit_name

PREFIX_SOURCE = "prefix level {level} node G[{hi}:{lo}]"
CIN_FOLD_SOURCE = "carry-in folded into g0"


@dataclass(frozen=True)
class Param:
    name: str
    default: Any
    help: str


@dataclass(frozen=True)
class Architecture:
    name: str
    family: str  # ripple | lookahead | skip | select | conditional | prefix
    summary: str
    params: tuple[Param, ...]
    build: Callable[..., "_Result"]


@dataclass
class _Result:
    sums: list[str]
    carry_out: str  # carry out of the top bit
    carry_top_in: str | None  # carry into the top bit (None means constant 0), for overflow


# ---- shared pieces -----------------------------------------------------------------------------

class _Adder:
    """The ports of the adder being built and the bit-level propagate/generate nets."""

    def __init__(self, width: int, cin: bool):
        self.n = width
        self.b = GateBuilder("term", fold=False, share=False)
        self.a = [bit_name("a", i, width) for i in range(width)]
        self.bb = [bit_name("b", i, width) for i in range(width)]
        self.cin: str | None = "cin" if cin else None
        self._p: dict[int, str] = {}
        self._g: dict[int, str] = {}

    @contextmanager
    def at(self, source: str) -> Iterator[None]:
        old, self.b.source = self.b.source, source
        try:
            yield
        finally:
            self.b.source = old

    def p(self, i: int) -> str:
        if i not in self._p:
            with self.at(f"bit {i} propagate"):
                self._p[i] = self.b.gate("xor", self.a[i], self.bb[i], out=f"p{i}")
        return self._p[i]

    def g(self, i: int) -> str:
        if i not in self._g:
            with self.at(f"bit {i} generate"):
                self._g[i] = self.b.gate("and", self.a[i], self.bb[i], out=f"g{i}")
        return self._g[i]

    def sum_bit(self, i: int, carry: str | None) -> str:
        """s_i = p_i ^ c_i (just p_i when the carry is the constant 0)."""
        if carry is None:
            return self.p(i)
        with self.at(f"sum bit {i}"):
            return self.b.gate("xor", self.p(i), carry, out=f"s{i}")

    def full_adder(self, i: int, carry: str | None, cout_name: str) -> tuple[str, str]:
        """Full adder from two half adders and an OR: (sum, carry out). A half adder if no carry."""
        if carry is None:
            return self.p(i), self.g(i)
        s = self.sum_bit(i, carry)
        with self.at(f"bit {i} full adder"):
            t = self.b.gate("and", self.p(i), carry, out=f"t{i}")
            c = self.b.gate("or", self.g(i), t, out=cout_name)
        return s, c


def _sop_carry(ad: _Adder, gs: Sequence[str], ps: Sequence[str], cin: str | None,
               out: str) -> str:
    """Two-level lookahead: g_k | p_k g_{k-1} | ... | p_k..p_0 cin over (g, p) lists LSB first."""
    terms: list[str] = []
    k = len(gs)
    for top in range(k - 1, -1, -1):
        chain = [ps[m] for m in range(k - 1, top, -1)] + [gs[top]]
        terms.append(chain[0] if len(chain) == 1 else ad.b.and_(*chain))
    if cin is not None:
        terms.append(ad.b.and_(*[ps[m] for m in range(k - 1, -1, -1)], cin))
    if len(terms) == 1:  # the carry is that net itself: no gate
        return terms[0]
    return ad.b.gate("or", *terms, out=out)


def _parse_sizes(value: Any, width: int, arch: str, keywords: dict[str, Callable[[int], list[int]]]
                 ) -> list[int] | None:
    if value is None:
        return None
    if isinstance(value, str):
        key = value.strip().lower()
        if key in keywords:
            return keywords[key](width)
        try:
            value = [int(x) for x in key.replace(" ", "").split(",") if x]
        except ValueError:
            known = " or ".join(f"'{k}'" for k in keywords)
            raise InputError(f"{arch}: sizes must be a comma-separated list of block sizes "
                             f"or {known}, got '{value}'") from None
    if not isinstance(value, (list, tuple)) or not value or not all(
            isinstance(x, int) and not isinstance(x, bool) for x in value):
        raise InputError(f"{arch}: sizes must be a list of whole numbers, got {value!r}")
    if any(x < 1 for x in value):
        raise InputError(f"{arch}: every block size must be >= 1, got {list(value)}")
    if sum(value) != width:
        raise InputError(f"{arch}: block sizes {list(value)} add up to {sum(value)}, "
                         f"not the width {width}")
    return list(value)


def _fixed_sizes(width: int, block: int) -> list[int]:
    sizes = [block] * (width // block)
    if width % block:
        sizes.append(width % block)
    return sizes


def _variable_sizes(width: int) -> list[int]:
    """Small blocks at both ends, larger in the middle: 1, 2, 3, ..., 3, 2, 1 filled to width."""
    front: list[int] = []
    back: list[int] = []
    left, s = width, 1
    while left > 0:
        take = min(s, left)
        front.append(take)
        left -= take
        if left > 0:
            take = min(s, left)
            back.append(take)
            left -= take
        s += 1
    return front + back[::-1]


def _growing_sizes(width: int, block: int) -> list[int]:
    """block, block, block+1, block+2, ... with the last block cut to fit."""
    sizes: list[int] = []
    left, s = width, block
    first = True
    while left > 0:
        take = min(s, left)
        sizes.append(take)
        left -= take
        if first:
            first = False
        else:
            s += 1
    return sizes


def _blocks(sizes: list[int]) -> list[tuple[int, int]]:
    out, lo = [], 0
    for s in sizes:
        out.append((lo, lo + s - 1))
        lo += s
    return out


# ---- ripple ------------------------------------------------------------------------------------

def _ripple(ad: _Adder) -> _Result:
    c, sums = ad.cin, []
    carry_top_in = None
    for i in range(ad.n):
        carry_top_in = c
        s, c = ad.full_adder(i, c, f"c{i + 1}")
        sums.append(s)
    return _Result(sums, c, carry_top_in)


def _ripple_maj(ad: _Adder) -> _Result:
    c, sums = ad.cin, []
    carry_top_in = None
    for i in range(ad.n):
        carry_top_in = c
        if c is None:
            sums.append(ad.p(i))
            with ad.at(f"bit {i} half adder"):
                c = ad.b.gate("and", ad.a[i], ad.bb[i], out=f"c{i + 1}")
            continue
        sums.append(ad.sum_bit(i, c))
        with ad.at(f"bit {i} majority carry"):
            c = ad.b.gate("maj", ad.a[i], ad.bb[i], c, out=f"c{i + 1}")
    return _Result(sums, c, carry_top_in)


# ---- carry-lookahead ---------------------------------------------------------------------------

@dataclass
class _Group:
    lo: int
    hi: int
    G: str
    P: str
    children: list["_Group"]


def _carry_lookahead(ad: _Adder, block: int = 4, levels: Any = None) -> _Result:
    n = ad.n
    if levels is None:
        levels = max(1, ceil(round(log2(n) / log2(block), 9))) if n > 1 else 1
    nodes = [_Group(i, i, ad.g(i), ad.p(i), []) for i in range(n)]
    for level in range(1, levels + 1):
        if len(nodes) == 1:
            break
        grouped: list[_Group] = []
        for k in range(0, len(nodes), block):
            kids = nodes[k:k + block]
            if len(kids) == 1:
                grouped.append(kids[0])
                continue
            lo, hi = kids[0].lo, kids[-1].hi
            with ad.at(f"lookahead level {level} block [{hi}:{lo}] group generate/propagate"):
                G = _sop_carry(ad, [c.G for c in kids], [c.P for c in kids], None, f"G_{hi}_{lo}")
                P = ad.b.gate("and", *[c.P for c in kids], out=f"P_{hi}_{lo}")
            grouped.append(_Group(lo, hi, G, P, kids))
        nodes = grouped
    carry: dict[int, str | None] = {0: ad.cin}

    def distribute(node: _Group, c: str | None, level: int) -> None:
        # carries into the children of this lookahead unit, each straight from the unit's carry-in
        kids = node.children
        for j in range(1, len(kids)):
            pos = kids[j].lo
            with ad.at(f"lookahead level {level} block [{node.hi}:{node.lo}] carry c{pos}"):
                carry[pos] = _sop_carry(ad, [k.G for k in kids[:j]], [k.P for k in kids[:j]], c,
                                        f"c{pos}")
        for kid in kids:
            if kid.children:
                distribute(kid, carry[kid.lo], level - 1)

    def height(node: _Group) -> int:
        return 0 if not node.children else 1 + height(node.children[0])

    for j, node in enumerate(nodes):
        c = carry[node.lo]
        if node.children:
            distribute(node, c, height(node))
        nxt = node.hi + 1
        with ad.at(f"carry c{nxt} out of block [{node.hi}:{node.lo}]"):
            carry[nxt] = _sop_carry(ad, [node.G], [node.P], c, f"c{nxt}")
    sums = [ad.sum_bit(i, carry[i]) for i in range(n)]
    return _Result(sums, carry[n], carry[n - 1])


# ---- carry-skip --------------------------------------------------------------------------------

def _carry_skip(ad: _Adder, block: int = 4, sizes: Any = None) -> _Result:
    n = ad.n
    sizes_ = _parse_sizes(sizes, n, "carry-skip", {"variable": _variable_sizes}) \
        or _fixed_sizes(n, block)
    c, sums = ad.cin, []
    carry_top_in = None
    for lo, hi in _blocks(sizes_):
        block_in = c
        for i in range(lo, hi + 1):
            carry_top_in = c
            name = f"c{i + 1}" if i < hi else f"r{i + 1}"
            s, c = ad.full_adder(i, c, name)
            sums.append(s)
        if block_in is not None:
            with ad.at(f"carry-skip block [{hi}:{lo}] skip"):
                ps = [ad.p(i) for i in range(lo, hi + 1)]
                P = ps[0] if len(ps) == 1 else ad.b.gate("and", *ps, out=f"P_{hi}_{lo}")
                c = ad.b.gate("mux", P, c, block_in, out=f"c{hi + 1}")
    return _Result(sums, c, carry_top_in)


# ---- carry-select ------------------------------------------------------------------------------

def _carry_select(ad: _Adder, block: int = 4, sizes: Any = None) -> _Result:
    n = ad.n
    sizes_ = _parse_sizes(sizes, n, "carry-select",
                          {"growing": lambda w: _growing_sizes(w, block)}) or _fixed_sizes(n, block)
    b = ad.b
    c, sums = ad.cin, []
    carry_top_in = None
    for k, (lo, hi) in enumerate(_blocks(sizes_)):
        if k == 0:
            for i in range(lo, hi + 1):
                carry_top_in = c
                s, c = ad.full_adder(i, c, f"c{i + 1}")
                sums.append(s)
            continue
        chains: dict[int, tuple[list[str], list[str]]] = {}
        for assume in (0, 1):
            with ad.at(f"carry-select block [{hi}:{lo}] adder for carry-in {assume}"):
                s_list, c_list = [], []
                if assume == 0:
                    s_list.append(ad.p(lo))
                    cc = ad.g(lo)
                else:
                    s_list.append(b.gate("not", ad.p(lo), out=f"s{lo}_if1"))
                    cc = b.gate("or", ad.a[lo], ad.bb[lo], out=f"c{lo + 1}_if1")
                c_list.append(cc)
                for i in range(lo + 1, hi + 1):
                    s_list.append(b.gate("xor", ad.p(i), cc, out=f"s{i}_if{assume}"))
                    t = b.gate("and", ad.p(i), cc, out=f"t{i}_if{assume}")
                    cc = b.gate("or", ad.g(i), t, out=f"c{i + 1}_if{assume}")
                    c_list.append(cc)
            chains[assume] = (s_list, c_list)
        (s0, c0), (s1, c1) = chains[0], chains[1]
        with ad.at(f"carry-select block [{hi}:{lo}] multiplexers"):
            if c is None:  # only possible without a carry-in and a first block: never reached
                raise AssertionError("carry-select block without a block carry")
            for j, i in enumerate(range(lo, hi + 1)):
                sums.append(b.gate("mux", c, s0[j], s1[j], out=f"s{i}"))
            if hi == n - 1:
                # the carry into the top bit, for the overflow flag, picked the same way
                carry_top_in = c if hi == lo else b.gate("mux", c, c0[-2], c1[-2], out=f"c{hi}")
            c = b.gate("mux", c, c0[-1], c1[-1], out=f"c{hi + 1}")
    return _Result(sums, c, carry_top_in)


# ---- conditional-sum ---------------------------------------------------------------------------

@dataclass
class _Cond:
    lo: int
    hi: int
    # known: (sums, carry) for the actual carry-in; otherwise versions[assume] = (sums, carry)
    known: tuple[list[str], str] | None
    versions: dict[int, tuple[list[str], str]] | None


def _conditional_sum(ad: _Adder) -> _Result:
    b, n = ad.b, ad.n

    def leaf(i: int) -> _Cond:
        if i == 0:
            with ad.at("bit 0 with the carry-in"):
                s, c = ad.full_adder(0, ad.cin, "c1")
            return _Cond(0, 0, ([s], c), None)
        with ad.at(f"conditional-sum level 0 bit {i}"):
            s1 = b.gate("xnor", ad.a[i], ad.bb[i], out=f"s{i}_if1")
            c1 = b.gate("or", ad.a[i], ad.bb[i], out=f"c{i + 1}_if1")
        return _Cond(i, i, None, {0: ([ad.p(i)], ad.g(i)), 1: ([s1], c1)})

    def build(lo: int, hi: int) -> tuple[_Cond, int]:
        if lo == hi:
            return leaf(lo), 0
        size = hi - lo + 1
        half = 1 << (ceil(log2(size)) - 1)
        low, l1 = build(lo, lo + half - 1)
        up, l2 = build(lo + half, hi)
        level = max(l1, l2) + 1
        assert up.versions is not None
        tag = f"conditional-sum level {level} block [{hi}:{lo}]"

        def pick(sel: str, suffix: str) -> tuple[list[str], str]:
            sums = [b.gate("mux", sel, up.versions[0][0][j], up.versions[1][0][j],
                           out=f"s{up.lo + j}_{lo}{suffix}") for j in range(len(up.versions[0][0]))]
            carry = b.gate("mux", sel, up.versions[0][1], up.versions[1][1],
                           out=f"c{hi + 1}_{lo}{suffix}")
            return sums, carry

        with ad.at(tag):
            if low.known is not None:
                sums, carry = pick(low.known[1], "")
                return _Cond(lo, hi, (low.known[0] + sums, carry), None), level
            assert low.versions is not None
            versions = {}
            for assume in (0, 1):
                sums, carry = pick(low.versions[assume][1], f"_if{assume}")
                versions[assume] = (low.versions[assume][0] + sums, carry)
            return _Cond(lo, hi, None, versions), level

    top, _ = build(0, n - 1)
    assert top.known is not None
    sums, carry = top.known
    carry_top_in: str | None
    if n == 1:
        carry_top_in = ad.cin
    else:
        with ad.at(f"carry into bit {n - 1} recovered from the sum, for the overflow flag"):
            carry_top_in = b.gate("xor", ad.p(n - 1), sums[-1], out=f"c{n - 1}_from_sum")
    return _Result(sums, carry, carry_top_in)


# ---- parallel prefix ---------------------------------------------------------------------------

Schedule = list[list[tuple[int, int]]]  # rows of (position, predecessor position)


def _serial_schedule(n: int) -> Schedule:
    return [[(i, i - 1)] for i in range(1, n)]


def _sklansky_schedule(n: int) -> Schedule:
    rows = []
    for l in range(ceil(log2(n)) if n > 1 else 0):
        rows.append([(i, ((i >> l) << l) - 1) for i in range(n) if (i >> l) & 1])
    return rows


def _kogge_stone_schedule(n: int) -> Schedule:
    rows, d = [], 1
    while d < n:
        rows.append([(i, i - d) for i in range(d, n)])
        d *= 2
    return rows


def _brent_kung_schedule(n: int) -> Schedule:
    levels = ceil(log2(n)) if n > 1 else 0
    rows = []
    for l in range(levels):  # up-sweep: groups of 2, 4, 8, ... ending at 2^k - 1
        d = 1 << l
        rows.append([(i, i - d) for i in range(n) if (i + 1) % (2 * d) == 0])
    for l in range(levels - 2, -1, -1):  # down-sweep fills the positions in between
        d = 1 << l
        rows.append([(i, i - d) for i in range(n) if (i + 1) % (2 * d) == d and i + 1 > d])
    return rows


def _odd_then_even(n: int, inner: Callable[[int], Schedule]) -> Schedule:
    """Pairs (odd, even) first, a prefix network over the odd positions, then the even ones."""
    rows = [[(i, i - 1) for i in range(1, n, 2)]]
    m = n // 2  # odd positions 1, 3, 5, ... as positions 0, 1, 2, ... of the inner network
    for row in inner(m):
        rows.append([(2 * k + 1, 2 * j + 1) for k, j in row])
    rows.append([(i, i - 1) for i in range(2, n, 2)])
    return rows


def _han_carlson_schedule(n: int) -> Schedule:
    return _odd_then_even(n, _kogge_stone_schedule)


def _ladner_fischer_schedule(n: int) -> Schedule:
    return _odd_then_even(n, _sklansky_schedule)


SCHEDULES: dict[str, Callable[[int], Schedule]] = {
    "serial-prefix": _serial_schedule,
    "sklansky": _sklansky_schedule,
    "kogge-stone": _kogge_stone_schedule,
    "brent-kung": _brent_kung_schedule,
    "han-carlson": _han_carlson_schedule,
    "ladner-fischer": _ladner_fischer_schedule,
}


def _prefix(schedule: Callable[[int], Schedule]) -> Callable[[_Adder], _Result]:
    def build(ad: _Adder) -> _Result:
        b, n = ad.b, ad.n
        # position -> (group generate net, group propagate net or None, low end of the span)
        cur: dict[int, tuple[str, str | None, int]] = {}
        for i in range(n):
            cur[i] = (ad.g(i), ad.p(i) if i > 0 else None, i)
        if ad.cin is not None:
            with ad.at(CIN_FOLD_SOURCE):
                t = b.gate("and", ad.p(0), ad.cin, out="t0_cin")
                cur[0] = (b.gate("or", ad.g(0), t, out="g0_cin"), None, 0)
        level = 0
        for row in schedule(n):
            if not row:
                continue
            level += 1
            new = dict(cur)
            for i, j in row:
                gi, pi, lo_i = cur[i]
                gj, pj, lo_j = cur[j]
                if j != lo_i - 1:  # pragma: no cover - the schedules above never do this
                    raise AssertionError(f"prefix node {i}<-{j} is not adjacent to span [{i}:{lo_i}]")
                assert pi is not None
                with ad.at(PREFIX_SOURCE.format(level=level, hi=i, lo=lo_j)):
                    t = b.gate("and", pi, gj, out=f"G_{i}_{lo_j}_t")
                    G = b.gate("or", gi, t, out=f"G_{i}_{lo_j}")
                    P = None
                    if lo_j > 0:  # black cell; a gray cell (span down to bit 0) needs no P
                        assert pj is not None
                        P = b.gate("and", pi, pj, out=f"P_{i}_{lo_j}")
                new[i] = (G, P, lo_j)
            cur = new
        for i in range(n):  # pragma: no branch - a check on the schedules, never fails
            if cur[i][2] != 0:
                raise AssertionError(f"prefix network leaves position {i} at span [{i}:{cur[i][2]}]")
        carries: list[str | None] = [ad.cin] + [cur[i][0] for i in range(n)]
        sums = [ad.sum_bit(i, carries[i]) for i in range(n)]
        return _Result(sums, carries[n], carries[n - 1])
    return build


# ---- the table ---------------------------------------------------------------------------------

_BLOCK = Param("block", 4, "block size")

ARCHITECTURES: dict[str, Architecture] = {
    a.name: a for a in [
        Architecture("ripple", "ripple",
                     "ripple-carry; each full adder is two half adders and an OR", (), _ripple),
        Architecture("ripple-maj", "ripple",
                     "ripple-carry; sum by XOR, carry by a majority gate", (), _ripple_maj),
        Architecture("carry-lookahead", "lookahead",
                     "lookahead units of `block` bits (two-level AND-OR), `levels` deep; "
                     "top-level blocks ripple",
                     (Param("block", 4, "bits (or groups) per lookahead unit, >= 2"),
                      Param("levels", None, "lookahead levels, >= 1 (default: enough for one "
                                            "unit at the top)")),
                     _carry_lookahead),
        Architecture("carry-skip", "skip",
                     "ripple blocks; a multiplexer skips the block carry when all its bits propagate",
                     (_BLOCK, Param("sizes", None, "block sizes LSB first, e.g. 2,4,4,2, or "
                                                   "'variable' (1,2,3,...,3,2,1)")),
                     _carry_skip),
        Architecture("carry-select", "select",
                     "first block ripples; each further block adds twice (carry-in 0 and 1) and "
                     "multiplexers pick by the block carry",
                     (_BLOCK, Param("sizes", None, "block sizes LSB first, e.g. 4,4,5,6, or "
                                                   "'growing' (block, block, block+1, ...)")),
                     _carry_select),
        Architecture("conditional-sum", "conditional",
                     "sums and carries for both carry-ins, merged pairwise by multiplexers",
                     (), _conditional_sum),
        Architecture("serial-prefix", "prefix", "prefix network, one node per row", (),
                     _prefix(_serial_schedule)),
        Architecture("sklansky", "prefix", "divide-and-conquer prefix network (high fanout)", (),
                     _prefix(_sklansky_schedule)),
        Architecture("kogge-stone", "prefix", "prefix network with fanout 2, log2 n rows", (),
                     _prefix(_kogge_stone_schedule)),
        Architecture("brent-kung", "prefix", "up-sweep and down-sweep prefix tree, fewest nodes", (),
                     _prefix(_brent_kung_schedule)),
        Architecture("han-carlson", "prefix",
                     "Kogge-Stone over the odd positions, one extra row for the even ones", (),
                     _prefix(_han_carlson_schedule)),
        Architecture("ladner-fischer", "prefix",
                     "Sklansky over the odd positions, one extra row for the even ones", (),
                     _prefix(_ladner_fischer_schedule)),
    ]
}


def _check_int(arch: str, name: str, value: Any, least: int) -> int:
    if isinstance(value, str) and value.strip().lstrip("-").isdigit():
        value = int(value)
    if isinstance(value, bool) or not isinstance(value, int) or value < least:
        raise InputError(f"{arch}: {name} must be a whole number >= {least}, got {value!r}")
    return value


def generate(arch: str, width: int, *, cin: bool = True, cout: bool = True,
             overflow: bool = False, name: str | None = None, **arch_params: Any) -> Netlist:
    """A reference adder of the named architecture as a validated Netlist (see the module doc)."""
    key = arch.strip().lower().replace("_", "-") if isinstance(arch, str) else arch
    if key not in ARCHITECTURES:
        raise InputError(f"unknown architecture {arch!r} (known: {', '.join(ARCHITECTURES)})")
    spec = ARCHITECTURES[key]
    width = _check_int(key, "width", width, 1)
    known = {p.name: p for p in spec.params}
    for pname in arch_params:
        if pname not in known:
            takes = ", ".join(known) if known else "no parameters"
            raise InputError(f"architecture '{key}' has no parameter '{pname}' (it takes: {takes})")
    params = {p.name: p.default for p in spec.params}
    params.update({k: v for k, v in arch_params.items() if v is not None})
    if "block" in params:
        params["block"] = _check_int(key, "block", params["block"],
                                     2 if key == "carry-lookahead" else 1)
    if params.get("levels") is not None:
        params["levels"] = _check_int(key, "levels", params["levels"], 1)
    ad = _Adder(width, cin)
    result = spec.build(ad, **params)
    outputs: dict[str, list[str]] = {"sum": result.sums}
    if cout:
        outputs["cout"] = [result.carry_out]
    if overflow:
        if result.carry_top_in is None:
            outputs["v"] = [result.carry_out]  # carry into the top bit is 0: v = carry out
        else:
            with ad.at("signed overflow: carry out XOR carry into the top bit"):
                outputs["v"] = [ad.b.gate("xor", result.carry_out, result.carry_top_in,
                                          out="v_flag")]
    inputs = [Port("a", width), Port("b", width)] + ([Port("cin", 1)] if cin else [])
    name = name or f"{key.replace('-', '_')}{width}"
    return ad.b.netlist(name, inputs, outputs, origin=f"generated {key} width {width}")


def describe_params(arch: str) -> str:
    spec = ARCHITECTURES[arch]
    if not spec.params:
        return "-"
    return ", ".join(f"{p.name}={'auto' if p.default is None else p.default}" for p in spec.params)


def prefix_schedule(arch: str, width: int) -> Schedule:
    """The rows of (position, predecessor) of a prefix architecture, empty rows included."""
    return SCHEDULES[arch](width)
