"""One manifest entry at one parameter point: read its design, check it, make its record.

Runs in worker processes too (``verify.manifest.executors``): takes and returns picklable values.
``verify.manifest.runner`` runs a whole manifest with these; ``remote`` and ``followup`` use them
for designs shipped to a cluster and for the reports' follow-up commands.
"""

from __future__ import annotations

import time
from pathlib import Path
from typing import Any

from verify.errors import InputError
from verify.manifest.records import EntryRecord
from verify.manifest.schema import Entry
from verify.model.result import Verdict

_VERILOG = (".v", ".sv", ".vh", ".svh")


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
