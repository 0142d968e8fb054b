"""``verify generate`` and ``verify stats``: thin click commands over verify.library.architectures and
verify.library.shape. ``register(main)`` adds them to the main command group."""

from __future__ import annotations

import json
from pathlib import Path

import click

from verify.errors import InputError


def _fail(e: InputError) -> None:
    click.echo(f"error: {e}", err=True)
    raise click.exceptions.Exit(2)


def _architecture_table() -> str:
    from verify.library.architectures import ARCHITECTURES, describe_params
    rows = [(name, describe_params(name), a.summary) for name, a in ARCHITECTURES.items()]
    w1 = max(len(r[0]) for r in rows)
    w2 = max(len(r[1]) for r in rows)
    lines = [f"{'architecture':<{w1}}  {'parameters':<{w2}}  structure"]
    lines += [f"{n:<{w1}}  {p:<{w2}}  {s}" for n, p, s in rows]
    return "\n".join(lines)


@click.command("generate")
@click.argument("arch", required=False, metavar="ARCH")
@click.option("--width", "-w", type=int, help="Operand width in bits (1 or more).")
@click.option("--no-cin", is_flag=True, help="Leave out the carry-in port.")
@click.option("--no-cout", is_flag=True, help="Leave out the carry-out port.")
@click.option("--overflow", is_flag=True, help="Add the signed-overflow output v.")
@click.option("--block", type=int, help="Block size (carry-lookahead, carry-skip, carry-select).")
@click.option("--levels", type=int, help="Lookahead levels (carry-lookahead).")
@click.option("--sizes", help="Block sizes LSB first, e.g. 2,4,4,2; or 'variable' (carry-skip), "
              "'growing' (carry-select).")
@click.option("--name", help="Design (module) name. Default: the architecture and width.")
@click.option("--format", "fmt", type=click.Choice(["json", "verilog"]), default="json",
              show_default=True, help="Output format.")
@click.option("-o", "--output", type=click.Path(dir_okay=False), help="Write here, not to stdout.")
@click.option("--force", is_flag=True, help="Replace the -o file if it exists.")
@click.option("--list", "list_", is_flag=True, help="List the architectures and their parameters.")
def generate_cmd(arch, width, no_cin, no_cout, overflow, block, levels, sizes, name, fmt, output,
                 force, list_):
    """Write a reference adder ARCH (e.g. kogge-stone) as a JSON netlist or structural Verilog.

    Ports: a, b (WIDTH bits), cin; sum (WIDTH bits), cout; v with --overflow.
    """
    if list_ or arch is None:
        click.echo(_architecture_table())
        if arch is None and not list_:
            click.echo("\nerror: name an architecture, e.g. 'verify generate kogge-stone --width 16'",
                       err=True)
            raise click.exceptions.Exit(2)
        return
    from verify.library.architectures import generate
    try:
        if width is None:
            raise InputError("--width is required (operand width in bits)")
        params = {k: v for k, v in (("block", block), ("levels", levels), ("sizes", sizes))
                  if v is not None}
        netlist = generate(arch, width, cin=not no_cin, cout=not no_cout, overflow=overflow,
                           name=name, **params)
    except InputError as e:
        _fail(e)
    if fmt == "json":
        from verify.formats.json_netlist import dumps
        text = dumps(netlist)
    else:
        from verify.formats.verilog.writer import dumps
        text = dumps(netlist)
    if output:
        from verify.files import write_text
        try:
            write_text(output, text, what="design", force=force)
        except InputError as e:
            _fail(e)
        click.echo(f"wrote {output}: {netlist.summary()}", err=True)
    else:
        click.echo(text, nl=False)


def _stats(paths, top, params, include_dirs, defines, as_json):
    """Gate counts, logic depth, the longest path, fanout and prefix nodes of a design."""
    from verify.cli.main import parse_defines, parse_params
    from verify.formats import load
    from verify.library.shape import format_text, stats
    try:
        point = parse_params(params)
        swept = sorted(name for name, values in point.items() if len(values) > 1)
        if swept:
            raise InputError(f"--param {swept[0]}: stats takes one value per parameter "
                             f"(figures of a sweep are not combined); run it once per value")
        netlist = load(list(paths), top=top, params={k: v[0] for k, v in point.items()},
                       include_dirs=list(include_dirs), defines=parse_defines(defines))
    except InputError as e:
        _fail(e)
    figures = stats(netlist)
    if as_json:
        click.echo(json.dumps(figures, indent=2))
    else:
        click.echo(format_text(figures))


_STATS_CMD: click.Command | None = None


def stats_command() -> click.Command:
    """The ``stats`` command, built on first use: its Verilog options (--top, --param, -I, -D)
    are the shared ones of verify.cli.main, which imports this module, so they are fetched late."""
    global _STATS_CMD
    if _STATS_CMD is None:
        from verify.cli.main import verilog_options  # (may register this module first: look again)
    if _STATS_CMD is None:
        cmd = click.option("--json", "as_json", is_flag=True, help="Print the figures as JSON.")(_stats)
        cmd = verilog_options(cmd)
        cmd = click.argument("paths", nargs=-1, required=True, metavar="DESIGN...")(cmd)
        cmd = click.command("stats")(cmd)
        for p in cmd.params:
            if p.name == "params":  # the shared help speaks of sweeps, which stats refuses
                p.metavar, p.help = "NAME=V", "Verilog: override a parameter (one value)."
        _STATS_CMD = cmd
    return _STATS_CMD


def register(main: click.Group) -> None:
    """Add ``generate`` and ``stats`` to the main command group."""
    main.add_command(generate_cmd)
    main.add_command(stats_command())
