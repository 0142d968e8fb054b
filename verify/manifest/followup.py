"""What a reviewer does next with a manifest record: the command that reproduces it, and for a
counterexample the diagnosis (suspects, bit table, cone, waveform) the reports draw.

``reproduce_argv`` gives, for a record with a counterexample, ``adder-verify explain`` on the very
vector of the counterexample (it exits 1 while the design is wrong on it); for any other record,
``adder-verify check`` with the entry's options. Paths are those of the manifest as it was named
(relative to the folder the run started in when the manifest was given by a relative path).

``diagnose_entry`` loads the design again and analyses the counterexample; the result is advice,
not a verdict, and is never cached.
"""

from __future__ import annotations

import os
from pathlib import Path

from verify.errors import InputError
from verify.manifest.records import EntryDiagnosis, EntryRecord

PROGRAM = "adder-verify"


def _value(v: int) -> str:
    return str(v) if v < 10 else hex(v)


def _design_args(entry, point: dict[str, int], base: Path) -> list[str]:
    args = [os.path.normpath(base / f) for f in entry.sources]
    if entry.top:
        args += ["--top", entry.top]
    for name, value in point.items():
        args += ["--param", f"{name}={value}"]
    for d in entry.include_dirs:
        args += ["-I", os.path.normpath(base / d)]
    for name, value in entry.defines:
        args += ["-D", name if value is None else f"{name}={value}"]
    for c in entry.cells:
        args += ["--cells", os.path.normpath(base / c)]
    return args


def reproduce_argv(entry, point: dict[str, int], record: EntryRecord, base: str | Path
                   ) -> list[str]:
    """The command line (argv, program first) that reproduces ``record``; ``base`` is the
    manifest's folder as the run named it."""
    base = Path(base)
    args = _design_args(entry, point, base)
    cex = record.counterexample
    if cex:
        vector = ",".join(f"{k}={_value(v)}" for k, v in cex["inputs"].items())
        return [PROGRAM, "explain", *args, "--spec", entry.spec, "--input", vector]
    out = [PROGRAM, "check", *args, "--spec", entry.spec, "--engine", entry.method,
           "--require", entry.require, "--timeout", f"{entry.time_limit:g}"]
    if entry.seed != 1:
        out += ["--seed", str(entry.seed)]
    if entry.vectors is not None:
        out += ["--vectors", str(entry.vectors)]
    if entry.exhaustive_limit is not None:
        out += ["--exhaustive-limit", str(entry.exhaustive_limit)]
    return out


def diagnose_entry(entry, point: dict[str, int], root: str | Path, record: EntryRecord
                   ) -> EntryDiagnosis | None:
    """The diagnosis of the record's counterexample (None when it has none)."""
    if not record.counterexample:
        return None
    from verify.check import resolve_spec
    from verify.diagnosis.explain import analyse_failure, cone_text, waveform_text
    from verify.manifest.entries import load_entry
    from verify.model.result import Counterexample

    root = Path(root)
    try:
        design = load_entry(entry, point, root)
        spec = resolve_spec(design, entry.spec)
        cex = Counterexample.from_json(record.counterexample)
        an, findings = analyse_failure(design, spec, cex)
    except InputError as e:  # the files changed under the run, or a cached record went stale
        return EntryDiagnosis(problem=f"the design could not be diagnosed again: {e}")
    suspects = findings.pop("suspects")
    for key in ("vcd", "dot", "svg"):  # no files here: the report writes its own
        findings.pop(key, None)
    return EntryDiagnosis(suspects=suspects, details=findings, cone_dot=cone_text(an, findings),
                          waveform_vcd=waveform_text(an))
