"""``adder-verify timing``: how soon a design's outputs are right (thin layer over verify.timing).

``register(main)`` adds the command to the main group; ``settle_lines`` is what ``check
--settle-within`` prints under a late result.
"""

from __future__ import annotations

import json

import click

from verify.errors import InputError


def _fail(e: InputError, as_json: bool = False) -> None:
    if as_json:
        click.echo(json.dumps({"ok": False, "error": str(e)}))
    click.echo(f"error: {e}", err=True)
    raise click.exceptions.Exit(2)


def _vector(text: str, design, flag: str) -> dict[str, int]:
    from verify.diagnosis.explain import parse_inputs
    try:
        return parse_inputs(text, design)
    except InputError as e:
        raise InputError(e.message.replace("--input", flag), flag) from None


def _widths(text: str) -> list[int]:
    try:
        ws = [int(x) for x in text.split(",") if x.strip()]
    except ValueError:
        raise InputError(f"'{text}': write widths as 8,16,32", "--widths") from None
    if not ws or any(w < 1 for w in ws):
        raise InputError(f"'{text}': widths are whole numbers >= 1", "--widths")
    return ws


def _timing(paths, delays, spec, as_json, from_text, to_text, vcd_path, widths, archs, plot_path,
            time_limit, force, top, params, include_dirs, defines):
    """Report topological and exact (floating-mode) delay of every output of DESIGN.

    The exact delay is the time after which every output holds its final value for every input
    vector, when before time 0 every net may hold any value (floating mode); the topological
    delay is the longest path, whether or not any input can use it. --from/--to simulate one
    input transition with transport delay (every input change of a gate schedules an output
    event d later; glitches are kept) and --vcd writes it. --widths with --arch (or --param
    NAME=V1,V2 for Verilog) sweeps the width; --plot draws delay against width (PNG).
    Figures cover modeled gate delays only: no wires, slews or loads; not sign-off timing.
    """
    from verify.cli.main import parse_defines, parse_params
    from verify.formats import load
    from verify.timing import report
    from verify.timing.delays import resolve
    from verify.timing.floating import TimeLimit, TooLarge

    try:
        model = resolve(delays)
        point = parse_params(params)
        swept = {k: v for k, v in point.items() if len(v) > 1}
        if time_limit is not None and time_limit <= 0:
            raise InputError("--time-limit must be a positive number of seconds")
        if plot_path:
            from verify.files import can_write
            can_write(plot_path, what="plot", force=force)
        if vcd_path:
            from verify.files import can_write
            can_write(vcd_path, what="waveform", replace_reports=True, kind="vcd")
        if widths or archs:
            if not (widths and archs):
                raise InputError("--widths and --arch go together (e.g. --arch ripple --widths "
                                 "8,16,32)")
            if paths:
                raise InputError("give either DESIGN files or --arch, not both")
            return _sweep_arch(model, archs, _widths(widths), plot_path, as_json, time_limit, force)
        if not paths:
            raise InputError("name a design (or --arch NAME --widths 8,16,...)")
        loader = (lambda values: load(list(paths), top=top, params=values,
                                      include_dirs=list(include_dirs),
                                      defines=parse_defines(defines)))
        if swept:
            if len(swept) > 1:
                raise InputError("sweep one parameter at a time")
            (name, values), = swept.items()
            fixed = {k: v[0] for k, v in point.items() if k != name}
            rows = report.sweep(lambda w: loader({**fixed, name: w}), values, model,
                                time_limit=time_limit)
            return _emit_sweep({name: rows}, model, plot_path, as_json, force, f"{name}")
        design = loader({k: v[0] for k, v in point.items()})
        if vcd_path and not to_text:
            raise InputError("--vcd writes the waveform of one transition: give --to (and "
                             "--from)")
        if from_text or to_text:
            if not to_text:
                raise InputError("--from needs --to (the vector the inputs switch to)")
            return _transition(design, model, from_text, to_text, vcd_path, as_json)
        if plot_path:
            raise InputError("--plot draws a sweep: give --widths with --arch, or --param "
                             "NAME=V1,V2,...")
        rep = report.analyze(design, model, time_limit=time_limit)
        if spec is not None:
            rep["function"] = _function(design, spec)
    except InputError as e:
        _fail(e, as_json)
    except TimeLimit:
        _fail(InputError(f"time limit of {time_limit:g} s reached: the exact delay is "
                         f"undecided"), as_json)
    except TooLarge as e:
        _fail(InputError(str(e)), as_json)
    if as_json:
        click.echo(json.dumps(rep, indent=2))
    else:
        click.echo(report.render_text(rep))
        if "function" in rep:
            f = rep["function"]
            click.echo(f"function against '{f['spec']}': {f['verdict']} ({f['coverage']})")


def _function(design, spec) -> dict:
    """Whether the values the outputs settle to are right: a functional check against ``spec``."""
    from verify.check import check
    r = check(design, spec)
    return {"spec": r.spec, "verdict": r.verdict.value, "coverage": r.coverage}


def _transition(design, model, from_text, to_text, vcd_path, as_json):
    from verify.timing.events import simulate
    from verify.timing.floating import Analysis
    from verify.timing.settle import timescale
    before = _vector(from_text, design, "--from") if from_text else None
    after = _vector(to_text, design, "--to")
    an = Analysis(design, model)
    wave = simulate(design, an.delay, after, before)
    outs = {o: model.to_units(wave.last_change([o])) for o in design.output_bits}
    events = {o: sum(1 for _, n, _ in wave.changes if n == o) for o in design.output_bits}
    finals = {o: wave.final[o] for o in design.output_bits}
    written = None
    if vcd_path:
        from verify.files import write_text
        from verify.render import vcd
        start = "unknown nets (floating mode)" if before is None else from_text
        text = vcd.dumps_timed(wave, timescale=timescale(model),
                               comment=f"transition from {start} to {to_text}, delays "
                                       f"'{model.name}', transport delay")
        written = str(write_text(vcd_path, text, what="waveform", replace_reports=True))
    out = {"design": design.name, "delays": model.name, "unit": model.unit,
           "from": before, "to": after, "semantics": "transport delay",
           "last_change": outs, "output_changes": events, "final": finals,
           "settled_at": max(outs.values(), default=0), "gate_events": len(wave.changes),
           "vcd": written}
    if as_json:
        click.echo(json.dumps(out, indent=2))
        return
    click.echo(f"{design.name}: {from_text or 'unknown nets'} -> {to_text}, delays "
               f"'{model.name}' ({model.unit}), transport delay")
    click.echo(f"  {'output':<12} {'last change':>12} {'changes':>8} {'final':>6}")
    for o in design.output_bits:
        click.echo(f"  {o:<12} {outs[o]:>12g} {events[o]:>8} {finals[o]:>6}")
    click.echo(f"outputs settled at {out['settled_at']:g} {model.unit}; {len(wave.changes)} net "
               f"changes in all (glitches included)")
    if written:
        click.echo(f"waveform: {written}")


def _sweep_arch(model, archs, widths, plot_path, as_json, time_limit, force):
    from verify.library.architectures import generate
    from verify.timing import report
    names = [a.strip() for item in archs for a in item.split(",") if a.strip()]
    series = {}
    for arch in names:
        generate(arch, 2)  # an unknown name raises InputError before any work
        series[arch] = report.sweep(lambda w, a=arch: generate(a, w), widths, model,
                                    time_limit=time_limit)
    return _emit_sweep(series, model, plot_path, as_json, force, "width")


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


def settle_lines(result, design, delays, within, vcd_path) -> list[str]:
    """Lines under a check that failed only on time; writes the timed waveform to --vcd."""
    from verify.timing.settle import settle_waveform
    e = next(e for e in result.engines if e.engine == "settle")
    lines = [f"late: {e.evidence}"]
    if vcd_path and result.counterexample is not None:
        path = settle_waveform(design, delays, result.counterexample.inputs, within, vcd_path)
        lines.append(f"timed waveform: {path}")
        result.extras["vcd"] = str(path)
    return lines


_CMD: click.Command | None = None


def timing_command() -> click.Command:
    """Built on first use: the shared Verilog options come from verify.cli.main (see stats)."""
    global _CMD
    if _CMD is None:
        from verify.cli.main import verilog_options
        cmd = _timing
        for opt in reversed([
            click.option("--delays", default="unit", show_default=True, metavar="MODEL",
                         help="'unit' (every gate 1, buf 0) or a TOML delay table "
                              "(e.g. designs/delays/typical.toml)."),
            click.option("--spec", help="Also check the function against this spec, so the "
                                        "settled values are known to be right."),
            click.option("--json", "as_json", is_flag=True, help="Print one JSON object."),
            click.option("--from", "from_text", metavar="PORT=V,..", help="Simulate a "
                         "transition from this vector (default: every net unknown)."),
            click.option("--to", "to_text", metavar="PORT=V,..", help="The vector the inputs "
                         "switch to at time 0."),
            click.option("--vcd", "vcd_path", metavar="FILE", help="Write the transition's "
                         "waveform (real time stamps, one change per gate event)."),
            click.option("--widths", metavar="W1,W2,..", help="Sweep these widths (with --arch)."),
            click.option("--arch", "archs", multiple=True, metavar="NAME",
                         help="Reference architecture(s) to sweep, e.g. ripple,kogge-stone."),
            click.option("--plot", "plot_path", metavar="FILE.png", help="Draw delay against "
                         "width."),
            click.option("--time-limit", type=float, default=None, metavar="SECONDS",
                         help="Stop the solver after this long; the exact delay is then "
                              "undecided."),
            click.option("--force", is_flag=True, help="Replace an existing --plot file."),
        ]):
            cmd = opt(cmd)
        cmd = verilog_options(cmd)
        cmd = click.argument("paths", nargs=-1, required=False, metavar="DESIGN...")(cmd)
        _CMD = click.command("timing")(cmd)
    return _CMD


def register(main: click.Group) -> None:
    main.add_command(timing_command())
