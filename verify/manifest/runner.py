"""Manifest runs for merge gating: every design of a repo, at every parameter value, each time.

A manifest (``verify.toml`` at the repo root by default) lists designs::

    [[design]]
    name = "larkspur_acc"
    sources = ["rtl/larkspur_acc.sv"]
    top = "larkspur_acc"
    params = { W = [16, 32, 64] }
    spec = "{cout, sum} = a + b + cin"
    require = "complete"      # or "tested"
    method = "auto"
    time_limit = 120

``name``, ``sources`` and ``spec`` are required. Paths are relative to the manifest's folder.
Optional keys: ``top``, ``params`` (a number or a list of numbers per parameter; several
parameters give every combination), ``require`` (default ``complete``), ``method`` (the engine,
default ``auto``), ``time_limit`` (seconds, default 60), ``deliberately_broken`` (``true`` for a
design broken on purpose, kept as a regression case: it meets the manifest when a counterexample
is found), ``include_dirs``, ``defines``, ``cells`` (Liberty files giving the logic of the
cells a gate-level netlist instantiates), ``seed``, ``vectors``, ``exhaustive_limit``,
``settle_within`` (prove every output settled by that time for every input, floating mode; see
``verify.timing``), ``delays`` (``unit``, the default, or a TOML delay table beside the
manifest), ``strength`` (inject that many single faults to estimate how strong a tested verdict's
vectors are) and ``cross_check`` (true: two independent complete engines must agree before a
complete verdict).

``run(manifest)`` checks every (entry, parameter point) - in a process pool with ``jobs > 1``,
with the same results as one job - and reports each one from the cache (``verify.manifest.cache``) when
nothing it rests on changed. Exit code of a run: 2 when any entry could not be read (bad input),
else 1 when any result contradicts the manifest (a counterexample in a design expected to pass, or
a proof for one marked deliberately broken), else 3 when any result is undecided or weaker than its
``require``, else 0.
"""

from __future__ import annotations

import itertools
import re
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Callable, Iterable, Sequence

from verify import __version__
from verify.errors import InputError
from verify.manifest.records import EntryRecord, meets  # noqa: F401 - meets is re-exported
from verify.model.result import Verdict, worst_exit_code

import tomllib as _toml

MANIFEST_NAME = "verify.toml"
from verify.check import ENGINE_NAMES as ENGINES  # noqa: E402 - one list of engine names
REQUIRES = ("complete", "tested")
DEFAULT_TIMEOUT = 60.0
KEYS = ("name", "sources", "spec", "top", "params", "require", "method", "time_limit",
        "deliberately_broken", "include_dirs", "defines", "cells", "seed", "vectors",
        "exhaustive_limit", "settle_within", "delays", "strength", "cross_check")
REQUIRED = ("name", "sources", "spec")
#: keys of earlier versions, refused with the key that replaced them
RENAMED = {"files": ("sources", 'sources = ["rtl/adder.sv"]'),
           "engine": ("method", 'method = "auto"'),
           "timeout": ("time_limit", "time_limit = 120"),
           "expect": ("deliberately_broken", "deliberately_broken = true")}
_VERILOG = (".v", ".sv", ".vh", ".svh")


# ---- the manifest -----------------------------------------------------------------------------

@dataclass(frozen=True)
class Entry:
    """One ``[[design]]`` table, checked and with defaults filled in."""

    name: str
    sources: tuple[str, ...]
    spec: str
    top: str | None = None
    params: tuple[tuple[str, tuple[int, ...]], ...] = ()
    require: str = "complete"
    method: str = "auto"
    time_limit: float = DEFAULT_TIMEOUT
    deliberately_broken: bool = False
    include_dirs: tuple[str, ...] = ()
    cells: tuple[str, ...] = ()
    defines: tuple[tuple[str, str | None], ...] = ()
    seed: int = 1
    vectors: int | None = None
    exhaustive_limit: int | None = None
    #: prove every output settled by this time (verify.timing), under ``delays`` (a TOML path)
    settle_within: float | None = None
    delays: str | None = None
    delays_hash: str | None = None
    strength: int | None = None  # faults injected to estimate a sample's strength
    #: two independent complete engines must agree before a complete verdict
    cross_check: bool = False
    #: where the entry starts, "verify.toml:12", for messages
    where: str = ""
    #: where each key of the entry is written, (("spec", "verify.toml:14"), ...), for messages
    key_where: tuple[tuple[str, str], ...] = ()

    def where_key(self, key: str) -> str:
        """The manifest line of ``key`` in this entry (the entry's first line if not written)."""
        return dict(self.key_where).get(key) or self.where

    def points(self) -> list[dict[str, int]]:
        """Every parameter combination, in manifest order ([{}] when there are no parameters)."""
        names = [n for n, _ in self.params]
        combos = itertools.product(*(vals for _, vals in self.params))
        return [dict(zip(names, c)) for c in combos] or [{}]

    def options(self) -> dict[str, Any]:
        """The options that decide the outcome (part of the cache key)."""
        return {"method": self.method, "require": self.require, "time_limit": self.time_limit,
                "seed": self.seed, "vectors": self.vectors,
                "exhaustive_limit": self.exhaustive_limit, "top": self.top,
                "include_dirs": list(self.include_dirs), "defines": dict(self.defines),
                "cells": list(self.cells), "strength": self.strength,
                "cross_check": self.cross_check,
                **({"settle_within": self.settle_within, "delays": self.delays,
                    "delays_hash": self.delays_hash} if self.settle_within is not None else {})}


@dataclass(frozen=True)
class Manifest:
    path: Path
    entries: tuple[Entry, ...]

    @property
    def root(self) -> Path:
        return self.path.parent


def _lines(text: str) -> tuple[list[int], list[str]]:
    """Line numbers (1-based) of each ``[[design]]`` header, and the text's lines."""
    lines = text.splitlines()
    heads = [i + 1 for i, line in enumerate(lines) if re.match(r"\s*\[\[\s*design\s*\]\]", line)]
    return heads, lines


def _key_line(lines: list[str], start: int, end: int, key: str) -> int | None:
    pat = re.compile(rf"\s*(\"?){re.escape(key)}\1\s*=")
    for n in range(start, min(end, len(lines) + 1)):
        if pat.match(lines[n - 1]):
            return n
    return None


def load_manifest(path: str | Path | None = None) -> Manifest:
    """Read and check a manifest; every mistake is an InputError naming the entry and the key."""
    path = Path(path) if path is not None else Path(MANIFEST_NAME)
    if path.is_dir():
        path = path / MANIFEST_NAME
    if not path.is_file():
        raise InputError("no such manifest (write a verify.toml, or give its path)", str(path))
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as e:
        raise InputError(f"cannot read the manifest: {e}", str(path)) from None
    try:
        data = _toml.loads(text)
    except RecursionError:  # the TOML reader recurses once a nested array or table
        raise InputError("arrays or tables nested too deep to read", str(path)) from None
    except _toml.TOMLDecodeError as e:
        msg = str(e)
        m = re.search(r"\(at line (\d+), column (\d+)\)", msg)
        where = f"{path}:{m.group(1)}:{m.group(2)}" if m else str(path)
        if not m and "(at end of document)" in msg:
            where = f"{path}:{len(text.splitlines()) or 1}"
            msg = msg.replace("(at end of document)", "(at the end of the file)")
        msg = re.sub(r"\s*\(at line \d+, column \d+\)", "", msg)
        raise InputError(f"not valid TOML: {msg}", where) from None
    heads, lines = _lines(text)
    for key in data:
        if key != "design":
            raise InputError(f"unknown top-level key '{key}' (a manifest holds [[design]] tables)",
                             str(path))
    designs = data.get("design")
    if designs is None:
        raise InputError("no [[design]] entries", str(path))
    if not isinstance(designs, list) or not all(isinstance(d, dict) for d in designs):
        raise InputError("'design' must be a list of tables: write each one as [[design]]", str(path))
    if not designs:
        raise InputError("no [[design]] entries", str(path))
    entries: list[Entry] = []
    seen: dict[str, str] = {}
    for i, table in enumerate(designs):
        start = heads[i] if i < len(heads) else 0
        end = heads[i + 1] if i + 1 < len(heads) else len(lines) + 1
        entry = _entry(table, i, path, lines, start, end)
        if entry.name in seen:
            raise InputError(f"design '{entry.name}': the name is used twice (first at "
                             f"{seen[entry.name]}); names must be unique", entry.where)
        seen[entry.name] = entry.where
        entries.append(entry)
    return Manifest(path, tuple(entries))


def _entry(table: dict, index: int, path: Path, lines: list[str], start: int, end: int) -> Entry:
    where = f"{path}:{start}" if start else str(path)
    label = f"design '{table['name']}'" if isinstance(table.get("name"), str) and table["name"] \
        else f"design #{index + 1}"

    def bad(key: str, msg: str) -> InputError:
        n = _key_line(lines, start, end, key) if start else None
        return InputError(f"{label}: key '{key}': {msg}", f"{path}:{n}" if n else where)

    for key in table:
        if key in RENAMED and key not in KEYS:
            new, example = RENAMED[key]
            raise bad(key, f"this key is now called '{new}': write {example}")
        if key not in KEYS:
            close = [k for k in KEYS if _similar(k, key)]
            hint = f" (did you mean '{close[0]}'?)" if close else f" (known keys: {', '.join(KEYS)})"
            raise bad(key, f"unknown key{hint}")
    for key in REQUIRED:
        if key not in table:
            raise InputError(f"{label}: the key '{key}' is required", where)

    name = table["name"]
    if not isinstance(name, str) or not name.strip():
        raise bad("name", "must be a non-empty string")
    if any(c in name for c in "\n\r\t"):
        raise bad("name", "must be on one line")

    files = table["sources"]
    if isinstance(files, str):
        raise bad("sources", f'must be a list of paths, e.g. sources = ["{files}"]')
    if not isinstance(files, list) or not files or not all(isinstance(f, str) and f.strip() for f in files):
        raise bad("sources", "must be a non-empty list of paths")
    root = path.parent
    for f in files:
        p = root / f
        if not p.is_file():
            raise bad("sources", f"no such file '{f}' (paths are relative to the manifest's folder)")
        if p.suffix not in (".json", *_VERILOG):
            raise bad("sources", f"'{f}': unknown design format (expected .json, .v or .sv)")
    kinds = {Path(f).suffix == ".json" for f in files}
    if kinds == {True} and len(files) > 1:
        raise bad("sources", "give one JSON netlist per entry")
    if len(kinds) > 1:
        raise bad("sources", "give either one JSON netlist or Verilog files, not both")
    is_json = kinds == {True}

    spec = table["spec"]
    if not isinstance(spec, str) or not spec.strip():
        raise bad("spec", 'must be a non-empty string, e.g. "{cout, sum} = a + b + cin"')

    def choice(key: str, allowed: Sequence[str], default: str) -> str:
        v = table.get(key, default)
        if v not in allowed:
            raise bad(key, f"{v!r} is not one of {', '.join(map(repr, allowed))}")
        return v

    def whole(key: str, lo: int, hi: int | None = None) -> int | None:
        if key not in table:
            return None
        v = table[key]
        if isinstance(v, bool) or not isinstance(v, int):
            raise bad(key, f"must be a whole number, got {v!r}")
        if v < lo or (hi is not None and v > hi):
            rng = f"from {lo} to {hi}" if hi is not None else f"at least {lo}"
            raise bad(key, f"must be {rng}, got {v}")
        return v

    top = table.get("top")
    if top is not None and (not isinstance(top, str) or not top.strip()):
        raise bad("top", "must be a module name")

    params_in = table.get("params", {})
    if not isinstance(params_in, dict):
        raise bad("params", "must be a table, e.g. params = { W = [16, 32] }")
    params: list[tuple[str, tuple[int, ...]]] = []
    for pname, val in params_in.items():
        vals = val if isinstance(val, list) else [val]
        if not vals:
            raise bad("params", f"parameter '{pname}' has an empty list of values")
        for v in vals:
            if isinstance(v, bool) or not isinstance(v, int):
                raise bad("params", f"parameter '{pname}': {v!r} is not a whole number")
        if len(set(vals)) != len(vals):
            raise bad("params", f"parameter '{pname}' lists a value twice")
        params.append((pname, tuple(vals)))

    def paths(key: str, kind: str, exists, example: str, where_hint: str = "") -> list[str]:
        """A key holding a list of paths beside the manifest, each of which must exist."""
        given = table.get(key, [])
        if not isinstance(given, list) or not all(isinstance(x, str) and x for x in given):
            raise bad(key, f"must be a list of {kind}s{example}")
        for x in given:
            if not exists(root / x):
                raise bad(key, f"no such {kind} '{x}'{where_hint}")
        return given

    include_dirs = paths("include_dirs", "folder", Path.is_dir, "")

    defines_in = table.get("defines", {})
    if not isinstance(defines_in, dict):
        raise bad("defines", 'must be a table, e.g. defines = { FAST = "1" }')
    defines: list[tuple[str, str | None]] = []
    for dname, val in defines_in.items():
        if val is True:
            defines.append((dname, None))
        elif isinstance(val, str) or (isinstance(val, int) and not isinstance(val, bool)):
            defines.append((dname, str(val)))
        else:
            raise bad("defines", f"'{dname}': give a string, a number or true")

    cells = paths("cells", "Liberty file", Path.is_file, ', e.g. cells = ["lib/cells.lib"]',
                  " (paths are relative to the manifest's folder)")

    if is_json and (top or params or include_dirs or defines or cells):
        used = [k for k in ("top", "params", "include_dirs", "defines", "cells") if table.get(k)]
        raise bad(used[0], "applies to Verilog files only; this entry is a JSON netlist")

    timeout = table.get("time_limit", DEFAULT_TIMEOUT)
    if isinstance(timeout, bool) or not isinstance(timeout, (int, float)) or not timeout > 0:
        raise bad("time_limit", f"must be a positive number of seconds, got {timeout!r}")
    broken = table.get("deliberately_broken", False)
    if not isinstance(broken, bool):
        raise bad("deliberately_broken", f"must be true or false, got {broken!r}")

    seed = whole("seed", 0)
    settle, delays, delays_hash = _settle_keys(table, path, bad)
    cross_check = table.get("cross_check", False)
    if not isinstance(cross_check, bool):
        raise bad("cross_check", f"must be true or false, got {cross_check!r}")
    key_where = []
    for key in table:
        n = _key_line(lines, start, end, key) if start else None
        if n:
            key_where.append((key, f"{path}:{n}"))
    return Entry(
        name=name, sources=tuple(files), spec=spec, top=top, params=tuple(params),
        require=choice("require", REQUIRES, "complete"), method=choice("method", ENGINES, "auto"),
        time_limit=float(timeout), deliberately_broken=broken,
        include_dirs=tuple(include_dirs), defines=tuple(defines), cells=tuple(cells),
        seed=1 if seed is None else seed, vectors=whole("vectors", 1),
        exhaustive_limit=whole("exhaustive_limit", 1, 40), where=where,
        key_where=tuple(key_where), settle_within=settle, delays=delays, delays_hash=delays_hash,
        strength=whole("strength", 1, 100_000), cross_check=cross_check)



def _settle_keys(table: dict, path: Path, bad) -> tuple:
    """A manifest entry's ``settle_within`` (a time >= 0) and ``delays`` ('unit' or a TOML file
    beside the manifest at ``path``): (time, delays, sha256 of the table); ``bad(key, message)``
    makes the manifest's InputError."""
    import hashlib
    settle, delays = table.get("settle_within"), table.get("delays")
    if settle is not None and (isinstance(settle, bool) or not isinstance(settle, (int, float))
                               or not settle >= 0):
        raise bad("settle_within", f"must be a time >= 0 in the delay model's unit, got {settle!r}")
    if delays is not None and (not isinstance(delays, str) or not delays.strip()):
        raise bad("delays", f"give 'unit' or the path of a TOML delay table, got {delays!r}")
    if delays is not None and settle is None:
        raise bad("delays", "applies with settle_within only")
    digest = None
    if delays is not None and delays.strip().lower() != "unit":
        f = path.parent / delays
        if not f.is_file():
            raise bad("delays", f"'{delays}': no such file")
        digest = hashlib.sha256(f.read_bytes()).hexdigest()
    return (None if settle is None else float(settle)), delays, digest


def _similar(a: str, b: str) -> bool:
    """Close spellings (one edit apart, or the same letters swapped)."""
    if a == b:
        return True
    if sorted(a) == sorted(b):
        return True
    if abs(len(a) - len(b)) > 1:
        return False
    if len(a) == len(b):
        return sum(x != y for x, y in zip(a, b)) == 1
    short, long_ = sorted((a, b), key=len)
    return any(long_[:i] + long_[i + 1:] == short for i in range(len(long_)))


# ---- one check ----------------------------------------------------------------------------

def label(name: str, point: dict[str, int]) -> str:
    """'larkspur_acc W=32' - how an entry at one parameter point is named in every report."""
    return " ".join([name, *(f"{k}={v}" for k, v in point.items())])


def entry_files(entry: Entry, root: Path) -> list[Path]:
    """The files an entry's design may be read from (see ``verify.manifest.cache.dependencies``)."""
    from verify.manifest.cache import dependencies
    return dependencies([root / f for f in entry.sources], [root / d for d in entry.include_dirs]) \
        + [root / c for c in entry.cells]


def entry_key(entry: Entry, point: dict[str, int], root: Path) -> tuple[str, dict[str, str]]:
    """(cache key, {file: sha256}) for one entry at one parameter point."""
    from verify.manifest.cache import file_hashes, make_key
    files = file_hashes(entry_files(entry, root), root)
    return make_key(files, point, entry.spec, entry.options()), files


def load_entry(entry: Entry, point: dict[str, int], root: str | Path):
    """The design of one entry at one parameter point, read from the manifest's folder."""
    from verify.formats import load
    root = Path(root)
    return load([root / f for f in entry.sources], top=entry.top, params=point or None,
                include_dirs=[str(root / d) for d in entry.include_dirs],
                cells=[root / c for c in entry.cells], defines=dict(entry.defines) or None)


def _base(entry: Entry, point: dict[str, int]) -> dict[str, Any]:
    return dict(name=entry.name, params=dict(point), label=label(entry.name, point),
                sources=list(entry.sources), spec=entry.spec, require=entry.require,
                deliberately_broken=entry.deliberately_broken, method=entry.method)


def error_record(entry: Entry, point: dict[str, int], e: InputError, seconds: float) -> EntryRecord:
    """The record of an entry whose design or manifest values are bad input."""
    fault = manifest_fault(e)
    return EntryRecord(**_base(entry, point), verdict=Verdict.ERROR,
                       error=str(e) if fault is None else entry_error(entry, *fault),
                       error_key=fault and fault[0], error_detail=fault and fault[1],
                       checked_seconds=seconds)


def check_entry(entry: Entry, point: dict[str, int], root: str | Path,
                design=None) -> EntryRecord:
    """Load and check one entry at one parameter point; a record for the reports.

    Runs in worker processes: takes and returns picklable values. Bad input becomes a record
    with verdict ``error``; anything else escaping is a bug and propagates. ``design``: the
    entry's design, already read (elsewhere) from the manifest's folder.
    """
    from verify.check import check
    from verify.engines import DEFAULT_EXHAUSTIVE_BITS

    root = Path(root)
    started = time.perf_counter()
    try:
        if design is None:
            _forget_stale_trees(entry, root)
            design = load_entry(entry, point, root)
        result = check(design, entry.spec, engine=entry.method, seed=entry.seed,
                       vectors=entry.vectors, timeout=entry.time_limit, require=entry.require,
                       exhaustive_limit=entry.exhaustive_limit or DEFAULT_EXHAUSTIVE_BITS,
                       settle_within=entry.settle_within,
                       delays=entry.delays if entry.delays in (None, "unit")
                       else str(root / entry.delays), strength=entry.strength,
                       cross_check=entry.cross_check)
    except InputError as e:
        return error_record(entry, point, e, time.perf_counter() - started)
    data = result.to_json()
    return EntryRecord(
        **_base(entry, point), verdict=result.verdict,
        engines=[{"engine": e["engine"], "status": e["status"], "seconds": e["seconds"],
                  "evidence": e["evidence"], **({"vectors": e["vectors"]} if "vectors" in e else {})}
                 for e in data["engines"]],
        coverage=result.coverage, counterexample=data.get("counterexample"),
        design_hash=result.design_hash, design=data["design"], strength=data.get("strength"),
        checked_seconds=result.seconds)


def lost_record(entry: Entry, point: dict[str, int], why: str) -> EntryRecord:
    """The record of a check no worker could finish: an error of that entry, never a verdict."""
    return EntryRecord(**_base(entry, point), verdict=Verdict.ERROR,
                       error=f"the check did not finish: {why}")


#: the manifest key of each Python API option an entry sets
_OPTION_KEYS = {"top": "top", "params": "params", "defines": "defines",
                "include_dirs": "include_dirs", "seed": "seed", "vectors": "vectors",
                "timeout": "time_limit", "exhaustive_limit": "exhaustive_limit",
                "engine": "method", "spec": "spec", "strength": "strength"}


def manifest_fault(e: InputError) -> tuple[str, str] | None:
    """(manifest key, what is wrong) when a check failed on a value the entry's manifest gave
    (its spec, a parameter name, a define, the top module...) rather than in a design file."""
    from verify.errors import SpecError
    if e.option in _OPTION_KEYS:
        return _OPTION_KEYS[e.option], e.detail
    if isinstance(e, SpecError) or e.where == "spec":
        return "spec", e.message
    return None


def entry_error(entry: Entry, key: str, detail: str) -> str:
    """'verify.toml:14: design 'sub': key 'defines': ...': a value of the manifest is at fault,
    said as the manifest's own errors are (file and line, the entry, the key)."""
    return str(InputError(f"design '{entry.name}': key '{key}': {detail}", entry.where_key(key)))


_SEEN_DEPS: dict[tuple[str, ...], dict[str, str]] = {}


def _forget_stale_trees(entry: Entry, root: Path) -> None:
    """Drop the Verilog reader's parsed trees when a file they rest on changed in this process.

    The reader reuses syntax trees while the listed files' size and time are unchanged; an
    included file that changed would not be seen by a long-lived process (the pytest plugin, a
    Python loop over commits). Comparing every dependency's hash with the last one seen here
    keeps parameter sweeps fast (one parse per entry) and never checks a stale design.
    """
    if not any(Path(f).suffix in _VERILOG for f in entry.sources):
        return
    try:
        from verify.formats.verilog import reader
    except ImportError:  # pragma: no cover - no Verilog reader in this build
        return
    trees = getattr(reader, "_TREE_CACHE", None)
    if not isinstance(trees, dict):
        return
    from verify.manifest.cache import file_hashes
    ident = tuple(str((root / f).resolve()) for f in entry.sources)
    now = file_hashes(entry_files(entry, root), root)
    if _SEEN_DEPS.get(ident) != now:  # first sight (trees of unknown age) or a changed file
        trees.clear()
    _SEEN_DEPS[ident] = now


# ---- a whole run --------------------------------------------------------------------------

@dataclass
class RunSummary:
    """The outcome of one ``run``: a record per (entry, parameter point), in manifest order."""

    manifest: str
    records: list[EntryRecord]
    seconds: float
    jobs: int
    cache_used: bool
    tool_version: str = __version__
    counts: dict[str, int] = field(default_factory=dict)
    #: things the user should know that are not verdicts (e.g. the cache could not be written)
    warnings: list[str] = field(default_factory=list)

    @property
    def exit_code(self) -> int:
        return worst_exit_code(r.exit_code for r in self.records)

    @property
    def ok(self) -> bool:
        return self.exit_code == 0


#: progress(event, done, total, record or None, label) with event "start" or "done"
Progress = Callable[[str, int, int, "EntryRecord | None", str], None]


def run(manifest: Manifest | str | Path | None = None, *, jobs: int = 1, use_cache: bool = True,
        cache_dir: str | Path | None = None, progress: Progress | None = None,
        only: Iterable[str] | None = None, point: dict[str, int] | None = None,
        diagnose: bool = False, executor=None) -> RunSummary:
    """Check every entry of ``manifest`` at every parameter point.

    Records come back in manifest order whatever order workers finish in, so ``jobs`` changes the
    time taken, never the results. ``only`` limits the run to the named entries, ``point`` to one
    parameter point of them. Every record gets the command that reproduces it; ``diagnose``
    also attaches a diagnosis to each record with a counterexample (for the HTML report).
    ``executor`` (``verify.manifest.executors``: a Dask cluster...) runs
    the checks instead of a local pool of ``jobs`` processes; the cache is consulted here first,
    so only checks it cannot answer are sent. A check whose workers all died is that entry's
    error (exit 2), never a pass.
    """
    from verify.manifest import followup
    from verify.manifest.cache import CACHE_DIR, Cache

    started = time.perf_counter()
    if not isinstance(manifest, Manifest):
        manifest = load_manifest(manifest)
    if jobs < 1:
        raise InputError(f"--jobs must be at least 1, got {jobs}")
    root = manifest.root
    entries = list(manifest.entries)
    if only is not None:
        wanted = list(only)
        names = {e.name for e in entries}
        for n in wanted:
            if n not in names:
                raise InputError(f"no design named '{n}' in the manifest", str(manifest.path))
        entries = [e for e in entries if e.name in wanted]
    cache = Cache(Path(cache_dir) if cache_dir is not None else root / CACHE_DIR)
    work = [(e, p) for e in entries for p in e.points() if point is None or p == point]
    total = len(work)
    records: list[EntryRecord | None] = [None] * total
    pending: list[tuple[int, Entry, dict, str, dict]] = []
    twins: dict[int, list[tuple[int, Entry, dict, dict]]] = {}  # first index -> same-key entries
    first_of: dict[str, int] = {}
    done = 0

    def reuse(i: int, result: EntryRecord, e: Entry, p: dict, key: str, files: dict, t0: float,
              same_as: str | None = None) -> None:
        nonlocal done
        # the entry's interpretation may differ (deliberately_broken, name) without changing the
        # verdict
        record = result.but(name=e.name, params=dict(p), label=label(e.name, p),
                            deliberately_broken=e.deliberately_broken, require=e.require,
                            method=e.method, sources=list(e.sources), spec=e.spec,
                            same_as=same_as if same_as is not None else result.same_as)
        if record.error_key:  # an entry's own manifest line, not its twin's
            record.error = entry_error(e, record.error_key, record.error_detail)
        # an error is never stored in the cache, so an entry sharing one is not "cached"
        records[i] = record.but(cached=not record.error, seconds=time.perf_counter() - t0,
                                key=key, file_hashes=files)
        done += 1
        if progress:
            progress("done", done, total, records[i], label(e.name, p))

    for i, (e, p) in enumerate(work):
        t0 = time.perf_counter()
        key, files = entry_key(e, p, root)
        hit = cache.get(key, root) if use_cache else None
        if hit is not None:
            reuse(i, EntryRecord.from_json(hit["result"]), e, p, key, files, t0)
        elif key in first_of:  # the same files, parameters, spec and options: check once
            twins.setdefault(first_of[key], []).append((i, e, p, files))
        else:
            first_of[key] = i
            pending.append((i, e, p, key, files))

    warnings: list[str] = []

    def store(i: int, record: EntryRecord, key: str, files: dict) -> None:
        nonlocal done
        records[i] = record.but(cached=False, seconds=record.checked_seconds, key=key,
                                file_hashes=files)
        # a fresh definite verdict is recorded even with use_cache=False: that run re-checked it
        try:
            cache.put(key, files, record.to_json())
        except OSError as e:  # a read-only checkout still gets its verdicts, just not cached
            note = f"the result cache in {cache.folder} could not be written ({e.strerror or e}); verdicts are not cached"
            if note not in warnings:
                warnings.append(note)
        done += 1
        if progress:
            progress("done", done, total, records[i], records[i].label)
        for j, e, p, f in twins.get(i, []):
            reuse(j, record, e, p, key, f, time.perf_counter(), same_as=records[i].label)

    if executor is None and (jobs == 1 or len(pending) <= 1):
        for i, e, p, key, files in pending:
            if progress:
                progress("start", done, total, None, label(e.name, p))
            store(i, check_entry(e, p, root), key, files)
    elif pending:
        from verify.manifest.executors import LocalPool
        from verify.manifest.remote import check_pending
        pool = executor if executor is not None else LocalPool(min(jobs, len(pending)))
        try:
            check_pending(pool, pending, root, store)
        finally:
            if executor is None:
                pool.close()
    final = [r for r in records if r is not None]
    for r, (e, p) in zip(final, work):
        r.reproduce = followup.reproduce_argv(e, p, r, manifest.path.parent)
        if diagnose and r.counterexample:
            r.diagnosis = followup.diagnose_entry(e, p, root, r)
    counts: dict[str, int] = {}
    for r in final:
        counts[r.status.value] = counts.get(r.status.value, 0) + 1
    workers = executor.workers if executor is not None else jobs
    return RunSummary(str(manifest.path), final, time.perf_counter() - started, workers, use_cache,
                      counts=counts, warnings=warnings)
