"""Establishing a repair: a change is offered as one that fixes the design only when a complete
engine has shown the changed design meets the spec.

A change is a new netlist: one gate replaced (another op, an inverted input, an input from
another net, one more input, a constant), or nets renamed everywhere (two output bits swapped, an
operand's bits permuted). ``establish`` runs the exhaustive engine when the input space is small,
else z3 within a short time limit; what it returns says how strongly the repair stands:

* ``exhaustive`` / ``proven``: every input (or z3's unsat) - the changed design meets the spec;
* ``sampled``: the complete engine gave no answer in time; the change is consistent with the
  vectors simulated, nothing more;
* ``refuted``: the complete engine found an input the changed design still gets wrong.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Mapping

from verify.errors import InputError, NetlistError
from verify.model.netlist import Gate, Netlist

#: input bits up to which a repair is checked by simulating every input
REPAIR_EXHAUSTIVE_BITS = 20
#: seconds z3 gets to prove one repair
REPAIR_TIME_LIMIT = 10.0
#: most repairs handed to a complete engine per diagnosis
MAX_ESTABLISH = 8


@dataclass
class Change:
    """One candidate repair: the text shown, its kind, and how to make the changed design."""

    text: str
    kind: str  # op, invert, source, missing, const, stuck, swap-outputs, permute-operand
    gate: Gate | None = None  # the replacement gate (for changes at one gate)
    rename: Mapping[str, str] | None = None  # net renaming (for permutations)
    word: int | None = None  # the net's word over the diagnosis vectors with this change
    extra: tuple = ()  # gates the change adds (an inverter)
    parts: tuple = ()  # changes made together (one per fault)

    @property
    def concrete(self) -> bool:
        """True when the change says how to make the changed design (not only what is wrong)."""
        if self.parts:
            return all(p.concrete for p in self.parts)
        return self.gate is not None or bool(self.rename)

    def apply(self, design: Netlist) -> Netlist | None:
        """The changed design, or None when the change makes no valid netlist (a loop)."""
        if self.parts:
            for p in self.parts:
                design = p.apply(design)
                if design is None:
                    return None
            return design
        if self.gate is not None:
            gates = tuple(self.gate if g.output == self.gate.output else g
                          for g in design.gates) + tuple(self.extra)
        else:
            r = dict(self.rename or {})
            gates = tuple(Gate(g.op, tuple(r.get(i, i) for i in g.inputs), r.get(g.output, g.output),
                               g.source) for g in design.gates)
        try:
            return Netlist(design.name, design.inputs, design.outputs, gates,
                           design.origin).validate()
        except NetlistError:
            return None


def establish(design: Netlist, spec, change: Change, *, vectors: int,
              time_limit: float = REPAIR_TIME_LIMIT,
              exhaustive_bits: int = REPAIR_EXHAUSTIVE_BITS) -> dict:
    """{change, established_by, vectors}: how far a complete engine backs ``change``.

    ``vectors`` is how many diagnosis vectors the change was already seen to be right on.
    ``established_by`` is ``exhaustive``, ``proven``, ``sampled`` or ``refuted``.
    """
    from verify.engines import Options
    from verify.engines import exhaustive, smt

    fixed = change.apply(design) if change.concrete else None
    out = {"change": change.text, "kind": change.kind, "established_by": "sampled",
           "vectors": vectors}
    if fixed is None:
        out["established_by"] = "refuted" if change.concrete else "sampled"
        return out
    n = design.input_width
    try:
        if n <= exhaustive_bits:
            got = exhaustive.run(fixed, spec, Options(exhaustive_limit=exhaustive_bits,
                                                      timeout=max(time_limit, 30.0)))
            status, by = got.status, "exhaustive"
            if status == "pass":
                out["vectors"] = 1 << n
        else:
            got = smt.run(fixed, spec, Options(timeout=time_limit))
            status, by = got.status, "proven"
    except InputError:  # a spec with no gate-level reference: the vectors are all there is
        return out
    if status == "pass":
        out["established_by"] = by
    elif status == "fail":
        out["established_by"] = "refuted"
        out["counterexample"] = got.counterexample.to_json() if got.counterexample else None
    return out


def wording(repair: Mapping) -> str:
    """The sentence a report prints for a repair, as strong as its evidence and no stronger."""
    by = repair["established_by"]
    if repair.get("kind") in ("swap-outputs", "permute-operand"):
        back = {"exhaustive": f"putting them back makes the design meet the spec on all "
                              f"{repair['vectors']:,} inputs (exhaustive)",
                "proven": "putting them back makes the design meet the spec (proven by z3)",
                "sampled": f"putting them back is consistent with the {repair['vectors']:,} "
                           f"vectors simulated (not established by a complete engine)"}
        if by in back:
            return f"{repair['change']}: {back[by]}"
    if by == "exhaustive":
        return (f"this change makes the design meet the spec on all {repair['vectors']:,} inputs "
                f"(exhaustive): {repair['change']}")
    if by == "proven":
        return f"this change makes the design meet the spec (proven by z3): {repair['change']}"
    if by == "sampled":
        return (f"a change consistent with the {repair['vectors']:,} vectors simulated "
                f"(not established by a complete engine): {repair['change']}")
    return f"the change '{repair['change']}' does not repair the design"


def permutation_changes(design: Netlist, expected: Mapping[str, int],
                        values: Mapping[str, int]) -> list[Change]:
    """Output bits in the wrong places: when every output bit's word equals some expected output
    bit's word one to one, the renaming that puts them right (swap, reversal or shift)."""
    changes = []
    for p in design.outputs:
        bits = p.bits
        if len(bits) < 2:
            continue
        where: dict[str, str] = {}
        by_word: dict[int, list[str]] = {}
        for b in bits:
            by_word.setdefault(expected[b], []).append(b)
        for b in bits:
            cands = by_word.get(values[b], [])
            if len(cands) != 1:
                break
            where[b] = cands[0]
        else:
            moved = {b: t for b, t in where.items() if b != t}
            if moved and sorted(moved.values()) == sorted(moved):
                changes.append(Change(_describe_move(p, moved), "swap-outputs", rename=moved))
    return changes


def operand_changes(design: Netlist, words: list[int], mask: int, miter_run,
                    lowest_wrong: int | None) -> list[Change]:
    """Operand bits read in the wrong place: transpositions within one input port (aimed at the
    lowest wrong sum position), reversal and shifts by one, kept when the permuted inputs make
    every output right on the diagnosis vectors. ``miter_run(words)`` is the failing word."""
    index = {b: k for k, b in enumerate(design.input_bits)}
    changes = []
    for p in design.inputs:
        w = p.width
        if w < 2:
            continue
        bits = p.bits
        perms: list[tuple[str, dict[int, int]]] = []
        firsts = [lowest_wrong] if lowest_wrong is not None and lowest_wrong < w else range(w)
        for i in firsts:
            for j in range(w):
                if j != i:
                    perms.append(("swap", {i: j, j: i}))
        perms.append(("reverse", {i: w - 1 - i for i in range(w)}))
        for i_perm_kind, perm in perms:
            trial = list(words)
            for i, j in perm.items():
                trial[index[bits[i]]] = words[index[bits[j]]]
            if miter_run(trial) == 0:
                rename = {bits[i]: bits[j] for i, j in perm.items() if i != j}
                if i_perm_kind == "swap":
                    a, b = sorted(perm)
                    text = f"{bits[a]} and {bits[b]} are swapped where the design reads them"
                else:
                    text = f"the bits of {p.name} are read in reverse order"
                changes.append(Change(text, "permute-operand", rename=rename))
                if len(changes) >= 2:
                    return changes
    return changes


def _describe_move(p, moved: Mapping[str, str]) -> str:
    if len(moved) == 2:
        x, y = sorted(moved, key=p.bits.index)
        return f"{x} and {y} are swapped"
    idx = {b: i for i, b in enumerate(p.bits)}
    shifts = {idx[t] - idx[b] for b, t in moved.items()}
    if all(idx[t] == p.width - 1 - idx[b] for b, t in moved.items()):
        return f"the bits of {p.name} are in reverse order"
    if len(shifts) == 1:
        s = shifts.pop()
        return f"the bits of {p.name} are shifted by {abs(s)} toward the {'top' if s > 0 else 'bottom'}"
    pairs = ", ".join(f"{b} -> {t}" for b, t in moved.items())
    return f"output bits of {p.name} are in the wrong places ({pairs})"
