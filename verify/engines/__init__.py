"""Engines: each is ``run(design, spec, options) -> EngineOutcome``.

``exhaustive`` simulates every input combination, ``smt`` asks z3 for an input where the design and
the spec differ, ``random`` simulates seeded vectors aimed at the hard cases of addition,
``sweep`` proves internal equivalences then the outputs with small SAT queries, ``bdd`` compares
the outputs as binary decision diagrams. Engines do
not print; they call ``options.progress(done, total)`` when it is set.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Mapping

from verify.model.netlist import Netlist
from verify.model.result import Counterexample, EngineOutcome

#: the largest input space the exhaustive engine takes by default: 2^26 vectors
DEFAULT_EXHAUSTIVE_BITS = 26
#: the random engine's default number of vectors
DEFAULT_VECTORS = 200_000
#: seconds a solver or a long simulation may take before its outcome is undecided
DEFAULT_TIMEOUT = 60.0


@dataclass(frozen=True)
class Options:
    seed: int = 1
    vectors: int | None = None
    timeout: float = DEFAULT_TIMEOUT
    exhaustive_limit: int = DEFAULT_EXHAUSTIVE_BITS
    #: (index from 1, count): cover only that part of the exhaustive input space
    shard: tuple[int, int] | None = None
    progress: Callable[[int, int], None] | None = None


def confirm(design: Netlist, spec, inputs: Mapping[str, int], simulator=None) -> Counterexample | None:
    """Re-simulate one vector on the design and re-evaluate the spec on Python integers.

    Returns the counterexample when they differ, None when they agree. Every engine passes its
    candidate through here, so a reported failure never rests on one engine's word alone.
    """
    from verify.sim import Simulator

    sim = simulator or Simulator(design)
    ins = {p.name: int(inputs.get(p.name, 0)) & ((1 << p.width) - 1) for p in design.inputs}
    actual = sim.evaluate(ins)
    expected = spec.evaluate(ins)
    if all(actual[p] == expected[p] for p in expected):
        return None
    return Counterexample(ins, {p.name: expected[p.name] for p in design.outputs},
                          {p.name: actual[p.name] for p in design.outputs})


def confirmed(engine: str, design: Netlist, spec, inputs: Mapping[str, int]) -> Counterexample:
    """``confirm`` for a vector an engine found failing; if it does not re-simulate as a failure,
    the engine and the integer spec disagree, which is a bug in this tool, never a verdict."""
    cex = confirm(design, spec, inputs)
    if cex is None:
        raise RuntimeError(f"{engine} engine: input {dict(inputs)} differs from the spec's "
                           "reference but not from the spec on integers")
    return cex


def stopped(engine: str, seconds: float, options: Options, done: int, total: int,
            details: dict) -> EngineOutcome:
    """The outcome of a simulation cut short by the time limit: undecided, never a pass."""
    return EngineOutcome(engine, "undecided", seconds,
                         f"stopped at the {options.timeout:g} s limit after {done:,} of {total:,} "
                         f"vectors, all matching", vectors=done, details=details)
