"""Liberty (.lib) cell libraries: cell functions for reading netlists, timing tables kept raw.

``read_liberty(path) -> CellLibrary``: ``cells[name]`` has ``inputs``, ``outputs``,
``function[pin]`` (the Liberty Boolean expression text), ``sequential`` (``"ff"``, ``"latch"``,
``"statetable"`` or None), ``line`` and ``arcs``: one ``TimingArc`` per ``timing()`` group with
``pin``, ``related_pin``, ``timing_type``, ``timing_sense`` and ``tables`` (``cell_rise``,
``cell_fall``, ``rise_transition``, ``fall_transition``... each a ``Table`` of ``index_1``,
``index_2`` and ``values`` as floats, rows as written).

``verilog_models(library)`` writes a Verilog module per combinational cell (an ``assign`` per
output) so that a cell-instance netlist can be read with the library's functions.

The parser here reads the Liberty subset these need: groups ``name (args) { ... }``, simple
attributes ``name : value ;``, complex attributes ``name (args) ;``, comments and line
continuations. (A PyPI parser was considered: liberty-parser is GPL-3.0, which this MIT project
cannot take in, and pulls in sympy; eda-liberty-parser had one release and an editing-oriented
data model. This file is small and reports errors with file:line.)
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from pathlib import Path

from verify.errors import InputError

MAX_LIBERTY_BYTES = 1 << 30


@dataclass
class Group:
    kind: str
    args: list[str]
    line: int
    attrs: dict[str, str] = field(default_factory=dict)
    complex: dict[str, list[list[str]]] = field(default_factory=dict)
    groups: list["Group"] = field(default_factory=list)

    def all(self, kind: str) -> list["Group"]:
        return [g for g in self.groups if g.kind == kind]


@dataclass
class Table:
    index_1: list[float]
    index_2: list[float]
    values: list[list[float]]
    template: str | None = None


@dataclass
class TimingArc:
    pin: str
    related_pin: str
    timing_type: str | None
    timing_sense: str | None
    tables: dict[str, Table]


@dataclass
class Cell:
    name: str
    line: int
    inputs: list[str]
    outputs: list[str]
    function: dict[str, str]
    sequential: str | None
    arcs: list[TimingArc]
    other_pins: dict[str, str]  # pin -> direction, for inout/internal pins
    area: float | None = None


@dataclass
class CellLibrary:
    name: str
    path: str
    cells: dict[str, Cell]


# ---- the syntax ---------------------------------------------------------------------------------
_TOKEN = re.compile(r'\\\r?\n|"(?:\\.|[^"\\])*"|[(){}:;,]|[^\s(){}:;,"\\]+|\\|\s+', re.S)
_COMMENT = re.compile(r"/\*.*?\*/|//[^\n]*", re.S)


def parse(text: str, path: str) -> Group:
    """The top group of a Liberty text (usually ``library (name) { ... }``)."""
    text = _COMMENT.sub(lambda m: "\n" * m.group(0).count("\n"), text)
    toks: list[tuple[str, int]] = []
    line = 1
    pos = 0
    n = len(text)
    while pos < n:
        m = _TOKEN.match(text, pos)
        if m is None:  # pragma: no cover - the pattern matches any character
            raise InputError(f"unexpected character {text[pos]!r}", f"{path}:{line}")
        t = m.group(0)
        if t.isspace() or t in ("\\\n", "\\\r\n"):
            line += t.count("\n")
        else:
            toks.append((t, line))
            line += t.count("\n")
        pos = m.end()
    root = Group("", [], 1)
    stack = [root]
    i = 0
    count = len(toks)

    def err(msg: str, at: int) -> InputError:
        ln = toks[min(at, count - 1)][1] if toks else 1
        return InputError(f"Liberty syntax: {msg}", f"{path}:{ln}")

    while i < count:
        t, ln = toks[i]
        if t == "}":
            if len(stack) == 1:
                raise err("'}' without its group", i)
            stack.pop()
            i += 1
            if i < count and toks[i][0] == ";":
                i += 1
            continue
        if t == ";":
            i += 1
            continue
        if t in "(){:,":
            raise err(f"unexpected '{t}'", i)
        name = t
        i += 1
        if i >= count:
            raise err(f"'{name}' ends the file", i - 1)
        t2 = toks[i][0]
        if t2 == ":":
            i += 1
            parts = []
            while i < count and toks[i][0] not in (";", "}") and toks[i][1] == ln:
                parts.append(_unquote(toks[i][0]))
                i += 1
            if not parts:
                raise err(f"attribute '{name}' has no value", i - 1)
            stack[-1].attrs[name] = " ".join(parts)
            continue
        if t2 == "(":
            i += 1
            args = []
            while i < count and toks[i][0] != ")":
                if toks[i][0] != ",":
                    if toks[i][0] in "{};":
                        raise err(f"'(' after '{name}' is not closed", i)
                    args.append(_unquote(toks[i][0]))
                i += 1
            if i >= count:
                raise err(f"'(' after '{name}' is not closed", i - 1)
            i += 1
            if i < count and toks[i][0] == "{":
                g = Group(name, args, ln)
                stack[-1].groups.append(g)
                stack.append(g)
                i += 1
            else:
                stack[-1].complex.setdefault(name, []).append(args)
            continue
        raise err(f"expected ':' or '(' after '{name}'", i)
    if len(stack) > 1:
        raise InputError(f"Liberty syntax: group '{stack[-1].kind}' opened here is not closed",
                         f"{path}:{stack[-1].line}")
    return root


def _unquote(t: str) -> str:
    if len(t) >= 2 and t[0] == '"' and t[-1] == '"':
        return t[1:-1].replace("\\\n", "").replace("\\\r\n", "")
    return t


# ---- the library --------------------------------------------------------------------------------
def read_liberty(path: str | Path) -> CellLibrary:
    """Read a Liberty file: every cell's pins, functions and timing arcs."""
    from verify.formats.verilog.guard import regular_file
    p = Path(path)
    st = regular_file(p, "Liberty file")
    if st.st_size > MAX_LIBERTY_BYTES:
        raise InputError(f"Liberty file of {st.st_size:,} bytes: the limit is "
                         f"{MAX_LIBERTY_BYTES:,}", str(p))
    text = p.read_bytes().decode("latin-1")
    root = parse(text, str(p))
    libs = root.all("library")
    if len(libs) != 1:
        raise InputError(f"expected one 'library (name) {{ ... }}' group, found {len(libs)}",
                         str(p))
    lib = libs[0]
    cells: dict[str, Cell] = {}
    for g in lib.all("cell"):
        if len(g.args) != 1:
            raise InputError("a cell group needs one name: cell (NAME)", f"{p}:{g.line}")
        name = g.args[0]
        if name in cells:
            raise InputError(f"cell '{name}' is defined twice (also at line {cells[name].line})",
                             f"{p}:{g.line}")
        cells[name] = _cell(g, name, str(p))
    return CellLibrary(lib.args[0] if lib.args else "", str(p), cells)


def _cell(g: Group, name: str, path: str) -> Cell:
    inputs, outputs, other = [], [], {}
    function: dict[str, str] = {}
    arcs: list[TimingArc] = []
    sequential = next((k for k in ("ff", "latch", "statetable", "ff_bank", "latch_bank")
                       if g.all(k)), None)
    for pin in g.all("pin"):
        for pname in pin.args:
            d = pin.attrs.get("direction", "").lower()
            if d == "input":
                inputs.append(pname)
            elif d == "output":
                outputs.append(pname)
            else:
                other[pname] = d or "(no direction)"
            if "function" in pin.attrs:
                function[pname] = pin.attrs["function"]
            for t in pin.all("timing"):
                tables = {}
                for tg in t.groups:
                    vals = tg.complex.get("values")
                    if not vals:
                        continue
                    tables[tg.kind] = Table(_floats(tg.complex.get("index_1"), path, tg),
                                            _floats(tg.complex.get("index_2"), path, tg),
                                            [_row(v, path, tg) for v in vals[0]],
                                            tg.args[0] if tg.args else None)
                for related in (t.attrs.get("related_pin") or "").split() or [""]:
                    arcs.append(TimingArc(pname, related, t.attrs.get("timing_type"),
                                          t.attrs.get("timing_sense"), tables))
    if g.all("bus") or g.all("bundle"):
        other.update({b.args[0] if b.args else "?": "bus" for b in g.all("bus") + g.all("bundle")})
    area = g.attrs.get("area")
    try:
        area_v = float(area) if area is not None else None
    except ValueError:
        area_v = None
    return Cell(name, g.line, inputs, outputs, function, sequential, arcs, other, area_v)


def _floats(attr, path: str, g: Group) -> list[float]:
    if not attr:
        return []
    return _row(attr[0][0] if attr[0] else "", path, g)


def _row(text: str, path: str, g: Group) -> list[float]:
    try:
        return [float(x) for x in text.replace(",", " ").split()]
    except ValueError:
        raise InputError(f"a table value in '{g.kind}' is not a number: {text!r}",
                         f"{path}:{g.line}") from None


# ---- Boolean functions --------------------------------------------------------------------------
_FTOKEN = re.compile(r"\s*(?:([A-Za-z_][A-Za-z0-9_.\[\]]*)|([01])|([!'^*&+|()]))")


def function_to_verilog(text: str, pins: set[str], where: str) -> str:
    """A Liberty Boolean function as a Verilog expression over the pin names.

    Operators (Liberty's own precedence, highest first): ``!x`` and ``x'`` (not), ``^`` (xor),
    ``*``, ``&`` and juxtaposition (and), ``+`` and ``|`` (or); parentheses; constants 0 and 1.
    """
    toks: list[tuple[str, str]] = []
    pos = 0
    s = text.strip()
    while pos < len(s):
        m = _FTOKEN.match(s, pos)
        if m is None or m.end() == pos:
            if s[pos:].strip() == "":
                break
            raise InputError(f"cannot read the function {text!r} at {s[pos:]!r}", where)
        if m.group(1):
            if m.group(1) not in pins:
                raise InputError(f"function {text!r} names '{m.group(1)}', which is not an input "
                                 f"pin of the cell", where)
            toks.append(("id", m.group(1)))
        elif m.group(2):
            toks.append(("const", m.group(2)))
        else:
            toks.append(("op", m.group(3)))
        pos = m.end()
    i = 0

    def peek():
        return toks[i] if i < len(toks) else ("end", "")

    def primary() -> str:
        nonlocal i
        kind, v = peek()
        if kind == "op" and v == "!":
            i += 1
            return f"(~{primary()})"
        if kind == "op" and v == "(":
            i += 1
            e = or_expr()
            if peek() != ("op", ")"):
                raise InputError(f"unbalanced parentheses in the function {text!r}", where)
            i += 1
            out = f"({e})"
        elif kind == "id":
            i += 1
            out = _vname(v)
        elif kind == "const":
            i += 1
            out = "1'b1" if v == "1" else "1'b0"
        else:
            raise InputError(f"the function {text!r} is incomplete or has a misplaced "
                             f"'{v or 'end'}'", where)
        while peek() == ("op", "'"):
            i += 1
            out = f"(~{out})"
        return out

    def xor_expr() -> str:
        nonlocal i
        e = primary()
        while peek() == ("op", "^"):
            i += 1
            e = f"({e} ^ {primary()})"
        return e

    def starts_primary() -> bool:
        kind, v = peek()
        return kind in ("id", "const") or (kind == "op" and v in "!(")

    def and_expr() -> str:
        nonlocal i
        e = xor_expr()
        while True:
            if peek() in (("op", "*"), ("op", "&")):
                i += 1
                e = f"({e} & {xor_expr()})"
            elif starts_primary():  # juxtaposition
                e = f"({e} & {xor_expr()})"
            else:
                return e

    def or_expr() -> str:
        nonlocal i
        e = and_expr()
        while peek() in (("op", "+"), ("op", "|")):
            i += 1
            e = f"({e} | {and_expr()})"
        return e

    if not toks:
        raise InputError("empty function", where)
    out = or_expr()
    if i != len(toks):
        raise InputError(f"cannot read the function {text!r} past '{toks[i][1]}'", where)
    return out


_VID = re.compile(r"[A-Za-z_][A-Za-z0-9_$]*\Z")


def _vname(name: str) -> str:
    return name if _VID.match(name) else f"\\{name} "


def verilog_models(lib: CellLibrary) -> tuple[str, dict[str, str]]:
    """(Verilog text with one module per usable cell, {cell: why it cannot be used}).

    A cell is usable when it is combinational and every output pin has a function over its
    input pins; the others get an empty module and a reason, given if a netlist instantiates one.
    `line directives point each module at its cell in the Liberty file.
    """
    out: list[str] = ["`celldefine\n"]
    refused: dict[str, str] = {}
    for cell in lib.cells.values():
        where = f"{lib.path}:{cell.line}"
        reason = None
        if cell.sequential:
            reason = (f"cell '{cell.name}' ({where}) is sequential (a '{cell.sequential}' group): "
                      f"only combinational designs can be checked")
        elif cell.other_pins:
            pin, d = next(iter(cell.other_pins.items()))
            reason = f"cell '{cell.name}' ({where}) has pin '{pin}' of direction {d}, which is not supported"
        else:
            missing = [p for p in cell.outputs if p not in cell.function]
            if missing:
                reason = (f"cell '{cell.name}' ({where}): output pin '{missing[0]}' has no "
                          f"function")
        ports = cell.inputs + cell.outputs + list(cell.other_pins)
        out.append(f"`line {cell.line} \"{lib.path}\" 0\n")
        out.append(f"module {_vname(cell.name)} ({', '.join(_vname(p) for p in ports)});\n")
        for p in cell.inputs:
            out.append(f"  input {_vname(p)};\n")
        for p in cell.outputs:
            out.append(f"  output {_vname(p)};\n")
        if reason is None:
            pins = set(cell.inputs)
            for p in cell.outputs:
                expr = function_to_verilog(cell.function[p], pins, where)
                out.append(f"`line {cell.line} \"{lib.path}\" 0\n")
                out.append(f"  assign {_vname(p)} = {expr};\n")
        else:
            refused[cell.name] = reason
            for p in cell.other_pins:
                out.append(f"  inout {_vname(p)};\n")
        out.append("endmodule\n")
    out.append("`endcelldefine\n")
    return "".join(out), refused
