"""Value change dump (IEEE 1364 VCD) files of input vectors run through a design.

One vector per time step: time ``k`` holds vector ``k`` (``$timescale 1 ns``; the file ends with
one more time step so that viewers show the last vector for its full step). The top scope is the
design's name. Ports are vector variables (``a [7:0]``); internal nets are 1-bit variables, put in
nested scopes by the dots of their hierarchical names (``u3.fa.t`` is ``t`` in scope ``u3.fa``),
with a bit index written as a VCD bit select (``G [3]``). A scope ``spec`` beside the ports holds
what the spec expects of each output and ``fails``, 1 in the steps where some output differs.

``write(path, design, vectors, expected=...)`` simulates the vectors (bit-parallel) and writes the
file; ``dumps`` returns the text. ``dumps_timed(waveform, timescale=...)`` writes a timed waveform
of one input transition (``verify.timing.events``): real time stamps, one value change per gate
event, unknown values as ``x``. The text itself is written by pyvcd (``vcd.VCDWriter``).
"""

from __future__ import annotations

import datetime as _dt
import io
import re
from pathlib import Path
from typing import Mapping, Sequence

from verify.model.netlist import Netlist
from verify.sim import Simulator, pack

_BIT = re.compile(r"^(?P<name>.+)\[(?P<index>-?\d+)\]$")
SPEC_SCOPE = "spec"


def _clean(name: str) -> str:
    return re.sub(r"\s+", "_", name) or "_"


class _Var:
    """One variable to declare: its scope path, width, reference text and values."""

    def __init__(self, scope: list[str], width: int, ref: str, values):
        self.scope, self.width, self.ref, self.values = scope, width, ref, values


def _port_ref(name: str, width: int) -> str:
    return _clean(name) + (f" [{width - 1}:0]" if width > 1 else "")


def _net_place(top: str, net: str) -> tuple[list[str], str]:
    """(scope path, reference) of an internal net: dots make scopes, a bit index a bit select."""
    parts = net.split(".")
    scope, leaf = [top, *[_clean(x) for x in parts[:-1] if x]], parts[-1]
    m = _BIT.match(leaf)
    return scope, (f"{_clean(m['name'])} [{m['index']}]" if m else _clean(leaf))


def _header(comment: str | None, notes: Sequence[str]) -> str:
    # the report mark must be on one of the first lines (verify.files looks there)
    lines = ["adder-verify report (vcd)"]
    if comment:
        lines.append(comment.replace("$end", "(end)"))
    lines += [n.replace("$end", "(end)") for n in notes]
    return "\n".join(lines)


def _render(vars_: list[_Var], times: Sequence[int], timescale: str, comment: str,
            date: str | None, end_time: int) -> str:
    """The VCD text (pyvcd): every var's value at each of ``times`` (values[k] at times[k])."""
    from vcd import VCDWriter

    from verify import __version__

    out = io.StringIO()
    stamp = date or _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M:%S UTC")
    with VCDWriter(out, timescale=timescale, date=stamp, comment=comment,
                   version=f"adder-verify {__version__}") as w:
        handles = []
        for v in vars_:
            init = _value(v.values[0], v.width)
            handles.append(w.register_var(v.scope, v.ref, "wire", size=v.width, init=init))
        for k in range(1, len(times)):
            for v, h in zip(vars_, handles):
                if v.values[k] != v.values[k - 1]:
                    w.change(h, times[k], _value(v.values[k], v.width))
        w.close(end_time)
    return out.getvalue()


def _value(v, width: int):
    """A value for pyvcd: an int, or for unknown bits 'x' (a string of 0/1/x for a vector)."""
    if v is None:
        return "x"
    if isinstance(v, str):
        return v
    return int(v)


def dumps(design: Netlist, vectors: Sequence[Mapping[str, int]], *,
          expected: Sequence[Mapping[str, int]] | None = None, internal: bool = True,
          comment: str | None = None, date: str | None = None) -> str:
    """The VCD text for ``vectors`` run through ``design``.

    ``expected`` (one {output port: int} per vector, from the spec) adds the ``spec`` scope.
    ``internal=False`` leaves out the internal nets.
    """
    count = len(vectors)
    if count == 0:
        raise ValueError("a waveform needs at least one vector")
    sim = Simulator(design)
    words = pack(design, vectors)
    nets = sim.run_all(words, (1 << count) - 1)

    def bits_of(word: int) -> list[int]:
        return [word >> j & 1 for j in range(count)]

    def port_values(port) -> list[int]:
        out = [0] * count
        for i, b in enumerate(port.bits):
            w = nets[b]
            for j in range(count):
                if w >> j & 1:
                    out[j] |= 1 << i
        return out

    vars_: list[_Var] = []
    top = _clean(design.name)
    for p in (*design.inputs, *design.outputs):
        vars_.append(_Var([top], p.width, _port_ref(p.name, p.width), port_values(p)))
    if internal:
        port_bits = set(design.input_bits) | set(design.output_bits)
        for g in design.ordered_gates:
            if g.output in port_bits:
                continue
            scope, ref = _net_place(top, g.output)
            vars_.append(_Var(scope, 1, ref, bits_of(nets[g.output])))
    if expected is not None:
        if len(expected) != count:
            raise ValueError("expected needs one entry per vector")
        fails = [0] * count
        for p in design.outputs:
            vals = [int(e[p.name]) for e in expected]
            vars_.append(_Var([top, SPEC_SCOPE], p.width, _port_ref(p.name, p.width), vals))
        actual = {p.name: port_values(p) for p in design.outputs}
        for j, e in enumerate(expected):
            fails[j] = int(any(actual[p.name][j] != int(e[p.name]) for p in design.outputs))
        vars_.append(_Var([top, SPEC_SCOPE], 1, "fails", fails))
    notes = [f"step {j}: " + ", ".join(f"{p.name}={int(v.get(p.name, 0))}" for p in design.inputs)
             for j, v in enumerate(vectors)]
    return _render(vars_, list(range(count)), "1 ns", _header(comment, notes), date, count)


def dumps_timed(wave, *, timescale: str, comment: str | None = None, date: str | None = None,
                marks: Mapping[str, Sequence[tuple[int, int]]] | None = None,
                end_time: int | None = None) -> str:
    """The VCD of a timed waveform (``verify.timing.events.Waveform``), time stamps in ticks.

    Every gate event that changes a net is one value change; unknown values are ``x``. ``marks``
    adds 1-bit variables in a ``marks`` scope, each a list of (time, value).
    """
    design = wave.design
    top = _clean(design.name)
    times = sorted({0, *(t for t, _, _ in wave.changes),
                    *(t for ch in (marks or {}).values() for t, _ in ch)})
    index = {t: k for k, t in enumerate(times)}
    # the value of every net at every listed time (after that time's changes)
    cur = dict(wave.initial)
    at: list[dict] = []
    k = 0
    changes = wave.changes
    for t in times:
        while k < len(changes) and changes[k][0] <= t:
            cur[changes[k][1]] = changes[k][2]
            k += 1
        at.append(dict(cur))

    def port_values(p):
        out = []
        for snap in at:
            bits = [snap[b] for b in p.bits]
            if any(x is None for x in bits):
                out.append("".join("x" if x is None else str(x) for x in reversed(bits)))
            else:
                out.append(sum(x << i for i, x in enumerate(bits)))
        return out

    vars_ = [_Var([top], p.width, _port_ref(p.name, p.width), port_values(p))
             for p in (*design.inputs, *design.outputs)]
    port_bits = set(design.input_bits) | set(design.output_bits)
    for g in design.ordered_gates:
        if g.output not in port_bits:
            scope, ref = _net_place(top, g.output)
            vars_.append(_Var(scope, 1, ref, [snap[g.output] for snap in at]))
    for name, points in (marks or {}).items():
        vals, v, pts = [], 0, sorted(points)
        j = 0
        for t in times:
            while j < len(pts) and pts[j][0] <= t:
                v = pts[j][1]
                j += 1
            vals.append(v)
        vars_.append(_Var([top, "marks"], 1, _clean(name), vals))
    del index
    last = times[-1] if times else 0
    return _render(vars_, times, timescale, _header(comment, []), date,
                   end_time if end_time is not None else last + 1)


def write(path: str | Path, design: Netlist, vectors: Sequence[Mapping[str, int]], **kw) -> Path:
    """Write ``dumps(design, vectors, **kw)`` to ``path`` (folders made as needed)."""
    from verify.files import write_text
    return write_text(path, dumps(design, vectors, **kw), what="waveform", replace_reports=True)
