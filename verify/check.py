"""The Python API: check a design against a spec with one or more engines.

::

    import verify
    result = verify.check(verify.load("designs/larkspur_add8_ripple.json"),
                          spec="{cout, sum} = a + b + cin")
    assert result.ok, result.coverage

``engine="auto"`` (the default) is a portfolio: random vectors first (``vectors`` of them,
default 20,000), to find a bug fast; then the exhaustive engine when the input bits fit its limit
(unless the random stage already simulated the whole space); otherwise the sweeping engine
(internal equivalences), then the BDD engine, then z3, each only if the one before gave no answer,
all within one CPU-time limit. If none answers, the verdict is undecided: passing random vectors
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
from verify.model.result import CheckResult, EngineOutcome, Require, ShardPart, Verdict, combine

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


def shard_binding(design: dict, spec: str, shard: dict) -> str:
    """A content hash tying a shard result to its design (name, hash, ports), spec and range,
    so that ``merge`` refuses a file whose name, port widths, spec or range was edited. Anyone
    can recompute it: it catches edits and mix-ups, not a deliberate forgery."""
    import hashlib
    import json

    data = {"design": {k: design.get(k) for k in ("name", "hash", "inputs", "outputs")},
            "spec": spec,
            "shard": {k: shard.get(k) for k in ("index", "count", "vectors", "first", "last")}}
    return hashlib.sha256(json.dumps(data, sort_keys=True).encode()).hexdigest()


def _whole(value) -> bool:
    return isinstance(value, int) and not isinstance(value, bool)


def _check_options(seed, vectors, timeout, exhaustive_limit) -> None:
    """Refuse option values no engine can honour, as InputError (exit 2), before any work."""
    if not _whole(seed) or seed < 0:
        raise InputError(f"must be a whole number >= 0, got {seed!r}", option="seed")
    if vectors is not None and (not _whole(vectors) or vectors < 1):
        raise InputError(f"must be a whole number >= 1, got {vectors!r}", option="vectors")
    if isinstance(timeout, bool) or not isinstance(timeout, (int, float)) or not math.isfinite(timeout) \
            or timeout <= 0:
        raise InputError(f"must be a positive number of seconds, got {timeout!r}", option="timeout")
    if timeout > MAX_TIMEOUT:
        raise InputError(f"{timeout:g} s is more than {MAX_TIMEOUT:,} s (a week); give a real limit",
                         option="timeout")
    if not _whole(exhaustive_limit) or not 1 <= exhaustive_limit <= 40:
        raise InputError(f"must be a whole number from 1 to 40, got {exhaustive_limit!r}",
                         option="exhaustive_limit")


def check(design: Netlist | str | Path, spec=None, *, engine: str = "auto", seed: int = 1,
          vectors: int | None = None, timeout: float = DEFAULT_TIMEOUT,
          require: str | Require = Require.TESTED,
          exhaustive_limit: int = DEFAULT_EXHAUSTIVE_BITS, shrink: bool = True,
          shard: tuple[int, int] | None = None, strength: int | None = None,
          progress: Callable[[str, int, int], None] | None = None,
          settle_within: float | None = None, delays=None,
          cross_check: bool = False) -> CheckResult:
    """Establish what can be established about ``design`` against ``spec``.

    ``spec`` is equation text, a ``verify.spec.Spec`` or None (inferred from port names).
    ``require="complete"`` makes a result that is only ``tested`` fail (exit code 3).
    ``shard=(k, n)`` limits the exhaustive engine to the k-th of n disjoint parts.
    ``settle_within=D`` also proves every output settled by time D for every input under the
    ``delays`` model (``verify.timing.settle_check``); a late output fails, a time limit leaves
    the verdict undecided.
    ``strength=N`` injects N single faults into copies of the design and reports in
    ``result.strength`` what fraction the same random vectors catch (an estimate, not a proof);
    only when random vectors are the strongest evidence (a tested or undecided verdict).
    ``cross_check=True`` makes two independent complete engines agree before a complete verdict
    (raises ``EngineDisagreement`` when they do not).
    Raises InputError for bad input; never returns a passing verdict no engine established.
    """
    started = time.perf_counter()
    if not isinstance(design, Netlist):
        from verify.formats import load
        design = load(design)
    if engine not in ENGINE_NAMES:
        raise InputError(f"unknown engine '{engine}' (choose from {', '.join(ENGINE_NAMES)})",
                         option="engine")
    require = Require(require) if not isinstance(require, Require) else require
    if shard is not None:
        k, n = shard
        if engine != "exhaustive":
            raise InputError("works with the exhaustive engine only", option="shard")
        if not (isinstance(k, int) and isinstance(n, int) and 1 <= k <= n):
            raise InputError(f"{k}/{n}: give K/N with 1 <= K <= N", option="shard")
    _check_options(seed, vectors, timeout, exhaustive_limit)
    if settle_within is not None:
        if isinstance(settle_within, bool) or not isinstance(settle_within, (int, float)) \
                or not math.isfinite(settle_within) or settle_within < 0:
            raise InputError(f"must be a time >= 0, got {settle_within!r}", option="settle_within")
        from verify.timing.delays import resolve as resolve_delays
        delays = resolve_delays(delays)
    if strength is not None and (not _whole(strength) or not 1 <= strength <= 100_000):
        raise InputError(f"must be a whole number of faults from 1 to 100,000, got {strength!r}",
                         option="strength")
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
        first = vectors if vectors else AUTO_RANDOM_VECTORS  # --vectors sets this stage
        outcomes.append(_engine("random")(design, the_spec, options("random", vectors=first)))
        if outcomes[-1].status != "fail" and outcomes[-1].engine != "exhaustive":
            # (the random stage simulated the whole space when it fitted its budget)
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
    if settle_within is not None and verdict is not Verdict.FAIL:
        from verify.timing.settle import settle_check
        outcomes.append(settle_check(design, the_spec, settle_within, delays, time_limit=timeout))
        if outcomes[-1].status == "fail":
            verdict, cex = Verdict.FAIL, outcomes[-1].counterexample
            shrink = False  # the vector is the settle witness; a smaller one may settle in time
        elif outcomes[-1].status != "pass" and verdict is not Verdict.FAIL:
            verdict = Verdict.UNDECIDED
    found = shard_part = strength_figures = None
    if cex is not None and shrink:
        from verify.engines.shrink import shrink as shrink_cex
        small = shrink_cex(design, the_spec, cex)
        if small != cex:
            found = cex
        cex = small
    if shard is not None and outcomes[0].details.get("shard"):
        part = dict(outcomes[0].details["shard"])
        part["binding"] = shard_binding(
            {"name": design.name, "hash": design.content_hash(),
             "inputs": {p.name: p.width for p in design.inputs},
             "outputs": {p.name: p.width for p in design.outputs}}, the_spec.text, part)
        shard_part = ShardPart(**part)
        if verdict is Verdict.EXHAUSTIVE and shard[1] > 1:
            verdict = Verdict.TESTED  # one part of the space: 'adder-verify merge' gives the whole
    sampled = [o for o in outcomes if o.engine == "random" and o.status == "pass"]
    if strength and sampled and verdict in (Verdict.TESTED, Verdict.UNDECIDED):
        from verify.engines.strength import estimate
        strength_figures = estimate(design, the_spec, faults=strength, seed=seed,
                                    vectors=sampled[0].vectors, time_limit=timeout)
    return CheckResult(
        design=design.name, design_hash=design.content_hash(),
        ports={"inputs": {p.name: p.width for p in design.inputs},
               "outputs": {p.name: p.width for p in design.outputs}},
        gate_count=len(design.gates), spec=the_spec.text, spec_inferred=the_spec.inferred,
        engines=outcomes, verdict=verdict, require=require, counterexample=cex,
        seconds=time.perf_counter() - started, origin=design.origin,
        found_counterexample=found, shard=shard_part, strength=strength_figures)


def _unconfirmed(first: EngineOutcome, second: EngineOutcome) -> EngineOutcome:
    """A pass that a required cross-check could not confirm: undecided, with both evidences."""
    return EngineOutcome(first.engine, "undecided", first.seconds,
                         f"{first.evidence}; not confirmed: the cross-check by {second.engine} gave "
                         f"no answer", first.vectors, None, dict(first.details, unconfirmed=True))
