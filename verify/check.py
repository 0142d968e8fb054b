"""The Python API: check a design against a spec with one or more engines.

::

    import verify
    result = verify.check(verify.load("designs/larkspur_add8_ripple.json"),
                          spec="{cout, sum} = a + b + cin")
    assert result.ok, result.coverage

``engine="auto"`` (the default) is a portfolio: random vectors first, to find a bug fast; then the
exhaustive engine when the input bits fit its limit; otherwise the sweeping engine (internal
equivalences), then the BDD engine, then z3, each only if the one before gave no answer, all
within one CPU-time limit. If none answers, the verdict is undecided: passing random vectors
never stands in for a proof. ``cross_check=True`` asks a second, independent complete engine to
agree with the first before ``proven`` (or a complete engine's failure) is given; if they
disagree, ``EngineDisagreement`` is raised (a bug in this tool, never a verdict).
"""

from __future__ import annotations

import math
import time
from pathlib import Path
from typing import Callable

from verify.engines import DEFAULT_EXHAUSTIVE_BITS, DEFAULT_TIMEOUT, Options
from verify.errors import EngineDisagreement, InputError
from verify.model.netlist import Netlist
from verify.model.result import CheckResult, EngineOutcome, Require, Verdict, combine

#: engine name -> module under verify/engines/ with run(design, spec, options)
ENGINES = {"exhaustive": "exhaustive", "smt": "smt", "random": "randomized", "sweep": "sweep",
           "bdd": "bdd"}
ENGINE_NAMES = ("auto", *ENGINES)
#: engines that decide the whole input space (a pass is proven or exhaustive)
COMPLETE_ENGINES = ("exhaustive", "sweep", "bdd", "smt")
#: the order auto tries complete engines in, past the exhaustive limit
PORTFOLIO = ("sweep", "bdd", "smt")
#: how many random vectors auto runs before the complete engine
AUTO_RANDOM_VECTORS = 20_000
#: the longest time limit accepted (a week): past it a limit means nothing
MAX_TIMEOUT = 7 * 24 * 3600


def _engine(name: str):
    import importlib
    return importlib.import_module(f"verify.engines.{ENGINES[name]}").run


def _partner(name: str, design: Netlist, exhaustive_limit: int) -> str:
    """An independent complete engine to confirm ``name``'s answer."""
    for other in ("sweep", "bdd", "smt"):
        if other != name:
            return other
    raise AssertionError(name)  # pragma: no cover


def resolve_spec(design: Netlist, spec=None):
    """A Spec object from text, an existing Spec, or None (inferred from the ports)."""
    from verify import spec as specmod
    if spec is None:
        return specmod.infer(design)
    if isinstance(spec, str):
        if not spec.strip():
            raise InputError("the spec is empty", "spec")
        return specmod.parse(spec, design)
    if not isinstance(spec, specmod.Spec):
        raise InputError(f"a spec is equation text or a verify.spec.Spec, not {type(spec).__name__}",
                         "spec")
    return spec


def _whole(value) -> bool:
    return isinstance(value, int) and not isinstance(value, bool)


def _check_options(seed, vectors, timeout, exhaustive_limit) -> None:
    """Refuse option values no engine can honour, as InputError (exit 2), before any work."""
    if not _whole(seed) or seed < 0:
        raise InputError(f"--seed must be a whole number >= 0, got {seed!r}")
    if vectors is not None and (not _whole(vectors) or vectors < 1):
        raise InputError(f"--vectors must be a whole number >= 1, got {vectors!r}")
    if isinstance(timeout, bool) or not isinstance(timeout, (int, float)) or not math.isfinite(timeout) \
            or timeout <= 0:
        raise InputError(f"--timeout must be a positive number of seconds, got {timeout!r}")
    if timeout > MAX_TIMEOUT:
        raise InputError(f"--timeout {timeout:g} is more than {MAX_TIMEOUT:,} s (a week); "
                         "give a real limit")
    if not _whole(exhaustive_limit) or not 1 <= exhaustive_limit <= 40:
        raise InputError(f"--exhaustive-limit must be a whole number from 1 to 40, got "
                         f"{exhaustive_limit!r}")


def check(design: Netlist | str | Path, spec=None, *, engine: str = "auto", seed: int = 1,
          vectors: int | None = None, timeout: float = DEFAULT_TIMEOUT,
          require: str | Require = Require.TESTED,
          exhaustive_limit: int = DEFAULT_EXHAUSTIVE_BITS, shrink: bool = True,
          shard: tuple[int, int] | None = None,
          progress: Callable[[str, int, int], None] | None = None,
          cross_check: bool = False) -> CheckResult:
    """Establish what can be established about ``design`` against ``spec``.

    ``spec`` is equation text, a ``verify.spec.Spec`` or None (inferred from port names).
    ``require="complete"`` makes a result that is only ``tested`` fail (exit code 3).
    ``shard=(k, n)`` limits the exhaustive engine to the k-th of n disjoint parts.
    ``cross_check=True`` makes two independent complete engines agree before a complete verdict
    (raises ``EngineDisagreement`` when they do not).
    Raises InputError for bad input; never returns a passing verdict no engine established.
    """
    started = time.perf_counter()
    if not isinstance(design, Netlist):
        from verify.formats import load
        design = load(design)
    if engine not in ENGINE_NAMES:
        raise InputError(f"unknown engine '{engine}' (choose from {', '.join(ENGINE_NAMES)})")
    require = Require(require) if not isinstance(require, Require) else require
    if shard is not None:
        k, n = shard
        if engine != "exhaustive":
            raise InputError("--shard works with --engine exhaustive only")
        if not (isinstance(k, int) and isinstance(n, int) and 1 <= k <= n):
            raise InputError(f"shard {k}/{n}: give K/N with 1 <= K <= N")
    _check_options(seed, vectors, timeout, exhaustive_limit)
    if shard is not None and shard[1] > 1 << design.input_width:
        raise InputError(f"shard {shard[0]}/{shard[1]}: the input space of {design.name} has only "
                         f"2^{design.input_width} = {1 << design.input_width:,} vectors; give at "
                         f"most that many shards")
    the_spec = resolve_spec(design, spec)

    def options(name: str, **over) -> Options:
        cb = (lambda done, total: progress(name, done, total)) if progress else None
        base = dict(seed=seed, vectors=vectors, timeout=timeout, exhaustive_limit=exhaustive_limit,
                    shard=shard, progress=cb)
        base.update(over)
        return Options(**base)

    outcomes: list[EngineOutcome] = []
    budget_start = time.process_time()

    def remaining() -> float:
        return max(0.001, timeout - (time.process_time() - budget_start))

    if engine == "auto":
        first = min(vectors, AUTO_RANDOM_VECTORS) if vectors else AUTO_RANDOM_VECTORS
        outcomes.append(_engine("random")(design, the_spec, options("random", vectors=first)))
        if outcomes[-1].status != "fail":
            chain = ("exhaustive",) if design.input_width <= exhaustive_limit else PORTFOLIO
            for name in chain:
                outcomes.append(_engine(name)(design, the_spec, options(name, timeout=remaining())))
                if outcomes[-1].status in ("pass", "fail"):
                    break
    else:
        outcomes.append(_engine(engine)(design, the_spec, options(engine)))
    if cross_check:
        decided = next((e for e in reversed(outcomes)
                        if e.engine in COMPLETE_ENGINES and e.status in ("pass", "fail")), None)
        if decided is not None and shard is None:
            other = _partner(decided.engine, design, exhaustive_limit)
            second = _engine(other)(design, the_spec, options(other))
            outcomes.append(second)
            if second.status in ("pass", "fail") and second.status != decided.status:
                raise EngineDisagreement(decided, second)
            if second.status != decided.status and decided.status == "pass":
                # the second engine gave no answer: the proof is not cross-checked
                outcomes[outcomes.index(decided)] = _unconfirmed(decided, second)

    verdict, cex = combine(outcomes)
    if engine == "auto" and verdict is Verdict.TESTED:
        verdict = Verdict.UNDECIDED  # the complete engine was asked and gave no answer
    extras: dict = {}
    if cex is not None and shrink:
        from verify.engines.shrink import shrink as shrink_cex
        small = shrink_cex(design, the_spec, cex)
        if small != cex:
            extras["found_counterexample"] = cex.to_json()
        cex = small
    if shard is not None and outcomes[0].details.get("shard"):
        extras["shard"] = outcomes[0].details["shard"]
        if verdict is Verdict.EXHAUSTIVE and shard[1] > 1:
            verdict = Verdict.TESTED  # one part of the space: 'verify merge' gives the whole
    return CheckResult(
        design=design.name, design_hash=design.content_hash(),
        ports={"inputs": {p.name: p.width for p in design.inputs},
               "outputs": {p.name: p.width for p in design.outputs}},
        gate_count=len(design.gates), spec=the_spec.text, spec_inferred=the_spec.inferred,
        engines=outcomes, verdict=verdict, require=require, counterexample=cex,
        seconds=time.perf_counter() - started, origin=design.origin, extras=extras)


def _unconfirmed(first: EngineOutcome, second: EngineOutcome) -> EngineOutcome:
    """A pass that a required cross-check could not confirm: undecided, with both evidences."""
    return EngineOutcome(first.engine, "undecided", first.seconds,
                         f"{first.evidence}; not confirmed: the cross-check by {second.engine} gave "
                         f"no answer", first.vectors, None, dict(first.details, unconfirmed=True))
