"""Merging the JSON results of ``adder-verify check --engine exhaustive --shard K/N --json``.

Shard K of N covers input vectors ``[(K-1)*T//N, K*T//N)`` of the ``T = 2^bits`` vectors
(``verify.engines.exhaustive.shard_range``): the N parts are disjoint and cover the space. A merge
gives:

* ``fail`` (exit 1) when any shard found a counterexample - it stands on its own, even when other
  shards are missing;
* ``exhaustive`` (exit 0) only when every shard 1..N is present, the parts are exactly the
  expected ranges, they cover every vector once, and every one passed;
* ``undecided`` (exit 3) when shards are missing or one stopped without an answer (timeout).

Shards of different designs (design hash), specs, parameter values or shard counts, a shard given
twice, parts that overlap or do not match their index, and files that are not shard results are
refused as bad input (exit 2). Each shard carries a binding hash over its design name, design
hash, ports, spec and range (``verify.check.shard_binding``): a file whose name, port widths,
spec or range was edited is refused.

What a merge cannot do: tell a forged file from a real one. The files are plain JSON and the
binding is a hash anyone can recompute; a merge checks that the shards are consistent with each
other, not that the checks they report were run. Keep shard results where only your own jobs
write them.
"""

from __future__ import annotations

import json
import time
from contextlib import closing
from pathlib import Path
from typing import Any, Iterable

from verify.errors import InputError


def _read(path: Path) -> list[dict[str, Any]]:
    try:
        text = path.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputError("no such file", str(path)) from None
    except (OSError, UnicodeDecodeError) as e:
        raise InputError(f"cannot read: {e}", str(path)) from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as e:
        raise InputError(f"not JSON: {e.msg}", f"{path}:{e.lineno}:{e.colno}") from None
    items = data if isinstance(data, list) else [data]
    if not items:
        raise InputError("an empty list: no shard results", str(path))
    return items


def _shard_of(item: Any, where: str) -> dict[str, Any]:
    if not isinstance(item, dict):
        raise InputError("not a result of 'adder-verify check --json'", where)
    if item.get("verdict") == "error":
        raise InputError(f"this shard's check did not run: {item.get('error', 'error')}", where)
    shard = item.get("shard")
    if not isinstance(shard, dict):
        raise InputError("not a shard result (run 'adder-verify check --engine exhaustive --shard K/N "
                         "--json')", where)
    for key in ("index", "count", "vectors", "first", "last"):
        v = shard.get(key)
        if isinstance(v, bool) or not isinstance(v, int):
            raise InputError(f"shard.{key} is missing or not a whole number", where)
    design = item.get("design")
    if not isinstance(design, dict) or not isinstance(design.get("hash"), str) \
            or not isinstance(design.get("inputs"), dict):
        raise InputError("the result has no design hash or input ports", where)
    # a passing shard is 'tested' (one part of the space); 'exhaustive' only when it is 1 of 1
    if not isinstance(item.get("spec"), str) or item.get("verdict") not in (
            "tested", "exhaustive", "fail", "undecided"):
        raise InputError(f"unexpected verdict {item.get('verdict')!r} for a shard", where)
    engines = [e.get("engine") for e in item.get("engines", []) if isinstance(e, dict)]
    if engines != ["exhaustive"]:
        raise InputError("a shard result must come from the exhaustive engine alone", where)
    return shard


def _passed(item: dict[str, Any]) -> bool:
    """The shard's exhaustive engine simulated its whole part and every output matched."""
    return item["verdict"] in ("tested", "exhaustive") and item["engines"][0].get("status") == "pass"


def merge(paths: Iterable[str | Path]) -> dict[str, Any]:
    """Merge shard results from JSON files; returns the merged result (see the module text)."""
    found: list[tuple[str, Any]] = []
    for p in paths:
        p = Path(p)
        items = _read(p)
        for n, item in enumerate(items):
            found.append((f"{p}[{n}]" if len(items) > 1 else str(p), item))
    if not found:
        raise InputError("no shard files given")
    return merge_results(found)


def merge_results(items: Iterable[tuple[str, Any]]) -> dict[str, Any]:
    """Merge shard results already in memory: (where it came from, the result's JSON form) pairs,
    e.g. ``("shard 3/8", result.to_json())``. Same rules and same merged result as ``merge``."""
    from verify.check import shard_binding
    from verify.engines.exhaustive import shard_range

    shards: list[tuple[str, dict, dict]] = []  # (where, shard, item)
    for where, item in items:
        shards.append((where, _shard_of(item, where), item))
    if not shards:
        raise InputError("no shard files given")

    first_where, first_shard, first = shards[0]
    ident = _identity(first)
    for where, shard, item in shards[1:]:
        other = _identity(item)
        for field, a, b in zip(("design", "spec", "params"), ident, other):
            if a != b:
                raise InputError(f"refusing to merge shards of different {field}s: "
                                 f"{_show(field, a)} in {first_where}, {_show(field, b)} in {where}",
                                 where)
        if shard["count"] != first_shard["count"]:
            raise InputError(f"refusing to merge: {first_where} is one of {first_shard['count']} "
                             f"shards, this one of {shard['count']}", where)
    count = first_shard["count"]
    bits = sum(first["design"]["inputs"].values())
    total = 1 << bits
    by_index: dict[int, str] = {}
    for where, shard, item in shards:
        k = shard["index"]
        if not 1 <= k <= count:
            raise InputError(f"shard index {k} is outside 1..{count}", where)
        if k in by_index:
            raise InputError(f"shard {k}/{count} is given twice (also in {by_index[k]})", where)
        by_index[k] = where
        lo, hi = shard_range(total, (k, count))
        if (shard["first"], shard["last"], shard["vectors"]) != (lo, hi - 1, hi - lo):
            raise InputError(f"shard {k}/{count} covers vectors {shard['first']}..{shard['last']}, "
                             f"but shard {k} of {count} over 2^{bits} vectors is {lo}..{hi - 1}", where)
        if shard.get("binding") != shard_binding(item["design"], item["spec"], shard):
            raise InputError("the shard's binding hash does not match its design name, ports, "
                             "spec or range: the file was edited, or made by another version",
                             where)
    ordered = sorted(shards, key=lambda s: s[1]["first"])
    for (wa, a, _), (wb, b, _) in zip(ordered, ordered[1:]):
        if b["first"] <= a["last"]:
            raise InputError(f"shards overlap: vectors {b['first']}..{min(a['last'], b['last'])} "
                             f"are in {wa} and {wb}", wb)

    missing = [k for k in range(1, count + 1) if k not in by_index]
    failed = [(w, s, i) for w, s, i in shards if i["verdict"] == "fail"]
    unfinished = [(w, s, i) for w, s, i in shards if i["verdict"] == "undecided"]
    covered = sum(s["vectors"] for _, s, i in shards if _passed(i))

    if failed:
        verdict, code = "fail", 1
        w, s, i = min(failed, key=lambda f: f[1]["index"])
        reason = (f"shard {s['index']}/{count} found a counterexample ({len(failed)} of "
                  f"{len(shards)} shards given failed)")
    elif missing:
        verdict, code = "undecided", 3
        reason = (f"{len(missing)} of {count} shards missing ({_ranges(missing)}): "
                  f"{covered:,} of {total:,} vectors checked")
    elif unfinished:
        verdict, code = "undecided", 3
        reason = (f"shard{'s' if len(unfinished) > 1 else ''} "
                  f"{', '.join(str(s['index']) for _, s, _ in unfinished)} stopped without an "
                  f"answer: {covered:,} of {total:,} vectors checked")
    else:
        spans = [(s["first"], s["last"]) for _, s, _ in ordered]
        contiguous = spans[0][0] == 0 and spans[-1][1] == total - 1 and all(
            b[0] == a[1] + 1 for a, b in zip(spans, spans[1:]))
        if not contiguous or covered != total:  # cannot happen after the checks above
            raise InputError("the shards do not cover the input space")
        verdict, code = "exhaustive", 0
        reason = (f"all {count} shards passed: every one of the 2^{bits} = {total:,} input "
                  f"combinations simulated once; every output equals the spec")
    out: dict[str, Any] = {
        "ok": code == 0, "verdict": verdict, "exit_code": code, "coverage": reason,
        "design": {k: first["design"].get(k) for k in ("name", "hash", "inputs", "outputs")},
        "spec": first["spec"], "params": first.get("params"),
        "shards": {"count": count, "present": sorted(by_index), "missing": missing,
                   "failed": sorted(s["index"] for _, s, _ in failed),
                   "undecided": sorted(s["index"] for _, s, _ in unfinished)},
        "vectors": {"total": total, "checked_passing": covered},
        "seconds": round(sum(float(i.get("seconds", 0)) for _, _, i in shards), 6),
        "files": [w for w, _, _ in shards],
    }
    if failed:
        w, s, i = min(failed, key=lambda f: f[1]["index"])
        out["counterexample"] = i.get("counterexample")
        out["counterexample_from"] = w
    return out


def _identity(item: dict) -> tuple:
    return (item["design"]["hash"], item["spec"], item.get("params") or {})


def _show(field: str, value: Any) -> str:
    if field == "design":
        return f"hash {value[:12]}"
    return json.dumps(value)


def _ranges(ks: list[int]) -> str:
    out, start = [], None
    for n, k in enumerate(ks):
        if start is None:
            start = k
        if n + 1 == len(ks) or ks[n + 1] != k + 1:
            out.append(str(start) if start == k else f"{start}-{k}")
            start = None
    return ", ".join(out)


def render_text(merged: dict[str, Any]) -> str:
    d = merged["design"]
    lines = [f"design  {d['name']}  (hash {d['hash'][:12]})", f"spec    {merged['spec']}",
             f"shards  {len(merged['shards']['present'])} of {merged['shards']['count']} given"]
    lines.append("")
    lines.append(f"{merged['verdict'].upper()}: {merged['coverage']}")
    cex = merged.get("counterexample")
    if cex:
        ins = " ".join(f"{k}={v}" for k, v in cex["inputs"].items())
        lines.append(f"counterexample ({merged['counterexample_from']}): {ins}")
        for port, want in cex["expected"].items():
            got = cex["actual"].get(port)
            if got != want:
                lines.append(f"  {port}: expected {want} ({want:#x}), actual {got} ({got:#x})")
    return "\n".join(lines)


# ---- splitting one exhaustive check over an executor's workers --------------------------------

#: shards per worker: enough that a slow or lost worker holds up a small part of the space
SHARDS_PER_WORKER = 4


def _shard_task(text: str, origin: str | None, spec, shard: tuple[int, int],
                options: dict[str, Any]) -> dict[str, Any]:
    """A worker's task: one shard of the exhaustive engine over a JSON netlist; its JSON result."""
    from dataclasses import replace

    from verify.check import check
    from verify.formats import json_netlist
    design = replace(json_netlist.parse(text, origin or "<json>"), origin=origin)
    return check(design, spec, engine="exhaustive", shard=shard, **options).to_json()


def check_split(design, spec, executor, *, shards: int | None = None, require="tested",
                progress=None, **options):
    """The exhaustive check of ``design``, split into shards run on ``executor`` and merged by
    ``merge_results``: the verdict and counterexample of one local exhaustive run.

    ``shards`` defaults to ``SHARDS_PER_WORKER`` per worker, never more than the input space. A
    shard no worker could finish is missing from the merge, so the verdict is ``undecided`` (or
    ``fail`` if another shard found a counterexample). Once a shard fails and every shard before
    it is done, the rest are cancelled: the first failing vector is then known. ``options`` are
    those of ``verify.check`` (timeout applies to each shard).
    """
    from verify.check import check, resolve_spec
    from verify.engines import DEFAULT_EXHAUSTIVE_BITS
    from verify.formats import json_netlist
    from verify.manifest.executors import each_done
    from verify.model.result import (CheckResult, Counterexample, EngineOutcome, Require,
                                     Verdict)

    bits = design.input_width
    the_spec = resolve_spec(design, spec)
    if bits > options.get("exhaustive_limit", DEFAULT_EXHAUSTIVE_BITS) or bits == 0:
        # nothing to split: the engine says why it does not run (or runs the one vector)
        return check(design, the_spec, engine="exhaustive", require=require, **options)
    count = shards or SHARDS_PER_WORKER * executor.workers
    count = max(1, min(count, 1 << bits))
    shipped = None if the_spec.inferred else the_spec.source
    text = json_netlist.dumps(design)
    started = time.perf_counter()
    items: dict[int, dict[str, Any]] = {}
    lost: list[str] = []
    total = 1 << bits
    tasks = [(k, _shard_task, (text, design.origin, shipped, (k, count), options))
             for k in range(1, count + 1)]
    with closing(each_done(executor, tasks)) as results:
        for k, item, why in results:
            if why is not None:
                lost.append(f"shard {k}/{count}: {why}")
                continue
            items[k] = item
            if progress:
                progress("exhaustive", sum(i["shard"]["vectors"] for i in items.values()), total)
            failed = [j for j, i in items.items() if i["verdict"] == "fail"]
            if failed and all(j in items for j in range(1, min(failed))):
                break  # the first failing vector is in shard min(failed): cancel the rest
    merged = merge_results([(f"shard {k}/{count}", items[k]) for k in sorted(items)]) if items \
        else None
    verdict = Verdict(merged["verdict"]) if merged else Verdict.UNDECIDED
    cex = found = None
    if merged and merged.get("counterexample"):
        cex = Counterexample.from_json(merged["counterexample"])
        source = items[min(merged["shards"]["failed"])]
        if source.get("found_counterexample"):
            found = Counterexample.from_json(source["found_counterexample"])
    status = {Verdict.EXHAUSTIVE: "pass", Verdict.FAIL: "fail"}.get(verdict, "undecided")
    where = getattr(executor, "where", "workers")
    if verdict is Verdict.FAIL:
        k = min(merged["shards"]["failed"])
        evidence = f"{items[k]['engines'][0]['evidence']} (shard {k}/{count}, on {where})"
    else:
        evidence = (merged["coverage"] if merged else f"no shard of {count} finished") + \
            f" ({count} shards on {where})"
    if lost:
        evidence += f"; not finished: {'; '.join(lost)}"
    vectors = sum(e.get("vectors") or 0 for i in items.values() for e in i["engines"])
    outcome = EngineOutcome(
        "exhaustive", status, time.perf_counter() - started, evidence, vectors=vectors,
        counterexample=cex,
        details={"input_bits": bits, "shards": merged["shards"] if merged else
                 {"count": count, "present": [], "missing": list(range(1, count + 1))}})
    return CheckResult(
        design=design.name, design_hash=design.content_hash(),
        ports={"inputs": {p.name: p.width for p in design.inputs},
               "outputs": {p.name: p.width for p in design.outputs}},
        gate_count=len(design.gates), spec=the_spec.text, spec_inferred=the_spec.inferred,
        engines=[outcome], verdict=verdict,
        require=require if isinstance(require, Require) else Require(require),
        counterexample=cex, seconds=time.perf_counter() - started, origin=design.origin,
        found_counterexample=found)
