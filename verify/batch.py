"""Checking designs given as files: folders, parameter sweeps, diagnosis and the run log.

This is what ``adder-verify check`` does, as a Python function a hardware repo's tests can call::

    from verify.batch import check_files
    for run in check_files(["rtl/adder.sv"], spec="{cout, sum} = a + b + cin",
                           params={"W": [8, 16, 32]}):
        assert run.ok, run.headline()

Each (design, parameter point) gives one ``FileCheck``: the result, or the input error that
stopped it, and the diagnosis of a failure. Nothing is printed here.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass, field
from pathlib import Path
from typing import Callable, Mapping, Sequence

from verify.errors import InputError
from verify.formats import VERILOG_SUFFIXES
from verify.model.result import CheckResult, worst_exit_code


@dataclass
class FileCheck:
    """One design at one parameter point: its result, or the error that stopped it."""

    label: str  # the files, as given
    files: list[Path]
    params: dict[str, int]
    result: CheckResult | None = None
    error: InputError | None = None
    #: the diagnosis of a failure, as text lines for the report (empty when nothing failed)
    diagnosis: list[str] = field(default_factory=list)
    #: things worth saying that are not verdicts (the run log could not be written...)
    warnings: list[str] = field(default_factory=list)

    @property
    def exit_code(self) -> int:
        return 2 if self.result is None else self.result.exit_code

    @property
    def ok(self) -> bool:
        return self.exit_code == 0

    @property
    def name(self) -> str:
        p = " ".join(f"{k}={v}" for k, v in self.params.items())
        return f"{self.label} {p}".strip()

    def headline(self) -> str:
        if self.result is None:
            return f"{self.name}: error: {self.error}"
        return f"{self.name}: {self.result.verdict.value}: {self.result.coverage}"


def sweep_points(params: Mapping[str, Sequence[int]] | None) -> list[dict[str, int]]:
    """Every combination of the parameter values ([{}] when there are none)."""
    params = dict(params or {})
    names = list(params)
    return [dict(zip(names, combo)) for combo in itertools.product(*(params[n] for n in names))] or [{}]


def design_files(paths: Sequence[str | Path]) -> list[list[Path]]:
    """What to check: one design from the files given, or one design per file in a folder."""
    given = [Path(p) for p in paths]
    if not given or any(str(p) == "" for p in given):
        raise InputError("give a design file or a folder (an empty path names nothing)")
    if len(given) > 1 and all(p.suffix == ".json" for p in given):
        return [[p] for p in given]  # each JSON netlist is a design of its own
    if len(given) == 1 and given[0].is_dir():
        files = sorted(p for p in given[0].rglob("*")
                       if p.is_file() and p.suffix in (".json", *VERILOG_SUFFIXES)
                       and not any(part.startswith(".") for part in p.relative_to(given[0]).parts))
        if not files:
            raise InputError("no .json, .v or .sv design files in this folder", str(given[0]))
        return [[f] for f in files]
    for p in given:
        if p.is_dir():
            raise InputError("give one folder on its own, or design files", str(p))
    return [given]


def check_files(paths: Sequence[str | Path], spec=None, *,
                params: Mapping[str, Sequence[int]] | None = None, top: str | None = None,
                include_dirs: Sequence[str] = (), defines: Mapping[str, str | None] | None = None,
                diagnose: bool = True, vcd_path: str | Path | None = None,
                dot_path: str | Path | None = None, log_dir: str | Path | None = None,
                progress: Callable[[str, int, int], None] | None = None,
                **check_options) -> list[FileCheck]:
    """Check every design the paths name (a folder: each file in it) at every parameter point.

    ``check_options`` go to ``verify.check.check`` (engine, seed, vectors, timeout, require,
    exhaustive_limit, shard...). With one design at one point, an input error is raised; with
    several, it is recorded in that design's ``FileCheck`` and the others are still checked.
    ``log_dir`` appends each result to ``<log_dir>/runs.jsonl`` (None: no log).
    """
    from verify.check import check, resolve_spec
    from verify.formats import load

    units = design_files(paths)
    points = sweep_points(params)
    single = len(units) == 1 and len(points) == 1
    if (vcd_path or dot_path) and not single:
        raise InputError("a waveform or cone file is written for one design at one parameter value",
                         option="vcd" if vcd_path else "dot")
    runs: list[FileCheck] = []
    for files in units:
        for point in points:
            run = FileCheck(" ".join(str(f) for f in files), files, dict(point))
            try:
                design = load(files, top=top, params=point, include_dirs=include_dirs,
                              defines=defines)
                the_spec = resolve_spec(design, spec)
                run.result = check(design, the_spec, progress=progress, **check_options)
                if diagnose and run.result.counterexample is not None:
                    from verify.diagnosis import explain
                    run.diagnosis = explain.attach(run.result, design, the_spec, vcd_path=vcd_path,
                                                   dot_path=dot_path, log_dir=log_dir)
            except InputError as e:
                if single:
                    raise
                run.error = e
            if run.result is not None and log_dir is not None:
                from verify.manifest import runlog
                try:
                    runlog.record(run.result, log_dir, files, point)
                except OSError as e:
                    run.warnings.append(f"could not write the run log in {log_dir}: {e}")
            runs.append(run)
    return runs


def exit_code(runs: Sequence[FileCheck]) -> int:
    """One exit code for several checks: 2 over 1 over 3 over 0."""
    return worst_exit_code(r.exit_code for r in runs)
