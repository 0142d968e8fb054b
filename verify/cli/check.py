"""``adder-verify check`` and ``adder-verify export``: thin click commands over verify.batch and
verify.formats."""

from __future__ import annotations

import json
import sys

import click

from verify.engines import DEFAULT_EXHAUSTIVE_BITS, DEFAULT_TIMEOUT
from verify.errors import InputError
from verify.cli.options import (check_report_paths, error_json, parse_defines, parse_params,
                                parse_shard, single_point, verilog_options, with_exit_codes)

from verify.check import ENGINE_NAMES as ENGINES  # noqa: E402 - the one list of engine names


@click.command("check", help=with_exit_codes(
    "Check DESIGN (a JSON netlist, Verilog files, or a folder of designs) against a spec."))
@click.argument("paths", nargs=-1, required=True, metavar="DESIGN...")
@click.option("--spec", help='What the outputs must equal, e.g. "{cout, sum} = a + b + cin". '
              "Default: inferred from port names and widths.")
@click.option("--engine", type=click.Choice(ENGINES), default="auto", show_default=True,
              help="auto: random vectors first, then exhaustive if the inputs fit, else sweep, "
              "bdd, smt in turn.")
@click.option("--cross-check", is_flag=True, help="Two independent complete engines must agree "
              "before a complete verdict.")
@click.option("--seed", type=click.IntRange(min=0), default=1, show_default=True,
              help="Seed of the random engine.")
@click.option("--vectors", type=click.IntRange(min=1), help="Vectors for the random engine "
              "(default 200,000; under auto, the random stage before the complete engine, "
              "default 20,000). An input space that fits is simulated whole (exhaustive).")
@click.option("--timeout", type=float, default=DEFAULT_TIMEOUT, show_default=True,
              help="Seconds an engine may take; past it the outcome is undecided.")
@click.option("--require", type=click.Choice(["tested", "complete"]), default="tested",
              show_default=True, help="complete: only proven or exhaustive count as meeting the spec.")
@click.option("--exhaustive-limit", type=click.IntRange(1, 40), default=DEFAULT_EXHAUSTIVE_BITS,
              show_default=True, metavar="BITS",
              help="Most input bits (all input ports together) the exhaustive engine takes.")
@click.option("--shard", metavar="K/N", help="Exhaustive engine only: cover the K-th of N parts.")
@click.option("--cluster", metavar="ADDRESS", help="Exhaustive engine only: split the input space "
              "into shards run on this Dask cluster (tcp://scheduler:8786, or local:N for N "
              "worker processes here) and merge them.")
@verilog_options()
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object (a list for a sweep).")
@click.option("--recursive", "-r", is_flag=True, help="With a folder: read its subfolders too.")
@click.option("--log-dir", metavar="DIR",
              help="Where runs.jsonl is appended and a failure's waveform is written (default: "
                   "logs/ beside the nearest verify.toml or logs/ folder, here or above; outside a "
                   "project nothing is logged).")
@click.option("--no-log", is_flag=True, help="Do not append to runs.jsonl (nor write a waveform there).")
@click.option("--vcd", "vcd_path", metavar="FILE", help="On a failure, write the waveform here "
              "(default: a file in the log dir).")
@click.option("--dot", "dot_path", metavar="FILE", help="On a failure, write the fan-in cone of the "
              "first wrong output as Graphviz DOT (and SVG when 'dot' is installed).")
@click.option("--no-diagnose", is_flag=True, help="On a failure, skip the suspects and the waveform.")
@click.option("--settle-within", type=float, metavar="D", help="Also prove every output settled "
              "by time D (in the delay model's unit) for every input, floating mode; see "
              "'adder-verify timing'.")
@click.option("--delays", metavar="MODEL", help="Delay model for --settle-within: 'unit' (the "
              "default), a TOML delay table, or a Liberty file (.lib) for a netlist of its cells.")
@click.option("--strength", type=click.IntRange(1, 100_000), metavar="N",
              help="After random vectors pass: inject N single faults into copies of the design "
              "and report what fraction the same vectors catch (an estimate, not a proof).")
@click.option("--quiet", "-q", is_flag=True, help="No progress display.")
def check_cmd(paths, spec, engine, cross_check, seed, vectors, timeout, require, exhaustive_limit, shard, cluster,
              top, params, include_dirs, defines, cells, as_json, recursive, log_dir, no_log,
              vcd_path, dot_path, no_diagnose, settle_within, delays, strength, quiet):
    from contextlib import nullcontext

    from verify.batch import check_files, exit_code, project_log_dir

    if no_log:
        log_dir = None
    elif log_dir is None:
        log_dir = project_log_dir()
        if log_dir is None and not as_json:
            click.echo("note: no run log kept (no verify.toml or logs/ folder here or above); "
                       "--log-dir DIR keeps one", err=True)
    bar = _progress(as_json, quiet)
    try:
        check_report_paths(vcd_path, dot_path)
        if cluster is not None and (engine != "exhaustive" or shard):
            raise InputError("splits the exhaustive engine's input space: give --engine "
                             "exhaustive without --shard (many designs: 'run --cluster')",
                             option="cluster")
        from verify.manifest.executors import open_executor
        with open_executor(cluster) if cluster is not None else nullcontext() as executor:
            runs = check_files(
                paths, spec, params=parse_params(params), top=top, include_dirs=include_dirs,
                defines=parse_defines(defines), cells=cells, diagnose=not no_diagnose,
                vcd_path=vcd_path, dot_path=dot_path, log_dir=log_dir, recursive=recursive,
                progress=bar, engine=engine, seed=seed, vectors=vectors, timeout=timeout,
                require=require, exhaustive_limit=exhaustive_limit, shard=parse_shard(shard),
                settle_within=settle_within, delays=delays, strength=strength,
                cross_check=cross_check, executor=executor)
    except InputError as e:
        if as_json:
            click.echo(json.dumps(error_json(e)))
        raise
    finally:
        if bar is not None:
            bar.close()
    for note in runs.notes:
        click.echo(f"note: {note}", err=True)
    for run in runs:
        for w in run.warnings:
            click.echo(f"warning: {w}", err=True)
    if as_json:
        _print_json(runs)
    else:
        _print_text(runs)
    return exit_code(runs)


#: the exhaustive engine shows a bar from this many vectors; anything else after this long
BAR_FROM_VECTORS = 1 << 24
BAR_AFTER_SECONDS = 1.0


class _ProgressBar:
    """A rich progress bar on stderr for long engine work: shown at once for an exhaustive check
    of 2^24 vectors or more, otherwise once the work has taken a second (random vectors, proof
    queries); never when stderr is not a terminal, with --json or with --quiet."""

    def __init__(self):
        import time
        self._clock = time.monotonic
        self.started: dict[str, float] = {}
        self.bar = None
        self.tasks: dict[str, int] = {}

    def __call__(self, engine: str, done: int, total: int) -> None:
        first = self.started.setdefault(engine, self._clock())
        if engine not in self.tasks:
            big = engine == "exhaustive" and total >= BAR_FROM_VECTORS
            if not big and self._clock() - first < BAR_AFTER_SECONDS:
                return
            if self.bar is None:
                from rich.console import Console
                from rich.progress import (BarColumn, MofNCompleteColumn, Progress, TextColumn,
                                           TimeRemainingColumn)
                self.bar = Progress(TextColumn("{task.description}"), BarColumn(),
                                    MofNCompleteColumn(), TimeRemainingColumn(),
                                    console=Console(stderr=True), transient=True)
                self.bar.start()
            self.tasks[engine] = self.bar.add_task(engine, total=total)
        self.bar.update(self.tasks[engine], completed=done, total=total)
        if done >= total:
            self.bar.remove_task(self.tasks.pop(engine))
            self.started.pop(engine, None)
            if not self.tasks:
                self.close()

    def close(self) -> None:
        if self.bar is not None:
            self.bar.stop()
            self.bar = None
            self.tasks.clear()


def _progress(as_json: bool, quiet: bool = False):
    if as_json or quiet or not sys.stderr.isatty():
        return None
    return _ProgressBar()


def _print_json(runs) -> None:
    from verify.render import text as reports
    items = []
    for run in runs:
        if run.result is None:
            items.append({**error_json(run.error), "files": run.label, "params": run.params})
        else:
            items.append(reports.render_json(run.result, params=run.params or None))
    click.echo(reports.dumps(items if len(runs) > 1 else items[0]))


def _print_text(runs) -> None:
    from verify.render import text as reports
    for n, run in enumerate(runs):
        if n:
            click.echo("\n" + "-" * 78)
        if run.result is None:
            click.echo(f"error: {run.error.for_command_line()}")
            continue
        click.echo(reports.render_text(run.result, params=run.params or None,
                                       diagnosis=run.diagnosis))
    if len(runs) > 1:
        click.echo("\n" + "=" * 78)
        click.echo(reports.summary_table(runs))


@click.command("export")
@click.argument("paths", nargs=-1, required=True, metavar="DESIGN...")
@click.option("--format", "fmt", type=click.Choice(["verilog", "json"]), required=True,
              help="structural Verilog (gate primitives and simple assigns) or the JSON netlist.")
@click.option("-o", "--output", metavar="FILE", help="Write here (default: standard output).")
@click.option("--force", is_flag=True, help="Replace FILE if it exists.")
@verilog_options(sweep=False)
def export_cmd(paths, fmt, output, force, top, params, include_dirs, defines, cells):
    """Write any loaded design as structural Verilog or as a JSON netlist.

    \b
    Exit codes: 0 written; 2 bad input; 4 internal error of this tool.
    """
    from verify.files import write_text
    from verify.formats import json_netlist, load
    from verify.formats.verilog import writer as verilog_writer

    design = load(list(paths), top=top, params=single_point(params, "export"),
                  include_dirs=include_dirs, defines=parse_defines(defines), cells=cells)
    text = verilog_writer.dumps(design) if fmt == "verilog" else json_netlist.dumps(design)
    if output:
        write_text(output, text, what="design", force=force)
        click.echo(f"wrote {output}: {design.summary()}", err=True)
    else:
        click.echo(text, nl=False)
    return 0
