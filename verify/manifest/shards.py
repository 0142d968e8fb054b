"""Merging the JSON results of ``verify check --engine exhaustive --shard K/N --json``.

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
        raise InputError("not a result of 'verify check --json'", where)
    if item.get("verdict") == "error":
        raise InputError(f"this shard's check did not run: {item.get('error', 'error')}", where)
    shard = item.get("shard")
    if not isinstance(shard, dict):
        raise InputError("not a shard result (run 'verify check --engine exhaustive --shard K/N "
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
    from verify.check import shard_binding
    from verify.engines.exhaustive import shard_range

    shards: list[tuple[str, dict, dict]] = []  # (where, shard, item)
    for p in paths:
        p = Path(p)
        items = _read(p)
        for n, item in enumerate(items):
            where = f"{p}[{n}]" if len(items) > 1 else str(p)
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
