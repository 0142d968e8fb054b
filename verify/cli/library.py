"""``adder-verify generate`` and ``adder-verify shape``: thin click commands over
verify.library.architectures and verify.library.shape."""

from __future__ import annotations

import json

import click

from verify.cli.options import parse_defines, single_point, verilog_options
from verify.errors import InputError


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

    \b
    Exit codes: 0 written (or listed); 2 bad input (an unknown architecture, a bad width, a file
    that may not be replaced); 4 internal error of this tool.
    """
    if list_ or arch is None:
        click.echo(_architecture_table())
        if arch is None and not list_:
            click.echo("\nerror: name an architecture, e.g. 'adder-verify generate kogge-stone --width 16'",
                       err=True)
            raise click.exceptions.Exit(2)
        return
    from verify.library.architectures import generate
    if width is None:
        raise InputError("is required (operand width in bits)", option="width")
    params = {k: v for k, v in (("block", block), ("levels", levels), ("sizes", sizes))
              if v is not None}
    netlist = generate(arch, width, cin=not no_cin, cout=not no_cout, overflow=overflow,
                       name=name, **params)
    if fmt == "json":
        from verify.formats.json_netlist import dumps
        text = dumps(netlist)
    else:
        from verify.formats.verilog.writer import dumps
        text = dumps(netlist)
    if output:
        from verify.files import write_text
        write_text(output, text, what="design", force=force)
        click.echo(f"wrote {output}: {netlist.summary()}", err=True)
    else:
        click.echo(text, nl=False)


@click.command("shape", help=(
    "Gate counts, logic depth in gate levels, the longest path, fanout and prefix nodes of "
    "DESIGN: the shape of the circuit, not a proof of anything.\n\n\b\nExit codes: 0 the "
    "figures were printed; 2 bad input; 4 internal error of this tool."))
@click.argument("paths", nargs=-1, required=True, metavar="DESIGN...")
@verilog_options(sweep=False)
@click.option("--json", "as_json", is_flag=True, help="Print the figures as JSON.")
def shape_cmd(paths, top, params, include_dirs, defines, cells, as_json):
    from verify.formats import load
    from verify.library.shape import format_text, stats
    netlist = load(list(paths), top=top, params=single_point(params, "shape"),
                   include_dirs=list(include_dirs), defines=parse_defines(defines), cells=cells)
    figures = stats(netlist)
    if as_json:
        click.echo(json.dumps(figures, indent=2))
    else:
        click.echo(format_text(figures))
