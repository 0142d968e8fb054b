"""Input formats. Each reader produces the same validated ``Netlist``; ``load`` picks by extension."""

from __future__ import annotations

from pathlib import Path
from typing import Mapping, Sequence

from verify.errors import InputError
from verify.model.netlist import Netlist

VERILOG_SUFFIXES = (".v", ".sv", ".vh", ".svh")


def load(paths: str | Path | Sequence[str | Path], *, top: str | None = None,
         params: Mapping[str, int] | None = None, include_dirs: Sequence[str] = (),
         defines: Mapping[str, str | None] | None = None,
         cells: Sequence[str | Path] = ()) -> Netlist:
    """Read one design: a JSON netlist, or one or more Verilog/SystemVerilog files.

    ``cells``: Liberty (.lib) files whose cells' ``function`` attributes define the modules a
    Verilog cell-instance netlist uses (in place of the cells' Verilog models).
    Notes (ignored delays and directives, meaningful front-end warnings) are issued as
    ``warnings`` of class ``verify.errors.InputNote``; see ``verify.formats.notes.collect``.
    """
    if isinstance(paths, (str, Path)):
        paths = [paths]
    paths = [Path(p) for p in paths]
    if not paths:
        raise InputError("no design file given")
    from verify.formats.verilog.guard import regular_file
    for p in paths:
        regular_file(p)  # before anything opens it: no folders, devices or FIFOs
    if all(p.suffix == ".json" for p in paths):
        if len(paths) > 1:
            raise InputError("give one JSON netlist at a time", str(paths[1]))
        if top or params or include_dirs or defines or cells:
            raise InputError("--top, --param, -I, -D and --cells apply to Verilog files only",
                             str(paths[0]))
        from verify.formats import json_netlist
        try:
            text = paths[0].read_text(encoding="utf-8")
        except UnicodeDecodeError:
            raise InputError("not a UTF-8 text file", str(paths[0])) from None
        return json_netlist.parse(text, str(paths[0]))
    if all(p.suffix in VERILOG_SUFFIXES for p in paths):
        try:
            from verify.formats.verilog import reader as verilog
        except ImportError:  # pragma: no cover - until the Verilog reader lands
            raise InputError("reading Verilog is not available in this build", str(paths[0])) from None
        return verilog.load(paths, top=top, params=dict(params or {}),
                            include_dirs=list(include_dirs), defines=dict(defines or {}),
                            cells=[Path(c) for c in cells])
    for p in paths:
        if p.suffix not in (".json", *VERILOG_SUFFIXES):
            raise InputError(f"unknown design format '{p.suffix or '(no extension)'}' "
                             f"(expected .json, .v or .sv)", str(p))
    raise InputError("give either one JSON netlist or Verilog files, not both", str(paths[0]))
