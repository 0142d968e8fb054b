"""Inferring the usual adder spec from a design's port names and widths.

Ports are first gathered into *items*: a port, or a bit-blasted group of 1-bit ports sharing a
stem with indices 0..n-1 (``a_0 .. a_127``, ``a0 .. a127``, ``b[0] .. b[7]``), which stands
for the word ``{a_127, ..., a_0}``. Roles are then read from widths and names. A name is
compared without case and without decoration around its core (``i_a``, ``a_i``, ``op_a``,
``in_b``, ``operand_a``, ``o_sum``, ``sum_o``, ``ow_cout``, ``carry_in``): see :func:`cores`.

When the ports do not tell, the refusal is one sentence saying what was found, with a best-guess
``--spec`` line to write.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Sequence

from verify.errors import SpecError
from verify.model.netlist import Netlist, Port
from verify.spec.model import Spec, parse
from verify.spec.printer import name_text

_CARRY_IN = {"cin", "ci", "c_in", "carry_in", "carryin", "cin0", "cy_in", "cyin", "c0"}
_CARRY_OUT = {"cout", "co", "c_out", "carry_out", "carryout", "c", "carry", "cy", "cy_out",
              "cyout"}
_SUM = {"s", "sum", "sum0", "s0", "res", "result", "out", "y", "f", "r", "z", "dout"}
_OVERFLOW = {"v", "ovf", "overflow", "ov", "vout", "ovfl", "of"}
#: a lone 1-bit input with one of these names is not taken for a carry-in
_CONTROL = {"m", "mode", "sub", "subtract", "add_sub", "addsub", "op", "sel", "select", "s",
            "en", "enable", "neg", "inv", "invert", "ctrl", "cmd"}
#: decoration around a name's core: direction, kind of net, "operand"
_PREFIXES = {"i", "o", "in", "out", "ow", "iw", "w", "r", "ro", "ri", "io", "p", "port", "op",
             "operand", "opnd", "src", "data", "din", "arg", "reg", "wire", "sig"}
_SUFFIXES = {"i", "o", "in", "out", "w", "r", "reg", "wire", "q", "ow", "iw", "port", "sig"}
_OPERAND = re.compile(r"^(?:[abxy]|(?:in|op|operand|src|data|d|i|x)_?(?:[ab]|\d+))$")
_INDEXED = re.compile(r"^(?P<stem>.*?[A-Za-z_$])(?:\[(?P<br>\d+)\]|(?P<num>\d+))$")
_LIST_MAX = 6


def cores(name: str) -> list[str]:
    """The name's possible cores, fewest decorations dropped first: 'i_carry_in' gives
    'i_carry_in', 'carry_in', 'i_carry', 'carry', ... (tokens split at '_')."""
    toks = [t for t in re.split(r"[_.$]+", name.lower()) if t]
    if not toks:
        return [name.lower()]
    starts = [0]
    while starts[-1] < len(toks) - 1 and toks[starts[-1]] in _PREFIXES:
        starts.append(starts[-1] + 1)
    ends = [len(toks)]
    while ends[-1] > 1 and toks[ends[-1] - 1] in _SUFFIXES:
        ends.append(ends[-1] - 1)
    pairs = sorted(((s, e) for s in starts for e in ends if e > s),
                   key=lambda se: se[0] + len(toks) - se[1])
    out: list[str] = []
    for s, e in pairs:
        for core in ("_".join(toks[s:e]), "".join(toks[s:e])):
            if core not in out:
                out.append(core)
    return out


def _is(name: str, names: set[str]) -> bool:
    return any(c in names for c in cores(name))


def _is_operand(name: str) -> bool:
    return any(_OPERAND.match(c) for c in cores(name))


def _operand_key(name: str) -> int | None:
    """a/x first, b/y second, digits by value; None when the name is no operand name."""
    for c in cores(name):
        if _OPERAND.match(c):
            m = re.search(r"\d+$", c)
            return int(m.group()) if m else (0 if c[-1] in "ax" else 1)
    return None


# ==== items: ports and bit-blasted groups ====================================================

@dataclass(frozen=True)
class Item:
    name: str                  # the stem of a group, else the port name
    ports: tuple[Port, ...]    # MSB first for a group
    group: bool

    @property
    def width(self) -> int:
        return len(self.ports) if self.group else self.ports[0].width

    @property
    def label(self) -> str:
        """For messages: 'a[3:0]', 'cin', or 'a_0..a_127' for a group."""
        if self.group:
            return f"{self.ports[-1].name}..{self.ports[0].name}"
        return str(self.ports[0])

    @property
    def parts(self) -> list[str]:
        """Spec text of each piece, MSB first."""
        return [name_text(p.name) for p in self.ports]

    @property
    def text(self) -> str:
        parts = self.parts
        return parts[0] if len(parts) == 1 else "{" + ", ".join(parts) + "}"

    def short(self, lhs: bool = False) -> str:
        """For a message: a long group as '{a_127, ..., a_0}' (to be written out in full)."""
        parts = self.parts
        if len(parts) > 4:
            parts = [parts[0], "...", parts[-1]]
        return ", ".join(parts) if lhs else parts[0] if len(parts) == 1 else "{" + ", ".join(parts) + "}"


def items(ports: Sequence[Port]) -> list[Item]:
    """Ports in design order, each bit-blasted group (1-bit ports ``stem<i>``, ``stem_<i>`` or
    ``stem[<i>]`` with every index 0..n-1, n >= 2) joined into one item at its first port."""
    groups: dict[tuple[str, str], dict[int, Port]] = {}
    for p in ports:
        m = _INDEXED.match(p.name) if p.width == 1 else None
        if m:
            style = "[]" if m.group("br") is not None else "#"
            index = int(m.group("br") if m.group("br") is not None else m.group("num"))
            groups.setdefault((m.group("stem"), style), {})[index] = p
    member: dict[str, Item] = {}
    for (stem, _), by_index in groups.items():
        n = len(by_index)
        if n >= 2 and sorted(by_index) == list(range(n)):
            item = Item(stem.rstrip("_"),
                        tuple(by_index[i] for i in reversed(range(n))), True)
            for p in item.ports:
                member[p.name] = item
    out: list[Item] = []
    for p in ports:
        item = member.get(p.name, Item(p.name, (p,), False))
        if item not in out:
            out.append(item)
    return out


def _plist(found: Sequence[Item]) -> str:
    labels = [i.label for i in found]
    if len(labels) > _LIST_MAX:
        labels = labels[:_LIST_MAX - 1] + [f"... ({len(found)} in all)"]
    return ", ".join(labels)


# ==== inference ==============================================================================

def _guess(ins: list[Item], outs: list[Item]) -> str:
    """A best-guess spec line from whatever the ports offer, for a refusal to show."""
    def pick(pool, test, n):
        named = [i for i in pool if test(i)]
        rest = sorted((i for i in pool if i not in named), key=lambda i: -i.width)
        return (named + rest)[:n]
    one_in = [i for i in ins if i.width == 1]
    cin = next((i for i in one_in if _is(i.name, _CARRY_IN)), None)
    ops = pick([i for i in ins if i is not cin], lambda i: _is_operand(i.name), 2)
    cout = next((i for i in outs if i.width == 1 and _is(i.name, _CARRY_OUT)), None)
    summ = pick([i for i in outs if i is not cout], lambda i: _is(i.name, _SUM), 1)
    if len(ops) < 2 or not summ:
        return "{cout, sum} = a + b + cin"
    rhs = " + ".join(i.short() for i in ops) + (f" + {cin.short()}" if cin else "")
    lhs = "{" + f"{cout.short(True)}, {summ[0].short(True)}" + "}" if cout else summ[0].short()
    line = f"{lhs} = {rhs}"
    ovf = next((i for i in outs if i.width == 1 and i is not cout and _is(i.name, _OVERFLOW)),
               None)
    if ovf is not None and ops[0].width == ops[1].width == summ[0].width:
        signed = " + ".join(f"$signed({i.short()})" for i in ops) + (f" + {cin.short()}" if cin else "")
        line += f"; {ovf.short()} = ({signed}) != $signed({summ[0].short()})"
    return line


def infer(design: Netlist) -> Spec:
    """The usual adder spec for a design, from its port names and widths.

    Refuses (SpecError naming the ports, with a best-guess --spec line) when the ports do not
    tell which spec is meant.
    """
    ins, outs = items(design.inputs), items(design.outputs)

    def refuse(why: str) -> SpecError:
        guess = _guess(ins, outs).replace("'", "\\'")
        return SpecError(f"cannot infer a spec for {design.name}: {why}; give one with --spec, "
                         f"e.g. --spec '{guess}'", where="spec")

    wide = [i for i in ins if i.width > 1]
    single = [i for i in ins if i.width == 1]
    if len(wide) > 2:
        raise refuse(f"more than two multi-bit inputs ({_plist(wide)}): cannot tell which are "
                     "the operands")
    if len(wide) == 1:
        raise refuse(f"only one multi-bit input ({_plist(wide)}); an adder has two operands")
    if len(wide) == 2:
        a, b = wide
        if a.width != b.width:
            raise refuse(f"the two operands have different widths ({_plist(wide)})")
        n = a.width
        if len(single) > 1:
            raise refuse(f"several 1-bit inputs ({_plist(single)}) besides the operands "
                         f"{a.label}, {b.label}: cannot tell which is the carry-in")
        cin = single[0] if single else None
    else:
        n = 1
        if len(single) not in (2, 3):
            raise refuse(f"{len(single)} one-bit input{'s' if len(single) != 1 else ''} "
                         f"({_plist(single) or 'none'}); a 1-bit adder has 2 or 3")
        if len(single) == 2:
            (a, b), cin = single, None
        else:
            named = [i for i in single if _is(i.name, _CARRY_IN)]
            if len(named) > 1:
                raise refuse(f"several inputs look like a carry-in ({_plist(named)})")
            cin = named[0] if named else single[2]
            a, b = [i for i in single if i is not cin]
    if cin is not None and not _is(cin.name, _CARRY_IN) and _is(cin.name, _CONTROL):
        raise refuse(f"the 1-bit input {cin.label} looks like a mode or control bit, not a "
                     "carry-in")
    ka, kb = _operand_key(a.name), _operand_key(b.name)
    if ka is not None and kb is not None and kb < ka:
        a, b = b, a

    full = [i for i in outs if i.width == n + 1]
    summ = [i for i in outs if i.width == n] if n > 1 else []
    ones = [i for i in outs if i.width == 1]
    odd = [i for i in outs if i not in full and i not in summ and i not in ones]
    if odd:
        raise refuse(f"output{'s' if len(odd) > 1 else ''} {_plist(odd)} "
                     f"fit{'s' if len(odd) == 1 else ''} no adder shape for {n}-bit operands")
    terms = f"{a.text} + {b.text}" + (f" + {cin.text}" if cin else "")
    if full:
        if len(outs) > 1:
            raise refuse(f"a result of {n + 1} bits ({_plist(full)}) and other outputs "
                         f"({_plist([i for i in outs if i is not full[0]])})")
        return parse(f"{full[0].text} = {terms}", design, inferred=True)

    carry = [i for i in ones if _is(i.name, _CARRY_OUT)]
    ovf = [i for i in ones if _is(i.name, _OVERFLOW) and i not in carry]
    if n == 1:
        named_sum = [i for i in ones if _is(i.name, _SUM) and i not in carry and i not in ovf]
        if len(named_sum) != 1:
            raise refuse(f"the 1-bit outputs ({_plist(ones)}) do not tell which one is the sum "
                         "(name it s or sum, the carry c, co or cout)")
        summ = named_sum
        ones = [i for i in ones if i is not summ[0]]
    elif len(summ) != 1:
        raise refuse(f"expected one {n}-bit sum output, found {len(summ)} ({_plist(summ) or 'none'})")
    unknown = [i for i in ones if i not in carry and i not in ovf]
    if unknown:
        raise refuse(f"1-bit output{'s' if len(unknown) > 1 else ''} {_plist(unknown)} "
                     "named neither as a carry-out (cout, co, c_out, carry_out, c) nor as an "
                     "overflow (v, ovf, overflow, ov)")
    if len(carry) > 1:
        raise refuse(f"several outputs look like a carry-out ({_plist(carry)})")
    if len(ovf) > 1:
        raise refuse(f"several outputs look like an overflow flag ({_plist(ovf)})")
    s = summ[0]
    lhs = "{" + ", ".join([*carry[0].parts, *s.parts]) + "}" if carry else s.text
    text = f"{lhs} = {terms}"
    if ovf:
        signed_terms = f"$signed({a.text}) + $signed({b.text})"
        if cin:
            signed_terms += f" + {cin.text}"
        text += f"; {ovf[0].text} = ({signed_terms}) != $signed({s.text})"
    return parse(text, design, inferred=True)
