"""The JSON netlist format, ``verify-netlist/1``.

::

    {"format": "verify-netlist/1", "name": "rca4",
     "inputs": {"a": 4, "b": 4, "cin": 1}, "outputs": {"sum": 4, "cout": 1},
     "gates": [{"out": "p0", "op": "xor", "in": ["a[0]", "b[0]"]}, ...]}

A reference is ``port[i]``, a bare 1-bit port name, another gate's ``out``, or "0"/"1". A gate
whose ``out`` is an output bit drives that bit. Gates may come in any order. An optional
``"src"`` string on a gate is carried into messages.
"""

from __future__ import annotations

import json
import re
from typing import Any

from verify.errors import InputError
from verify.model.netlist import MAX_PORT_WIDTH, Gate, Netlist, Port, canonical_ref

FORMAT = "verify-netlist/1"
_TOP_KEYS = {"format", "name", "inputs", "outputs", "gates", "comment"}
_GATE_KEYS = {"out", "op", "in", "src"}


def _no_duplicates(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for k, v in pairs:
        if k in out:
            raise InputError(f"key '{k}' appears twice in one object")
        out[k] = v
    return out


#: most inputs one gate may have: far past any real gate, and short of the point where
#: compiling the gate's expression exhausts Python's recursion limit
MAX_GATE_INPUTS = 1024
#: a port name is a plain identifier, so every writer can use it as it is
_IDENTIFIER = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")
#: net names may hold brackets and dots (bit references, instance paths) but no white space,
#: which would end a Verilog escaped identifier early, and no control characters
_SPACE = re.compile(r"[\s\x00-\x1f\x7f]")
_CONTROL = re.compile(r"[\x00-\x1f\x7f]")


def parse(text: str, origin: str = "<json>") -> Netlist:
    """Parse JSON netlist text into a validated Netlist; every mistake is one InputError."""
    try:
        data = json.loads(text, object_pairs_hook=_no_duplicates)
    except json.JSONDecodeError as e:
        raise InputError(f"not valid JSON: {e.msg}", f"{origin}:{e.lineno}:{e.colno}") from None
    except RecursionError:  # the decoder recurses once a bracket
        raise InputError("brackets nested too deep to read (a netlist nests 4 deep)",
                         origin) from None
    except InputError as e:
        raise e.located(origin) from None
    return from_dict(data, origin)


def from_dict(data: Any, origin: str = "<json>") -> Netlist:
    def bad(msg: str) -> InputError:
        return InputError(msg, origin)

    if not isinstance(data, dict):
        raise bad(f"expected a JSON object at the top level, got {type(data).__name__}")
    if "format" not in data:
        raise bad(f"missing key 'format' (a netlist starts with \"format\": \"{FORMAT}\")")
    if data.get("format") != FORMAT:
        raise bad(f"'format' must be \"{FORMAT}\", got {data.get('format')!r}")
    unknown = set(data) - _TOP_KEYS
    if unknown:
        raise bad(f"unknown key{'s' if len(unknown) > 1 else ''} {', '.join(sorted(unknown))} "
                  f"(known: {', '.join(sorted(_TOP_KEYS))})")
    for key in ("inputs", "outputs", "gates"):
        if key not in data:
            raise bad(f"missing key '{key}'")
    name = data.get("name", "design")
    if not isinstance(name, str) or not name:
        raise bad("'name' must be a non-empty string")
    if _CONTROL.search(name):
        raise bad(f"'name' {name!r} holds a control character (a line break?)")
    ports = {}
    port_lists = []
    for key in ("inputs", "outputs"):
        spec = data[key]
        if not isinstance(spec, dict):
            raise bad(f"'{key}' must be an object mapping port names to widths")
        plist = []
        for pname, width in spec.items():
            if not _IDENTIFIER.fullmatch(pname):
                raise bad(f"{key}: port name {pname!r} is not an identifier (letters, digits and "
                          f"_, not starting with a digit)")
            if isinstance(width, bool) or not isinstance(width, int) or width < 1:
                raise bad(f"{key}.{pname}: width must be a whole number >= 1, got {width!r}")
            if width > MAX_PORT_WIDTH:
                raise bad(f"{key}.{pname}: width {width:,} is over the widest port supported "
                          f"({MAX_PORT_WIDTH:,} bits)")
            if pname in ports:
                raise bad(f"port '{pname}' is declared as both an input and an output")
            ports[pname] = width
            plist.append(Port(pname, width))
        port_lists.append(tuple(plist))
    gates_data = data["gates"]
    if not isinstance(gates_data, list):
        raise bad("'gates' must be a list")
    gates = []
    for i, g in enumerate(gates_data):
        where = f"gates[{i}]"
        if not isinstance(g, dict):
            raise bad(f"{where}: expected an object with 'out', 'op' and 'in'")
        extra = set(g) - _GATE_KEYS
        if extra:
            raise bad(f"{where}: unknown key{'s' if len(extra) > 1 else ''} {', '.join(sorted(extra))}")
        for key in ("out", "op"):
            if not isinstance(g.get(key), str) or not g.get(key):
                raise bad(f"{where}: '{key}' must be a non-empty string, got {g.get(key)!r}")
        ins = g.get("in", [])
        if not isinstance(ins, list) or not all(isinstance(x, str) and x for x in ins):
            raise bad(f"{where} (out '{g['out']}'): 'in' must be a list of net names")
        for net in (g["out"], *ins):
            if _SPACE.search(net):
                raise bad(f"{where}: net name {net!r} holds a space or control character")
        if len(ins) > MAX_GATE_INPUTS:
            raise bad(f"{where} (out '{g['out']}'): {len(ins):,} inputs; a gate takes at most "
                      f"{MAX_GATE_INPUTS:,} (build wide functions from a tree of gates)")
        src = g.get("src")
        if src is not None and not isinstance(src, str):
            raise bad(f"{where}: 'src' must be a string")
        gates.append(Gate(g["op"], tuple(canonical_ref(x, ports) for x in ins),
                          canonical_ref(g["out"], ports), src))
    return Netlist(name, port_lists[0], port_lists[1], tuple(gates), origin).validate()


def to_dict(netlist: Netlist) -> dict[str, Any]:
    gates = []
    for g in netlist.ordered_gates:
        d: dict[str, Any] = {"out": g.output, "op": g.op, "in": list(g.inputs)}
        if g.source:
            d["src"] = g.source
        gates.append(d)
    return {"format": FORMAT, "name": netlist.name,
            "inputs": {p.name: p.width for p in netlist.inputs},
            "outputs": {p.name: p.width for p in netlist.outputs},
            "gates": gates}


def dumps(netlist: Netlist) -> str:
    """JSON text with one gate a line, so that diffs of generated designs stay readable."""
    d = to_dict(netlist)
    head = {k: v for k, v in d.items() if k != "gates"}
    lines = [json.dumps(head)[:-1] + ', "gates": [']
    body = [json.dumps(g) for g in d["gates"]]
    lines.append(",\n".join("  " + b for b in body))
    lines.append("]}")
    return "\n".join(lines) + "\n"
