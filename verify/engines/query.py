"""Small decision problems: "can these two nodes of a little circuit differ?"

A ``Circuit`` is a list of nodes over free variables: each node is a free variable, a constant or
a gate drawing its meaning from ``verify.model.ops.OPS``. Some pairs of free variables may be
excluded together (``exclude(u, v)``: not both 1 — a segment's group generate and propagate).
``differ(u, v)`` answers whether some assignment of the free variables gives the two nodes
different values:

- with few free variables (at most ``EXHAUSTIVE_VARS``), by evaluating every assignment at once
  (bit-parallel words over all 2^k assignments): a complete check with no solver call;
- otherwise by CaDiCaL 1.9.5 through python-sat on the Tseitin clauses (``OPS[op].clauses``).

The answer is ``Answer(status, model)`` with status ``"unsat"`` (they never differ), ``"sat"`` with
a satisfying assignment ({free variable: 0/1}) or ``"unknown"`` (the solver was stopped).
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field

from verify.model.ops import OPS

#: free variables up to which a query is decided by evaluating every assignment
EXHAUSTIVE_VARS = 12
SOLVER = "cadical195"
#: conflicts in a solver's first round (then doubled each round until the time limit)
FIRST_BUDGET = 20_000


@dataclass
class Answer:
    status: str  # unsat | sat | unknown
    model: dict[int, int] = field(default_factory=dict)
    solver_call: bool = False
    variables: int = 0


class Circuit:
    def __init__(self):
        self.kind: list[str] = []  # "var" | "const0" | "const1" | op name
        self.args: list[tuple[int, ...]] = []
        self.free: list[int] = []
        self.exclusions: list[tuple[int, int]] = []
        self._hash: dict[tuple, int] = {}

    def __len__(self) -> int:
        return len(self.kind)

    def var(self) -> int:
        self.kind.append("var")
        self.args.append(())
        self.free.append(len(self.kind) - 1)
        return len(self.kind) - 1

    def const(self, v: int) -> int:
        return self.gate("const1" if v else "const0", ())

    def gate(self, op: str, args) -> int:
        args = tuple(args)
        key = (op, args)
        node = self._hash.get(key)  # structural hashing: one node per (op, inputs)
        if node is None:
            self.kind.append(op)
            self.args.append(args)
            node = self._hash[key] = len(self.kind) - 1
        return node

    def exclude(self, u: int, v: int) -> None:
        self.exclusions.append((u, v))

    # ---- deciding ----------------------------------------------------------------------------
    def differ(self, u: int, v: int, seconds: float | None = None) -> Answer:
        if u == v:
            return Answer("unsat")
        if len(self.free) <= EXHAUSTIVE_VARS:
            return self._evaluate(u, v)
        return self._solve(u, v, seconds)

    def _evaluate(self, u: int, v: int) -> Answer:
        k = len(self.free)
        size = 1 << k
        mask = (1 << size) - 1
        word: list[int] = [0] * len(self.kind)
        for t, node in enumerate(self.free):
            # the t-th variable's column of the truth table: blocks of 2^t zeros then ones
            block = (1 << (1 << t)) - 1
            pattern = 0
            step = 1 << (t + 1)
            for start in range(1 << t, size, step):
                pattern |= block << start
            word[node] = pattern
        for node, op in enumerate(self.kind):
            if op != "var":
                word[node] = OPS[op].evaluate([word[a] for a in self.args[node]], mask) & mask
        allowed = mask
        for a, b in self.exclusions:
            allowed &= ~(word[a] & word[b])
        diff = (word[u] ^ word[v]) & allowed & mask
        if not diff:
            return Answer("unsat", variables=k)
        j = (diff & -diff).bit_length() - 1
        return Answer("sat", {node: word[node] >> j & 1 for node in self.free}, variables=k)

    def _solve(self, u: int, v: int, seconds: float | None) -> Answer:
        from pysat.solvers import Solver

        top = len(self.kind)

        def fresh() -> int:
            nonlocal top
            top += 1
            return top

        clauses: list[list[int]] = []
        for node, op in enumerate(self.kind):
            if op != "var":
                clauses += OPS[op].clauses(node + 1, [a + 1 for a in self.args[node]], fresh)
        clauses += [[-(a + 1), -(b + 1)] for a, b in self.exclusions]
        clauses += [[u + 1, v + 1], [-(u + 1), -(v + 1)]]
        with Solver(name=SOLVER, bootstrap_with=clauses) as solver:
            # CaDiCaL in python-sat ignores interrupt(); a conflict budget stops it, so the
            # search runs in rounds of growing budgets with the CPU clock read between rounds
            deadline = None if seconds is None else time.process_time() + seconds
            budget = FIRST_BUDGET
            while True:
                if deadline is not None:
                    solver.conf_budget(budget)
                result = solver.solve_limited()
                if result is not None or deadline is None or time.process_time() >= deadline:
                    break
                budget = min(budget * 2, 1_000_000)
            if result is None:
                return Answer("unknown", solver_call=True, variables=top)
            if not result:
                return Answer("unsat", solver_call=True, variables=top)
            model = {abs(x) - 1: int(x > 0) for x in solver.get_model() or ()}
            return Answer("sat", {n: model.get(n, 0) for n in self.free}, solver_call=True,
                          variables=top)
