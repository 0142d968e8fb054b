"""Checking designs given as files: folders, parameter sweeps, diagnosis and the run log.

This is what ``adder-verify check`` does, as a Python function a hardware repo's tests can call::

    from verify.batch import check_files
    for run in check_files(["rtl/adder.sv"], spec="{cout, sum} = a + b + cin",
                           params={"W": [8, 16, 32]}):
        assert run.ok, run.headline()

Each (design, parameter point) gives one ``FileCheck``: the result, or the input error that
stopped it, and the diagnosis of a failure. Nothing is printed here.

``check_many`` checks a stream of designs (paths or in-memory netlists, e.g. candidates from a
generator) in worker processes or on a Dask cluster, yielding each result as it lands::

    for item in check_many(candidates, spec="{cout, sum} = a + b + cin", jobs=2):
        scores[item.index] = item.verdict
"""

from __future__ import annotations

import itertools
import re
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Callable, Iterable, Iterator, Mapping, Sequence

from verify.errors import InputError
from verify.formats import VERILOG_SUFFIXES
from verify.model.netlist import Netlist
from verify.model.result import CheckResult, Verdict, worst_exit_code


class _HasResult:
    """Exit code and ok of a record holding a CheckResult, or None when nothing was checked."""

    result: CheckResult | None

    @property
    def exit_code(self) -> int:
        return 2 if self.result is None else self.result.exit_code

    @property
    def ok(self) -> bool:
        return self.exit_code == 0


@dataclass
class FileCheck(_HasResult):
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
    def name(self) -> str:
        p = " ".join(f"{k}={v}" for k, v in self.params.items())
        return f"{self.label} {p}".strip()

    def headline(self) -> str:
        if self.result is None:
            return f"{self.name}: error: {self.error}"
        return f"{self.name}: {self.result.verdict.value}: {self.result.coverage}"


def _late(result: CheckResult, design, late, vcd_path, options) -> list[str]:
    """The report lines of a result that is right but not settled in time; with ``vcd_path``,
    the timed waveform of the late vector is written there."""
    from verify.model.result import Diagnosis
    lines = [f"late: {late.evidence}"]
    path = None
    if vcd_path and result.counterexample is not None:
        from verify.timing.settle import settle_waveform
        path = str(settle_waveform(design, options.get("delays"), result.counterexample.inputs,
                                   options.get("settle_within"), vcd_path))
        lines.append(f"timed waveform: {path}")
    result.diagnosis = Diagnosis(vcd=path, details={"late": late.evidence})
    return lines


def sweep_points(params: Mapping[str, Sequence[int]] | None) -> list[dict[str, int]]:
    """Every combination of the parameter values ([{}] when there are none)."""
    params = dict(params or {})
    names = list(params)
    return [dict(zip(names, combo)) for combo in itertools.product(*(params[n] for n in names))] or [{}]


#: how a JSON file says it is a netlist of this tool (see verify/formats/json_netlist.py)
_NETLIST_FORMAT = re.compile(rb'"format"\s*:\s*"verify-netlist/')


def _is_design(path: Path) -> bool:
    """A Verilog file, or a JSON file that declares the netlist format in its first 64 KiB."""
    if path.suffix in VERILOG_SUFFIXES:
        return True
    if path.suffix != ".json":
        return False
    try:
        with path.open("rb") as fh:
            return bool(_NETLIST_FORMAT.search(fh.read(1 << 16)))
    except OSError:
        return False


class Checks(list):
    """The FileCheck records of one call, in order, with notes about what was not checked."""

    def __init__(self, runs=(), notes=()):
        super().__init__(runs)
        self.notes: list[str] = list(notes)


def design_files(paths: Sequence[str | Path], *, recursive: bool = False
                 ) -> tuple[list[list[Path]], list[Path]]:
    """What to check: one design from the files given, or one design per file in a folder.

    In a folder, Verilog files and JSON files that declare the netlist format are designs; other
    files (shard results, run summaries, notes) are returned as skipped. Subfolders are read only
    with ``recursive``. Returns (designs, skipped files).
    """
    if not paths or any(str(p).strip() == "" for p in paths):  # Path("") would mean "."
        raise InputError("give a design file or a folder (an empty path names nothing)")
    given = [Path(p) for p in paths]
    if len(given) > 1 and all(p.suffix == ".json" for p in given):
        return [[p] for p in given], []  # each JSON netlist is a design of its own
    if len(given) == 1 and given[0].is_dir():
        folder = given[0]
        found = folder.rglob("*") if recursive else folder.glob("*")
        files = sorted(p for p in found if p.is_file()
                       and not any(part.startswith(".") for part in p.relative_to(folder).parts))
        designs = [p for p in files if _is_design(p)]
        skipped = [p for p in files if p not in designs]
        if not designs:
            deeper = "" if recursive else " (subfolders are read with --recursive)"
            raise InputError(f"no Verilog files or JSON netlists in this folder{deeper}", str(folder))
        return [[f] for f in designs], skipped
    for p in given:
        if p.is_dir():
            raise InputError("give one folder on its own, or design files", str(p))
    return [given], []


def check_files(paths: Sequence[str | Path], spec=None, *,
                params: Mapping[str, Sequence[int]] | None = None, top: str | None = None,
                include_dirs: Sequence[str] = (), defines: Mapping[str, str | None] | None = None,
                cells: Sequence[str | Path] = (), diagnose: bool = True, vcd_path: str | Path | None = None,
                dot_path: str | Path | None = None, log_dir: str | Path | None = None,
                recursive: bool = False, progress: Callable[[str, int, int], None] | None = None,
                executor=None, **check_options) -> Checks:
    """Check every design the paths name (a folder: each file in it) at every parameter point.

    ``check_options`` go to ``verify.check.check`` (engine, seed, vectors, timeout, require,
    exhaustive_limit, shard...). With one design at one point, an input error is raised; with
    several, it is recorded in that design's ``FileCheck`` and the others are still checked.
    ``log_dir`` appends each result to ``<log_dir>/runs.jsonl`` (None: no log). A folder's
    subfolders are read only with ``recursive``; files in it that are not designs are skipped and
    named in the returned ``notes``.
    ``executor`` (``verify.manifest.executors``) splits each exhaustive check into shards run
    there and merged with the rules of ``adder-verify merge`` (``engine="exhaustive"`` only).
    """
    from verify.check import check, resolve_spec
    from verify.formats import load

    if log_dir is not None and Path(log_dir).exists() and not Path(log_dir).is_dir():
        raise InputError(f"'{log_dir}' names a file; the run log needs a folder", option="log_dir")
    units, skipped = design_files(paths, recursive=recursive)
    points = sweep_points(params)
    single = len(units) == 1 and len(points) == 1
    if (vcd_path or dot_path) and not single:
        raise InputError("a waveform or cone file is written for one design at one parameter value",
                         option="vcd" if vcd_path else "dot")
    if executor is not None and (check_options.get("engine") != "exhaustive"
                                 or check_options.get("shard") is not None):
        raise InputError("a cluster splits the exhaustive engine's input space: give --engine "
                         "exhaustive without --shard (for many designs use 'run --cluster' or "
                         "verify.check_many)", option="cluster")
    runs = Checks()
    if skipped:
        names = ", ".join(p.name for p in skipped[:5]) + (", ..." if len(skipped) > 5 else "")
        runs.notes.append(f"skipped {len(skipped)} file{'s' if len(skipped) != 1 else ''} that "
                          f"are not designs (not Verilog, not a JSON netlist): {names}")
    for files in units:
        for point in points:
            run = FileCheck(" ".join(str(f) for f in files), files, dict(point))
            try:
                design = load(files, top=top, params=point, include_dirs=include_dirs,
                              defines=defines, cells=cells)
                the_spec = resolve_spec(design, spec)
                if executor is not None:
                    from verify.manifest.shards import check_split
                    options = {k: v for k, v in check_options.items() if k not in ("engine", "shard")}
                    run.result = check_split(design, spec, executor, progress=progress, **options)
                else:
                    run.result = check(design, the_spec, progress=progress, **check_options)
                late = next((e for e in run.result.engines
                             if e.engine == "settle" and e.status == "fail"), None)
                if late is not None:  # late, not wrong: a timed waveform, no suspects
                    run.diagnosis = _late(run.result, design, late, vcd_path, check_options)
                elif diagnose and run.result.counterexample is not None:
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


def project_log_dir(start: str | Path = ".") -> Path | None:
    """The run log folder of the project around ``start``: ``logs/`` beside the nearest
    verify.toml or the nearest existing ``logs/`` folder, looking upward; None outside a project
    (then nothing is logged, and no folder is created)."""
    here = Path(start).resolve()
    for folder in (here, *here.parents):
        if (folder / "logs").is_dir() or (folder / "verify.toml").is_file():
            return folder / "logs"
    return None


def exit_code(runs: Sequence[FileCheck]) -> int:
    """One exit code for several checks: 2 over 1 over 3 over 0."""
    return worst_exit_code(r.exit_code for r in runs)


# ---- many designs, in worker processes or on a cluster ------------------------------------------

@dataclass
class BatchCheck(_HasResult):
    """One design of ``check_many``: its place in the input, and its result or why there is none."""

    index: int  # the design's position in the designs given (0 first)
    name: str  # the design's name (its path when it could not be read)
    result: CheckResult | None = None
    #: the input error, or why no worker could finish the check (then result is None)
    error: str | None = None

    @property
    def verdict(self) -> Verdict:
        return Verdict.ERROR if self.result is None else self.result.verdict



def _shipped_spec(spec):
    """What a worker needs to rebuild the spec: its text as written (None: infer it)."""
    from verify.spec import Spec
    if isinstance(spec, Spec):
        return None if spec.inferred else spec.source
    return spec


def _check_one(design: "Netlist | str", origin: str | None, spec, options: dict[str, Any]):
    """A worker's task: one design (JSON netlist text, or a Netlist in this process) checked.
    Returns ("ok", CheckResult) or ("error", message) for bad input."""
    from dataclasses import replace

    from verify.check import check
    from verify.formats import json_netlist
    try:
        if isinstance(design, str):
            design = replace(json_netlist.parse(design, origin or "<json>"), origin=origin)
        return "ok", check(design, spec, **options)
    except InputError as e:
        return "error", str(e)


def _prepare(design) -> tuple[str, "Netlist | str | None", str | None, str | None]:
    """(name, what to ship, origin, error): JSON files go as their text, Verilog is elaborated
    here and goes as JSON netlist text, a Netlist as itself (turned to text for other processes)."""
    if isinstance(design, Netlist):
        return design.name, design, design.origin, None
    path = Path(design)
    try:
        if path.suffix == ".json":
            try:
                return str(path), path.read_text(encoding="utf-8"), str(path), None
            except FileNotFoundError:
                raise InputError("no such file", str(path)) from None
            except (OSError, UnicodeDecodeError) as e:
                raise InputError(f"cannot read: {e}", str(path)) from None
        from verify.formats import load
        loaded = load([path])
        return loaded.name, loaded, loaded.origin, None
    except InputError as e:
        return str(path), None, None, str(e)


def check_many(designs: Iterable[Netlist | str | Path], spec=None, *, engine: str = "auto",
               jobs: int = 1, executor=None, **check_options) -> Iterator[BatchCheck]:
    """Check each design; yield a ``BatchCheck`` per design as soon as its check finishes.

    ``designs`` may be a generator: designs are taken from it as workers free up (a few per
    worker in flight), so a search loop can propose candidates while earlier ones are checked.
    Results come in the order they finish; ``BatchCheck.index`` says which design each is.
    ``jobs > 1`` uses a local pool of processes, ``executor`` any ``verify.manifest.executors``
    executor (a Dask cluster: ``DaskCluster("tcp://scheduler:8786")``); workers stay up for the
    whole batch, and each design travels as JSON netlist text. ``check_options`` are those of
    ``verify.check`` (seed, vectors, timeout, require, exhaustive_limit, shrink). A design that
    cannot be read, or whose workers all died, gives a BatchCheck with ``error`` (exit code 2),
    never a verdict.
    """
    from verify.check import ENGINE_NAMES, _check_options
    from verify.engines import DEFAULT_EXHAUSTIVE_BITS, DEFAULT_TIMEOUT
    if engine not in ENGINE_NAMES:
        raise InputError(f"unknown engine '{engine}' (choose from {', '.join(ENGINE_NAMES)})",
                         option="engine")
    if executor is None and (isinstance(jobs, bool) or not isinstance(jobs, int) or jobs < 1):
        raise InputError(f"must be a whole number >= 1, got {jobs!r}", option="jobs")
    for bad in ("shard", "progress"):
        if check_options.get(bad) is not None:
            raise InputError("is not taken by check_many", option=bad)
    _check_options(check_options.get("seed", 1), check_options.get("vectors"),
                   check_options.get("timeout", DEFAULT_TIMEOUT),
                   check_options.get("exhaustive_limit", DEFAULT_EXHAUSTIVE_BITS))
    options = dict(check_options, engine=engine)
    # checked here, when called; the work starts when the first result is asked for
    return _stream(designs, _shipped_spec(spec), options, jobs, executor)


def _stream(designs, shipped, options, jobs, executor) -> Iterator[BatchCheck]:
    from verify.manifest.executors import InProcess, TaskLost, open_executor

    pool = executor if executor is not None else open_executor(jobs=jobs)
    local = isinstance(pool, InProcess)
    window = 1 if local else max(2, 4 * pool.workers)
    source = enumerate(designs)
    running: dict[Any, tuple[int, str]] = {}
    try:
        exhausted = False
        while True:
            while not exhausted and len(running) < window:
                try:
                    index, design = next(source)
                except StopIteration:
                    exhausted = True
                    break
                name, payload, origin, error = _prepare(design)
                if error is not None:
                    yield BatchCheck(index, name, error=error)
                    continue
                if isinstance(payload, Netlist) and not local:
                    from verify.formats import json_netlist
                    payload = json_netlist.dumps(payload)
                running[pool.submit(_check_one, payload, origin, shipped, options)] = (index, name)
            if not running:
                return
            finished, _ = pool.wait_any(list(running))
            for h in finished:
                index, name = running.pop(h)
                try:
                    kind, value = pool.outcome(h)
                except TaskLost as lost:
                    yield BatchCheck(index, name, error=f"the check did not finish: {lost}")
                    continue
                if kind == "ok":
                    yield BatchCheck(index, value.design, result=value)
                else:
                    yield BatchCheck(index, name, error=value)
    finally:
        if running:
            pool.cancel(list(running))
        if executor is None:
            pool.close()
