"""The command line: a thin click layer over the Python API (verify.check, verify.load, ...).

Exit codes: 0 meets the spec, 1 counterexample found, 2 bad input or usage, 3 undecided (or only
tested while --require complete asked for proven or exhaustive).
"""

from __future__ import annotations

import itertools
import json
import sys
from pathlib import Path

import click

from verify import __version__
from verify.engines import DEFAULT_EXHAUSTIVE_BITS, DEFAULT_TIMEOUT
from verify.errors import InputError
from verify.formats import VERILOG_SUFFIXES
from verify.model.result import Verdict, worst_exit_code

from verify.check import ENGINE_NAMES as ENGINES  # noqa: E402 - one list of engine names


@click.group(context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100})
@click.version_option(__version__, prog_name="verify")
def cli() -> None:
    """Prove, exhaustively check and randomly test adder circuits against integer addition."""


def main(argv: list[str] | None = None) -> None:
    """Console entry point: every bad input becomes one line on stderr and exit code 2."""
    if not (sys.argv[1:] if argv is None else argv):
        click.echo(cli.get_help(click.Context(cli, info_name="verify")))
        sys.exit(0)
    try:
        code = cli.main(args=argv, prog_name="verify", standalone_mode=False)
    except click.exceptions.Exit as e:
        sys.exit(e.exit_code)
    except click.exceptions.Abort:
        click.echo("error: interrupted", err=True)
        sys.exit(130)
    except click.exceptions.UsageError as e:
        hint = f" (see 'verify {e.ctx.info_name} --help')" if e.ctx and e.ctx.parent else " (see 'verify --help')"
        click.echo(f"error: {e.format_message()}{hint}", err=True)
        sys.exit(2)
    except click.exceptions.ClickException as e:
        click.echo(f"error: {e.format_message()}", err=True)
        sys.exit(2)
    except InputError as e:
        click.echo(f"error: {e}", err=True)
        sys.exit(2)
    except Exception as e:  # a bug in this tool (e.g. EngineDisagreement): never exit 1 (= fail)
        click.echo(f"internal error: {type(e).__name__}: {e}", err=True)
        sys.exit(2)
    sys.exit(code or 0)


# ---- shared option parsing ------------------------------------------------------------------

def parse_params(values: tuple[str, ...]) -> dict[str, list[int]]:
    """--param NAME=VALUE[,VALUE...] -> {NAME: [values]} (several values make a sweep)."""
    out: dict[str, list[int]] = {}
    for item in values:
        name, eq, rest = item.partition("=")
        if not eq or not name.strip() or not rest.strip():
            raise InputError(f"--param '{item}': write NAME=VALUE or NAME=V1,V2,...")
        vals = []
        for v in rest.split(","):
            try:
                vals.append(int(v.strip(), 0))
            except ValueError:
                raise InputError(f"--param {name}: '{v}' is not a whole number") from None
        if name.strip() in out:
            raise InputError(f"--param {name.strip()} is given twice; for a sweep write "
                             f"{name.strip()}=V1,V2,...")
        out[name.strip()] = vals
    return out


def parse_defines(values: tuple[str, ...]) -> dict[str, str | None]:
    out: dict[str, str | None] = {}
    for item in values:
        name, eq, val = item.partition("=")
        if not name:
            raise InputError(f"-D '{item}': write NAME or NAME=VALUE")
        out[name] = val if eq else None
    return out


def parse_shard(text: str | None) -> tuple[int, int] | None:
    if text is None:
        return None
    k, slash, n = text.partition("/")
    try:
        shard = (int(k), int(n))
    except ValueError:
        raise InputError(f"--shard '{text}': write K/N, e.g. 3/8") from None
    if not slash or not 1 <= shard[0] <= shard[1]:
        raise InputError(f"--shard '{text}': need 1 <= K <= N")
    return shard


def check_report_paths(vcd_path: str | None, dot_path: str | None) -> None:
    """Refuse a waveform or picture path that may not be written, before any work is done."""
    from verify.files import can_write
    if vcd_path:
        can_write(vcd_path, what="waveform", replace_reports=True, kind="vcd")
    if dot_path:
        can_write(dot_path, what="cone picture", replace_reports=True, kind="dot")
        can_write(Path(dot_path).with_suffix(".svg"), what="cone picture", replace_reports=True,
                  kind="svg")


def sweep(params: dict[str, list[int]]) -> list[dict[str, int]]:
    names = list(params)
    return [dict(zip(names, combo)) for combo in itertools.product(*(params[n] for n in names))] or [{}]


def design_units(paths: tuple[str, ...]) -> list[list[Path]]:
    """What to check: one design from the files given, or one design per file in a folder."""
    given = [Path(p) for p in paths]
    if len(given) > 1 and all(p.suffix == ".json" for p in given):
        return [[p] for p in given]  # each JSON netlist is a design of its own
    if len(given) == 1 and given[0].is_dir():
        files = sorted(p for p in given[0].rglob("*")
                       if p.is_file() and p.suffix in (".json", *VERILOG_SUFFIXES)
                       and not any(part.startswith(".") for part in p.relative_to(given[0]).parts))
        if not files:
            raise InputError("no .json, .v or .sv design files in this folder", str(given[0]))
        return [[f] for f in files]
    for p in given:
        if p.is_dir():
            raise InputError("give one folder on its own, or design files", str(p))
    return [given]


def verilog_options(f):
    """--top, --param, -I and -D: how to elaborate Verilog designs (ignored by nothing, refused
    for JSON netlists)."""
    for option in reversed([
        click.option("--top", help="Verilog: the top module (found automatically if there is one)."),
        click.option("--param", "params", multiple=True, metavar="NAME=V[,V...]",
                     help="Verilog: override a parameter (check: several values check each in turn)."),
        click.option("-I", "include_dirs", multiple=True, metavar="DIR", help="Verilog include folder."),
        click.option("-D", "defines", multiple=True, metavar="NAME[=VALUE]", help="Verilog define."),
    ]):
        f = option(f)
    return f


# ---- verify check ---------------------------------------------------------------------------

@cli.command("check")
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
              "(default 200,000; auto runs 20,000 first).")
@click.option("--timeout", type=float, default=DEFAULT_TIMEOUT, show_default=True,
              help="Seconds an engine may take; past it the outcome is undecided.")
@click.option("--require", type=click.Choice(["tested", "complete"]), default="tested",
              show_default=True, help="complete: only proven or exhaustive count as meeting the spec.")
@click.option("--exhaustive-limit", type=click.IntRange(1, 40), default=DEFAULT_EXHAUSTIVE_BITS,
              show_default=True, metavar="BITS",
              help="Most input bits (all input ports together) the exhaustive engine takes.")
@click.option("--shard", metavar="K/N", help="Exhaustive engine only: cover the K-th of N parts.")
@verilog_options
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object (a list for a sweep).")
@click.option("--log-dir", default="logs", show_default=True, metavar="DIR",
              help="Where runs.jsonl is appended and a failure's waveform is written.")
@click.option("--no-log", is_flag=True, help="Do not append to runs.jsonl (nor write a waveform there).")
@click.option("--vcd", "vcd_path", metavar="FILE", help="On a failure, write the waveform here "
              "(default: a file in the log dir).")
@click.option("--dot", "dot_path", metavar="FILE", help="On a failure, write the fan-in cone of the "
              "first wrong output as Graphviz DOT (and SVG when 'dot' is installed).")
@click.option("--no-diagnose", is_flag=True, help="On a failure, skip the suspects and the waveform.")
def check_cmd(paths, spec, engine, cross_check, seed, vectors, timeout, require, exhaustive_limit, shard, top,
              params, include_dirs, defines, as_json, log_dir, no_log, vcd_path, dot_path,
              no_diagnose):
    """Check DESIGN (a JSON netlist, Verilog files, or a folder of designs) against a spec."""
    from verify.diagnosis import explain as diagnose
    from verify.manifest import runlog as logbook
    from verify.check import check, resolve_spec
    from verify.formats import load

    try:
        shard_t = parse_shard(shard)
        sweep_params = parse_params(params)
        define_map = parse_defines(defines)
        units = design_units(paths)
        if (vcd_path or dot_path) and (len(units) > 1 or len(sweep(sweep_params)) > 1):
            raise InputError("--vcd and --dot take one design at one parameter value")
        check_report_paths(vcd_path, dot_path)
    except InputError as e:
        return _input_error(e, as_json)
    runs = []  # (label, params, result or error, diagnosis lines)
    for files in units:
        for point in sweep(sweep_params):
            label = " ".join(str(f) for f in files)
            try:
                design = load(files, top=top, params=point, include_dirs=include_dirs,
                              defines=define_map)
                the_spec = resolve_spec(design, spec)
                result = check(design, the_spec, engine=engine, seed=seed, vectors=vectors,
                               timeout=timeout, require=require,
                               exhaustive_limit=exhaustive_limit, shard=shard_t,
                               progress=_progress(as_json), cross_check=cross_check)
                lines = [] if no_diagnose else diagnose.attach(
                    result, design, the_spec, vcd_path=vcd_path, dot_path=dot_path,
                    log_dir=None if no_log else log_dir)
            except InputError as e:
                if len(units) == 1 and len(sweep(sweep_params)) == 1:
                    return _input_error(e, as_json)
                runs.append((label, point, e, []))
                continue
            if not no_log:
                try:
                    logbook.record(result, log_dir, files, point)
                except OSError as e:
                    click.echo(f"warning: could not write the run log in {log_dir}: {e}", err=True)
            runs.append((label, point, result, lines))
    return _report(runs, as_json, several=len(runs) > 1)


def _progress(as_json: bool):
    if as_json or not sys.stderr.isatty():
        return None
    state = {"last": None}

    def show(engine: str, done: int, total: int) -> None:
        pct = int(100 * done / total) if total else 100
        if state["last"] != (engine, pct):
            state["last"] = (engine, pct)
            click.echo(f"\r  {engine} {pct:3d}% ({done:,} of {total:,})", err=True, nl=False)
            if done >= total:
                click.echo("\r" + " " * 60 + "\r", err=True, nl=False)
    return show


def _input_error(e: InputError, as_json: bool) -> int:
    if as_json:
        click.echo(json.dumps({"ok": False, "verdict": "error", "error": str(e)}))
    click.echo(f"error: {e}", err=True)
    return 2


def _report(runs, as_json: bool, several: bool) -> int:
    from verify.render import text as reports

    codes = []
    if as_json:
        items = []
        for label, point, r, _ in runs:
            if isinstance(r, InputError):
                items.append({"ok": False, "verdict": "error", "error": str(r), "files": label,
                              "params": point})
                codes.append(2)
            else:
                items.append(reports.render_json(r, params=point or None))
                codes.append(r.exit_code)
        click.echo(reports.dumps(items if several else items[0]))
        return worst_exit_code(codes)
    for n, (label, point, r, lines) in enumerate(runs):
        if n:
            click.echo("\n" + "-" * 78)
        if isinstance(r, InputError):
            click.echo(f"error: {r}")
            codes.append(2)
            continue
        click.echo(reports.render_text(r, params=point or None, diagnosis=lines))
        codes.append(r.exit_code)
    if several:
        click.echo("\n" + "=" * 78)
        click.echo(summary_table(runs))
    return worst_exit_code(codes)


def summary_table(runs) -> str:
    lines = ["summary:"]
    for label, point, r, _ in runs:
        p = " ".join(f"{k}={v}" for k, v in point.items())
        name = f"{label} {p}".strip()
        if isinstance(r, InputError):
            lines.append(f"  {'ERROR':<13} {name}: {r.message}")
        else:
            engines = "+".join(e.engine for e in r.engines if e.status != "skipped")
            lines.append(f"  {r.verdict.value.upper():<13} {name}  ({engines}, {r.seconds:.2f} s)")
    counts: dict[str, int] = {}
    for _, _, r, _ in runs:
        v = "error" if isinstance(r, InputError) else r.verdict.value
        counts[v] = counts.get(v, 0) + 1
    lines.append("  " + ", ".join(f"{n} {v}" for v, n in counts.items()))
    return "\n".join(lines)




# ---- verify export ---------------------------------------------------------------------------

@cli.command("export")
@click.argument("paths", nargs=-1, required=True, metavar="DESIGN...")
@click.option("--format", "fmt", type=click.Choice(["verilog", "json"]), required=True,
              help="structural Verilog (gate primitives and simple assigns) or the JSON netlist.")
@click.option("-o", "--output", metavar="FILE", help="Write here (default: standard output).")
@click.option("--force", is_flag=True, help="Replace FILE if it exists.")
@verilog_options
def export_cmd(paths, fmt, output, force, top, params, include_dirs, defines):
    """Write any loaded design as structural Verilog or as a JSON netlist."""
    from verify.formats import json_netlist, load
    from verify.formats.verilog import writer as verilog_writer
    from verify.files import write_text

    point = parse_params(params)
    if any(len(v) > 1 for v in point.values()):
        raise InputError("export takes one value per --param")
    design = load(list(paths), top=top, params={k: v[0] for k, v in point.items()},
                  include_dirs=include_dirs, defines=parse_defines(defines))
    text = verilog_writer.dumps(design) if fmt == "verilog" else json_netlist.dumps(design)
    if output:
        write_text(output, text, what="design", force=force)
        click.echo(f"wrote {output}: {design.summary()}", err=True)
    else:
        click.echo(text, nl=False)
    return 0


# ---- the other commands, each in the module of its concern ---------------------------------
def _register_commands() -> None:
    from verify.cli import explain as cli_diagnose
    from verify.cli import run as cli_gate
    from verify.cli import library as cli_library
    for module in (cli_library, cli_diagnose, cli_gate):
        module.register(cli)


_register_commands()

if __name__ == "__main__":  # pragma: no cover
    main()
