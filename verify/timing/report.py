"""Delay reports of a design: topological and exact figures per output, sweeps over width.

``analyze(design, delays)`` returns a JSON-ready dict; ``render_text`` prints it. Figures are in
the delay model's unit. They cover the modeled gate delays only: no wires, slews or loads, and
no sign-off timing.
"""

from __future__ import annotations

import time
from typing import Callable, Sequence

from verify.model.netlist import Netlist
from verify.timing.delays import DelayModel, resolve
from verify.timing.floating import Analysis, TimeLimit, TooLarge

SCOPE = ("modeled gate delays only (floating mode): no wires, slews or loads; not sign-off "
         "timing")


def _num(x: float):
    return int(x) if float(x).is_integer() else round(float(x), 6)


def analyze(design: Netlist, delays: DelayModel | str | None = None, *,
            time_limit: float | None = None) -> dict:
    """Topological and exact (floating-mode) delay of every output bit, with witnesses.

    Raises ``TimeLimit`` when the solver runs out of ``time_limit`` seconds.
    """
    started = time.perf_counter()
    an = Analysis(design, resolve(delays), interruptible=bool(time_limit))
    units = an.model.to_units
    deadline = time.monotonic() + time_limit if time_limit else None
    per_output, false_paths = {}, []
    worst = None
    try:
        for net in design.output_bits:
            r = an.exact(net, deadline)
            per_output[net] = {
                "topological": _num(units(r.topological)), "exact": _num(units(r.exact)),
                "longest_path": r.longest_path, "sensitized_path": r.sensitized_path,
                "witness": r.witness}
            if r.exact < r.topological:
                false_paths.append({"output": net, "path": r.longest_path,
                                    "length": _num(units(r.topological)),
                                    "exact": _num(units(r.exact))})
            if worst is None or (r.exact, r.topological) > (worst.exact, worst.topological):
                worst = r
    finally:
        an.close()
    top = max(an.arrival[n] for n in design.output_bits)
    return {
        "design": design.name,
        "delays": an.model.name,
        "unit": an.model.unit,
        "topological_delay": _num(units(top)),
        "exact_delay": _num(units(worst.exact)),
        "difference": _num(units(top - worst.exact)),
        "critical_path": worst.sensitized_path,
        "critical_output": worst.net,
        "witness": worst.witness,
        "per_output": per_output,
        "false_paths": false_paths,
        "seconds": round(time.perf_counter() - started, 6),
        "scope": SCOPE,
    }


def render_text(rep: dict) -> str:
    u = rep["unit"]
    lines = [f"{rep['design']}: delays '{rep['delays']}' (figures in {u})",
             f"  {'output':<12} {'topological':>12} {'exact':>8}"]
    for net, r in rep["per_output"].items():
        mark = "  false path" if r["exact"] < r["topological"] else ""
        lines.append(f"  {net:<12} {r['topological']:>12} {r['exact']:>8}{mark}")
    lines.append(f"topological delay: {rep['topological_delay']} {u} (longest path, whether "
                 f"or not any input can use it)")
    lines.append(f"exact delay:       {rep['exact_delay']} {u} (floating mode: every output "
                 f"settles by then for every input, and some input needs that long)")
    w = ", ".join(f"{k}={v}" for k, v in rep["witness"].items())
    lines.append(f"witness: {w} needs {rep['exact_delay']} {u} at {rep['critical_output']}")
    lines.append(f"  sensitized path: {' -> '.join(rep['critical_path'])}")
    if rep["false_paths"]:
        lines.append(f"false paths ({len(rep['false_paths'])} outputs whose longest path no "
                     f"input needs):")
        for fp in rep["false_paths"][:8]:
            path = fp["path"]
            shown = " -> ".join(path if len(path) <= 8 else path[:3] + ["..."] + path[-3:])
            lines.append(f"  {fp['output']}: longest path {fp['length']} {u}, exact "
                         f"{fp['exact']} {u}: {shown}")
        if len(rep["false_paths"]) > 8:
            lines.append(f"  ... and {len(rep['false_paths']) - 8} more (see --json)")
    else:
        lines.append("no false paths: the longest path of every output is needed by some input")
    lines.append(f"scope: {rep['scope']}")
    return "\n".join(lines)


def sweep(make: Callable[[int], Netlist], widths: Sequence[int], delays=None, *,
          time_limit: float | None = None) -> list[dict]:
    """One row per width: {width, topological, exact, seconds} (exact None on a time limit)."""
    rows = []
    for w in widths:
        design = make(w)
        t0 = time.perf_counter()
        try:
            rep = analyze(design, delays, time_limit=time_limit)
            exact, note = rep["exact_delay"], ""
            top = rep["topological_delay"]
        except (TimeLimit, TooLarge) as e:
            an = Analysis(design, resolve(delays))
            top = _num(an.model.to_units(max(an.arrival[n] for n in design.output_bits)))
            exact, note = None, str(e) or "time limit reached: exact delay undecided"
        rows.append({"width": w, "design": design.name, "gates": len(design.gates),
                     "topological": top, "exact": exact, "note": note,
                     "seconds": round(time.perf_counter() - t0, 3)})
    return rows


def render_sweep(label: str, rows: list[dict], unit: str) -> str:
    lines = [f"{label} (figures in {unit})",
             f"  {'width':>6} {'gates':>7} {'topological':>12} {'exact':>8} {'seconds':>8}"]
    for r in rows:
        ex = "undecided" if r["exact"] is None else r["exact"]
        lines.append(f"  {r['width']:>6} {r['gates']:>7} {r['topological']:>12} {ex:>8} "
                     f"{r['seconds']:>8.2f}")
    return "\n".join(lines)


def plot(series: dict[str, list[dict]], unit: str, path, title: str = "delay against width",
         force: bool = False):
    """Draw exact (solid) and topological (dashed) delay against width per series to a PNG.

    An existing file is never replaced unless ``force`` (a PNG carries no report mark).
    """
    import io
    import os
    import tempfile
    from pathlib import Path

    from verify.errors import InputError
    try:
        import matplotlib
    except ImportError:
        raise InputError("--plot needs matplotlib: pip install 'adder-verify[plot]'") from None
    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    from verify.files import can_write

    p = can_write(path, what="plot", force=force)
    fig, ax = plt.subplots(figsize=(7, 4.5))
    for k, (label, rows) in enumerate(series.items()):
        color = f"C{k % 10}"
        xs = [r["width"] for r in rows]
        ax.plot(xs, [r["topological"] for r in rows], "--", color=color, alpha=0.6,
                label=f"{label} topological")
        pts = [(r["width"], r["exact"]) for r in rows if r["exact"] is not None]
        if pts:
            ax.plot(*zip(*pts), "o-", color=color, label=f"{label} exact")
    ax.set_xscale("log", base=2)
    ax.set_xticks(sorted({r["width"] for rows in series.values() for r in rows}))
    ax.get_xaxis().set_major_formatter(matplotlib.ticker.ScalarFormatter())
    ax.set_xlabel("width (bits)")
    ax.set_ylabel(f"delay ({unit})")
    ax.set_title(title)
    ax.grid(True, alpha=0.3)
    ax.legend(fontsize=8)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=110, bbox_inches="tight")
    plt.close(fig)
    try:
        if not p.parent.exists():
            p.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", dir=str(p.parent or Path(".")))
        with os.fdopen(fd, "wb") as fh:
            fh.write(buf.getvalue())
        os.replace(tmp, p)
    except OSError as e:
        raise InputError(f"cannot write the plot: {e.strerror or e}", str(p)) from None
    return p


def transition(design: Netlist, delays=None, after: dict | None = None, before: dict | None = None,
               *, vcd_path=None, from_text: str | None = None, to_text: str | None = None) -> dict:
    """One input transition simulated event by event (transport delay, glitches kept).

    ``before`` None means every net starts unknown (floating mode). With ``vcd_path`` the
    waveform is written there (real time stamps). Returns a JSON-ready dict.
    """
    from verify.timing.delays import resolve
    from verify.timing.events import simulate
    from verify.timing.floating import Analysis
    from verify.timing.settle import timescale

    model = resolve(delays)
    an = Analysis(design, model)
    wave = simulate(design, an.delay, after or {}, before)
    outs = {o: model.to_units(wave.last_change([o])) for o in design.output_bits}
    events = {o: sum(1 for _, n, _ in wave.changes if n == o) for o in design.output_bits}
    written = None
    if vcd_path:
        from verify.files import write_text
        from verify.render import vcd
        start = "unknown nets (floating mode)" if before is None else (from_text or str(before))
        text = vcd.dumps_timed(wave, timescale=timescale(model),
                               comment=f"transition from {start} to {to_text or after}, delays "
                                       f"'{model.name}', transport delay")
        written = str(write_text(vcd_path, text, what="waveform", replace_reports=True))
    return {"design": design.name, "delays": model.name, "unit": model.unit,
            "from": before, "to": after, "semantics": "transport delay",
            "last_change": outs, "output_changes": events,
            "final": {o: wave.final[o] for o in design.output_bits},
            "settled_at": max(outs.values(), default=0), "gate_events": len(wave.changes),
            "vcd": written}


def render_transition(t: dict, from_text: str | None, to_text: str) -> str:
    lines = [f"{t['design']}: {from_text or 'unknown nets'} -> {to_text}, delays "
             f"'{t['delays']}' ({t['unit']}), transport delay",
             f"  {'output':<12} {'last change':>12} {'changes':>8} {'final':>6}"]
    for o, last in t["last_change"].items():
        lines.append(f"  {o:<12} {last:>12g} {t['output_changes'][o]:>8} {t['final'][o]:>6}")
    lines.append(f"outputs settled at {t['settled_at']:g} {t['unit']}; {t['gate_events']} net "
                 f"changes in all (glitches included)")
    if t["vcd"]:
        lines.append(f"waveform: {t['vcd']}")
    return "\n".join(lines)
