"""Reports of a manifest run (``adder-verify run``): a terminal table, JUnit XML, a JSON summary and a
Markdown summary short enough for a pull-request comment.

Every function takes a ``verify.manifest.runner.RunSummary``; a record is one entry at one parameter point
(see ``verify.manifest.runner.check_entry`` for its fields).
"""

from __future__ import annotations

import json
import re
import shlex
import xml.etree.ElementTree as ET
from typing import Any

from verify.manifest.records import EntryRecord
from verify.model.result import SCOPE_NOTE

JSON_FORMAT = "verify-run/1"
#: the Markdown summary lists every row up to this many; past it, only rows that need attention
MARKDOWN_ROWS = 30

_EXIT_MEANING = {0: "every entry met its manifest", 1: "a result contradicts the manifest",
                 2: "bad input: an entry could not be read", 3: "undecided or weaker than required"}


def engines_text(record: EntryRecord) -> str:
    names = [e["engine"] for e in record.engines if e.get("status") != "skipped"]
    return "+".join(names) or "-"


def params_text(params: dict[str, int]) -> str:
    return " ".join(f"{k}={v}" for k, v in params.items()) or "-"


def counterexample_text(record: EntryRecord) -> str | None:
    """One line: the inputs, then each wrong output with expected and actual values."""
    cex = record.counterexample
    if not cex:
        return None
    ins = " ".join(f"{k}={_hex(v)}" for k, v in cex["inputs"].items())
    wrong = cex.get("wrong_bits") or {}
    outs = []
    for port, want in cex["expected"].items():
        if port in wrong:
            got = cex["actual"].get(port)
            bits = ",".join(str(b) for b in wrong[port])
            word = "bit" if len(wrong[port]) == 1 else "bits"
            outs.append(f"{port} expected {_hex(want)} got {_hex(got)} (wrong {word} {bits})")
    return f"{ins}: " + "; ".join(outs)


def _hex(v: int | None) -> str:
    if v is None:
        return "?"
    return str(v) if v < 10 else f"{v:#x}"


def problem_text(record: EntryRecord) -> str | None:
    """Why a record does not meet its entry, in one line (None when it does)."""
    status = record.status
    if record.ok:
        return None
    if status == "error":
        return record.error or "could not be read"
    if status == "counterexample":
        return "counterexample " + (counterexample_text(record) or "")
    if status == "unexpected pass":
        return (f"expected a counterexample (deliberately_broken = true) but the design is "
                f"{record.verdict}: {(record.coverage or '')}")
    if status == "weaker than required":
        return f"{(record.coverage or '')}; require = \"complete\" asks for proven or exhaustive"
    if record.deliberately_broken:
        return "expected a counterexample, none was established: " + _evidence(record)
    return _evidence(record)


def _evidence(record: EntryRecord) -> str:
    parts = [f"{e['engine']}: {e['evidence']}" for e in record.engines
             if e.get("status") in ("undecided", "skipped")]
    return "; ".join(parts) or (record.coverage or "no engine established the spec")


def command_text(record: EntryRecord) -> str | None:
    """The shell command (quoted for a POSIX shell) that reproduces the record: for a
    counterexample, ``adder-verify explain`` on its vector; otherwise ``adder-verify check`` with
    the entry's options. Paths are relative to the folder the run started in."""
    return shlex.join(record.reproduce) if record.reproduce else None


def next_step(record: EntryRecord) -> str | None:
    """'explain it: adder-verify explain ...' for a record that does not meet its entry (not for
    an entry that could not be read: its error line says what to fix)."""
    cmd = command_text(record)
    if record.ok or record.exit_code == 2 or cmd is None:
        return None
    what = "explain it" if record.counterexample else "check it again"
    return f"{what}: {cmd}"


def _time(record: EntryRecord) -> str:
    return "cached" if record.cached else f"{record.seconds:.2f} s"


def headline(summary) -> str:
    n = len(summary.records)
    caught = sum(1 for r in summary.records if r.ok and r.deliberately_broken)
    cached = sum(1 for r in summary.records if r.cached)
    parts = []
    for status, count in summary.counts.items():
        note = f" ({caught} broken on purpose and caught)" if status == "met" and caught else ""
        parts.append(f"{count} {status}{note}")
    extra = f"; {cached} from the cache" if cached else ""
    return (f"{n} check{'s' if n != 1 else ''}: {', '.join(parts)}{extra}; {summary.seconds:.2f} s; "
            f"exit {summary.exit_code} ({_EXIT_MEANING[summary.exit_code]})")


# ---- the terminal table -----------------------------------------------------------------------

def render_table(summary) -> str:
    rows = [("design", "params", "verdict", "engines", "time", "result")]
    for r in summary.records:
        mark = "ok" if r.ok else r.status.value.upper()
        if r.ok and r.deliberately_broken:
            mark = "ok (expected fail)"
        rows.append((r.name, params_text(r.params), r.verdict.value.upper(),
                     engines_text(r), _time(r), mark))
    widths = [max(len(row[i]) for row in rows) for i in range(len(rows[0]))]
    lines = []
    for n, row in enumerate(rows):
        lines.append("  ".join(cell.ljust(w) if i != 4 else cell.rjust(w)
                               for i, (cell, w) in enumerate(zip(row, widths))).rstrip())
        if n == 0:
            lines.append("  ".join("-" * w for w in widths))
    caught = [(r.label, counterexample_text(r)) for r in summary.records
              if r.ok and r.deliberately_broken and r.counterexample]
    if caught:
        lines.append("")
        lines.append("broken on purpose, caught with these counterexamples:")
        for name, text in caught:
            lines.append(f"  {name}: {text}")
    problems = [r for r in summary.records if not r.ok]
    if problems:
        lines.append("")
        for r in problems:
            lines.append(f"{r.label}: {problem_text(r)}")
            step = next_step(r)
            if step:
                lines.append(f"  {step}")
    lines.append("")
    lines.append(headline(summary))
    return "\n".join(lines)


# ---- JSON ---------------------------------------------------------------------------------

def render_json(summary) -> dict[str, Any]:
    """The JSON summary: ``entries`` holds one object per design and parameter point."""
    entries = []
    for r in summary.records:
        entries.append({
            "name": r.name, "params": r.params, "ok": r.ok, "verdict": r.verdict.value,
            "status": r.status.value, "exit_code": r.exit_code, "cached": r.cached,
            "seconds": round(r.seconds, 6), "checked_seconds": round(r.checked_seconds, 6),
            "deliberately_broken": r.deliberately_broken, "require": r.require,
            "method": r.method,
            "engines": r.engines, "coverage": r.coverage, "spec": r.spec,
            "sources": r.sources, "file_hashes": r.file_hashes,
            "design_hash": r.design_hash, "cache_key": r.key,
            "counterexample": r.counterexample, "error": r.error,
            "same_as": r.same_as, "reproduce": command_text(r),
        })
    return {"format": JSON_FORMAT, "tool_version": summary.tool_version,
            "manifest": summary.manifest, "ok": summary.ok, "exit_code": summary.exit_code,
            "counts": summary.counts, "seconds": round(summary.seconds, 6), "jobs": summary.jobs,
            "cache_used": summary.cache_used, "entries": entries, "note": SCOPE_NOTE}


def dumps_json(summary) -> str:
    return json.dumps(render_json(summary), indent=2) + "\n"


# ---- JUnit XML ----------------------------------------------------------------------------

_BAD_XML = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")


def _x(text: Any) -> str:
    """Text XML 1.0 can hold (ElementTree escapes <, & and quotes; control characters go)."""
    return _BAD_XML.sub("?", str(text))


def render_junit(summary, suite_name: str | None = None) -> str:
    """JUnit XML: one test case per design and parameter point.

    A counterexample is a ``failure`` whose message is the counterexample; an undecided or
    weaker-than-required result and an unexpected pass are failures too (the gate is red), with
    their own ``type``; an entry that could not be read is an ``error``.
    """
    failures = sum(1 for r in summary.records if r.exit_code in (1, 3))
    errors = sum(1 for r in summary.records if r.exit_code == 2)
    total_time = f"{summary.seconds:.3f}"
    root = ET.Element("testsuites", name="adder-verify run", tests=str(len(summary.records)),
                      failures=str(failures), errors=str(errors), time=total_time)
    suite = ET.SubElement(root, "testsuite", name=_x(suite_name or summary.manifest),
                          tests=str(len(summary.records)), failures=str(failures),
                          errors=str(errors), skipped="0", time=total_time)
    props = ET.SubElement(suite, "properties")
    ET.SubElement(props, "property", name="tool_version", value=_x(summary.tool_version))
    ET.SubElement(props, "property", name="exit_code", value=str(summary.exit_code))
    for r in summary.records:
        case = ET.SubElement(suite, "testcase", classname=_x(f"verify.{r.name}"),
                             name=_x(r.label), time=f"{r.seconds:.3f}")
        problem = problem_text(r)
        status = r.status
        if r.exit_code == 2:
            el = ET.SubElement(case, "error", type="input", message=_x(problem))
            el.text = _x(problem)
        elif r.exit_code in (1, 3):
            kind = {"counterexample": "counterexample", "unexpected pass": "unexpected-pass",
                    "weaker than required": "weaker-than-required"}.get(status, "undecided")
            message = counterexample_text(r) if status == "counterexample" else problem
            el = ET.SubElement(case, "failure", type=kind, message=_x(message))
            el.text = _x(_details(r))
        out = ET.SubElement(case, "system-out")
        out.text = _x(_details(r))
    ET.indent(root)
    return ('<?xml version="1.0" encoding="utf-8"?>\n<!-- adder-verify report (junit) -->\n'
            + ET.tostring(root, encoding="unicode") + "\n")


def _details(r: EntryRecord) -> str:
    lines = [f"verdict: {r.verdict}{' (from the cache)' if r.cached else ''}",
             f"meets the manifest: {'yes' if r.ok else 'no'} ({r.status})",
             f"spec: {r.spec}", f"sources: {', '.join(r.sources)}"]
    if r.coverage:
        lines.append(f"coverage: {r.coverage}")
    for e in r.engines:
        lines.append(f"  {e['engine']}: {e['status']} in {e['seconds']:.3f} s: {e['evidence']}")
    cex = counterexample_text(r)
    if cex:
        lines.append(f"counterexample: {cex}")
    if r.error:
        lines.append(f"error: {r.error}")
    return "\n".join(lines)


# ---- Markdown -----------------------------------------------------------------------------

def _md(text: str) -> str:
    return str(text).replace("\\", "\\\\").replace("|", "\\|").replace("\n", " ")


def _code_span(text: str) -> str:
    """``text`` as a Markdown code span, fenced with more backticks than it holds in a row."""
    longest = max((len(m) for m in re.findall(r"`+", text)), default=0)
    fence = "`" * (longest + 1)
    pad = " " if text.startswith("`") or text.endswith("`") else ""
    return f"{fence}{pad}{text.replace(chr(10), ' ')}{pad}{fence}"


def render_markdown(summary) -> str:
    """A short Markdown summary for a pull-request comment."""
    mark = "✅" if summary.ok else "❌"
    lines = ["<!-- adder-verify report (markdown) -->",
             f"### {mark} adder-verify: {_md(headline(summary))}", ""]
    records = summary.records
    shown = records if len(records) <= MARKDOWN_ROWS else [r for r in records if not r.ok]
    if shown:
        lines.append("| | design | params | verdict | engines | time |")
        lines.append("|---|---|---|---|---|---|")
        for r in shown:
            sign = "✅" if r.ok else "❌"
            verdict = r.verdict.value + (" (expected)" if r.ok and r.deliberately_broken else "")
            if not r.ok:
                verdict = f"**{verdict}**"
            lines.append(f"| {sign} | `{_md(r.name)}` | {_md(params_text(r.params))} | "
                         f"{verdict} | {_md(engines_text(r))} | {_time(r)} |")
    hidden = len(records) - len(shown)
    if hidden:
        lines.append("")
        lines.append(f"{hidden} more check{'s' if hidden != 1 else ''} met the manifest "
                     f"(see the JSON summary).")
    problems = [r for r in records if not r.ok]
    if problems:
        lines.append("")
        for r in problems[:MARKDOWN_ROWS]:
            lines.append(f"- `{_md(r.label)}`: {_md(problem_text(r) or '')}")
            step = next_step(r)
            if step:
                what, cmd = step.split(": ", 1)
                lines.append(f"  {what}: {_code_span(cmd)}")
        if len(problems) > MARKDOWN_ROWS:
            lines.append(f"- ... and {len(problems) - MARKDOWN_ROWS} more")
    lines.append("")
    lines.append(f"<sub>{_md(SCOPE_NOTE)}</sub>")
    return "\n".join(lines) + "\n"
