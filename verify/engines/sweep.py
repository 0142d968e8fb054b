"""Sweeping engine: prove internal equivalences first, then the outputs, with small queries.

The method is SAT sweeping with cut points (Kuehlmann and Krohm 1997; Mishchenko et al. 2006),
stated over the bit ranges of an addition. The design and the spec's reference netlist
(``Spec.reference``) are simulated side by side on the same vectors. When the spec is an
addition X + Y + cin (``cases.find_addition``), each net is compared, by its simulated values,
with the functions an adder computes over a range of bit positions j..i, chosen from the net's
structural support: the operand bits, the group generate G[i:j] (the carry out of bits j..i;
j = -1 takes in the carry-in, so G[i:-1] is the carry into bit i+1), the group propagate
P[i:j], and T[i:j] = G | P (the carry out when a carry enters: carry-select and conditional-sum
blocks, Ling's t = a | b), or their complements. A net that matches is then proven to compute that function, in
topological order, by a query in which the nets already proven are free cut variables. Each
query is stated over disjoint bit segments: a segment of one bit uses the real operand bits,
a longer one a free group generate G and propagate P with not both 1. Every such assignment is
made by some real operand bits, so a satisfying assignment is a real input (no spurious answers
from cuts, so no refinement is needed). Outputs are proven last: each output bit of the design
against the same bit of the reference, both cones cut at proven nets. ``pass`` comes only from
every output query being unsat.

Queries with few free variables are decided by evaluating every assignment; the rest go to
CaDiCaL (``query.py``). A design or spec with nothing to match (no addition) leaves every cone
whole: the output queries are then one plain SAT miter per output bit, and the evidence says so.
One-bit control inputs are split into cases first (``cases.py``).
"""

from __future__ import annotations

import random
import time

from verify.engines import Options, confirmed
from verify.engines.cases import Addition, cases, control_inputs, find_addition
from verify.engines.query import EXHAUSTIVE_VARS, SOLVER, Circuit
from verify.model.netlist import CONST0, CONST1
from verify.model.result import EngineOutcome
from verify.model.ops import OPS

#: simulation vectors used to find candidate equivalences
SIGNATURE_VECTORS = 256
#: an internal candidate whose cone (back to proven nets) is larger than this is not tried
MAX_CANDIDATE_CONE = 400

_NONE = (None, None)


class _Stop(Exception):
    pass


class _Case:
    """One case: the design and the reference with some one-bit inputs held constant."""

    def __init__(self, design, reference, fixed, add: Addition | None, options: Options, deadline,
                 stats):
        self.design, self.reference, self.fixed, self.add = design, reference, fixed, add
        self.options, self.deadline, self.stats = options, deadline, stats
        # every net of both netlists under one key: design gates "d:net", reference "r:net"
        self.gate: dict[str, tuple[str, tuple[str, ...]]] = {}
        self.order: dict[str, int] = {}
        for tag, nl in (("d:", design), ("r:", reference)):
            ins = set(nl.input_bits)
            def key(n, tag=tag, ins=ins):
                return n if n in ins or n in (CONST0, CONST1) else tag + n
            for g in nl.ordered_gates:
                k = key(g.output)
                self.gate[k] = (g.op, tuple(key(i) for i in g.inputs))
                self.order[k] = len(self.order)
        self.position: dict[str, tuple[str, int, bool]] = {}  # input bit -> (x|y|c, pos, inverted)
        self.constant: dict[str, int] = {CONST0: 0, CONST1: 1}
        for p in design.inputs:
            for i, b in enumerate(p.bits):
                if p.name in fixed:
                    self.constant[b] = fixed[p.name] >> i & 1
        if add is not None:
            for role, (port, inv) in (("x", add.x), ("y", add.y)):
                for i, b in enumerate(list(design.ports[port].bits)):
                    self.position[b] = (role, i, inv)
            if not isinstance(add.cin, int):
                self.position[design.ports[add.cin[0]].bits[0]] = ("c", -1, add.cin[1])
        self.has_cin = add is not None and add.cin != 0
        self.proven: dict[str, tuple] = {}  # net -> (meaning, negated)
        self.ticks = 0
        self.remaining = options.timeout

    # ---- simulation and candidates ------------------------------------------------------------
    def simulate(self) -> None:
        rng = random.Random(self.options.seed)
        n = SIGNATURE_VECTORS
        self.mask = mask = (1 << n) - 1
        words = {}
        for p in self.design.inputs:
            for i, b in enumerate(p.bits):
                if b in self.constant:
                    words[b] = mask if self.constant[b] else 0
                else:
                    words[b] = rng.getrandbits(n)
        if self.add is not None:  # long carry chains: y near ~x on a quarter of the vectors
            chain = int("0001" * (n // 4), 2)
            xbits = self.design.ports[self.add.x[0]].bits
            ybits = self.design.ports[self.add.y[0]].bits
            for i in range(self.add.width):
                xb, yb = xbits[i], ybits[i]
                if xb in self.constant or yb in self.constant:
                    continue
                xv = words[xb] ^ (mask if self.add.x[1] else 0)
                flip = rng.getrandbits(n) & rng.getrandbits(n) & rng.getrandbits(n)
                flip &= rng.getrandbits(n) & rng.getrandbits(n)
                want = (xv ^ mask ^ flip) ^ (mask if self.add.y[1] else 0)
                words[yb] = (words[yb] & ~chain) | (want & chain)
        self.sig: dict[str, int] = dict(words)
        self.sig[CONST0], self.sig[CONST1] = 0, mask
        for key, (op, args) in self.gate.items():  # one pass, no compiling: run once
            self.sig[key] = OPS[op].evaluate([self.sig[a] for a in args], mask) & mask
        # the operand words and the bit generate/propagate of each position
        self.xw: dict[int, int] = {}
        self.yw: dict[int, int] = {}
        for b, (role, i, inv) in self.position.items():
            w = words[b] ^ (mask if inv else 0)
            if role == "x":
                self.xw[i] = w
            elif role == "y":
                self.yw[i] = w
        self.cinw = 0
        if self.add is not None:
            if isinstance(self.add.cin, int):
                self.cinw = mask if self.add.cin else 0
            else:
                b = self.design.ports[self.add.cin[0]].bits[0]
                self.cinw = words[b] ^ (mask if self.add.cin[1] else 0)
        self._G: dict[tuple[int, int], int] = {}
        self._P: dict[tuple[int, int], int] = {}

    def G(self, i: int, j: int, split: int | None = None) -> int:
        key = (i, j)
        if key in self._G:
            return self._G[key]
        if split is not None and j < split <= i and (i, split) in self._G and (split - 1, j) in self._G:
            v = self._G[(i, split)] | (self.P(i, split) & self._G[(split - 1, j)])
            self._G[key] = v
            return v
        # ripple up from the lowest position, remembering every prefix on the way
        k = j
        acc = self.cinw if j == -1 else self.xw[j] & self.yw[j]
        self._G[(j, j)] = acc
        while k < i:
            k += 1
            if (k, j) in self._G:
                acc = self._G[(k, j)]
                continue
            acc = (self.xw[k] & self.yw[k]) | ((self.xw[k] ^ self.yw[k]) & acc)
            self._G[(k, j)] = acc
        return acc

    def P(self, i: int, j: int, split: int | None = None) -> int:
        key = (i, j)
        if key in self._P:
            return self._P[key]
        if split is not None and j < split <= i and (i, split) in self._P \
                and (split - 1, j) in self._P:
            v = self._P[key] = self._P[(i, split)] & self._P[(split - 1, j)]
            return v
        if j == -1:
            v = 0
        elif i == j:
            v = self.xw[i] ^ self.yw[i]
        else:
            v = self.P(i, i) & self.P(i - 1, j) if (i - 1, j) in self._P else self._P_ripple(i, j)
        self._P[key] = v
        return v

    def _P_ripple(self, i: int, j: int) -> int:
        acc = self.mask
        for k in range(j, i + 1):
            acc &= self.xw[k] ^ self.yw[k]
            self._P[(k, j)] = acc
        return acc

    def candidates(self, net: str, span, splits):
        """(meaning, negated) pairs worth trying for ``net``, given its support span."""
        sig = self.sig[net]
        mask = self.mask
        found = []
        constant = [(("K", sig & 1), False)] if sig == 0 or sig == mask else []
        if span is None or self.add is None or span[2]:
            return constant
        lo, hi = span[0], span[1]
        options = []
        if lo == hi and lo >= 0:
            options += [(("X", lo), self.xw.get(lo)), (("Y", lo), self.yw.get(lo)),
                        (("P", lo, lo), self.P(lo, lo)), (("G", lo, lo), self.G(lo, lo)),
                        (("T", lo, lo), self.G(lo, lo) | self.P(lo, lo))]
        elif hi >= 0:
            split = next((s for s in splits if lo < s <= hi), None)
            options.append((("G", hi, lo), self.G(hi, lo, split)))
            if lo >= 0:
                options.append((("P", hi, lo), self.P(hi, lo, split)))
                options.append((("T", hi, lo), self.G(hi, lo) | self.P(hi, lo)))
        if lo == 0 and self.add.cin == 1:
            options.append((("G", hi, -1), self.G(hi, -1)))  # a constant carry-in of 1
        for meaning, w in options:
            if w is None:
                continue
            if w == sig:
                found.append((meaning, False))
            elif w ^ mask == sig:
                found.append((meaning, True))
        return found + constant  # a constant is the last guess for a net with operand support

    # ---- queries --------------------------------------------------------------------------
    def cone(self, roots, limit=None):
        """Gates back to cuts: (gate nets in order, cut nets, raw input bits)."""
        seen, cuts, raw, inner = set(), set(), set(), []
        stack = list(roots)
        first = set(roots)
        while stack:
            n = stack.pop()
            if n in seen:
                continue
            seen.add(n)
            if n in self.constant:
                continue
            if n in self.proven and n not in first:
                cuts.add(n)
            elif n in self.gate:
                inner.append(n)
                if limit is not None and len(inner) > limit:
                    return None
                stack.extend(self.gate[n][1])
            else:
                raw.add(n)
        inner.sort(key=self.order.__getitem__)
        return inner, cuts, raw

    @staticmethod
    def _range(meaning):
        kind = meaning[0]
        if kind in ("X", "Y"):
            return meaning[1], meaning[1]
        if kind in ("G", "P", "T"):
            return meaning[2], meaning[1]
        return None

    def build(self, inner, cuts, raw, targets):
        """The query circuit: segments for every range used, cuts as their meanings."""
        c = Circuit()
        points: set[int] = set()
        meanings = [self.proven[n][0] for n in cuts] + [m for m in targets]
        for m in meanings:
            r = self._range(m)
            if r is not None:
                points.update((r[0], r[1] + 1))
        for b in raw:
            pos = self.position.get(b)
            if pos is not None:
                points.update((pos[1], pos[1] + 1))
        if self.has_cin:
            points.add(0)  # the carry-in is its own segment at position -1
        cuts_at = sorted(points)
        segments = list(zip(cuts_at, cuts_at[1:]))  # [lo, hi+1)
        seg_of = {lo: k for k, (lo, _) in enumerate(segments)}
        gp: list[tuple[int, int]] = []
        operand: dict[tuple[str, int], int] = {}
        info = []
        for lo, end in segments:
            if lo == -1:
                if isinstance(self.add.cin, int):
                    g = c.const(self.add.cin)
                else:
                    g = c.var()
                    operand[("c", -1)] = g
                gp.append((g, c.const(0)))
                info.append(("cin", lo, end, g))
            elif end - lo == 1:
                x, y = c.var(), c.var()
                operand[("x", lo)], operand[("y", lo)] = x, y
                gp.append((c.gate("and", (x, y)), c.gate("xor", (x, y))))
                info.append(("bit", lo, end, (x, y)))
            else:
                g, p = c.var(), c.var()
                c.exclude(g, p)
                gp.append((g, p))
                info.append(("group", lo, end, (g, p)))
        self.seg_info = info

        def meaning_node(m):
            kind = m[0]
            if kind == "K":
                return c.const(m[1])
            if kind in ("X", "Y"):
                return operand[(kind.lower(), m[1])]
            hi, lo = m[1], m[2]
            k, acc = seg_of[lo], None
            parts = []
            while k < len(segments) and segments[k][1] - 1 <= hi:
                parts.append(gp[k])
                k += 1
            if kind == "P":
                acc = parts[0][1]
                for _, p in parts[1:]:
                    acc = c.gate("and", (p, acc))
                return acc
            if kind == "T":  # the carry out of the range when a carry enters it: G | P
                return c.gate("or", (meaning_node(("G", hi, lo)), meaning_node(("P", hi, lo))))
            acc = parts[0][0]
            for g, p in parts[1:]:
                acc = c.gate("or", (g, c.gate("and", (p, acc))))
            return acc

        node: dict[str, int] = {CONST0: c.const(0), CONST1: c.const(1)}
        for b, v in self.constant.items():
            node[b] = c.const(v)
        self.foreign = {}
        for b in raw:
            if b in node:
                continue
            pos = self.position.get(b)
            if pos is None:
                node[b] = self.foreign[b] = c.var()
            else:
                lit = operand[(pos[0], pos[1])]
                node[b] = c.gate("not", (lit,)) if pos[2] else lit
        for n in cuts:
            m, neg = self.proven[n]
            v = meaning_node(m)
            node[n] = c.gate("not", (v,)) if neg else v
        for n in inner:
            op, args = self.gate[n]
            node[n] = c.gate(op, [node[a] for a in args])
        self.operand_nodes = operand
        return c, node, meaning_node

    def left(self, c: Circuit | None = None) -> float:
        """CPU seconds left (raises _Stop past the limit). The clock is read for every large
        query and every 64th small one; small queries take milliseconds."""
        self.ticks += 1
        if c is not None and len(c.free) <= EXHAUSTIVE_VARS and self.ticks % 512:
            return self.remaining  # decided by evaluation in microseconds: no clock read
        remaining = self.remaining = self.deadline - time.process_time()
        if remaining <= 0:
            raise _Stop()
        return remaining

    def prove_net(self, net: str, meaning, neg) -> bool:
        shape = self.cone([net], MAX_CANDIDATE_CONE)
        if shape is None:
            return False
        inner, cuts, raw = shape
        if any(self.position.get(b) is None and b not in self.constant for b in raw):
            return False
        c, node, meaning_node = self.build(inner, cuts, raw, [meaning])
        m = meaning_node(meaning)
        target = c.gate("not", (m,)) if neg else m
        answer = c.differ(node[net], target, self.left(c))
        self.stats.record(answer)
        if answer.status == "unknown":
            self.left()
            return False
        return answer.status == "unsat"

    def sweep(self) -> None:
        span: dict[str, tuple | None] = {}
        for b in self.sig:
            if b in self.constant:
                span[b] = None
            elif b in self.position:
                p = self.position[b][1]
                span[b] = (p, p, False)
            elif b not in self.gate:
                span[b] = (10 ** 9, -(10 ** 9), True)
        for net in self.gate:
            args = self.gate[net][1]
            lo, hi, foreign = 10 ** 9, -(10 ** 9), False
            for a in args:
                s = span.get(a)
                if s is not None:
                    lo, hi, foreign = min(lo, s[0]), max(hi, s[1]), foreign or s[2]
            span[net] = None if lo > hi and not foreign else (lo, hi, foreign)
            splits = []
            for a in args:
                pm = self.proven.get(a)
                if pm is not None and pm[0][0] in ("G", "P", "T"):
                    splits.append(pm[0][2])
            for meaning, neg in self.candidates(net, span[net], splits):
                self.stats.candidates += 1
                if self.prove_net(net, meaning, neg):
                    self.proven[net] = (meaning, neg)
                    self.stats.proven += 1
                    break

    def outputs(self):
        """Prove each output bit equal to the reference's; the first real difference is a
        counterexample (an input vector)."""
        for b in self.design.output_bits:
            d = b if b not in self.design.driver else "d:" + b
            r = b if b not in self.reference.driver else "r:" + b
            pd, pr = self.proven.get(d), self.proven.get(r)
            self.stats.output_queries += 1
            if pd is not None and pd == pr:
                self.stats.closed_by_meaning += 1
                continue
            inner, cuts, raw = self.cone([d, r])
            c, node, _ = self.build(inner, cuts, raw, [])
            answer = c.differ(node[d], node[r], self.left(c))
            self.stats.record(answer)
            if answer.status == "unknown":
                self.left()
                return "unknown", b
            if answer.status == "sat":
                return "sat", self.vector(answer.model)
        return "unsat", None

    def vector(self, model) -> dict[str, int]:
        """A real input vector realising a satisfying assignment of an output query."""
        xs: dict[int, int] = {}
        ys: dict[int, int] = {}
        cin = 0
        for kind, lo, end, nodes in self.seg_info:
            if kind == "cin":
                cin = model.get(nodes, 0) if not isinstance(self.add.cin, int) else self.add.cin
            elif kind == "bit":
                xs[lo], ys[lo] = model.get(nodes[0], 0), model.get(nodes[1], 0)
            else:
                g, p = model.get(nodes[0], 0), model.get(nodes[1], 0)
                for i in range(lo, end):
                    if p:
                        xs[i], ys[i] = 1, 0
                    elif g and i == end - 1:
                        xs[i], ys[i] = 1, 1
                    else:
                        xs[i], ys[i] = 0, 0
        values = {p.name: 0 for p in self.design.inputs}
        values.update(self.fixed)
        for b, node in self.foreign.items():
            port, bit = self._bit_of(b)
            values[port] |= model.get(node, 0) << bit
        if self.add is not None:
            for role, (port, inv), vals in (("x", self.add.x, xs), ("y", self.add.y, ys)):
                width = self.design.ports[port].width
                v = sum(vals.get(i, 0) << i for i in range(width))
                values[port] = v ^ ((1 << width) - 1) if inv else v
            if not isinstance(self.add.cin, int):
                values[self.add.cin[0]] = cin ^ int(self.add.cin[1])
        return values

    def _bit_of(self, b: str) -> tuple[str, int]:
        if not hasattr(self, "_bits"):
            self._bits = {x: (p.name, i) for p in self.design.inputs for i, x in enumerate(p.bits)}
        return self._bits[b]


class _Stats:
    def __init__(self):
        self.candidates = self.proven = self.solver_calls = self.closed_without_solver = 0
        self.largest = 0
        self.output_queries = self.closed_by_meaning = 0

    def record(self, answer) -> None:
        if answer.solver_call:
            self.solver_calls += 1
            self.largest = max(self.largest, answer.variables)
        else:
            self.closed_without_solver += 1


def run(design, spec, options: Options) -> EngineOutcome:
    started_wall, started = time.perf_counter(), time.process_time()
    deadline = started + options.timeout
    reference = spec.reference()
    split, whole = control_inputs(design, spec, options.seed)
    stats = _Stats()
    additions = []
    details: dict = {"solver": SOLVER, "time": "cpu"}
    try:
        for fixed in cases(split):
            # the unsplit case was already searched when choosing what to split
            add = whole if not fixed else find_addition(design, spec, fixed, options.seed)
            additions.append(add.describe() if add else None)
            case = _Case(design, reference, fixed, add, options, deadline, stats)
            case.simulate()
            case.sweep()
            status, what = case.outputs()
            if status == "sat":
                cex = confirmed("sweep", design, spec, what)
                details.update(_figures(stats, split, additions))
                return EngineOutcome("sweep", "fail", time.perf_counter() - started_wall,
                                     "an output query found an input where an output differs "
                                     "(re-simulated)", counterexample=cex, details=details)
            if status == "unknown":
                details.update(_figures(stats, split, additions))
                return EngineOutcome("sweep", "undecided", time.perf_counter() - started_wall,
                                     f"the solver gave no answer for output bit {what} within "
                                     f"the {options.timeout:g} s limit", details=details)
    except _Stop:
        details.update(_figures(stats, split, additions))
        return EngineOutcome("sweep", "undecided", time.perf_counter() - started_wall,
                             f"stopped at the {options.timeout:g} s CPU-time limit after "
                             f"{stats.proven:,} internal equivalences", details=details)
    details.update(_figures(stats, split, additions))
    details["cpu_seconds"] = round(time.process_time() - started, 6)
    how = (f"{stats.proven:,} internal equivalences proven (nets of the design and of the spec's "
           f"reference, each to an operand or bit-range function)" if stats.proven else
           "no internal equivalence found: each output bit proven by a plain SAT miter of its "
           "whole cone")
    queries = stats.solver_calls + stats.closed_without_solver
    text = (f"{how} with {queries:,} queries ({stats.solver_calls:,} solver calls, largest "
            f"{stats.largest:,} variables); all {stats.output_queries:,} output bit queries unsat")
    if split:
        text += f"; {len(cases(split))} cases over {', '.join(split)}"
    return EngineOutcome("sweep", "pass", time.perf_counter() - started_wall, text, details=details)


def _figures(stats: _Stats, split, additions) -> dict:
    return {"internal_equivalences": stats.proven, "candidates": stats.candidates,
            "solver_calls": stats.solver_calls,
            "closed_without_solver": stats.closed_without_solver,
            "largest_query_variables": stats.largest, "output_queries": stats.output_queries,
            "split_inputs": list(split), "addition": additions}
