"""The typed record of one manifest entry at one parameter point, and what it means.

A record is what a worker process returns, what the cache stores, what every report draws and
what the pytest plugin judges. ``to_json``/``from_json`` are its one JSON form (the cache and the
JSON summary); the meaning against the entry (``exit_code``, ``status``) is derived, never stored
by hand.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field, fields, replace
from enum import Enum
from typing import Any

from verify.model.result import Require, Verdict, exit_code


class Standing(str, Enum):
    """What a record means against its manifest entry."""

    MET = "met"
    COUNTEREXAMPLE = "counterexample"
    UNEXPECTED_PASS = "unexpected pass"  # deliberately broken, yet an engine established it
    WEAKER = "weaker than required"
    UNDECIDED = "undecided"
    ERROR = "error"

    def __str__(self) -> str:  # pragma: no cover - trivial
        return self.value


def meets(verdict: Verdict, require: str, deliberately_broken: bool) -> int:
    """The exit code of one result against its manifest entry (0 meets it)."""
    verdict = Verdict(verdict)
    if verdict is Verdict.ERROR:
        return 2
    if deliberately_broken:
        if verdict is Verdict.FAIL:
            return 0
        if verdict in (Verdict.PROVEN, Verdict.EXHAUSTIVE):
            return 1  # the manifest says broken; an engine established it is correct
        return 3
    return exit_code(verdict, Require(require))


@dataclass
class EntryDiagnosis:
    """Advice on one counterexample of a record, worked out for a report (never a verdict, never
    cached): the ranked suspects, the other findings, the cone as DOT text and the waveform as
    VCD text. ``problem`` says why there is none when the diagnosis could not be made."""

    suspects: list[dict[str, Any]] = field(default_factory=list)
    #: the rest of verify.diagnosis.explain's findings: bits, trace, notes, model, outputs...
    details: dict[str, Any] = field(default_factory=dict)
    cone_dot: str | None = None
    waveform_vcd: str | None = None
    problem: str | None = None


@dataclass
class EntryRecord:
    """One entry at one parameter point: what was checked and what came of it."""

    name: str
    params: dict[str, int]
    label: str
    sources: list[str]
    spec: str
    require: str
    deliberately_broken: bool
    method: str
    verdict: Verdict
    error: str | None = None
    #: the manifest key at fault and what is wrong with it, when a manifest value is at fault
    error_key: str | None = None
    error_detail: str | None = None
    engines: list[dict[str, Any]] = field(default_factory=list)
    coverage: str = "nothing was checked"
    counterexample: dict[str, Any] | None = None
    design_hash: str | None = None
    design: dict[str, Any] | None = None
    #: the strength estimate of a tested verdict ({faults, caught, fraction, missed}), if asked
    strength: dict[str, Any] | None = None
    checked_seconds: float = 0.0
    # ---- set by the run that reports it ----
    cached: bool = False
    seconds: float = 0.0
    key: str | None = None
    file_hashes: dict[str, str] = field(default_factory=dict)
    #: the label of the entry whose check this one shares (same files, spec and options)
    same_as: str | None = None
    #: the command line (argv) that reproduces this record; see verify.manifest.followup
    reproduce: list[str] = field(default_factory=list)
    #: set by ``run(..., diagnose=True)`` on records with a counterexample; not stored
    diagnosis: EntryDiagnosis | None = None

    def __post_init__(self) -> None:
        self.verdict = Verdict(self.verdict)

    @property
    def exit_code(self) -> int:
        return meets(self.verdict, self.require, self.deliberately_broken)

    @property
    def ok(self) -> bool:
        return self.exit_code == 0

    @property
    def status(self) -> Standing:
        code = self.exit_code
        if code == 0:
            return Standing.MET
        if code == 2:
            return Standing.ERROR
        if code == 1:
            return Standing.UNEXPECTED_PASS if self.deliberately_broken else Standing.COUNTEREXAMPLE
        if self.verdict is Verdict.TESTED:
            return Standing.WEAKER
        return Standing.UNDECIDED

    def but(self, **changes) -> "EntryRecord":
        """A copy with some fields changed."""
        return replace(self, **changes)

    def to_json(self) -> dict[str, Any]:
        out = asdict(self.but(diagnosis=None))
        del out["diagnosis"]
        out["verdict"] = self.verdict.value
        return out

    @classmethod
    def from_json(cls, data: dict[str, Any]) -> "EntryRecord":
        known = {f.name for f in fields(cls)}
        return cls(**{k: v for k, v in data.items() if k in known})
