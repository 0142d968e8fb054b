"""Exact settle times under the floating-mode model, by SAT over stabilization in time.

The floating-mode rule (the op table ``verify.model.ops`` holds each op's part of it): before
the inputs arrive every net may hold any value; the inputs are stable from time 0; a gate's output
is stable ``d`` (its delay) after the earliest time at which its inputs that are already stable
determine its value. A net's *settle time* for an input vector is the time from which it holds its
final value whatever the nets held before; an output's *exact delay* is the largest settle time
over all input vectors. It never exceeds the topological (longest-path) arrival time and is
smaller when the longest paths are false (no vector needs them).

Encoding: a net can only settle at one of its *candidate times*, the distinct delays of the paths
reaching it (a forward pass). For every gate output ``n`` and candidate ``t`` a variable
``s(n, t)`` means "n has settled by t"; it is defined, both ways, as "some settling set of the
gate's inputs (the op's rule) has settled by t - d, each at the value the set names". The values
are the ordinary gate clauses (``OPS[op].clauses``). Then ``n`` settles after ``t`` for some
input exactly when ``not s(n, t)`` is satisfiable; the exact delay is the smallest candidate ``t``
where it is not, found by binary search with one incremental solver (CaDiCaL via python-sat).
Settle variables are encoded on demand: a query at ``(n, t)`` adds only the pairs it reaches
backwards (each gate's inputs at ``t - d``, rounded down to their candidates).
"""

from __future__ import annotations

import bisect
import threading
import time as _time
from dataclasses import dataclass, field

from verify.model import graph
from verify.model.netlist import Netlist
from verify.model.ops import OPS
from verify.timing.delays import DelayModel, resolve

#: the most candidate times one net may have before the encoding refuses (a delay table with
#: many distinct values can make path-delay sums explode; the unit model never comes near)
MAX_CANDIDATES = 20_000
SOLVER = "cadical195"
#: python-sat cannot interrupt CaDiCaL, so a solve under a time limit uses Glucose 4, which it can
INTERRUPTIBLE_SOLVER = "glucose4"


class TimeLimit(Exception):
    """The SAT solver ran out of the time allowed; the answer is undecided."""


class TooLarge(Exception):
    """The encoding would be too large to build (too many candidate times)."""


@dataclass
class OutputTiming:
    net: str
    topological: int  # ticks
    exact: int  # ticks
    longest_path: list[str]
    witness: dict[str, int] | None = None  # {port: int}, a vector that needs `exact`
    sensitized_path: list[str] = field(default_factory=list)


class Analysis:
    """A design prepared for timing under one delay model: delays, arrivals, candidates, SAT."""

    def __init__(self, design: Netlist, model: DelayModel | str | None = None, *,
                 interruptible: bool = False):
        """``interruptible``: solves will be given deadlines (picks a solver that can stop)."""
        self.design = design
        self.solver_name = INTERRUPTIBLE_SOLVER if interruptible else SOLVER
        self.model = resolve(model)
        self.delay = {g.output: self.model.ticks(g) for g in design.gates}
        arrival, came_from = graph.arrival(design, lambda g: self.delay[g.output])
        self.arrival = {n: int(t) for n, t in arrival.items()}
        self.came_from = came_from
        self.sources = set(design.input_bits) | set(graph.CONSTANT_NETS)
        self._candidates: dict[str, list[int]] | None = None
        self._solver = None
        self._vars: dict = {}

    # ---- candidate settle times --------------------------------------------------------
    @property
    def candidates(self) -> dict[str, list[int]]:
        if self._candidates is None:
            cand: dict[str, list[int]] = {n: [0] for n in self.sources}
            for g in self.design.ordered_gates:
                d = self.delay[g.output]
                times = {t + d for i in g.inputs for t in cand[i]} if g.inputs else {d}
                if len(times) > MAX_CANDIDATES:
                    raise TooLarge(f"net '{g.output}' has {len(times):,} distinct path delays "
                                   f"(limit {MAX_CANDIDATES:,}); use a coarser delay table")
                cand[g.output] = sorted(times)
            self._candidates = cand
        return self._candidates

    # ---- one vector, in Python ---------------------------------------------------------
    def settle_times(self, vector: dict[str, int]) -> tuple[dict[str, int], dict[str, int],
                                                            dict[str, str | None]]:
        """(values, settle time, the input each net settled through) for one input vector."""
        value: dict[str, int] = {"0": 0, "1": 1}
        for p in self.design.inputs:
            for i, b in enumerate(p.bits):
                value[b] = int(vector.get(p.name, 0)) >> i & 1
        settle = {n: 0 for n in self.sources}
        via: dict[str, str | None] = {n: None for n in self.sources}
        for g in self.design.ordered_gates:
            op = OPS[g.op]
            vals = [value[i] for i in g.inputs]
            value[g.output] = op.bit(vals)
            best, best_in = None, None
            for group in op.settling_sets(len(g.inputs)):
                if any(v is not None and vals[i] != v for i, v in group):
                    continue
                t, last = 0, None
                for i, _ in group:
                    if last is None or settle[g.inputs[i]] > t:
                        t, last = settle[g.inputs[i]], g.inputs[i]
                if best is None or t < best:
                    best, best_in = t, last
            settle[g.output] = best + self.delay[g.output]
            via[g.output] = best_in
        return value, settle, via

    def sensitized_path(self, vector: dict[str, int], net: str) -> list[str]:
        """The chain of nets, input first, that set ``net``'s settle time for ``vector``."""
        _, _, via = self.settle_times(vector)
        return graph.path_to(via, net)

    # ---- the SAT encoding --------------------------------------------------------------
    def _fresh(self) -> int:
        self._top += 1
        return self._top

    def _build(self) -> None:
        """The value clauses of every gate; settle variables are added as queries need them."""
        from pysat.solvers import Solver

        self._top = 0
        clauses: list[list[int]] = []
        true = self._fresh()
        clauses.append([true])
        x = {"0": -true, "1": true}
        for b in self.design.input_bits:
            x[b] = self._fresh()
        for g in self.design.ordered_gates:
            x[g.output] = self._fresh()
        for g in self.design.ordered_gates:
            clauses += OPS[g.op].clauses(x[g.output], [x[i] for i in g.inputs], self._fresh)
        self._solver = Solver(name=self.solver_name, bootstrap_with=clauses)
        self._vars = {"x": x, "s": {}, "true": true}

    def _key(self, net: str, t: int):
        """'net settled by t' as: True (always), None (never) or the (net, candidate) it means."""
        if net in self.sources:
            return True if t >= 0 else None
        times = self.candidates[net]
        k = bisect.bisect_right(times, t) - 1
        return (net, times[k]) if k >= 0 else None

    def _settled(self, net: str, t: int) -> int | None:
        """The literal for 'net settled by t' (None: false), encoding what it needs on demand.

        Only the (net, candidate) pairs a query reaches backwards are encoded: for a gate at
        time t its inputs at t - d, rounded down to their candidates.
        """
        if self._solver is None:
            self._build()
        s, x, true = self._vars["s"], self._vars["x"], self._vars["true"]
        key = self._key(net, t)
        if key is None or key is True:
            return None if key is None else true
        stack = [(key, False)]
        clauses: list[list[int]] = []
        driver = self.design.driver
        while stack:
            (n, tt), ready = stack.pop()
            if (n, tt) in s:
                continue
            g = driver[n]
            d = self.delay[n]
            keys = {i: self._key(i, tt - d) for i in dict.fromkeys(g.inputs)}
            if not ready:
                missing = [k for k in keys.values() if isinstance(k, tuple) and k not in s]
                if missing:
                    stack.append(((n, tt), True))
                    stack.extend((k, False) for k in missing)
                    continue
            lit_of = {i: (true if k is True else None if k is None else s[k])
                      for i, k in keys.items()}
            v = self._fresh()
            s[(n, tt)] = v
            terms = []
            for group in OPS[g.op].settling_sets(len(g.inputs)):
                lits, dead = [], False
                for idx, want in group:
                    lit = lit_of[g.inputs[idx]]
                    if lit is None:
                        dead = True
                        break
                    if lit != true:
                        lits.append(lit)
                    if want is not None:
                        lits.append(x[g.inputs[idx]] if want else -x[g.inputs[idx]])
                if dead:
                    continue
                lits = list(dict.fromkeys(lits))
                if not lits:
                    terms = [true]
                    break
                if len(lits) == 1:
                    terms.append(lits[0])
                else:
                    a = self._fresh()
                    clauses += [[-a, lit] for lit in lits] + [[a, *(-lit for lit in lits)]]
                    terms.append(a)
            clauses.append([-v, *terms])
            clauses += [[v, -a] for a in terms]
        self._solver.append_formula(clauses)
        return s[key]

    def _solve(self, assumptions: list[int], deadline: float | None) -> bool:
        if self._solver is None:
            self._build()
        if deadline is None:
            return self._solver.solve(assumptions=assumptions)
        if self.solver_name != INTERRUPTIBLE_SOLVER:
            raise ValueError("a deadline needs Analysis(..., interruptible=True)")
        left = deadline - _time.monotonic()
        if left <= 0:
            raise TimeLimit()
        timer = threading.Timer(left, self._solver.interrupt)
        timer.start()
        try:
            answer = self._solver.solve_limited(assumptions=assumptions, expect_interrupt=True)
        finally:
            timer.cancel()
            self._solver.clear_interrupt()
        if answer is None:
            raise TimeLimit()
        return answer

    def _model_vector(self) -> dict[str, int]:
        model = self._solver.get_model()  # model[v - 1] is v or -v
        x = self._vars["x"]
        out = {}
        for p in self.design.inputs:
            out[p.name] = sum(1 << i for i, b in enumerate(p.bits) if model[x[b] - 1] > 0)
        return out

    def unsettled_at(self, nets: list[str], t: int, deadline: float | None = None
                     ) -> dict[str, int] | None:
        """An input vector for which some net of ``nets`` has not settled by ``t``, or None."""
        if self._solver is None:
            self._build()
        lits = []
        for n in nets:
            lit = self._settled(n, t)
            if lit is None:  # cannot have settled this early for any vector
                return {p.name: 0 for p in self.design.inputs}
            if lit != self._vars["true"]:
                lits.append(lit)
        if not lits:
            return None
        if len(lits) == 1:
            return self._model_vector() if self._solve([-lits[0]], deadline) else None
        sel = self._fresh()
        self._solver.add_clause([-sel, *(-lit for lit in lits)])  # sel -> some net unsettled
        try:
            return self._model_vector() if self._solve([sel], deadline) else None
        finally:
            self._solver.add_clause([-sel])

    def exact(self, net: str, deadline: float | None = None) -> OutputTiming:
        """The exact floating-mode delay of one net, a witness vector and its sensitized path."""
        top = self.arrival[net]
        longest = graph.path_to(self.came_from, net)
        if net in self.sources:
            return OutputTiming(net, 0, 0, longest, {p.name: 0 for p in self.design.inputs},
                                [net])
        times = self.candidates[net]
        lo, hi = 0, len(times) - 1  # times[hi] always settles: it is the longest path
        witness = None
        while lo < hi:
            mid = (lo + hi) // 2
            vec = self.unsettled_at([net], times[mid], deadline)
            if vec is None:
                hi = mid
            else:
                lo, witness = mid + 1, vec
        if witness is None or self.settle_times(witness)[1][net] != times[lo]:
            # either nothing is unsettled below the first candidate (every vector settles at
            # times[0]) or the last witness came from an earlier probe: find one at times[lo]
            witness = self.unsettled_at([net], times[lo] - 1, deadline) if lo > 0 else None
            if witness is None:
                witness = {p.name: 0 for p in self.design.inputs}
        settle = self.settle_times(witness)[1][net]
        assert settle == times[lo], (net, settle, times[lo])  # the SAT answer, re-simulated
        return OutputTiming(net, top, times[lo], longest, witness,
                            self.sensitized_path(witness, net))

    def close(self) -> None:
        if self._solver is not None:
            self._solver.delete()
            self._solver = None
