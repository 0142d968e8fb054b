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

import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Callable, Iterable

from verify import __version__
from verify.errors import InputError
from verify.manifest.records import EntryRecord
from verify.model.result import worst_exit_code

from verify.manifest.entries import (  # noqa: F401 - the per-entry API, re-exported here
    check_entry, entry_error, entry_files, entry_key, error_record, label, load_entry,
    lost_record, manifest_fault)
from verify.manifest.schema import Entry, Manifest, load_manifest  # noqa: F401 - re-exported


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
        raise InputError(f"must be at least 1, got {jobs}", option="jobs")
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
