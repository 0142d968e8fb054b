"""Inferring the usual adder spec from a design's port names and widths."""

from __future__ import annotations

from typing import Sequence

from verify.errors import SpecError
from verify.model.netlist import Netlist, Port
from verify.spec.model import Spec, parse
from verify.spec.printer import name_text as _name_text

_CARRY_IN = {"cin", "ci", "c_in", "carry_in", "carryin", "cin0", "cy_in", "cyin"}
_CARRY_OUT = {"cout", "co", "c_out", "carry_out", "carryout", "c", "carry", "cy", "cy_out"}
_SUM = {"s", "sum", "sum0", "s0"}
_OVERFLOW = {"v", "ovf", "overflow", "ov", "vout", "ovfl"}
#: a lone 1-bit input with one of these names is not taken for a carry-in
_CONTROL = {"m", "mode", "sub", "subtract", "add_sub", "addsub", "op", "sel", "select", "s",
            "en", "enable", "neg", "inv", "invert", "ctrl", "cmd"}


def _looks(name: str, names: set[str]) -> bool:
    """Name match ignoring case and a direction prefix or suffix (i_cin, cin_i, o_sum, ...)."""
    n = name.lower()
    candidates = {n}
    for pre in ("i_", "o_", "in_", "out_"):
        if n.startswith(pre):
            candidates.add(n[len(pre):])
    for suf in ("_i", "_o"):
        if n.endswith(suf):
            candidates.add(n[:-len(suf)])
    return bool(candidates & names)


def _plist(ports: Sequence[Port]) -> str:
    return ", ".join(str(p) for p in ports)


def infer(design: Netlist) -> Spec:
    """The usual adder spec for a design, from its port names and widths.

    Refuses (SpecError naming the ports) when the ports do not tell which spec is meant.
    """
    def refuse(why: str) -> SpecError:
        return SpecError(f"cannot infer a spec for {design.name}: {why}; give one with --spec, "
                         "e.g. --spec '{cout, sum} = a + b + cin'", where="spec")

    wide = [p for p in design.inputs if p.width > 1]
    single = [p for p in design.inputs if p.width == 1]
    if len(wide) > 2:
        raise refuse(f"more than two multi-bit inputs ({_plist(wide)})")
    if len(wide) == 1:
        raise refuse(f"only one multi-bit input ({_plist(wide)}); an adder has two operands")
    if len(wide) == 2:
        a, b = wide
        if a.width != b.width:
            raise refuse(f"the two operands have different widths ({_plist(wide)})")
        n = a.width
        if len(single) > 1:
            raise refuse(f"several 1-bit inputs ({_plist(single)}) besides the operands "
                         f"{a.name}, {b.name}: cannot tell which is the carry-in")
        cin = single[0] if single else None
    else:
        n = 1
        if len(single) not in (2, 3):
            raise refuse(f"{len(single)} one-bit input{'s' if len(single) != 1 else ''} "
                         f"({_plist(single) or 'none'}); a 1-bit adder has 2 or 3")
        if len(single) == 2:
            (a, b), cin = single, None
        else:
            named = [p for p in single if _looks(p.name, _CARRY_IN)]
            if len(named) > 1:
                raise refuse(f"several inputs look like a carry-in ({_plist(named)})")
            cin = named[0] if named else single[2]
            a, b = [p for p in single if p is not cin]
    if cin is not None and not _looks(cin.name, _CARRY_IN) and _looks(cin.name, _CONTROL):
        raise refuse(f"the 1-bit input {cin.name} looks like a mode or control bit, not a "
                     "carry-in")

    outs = list(design.outputs)
    full = [p for p in outs if p.width == n + 1]
    summ = [p for p in outs if p.width == n] if n > 1 else []
    ones = [p for p in outs if p.width == 1]
    odd = [p for p in outs if p not in full and p not in summ and p not in ones]
    if odd:
        raise refuse(f"output{'s' if len(odd) > 1 else ''} {_plist(odd)} "
                     f"fit{'s' if len(odd) == 1 else ''} no adder shape for {n}-bit operands")
    terms = f"{_name_text(a.name)} + {_name_text(b.name)}" + (f" + {_name_text(cin.name)}" if cin else "")
    if full:
        if len(outs) > 1:
            raise refuse(f"a result of {n + 1} bits ({_plist(full)}) and other outputs "
                         f"({_plist([p for p in outs if p is not full[0]])})")
        return parse(f"{_name_text(full[0].name)} = {terms}", design, inferred=True)

    carry = [p for p in ones if _looks(p.name, _CARRY_OUT)]
    ovf = [p for p in ones if _looks(p.name, _OVERFLOW)]
    if n == 1:
        named_sum = [p for p in ones if _looks(p.name, _SUM)]
        if len(named_sum) != 1:
            raise refuse(f"the 1-bit outputs ({_plist(ones)}) do not tell which one is the sum "
                         "(name it s or sum, the carry c, co or cout)")
        summ = named_sum
        ones = [p for p in ones if p is not summ[0]]
    elif len(summ) != 1:
        raise refuse(f"expected one {n}-bit sum output, found {len(summ)} ({_plist(summ) or 'none'})")
    unknown = [p for p in ones if p not in carry and p not in ovf]
    if unknown:
        raise refuse(f"1-bit output{'s' if len(unknown) > 1 else ''} {_plist(unknown)} "
                     "named neither as a carry-out (cout, co, c_out, carry_out, c) nor as an "
                     "overflow (v, ovf, overflow, ov)")
    if len(carry) > 1:
        raise refuse(f"several outputs look like a carry-out ({_plist(carry)})")
    if len(ovf) > 1:
        raise refuse(f"several outputs look like an overflow flag ({_plist(ovf)})")
    s = _name_text(summ[0].name)
    lhs = f"{{{_name_text(carry[0].name)}, {s}}}" if carry else s
    text = f"{lhs} = {terms}"
    if ovf:
        signed_terms = f"$signed({_name_text(a.name)}) + $signed({_name_text(b.name)})"
        if cin:
            signed_terms += f" + {_name_text(cin.name)}"
        text += f"; {_name_text(ovf[0].name)} = ({signed_terms}) != $signed({s})"
    return parse(text, design, inferred=True)
