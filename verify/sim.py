"""The netlist compiled once into straight-line bit-parallel Python.

A netlist becomes Python source with one assignment per gate, split into chunk functions of a
few thousand gates each (so a 65,536-gate-deep design compiles), then ``exec``-ed.
Every variable holds a *word*: bit j of the word is the value of that net in vector j. Words are
Python integers (any number of vectors at once; ``M`` is the all-ones mask of the word) or numpy
``uint64`` arrays (64 vectors per element; ``M`` is ``np.uint64(2**64-1)``). The same source serves
both: ``not x`` is written ``x ^ M``.

``Simulator`` simulates one netlist; ``Miter`` simulates a design beside its reference and returns
one word whose set bits are the vectors where any output differs.
"""

from __future__ import annotations

import re
from functools import lru_cache
from typing import Mapping, Sequence

from verify.model.netlist import CONST0, CONST1, Netlist, Port
from verify.model.ops import OPS

Word = int  # or a numpy uint64 array


#: gates per generated function: CPython's compiler recurses over a function's body, so one
#: function per 65,536 gates would exhaust its stack; chunks of this size never do
CHUNK = 2000


def emit(netlist: Netlist, tag: str, inputs: Mapping[str, str]) -> tuple[list[str], dict[str, str]]:
    """Python lines computing every gate of ``netlist``; returns (lines, net -> variable).

    ``inputs`` names the variable holding each input bit; internal variables are ``{tag}{k}``.
    """
    var: dict[str, str] = {CONST0: "0", CONST1: "M", **inputs}
    lines = []
    for k, g in enumerate(netlist.ordered_gates):
        v = f"{tag}{k}"
        lines.append(f"{v} = {OPS[g.op].word([var[i] for i in g.inputs])}")
        var[g.output] = v
    return lines, var


def _input_vars(netlist: Netlist) -> dict[str, str]:
    return {b: f"i{k}" for k, b in enumerate(netlist.input_bits)}


_NAME = re.compile(r"\b[a-z]\d+\b")


def _compile(name: str, args: list[str], lines: list[str], result: list[str], reduce_or: bool = False):
    """Compile straight-line ``lines`` (``var = expr``) into ``name(I, M)``.

    The lines are split into chunk functions of at most ``CHUNK`` lines. Values that cross a
    chunk boundary travel in one dict ``V`` (each chunk loads what it reads from earlier chunks
    into locals and stores what later chunks or the result read). ``result`` lists the variables
    returned as a tuple, or, with ``reduce_or``, OR-ed into one word (one statement per term, so
    no expression nests deeply).
    """
    chunks = [lines[k:k + CHUNK] for k in range(0, len(lines), CHUNK)] or [[]]
    defined_in: dict[str, int] = {a: -1 for a in args}
    reads: list[set[str]] = []
    for c, chunk in enumerate(chunks):
        used: set[str] = set()
        for line in chunk:
            target, expr = line.split(" = ", 1)
            used.update(_NAME.findall(expr))
            defined_in[target] = c
        reads.append(used)
    needed_later: set[str] = set(result)
    stores: list[set[str]] = [set() for _ in chunks]
    loads: list[set[str]] = [set() for _ in chunks]
    for c in range(len(chunks) - 1, -1, -1):
        for v in reads[c]:
            d = defined_in.get(v)
            if d is not None and d != c:
                loads[c].add(v)
                needed_later.add(v)
    for v in needed_later:
        d = defined_in.get(v)
        if d is not None and d >= 0:
            stores[d].add(v)
    src = []
    for c, chunk in enumerate(chunks):
        src.append(f"def _{name}_{c}(V, M):")
        src += [f"    {v} = V[{v!r}]" for v in sorted(loads[c])]
        src += [f"    {line}" for line in chunk]
        src += [f"    V[{v!r}] = {v}" for v in sorted(stores[c])]
        src.append("    return None")
    src.append(f"def {name}(I, M):")
    src.append(f"    V = dict(zip({tuple(args)!r}, I))")
    src += [f"    _{name}_{c}(V, M)" for c in range(len(chunks))]
    value = lambda v: v if v in ("0", "M") else f"V[{v!r}]"  # noqa: E731
    if reduce_or:
        src.append("    out = 0")
        src += [f"    out |= {value(t)}" for t in result]
        src.append("    return out")
    else:
        src.append("    return (" + "".join(value(v) + ", " for v in result) + ")")
    text = "\n".join(src) + "\n"
    scope: dict = {}
    exec(compile(text, f"<{name}>", "exec"), scope)  # noqa: S102 - our own generated code
    return scope[name], text


class Simulator:
    """One netlist, compiled. ``run`` takes one word per input bit (in ``netlist.input_bits``
    order) and returns one word per output bit (``netlist.output_bits`` order)."""

    def __init__(self, netlist: Netlist):
        self.netlist = netlist
        ivars = _input_vars(netlist)
        lines, var = emit(netlist, "g", ivars)
        outs = [var[b] for b in netlist.output_bits]
        self._run, self.source = _compile("simulate", list(ivars.values()), lines, outs)
        self._run_all = None
        self._all_nets: list[str] = []

    @property
    def gate_count(self) -> int:
        return len(self.netlist.gates)

    def run(self, words: Sequence[Word], mask: Word) -> tuple[Word, ...]:
        return self._run(words, mask)

    def run_all(self, words: Sequence[Word], mask: Word) -> dict[str, Word]:
        """Every net's word: inputs, gate outputs (for waveforms and diagnosis)."""
        if self._run_all is None:
            ivars = _input_vars(self.netlist)
            lines, var = emit(self.netlist, "g", ivars)
            self._all_nets = list(self.netlist.input_bits) + [g.output for g in self.netlist.ordered_gates]
            self._run_all, _ = _compile("simulate_all", list(ivars.values()), lines,
                                        [var[n] for n in self._all_nets])
        values = self._run_all(words, mask)
        return dict(zip(self._all_nets, values))

    def evaluate(self, inputs: Mapping[str, int]) -> dict[str, int]:
        """One vector: {input port: int} -> {output port: int}."""
        return self.evaluate_many([inputs])[0]

    def evaluate_many(self, vectors: Sequence[Mapping[str, int]]) -> list[dict[str, int]]:
        words = pack(self.netlist, vectors)
        mask = (1 << len(vectors)) - 1
        outs = self.run(words, mask)
        return unpack(self.netlist, outs, len(vectors))


class Miter:
    """A design and its reference side by side on the same input words.

    ``run(words, mask)`` returns a word with bit j set where vector j makes any output bit of the
    design differ from the reference. Both netlists must have the same input and output ports.
    """

    def __init__(self, design: Netlist, reference: Netlist):
        if [(p.name, p.width) for p in design.inputs] != [(p.name, p.width) for p in reference.inputs]:
            raise ValueError("design and reference inputs differ")
        if sorted((p.name, p.width) for p in design.outputs) != sorted(
                (p.name, p.width) for p in reference.outputs):
            raise ValueError("design and reference outputs differ")
        ivars = _input_vars(design)
        dl, dvar = emit(design, "d", ivars)
        rl, rvar = emit(reference, "r", ivars)
        diffs = [f"x{k} = {dvar[b]} ^ {rvar[b]}" for k, b in enumerate(design.output_bits)]
        self.gate_count = len(design.gates) + len(reference.gates)
        self._run, self.source = _compile("miter", list(ivars.values()), dl + rl + diffs,
                                          [f"x{k}" for k in range(len(diffs))], reduce_or=True)

    def run(self, words: Sequence[Word], mask: Word) -> Word:
        return self._run(words, mask)


@lru_cache(maxsize=4)
def miter_of(design: Netlist, reference: Netlist) -> Miter:
    """The compiled miter of a design and its reference, compiled once however many engines
    (and the shrinker) of one check use it. Netlists are immutable, so the pair is the key."""
    return Miter(design, reference)


# ---- packing vectors into words and back ----------------------------------------------------

def pack(netlist: Netlist, vectors: Sequence[Mapping[str, int]]) -> list[int]:
    """Bit-slice vectors: one Python int per input bit, bit j from vector j."""
    words = []
    for p in netlist.inputs:
        values = [v.get(p.name, 0) for v in vectors]
        for i in range(p.width):
            w = 0
            for j, x in enumerate(values):
                if x >> i & 1:
                    w |= 1 << j
            words.append(w)
    return words


def unpack(netlist: Netlist, outs: Sequence[int], count: int) -> list[dict[str, int]]:
    """Output words back to one {port: int} per vector."""
    return [values_at(netlist.outputs, outs, j) for j in range(count)]


def values_at(ports: Sequence[Port], words: Sequence[Word], j: int) -> dict[str, int]:
    """{port: value} in position j of bit-sliced words (one word per bit, ports in order)."""
    out: dict[str, int] = {}
    k = 0
    for p in ports:
        v = 0
        for i in range(p.width):
            v |= (int(words[k + i]) >> j & 1) << i
        k += p.width
        out[p.name] = v
    return out


def vector_of(netlist: Netlist, words: Sequence[int], j: int) -> dict[str, int]:
    """The input vector held in position j of bit-sliced input words."""
    return values_at(netlist.inputs, words, j)
