"""Manifest checks on workers that may be on other machines.

Each pending (entry, parameter point) is first sent as it is: a worker that sees the manifest's
folder at the same path (a shared filesystem, a local pool, a local cluster) reads and checks it
there, so reading Verilog is spread over the workers too. A worker that does not see the folder
(pods of a Kubernetes cluster, machines without the checkout) answers at once that it needs the
design; those entries are then read here and sent again as JSON netlist text
(``verify.formats.json_netlist``), with the origin they have here, so the record is the one a
local run gives. Bad input found while reading here is that entry's error record, as a worker's
would be.
"""

from __future__ import annotations

import time
from dataclasses import replace
from pathlib import Path
from typing import Callable

from verify.errors import InputError
from verify.manifest.records import EntryRecord
from verify.manifest.entries import Entry, check_entry, error_record, load_entry, lost_record

#: what a worker answers when it cannot see the manifest's folder
NEEDS_DESIGN = "needs the design"


def check_entry_on_worker(entry: Entry, point: dict[str, int], root: str,
                          text: str | None = None, origin: str | None = None):
    """A worker's task: the record of one entry, or ``NEEDS_DESIGN`` when the design was not
    sent and the manifest's folder is not at ``root`` on this worker."""
    if text is not None:
        from verify.formats import json_netlist
        design = replace(json_netlist.parse(text, origin or "<json>"), origin=origin)
        return check_entry(entry, point, root, design)
    if not Path(root).is_dir():
        return NEEDS_DESIGN
    return check_entry(entry, point, root)


def ship_entry(entry: Entry, point: dict[str, int], root: Path) -> tuple[str, str | None] | EntryRecord:
    """(JSON netlist text, origin) of an entry's design read here, or its error record."""
    from verify.formats import json_netlist
    started = time.perf_counter()
    try:
        design = load_entry(entry, point, root)
    except InputError as e:
        return error_record(entry, point, e, time.perf_counter() - started)
    return json_netlist.dumps(design), design.origin


def check_pending(pool, pending: list, root: Path,
                  store: Callable[[int, EntryRecord, str, dict], None]) -> None:
    """Check every (index, entry, point, key, files) of ``pending`` on ``pool``; ``store`` each
    record as it lands. A check no worker could finish is stored as that entry's error."""
    from verify.manifest.executors import each_done

    tasks = [(item, check_entry_on_worker, (item[1], item[2], str(root))) for item in pending]
    unseen = []
    for (i, e, p, key, files), record, lost in each_done(pool, tasks):
        if lost is not None:
            store(i, lost_record(e, p, lost), key, files)
        elif isinstance(record, str):  # NEEDS_DESIGN
            unseen.append((i, e, p, key, files))
        else:
            store(i, record, key, files)
    tasks = []
    for i, e, p, key, files in unseen:
        shipped = ship_entry(e, p, root)
        if isinstance(shipped, EntryRecord):
            store(i, shipped, key, files)
        else:
            tasks.append(((i, e, p, key, files), check_entry_on_worker,
                          (e, p, str(root), *shipped)))
    for (i, e, p, key, files), record, lost in each_done(pool, tasks):
        store(i, record if lost is None else lost_record(e, p, lost), key, files)
