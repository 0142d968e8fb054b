"""Reports of check results: plain text for people, JSON for programs."""

from __future__ import annotations

import json

from verify.model.result import SCOPE_NOTE, CheckResult, Verdict

_VERDICT_WORD = {
    Verdict.PROVEN: "PROVEN",
    Verdict.EXHAUSTIVE: "EXHAUSTIVE",
    Verdict.TESTED: "TESTED",
    Verdict.FAIL: "FAIL",
    Verdict.UNDECIDED: "UNDECIDED",
    Verdict.ERROR: "ERROR",
}


def _ports(ports: dict[str, int]) -> str:
    return ", ".join(n if w == 1 else f"{n}[{w - 1}:0]" for n, w in ports.items())


def _num(v: int, width: int, field: int = 0) -> str:
    """Decimal, right-aligned to ``field`` characters, then hex at the port's width."""
    digits = max(1, (width + 3) // 4)
    return f"{v:>{max(field, len(str(2 ** width - 1)))}}  0x{v:0{digits}x}"


def render_text(result: CheckResult, *, params: dict | None = None,
                diagnosis: list[str] | None = None) -> str:
    """The report of one check; ``diagnosis`` lines (suspects, bit table) follow a failure."""
    lines = []
    where = f"  ({result.origin})" if result.origin else ""
    lines.append(f"design  {result.design}{where}")
    if params:
        lines.append(f"params  {', '.join(f'{k}={v}' for k, v in params.items())}")
    lines.append(f"ports   in {_ports(result.ports['inputs'])};  out {_ports(result.ports['outputs'])};"
                 f"  {result.gate_count} gates")
    how = "  (inferred from port names and widths; give --spec to state it)" if result.spec_inferred else ""
    lines.append(f"spec    {result.spec}{how}")
    lines.append("")
    for e in result.engines:
        lines.append(f"  {e.engine:<10}  {e.status:<12}  {e.seconds:8.3f} s  {e.evidence}")
    lines.append("")
    lines.append(f"{_VERDICT_WORD[result.verdict]}: {result.coverage}")
    if result.verdict is Verdict.TESTED and result.exit_code != 0:
        lines.append("  --require complete asked for proven or exhaustive: a sample is not enough")
    cex = result.counterexample
    if cex is not None:
        lines.extend(render_counterexample(result))
    if diagnosis:
        lines.append("")
        lines.extend(diagnosis)
    if result.strength is not None:
        from verify.engines.strength import describe
        lines.append("")
        lines.extend(describe(result.strength))
    lines.append("")
    lines.append(f"note: {SCOPE_NOTE}")
    return "\n".join(lines)


def render_counterexample(result: CheckResult) -> list[str]:
    cex = result.counterexample
    ins, outs = result.ports["inputs"], result.ports["outputs"]
    name_w = max(len(n) for n in (*ins, *outs))
    field = max(len(str(2 ** w - 1)) for w in (*ins.values(), *outs.values()))
    lines = ["", "counterexample:"]
    for n, w in ins.items():
        lines.append(f"  in   {n:<{name_w}}  {_num(cex.inputs[n], w, field)}")
    wrong = cex.wrong_bits()
    for n, w in outs.items():
        exp, act = cex.expected[n], cex.actual[n]
        mark = "  wrong bits: " + ", ".join(str(b) for b in wrong[n]) if n in wrong else "  ok"
        lines.append(f"  out  {n:<{name_w}}  {_num(exp, w, field)} expected, "
                     f"{_num(act, w, field)} actual{mark}")
    return lines


def render_json(result: CheckResult, *, params: dict | None = None) -> dict:
    data = result.to_json()
    if params is not None:
        data["params"] = params
    return data


def dumps(data) -> str:
    return json.dumps(data, indent=2, sort_keys=False)


def summary_table(runs) -> str:
    """The closing table of a check over several designs or parameter points
    (``runs``: verify.batch.FileCheck records)."""
    lines = ["summary:"]
    counts: dict[str, int] = {}
    for run in runs:
        r = run.result
        if r is None:
            lines.append(f"  {'ERROR':<13} {run.name}: {run.error.message}")
            counts["error"] = counts.get("error", 0) + 1
            continue
        engines = "+".join(e.engine for e in r.engines if e.status != "skipped")
        lines.append(f"  {r.verdict.value.upper():<13} {run.name}  ({engines}, {r.seconds:.2f} s)")
        counts[r.verdict.value] = counts.get(r.verdict.value, 0) + 1
    lines.append("  " + ", ".join(f"{n} {v}" for v, n in counts.items()))
    return "\n".join(lines)
