"""The one result type, shared by engines, the Python API, reports and the command line.

Verdicts, strongest first, and what each one covers:

============  =====================================================================  ====
verdict       meaning                                                                exit
============  =====================================================================  ====
proven        a complete engine (z3, sweeping, BDD) showed no input makes any output     0
              differ from the spec
exhaustive    every combination of every input bit was simulated and matched         0
tested        N vectors matched; a sample, never a proof                             0 (3 with require=complete)
fail          a counterexample: an input where some output differs (re-simulated)    1
undecided  no engine established anything (timeout, solver unknown, too large)    3
error         bad input: nothing was checked                                         2
============  =====================================================================  ====

Engine statuses (``Status``): ``pass`` (the engine established what its evidence says),
``fail`` (it found a counterexample), ``undecided`` (it stopped without an answer: timeout,
unknown, limit) and ``skipped`` (not run, with the reason in its evidence).

``CheckResult.to_json`` is the one place a result becomes JSON (``--json``, reports, the run
log's counterexample); every field a later stage adds (diagnosis, shard range) is a typed field
here, never an untyped dictionary edited in place.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from enum import Enum
from typing import Any


class Verdict(str, Enum):
    PROVEN = "proven"
    EXHAUSTIVE = "exhaustive"
    TESTED = "tested"
    FAIL = "fail"
    UNDECIDED = "undecided"
    ERROR = "error"

    def __str__(self) -> str:  # pragma: no cover - trivial
        return self.value


COMPLETE = (Verdict.PROVEN, Verdict.EXHAUSTIVE)


class Status(str, Enum):
    """What one engine did."""

    PASS = "pass"
    FAIL = "fail"
    UNDECIDED = "undecided"
    SKIPPED = "skipped"

    def __str__(self) -> str:  # pragma: no cover - trivial
        return self.value


#: engines whose pass is a proof, and how the coverage sentence names them
PROOF_ENGINES = {"smt": "z3", "sweep": "internal-equivalence sweeping", "bdd": "BDD comparison"}

#: the cautions every verdict carries
SCOPE_NOTE = (
    "A verdict covers the modeled two-valued logic at this width only, and a settle time only "
    "under the stated gate-delay model (floating mode): not X-propagation, wire delays, slews or "
    "other physical effects. Sign-off stays with your own flow and its rules."
)


class Require(str, Enum):
    """How strong a verdict must be to count as meeting the spec."""

    TESTED = "tested"  # proven, exhaustive or tested
    COMPLETE = "complete"  # proven or exhaustive only


@dataclass(frozen=True)
class Counterexample:
    """An input vector where the design's outputs differ from the spec."""

    inputs: dict[str, int]
    expected: dict[str, int]
    actual: dict[str, int]

    def wrong_bits(self) -> dict[str, list[int]]:
        """output port -> bit indices that differ, LSB first; ports that agree are left out."""
        out = {}
        for port, want in self.expected.items():
            diff = want ^ self.actual.get(port, 0)
            bits = [i for i in range(diff.bit_length()) if diff >> i & 1]
            if bits:
                out[port] = bits
        return out

    def to_json(self) -> dict[str, Any]:
        return {"inputs": dict(self.inputs), "expected": dict(self.expected),
                "actual": dict(self.actual), "wrong_bits": self.wrong_bits()}

    @classmethod
    def from_json(cls, data: dict[str, Any]) -> "Counterexample":
        return cls(dict(data["inputs"]), dict(data["expected"]), dict(data["actual"]))


@dataclass(frozen=True)
class EngineOutcome:
    """What one engine established, in one sentence (``evidence``), with its figures."""

    engine: str  # exhaustive | smt | random | sweep | bdd | settle
    status: Status
    seconds: float
    evidence: str
    vectors: int | None = None  # how many input vectors were simulated, where that applies
    counterexample: Counterexample | None = None
    details: dict[str, Any] = field(default_factory=dict)

    def __post_init__(self) -> None:
        object.__setattr__(self, "status", Status(self.status))  # refuses an unknown status

    def to_json(self) -> dict[str, Any]:
        out: dict[str, Any] = {"engine": self.engine, "status": self.status.value,
                               "seconds": round(self.seconds, 6), "evidence": self.evidence}
        if self.vectors is not None:
            out["vectors"] = self.vectors
        if self.counterexample is not None:
            out["counterexample"] = self.counterexample.to_json()
        out.update(self.details)
        return out


@dataclass(frozen=True)
class ShardPart:
    """The part of the exhaustive input space one shard covered (vectors first..last)."""

    index: int
    count: int
    first: int
    last: int
    vectors: int
    #: a hash binding the shard to its design, ports, spec and range (see check.shard_binding)
    binding: str | None = None

    def to_json(self) -> dict[str, Any]:
        out: dict[str, Any] = {"index": self.index, "count": self.count, "first": self.first,
                               "last": self.last, "vectors": self.vectors}
        if self.binding is not None:
            out["binding"] = self.binding
        return out


@dataclass
class Diagnosis:
    """What the diagnosis of a failure found: advice for a person, never a verdict."""

    #: ranked suspects, most likely first (JSON-ready records)
    suspects: list[dict[str, Any]] = field(default_factory=list)
    #: files written: the waveform, the cone picture (DOT and SVG)
    vcd: str | None = None
    dot: str | None = None
    svg: str | None = None
    #: the rest of the findings (trace, bit table, model, notes), JSON-ready
    details: dict[str, Any] = field(default_factory=dict)

    def to_json(self) -> dict[str, Any]:
        out: dict[str, Any] = {"suspects": self.suspects, "vcd": self.vcd}
        if self.dot:
            out["dot"], out["svg"] = self.dot, self.svg
        out["diagnosis"] = self.details
        return out


@dataclass
class CheckResult:
    """Everything one check established about one design against one spec."""

    design: str  # design name
    design_hash: str
    ports: dict[str, dict[str, int]]  # {"inputs": {name: width}, "outputs": {...}}
    gate_count: int
    spec: str
    spec_inferred: bool
    engines: list[EngineOutcome]
    verdict: Verdict
    require: Require = Require.TESTED
    counterexample: Counterexample | None = None
    seconds: float = 0.0
    origin: str | None = None
    #: the counterexample as found, when shrinking made it smaller
    found_counterexample: Counterexample | None = None
    #: the part of the input space a shard covered
    shard: ShardPart | None = None
    #: the diagnosis of a failure, attached by verify.diagnosis
    diagnosis: Diagnosis | None = None
    #: how strong the random sample was on injected faults: {faults, caught, fraction, missed}
    #: (an estimate of the vectors' strength, never a proof; verify.engines.strength)
    strength: dict[str, Any] | None = None

    @property
    def ok(self) -> bool:
        return self.exit_code == 0

    @property
    def exit_code(self) -> int:
        return exit_code(self.verdict, self.require)

    @property
    def coverage(self) -> str:
        """One sentence: exactly what the verdict covers (and, when a settle time was proven,
        under which delay model)."""
        text = self._function_coverage()
        settled = next((e for e in self.engines if e.engine == "settle" and e.status == "pass"), None)
        if settled is not None and self.verdict in COMPLETE:
            text += f"; and {settled.evidence}"
        return text

    def _function_coverage(self) -> str:
        bits = sum(self.ports["inputs"].values())
        v = self.verdict
        if v is Verdict.PROVEN:
            by = ", ".join(PROOF_ENGINES[e.engine] for e in self.engines
                           if e.status == "pass" and e.engine in PROOF_ENGINES)
            return (f"proven by {by} for all 2^{bits} values of the {bits} input bits: every output "
                    f"equals the spec")
        if v is Verdict.EXHAUSTIVE:
            return (f"all 2^{bits} = {2 ** bits:,} input combinations simulated; every output "
                    f"equals the spec")
        if v is Verdict.TESTED and self.shard is not None:
            sh = self.shard
            return (f"shard {sh.index}/{sh.count}: vectors {sh.first:,}..{sh.last:,} of "
                    f"the 2^{bits} simulated, all matched; 'adder-verify merge' over all {sh.count} "
                    f"shards gives the exhaustive verdict")
        if v is Verdict.TESTED:
            n = sum(e.vectors or 0 for e in self.engines if e.status == "pass")
            return (f"tested {n:,} input vector{'s' if n != 1 else ''}, all matched; this is a "
                    f"sample of the 2^{bits} "
                    f"inputs, not a proof")
        if v is Verdict.FAIL:
            failed = {e.engine for e in self.engines if e.status == "fail"}
            if failed == {"settle"}:
                return ("counterexample found: an output is not settled by the time asked for on "
                        "this input (its final value is right; the design is late, not wrong)")
            return "counterexample found: the design does not meet the spec"
        if v is Verdict.UNDECIDED:
            return "no engine established the spec (see each engine's evidence)"
        return "nothing was checked"

    def to_json(self) -> dict[str, Any]:
        out: dict[str, Any] = {
            "ok": self.ok,
            "verdict": self.verdict.value,
            "exit_code": self.exit_code,
            "require": self.require.value,
            "coverage": self.coverage,
            "design": {"name": self.design, "hash": self.design_hash, "origin": self.origin,
                       "gates": self.gate_count, **self.ports},
            "spec": self.spec,
            "spec_inferred": self.spec_inferred,
            "engines": [e.to_json() for e in self.engines],
            "seconds": round(self.seconds, 6),
            "note": SCOPE_NOTE,
        }
        if self.counterexample is not None:
            out["counterexample"] = self.counterexample.to_json()
        if self.found_counterexample is not None:
            out["found_counterexample"] = self.found_counterexample.to_json()
        if self.shard is not None:
            out["shard"] = self.shard.to_json()
        if self.diagnosis is not None:
            out.update(self.diagnosis.to_json())
        if self.strength is not None:
            out["strength"] = self.strength
        return out


def exit_code(verdict: Verdict, require: Require = Require.TESTED) -> int:
    if verdict in COMPLETE:
        return 0
    if verdict is Verdict.TESTED:
        return 0 if require is Require.TESTED else 3
    if verdict is Verdict.FAIL:
        return 1
    if verdict is Verdict.ERROR:
        return 2
    return 3


def worst_exit_code(codes) -> int:
    """One exit code for several results: 2 (bad input) over 1 (fail) over 3 (undecided)."""
    codes = set(codes)
    for c in (2, 1, 3):
        if c in codes:
            return c
    return 0


def combine(outcomes: list[EngineOutcome]) -> tuple[Verdict, Counterexample | None]:
    """The verdict a list of engine outcomes supports: a failure beats all, a proof beats a sample.

    An engine that was asked to establish more than a sample and could not (for example smt timing
    out after random testing passed) leaves the verdict undecided: see ``check.check``.
    """
    for e in outcomes:
        if e.status is Status.FAIL:
            return Verdict.FAIL, e.counterexample
    passed = {e.engine for e in outcomes if e.status is Status.PASS}
    if passed & set(PROOF_ENGINES):
        return Verdict.PROVEN, None
    if "exhaustive" in passed:
        return Verdict.EXHAUSTIVE, None
    if "random" in passed:
        return Verdict.TESTED, None
    return Verdict.UNDECIDED, None
