"""``adder-verify timing``: how soon a design's outputs are right (thin layer over verify.timing)."""

from __future__ import annotations

import json

import click

from verify.cli.options import parse_defines, parse_params, verilog_options
from verify.errors import InputError

EXIT_CODES = ("Exit codes: 0 the delays were computed; 2 bad input; 3 undecided (the time limit "
              "was reached before the exact delay was known); 4 internal error of this tool.")


def _vector(text: str, design, option: str) -> dict[str, int]:
    from verify.diagnosis.explain import parse_inputs
    try:
        return parse_inputs(text, design)
    except InputError as e:
        raise InputError(e.message.replace("--input", "").strip(": "), option=option) from None


def _widths(text: str) -> list[int]:
    try:
        ws = [int(x) for x in text.split(",") if x.strip()]
    except ValueError:
        raise InputError(f"'{text}': write widths as 8,16,32", option="widths") from None
    if not ws or any(w < 1 for w in ws):
        raise InputError(f"'{text}': widths are whole numbers >= 1", option="widths")
    return ws


@click.command("timing", epilog=EXIT_CODES)
@click.argument("paths", nargs=-1, required=False, metavar="DESIGN...")
@click.option("--delays", default="unit", show_default=True, metavar="MODEL",
              help="'unit' (every gate 1, buf 0), a TOML delay table or a Liberty file (.lib, per-cell delays; with --cells) "
                   "(e.g. designs/delays/typical.toml).")
@click.option("--spec", help="Also check the function against this spec, so the settled values "
                             "are known to be right.")
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object.")
@click.option("--from", "from_text", metavar="PORT=V,..", help="Simulate a transition from this "
              "vector (default: every net unknown).")
@click.option("--to", "to_text", metavar="PORT=V,..", help="The vector the inputs switch to at "
              "time 0.")
@click.option("--vcd", "vcd_path", metavar="FILE", help="Write the transition's waveform (real "
              "time stamps, one change per gate event).")
@click.option("--widths", metavar="W1,W2,..", help="Sweep these widths (with --arch).")
@click.option("--arch", "archs", multiple=True, metavar="NAME",
              help="Reference architecture(s) to sweep, e.g. ripple,kogge-stone.")
@click.option("--plot", "plot_path", metavar="FILE.png", help="Draw delay against width.")
@click.option("--time-limit", type=float, default=None, metavar="SECONDS",
              help="Stop the solver after this long; the exact delay is then undecided.")
@click.option("--force", is_flag=True, help="Replace an existing --plot file.")
@verilog_options()
def timing_cmd(paths, delays, spec, as_json, from_text, to_text, vcd_path, widths, archs,
               plot_path, time_limit, force, top, params, include_dirs, defines, cells):
    """Report topological and exact (floating-mode) delay of every output of DESIGN.

    The exact delay is the time after which every output holds its final value for every input
    vector, when before time 0 every net may hold any value (floating mode); the topological
    delay is the longest path, whether or not any input can use it. --from/--to simulate one
    input transition with transport delay (every input change of a gate schedules an output
    event d later; glitches are kept) and --vcd writes it. --widths with --arch (or --param
    NAME=V1,V2 for Verilog) sweeps the width; --plot draws delay against width (PNG).
    Figures cover modeled gate delays only: no wires, slews or loads; not sign-off timing.
    """
    from verify.files import can_write
    from verify.formats import load
    from verify.timing import report
    from verify.timing.delays import resolve
    from verify.timing.floating import TimeLimit, TooLarge

    model = resolve(delays)
    point = parse_params(params)
    swept = {k: v for k, v in point.items() if len(v) > 1}
    if time_limit is not None and time_limit <= 0:
        raise InputError("must be a positive number of seconds", option="time_limit")
    if plot_path:
        can_write(plot_path, what="plot", force=force)
    if vcd_path:
        can_write(vcd_path, what="waveform", replace_reports=True, kind="vcd")
    try:
        if widths or archs:
            if not (widths and archs):
                raise InputError("--widths and --arch go together (e.g. --arch ripple --widths "
                                 "8,16,32)")
            if paths:
                raise InputError("give either DESIGN files or --arch, not both")
            _sweep_arch(model, archs, _widths(widths), plot_path, as_json, time_limit, force)
            return 0
        if not paths:
            raise InputError("name a design (or --arch NAME --widths 8,16,...)")

        def loader(values):
            return load(list(paths), top=top, params=values, include_dirs=list(include_dirs),
                        defines=parse_defines(defines), cells=cells)
        if swept:
            if len(swept) > 1:
                raise InputError("sweep one parameter at a time", option="params")
            (name, values), = swept.items()
            fixed = {k: v[0] for k, v in point.items() if k != name}
            rows = report.sweep(lambda w: loader({**fixed, name: w}), values, model,
                                time_limit=time_limit)
            _emit_sweep({name: rows}, model, plot_path, as_json, force, f"{name}")
            return 0
        design = loader({k: v[0] for k, v in point.items()})
        if vcd_path and not to_text:
            raise InputError("writes the waveform of one transition: give --to (and --from)",
                             option="vcd")
        if from_text or to_text:
            if not to_text:
                raise InputError("needs --to (the vector the inputs switch to)", option="from")
            before = _vector(from_text, design, "from") if from_text else None
            t = report.transition(design, model, _vector(to_text, design, "to"), before,
                                  vcd_path=vcd_path, from_text=from_text, to_text=to_text)
            click.echo(json.dumps(t, indent=2) if as_json
                       else report.render_transition(t, from_text, to_text))
            return 0
        if plot_path:
            raise InputError("draws a sweep: give --widths with --arch, or --param NAME=V1,V2,...",
                             option="plot")
        rep = report.analyze(design, model, time_limit=time_limit)
    except TimeLimit:
        message = (f"the exact delay is undecided: the {time_limit:g} s time limit was reached "
                   f"(the topological delay is an upper bound)")
        if as_json:
            click.echo(json.dumps({"ok": False, "verdict": "undecided", "reason": message}))
        click.echo(f"undecided: {message}", err=True)
        return 3
    except TooLarge as e:
        raise InputError(str(e)) from None
    if spec is not None:
        from verify.check import check
        r = check(design, spec)
        rep["function"] = {"spec": r.spec, "verdict": r.verdict.value, "coverage": r.coverage}
    if as_json:
        click.echo(json.dumps(rep, indent=2))
    else:
        click.echo(report.render_text(rep))
        if "function" in rep:
            f = rep["function"]
            click.echo(f"function against '{f['spec']}': {f['verdict']} ({f['coverage']})")
    return 0


def _sweep_arch(model, archs, widths, plot_path, as_json, time_limit, force):
    from verify.library.architectures import generate
    from verify.timing import report
    names = [a.strip() for item in archs for a in item.split(",") if a.strip()]
    series = {}
    for arch in names:
        generate(arch, 2)  # an unknown name raises InputError before any work
        series[arch] = report.sweep(lambda w, a=arch: generate(a, w), widths, model,
                                    time_limit=time_limit)
    _emit_sweep(series, model, plot_path, as_json, force, "width")


def _emit_sweep(series, model, plot_path, as_json, force, what):
    from verify.timing import report
    written = None
    if plot_path:
        written = str(report.plot(series, model.unit, plot_path,
                                  title=f"delay against {what} (delays '{model.name}')",
                                  force=force))
    if as_json:
        click.echo(json.dumps({"delays": model.name, "unit": model.unit, "sweeps": series,
                               "plot": written}, indent=2))
        return
    for label, rows in series.items():
        click.echo(report.render_sweep(label, rows, model.unit))
    if written:
        click.echo(f"plot: {written}")
