"""Finding the gate that goes wrong first: signatures, single-net repair and ranking.

Over a few thousand vectors (the counterexample, its one-bit neighbours, propagate runs aimed at
long carry chains, and seeded uniform ones), every net of the design is simulated bit-parallel
(bit j of a net's word is its value in vector j) and its word is looked up among the reference
functions of addition (``diagnose_model``): a net whose word is one of them *behaves like part of
an adder*; one whose word is none of them *breaks from every reference function*.

Then, for each net that reaches every wrong output bit, the design is re-simulated with that net's
value flipped (only its fan-out cone is recomputed). Vectors where the flip makes every output
right, and vectors that were right and stay right, say which value the net would need: a net is a
*repair point* when some value on every vector makes all outputs right. The output of a single
miswired gate is always a repair point (give it the value the correct gate would give), and so is
every net that all of its wrong values must pass through; the earliest of them is the origin.

Ranking (``score`` in 0..1): the fraction of failing vectors a change of the net repairs, times
0.4 when the net's word is itself a reference function (it behaves like an adder signal, so the
fault is more likely elsewhere), divided by one plus the number of repair points upstream of it
that break from every reference function (the wrong value started earlier). Without a model
(specs other than A + B + c) only the repair fraction and the order count.
"""

from __future__ import annotations

import random
from dataclasses import dataclass, field
from typing import Mapping, Sequence

from verify.diagnosis.reference import AdderModel, Table, detect, table
from verify.errors import InputError
from verify.model.ops import OPS
from verify.model.netlist import CONST0, CONST1, Netlist
from verify.diagnosis.changes import local_changes
from verify.diagnosis.repair import (MAX_ESTABLISH, Change, operand_changes,
                                     permutation_changes, wording)
from verify.diagnosis.repair import establish as establish_repair
from verify.sim import Simulator, pack

#: vectors simulated for a diagnosis (the counterexample and its neighbours come on top)
DEFAULT_VECTORS = 2048
HEALTHY_WEIGHT = 0.4


def _popcount(x: int) -> int:
    return bin(x).count("1")


def _eval(op: str, xs: Sequence[int], M: int) -> int:
    return OPS[op].evaluate(xs, M)


@dataclass
class Suspect:
    net: str
    op: str
    inputs: tuple[str, ...]
    source: str | None
    score: float
    repairs: float  # fraction of failing vectors a change of this net repairs
    behaves_like: list[str]  # reference functions its word equals
    should_be: list[str]  # reference functions equal to the value it would need
    must_change: int  # vectors where its value must change
    upstream: int  # repair points upstream that break from every reference function
    order: int  # position in topological order
    why: str = ""
    local: str | None = None  # one change at this gate that gives the value it needs
    after: list[str] = field(default_factory=list)  # suspects repaired before this one was ranked
    changes: list = field(default_factory=list)  # candidate repairs at this gate (repair.Change)
    repair: dict | None = None  # how far a complete engine backs the best of them
    refuted: bool = False  # every concrete change tried was refuted by a complete engine
    nfail: int = 0  # failing vectors when it was ranked

    def to_json(self, table: Table | None = None) -> dict:
        out = {"net": self.net, "op": self.op, "inputs": list(self.inputs),
               "score": round(self.score, 4), "source": self.source,
               "repairs": round(self.repairs, 4), "must_change_vectors": self.must_change,
               "behaves_like": self.behaves_like, "should_be": self.should_be,
               "local_change": self.local, "after_repairing": self.after, "why": self.why}
        if self.repair is not None:
            out["repair"] = {k: self.repair[k] for k in ("change", "established_by", "vectors")}
        return out


@dataclass
class Analysis:
    """Everything the diagnosis computed over its vectors; vector 0 is the one explained."""

    design: Netlist
    model: AdderModel | None
    vectors: list[dict[str, int]]
    mask: int
    values: dict[str, int]  # net -> word (the design as it is)
    expected: dict[str, int]  # output bit -> word (the spec's reference)
    failing: int  # word: vectors where some output differs
    wrong_bits: list[str]  # output bits that differ on some vector
    table: Table | None
    model_words: dict = field(default_factory=dict)
    suspects: list[Suspect] = field(default_factory=list)
    repaired: dict[str, int] = field(default_factory=dict)  # values with the top suspect fixed
    candidates_tried: int = 0
    remaining: int = 0  # word: vectors still failing with every chosen suspect repaired
    permutation: dict | None = None  # output or operand bits in the wrong places (a repair)
    chosen: list[str] = field(default_factory=list)  # one suspect per fault, repaired in turn

    @property
    def count(self) -> int:
        return len(self.vectors)

    def failing_count(self) -> int:
        return _popcount(self.failing)

    def bit(self, net: str, j: int = 0, repaired: bool = False) -> int:
        src = self.repaired if repaired and self.repaired else self.values
        if net == CONST0:
            return 0
        if net == CONST1:
            return 1
        return src[net] >> j & 1


def make_vectors(design: Netlist, first: Sequence[Mapping[str, int]], model: AdderModel | None,
                 count: int = DEFAULT_VECTORS, seed: int = 1) -> list[dict[str, int]]:
    """The vectors: ``first`` as given, each first vector's one-bit neighbours, propagate runs
    over every (start, length) when they fit in half the budget (else sampled), uniform ones."""
    rng = random.Random(seed)
    ports = [(p.name, p.width) for p in design.inputs]
    out: list[dict[str, int]] = []
    seen: set[tuple] = set()

    def add(v: Mapping[str, int]) -> None:
        v = {n: int(v.get(n, 0)) & ((1 << w) - 1) for n, w in ports}
        key = tuple(v[n] for n, _ in ports)
        if key not in seen:
            seen.add(key)
            out.append(v)

    for v in first:
        add(v)
    for v in list(first)[:4]:
        for n, w in ports:
            for i in range(w):
                add({**v, n: v.get(n, 0) ^ (1 << i)})
    runs_budget = count // 2
    if model is not None:
        n = model.width
        pairs = [(s, L) for s in range(n) for L in range(1, n - s + 1)]
        if 2 * len(pairs) > runs_budget:
            pairs = rng.sample(pairs, runs_budget // 2)
        mask = (1 << n) - 1
        for s, L in pairs:
            for cin in (0, 1):
                A = rng.getrandbits(n)
                run = ((1 << L) - 1) << s
                # B's operand bits are the complement of A's over the run: p = 1 there
                Bop = (A ^ run) & run | (rng.getrandbits(n) & ~run & mask)
                if s > 0 and rng.random() < 0.5:  # a carry generated just below the run
                    A |= 1 << (s - 1)
                    Bop |= 1 << (s - 1)
                v = {n_: rng.getrandbits(w) for n_, w in ports}
                v[model.a] = A ^ (mask if model.a_inv else 0)
                flip = mask if model.b_inv else 0
                if model.b_xor and v.get(model.b_xor, 0) & 1:
                    flip ^= mask
                v[model.b] = Bop ^ flip
                if model.carry not in ("0", "1"):
                    v[model.carry] = cin ^ int(model.carry_inv)
                add(v)
    while len(out) < count:
        add({n: rng.getrandbits(w) for n, w in ports})
        if len(seen) >= 2 ** sum(w for _, w in ports):
            break
    return out


def analyse(design: Netlist, spec, first: Sequence[Mapping[str, int]], *,
            count: int = DEFAULT_VECTORS, seed: int = 1, top: int = 10,
            model: AdderModel | None | str = "detect", establish: bool = False) -> Analysis:
    """Simulate, match signatures, try single-net repairs and rank the suspects.

    ``establish=True`` also checks output/operand permutations and the top suspects' repairs
    with a complete engine (``verify.diagnosis.repair``)."""
    if model == "detect":
        model = detect(design, spec)
    vectors = make_vectors(design, first, model, count, seed)
    N = len(vectors)
    M = (1 << N) - 1
    words = pack(design, vectors)
    values = Simulator(design).run_all(words, M)
    try:
        ref = spec.reference()
    except InputError:  # a spec too large for gates: its integer evaluation, vector by vector
        ref = None
    if ref is not None:
        ref_out = Simulator(ref).run(pack(ref, vectors), M)
        expected = dict(zip(ref.output_bits, ref_out))
    else:
        expected = {b: 0 for b in design.output_bits}
        for j, v in enumerate(vectors):
            out = spec.evaluate(v)
            for p in design.outputs:
                for i, b in enumerate(p.bits):
                    if out[p.name] >> i & 1:
                        expected[b] |= 1 << j
    failing = 0
    wrong = []
    for b in design.output_bits:
        d = values[b] ^ expected[b]
        if d:
            wrong.append(b)
            failing |= d
    tab, mwords = (table(model, values, M) if model is not None else (None, {}))
    an = Analysis(design, model, vectors, M, values, expected, failing, wrong, tab, mwords)
    if failing and establish:
        an.permutation = _permutation(an, spec, words)
        if an.permutation and an.permutation["established_by"] in ("exhaustive", "proven"):
            return an  # bits in the wrong places explain it all: no gate-level search
    if failing:
        _rank(an, top)
        if establish:
            settle_repairs(an, spec)
    return an


def _permutation(an: Analysis, spec, words: list[int]) -> dict | None:
    """Output bits or operand bits in the wrong places, checked by a complete engine."""
    d = an.design
    cands = permutation_changes(d, an.expected, an.values)
    if not cands:
        sim = Simulator(d)
        exp = [an.expected[b] for b in d.output_bits]

        def miter_run(trial: list[int]) -> int:
            diff = 0
            for got, want in zip(sim.run(trial, an.mask), exp):
                diff |= got ^ want
            return diff

        widest = max(d.outputs, key=lambda p: p.width)
        wrong = [i for i, b in enumerate(widest.bits) if b in an.wrong_bits]
        cands = operand_changes(d, words, an.mask, miter_run, wrong[0] if wrong else None)
    for c in cands[:2]:
        r = establish_repair(d, spec, c, vectors=an.count)
        if r["established_by"] != "refuted":
            return r
    return None


def settle_repairs(an: Analysis, spec, budget: int = MAX_ESTABLISH) -> None:
    """Hand the top suspects' candidate changes to a complete engine, most plausible first; a
    suspect keeps the first change shown to make the design meet the spec (else the first one
    no engine could settle, worded as consistent with the vectors). Refuted changes are dropped."""
    tries = 0
    if len(an.chosen) > 1:  # several faults: the chosen suspects' changes made together
        by_net = {s.net: s for s in an.suspects}
        group = [by_net[n] for n in an.chosen if n in by_net]
        firsts = [next((c for c in s.changes if c.concrete), None) for s in group]
        if len(group) == len(an.chosen) and all(firsts):
            joint = Change(" and ".join(f"at {s.net}: {c.text}" for s, c in zip(group, firsts)),
                           "joint", parts=tuple(firsts))
            r = establish_repair(an.design, spec, joint, vectors=an.count)
            tries += 1
            for s, c in zip(group, firsts):
                if r["established_by"] != "refuted":
                    s.repair, s.local = r, c.text
                else:
                    s.refuted = True
                s.why = _why(s, an, s.nfail)
        return
    for s in an.suspects[:3]:
        for c in [c for c in s.changes if c.concrete]:
            if tries >= budget:
                break
            tries += 1
            r = establish_repair(an.design, spec, c, vectors=an.count)
            if r["established_by"] in ("exhaustive", "proven"):
                s.repair = r
                s.local = c.text
                break
            if r["established_by"] == "sampled" and s.repair is None:
                s.repair = r
                s.local = c.text
        if s.repair is None and s.local and any(c.concrete for c in s.changes):
            s.local = None  # every change tried was refuted, or none could be tried
            s.refuted = True
        s.why = _why(s, an, s.nfail)


class _Graph:
    """Index-based view of a netlist for re-simulating fan-out cones."""

    def __init__(self, design: Netlist):
        self.design = design
        self.gates = design.ordered_gates
        self.nets = [CONST0, CONST1, *design.input_bits, *(g.output for g in self.gates)]
        self.index = {n: k for k, n in enumerate(self.nets)}
        self.first_gate = 2 + len(design.input_bits)
        self.gate_ins = [[self.index[i] for i in g.inputs] for g in self.gates]
        self.users: list[list[int]] = [[] for _ in self.nets]
        for gpos, ins in enumerate(self.gate_ins):
            for k in set(ins):
                self.users[k].append(gpos)
        self.outputs = [self.index[b] for b in design.output_bits]

    def cone(self, k: int) -> list[int]:
        """Gate positions downstream of net k, in topological order."""
        seen: set[int] = set()
        stack = list(self.users[k])
        while stack:
            gpos = stack.pop()
            if gpos in seen:
                continue
            seen.add(gpos)
            stack.extend(self.users[self.first_gate + gpos])
        return sorted(seen)

    def reach_outputs(self) -> list[int]:
        """net index -> bitset of output positions it reaches."""
        out_pos = {k: 1 << n for n, k in enumerate(self.outputs)}
        reach = [0] * len(self.nets)
        for k, bit in out_pos.items():
            reach[k] |= bit
        for gpos in range(len(self.gates) - 1, -1, -1):
            r = reach[self.first_gate + gpos]
            for k in self.gate_ins[gpos]:
                reach[k] |= r
        return reach

    def ancestors(self) -> list[int]:
        """net index -> bitset of net indices in its fan-in (itself excluded)."""
        anc = [0] * len(self.nets)
        for gpos, ins in enumerate(self.gate_ins):
            a = 0
            for k in ins:
                a |= anc[k] | (1 << k)
            anc[self.first_gate + gpos] = a
        return anc

    def simulate_forced(self, base: list[int], k: int, word: int, M: int,
                        cone: list[int] | None = None) -> list[int]:
        vals = list(base)
        vals[k] = word
        ops = self.gates
        first = self.first_gate
        for gpos in (cone if cone is not None else self.cone(k)):
            vals[first + gpos] = _eval(ops[gpos].op, [vals[i] for i in self.gate_ins[gpos]], M)
        return vals


#: at most this many faults are explained one after another
MAX_FAULTS = 3


def _rank(an: Analysis, top: int) -> None:
    """Rank repair points; when the best one leaves failing vectors, apply its repair and rank
    again on what still fails (one suspect per fault, up to MAX_FAULTS)."""
    G = _Graph(an.design)
    M = an.mask
    base = [0, M] + [an.values[n] for n in G.nets[2:]]
    exp = [an.expected[b] for b in an.design.output_bits]
    reach = G.reach_outputs()
    anc = G.ancestors()
    fail = an.failing
    chosen: list[Suspect] = []
    first: list[Suspect] = []
    for round_ in range(MAX_FAULTS):
        ranked, repaired = _rank_once(an, G, base, exp, fail, reach, anc, top)
        if not ranked:
            break
        taken = {c.net for c in chosen}
        fresh = [r for r in ranked if r.net not in taken]
        if not fresh:
            break
        best = fresh[0]
        if round_ == 0:
            first = ranked
        else:
            best.after = [c.net for c in chosen]
            best.why = _why(best, an, _popcount(fail))
        chosen.append(best)
        base = repaired
        fail = 0
        for o, e in zip(G.outputs, exp):
            fail |= base[o] ^ e
        if not fail:
            break
    picked = {c.net for c in chosen}
    listed = chosen + [s for s in first if s.net not in picked]
    # one entry a net, in the order of the scores printed beside them
    an.suspects = sorted(listed, key=lambda s: -round(s.score, 9))[:top]  # stable: ties keep
    # the ranking's own order (a plain reference function before a complement, then earlier)
    an.chosen = [c.net for c in chosen]
    an.remaining = fail if chosen else an.failing
    an.repaired = dict(zip(G.nets[2:], base[2:])) if chosen else {}


def _rank_once(an: Analysis, G: _Graph, base: list[int], exp: list[int], fail: int,
               reach: list[int], anc: list[int], top: int) -> tuple[list[Suspect], list[int]]:
    M = an.mask
    nfail = _popcount(fail)
    need = 0
    for n, (o, e) in enumerate(zip(G.outputs, exp)):
        if (base[o] ^ e) & fail:
            need |= 1 << n
    gate_nets = range(G.first_gate, len(G.nets))
    full = [k for k in gate_nets if reach[k] & need == need]
    some = [k for k in gate_nets if reach[k] & need and reach[k] & need != need]
    results = {}
    for k in _then(full, some, results, fail):
        cone = G.cone(k)
        vals = G.simulate_forced(base, k, base[k] ^ M, M, cone)
        diff = 0
        for o, e in zip(G.outputs, exp):
            diff |= vals[o] ^ e
        ok_flip = ~diff & M
        fixed = fail & ok_flip
        if not fixed:
            continue
        results[k] = (fixed, ok_flip)
    an.candidates_tried += len(results)
    if not results:
        return [], base
    healthy = {k: bool(an.table and an.table.matches(base[k])) for k in results}
    exact = {k for k, (fixed, _) in results.items() if fixed == fail}
    breaking = 0  # bitset of repair points that break from every reference function
    for k in (exact or results):
        if not healthy[k]:
            breaking |= 1 << k
    # the local test, for the repair points that could explain every failing vector (or, when
    # none can, the best partial ones): can one change at this gate give the value it needs?
    prelim = sorted(results, key=lambda k: (-_popcount(results[k][0]), k))
    local_for = set(exact) if exact else set(prelim[:LOCAL_TESTS])
    if len(local_for) > LOCAL_TESTS:
        local_for = set(sorted(local_for)[:LOCAL_TESTS])
    suspects = []
    changed: dict[int, int | None] = {}  # net -> its word with the local change applied
    for k, (fixed, ok_flip) in results.items():
        frac = _popcount(fixed) / nfail
        upstream = _popcount(anc[k] & breaking)
        g = G.gates[k - G.first_gate]
        required = base[k] ^ fixed
        care = fixed | (~fail & M & ~ok_flip)
        changes = local_changes(G, base, k, required, care, M, search=k in local_for,
                                 limit=4 if k in exact else 1)
        change = changes[0] if changes else None
        if change is None:
            weight = NO_LOCAL_WEIGHT * (HEALTHY_WEIGHT if healthy[k] else 1.0)
        else:
            weight = _CHANGE_WEIGHT[change.kind] * (HEALTHY_LOCAL_WEIGHT if healthy[k] else 1.0)
            changed[k] = change.word
        score = frac * weight / (1 + upstream)
        sus = Suspect(g.output, g.op, g.inputs, g.source, score, frac,
                      an.table.matches(base[k])[:3] if an.table else [], [],
                      _popcount(fixed), upstream, k)
        sus.local = change.text if change else None
        sus.changes = changes
        suspects.append(sus)
    suspects.sort(key=lambda s: (-s.score, s.order))
    suspects = suspects[:top + 4]
    for s in suspects:
        k = G.index[s.net]
        fixed, ok_flip = results[k]
        required = base[k] ^ fixed
        care = fixed | (~fail & M & ~ok_flip)
        if an.table is not None:
            s.should_be = an.table.matches_on(required, care, near=base[k])
    # equal scores: a net that should carry a plain reference function before one that should
    # carry a complement, then the earlier net
    suspects.sort(key=lambda s: (-round(s.score, 9),
                                 bool(s.should_be) and s.should_be[0].startswith("~"), s.order))
    suspects = suspects[:top]
    for s in suspects:
        s.why = _why(s, an, nfail)
    # the repair: the gate with its local change (right on every vector, also where another
    # fault hides it), else the net flipped on the vectors that flip repairs
    k = G.index[suspects[0].net]
    word = changed.get(k)
    repaired = G.simulate_forced(base, k, word if word is not None else base[k] ^ results[k][0], M)
    return suspects, repaired


def _then(full: list[int], some: list[int], results: dict, fail: int):
    """The nets reaching every wrong output bit; then, unless one of them repairs every failing
    vector (one fault), the nets reaching only some (two faults or more)."""
    yield from full
    if not any(fixed == fail for fixed, _ in results.values()):
        yield from some


#: how many repair points get the full local test (other sources, forgotten inputs) at most
LOCAL_TESTS = 40
#: weight of a repair point where no single change at the gate gives the value it needs
NO_LOCAL_WEIGHT = 0.3
#: how much a net that behaves like an adder signal counts when one change at it fixes it
HEALTHY_LOCAL_WEIGHT = 0.8
#: how plausible each kind of single change at a gate is, as a bug
_CHANGE_WEIGHT = {"const": 1.0, "op": 1.0, "invert": 1.0, "stuck": 0.9, "source": 0.9,
                  "missing": 0.7, "source-const": 0.6}
def _why(s: Suspect, an: Analysis, nfail: int) -> str:
    s.nfail = nfail
    parts = []
    if s.after:
        parts.append(f"with {', '.join(s.after)} repaired, {nfail} vectors still fail")
    if s.repairs >= 1.0:
        parts.append(f"changing this net alone makes every output right on all {an.count} "
                     f"vectors ({s.must_change} need a different value)")
    else:
        parts.append(f"changing this net alone repairs {s.must_change} of {nfail} failing vectors")
    t = an.table
    if t is not None:
        if s.behaves_like:
            parts.append(f"on every vector simulated its value equals {s.behaves_like[0]} "
                         f"({t.explain(s.behaves_like[0])})")
        else:
            parts.append("its value matches no reference function of addition")
        if s.should_be:
            parts.append(f"on these {an.count} vectors the value it would need equals "
                         f"{s.should_be[0]} ({t.explain(s.should_be[0])})")
    if s.repair is not None and s.repair["established_by"] in ("exhaustive", "proven", "sampled"):
        parts.append(wording(s.repair))
    elif s.refuted:
        parts.append("the changes at this gate that fit these vectors were refuted by a complete "
                     "engine (the design stays wrong with them)")
    elif s.local and s.repair is None:
        parts.append(f"a change at this gate consistent with the {an.count} vectors simulated: "
                     f"{s.local}")
    if s.upstream:
        parts.append(f"{s.upstream} earlier net{'s also diverge' if s.upstream > 1 else ' also diverges'}")
    return "; ".join(parts)
