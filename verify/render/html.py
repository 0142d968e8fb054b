"""The HTML report of a manifest run (``adder-verify run --html FILE``): one self-contained page.

The page holds the table of entries (design, width, verdict, engines, time, cached, result) and,
for every record with a counterexample (a deliberately broken design that was caught, or a design
that should pass and does not), its bit table, the suspects, the fan-in cone drawn inline as SVG,
a link to its waveform and the command that reproduces and explains it; records that do not meet
their entry for another reason get their reason and the command that checks them again.

Nothing is fetched: no scripts, no external style sheets, fonts or images; the only links are
to the page's own sections and to the waveform files written beside it (relative links). The
diagnosis is worked out before rendering (``verify.manifest.runner.run(..., diagnose=True)``);
this module only draws. The cone is drawn by Graphviz ``dot`` when it is installed; without it the
page shows the DOT text and says so.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from html import escape
from pathlib import Path
from typing import Any, Mapping
from urllib.parse import quote

from verify.files import report_mark
from verify.manifest.records import EntryRecord
from verify.model.result import SCOPE_NOTE
from verify.render.batch import (command_text, counterexample_text, engines_text, headline,
                                 problem_text)

KIND = "html"

_CSS = """
body { font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Helvetica, Arial, sans-serif;
       margin: 1.5em auto; max-width: 1240px; padding: 0 1em; color: #1d1d1f; }
h1 { font-size: 1.5em; margin-bottom: .2em; }
h2 { font-size: 1.25em; margin-top: 1.8em; border-bottom: 1px solid #ccc; }
h3 { font-size: 1.1em; margin: 0 0 .4em; }
code, pre, .bits td, .bits th { font-family: ui-monospace, "DejaVu Sans Mono", Menlo, monospace; }
table { border-collapse: collapse; margin: .4em 0 .8em; }
caption { text-align: left; font-size: .9em; color: #444; padding-bottom: .2em; }
th, td { border: 1px solid #d0d0d0; padding: .2em .5em; text-align: left; vertical-align: top; }
thead th { background: #f0f0f0; }
td.num { text-align: right; white-space: nowrap; }
.banner { padding: .6em .9em; border-radius: 6px; font-weight: 600; }
.banner.good { background: #e3f4e6; border: 1px solid #2e7d32; }
.banner.bad { background: #fbe4e4; border: 1px solid #c62828; }
.banner.maybe { background: #fff3dc; border: 1px solid #b26a00; }
.tag { display: inline-block; padding: 0 .45em; border-radius: 4px; font-size: .9em;
       font-weight: 600; white-space: nowrap; }
.good .tag, .tag.good { background: #d7efdb; color: #1b5e20; }
.bad .tag, .tag.bad { background: #f8d4d4; color: #8e1616; }
.maybe .tag, .tag.maybe { background: #ffe7b8; color: #6d4100; }
tr.bad > * { background: #fff5f5; }
tr.maybe > * { background: #fffaf0; }
section.entry { border: 1px solid #d0d0d0; border-left: 6px solid #999; border-radius: 6px;
                padding: .8em 1em; margin: 1em 0; }
section.entry.good { border-left-color: #2e7d32; }
section.entry.bad { border-left-color: #c62828; }
section.entry.maybe { border-left-color: #b26a00; }
.bits td, .bits th { text-align: center; padding: .1em .3em; min-width: 1.2em; }
.bits th[scope=row] { text-align: left; white-space: nowrap; }
.bits td.wrong { background: #e04040; color: #fff; font-weight: 700; }
.bits td.carrywrong { background: #f6b26b; font-weight: 700; }
.bits td.none { color: #999; }
ol.suspects li { margin-bottom: .4em; }
p.finding { font-weight: bold; }
.why { color: #444; }
figure.cone { margin: .5em 0; overflow-x: auto; border: 1px solid #e0e0e0; padding: .3em; }
figure.cone svg { max-width: 100%; height: auto; }
figcaption { font-size: .9em; color: #444; }
pre { background: #f6f6f6; border: 1px solid #ddd; padding: .5em .7em; overflow-x: auto;
      white-space: pre-wrap; overflow-wrap: anywhere; }
.note { color: #6d4100; }
.legend { font-size: .9em; color: #444; margin-bottom: 0; }
footer { margin-top: 2em; font-size: .9em; color: #555; }
"""


def _e(text: Any) -> str:
    return escape(str(text), quote=True)


def _tone(record: EntryRecord) -> str:
    """good (meets its entry), bad (contradicts it or could not be read), maybe (undecided)."""
    if record.ok:
        return "good"
    return "maybe" if record.exit_code == 3 else "bad"


def _result_text(record: EntryRecord) -> str:
    if record.ok and record.deliberately_broken:
        return "met: broken on purpose, caught"
    return record.status.value


def _width(record: EntryRecord) -> str:
    ports = (record.design or {}).get("inputs") or {}
    return str(max(ports.values())) if ports else "-"


def _ports_text(record: EntryRecord) -> str:
    d = record.design or {}
    ins = ", ".join(f"{k} {v}" for k, v in (d.get("inputs") or {}).items())
    outs = ", ".join(f"{k} {v}" for k, v in (d.get("outputs") or {}).items())
    return f"inputs {ins}; outputs {outs} (bits)" if ins else ""


def _hex(v: int | None) -> str:
    return "?" if v is None else (str(v) if v < 10 else f"{v:#x}")


def _anchor(index: int) -> str:
    return f"entry-{index + 1}"


def _detailed(record: EntryRecord) -> bool:
    return bool(record.counterexample) or not record.ok


# ---- files beside the page --------------------------------------------------------------

def waveform_paths(summary, html_path: str | Path) -> dict[str, Path]:
    """record label -> where its waveform goes: ``<page stem>-waves/<label>.vcd`` beside the
    page, for every record whose diagnosis has a waveform."""
    page = Path(html_path)
    folder = page.parent / f"{page.stem}-waves"
    out: dict[str, Path] = {}
    used: set[str] = set()
    for r in summary.records:
        if r.diagnosis is None or not r.diagnosis.waveform_vcd:
            continue
        stem = re.sub(r"[^A-Za-z0-9_.-]+", "_", r.label).strip("._") or "entry"
        name, k = stem, 1
        while name.lower() in used:
            k += 1
            name = f"{stem}-{k}"
        used.add(name.lower())
        out[r.label] = folder / f"{name}.vcd"
    return out


def relative_href(target: Path, page: str | Path) -> str:
    """A relative URL from the page to ``target`` (a file beside it or below)."""
    rel = Path(target).relative_to(Path(page).parent)
    return "/".join(quote(part) for part in rel.parts)


# ---- the cone ---------------------------------------------------------------------------

_XML_HEAD = re.compile(r"^.*?(?=<svg\b)", re.S)
_NS_ATTR = re.compile(r'\s+xmlns(?::\w+)?="[^"]*"')
_ID_ATTR = re.compile(r'\bid="([^"]*)"')

def svg_from_dot(dot_text: str, prefix: str) -> tuple[str | None, str | None]:
    """(inline SVG, None) drawn by Graphviz ``dot``, or (None, why not).

    The XML declaration and DOCTYPE (which names a URL) are dropped, so are namespace
    declarations (HTML gives inline ``<svg>`` its namespace); element ids get ``prefix`` so that
    several drawings on one page do not share ids.
    """
    exe = shutil.which("dot")
    if exe is None:
        return None, "Graphviz 'dot' is not installed here, so the cone is shown as DOT text"
    try:
        done = subprocess.run([exe, "-Tsvg"], input=dot_text, check=True, timeout=60,
                              capture_output=True, text=True)
    except (subprocess.SubprocessError, OSError) as e:
        return None, f"Graphviz 'dot' could not draw the cone ({e}), so it is shown as DOT text"
    svg = _XML_HEAD.sub("", done.stdout, count=1)
    svg = _NS_ATTR.sub("", svg)

    svg = _ID_ATTR.sub(lambda m: f'id="{prefix}-{m[1]}"', svg)
    if not svg.lstrip().startswith("<svg"):
        return None, "Graphviz 'dot' gave no SVG, so the cone is shown as DOT text"
    return svg.strip(), None


# ---- pieces of a failure ----------------------------------------------------------------

def _ports_table(record: EntryRecord) -> str:
    cex = record.counterexample or {}
    wrong = cex.get("wrong_bits") or {}
    rows = ['<table class="ports"><caption>the counterexample, port by port</caption>',
            '<thead><tr><th scope="col">port</th><th scope="col">value</th>'
            '<th scope="col">expected by the spec</th><th scope="col">wrong bits</th></tr>'
            '</thead><tbody>']
    for port, v in (cex.get("inputs") or {}).items():
        rows.append(f'<tr><th scope="row">{_e(port)} (input)</th><td class="num">{_e(_hex(v))}'
                    f'</td><td></td><td></td></tr>')
    for port, want in (cex.get("expected") or {}).items():
        got = (cex.get("actual") or {}).get(port)
        bad = port in wrong
        bits = ", ".join(str(b) for b in wrong.get(port, [])) or "none"
        rows.append(f'<tr class="{"bad" if bad else ""}"><th scope="row">{_e(port)} (output)</th>'
                    f'<td class="num">{_e(_hex(got))}</td><td class="num">{_e(_hex(want))}</td>'
                    f'<td>{_e(bits)}</td></tr>')
    rows.append("</tbody></table>")
    return "\n".join(rows)


def _bit_table(bits: Mapping[str, Any]) -> str:
    """Per bit of the sum, MSB on the left: operands, carry and sum, expected and actual."""
    rows = list(bits["rows"])
    n = bits["width"]
    a_name, b_name = bits["operands"]
    order = list(reversed(rows))

    def cell(row: Mapping[str, Any], key: str, other: str | None = None, cls: str = "") -> str:
        v = row.get(key)
        if v is None and key == "carry_actual":
            return '<td class="none" title="no net of the design carries it">.</td>'
        if v is None:
            return "<td></td>"
        mark = cls if other is not None and row.get(other) is not None and row[other] != v else ""
        return f'<td class="{mark}">{_e(v)}</td>' if mark else f"<td>{_e(v)}</td>"

    out = [f'<p class="legend">Columns are bits of {_e(a_name)} + {_e(b_name)}, column {n} is '
           f'the carry out; red: a wrong bit of the sum, amber: a wrong carry; "." where no net '
           f'of the design carries that carry.</p>',
           '<table class="bits"><caption>the counterexample, bit by bit</caption>',
           '<thead><tr><th scope="col">bit</th>'
           + "".join(f'<th scope="col">{r["bit"]}</th>' for r in order) + "</tr></thead><tbody>"]
    spec = [(a_name, "a", None, ""), (b_name, "b", None, ""),
            ("carry in, expected", "carry_expected", None, ""),
            ("carry in, actual", "carry_actual", "carry_expected", "carrywrong"),
            ("sum, expected", "sum_expected", None, ""),
            ("sum, actual", "sum_actual", "sum_expected", "wrong")]
    for title, key, other, cls in spec:
        cells = "".join(cell(r, key, other, cls) for r in order)
        out.append(f'<tr><th scope="row">{_e(title)}</th>{cells}</tr>')
    out.append("</tbody></table>")
    wrong = [r["bit"] for r in rows if r.get("sum_actual") is not None
             and r["sum_actual"] != r.get("sum_expected")]
    if wrong:
        first = rows[min(wrong)]
        carry = (f", the design's {first['carry_net']} is {first['carry_actual']}"
                 if "carry_net" in first else ", no net of the design carries it")
        out.append(f"<p>First wrong bit: {min(wrong)} of the sum ({_e(first.get('output'))}); "
                   f"carry into it: expected {_e(first['carry_expected'])}{_e(carry)}.</p>")
    else:
        out.append("<p>Every bit of the sum is right on this vector; the wrong output is in the "
                   "table above.</p>")
    return "\n".join(out)


def _suspects(suspects: list[Mapping[str, Any]], shown: int = 3) -> str:
    if not suspects:
        return "<p>No suspect: no single net of the design explains the failure.</p>"
    items = []
    for s in suspects[:shown]:
        where = f" at <code>{_e(s['source'])}</code>" if s.get("source") else ""
        items.append(f"<li><code>{_e(s['net'])} = {_e(s['op'])}({_e(', '.join(s['inputs']))})"
                     f"</code> score {s['score']:.2f}{where}<br><span class=\"why\">"
                     f"{_e(s.get('why', ''))}</span></li>")
    return ('<h4>Suspects (most likely first)</h4>\n<ol class="suspects">\n' + "\n".join(items)
            + "\n</ol>")


def _trace(trace: list[Mapping[str, Any]]) -> str:
    if not trace:
        return ""
    steps = " &rarr; ".join(f"<code>{_e(t['net'])}</code> ({_e(t['op'])}, {_e(t['actual'])} "
                            f"not {_e(t['expected'])})" for t in trace)
    return f"<p>The first wrong value travels: {steps}.</p>"


def _cone(record: EntryRecord, index: int) -> str:
    dot = record.diagnosis.cone_dot if record.diagnosis else None
    if not dot:
        return ""
    caption = ("fan-in cone of the first wrong output bit; red: first suspect, pink: next "
               "suspects, orange: a wrong value on the counterexample; the output has a double "
               "border")
    svg, note = svg_from_dot(dot, f"cone{index + 1}")
    if svg is None:
        return (f'<figure class="cone"><p class="note">{_e(note)}.</p><pre>{_e(dot)}</pre>'
                f"<figcaption>{_e(caption)}</figcaption></figure>")
    return (f'<figure class="cone" role="group" aria-label="{_e(caption)}">\n{svg}\n'
            f"<figcaption>{_e(caption)}</figcaption></figure>")


def render_delays(delays: Mapping[str, Any]) -> str:
    """The delay table and a bar plot of a timing result, from a plain dict.

    A separate place for the delay analysis another branch adds; the shape expected here is
    ``{"unit": "ns", "arrival": {output bit: delay, ...}, "note": "..."}`` (adapt the keys when
    that branch lands). Draws only what the dict holds: nothing is estimated here.
    """
    arrival = {str(k): float(v) for k, v in (delays.get("arrival") or {}).items()}
    if not arrival:
        return ""
    unit = str(delays.get("unit", ""))
    top = max(arrival.values()) or 1.0
    rows = "".join(f'<tr><th scope="row"><code>{_e(k)}</code></th><td class="num">{v:g} '
                   f"{_e(unit)}</td></tr>" for k, v in arrival.items())
    bar_h, width, label_w = 16, 520, 150
    bars = []
    for i, (k, v) in enumerate(arrival.items()):
        y = i * (bar_h + 4)
        w = max(1.0, (width - label_w - 60) * v / top)
        bars.append(f'<text x="{label_w - 6}" y="{y + 12}" text-anchor="end" font-size="11">'
                    f'{_e(k)}</text><rect x="{label_w}" y="{y}" width="{w:.1f}" height="{bar_h}" '
                    f'fill="#4a78b5"/><text x="{label_w + w + 4:.1f}" y="{y + 12}" '
                    f'font-size="11">{v:g}</text>')
    height = len(arrival) * (bar_h + 4)
    note = f"<p>{_e(delays['note'])}</p>" if delays.get("note") else ""
    return (f'<h4>Delays</h4>{note}<table class="delays"><thead><tr><th scope="col">output'
            f'</th><th scope="col">arrival</th></tr></thead><tbody>{rows}</tbody></table>'
            f'<svg width="{width}" height="{height}" role="img" aria-label="arrival time per '
            f'output">{"".join(bars)}</svg>')


def _entry_section(record: EntryRecord, index: int, waveform: str | None) -> str:
    tone = _tone(record)
    out = [f'<section class="entry {tone}" id="{_anchor(index)}">',
           f'<h3>{_e(record.label)} <span class="tag">{_e(_result_text(record))}</span></h3>']
    facts = [f"verdict <strong>{_e(record.verdict.value)}</strong>",
             f"sources <code>{_e(', '.join(record.sources))}</code>",
             f"spec <code>{_e(record.spec)}</code>"]
    out.append("<p>" + "; ".join(facts) + ".</p>")
    if record.ok and record.deliberately_broken:
        out.append("<p>Marked deliberately broken in the manifest; the check caught it with this "
                   "counterexample, so the entry meets its manifest.</p>")
    elif record.counterexample and record.status.value == "counterexample":
        out.append("<p><strong>Why it does not meet the manifest:</strong> the design gives "
                   "wrong outputs on the counterexample below.</p>")
    elif not record.ok:
        out.append(f"<p><strong>Why it does not meet the manifest:</strong> "
                   f"{_e(problem_text(record) or '')}</p>")
    if record.coverage and not record.counterexample:
        out.append(f"<p>Coverage: {_e(record.coverage)}</p>")
    if record.counterexample:
        out.append(f"<p>Counterexample: <code>{_e(counterexample_text(record))}</code></p>")
        out.append(_ports_table(record))
        d = record.diagnosis
        if d is None:
            out.append('<p class="note">No diagnosis was made for this report.</p>')
        elif d.problem:
            out.append(f'<p class="note">{_e(d.problem)}</p>')
        else:
            det = d.details
            if det.get("permutation_text"):
                out.append(f'<p class="finding">{_e(det["permutation_text"])}</p>')
            if det.get("bits"):
                out.append(_bit_table(det["bits"]))
            out.append(_suspects(d.suspects))
            out.append(_trace(det.get("trace") or []))
            for note in det.get("notes") or []:
                out.append(f'<p class="note">Note: {_e(note)}</p>')
            out.append(f"<p>Diagnosis over {det.get('vectors', 0):,} simulated vectors "
                       f"({det.get('failing_vectors', 0):,} fail): advice on where to look, "
                       f"not a verdict.</p>")
            out.append(_cone(record, index))
        if waveform:
            out.append(f'<p>Waveform (VCD; step 0 is this counterexample, later steps are other '
                       f'failing vectors): <a href="{_e(waveform)}">{_e(waveform)}</a></p>')
    delays = getattr(record, "delays", None)
    if isinstance(delays, Mapping):
        out.append(render_delays(delays))
    cmd = command_text(record)
    if cmd and record.exit_code != 2:
        what = ("Reproduce and explain it (from the folder the run started in; exits 1 while "
                "the design is wrong on this vector)" if record.counterexample else
                "Check it again (from the folder the run started in)")
        out.append(f'<p>{_e(what)}:</p>\n<pre class="command"><code>{_e(cmd)}</code></pre>')
    out.append("</section>")
    return "\n".join(x for x in out if x)


# ---- the page -----------------------------------------------------------------------------

def _entries_table(records: list[EntryRecord]) -> str:
    head = ("design", "width (bits)", "verdict", "engines", "time", "cached", "result")
    out = ['<table class="entries"><caption>every entry at every parameter value, in manifest '
           'order</caption>',
           "<thead><tr>" + "".join(f'<th scope="col">{h}</th>' for h in head) + "</tr></thead>",
           "<tbody>"]
    for i, r in enumerate(records):
        name = _e(r.label)
        if _detailed(r):
            name = f'<a href="#{_anchor(i)}">{name}</a>'
        cached = "yes" if r.cached else "no"
        if r.cached:
            cached += f" (checked in {r.checked_seconds:.2f} s)"
        tone = _tone(r)
        out.append(f'<tr class="{tone}"><th scope="row">{name}</th>'
                   f'<td class="num" title="{_e(_ports_text(r))}">{_e(_width(r))}</td>'
                   f"<td>{_e(r.verdict.value)}</td><td>{_e(engines_text(r))}</td>"
                   f'<td class="num">{r.seconds:.2f} s</td><td>{_e(cached)}</td>'
                   f'<td><span class="tag">{_e(_result_text(r))}</span></td></tr>')
    out.append("</tbody></table>")
    return "\n".join(out)


def render_html(summary, waveforms: Mapping[str, str] | None = None,
                title: str | None = None) -> str:
    """The page for ``summary`` (a RunSummary); ``waveforms`` maps a record label to the relative
    URL of its waveform file (see ``waveform_paths``)."""
    waveforms = waveforms or {}
    records: list[EntryRecord] = list(summary.records)
    tone = "good" if summary.ok else ("maybe" if summary.exit_code == 3 else "bad")
    title = title or f"adder-verify run of {summary.manifest}"
    parts = ["<!DOCTYPE html>", f"<!-- {report_mark(KIND)} -->", '<html lang="en">', "<head>",
             '<meta charset="utf-8">',
             '<meta name="viewport" content="width=device-width, initial-scale=1">',
             f"<title>{_e(title)}</title>", f"<style>{_CSS}</style>", "</head>", "<body>",
             f"<header><h1>{_e(title)}</h1>",
             f'<p class="banner {tone}">{_e(headline(summary))}</p>',
             f"<p>adder-verify {_e(summary.tool_version)}; {summary.jobs} job"
             f"{'s' if summary.jobs != 1 else ''}; result cache "
             f"{'used' if summary.cache_used else 'not used'}.</p></header>",
             "<main>", "<h2>Entries</h2>", _entries_table(records)]
    for note in getattr(summary, "warnings", []) or []:
        parts.append(f'<p class="note">Warning: {_e(note)}</p>')
    detailed = [(i, r) for i, r in enumerate(records) if _detailed(r)]
    needs = [(i, r) for i, r in detailed if not r.ok]
    caught = [(i, r) for i, r in detailed if r.ok]
    if needs:
        parts.append("<h2>Entries that do not meet the manifest</h2>")
        parts += [_entry_section(r, i, waveforms.get(r.label)) for i, r in needs]
    if caught:
        parts.append("<h2>Broken on purpose, caught</h2>")
        parts += [_entry_section(r, i, waveforms.get(r.label)) for i, r in caught]
    if not detailed:
        parts.append("<p>No counterexample and nothing to act on.</p>")
    parts += ["</main>", f"<footer><p>{_e(SCOPE_NOTE)}</p></footer>", "</body>", "</html>"]
    return "\n".join(parts) + "\n"

