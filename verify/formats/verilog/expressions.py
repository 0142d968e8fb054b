"""Expressions to gates: one method per expression kind, dispatched on the node's kind.

Widths and signedness are slang's (IEEE 1800 rules already applied, conversions inserted), so each
node is translated at the width of its own type. Word arithmetic is in verify.model.words.
"""

from __future__ import annotations

from pyslang import ast

from verify.model import words
from verify.model.netlist import CONST0, CONST1
from verify.formats.verilog.drivers import MAX_EXPRESSION_BITS
from verify.formats.verilog.common import (BO, EK, SK, UO, _CONSTS, _COMPARE, _kind_words,
                                           _expr_words)
from verify.formats.verilog.constants import (_extends_signed, _from_int, _gather, _local_name,
                                              _representable, _to_int, k_has_value)
from verify.formats.verilog.common import _MAX_MUL, MAX_NEST


class Expressions:
    """Evaluates an expression to a list of nets, least significant bit first."""

    def fit(self, bits: list[str], width: int, signed: bool) -> list[str]:
        n = len(bits)
        if n == width:
            return bits
        if n > width:
            return bits[:width]
        fill = bits[-1] if (signed and bits) else CONST0
        return bits + [fill] * (width - n)

    def ev(self, e) -> list[str]:
        k = e.kind
        t = e.type.canonicalType
        if t.isIntegral and t.bitWidth > MAX_EXPRESSION_BITS:
            raise self.fail(f"an expression {t.bitWidth:,} bits wide; the limit is "
                            f"{MAX_EXPRESSION_BITS:,} bits (twice the widest port)", e)
        if k == EK.BinaryOp or k == EK.Conversion:
            return self._chain(e)
        fn = self._dispatch.get(k)
        if fn is None:
            raise self.unsupported(_expr_words(e), e)
        self.enter(e)
        try:
            return fn(self, e)
        finally:
            self._nest -= 1

    def enter(self, node) -> None:
        """Count one level of nesting (expression or statement); refuse past MAX_NEST.

        Nesting is translated recursively; left-associative chains of binary operators
        (``a ^ b ^ c ...``, however long) are not, see ``_chain``.
        """
        self._nest += 1
        if self._nest > MAX_NEST:
            self._nest = 0
            raise self.fail(f"an expression or statement nested more than {MAX_NEST} levels deep "
                            f"(long chains such as a ^ b ^ c ... are fine; deeper nesting "
                            f"is not translated)", node)

    _nest = 0

    def _chain(self, e) -> list[str]:
        """A binary operator or conversion, evaluated without recursion along its first operand:
        the left spine of binary operators and conversions is walked down to its first leaf,
        which is evaluated, and the nodes above are applied bottom-up to the value so far (the
        order of evaluation is the recursive one: left operand before right)."""
        spine = []
        n = e
        value = None
        while True:
            if n.kind == EK.BinaryOp and not (n.left.type.isIntegral and n.right.type.isIntegral):
                # an operator on strings or reals: only its constant value can be used
                cv = n.constant
                if cv is None or not n.type.isIntegral:
                    raise self.unsupported(f"an operator on values of type '{n.left.type}' that "
                                           f"is not a constant", n)
                value = self.const_bits(cv, self.width(n.type, n), n)
                break
            if n.kind == EK.BinaryOp:
                spine.append(n)
                n = n.left
            elif n.kind == EK.Conversion and n.operand.kind != EK.Streaming and \
                    n.type.canonicalType.isIntegral and n.operand.type.canonicalType.isIntegral:
                spine.append(n)
                n = n.operand
            else:
                break
        if not spine and value is not None:
            return value
        if not spine:  # a conversion this walk does not take: the general path
            self.enter(e)
            try:
                return self._dispatch[e.kind](self, e)
            finally:
                self._nest -= 1
        if value is None:
            value = self.ev(n)
        self.enter(e)
        try:
            for node in reversed(spine):
                if node.kind == EK.BinaryOp:
                    value = self._binary(node, value)
                else:
                    value = self._conversion(node, value)
        finally:
            self._nest -= 1
        return value

    def _literal(self, e):
        return self.const_bits(e.value if k_has_value(e) else e.constant, self.width(e.type, e), e)

    def _unbased(self, e):
        w = self.width(e.type, e)
        lv = e.literalValue
        if lv.isUnknown:
            x = self.xbit(self.where(e))
            return [x] * w
        return [CONST1 if lv.value else CONST0] * w

    def _named(self, e):
        sym = e.symbol
        sk = sym.kind
        if sk in (SK.Parameter, SK.EnumValue, SK.Genvar, SK.Specparam):
            return self.const_bits(sym.value, self.width(e.type, e), e)
        if sk not in (SK.Net, SK.Variable, SK.FormalArgument):
            raise self.unsupported(f"a reference to {_kind_words(sk)} '{sym.name}'", e)
        r = self.ref(e)
        return self.read(r, e)

    def read(self, r, e) -> list[str]:
        key, bits, offs = r
        f = self.frame
        out = []
        env = None
        if f is not None:
            env = f.env.get(key)
            up = f.parent
            while env is None and up is not None and key not in f.locals:
                env = up.env.get(key)  # a function sees its caller's current values
                up = up.parent
        xw = None
        for o in offs:
            if o is None:
                if xw is None:
                    xw = self.where(e)
                out.append(self.xbit(xw, "a select outside the declared range (x)"))
                continue
            if env is not None:
                v = env[o]
                if v is not None:
                    out.append(v)
                    continue
            if f is not None:
                if key in f.locals:
                    raise self.fail(f"'{_local_name(key, o)}' is read before it is assigned", e)
                rd = f.reads.get(key)
                if rd is None:
                    f.reads[key] = ({o}, self.where(e))
                else:
                    rd[0].add(o)
            self.outside_reads.add(key)
            out.append(self.res(bits[o]))
        return out

    def _hier(self, e):
        if e.constant is not None:
            return self.const_bits(e.constant, self.width(e.type, e), e)
        raise self.unsupported(f"hierarchical reference '{e.symbol.name}'", e)

    def _select(self, e):
        r = self.ref(e)
        if r is not None:
            return self.read(r, e)
        # a select from a computed value, or with an index that is not constant
        base = self.ev(e.value)
        sel = self.select_positions(e)
        if sel is not None:
            xw = self.where(e)
            return [base[i] if i is not None else self.xbit(xw, "a select outside the declared range (x)")
                    for i in sel]
        return self.dynamic_select(e, base)

    def dynamic_select(self, e, base: list[str]) -> list[str]:
        if e.kind != EK.ElementSelect:
            if e.selectionKind == ast.RangeSelectionKind.Simple:
                raise self.unsupported("a part select with bounds that are not constant", e)
            wd = self.const_int(e.right)
            if wd is None:  # pragma: no cover - slang requires a constant width
                raise self.unsupported("an indexed part select whose width is not constant", e)
            idx_expr = e.left
            up = e.selectionKind == ast.RangeSelectionKind.IndexedUp
        else:
            idx_expr, wd, up = e.selector, None, True
        vt = e.value.type.canonicalType
        if vt.kind in (SK.PackedArrayType, SK.FixedSizeUnpackedArrayType):
            r, ew = vt.range, self.width(vt.elementType, e)
        else:
            r, ew = vt.fixedRange, 1
        desc = r.left >= r.right
        n = r.width
        sel = self.ev(idx_expr)
        signed = idx_expr.type.isSigned
        out_w = self.width(e.type, e)
        b = self.b
        xw = self.where(e)
        result = None
        sw = len(sel)
        lo_i, hi_i = min(r.left, r.right), max(r.left, r.right)

        def selects_something(i: int) -> bool:
            if e.kind == EK.ElementSelect:
                return lo_i <= i <= hi_i
            return lo_i - (out_w // ew) + 1 <= i <= hi_i

        free = [k for k, x in enumerate(sel) if x not in _CONSTS]
        if len(free) <= 12:
            # the index has few bits that are not constant (k*4, {k, 2'b00}, ...): enumerate
            # exactly the values it can take
            fixed = sum(1 << k for k, x in enumerate(sel) if x == CONST1)
            values = set()
            for m in range(1 << len(free)):
                v = fixed | sum((m >> j & 1) << k for j, k in enumerate(free))
                if signed and sw and v >> (sw - 1) & 1:
                    v -= 1 << sw
                values.add(v)
            candidates = sorted(i for i in values if selects_something(i))
            every_value_covered = len(candidates) == len(values)
        else:
            candidates = [i for i in range(lo_i - (out_w // ew) + 1, hi_i + 1)
                          if selects_something(i) and _representable(i, sw, signed)]
            every_value_covered = sw < 30 and len(candidates) == 1 << sw
        for count, i in enumerate(candidates):
            if e.kind == EK.ElementSelect:
                idxs = [i]
            else:
                idxs = list(range(i, i + wd)) if up else list(range(i - wd + 1, i + 1))
            bits: list[str] = []
            for j in sorted(idxs, key=lambda j: (j - r.right) if desc else (r.right - j)):
                p = (j - r.right) if desc else (r.right - j)
                if 0 <= p < n:
                    bits.extend(base[p * ew:(p + 1) * ew])
                else:
                    x = self.xbit(xw, "a select outside the declared range (x)")
                    bits.extend([x] * ew)
            if result is None:
                if every_value_covered:
                    result = bits  # every index value is covered: the first is the default
                    continue
                x = self.xbit(xw, "a select outside the declared range (x)")
                result = [x] * out_w
            hit = self.eq_const([sel[k] for k in free], _gather(i, free))
            result = [b.mux(hit, d0, d1) for d0, d1 in zip(result, bits)]
        if result is None:
            x = self.xbit(xw, "a select outside the declared range (x)")
            result = [x] * out_w
        return result

    def eq_const(self, bits: list[str], value: int) -> str:
        return words.equal_const(self.b, bits, value)

    def _concat(self, e):
        out: list[str] = []
        for op in reversed(list(e.operands)):
            if op.type.canonicalType.isVoid if hasattr(op.type.canonicalType, "isVoid") else False:
                continue
            out.extend(self.ev(op))
        return out

    def _replication(self, e):
        n = self.const_int(e.count)
        if n is None or n < 0:  # pragma: no cover - slang requires a constant count
            raise self.unsupported("a replication count that is not a constant", e)
        inner = self.ev(e.concat) if n else []
        return inner * n

    def _conversion(self, e, operand: list[str] | None = None):
        op = e.operand
        t = e.type.canonicalType
        if op.kind == EK.Streaming:
            raise self.unsupported("streaming concatenation ({<<{...}} / {>>{...}})", op)
        if not t.isIntegral or not op.type.canonicalType.isIntegral:
            if t.kind == SK.FixedSizeUnpackedArrayType and op.type.canonicalType.kind == t.kind:
                return self.ev(op)
            raise self.unsupported(f"conversion from '{op.type}' to '{e.type}'", e)
        bits = self.ev(op) if operand is None else operand
        out = self.fit(bits, self.width(t, e), _extends_signed(e))
        if not t.isFourState and self.xnets:
            out = [CONST0 if x in self.xnets else x for x in out]  # 4-state to 2-state: x is 0
        return out

    def _empty_arg(self, e):
        if self._empty is None:  # pragma: no cover
            raise self.unsupported("an empty argument", e)
        return list(self._empty)

    def _lvalue_ref(self, e):
        if self._lvref is None:  # pragma: no cover
            raise self.unsupported("this compound assignment", e)
        return list(self._lvref)

    _lvref: list[str] | None = None

    def _conditional(self, e):
        conds = list(e.conditions)
        if len(conds) != 1 or conds[0].pattern is not None:
            raise self.unsupported("a conditional with patterns (matches)", e)
        c = self.truth(self.ev(conds[0].expr))
        w = self.width(e.type, e)
        if c == CONST1:
            return self.ev(e.left)
        if c == CONST0:
            return self.ev(e.right)
        t = self.fit(self.ev(e.left), w, e.left.type.isSigned)
        f = self.fit(self.ev(e.right), w, e.right.type.isSigned)
        b = self.b
        return [b.mux(c, d0, d1) for d1, d0 in zip(t, f)]

    def truth(self, bits: list[str]) -> str:
        return self.b.or_(*bits) if bits else CONST0

    def _unary(self, e):
        op = e.op
        b = self.b
        if op in (UO.Preincrement, UO.Predecrement, UO.Postincrement, UO.Postdecrement):
            return self.incdec(e)
        x = self.ev(e.operand)
        if op == UO.Plus:
            return x
        if op == UO.BitwiseNot:
            return [b.not_(v) for v in x]
        if op == UO.Minus:
            return self.negate(x)
        if op == UO.LogicalNot:
            return self.fit([b.not_(self.truth(x))], self.width(e.type, e), False)
        red = {UO.BitwiseAnd: ("and", False), UO.BitwiseOr: ("or", False),
               UO.BitwiseXor: ("xor", False), UO.BitwiseNand: ("and", True),
               UO.BitwiseNor: ("or", True), UO.BitwiseXnor: ("xor", True)}
        if op in red:
            g, inv = red[op]
            v = {"and": b.and_, "or": b.or_, "xor": b.xor_}[g](*x)
            return self.fit([b.not_(v) if inv else v], self.width(e.type, e), False)
        raise self.unsupported(f"unary operator {op.name}", e)  # pragma: no cover

    def negate(self, x: list[str]) -> list[str]:
        return words.negate(self.b, x)

    def _binary(self, e, left: list[str] | None = None):
        """``left``: the value of the left operand when the caller has already evaluated it."""
        op = e.op
        b = self.b
        w = self.width(e.type, e)
        if op in (BO.LogicalAnd, BO.LogicalOr, BO.LogicalImplication, BO.LogicalEquivalence):
            l = self.truth((self.ev(e.left) if left is None else left))
            if op == BO.LogicalAnd and l == CONST0:
                return self.fit([CONST0], w, False)
            if op == BO.LogicalOr and l == CONST1:
                return self.fit([CONST1], w, False)
            r = self.truth(self.ev(e.right))
            v = {BO.LogicalAnd: lambda: b.and_(l, r), BO.LogicalOr: lambda: b.or_(l, r),
                 BO.LogicalImplication: lambda: b.or_(b.not_(l), r),
                 BO.LogicalEquivalence: lambda: b.not_(b.xor_(l, r))}[op]()
            return self.fit([v], w, False)
        if op in (BO.LogicalShiftLeft, BO.LogicalShiftRight, BO.ArithmeticShiftLeft,
                  BO.ArithmeticShiftRight):
            return self.shift(e, op, w, left)
        if op == BO.Power:
            return self.power(e, w, left)
        lt, rt = e.left.type, e.right.type
        if op in _COMPARE:
            cw = max(self.width(lt, e), self.width(rt, e))
            signed = lt.isSigned and rt.isSigned
            l = self.fit((self.ev(e.left) if left is None else left), cw, lt.isSigned)
            r = self.fit(self.ev(e.right), cw, rt.isSigned)
            return self.fit([self.compare(op, l, r, signed, e)], w, False)
        l = self.fit((self.ev(e.left) if left is None else left), w, lt.isSigned)
        r = self.fit(self.ev(e.right), w, rt.isSigned)
        if op == BO.BinaryAnd:
            return [b.and_(x, y) for x, y in zip(l, r)]
        if op == BO.BinaryOr:
            return [b.or_(x, y) for x, y in zip(l, r)]
        if op == BO.BinaryXor:
            return [b.xor_(x, y) for x, y in zip(l, r)]
        if op == BO.BinaryXnor:
            return [b.not_(b.xor_(x, y)) for x, y in zip(l, r)]
        if op == BO.Add:
            return words.add(b, l, r)[0]
        if op == BO.Subtract:
            return words.subtract(b, l, r)[0]
        if op == BO.Multiply:
            return self.multiply(l, r, e)
        if op in (BO.Divide, BO.Mod):
            return self.divide(e, op, l, r, w)
        raise self.unsupported(f"binary operator {op.name}", e)  # pragma: no cover

    def compare(self, op, l: list[str], r: list[str], signed: bool, e) -> str:
        if op in (BO.WildcardEquality, BO.WildcardInequality):
            raise self.unsupported("wildcard equality (==? / !=?)", e)
        return words.compare(self.b, _COMPARE_TEXT[op], l, r, signed)

    def multiply(self, l: list[str], r: list[str], e) -> list[str]:
        w = len(l)
        if w > _MAX_MUL and not (all(x in _CONSTS for x in l) or all(x in _CONSTS for x in r)):
            raise self.unsupported(f"a {w}-bit multiplication (the limit is {_MAX_MUL} bits)", e)
        return words.multiply(self.b, l, r)

    def divide(self, e, op, l, r, w) -> list[str]:
        if all(x in _CONSTS for x in l + r):
            lv, rv = _to_int(l, e.left.type.isSigned), _to_int(r, e.right.type.isSigned)
            if rv == 0:
                x = self.xbit(self.where(e), "a division by zero (x)")
                return [x] * w
            q = abs(lv) // abs(rv)
            if (lv < 0) != (rv < 0):
                q = -q
            v = q if op == BO.Divide else lv - q * rv
            return _from_int(v, w)
        rv = _to_int(r, e.right.type.isSigned) if all(x in _CONSTS for x in r) else None
        if rv is not None and rv > 0 and rv & (rv - 1) == 0 and not e.type.isSigned:
            k = rv.bit_length() - 1
            if op == BO.Divide:
                return l[k:] + [CONST0] * k
            return l[:k] + [CONST0] * (w - k)
        raise self.unsupported("division or modulo by a value that is not a constant power of two", e)

    def power(self, e, w, left: list[str] | None = None) -> list[str]:
        l = self.ev(e.left) if left is None else left
        r = self.ev(e.right)
        if all(x in _CONSTS for x in l + r):
            lv, rv = _to_int(l, e.left.type.isSigned), _to_int(r, e.right.type.isSigned)
            if rv < 0:
                v = 1 if lv == 1 else (1 if rv % 2 == 0 else -1) if lv == -1 else 0
            else:
                v = pow(lv, rv, 1 << w)
            return _from_int(v, w)
        if all(x in _CONSTS for x in l) and _to_int(l, False) == 2 and not e.right.type.isSigned:
            sh = [CONST1] + [CONST0] * (w - 1)
            return self.barrel(sh, r, left=True, fill=CONST0)
        raise self.unsupported("the power operator '**' with operands that are not constants", e)

    def shift(self, e, op, w, first: list[str] | None = None) -> list[str]:
        x = self.fit(self.ev(e.left) if first is None else first, w, e.left.type.isSigned)
        amount = self.ev(e.right)
        arith = op == BO.ArithmeticShiftRight and e.type.isSigned
        fill = x[-1] if (arith and x) else CONST0
        left = op in (BO.LogicalShiftLeft, BO.ArithmeticShiftLeft)
        if all(a in _CONSTS for a in amount):
            n = _to_int(amount, False)  # the shift amount is always treated as unsigned
            return words.shift_const(x, n, left=left, fill=fill)
        return self.barrel(x, amount, left=left, fill=fill)

    def barrel(self, x: list[str], amount: list[str], *, left: bool, fill: str) -> list[str]:
        return words.shift(self.b, x, amount, left=left, fill=fill)

    def _inside(self, e):
        l = self.ev(e.left)
        hits = []
        for item in e.rangeList:
            if item.kind == EK.ValueRange:
                raise self.unsupported("a value range in 'inside'", item)
            r = self.fit(self.ev(item), len(l), item.type.isSigned)
            hits.append(self.compare(BO.Equality, l, r, False, e))
        return self.fit([self.truth(hits)], self.width(e.type, e), False)

    def _call(self, e):
        if e.constant is not None:
            return self.const_bits(e.constant, self.width(e.type, e), e)
        if e.isSystemCall:
            name = e.subroutineName
            args = list(e.arguments)
            if name in ("$signed", "$unsigned") and len(args) == 1:
                return self.fit(self.ev(args[0]), self.width(e.type, e), False)
            raise self.unsupported(f"system function '{name}' on values that are not constant", e)
        sub = e.subroutine
        if sub.flags & ast.MethodFlags.DPIImport:
            raise self.unsupported(f"a call of the DPI import '{sub.name}' (C code)", e)
        if sub.subroutineKind != ast.SubroutineKind.Function:
            raise self.unsupported(f"task call '{sub.name}'", e)
        return self.inline_function(sub, list(e.arguments), e)

    def _assignment_expr(self, e):
        raise self.unsupported("an assignment used inside an expression", e)

    def _member(self, e):
        r = self.ref(e)
        if r is not None:
            return self.read(r, e)
        lo, hi = self.member_span(e)
        return self.ev(e.value)[lo:hi]

    def _pattern(self, e):
        """An assignment pattern ('{a, b}, '{default: ..., 1: ...}, '{n{...}}): slang lists the
        resulting elements left to right, so the value is their concatenation, the first
        element in the most significant place (like {a, b})."""
        elems = list(e.elements)
        if e.kind == EK.ReplicatedAssignmentPattern:
            n = self.const_int(e.count)
            if n is None or n < 0:  # pragma: no cover - slang requires a constant count
                raise self.unsupported("a replication count that is not a constant", e)
            elems = elems * n
        out: list[str] = []
        for op in reversed(elems):
            out.extend(self.ev(op))
        return self.fit(out, self.width(e.type, e), False)

    def _streaming(self, e):
        raise self.unsupported("streaming concatenation", e)



_COMPARE_TEXT = {BO.Equality: "==", BO.CaseEquality: "==", BO.Inequality: "!=",
                 BO.CaseInequality: "!=", BO.LessThan: "<", BO.LessThanEqual: "<=",
                 BO.GreaterThan: ">", BO.GreaterThanEqual: ">="}

Expressions._dispatch = {
    EK.IntegerLiteral: Expressions._literal,
    EK.UnbasedUnsizedIntegerLiteral: Expressions._unbased,
    EK.NamedValue: Expressions._named,
    EK.HierarchicalValue: Expressions._hier,
    EK.ElementSelect: Expressions._select,
    EK.RangeSelect: Expressions._select,
    EK.Concatenation: Expressions._concat,
    EK.Replication: Expressions._replication,
    EK.Conversion: Expressions._conversion,
    EK.EmptyArgument: Expressions._empty_arg,
    EK.LValueReference: Expressions._lvalue_ref,
    EK.ConditionalOp: Expressions._conditional,
    EK.UnaryOp: Expressions._unary,
    EK.BinaryOp: Expressions._binary,
    EK.Inside: Expressions._inside,
    EK.Call: Expressions._call,
    EK.Assignment: Expressions._assignment_expr,
    EK.MemberAccess: Expressions._member,
    EK.Streaming: Expressions._streaming,
    EK.SimpleAssignmentPattern: Expressions._pattern,
    EK.StructuredAssignmentPattern: Expressions._pattern,
    EK.ReplicatedAssignmentPattern: Expressions._pattern,
}
