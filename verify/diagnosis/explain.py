"""Making a failure easy to act on: suspects, the bit-by-bit picture, waveforms and cone drawings.

For the lead's ``adder-verify check`` (after shrinking)::

    findings = diagnose.diagnose(design, spec, result.counterexample,
                                 vcd_path=opt_vcd, dot_path=opt_dot, log_dir=log_dir)
    result.diagnosis = Diagnosis(suspects=findings["suspects"], vcd=findings["vcd"], ...)
    lines = diagnose.render_text(design, spec, result.counterexample, findings)

``explain(design, spec, inputs)`` does the same for one input vector of the user's choosing (it
may pass). How suspects are found and ranked: ``verify.diagnosis.suspects``; the reference functions
of addition: ``verify.diagnosis.reference``. A diagnosis is advice, never a verdict: the verdict is the
engines' (the counterexample was re-simulated and re-evaluated before it got here).
"""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path
from typing import Any, Mapping

from verify.diagnosis.suspects import DEFAULT_VECTORS, Analysis, analyse
from verify.diagnosis.reference import AdderModel
from verify.diagnosis.repair import wording
from verify.errors import InputError
from verify.files import write_text
from verify.model.netlist import CONSTANTS, Netlist
from verify.model.result import Counterexample, Diagnosis
from verify.sim import values_at

_FILE_LINE = re.compile(r"^(?P<where>\S+:\d+) (?P<inst>\S.*)$")

NO_MODEL_NOTE = ("no reference-function model applies to this spec (it is not A + B + carry "
                 "with outputs that are slices of the sum): suspects are ranked by single-net "
                 "repair alone")
#: failing vectors written to the waveform besides the counterexample
MORE_FAILING = 7


# ---- the entry points --------------------------------------------------------------------------

def diagnose(design: Netlist, spec, counterexample: Counterexample, *,
             vcd_path: str | Path | None = None, dot_path: str | Path | None = None,
             log_dir: str | Path | None = None, vectors: int = DEFAULT_VECTORS, seed: int = 1,
             top: int = 5) -> dict[str, Any]:
    """Suspects, the path of the first wrong value, and (when asked) a VCD file and a DOT cone.

    ``vcd_path`` None with ``log_dir`` given writes ``<log_dir>/<design>-<hash>.vcd``. Returns a
    JSON-ready dict: ``suspects`` (ranked list of {net, op, score, source, ...}), ``vcd``,
    ``dot``, ``svg`` (paths or None), ``trace`` (the first wrong value's path), ``bits``,
    ``model``, ``notes``.
    """
    an, findings = analyse_failure(design, spec, counterexample, vectors=vectors, seed=seed,
                                   top=top)
    if vcd_path is None and log_dir is not None:
        vcd_path = default_vcd_path(design, log_dir)
    if vcd_path is not None:
        findings["vcd"] = str(write_waveform(an, spec, vcd_path))
    if dot_path is not None:
        dot, svg, note = write_cone(an, findings, dot_path)
        findings["dot"], findings["svg"] = str(dot), (str(svg) if svg else None)
        if note:
            findings["notes"].append(note)
    return findings


def analyse_failure(design: Netlist, spec, counterexample: Counterexample, *,
                    vectors: int = DEFAULT_VECTORS, seed: int = 1, top: int = 5
                    ) -> tuple[Analysis, dict[str, Any]]:
    """The analysis behind ``diagnose`` and its JSON-ready findings, with no file written (for
    callers that draw the waveform and the cone themselves: ``waveform_text``, ``cone_text``)."""
    an = analyse(design, spec, [counterexample.inputs], count=vectors, seed=seed, top=top,
                 establish=True)
    return an, _findings(an, counterexample)


def attach(result, design: Netlist, spec=None, *, vcd_path: str | Path | None = None,
           dot_path: str | Path | None = None, log_dir: str | Path | None = None) -> list[str]:
    """For ``adder-verify check``: diagnose ``result.counterexample`` (when there is one), put
    a typed ``Diagnosis`` (suspects, files, findings) into ``result.diagnosis`` (so they
    reach ``--json``) and return the lines for the text report (empty when nothing failed).

    ``spec`` is what ``check`` was given (text, a Spec, or None for the inferred one).
    """
    cex = getattr(result, "counterexample", None)
    if cex is None:
        return []
    from verify.check import resolve_spec

    the_spec = resolve_spec(design, spec)
    findings = diagnose(design, the_spec, cex, vcd_path=vcd_path, dot_path=dot_path,
                        log_dir=log_dir)
    result.diagnosis = Diagnosis(
        suspects=findings["suspects"], vcd=findings["vcd"], dot=findings["dot"],
        svg=findings["svg"] if findings["dot"] else None,
        details={k: v for k, v in findings.items() if k not in ("suspects", "vcd", "dot", "svg")})
    return render_text(design, the_spec, cex, findings)


def explain(design: Netlist, spec, inputs: Mapping[str, int], *,
            vcd_path: str | Path | None = None, dot_path: str | Path | None = None,
            vectors: int = DEFAULT_VECTORS, seed: int = 1, top: int = 5) -> dict[str, Any]:
    """``diagnose`` for one chosen input vector, which may give right outputs."""
    from verify.sim import Simulator

    ins = {p.name: int(inputs.get(p.name, 0)) for p in design.inputs}
    expected = spec.evaluate(ins)
    actual = Simulator(design).evaluate(ins)
    cex = Counterexample(ins, {p.name: expected[p.name] for p in design.outputs},
                         {p.name: actual[p.name] for p in design.outputs})
    return diagnose(design, spec, cex, vcd_path=vcd_path, dot_path=dot_path, vectors=vectors,
                    seed=seed, top=top)


def default_vcd_path(design: Netlist, log_dir: str | Path) -> Path:
    safe = "".join(ch if ch.isalnum() or ch in "-_" else "_" for ch in design.name) or "design"
    return Path(log_dir) / f"{safe}-{design.content_hash()[:10]}.vcd"


def parse_inputs(text: str, design: Netlist) -> dict[str, int]:
    """``a=5,b=0x1f,cin=1`` -> {port: int}; ports left out are 0. Mistakes raise InputError."""
    ports = {p.name: p.width for p in design.inputs}
    out: dict[str, int] = {}
    if not text or not text.strip():
        raise InputError("--input is empty: write PORT=VALUE,PORT=VALUE,...", "--input")
    for item in text.split(","):
        if not item.strip():
            continue
        name, eq, value = item.partition("=")
        name, value = name.strip(), value.strip()
        if not eq or not name or not value:
            raise InputError(f"'{item.strip()}': write PORT=VALUE, e.g. a=5,b=0x1f,cin=1", "--input")
        if name not in ports:
            known = ", ".join(ports)
            raise InputError(f"'{name}' is not an input port of {design.name} (inputs: {known})",
                             "--input")
        if name in out:
            raise InputError(f"'{name}' is given twice", "--input")
        try:
            v = int(value, 0)
        except ValueError:
            raise InputError(f"{name}={value}: not a whole number (write 5, 0x1f, 0b101 or 0o17)",
                             "--input") from None
        w = ports[name]
        if v < 0 or v >> w:
            raise InputError(f"{name}={value}: does not fit the {w}-bit port {name} "
                             f"(0..{(1 << w) - 1})", "--input")
        out[name] = v
    if not out:
        raise InputError("--input names no port: write PORT=VALUE,...", "--input")
    return out


# ---- findings ----------------------------------------------------------------------------------

def _findings(an: Analysis, cex: Counterexample) -> dict[str, Any]:
    notes: list[str] = []
    if an.model is None:
        notes.append(NO_MODEL_NOTE)
    fails_here = bool(an.failing & 1)
    if not an.failing:
        notes.append(f"all {an.count} vectors simulated give the outputs the spec expects: "
                     f"nothing to diagnose (this is a sample, not a proof)")
    elif not fails_here:
        j = (an.failing & -an.failing).bit_length() - 1
        other = ", ".join(f"{k}={v}" for k, v in an.vectors[j].items())
        notes.append(f"this vector gives the right outputs, but {an.failing_count()} of "
                     f"{an.count} other vectors simulated fail (for example {other})")
    if fails_here and an.chosen and (len(an.chosen) > 1 or an.remaining):
        fixes = an.chosen
        if not an.remaining:
            notes.append(f"no single net explains every failing vector; changing "
                         f"{' and '.join(fixes)} together makes all {an.count} vectors right "
                         f"(a sample, not a proof)")
        else:
            notes.append(f"no single net explains every failing vector (more than one fault?); "
                         f"with {', '.join(fixes)} changed, {bin(an.remaining).count('1')} "
                         f"vectors still fail")
    lines_used: dict[str, list[str]] = {}  # one source line used by several instances
    for s in an.suspects[:3]:
        m = _FILE_LINE.match(s.source or "")
        if m:  # Verilog sources read "file.sv:LINE instance.path"
            lines_used.setdefault(m["where"], []).append(m["inst"])
    for where, insts in lines_used.items():
        if len(set(insts)) > 1:
            notes.append(f"suspects in instances {', '.join(dict.fromkeys(insts))} come from the "
                         f"same source line {where}: one fix there may repair them all")
    first = _first_wrong_bit(an)
    trace = _trace(an, first) if fails_here and an.suspects else []
    return {
        "model": an.model.describe() if an.model else None,
        "vectors": an.count,
        "failing_vectors": an.failing_count(),
        "suspects": [s.to_json() for s in an.suspects],
        "permutation": an.permutation,
        #: the permutation finding as the one line a report prints (None when there is none)
        "permutation_text": wording(an.permutation) if an.permutation else None,
        "first_wrong": first,
        "trace": trace,
        "bits": _bits(an, cex),
        "vcd": None,
        "dot": None,
        "svg": None,
        "notes": notes,
        "outputs": _model_outputs(an),
    }


def _first_wrong_bit(an: Analysis) -> str | None:
    """The output bit that goes wrong first on vector 0: lowest bit of the sum under a model."""
    wrong = [b for b in an.design.output_bits if (an.values[b] ^ an.expected[b]) & 1]
    if not wrong:
        return None
    if an.model is not None:
        pos = _sum_positions(an.design, an.model)
        wrong.sort(key=lambda b: pos.get(b, 10 ** 6))
    return wrong[0]


def _sum_positions(design: Netlist, model: AdderModel) -> dict[str, int]:
    """output bit -> which bit of S = A + B + c it holds (overflow flag: n)."""
    out = {}
    for p in design.outputs:
        kind, lo = model.outputs.get(p.name, ("", 0))
        for i, b in enumerate(p.bits):
            out[b] = lo + i if kind.startswith("slice") else model.width
    return out


def _trace(an: Analysis, target: str | None) -> list[dict[str, Any]]:
    """From the top suspect to ``target`` through nets whose value is wrong on vector 0."""
    if target is None or not an.repaired:
        return []
    d = an.design
    start = an.suspects[0].net

    def wrong(n: str) -> bool:
        return n not in CONSTANTS and ((an.values[n] ^ an.repaired[n]) & 1) == 1

    if not wrong(start):
        return []
    users: dict[str, list[str]] = {}
    for g in d.gates:
        for i in g.inputs:
            users.setdefault(i, []).append(g.output)
    parent = {start: None}
    queue = [start]
    while queue and target not in parent:
        nxt = []
        for n in queue:
            for u in users.get(n, ()):
                if u not in parent and wrong(u):
                    parent[u] = n
                    nxt.append(u)
        queue = nxt
    if target not in parent:
        return []
    path = []
    n: str | None = target
    while n is not None:
        path.append(n)
        n = parent[n]
    path.reverse()
    if an.table is not None:  # start at the first net that matches no reference function
        while path and an.table.matches(an.values[path[0]]):
            path.pop(0)
    out = []
    for n in path:
        g = d.driver[n]
        out.append({"net": n, "op": g.op, "inputs": list(g.inputs), "source": g.source,
                    "expected": an.repaired[n] & 1, "actual": an.values[n] & 1})
    return out


def _bits(an: Analysis, cex: Counterexample) -> dict[str, Any] | None:
    """Per bit of the sum, for vector 0: operands, expected and actual carry in and sum."""
    m = an.model
    if m is None:
        return None
    n = m.width
    A, B, c = m.operands(cex.inputs)
    carries = m.carries(cex.inputs)
    pos = _sum_positions(an.design, m)
    by_pos: dict[int, str] = {}
    inverted: set[str] = set()
    for b, k in pos.items():
        kind, _ = m.outputs[_port_of(an.design, b)]
        if kind.startswith("slice"):
            by_pos.setdefault(k, b)
        if kind == "slice_inv":
            inverted.add(b)
    carry_nets = _carry_nets(an)
    rows = []
    for i in range(n + 1):
        row: dict[str, Any] = {"bit": i}
        if i < n:
            row["a"] = A >> i & 1
            row["b"] = B >> i & 1
        row["carry_expected"] = carries[i]
        net = carry_nets[i]
        if net is not None:
            name, inv = net
            row["carry_net"] = ("~" if inv else "") + name
            row["carry_actual"] = an.bit(name) ^ int(inv)
        out_bit = by_pos.get(i)
        if out_bit is not None:
            row["output"] = out_bit
            inv = int(out_bit in inverted)  # the row shows bits of the sum, not the port
            row["sum_expected"] = (an.expected[out_bit] & 1) ^ inv
            row["sum_actual"] = (an.values[out_bit] & 1) ^ inv
        rows.append(row)
    return {"width": n, "operands": list(m.operand_names()), "rows": rows}


def _port_of(design: Netlist, bit: str) -> str:
    for p in design.outputs:
        if bit in p.bits:
            return p.name
    raise KeyError(bit)  # pragma: no cover


def _carry_nets(an: Analysis) -> list[tuple[str, bool] | None]:
    """For each carry c_0..c_n, the design net equal to it on every vector simulated, if any:
    first in the design as it is, else in the design with the top suspect changed (a net that
    goes wrong is found there)."""
    M = an.mask
    order = [*an.design.input_bits, *(g.output for g in an.design.ordered_gates)]
    as_is: dict[int, str] = {}
    for n in order:
        as_is.setdefault(an.values[n], n)
    changed: dict[int, str] = {}
    if an.repaired:
        for n in order:
            changed.setdefault(an.repaired[n], n)
    out: list[tuple[str, bool] | None] = []
    for w in an.model_words.get("c", []):
        for table in (as_is, changed):
            if w in table:
                out.append((table[w], False))
                break
            if (w ^ M) in table:
                out.append((table[w ^ M], True))
                break
        else:
            out.append(None)
    return out


# ---- the text report ---------------------------------------------------------------------------

def render_text(design: Netlist, spec, counterexample: Counterexample,
                findings: Mapping[str, Any]) -> list[str]:
    """Lines for the text report: aligned bits, suspects, the path, the files written."""
    lines: list[str] = [""]
    head = f"diagnosis over {findings['vectors']:,} vectors ({findings['failing_vectors']:,} fail)"
    if findings.get("model"):
        head += "; model: " + "; ".join(f"{k} = {v}" for k, v in findings["outputs"].items())
    lines.append(head)
    if findings.get("permutation_text"):
        lines.append(findings["permutation_text"])
    if findings.get("bits"):
        lines.extend(_bit_table(design, counterexample, findings))
    else:
        lines.extend(_port_table(design, counterexample))
    suspects = findings.get("suspects") or []
    if suspects:
        lines.append("suspects (most likely first):")
        for k, s in enumerate(suspects[:3], 1):
            where = f"  at {s['source']}" if s.get("source") else ""
            lines.append(f"  {k}. {s['net']} = {s['op']}({', '.join(s['inputs'])})  "
                         f"score {s['score']:.2f}{where}")
            lines.append(f"     {s['why']}")
    trace = findings.get("trace") or []
    if trace:
        steps = " -> ".join(f"{t['net']} ({t['op']}, {t['actual']} not {t['expected']})"
                            for t in trace)
        lines.append(f"first wrong value travels: {steps}")
    for key, label in (("vcd", "waveform"), ("dot", "cone picture"), ("svg", "cone picture")):
        if findings.get(key):
            lines.append(f"{label}: {findings[key]}")
    for note in findings.get("notes", []):
        lines.append(f"note: {note}")
    return lines


def _model_outputs(an: Analysis) -> dict[str, str] | None:
    """output port -> what the model says it is, e.g. 'bits 7..0 of a + b + cin'."""
    if an.model is None:
        return None
    text = an.model.describe()
    out = {}
    for p in an.design.outputs:
        kind, lo = an.model.outputs[p.name]
        if kind == "overflow":
            out[p.name] = f"signed overflow of {text}"
        else:
            what = f"bit {lo}" if p.width == 1 else f"bits {lo + p.width - 1}..{lo}"
            out[p.name] = f"{what} of {text}" if kind == "slice" else f"NOT {what} of {text}"
    return out


def _grid(width: int) -> tuple[int, list[str]]:
    """Column width and header lines for a row of ``width`` bits, MSB on the left."""
    if width <= 16:
        return 3, ["".join(f"{i:>3}" for i in range(width - 1, -1, -1))]
    tens = "".join(str(i // 10) if i >= 10 else " " for i in range(width - 1, -1, -1))
    units = "".join(str(i % 10) for i in range(width - 1, -1, -1))
    return 1, [tens, units]


def _row(values: list[int | None], cw: int) -> str:
    """Bits LSB first (None for blank) as a row, MSB on the left."""
    return "".join(("." if v is None else str(v)).rjust(cw) for v in reversed(values))


def _bit_table(design: Netlist, cex: Counterexample, findings: Mapping[str, Any]) -> list[str]:
    bits = findings["bits"]
    n = bits["width"]
    rows = bits["rows"]
    cw, header = _grid(n + 1)
    an_, bn_ = bits["operands"]
    label_w = max(14, len(an_) + 2, len(bn_) + 2)
    lines = []
    pad = " " * label_w
    for h in header:
        lines.append(f"  {'bit':<{label_w}}{h}" if h is header[-1] else f"  {pad}{h}")
    lines.append(f"  {an_:<{label_w}}{_row([r.get('a') for r in rows], cw)}")
    lines.append(f"  {bn_:<{label_w}}{_row([r.get('b') for r in rows], cw)}")
    lines.append(f"  {'carry in  exp':<{label_w}}{_row([r['carry_expected'] for r in rows], cw)}")
    lines.append(f"  {'          act':<{label_w}}{_row([r.get('carry_actual') for r in rows], cw)}")
    lines.append(f"  {'sum       exp':<{label_w}}{_row([r.get('sum_expected') for r in rows], cw)}")
    lines.append(f"  {'          act':<{label_w}}{_row([r.get('sum_actual') for r in rows], cw)}")
    wrong = [r["bit"] for r in rows if r.get("sum_actual") is not None
             and r["sum_actual"] != r["sum_expected"]]
    marks = [1 if r["bit"] in wrong else None for r in rows]
    if wrong:
        mark_row = "".join(("^" if m else " ").rjust(cw) for m in reversed(marks))
        lines.append(f"  {'':<{label_w}}{mark_row}")
        first = min(wrong)
        out_bit = rows[first]["output"]
        lines.append(f"  first wrong bit: {first} of the sum ({out_bit}); "
                     f"carry into it: expected {rows[first]['carry_expected']}"
                     + (f", the design's {rows[first]['carry_net']} is "
                        f"{rows[first]['carry_actual']}" if "carry_net" in rows[first] else
                        ", no net of the design equals it on every vector simulated"))
    else:
        lines.append("  every bit of the sum is right on this vector")
    legend = f"  (columns are bits of {an_} + {bn_}; column {n} is the carry out"
    if any("carry_net" not in r for r in rows):
        legend += "; '.' where no net of the design equals that carry on every vector simulated"
    lines.append(legend + ")")
    for p in design.outputs:  # outputs that are not slices of the sum (overflow flags)
        if (findings.get("outputs") or {}).get(p.name, "").startswith("signed overflow"):
            e, a = cex.expected[p.name], cex.actual[p.name]
            lines.append(f"  {p.name}: expected {e}, actual {a}{'' if e == a else '   <- wrong'}")
    return lines


def _port_table(design: Netlist, cex: Counterexample) -> list[str]:
    width = max(p.width for p in (*design.inputs, *design.outputs))
    cw, header = _grid(width)
    name_w = max(10, *(len(p.name) + 5 for p in (*design.inputs, *design.outputs)))
    lines = []
    for h in header:
        lines.append(f"  {'bit' if h is header[-1] else '':<{name_w}}{h}")

    def bits_of(v: int, w: int) -> list[int | None]:
        return [v >> i & 1 if i < w else None for i in range(width)]

    for p in design.inputs:
        lines.append(f"  {p.name:<{name_w}}{_row(bits_of(cex.inputs[p.name], p.width), cw)}")
    for p in design.outputs:
        e, a = cex.expected[p.name], cex.actual[p.name]
        lines.append(f"  {p.name + ' exp':<{name_w}}{_row(bits_of(e, p.width), cw)}")
        lines.append(f"  {'act':>{name_w - 1}} {_row(bits_of(a, p.width), cw)}")
        if e != a:
            marks = "".join(("^" if (e ^ a) >> i & 1 else " ").rjust(cw)
                            for i in range(width - 1, -1, -1))
            lines.append(f"  {'':<{name_w}}{marks}")
    return lines


# ---- files -------------------------------------------------------------------------------------

def write_waveform(an: Analysis, spec, path: str | Path) -> Path:
    """The counterexample (step 0) and up to MORE_FAILING other failing vectors as a VCD file."""
    return write_text(path, waveform_text(an), what="waveform", replace_reports=True)


def waveform_text(an: Analysis) -> str:
    """The VCD text ``write_waveform`` writes."""
    from verify.render import vcd

    picks = [0]
    rest = an.failing & ~1
    while rest and len(picks) < 1 + MORE_FAILING:
        j = (rest & -rest).bit_length() - 1
        picks.append(j)
        rest &= rest - 1
    vectors = [an.vectors[j] for j in picks]
    expected_words = [an.expected[b] for b in an.design.output_bits]
    expected = [values_at(an.design.outputs, expected_words, j) for j in picks]
    comment = (f"adder-verify diagnosis of {an.design.name}: step 0 is the vector diagnosed, "
               f"steps 1.. are other failing vectors")
    return vcd.dumps(an.design, vectors, expected=expected, comment=comment)


def write_cone(an: Analysis, findings: Mapping[str, Any], path: str | Path
               ) -> tuple[Path, Path | None, str | None]:
    """The fan-in cone of the first failing output as DOT; SVG beside it when ``dot`` exists.

    Returns (dot path, svg path or None, a note when no SVG was made).
    """
    path = write_text(path, cone_text(an, findings), what="cone picture", replace_reports=True)
    exe = shutil.which("dot")
    if exe is None:
        return path, None, "Graphviz 'dot' is not installed: wrote the DOT file only"
    svg = path.with_suffix(".svg")
    try:
        done = subprocess.run([exe, "-Tsvg", str(path)], check=True, timeout=60,
                              capture_output=True, text=True)
    except (subprocess.SubprocessError, OSError) as e:
        return path, None, f"Graphviz 'dot' could not render the SVG: {e}"
    # the mark goes near the top (after the XML declaration, which must come first), so that
    # a later run may replace this picture but nothing else
    head, nl, rest = done.stdout.partition("\n")
    if not head.startswith("<?xml"):
        head, nl, rest = "", "", done.stdout
    write_text(svg, f"{head}{nl}<!-- adder-verify report (svg): rendered from {path.name} -->\n{rest}",
               what="cone picture", replace_reports=True)
    return path, svg, None


def cone_text(an: Analysis, findings: Mapping[str, Any]) -> str:
    """The DOT text of the fan-in cone of the first failing output (what ``write_cone`` writes)."""
    from verify.render.dot import cone_dot

    target = findings.get("first_wrong") or (an.wrong_bits[0] if an.wrong_bits else None)
    if target is None:
        target = an.design.output_bits[0]
    suspects = [s.net for s in an.suspects[:3]]
    diverging = set()
    if an.repaired:
        diverging = {n for n in an.repaired if (an.values[n] ^ an.repaired[n]) & 1}
    return cone_dot(an.design, target, suspects, diverging,
                    values={n: an.values[n] & 1 for n in an.values})


__all__ = ["diagnose", "analyse_failure", "waveform_text", "cone_text", "attach", "explain",
           "render_text", "parse_inputs", "default_vcd_path", "write_waveform", "write_cone",
           "NO_MODEL_NOTE"]
