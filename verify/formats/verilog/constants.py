"""Constant evaluation: literals, parameters and constant expressions at their own width."""

from __future__ import annotations

from pyslang import ast

from verify.model.netlist import CONST0, CONST1
from verify.formats.verilog.common import BO, EK, SK, UO, _CONSTS, _COMPARE


class Constants:
    """Turns constant values into bits and folds constant integer expressions."""

    def const_bits(self, cv, width: int, node) -> list[str]:
        if _is_container(cv):
            # an unpacked array constant: its elements, leftmost first, are stored with the
            # leftmost in the most significant place (as for an assignment pattern)
            elems = list(cv.value)
            if not elems or width % len(elems):
                raise self.unsupported("a constant of this kind", node)
            ew = width // len(elems)
            out: list[str] = []
            for el in reversed(elems):
                out.extend(self.const_bits(el, ew, node))
            return out
        sv = cv
        if not hasattr(sv, "toString") or not hasattr(sv, "bitWidth"):
            try:
                sv = cv.value
            except Exception:
                sv = None
        if sv is None or not hasattr(sv, "toString"):
            raise self.unsupported("a constant of this kind", node)
        bits = []
        xw = None
        for ch in _sv_chars(sv):
            if ch in "01":
                bits.append(ch)
            else:
                if xw is None:
                    xw = self.where(node)
                bits.append(self.xbit(xw, "an x or z value"))
        return self.fit(bits, width, sv.isSigned)

    def const_int(self, e) -> int | None:
        v = self.try_const(e)
        if v is not None:
            t = e.type
            w = t.bitWidth
            if t.isSigned and w and v >> (w - 1) & 1:
                v -= 1 << w
            return v
        bits = self.ev(e)
        if not all(b in _CONSTS for b in bits):
            return None
        v = 0
        for i, b in enumerate(bits):
            if b == CONST1:
                v |= 1 << i
        if e.type.isSigned and bits and bits[-1] == CONST1:
            v -= 1 << len(bits)
        return v

    def try_const(self, e) -> int | None:
        """The value of a constant integer expression as a w-bit pattern (quickly), else None.

        Covers literals, parameters, genvars, loop variables holding constants and the usual
        operators, with the node's own width and signedness (the same rules as the gates).
        """
        cv = e.constant
        k = e.kind
        t = e.type
        if not t.isIntegral:
            return None
        w = t.bitWidth
        mask = (1 << w) - 1
        if cv is not None:
            return _sv_int(cv.value if hasattr(cv, "value") else cv, mask)
        if k == EK.IntegerLiteral:
            return _sv_int(e.value, mask)
        if k == EK.NamedValue:
            sym = e.symbol
            sk = sym.kind
            if sk in (SK.Parameter, SK.EnumValue, SK.Genvar):
                return _sv_int(sym.value.value, mask)
            f = self.frame
            if f is not None:
                vals = f.env.get((self.path, sym))
                if vals is not None and len(vals) == w and all(v in _CONSTS for v in vals):
                    return _to_int(vals, False)
            return None
        if k == EK.Conversion:
            op = e.operand
            if not op.type.isIntegral:
                return None
            v = self.try_const(op)
            if v is None:
                return None
            ow = op.type.bitWidth
            if _extends_signed(e) and ow and v >> (ow - 1) & 1:
                v -= 1 << ow
            return v & mask
        if k == EK.BinaryOp:
            op = e.op
            fn = _CONST_BINARY.get(op)
            if fn is None:
                return None
            lv = self.try_const(e.left)
            if lv is None:
                return None
            rv = self.try_const(e.right)
            if rv is None:
                return None
            lt, rt = e.left.type, e.right.type
            if op in _COMPARE or op in (BO.LogicalAnd, BO.LogicalOr):
                signed = lt.isSigned and rt.isSigned
                if signed:
                    lv, rv = _signed(lv, lt.bitWidth), _signed(rv, rt.bitWidth)
                return int(fn(lv, rv)) & mask
            if op in (BO.Divide, BO.Mod):
                if rv == 0:
                    return None
                if t.isSigned:
                    lv, rv = _signed(lv, w), _signed(rv, w)
                q = abs(lv) // abs(rv)
                if (lv < 0) != (rv < 0):
                    q = -q
                return (q if op == BO.Divide else lv - q * rv) & mask
            if op == BO.ArithmeticShiftRight and t.isSigned:
                return (_signed(lv, w) >> min(rv, w)) & mask
            if op in (BO.LogicalShiftLeft, BO.ArithmeticShiftLeft, BO.LogicalShiftRight,
                      BO.ArithmeticShiftRight):
                return fn(lv, min(rv, w + 1)) & mask
            if op == BO.Power:
                if t.isSigned:
                    lv, rv = _signed(lv, w), _signed(rv, rt.bitWidth) if rt.isSigned else rv
                if rv < 0:
                    return None
                return pow(lv, rv, 1 << w) if w else 0
            return fn(lv, rv) & mask
        if k == EK.UnaryOp:
            op = e.op
            v = self.try_const(e.operand)
            if v is None:
                return None
            if op == UO.Minus:
                return (-v) & mask
            if op == UO.Plus:
                return v & mask
            if op == UO.BitwiseNot:
                return (~v) & mask
            if op == UO.LogicalNot:
                return int(v == 0)
            return None
        if k == EK.ConditionalOp:
            conds = list(e.conditions)
            if len(conds) != 1 or conds[0].pattern is not None:
                return None
            c = self.try_const(conds[0].expr)
            if c is None:
                return None
            v = self.try_const(e.left if c else e.right)
            return None if v is None else v & mask
        return None


def _is_container(cv) -> bool:
    f = getattr(cv, "isContainer", None)
    if f is None:
        return False
    return bool(f() if callable(f) else f)


def _sv_chars(sv) -> list[str]:
    """An SVInt's bits as characters 0/1/x/z, least significant first, bitWidth of them."""
    import pyslang
    s = sv.toString(pyslang.LiteralBase.Binary, False).replace("_", "").lower()
    if "'" in s:
        s = s.split("b", 1)[-1]
    if s.startswith("-"):  # a negative signed value prints with a minus sign: two's complement
        s = format((1 << sv.bitWidth) - int(s[1:], 2), "b")
    if len(s) < sv.bitWidth:
        s = (s[0] if s and s[0] in "xz" else "0") * (sv.bitWidth - len(s)) + s
    return list(reversed(s))[:sv.bitWidth]


def _literal_chars(x, w: int, ext_signed: bool) -> list[str] | None:
    """A case item that is a literal (under conversions): its bits as 0/1/x/z/? at width w."""
    convs = []
    while x.kind == EK.Conversion:
        convs.append(x)
        x = x.operand
    if x.kind == EK.IntegerLiteral:
        chars = _sv_chars(x.value)
        signed = x.type.isSigned
    elif x.kind == EK.UnbasedUnsizedIntegerLiteral:
        lv = x.literalValue
        ch = "x" if lv.isUnknown else ("1" if lv.value else "0")
        return [ch] * w
    elif x.constant is not None and hasattr(x.constant.value, "toString"):
        chars = _sv_chars(x.constant.value)
        signed = x.type.isSigned
    else:
        return None
    for c in reversed(convs):
        cw = c.type.bitWidth
        if len(chars) < cw:
            ext = chars[-1] if chars and _extends_signed(c) else "0"
            chars = chars + [ext] * (cw - len(chars))
        else:
            chars = chars[:cw]
        signed = c.type.isSigned
    if len(chars) < w:
        ext = chars[-1] if chars and signed and ext_signed else "0"
        chars = chars + [ext] * (w - len(chars))
    return chars[:w]


def _sv_int(sv, mask: int) -> int | None:
    """An SVInt without x/z bits as an unsigned pattern masked to ``mask``; None if unknown."""
    if sv is None or not hasattr(sv, "bitWidth") or sv.hasUnknown:
        return None
    chars = _sv_chars(sv)
    v = int("".join(reversed(chars)) or "0", 2)
    if sv.isSigned and chars and chars[-1] == "1":
        v -= 1 << len(chars)
    return v & mask


def _extends_signed(conv) -> bool:
    """Whether a widening conversion copies the sign bit.

    A conversion slang inserts to propagate an expression's type down to an operand (IEEE 1800
    11.8.2: operands take the expression's signedness before they are extended) uses the
    target's signedness; any other (an assignment, a cast, $signed) the operand's own.
    """
    if conv.conversionKind == ast.ConversionKind.Propagated:
        return conv.type.isSigned
    return conv.operand.type.isSigned


def _signed(v: int, w: int) -> int:
    return v - (1 << w) if w and v >> (w - 1) & 1 else v


_CONST_BINARY = {
    BO.Add: lambda a, b: a + b, BO.Subtract: lambda a, b: a - b, BO.Multiply: lambda a, b: a * b,
    BO.Divide: None, BO.Mod: None,
    BO.BinaryAnd: lambda a, b: a & b, BO.BinaryOr: lambda a, b: a | b,
    BO.BinaryXor: lambda a, b: a ^ b,
    BO.Equality: lambda a, b: a == b, BO.Inequality: lambda a, b: a != b,
    BO.CaseEquality: lambda a, b: a == b, BO.CaseInequality: lambda a, b: a != b,
    BO.GreaterThanEqual: lambda a, b: a >= b, BO.GreaterThan: lambda a, b: a > b,
    BO.LessThanEqual: lambda a, b: a <= b, BO.LessThan: lambda a, b: a < b,
    BO.LogicalAnd: lambda a, b: bool(a) and bool(b), BO.LogicalOr: lambda a, b: bool(a) or bool(b),
    BO.LogicalShiftLeft: lambda a, b: a << b, BO.ArithmeticShiftLeft: lambda a, b: a << b,
    BO.LogicalShiftRight: lambda a, b: a >> b, BO.ArithmeticShiftRight: lambda a, b: a >> b,
    BO.Power: None,
}
_CONST_BINARY = {k: (v if v is not None else (lambda a, b: 0)) for k, v in _CONST_BINARY.items()}


def k_has_value(e) -> bool:
    return e.kind == EK.IntegerLiteral


def _to_int(bits: list[str], signed: bool) -> int:
    v = 0
    for i, b in enumerate(bits):
        if b == CONST1:
            v |= 1 << i
    if signed and bits and bits[-1] == CONST1:
        v -= 1 << len(bits)
    return v


def _from_int(v: int, w: int) -> list[str]:
    v &= (1 << w) - 1
    return [CONST1 if v >> i & 1 else CONST0 for i in range(w)]


def _gather(value: int, positions: list[int]) -> int:
    """The bits of ``value`` (two's complement) at ``positions``, packed from bit 0 up."""
    return sum((value >> k & 1) << j for j, k in enumerate(positions))


def _representable(i: int, w: int, signed: bool) -> bool:
    if signed:
        return -(1 << (w - 1)) <= i < (1 << (w - 1)) if w else i == 0
    return 0 <= i < (1 << w)


def _local_name(key, o) -> str:
    sym = key[1]
    return f"{sym.name}[{o}]" if sym.type.bitWidth > 1 else sym.name


