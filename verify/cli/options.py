"""Options shared by several commands, and parsing their values into Python API arguments.

Command modules import this module and ``verify`` only; ``verify.cli.main`` imports the command
modules. Nothing here imports a command, so there is no import circle.
"""

from __future__ import annotations

from pathlib import Path

import click

from verify.errors import InputError

#: the exit codes every command shares, for each command's --help
EXIT_CODES = ("Exit codes: 0 meets the spec (proven, exhaustive, or tested when that is enough); "
              "1 a counterexample was found; 2 bad input, or two engines disagree; 3 undecided "
              "(or only tested where complete was required); 4 internal error of this tool.")


def error_json(e: InputError, **extra) -> dict:
    """The JSON a command prints with --json when its input was bad (what stderr says too)."""
    return {"ok": False, "verdict": "error", **extra, "error": e.for_command_line()}


def with_exit_codes(text: str) -> str:
    """A command's help text followed by the exit codes (its own paragraph in --help)."""
    return f"{text.rstrip()}\n\n\b\n{EXIT_CODES}"


def parse_params(values: tuple[str, ...]) -> dict[str, list[int | str]]:
    """--param NAME=VALUE[,VALUE...] -> {NAME: [values]} (several values make a sweep).

    Whole numbers (decimal, 0x..., 0b...) become ints; anything else is kept as text, an enum
    member or a string, which the Verilog reader checks against the parameter's type."""
    out: dict[str, list[int]] = {}
    for item in values:
        name, eq, rest = item.partition("=")
        if not eq or not name.strip() or not rest.strip():
            raise InputError(f"'{item}': write NAME=VALUE or NAME=V1,V2,...", option="params")
        vals = []
        for v in rest.split(","):
            if not v.strip():
                raise InputError(f"{name}: an empty value", option="params")
            try:
                vals.append(int(v.strip(), 0))
            except ValueError:
                vals.append(v.strip())  # an enum member or a string: the reader decides
        if name.strip() in out:
            raise InputError(f"{name.strip()} is given twice; for a sweep write "
                             f"{name.strip()}=V1,V2,...", option="params")
        out[name.strip()] = vals
    return out


def single_point(values: tuple[str, ...], command: str) -> dict[str, int]:
    """--param values of a command that takes one value per parameter."""
    point = parse_params(values)
    swept = sorted(name for name, vals in point.items() if len(vals) > 1)
    if swept:
        raise InputError(f"{swept[0]}: {command} takes one value per parameter; run it once per "
                         f"value", option="params")
    return {k: v[0] for k, v in point.items()}


def parse_defines(values: tuple[str, ...]) -> dict[str, str | None]:
    out: dict[str, str | None] = {}
    for item in values:
        name, eq, val = item.partition("=")
        if not name:
            raise InputError(f"'{item}': write NAME or NAME=VALUE", option="defines")
        out[name] = val if eq else None
    return out


def parse_shard(text: str | None) -> tuple[int, int] | None:
    if text is None:
        return None
    k, slash, n = text.partition("/")
    try:
        shard = (int(k), int(n))
    except ValueError:
        raise InputError(f"'{text}': write K/N, e.g. 3/8", option="shard") from None
    if not slash or not 1 <= shard[0] <= shard[1]:
        raise InputError(f"'{text}': need 1 <= K <= N", option="shard")
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


def verilog_options(sweep: bool = True):
    """--top, --param, -I, -D and --cells: how to elaborate Verilog designs (refused for JSON
    netlists). ``sweep=False`` for commands that take one value per parameter."""
    param_help = ("Verilog: override a parameter (several values check each in turn)." if sweep
                  else "Verilog: override a parameter (one value).")

    def decorate(f):
        for option in reversed([
            click.option("--top", help="Verilog: the top module (found automatically if there is one)."),
            click.option("--param", "params", multiple=True,
                         metavar="NAME=V[,V...]" if sweep else "NAME=V", help=param_help),
            click.option("-I", "include_dirs", multiple=True, metavar="DIR", help="Verilog include folder."),
            click.option("-D", "defines", multiple=True, metavar="NAME[=VALUE]", help="Verilog define."),
            click.option("--cells", multiple=True, metavar="FILE.lib",
                         help="Liberty cell library: the cells a gate-level netlist instantiates "
                              "get their logic from its 'function' attributes (repeatable)."),
        ]):
            f = option(f)
        return f
    return decorate
