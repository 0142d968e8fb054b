"""Translate a design elaborated by pyslang into the netlist model, bit by bit.

Every Verilog net or variable bit gets a *placeholder* net named after it (``u_pre.gen[2].g[5]``);
a continuous assignment, a port connection or the end of a combinational block *drives* the
placeholder with the net holding its value. Reads look the driver up eagerly (so constants fold
through wires) and fall back to the placeholder when the driver comes later in the source. At the
end, each gate output that a placeholder names is renamed after it, every other placeholder is
replaced by its value, and the output ports are connected.

Expression widths and signedness are slang's: slang has already applied the IEEE 1800 rules and
inserted a conversion wherever an operand is extended or truncated, so each node is translated at
the width of its own type.

Values are lists of nets, least significant bit first. Unpacked arrays are stored flat: element
position k (counted from the right-hand bound of the declared range) holds bits k*w .. k*w+w-1.
"""

from __future__ import annotations

import re

from pyslang import ast

from verify.model.builder import GateBuilder
from verify.errors import InputError, NetlistError
from verify.model.netlist import CONST0, CONST1, Gate, Port, bit_name

EK = ast.ExpressionKind
SK = ast.SymbolKind
STK = ast.StatementKind
BO = ast.BinaryOperator
UO = ast.UnaryOperator

_CONSTS = (CONST0, CONST1)
_MAX_LOOP = 1 << 16
_MAX_MUL = 128  # widest '*' translated into gates


class _Frame:
    """The state of one combinational block (or one inlined function call) being executed."""

    def __init__(self, where: str | None, event_keys: dict | None = None):
        self.env: dict[tuple, list] = {}
        self.written: dict[tuple, set[int]] = {}
        self.reads: dict[tuple, tuple[set[int], str | None]] = {}
        self.locals: set[tuple] = set()
        self.where = where
        self.nonblocking: dict[tuple, list] = {}
        self.event_keys = event_keys
        self.returned = False
        self.parent: _Frame | None = None  # the caller's frame, for an inlined function
        # inside loops: the condition (a net) under which this path has left the loop (break)
        # or the rest of this iteration (continue); writes are guarded by neither being true
        self.brk = CONST0
        self.cont = CONST0
        self.loops = 0
        self.first_write: dict[tuple, str | None] = {}


class _Builder(GateBuilder):
    """GateBuilder that keeps Verilog's x semantics while folding.

    Every fold GateBuilder makes is also right for an x input (x & 0 is 0, x | 1 is 1, ~~x is x,
    s ? d : d is d) except one: a ^ a is x, not 0, when a is x. Nets that carry an x (the x
    literals and every gate fed by one) are tracked, and for them that fold is not made, so that
    the check for x reaching an output sees exactly what a simulator would.
    """

    def __init__(self, *args, **kwargs):
        super().__init__(*args, **kwargs)
        self.tainted: set[str] = set()

    def gate(self, op: str, *inputs: str, out: str | None = None) -> str:
        tainted = self.tainted
        hit = any(i in tainted for i in inputs)
        if hit and op in ("xor", "xnor") and len(set(inputs)) < len(inputs):
            net = out if out is not None else self.fresh()
            g = Gate(op, tuple(inputs), net, self.source)
            self.gates.append(g)
            tainted.add(net)
            return net
        before = len(self.gates)
        net = super().gate(op, *inputs, out=out)
        if hit and len(self.gates) > before and self.gates[-1].output == net:
            tainted.add(net)
        return net


class Translator:
    def __init__(self, locator, origin: str):
        self.loc = locator
        self.origin = origin
        self.b = _Builder(prefix="$", fold=True, share=False)
        self.sigs: dict[tuple, list[str]] = {}
        self.sig_where: dict[str, str | None] = {}  # placeholder -> where declared
        self.placeholders: dict[str, None] = {}  # ordered set
        self.alias: dict[str, str] = {}
        self.alias_where: dict[str, str | None] = {}
        self.conflicts: dict[str, str] = {}
        self.xnets: dict[str, str | None] = {}
        self.path = ""  # instance path prefix of the scope being translated, "" or "u1.u2."
        self.inst_hp = ""  # slang hierarchical path of that instance
        self.frame: _Frame | None = None
        self._empty: list[str] | None = None  # the port value inside an output connection
        self._xcount = 0

    # ==== errors and locations ==========================================================
    def where(self, node) -> str | None:
        loc = None
        if hasattr(node, "sourceRange"):
            try:
                loc = node.sourceRange.start
            except Exception:  # pragma: no cover
                loc = None
        if loc is None and hasattr(node, "location"):
            loc = node.location
        return self.loc.where(loc) if loc is not None else None

    def fail(self, message: str, node=None, where: str | None = None) -> InputError:
        return InputError(message, where or (self.where(node) if node is not None else None)
                          or self.origin)

    def unsupported(self, what: str, node) -> InputError:
        return self.fail(f"{what} is not supported", node)

    def set_source(self, node) -> None:
        w = self.where(node)
        line = w.rsplit(":", 1)[0] if w else None
        inst = self.path[:-1] if self.path else ""
        self.b.source = (f"{line} {inst}" if inst else line) if line else (inst or None)

    # ==== signals =======================================================================
    def width(self, t, node=None) -> int:
        ct = t.canonicalType
        if ct.isIntegral:
            return ct.bitWidth
        if ct.kind == SK.FixedSizeUnpackedArrayType:
            return ct.range.width * self.width(ct.elementType, node)
        raise self.fail(f"values of type '{t}' are not supported (only bit vectors and fixed-size "
                        f"arrays of them)", node)

    def _bit_names(self, t, base: str) -> list[str]:
        ct = t.canonicalType
        if ct.kind in (SK.PackedArrayType, SK.FixedSizeUnpackedArrayType):
            r = ct.range
            n = r.width
            names: list[str] = []
            desc = r.left >= r.right
            for k in range(n):
                idx = r.right + k if desc else r.right - k
                names += self._bit_names(ct.elementType, f"{base}[{idx}]")
            return names
        w = self.width(ct)
        if w == 1:
            return [base]
        if ct.hasFixedRange:
            r = ct.fixedRange
            desc = r.left >= r.right
            return [f"{base}[{r.right + k if desc else r.right - k}]" for k in range(w)]
        return [f"{base}[{k}]" for k in range(w)]

    def name_of(self, sym) -> str:
        hp = sym.hierarchicalPath
        if self.inst_hp and hp.startswith(self.inst_hp + "."):
            hp = hp[len(self.inst_hp) + 1:]
        return self.path + hp

    def sig(self, sym, node=None) -> list[str]:
        k = (self.path, sym)
        bits = self.sigs.get(k)
        if bits is not None:
            return bits
        t = sym.type
        w = self.width(t, node or sym)
        if sym.kind == SK.Net:
            nk = sym.netType.netKind
            NK = ast.NetType.NetKind
            if nk == NK.Supply0 or nk == NK.Supply1:
                bits = [CONST1 if nk == NK.Supply1 else CONST0] * w
                self.sigs[k] = bits
                return bits
            if nk not in (NK.Wire, NK.UWire, NK.Tri, NK.Unknown):
                raise self.fail(f"net '{sym.name}' of kind {sym.netType.name}: only wire, uwire "
                                f"and tri nets are supported (no wired-AND/OR, pull or "
                                f"charge-storage nets)", sym)
        where = self.loc.where(sym.location)
        bits = self._bit_names(t, self.name_of(sym))
        for b in bits:
            self.placeholders[b] = None
            self.sig_where[b] = where
        self.sigs[k] = bits
        return bits

    def res(self, net: str) -> str:
        seen = 0
        alias = self.alias
        while net in alias:
            net = alias[net]
            seen += 1
            if seen > 1_000_000:  # pragma: no cover - drive() prevents cycles
                break
        return net

    def drive(self, p: str, v: str, where: str | None) -> None:
        if p not in self.placeholders:
            if p in _CONSTS:
                raise self.fail("cannot assign to a supply net", where=where)
            raise self.fail(f"'{p}' is an input port of the top module and cannot be assigned",
                            where=where)
        v = self.res(v)
        if v == p:
            raise self.fail(f"combinational loop: '{p}' is assigned a value that depends only on "
                            f"itself", where=where)
        if p in self.alias:
            if p not in self.conflicts:
                self.conflicts[p] = (f"net '{p}' has more than one driver: "
                                     f"{self.alias_where.get(p) or '?'} and {where or '?'}")
            return
        self.alias[p] = v
        self.alias_where[p] = where

    def xbit(self, where: str | None, what: str = "an x or z value") -> str:
        self._xcount += 1
        n = f"$x{self._xcount}"
        self.b.tainted.add(n)
        self.xnets[n] = f"{what}"
        self.sig_where[n] = where
        return n

    # ==== the hierarchy =================================================================
    def run(self, inst):
        self.inst_hp = inst.hierarchicalPath
        self.path = ""
        inputs: list[Port] = []
        outputs: dict[str, list[str]] = {}
        out_ports: list[tuple[str, list[str]]] = []
        for port in inst.body.portList:
            if port.kind != SK.Port:
                raise self.unsupported(f"port '{port.name}' of kind {port.kind.name}", port)
            internal = port.internalSymbol
            if internal is None or port.internalExpr is not None and \
                    port.internalExpr.kind != EK.NamedValue:
                raise self.unsupported(f"port '{port.name}' given as an expression", port)
            if not port.name:
                raise self.unsupported("a port without a name", port)
            t = internal.type
            if not t.canonicalType.isIntegral:
                raise self.fail(f"top-level port '{port.name}' has type '{t}': top-level ports must "
                                f"be bit vectors", port)
            w = self.width(t, port)
            d = port.direction
            if d == ast.ArgumentDirection.In:
                bits = [bit_name(port.name, i, w) for i in range(w)]
                self.sigs[(self.path, internal)] = bits
                inputs.append(Port(port.name, w))
            elif d == ast.ArgumentDirection.Out:
                bits = [bit_name(port.name, i, w) for i in range(w)]
                for b in bits:
                    self.placeholders[b] = None
                    self.sig_where[b] = self.where(port)
                self.sigs[(self.path, internal)] = bits
                out_ports.append((port.name, bits))
            else:
                raise self.fail(f"port '{port.name}' is {d.name.lower()}: inout (tristate) and ref "
                                f"ports are not supported", port)
        if not inputs:
            raise self.fail(f"top module '{inst.name}' has no input ports", inst)
        if not out_ports:
            raise self.fail(f"top module '{inst.name}' has no output ports", inst)
        self.scope(inst.body)
        return self.finish(inst.name, inputs, out_ports)

    def scope(self, scope) -> None:
        for m in scope:
            k = m.kind
            if k == SK.ContinuousAssign:
                self.continuous(m)
            elif k == SK.Net:
                self.sig(m)
                if m.initializer is not None:
                    self.set_source(m)
                    bits = self.ev(m.initializer)
                    sig = self.sig(m)
                    w = self.where(m)
                    for p, v in zip(sig, self.fit(bits, len(sig), False)):
                        self.drive(p, v, w)
            elif k == SK.Variable:
                if m.initializer is not None:
                    raise self.fail(f"variable '{m.name}' has an initial value, which is set once "
                                    f"at time zero, not continuously; declare it as a wire (or use "
                                    f"assign) for combinational logic", m)
            elif k == SK.ProceduralBlock:
                self.procedural(m)
            elif k == SK.Instance:
                self.instance(m)
            elif k == SK.InstanceArray:
                self.scope(m.elements)
            elif k == SK.PrimitiveInstance:
                self.primitive(m)
            elif k == SK.GenerateBlock:
                if not m.isUninstantiated:
                    self.scope(m)
            elif k == SK.GenerateBlockArray:
                for e in m.entries:
                    if not e.isUninstantiated:
                        self.scope(e)
            elif k in _IGNORED_MEMBERS:
                continue
            elif k == SK.UninstantiatedDef:
                raise self.fail(f"instance of an unknown module '{getattr(m, 'definitionName', m.name)}'", m)
            else:
                raise self.unsupported(f"{_kind_words(k)} ('{m.name}')" if m.name else _kind_words(k), m)

    def instance(self, inst) -> None:
        if not inst.isModule:
            raise self.unsupported(f"interface instance '{inst.name}'", inst)
        parent_path, parent_hp = self.path, self.inst_hp
        child_rel = inst.hierarchicalPath
        if parent_hp and child_rel.startswith(parent_hp + "."):
            child_rel = child_rel[len(parent_hp) + 1:]
        child_path = parent_path + child_rel + "."
        body = inst.body
        # the child's port nets first, so that the connections can drive them
        connections = []
        for pc in inst.portConnections:
            port = pc.port
            if port.kind != SK.Port:
                raise self.unsupported(f"port '{port.name}' of kind {port.kind.name}", port)
            internal = port.internalSymbol
            if internal is None or (port.internalExpr is not None
                                    and port.internalExpr.kind != EK.NamedValue):
                raise self.unsupported(f"port '{port.name}' of module '{inst.definition.name}' "
                                       f"given as an expression", port)
            connections.append((pc, port, internal))
        self.path, self.inst_hp = child_path, inst.hierarchicalPath
        child_bits = [self.sig(internal, port) for _, port, internal in connections]
        self.path, self.inst_hp = parent_path, parent_hp
        for (pc, port, internal), cbits in zip(connections, child_bits):
            d = port.direction
            expr = pc.expression
            if d not in (ast.ArgumentDirection.In, ast.ArgumentDirection.Out):
                raise self.fail(f"port '{port.name}' of module '{inst.definition.name}' is "
                                f"{d.name.lower()}: inout (tristate) and ref ports are not supported",
                                expr if expr is not None else inst)
            if expr is None:
                continue  # unconnected: an input floats (caught if it matters), an output is unused
            self.set_source(expr)
            w = self.where(expr)
            if d == ast.ArgumentDirection.In:
                bits = self.fit(self.ev(expr), len(cbits), expr.type.isSigned)
                for p, v in zip(cbits, bits):
                    self.drive(p, v, w)
            else:
                if expr.kind != EK.Assignment:
                    raise self.unsupported("this output port connection", expr)
                self._empty = [self.res(x) for x in cbits]
                try:
                    value = self.ev(expr.right)
                finally:
                    self._empty = None
                self.assign_lvalue(expr.left, value, w)
        self.path, self.inst_hp = child_path, inst.hierarchicalPath
        try:
            self.scope(body)
        finally:
            self.path, self.inst_hp = parent_path, parent_hp

    def primitive(self, prim) -> None:
        ptype = prim.primitiveType
        name = ptype.name
        if name not in _GATE_PRIMS:
            what = "tristate or switch primitive" if name in _TRI_PRIMS else "user-defined primitive"
            raise self.unsupported(f"{what} '{name}'", prim)
        conns = list(prim.portConnections)
        self.set_source(prim)
        w = self.where(prim)
        if name in ("buf", "not"):
            outs, ins = conns[:-1], conns[-1:]
        else:
            outs, ins = conns[:1], conns[1:]
        vals = []
        for e in ins:
            bits = self.ev(e)
            vals.append(bits[0] if bits else self.xbit(self.where(e)))
        b = self.b
        combine = {"and": b.and_, "or": b.or_, "xor": b.xor_}
        if name == "buf":
            v = vals[0]
        elif name == "not":
            v = b.not_(vals[0])
        elif name in combine:
            v = combine[name](*vals)
        else:  # nand, nor, xnor
            v = b.not_(combine[{"nand": "and", "nor": "or", "xnor": "xor"}[name]](*vals))
        for e in outs:
            if e.kind == EK.Assignment:
                self.assign_lvalue(e.left, [v] * max(1, self.width(e.left.type, e)), w)
            else:
                self.assign_lvalue(e, [v] * max(1, self.width(e.type, e)), w)

    def continuous(self, ca) -> None:
        a = ca.assignment
        self.set_source(a)
        if a.kind != EK.Assignment:  # pragma: no cover - slang always makes an assignment
            raise self.unsupported("this continuous assignment", a)
        value = self.ev(a.right)
        self.assign_lvalue(a.left, value, self.where(a))

    # ==== lvalues and references ========================================================
    def ref(self, e):
        """(key, signal bits, offsets) for a reference with constant selects, else None.

        Offsets may contain None for bits selected outside the declared range.
        """
        k = e.kind
        if k == EK.NamedValue:
            sym = e.symbol
            if sym.kind not in (SK.Net, SK.Variable, SK.FormalArgument):
                return None
            bits = self.sig_or_local(sym, e)
            return (self.path, sym), bits, range(len(bits))
        if k == EK.ElementSelect or k == EK.RangeSelect:
            base = self.ref(e.value)
            if base is None:
                return None
            key, bits, offs = base
            sel = self.select_positions(e)
            if sel is None:
                return None
            n = len(offs)
            if isinstance(sel, range) and (not sel or (sel.start >= 0 and sel.stop <= n)):
                return key, bits, offs[sel.start:sel.stop]  # a range of a range stays a range
            return key, bits, [offs[i] if i is not None and 0 <= i < n else None for i in sel]
        if k == EK.MemberAccess:
            span = self.member_span(e)
            base = self.ref(e.value)
            if base is None:
                return None
            key, bits, offs = base
            lo, hi = span
            return key, bits, offs[lo:hi]
        return None

    def member_span(self, e) -> tuple[int, int]:
        """(low, high) bit positions of a packed struct or union member within its value."""
        vt = e.value.type.canonicalType
        if vt.kind not in (SK.PackedStructType, SK.PackedUnionType) or \
                e.member.kind != SK.Field:
            raise self.unsupported(f"member access on a value of type '{e.value.type}' (packed "
                                   f"structs and unions only)", e)
        lo = e.member.bitOffset
        return lo, lo + self.width(e.type, e)

    def sig_or_local(self, sym, node) -> list[str]:
        k = (self.path, sym)
        f = self.frame
        if f is not None and k in f.locals:
            return [None] * self.width(sym.type, node)  # type: ignore[list-item]
        return self.sig(sym, node)

    def select_positions(self, e):
        """Flat bit positions (within the base value) chosen by a constant select, or None."""
        vt = e.value.type.canonicalType
        if vt.kind in (SK.PackedArrayType, SK.FixedSizeUnpackedArrayType):
            r = vt.range
            ew = self.width(vt.elementType, e)
        elif vt.isIntegral and vt.hasFixedRange:
            r = vt.fixedRange
            ew = 1
        else:
            raise self.unsupported(f"selecting from a value of type '{e.value.type}'", e)
        desc = r.left >= r.right
        n = r.width

        def pos(i: int) -> int:
            return i - r.right if desc else r.right - i

        if e.kind == EK.ElementSelect:
            i = self.const_int(e.selector)
            if i is None:
                return None
            p = pos(i)
            if 0 <= p < n:
                return range(p * ew, (p + 1) * ew)
            return [None] * ew
        sk = e.selectionKind
        if sk == ast.RangeSelectionKind.Simple:
            li, ri = self.const_int(e.left), self.const_int(e.right)
            if li is None or ri is None:
                return None
            idx = [li, ri]
        else:
            base = self.const_int(e.left)
            wd = self.const_int(e.right)
            if base is None or wd is None:
                return None
            idx = [base, base + wd - 1] if sk == ast.RangeSelectionKind.IndexedUp else [base - wd + 1, base]
        plo, phi = sorted((pos(idx[0]), pos(idx[1])))
        if 0 <= plo and phi < n:
            return range(plo * ew, (phi + 1) * ew)
        out: list = []
        for p in range(plo, phi + 1):
            if 0 <= p < n:
                out.extend(range(p * ew, (p + 1) * ew))
            else:
                out.extend([None] * ew)
        return out

    def targets(self, e) -> list[tuple[tuple, str | None, int | None]]:
        """LSB-first list of (key, placeholder, offset) written by an lvalue expression."""
        if e.kind == EK.Concatenation:
            out = []
            for op in reversed(list(e.operands)):
                out.extend(self.targets(op))
            return out
        if e.kind == EK.Assignment:  # pragma: no cover - nested assignment as an lvalue
            raise self.unsupported("an assignment used as a value", e)
        r = self.ref(e)
        if r is None:
            if e.kind in (EK.ElementSelect, EK.RangeSelect):
                raise self.unsupported("assigning through a select whose index is not a constant", e)
            if e.kind == EK.HierarchicalValue:
                raise self.unsupported("hierarchical reference", e)
            raise self.unsupported(f"assigning to this kind of expression ({e.kind.name})", e)
        key, bits, offs = r
        return [(key, bits[o] if o is not None else None, o) for o in offs]

    def assign_lvalue(self, lhs, value: list[str], where: str | None) -> None:
        """A continuous drive (assign, net initializer, port connection, gate output)."""
        tg = self.targets(lhs)
        value = self.fit(value, len(tg), False)
        for (key, p, off), v in zip(tg, value):
            if p is None:
                continue  # outside the declared range: IEEE 1800 11.5.1 says the write is ignored
            self.drive(p, v, where)

    # ==== constants =====================================================================
    def const_bits(self, cv, width: int, node) -> list[str]:
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

    # ==== expressions ===================================================================
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
        fn = self._dispatch.get(k)
        if fn is None:
            raise self.unsupported(_expr_words(e), e)
        return fn(self, e)

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
        b = self.b
        terms = []
        for i, x in enumerate(bits):
            want = (value >> i) & 1
            terms.append(x if want else b.not_(x))
        return b.and_(*terms) if terms else CONST1

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

    def _conversion(self, e):
        op = e.operand
        t = e.type.canonicalType
        if op.kind == EK.Streaming:
            raise self.unsupported("streaming concatenation ({<<{...}} / {>>{...}})", op)
        if not t.isIntegral or not op.type.canonicalType.isIntegral:
            if t.kind == SK.FixedSizeUnpackedArrayType and op.type.canonicalType.kind == t.kind:
                return self.ev(op)
            raise self.unsupported(f"conversion from '{op.type}' to '{e.type}'", e)
        bits = self.ev(op)
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
        b = self.b
        inv = [b.not_(v) for v in x]
        s, _ = b.add(inv, [CONST0] * len(x), CONST1)
        return s

    def _binary(self, e):
        op = e.op
        b = self.b
        w = self.width(e.type, e)
        if op in (BO.LogicalAnd, BO.LogicalOr, BO.LogicalImplication, BO.LogicalEquivalence):
            l = self.truth(self.ev(e.left))
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
            return self.shift(e, op, w)
        if op == BO.Power:
            return self.power(e, w)
        lt, rt = e.left.type, e.right.type
        if op in _COMPARE:
            cw = max(self.width(lt, e), self.width(rt, e))
            signed = lt.isSigned and rt.isSigned
            l = self.fit(self.ev(e.left), cw, lt.isSigned)
            r = self.fit(self.ev(e.right), cw, rt.isSigned)
            return self.fit([self.compare(op, l, r, signed, e)], w, False)
        l = self.fit(self.ev(e.left), w, lt.isSigned)
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
            return b.add(l, r)[0]
        if op == BO.Subtract:
            return b.add(l, [b.not_(y) for y in r], CONST1)[0]
        if op == BO.Multiply:
            return self.multiply(l, r, e)
        if op in (BO.Divide, BO.Mod):
            return self.divide(e, op, l, r, w)
        raise self.unsupported(f"binary operator {op.name}", e)  # pragma: no cover

    def compare(self, op, l: list[str], r: list[str], signed: bool, e) -> str:
        b = self.b
        if op in (BO.Equality, BO.CaseEquality, BO.Inequality, BO.CaseInequality):
            diff = [b.xor_(x, y) for x, y in zip(l, r)]
            ne = self.truth(diff)
            return ne if op in (BO.Inequality, BO.CaseInequality) else b.not_(ne)
        if op in (BO.WildcardEquality, BO.WildcardInequality):
            raise self.unsupported("wildcard equality (==? / !=?)", e)
        if signed and l:
            l = l[:-1] + [b.not_(l[-1])]
            r = r[:-1] + [b.not_(r[-1])]
        # l - r: carry out is 1 exactly when l >= r (unsigned)
        _, ge = b.add(l, [b.not_(y) for y in r], CONST1)
        if op == BO.GreaterThanEqual:
            return ge
        if op == BO.LessThan:
            return b.not_(ge)
        _, ge_rl = b.add(r, [b.not_(y) for y in l], CONST1)  # r >= l
        if op == BO.LessThanEqual:
            return ge_rl
        return b.not_(ge_rl)  # GreaterThan

    def multiply(self, l: list[str], r: list[str], e) -> list[str]:
        w = len(l)
        if w > _MAX_MUL and not (all(x in _CONSTS for x in l) or all(x in _CONSTS for x in r)):
            raise self.unsupported(f"a {w}-bit multiplication (the limit is {_MAX_MUL} bits)", e)
        b = self.b
        acc = [CONST0] * w
        for i, rb in enumerate(r):
            if rb == CONST0:
                continue
            row = [CONST0] * i + [b.and_(x, rb) for x in l[:w - i]]
            acc = b.add(acc, row)[0]
        return acc

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

    def power(self, e, w) -> list[str]:
        l, r = self.ev(e.left), self.ev(e.right)
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

    def shift(self, e, op, w) -> list[str]:
        x = self.fit(self.ev(e.left), w, e.left.type.isSigned)
        amount = self.ev(e.right)
        arith = op == BO.ArithmeticShiftRight and e.type.isSigned
        fill = x[-1] if (arith and x) else CONST0
        left = op in (BO.LogicalShiftLeft, BO.ArithmeticShiftLeft)
        if all(a in _CONSTS for a in amount):
            n = _to_int(amount, False)  # the shift amount is always treated as unsigned
            if n >= w:
                return [CONST0] * w if left else [fill] * w
            if left:
                return [CONST0] * n + x[:w - n]
            return x[n:] + [fill] * n
        return self.barrel(x, amount, left=left, fill=fill)

    def barrel(self, x: list[str], amount: list[str], *, left: bool, fill: str) -> list[str]:
        b = self.b
        w = len(x)
        cur = list(x)
        big = []
        for j, s in enumerate(amount):
            step = 1 << j
            if step >= w:
                big.append(s)
                continue
            if left:
                shifted = [CONST0] * step + cur[:w - step]
            else:
                shifted = cur[step:] + [fill] * step
            cur = [b.mux(s, d0, d1) for d0, d1 in zip(cur, shifted)]
        if big:
            over = self.truth(big)
            cur = [b.mux(over, d, CONST0 if left else fill) for d in cur]
        return cur

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

    def _streaming(self, e):
        raise self.unsupported("streaming concatenation", e)

    # ==== combinational blocks ==========================================================
    def procedural(self, blk) -> None:
        pk = blk.procedureKind
        PK = ast.ProceduralBlockKind
        body = blk.body
        if pk in (PK.Initial, PK.Final):
            raise self.unsupported(f"an {'initial' if pk == PK.Initial else 'final'} block "
                                   f"(a combinational design has no start-up behaviour)", blk)
        if pk == PK.AlwaysFF:
            raise self.fail("sequential logic (always_ff) is not supported: only combinational "
                            "designs can be checked", blk)
        if pk == PK.AlwaysLatch:
            raise self.fail("always_latch describes a latch (sequential logic), which is not "
                            "supported", blk)
        events = None
        if pk == PK.Always:
            if body.kind != STK.Timed:
                raise self.fail("an always block without an event control runs forever; use "
                                "always @* or always_comb", blk)
            tc = body.timing
            TK = ast.TimingControlKind
            if tc.kind == TK.ImplicitEvent:
                pass
            elif tc.kind in (TK.SignalEvent, TK.EventList):
                evs = [tc] if tc.kind == TK.SignalEvent else list(tc.events)
                events = {}
                for ev_ in evs:
                    if ev_.kind != TK.SignalEvent:
                        raise self.unsupported("this event control", ev_)
                    if ev_.edge != ast.EdgeKind.None_:
                        raise self.fail("sequential logic (a clocked always block, @(posedge/negedge "
                                        "...)) is not supported: only combinational designs can "
                                        "be checked", ev_)
                    r = self.ref(ev_.expr)
                    if r is None:
                        raise self.unsupported("an event on an expression", ev_)
                    events.setdefault(r[0], set()).update(o for o in r[2] if o is not None)
            else:
                raise self.unsupported(f"the timing control {tc.kind.name} in an always block", tc)
            body = body.stmt
        where = self.where(blk)
        frame = _Frame(where, events)
        saved = self.frame
        self.frame = frame
        try:
            self.exec(body)
        finally:
            self.frame = saved
        self.finish_block(frame, blk)

    def finish_block(self, f: _Frame, blk) -> None:
        # nonblocking assignments take effect after the block
        for key, vals in f.nonblocking.items():
            cur = f.env.get(key)
            f.env[key] = [v if v is not None else (cur[i] if cur else None)
                          for i, v in enumerate(vals)]
        for key, offs in f.written.items():
            if key in f.locals:
                continue
            rd = f.reads.get(key)
            if rd is not None:
                both = rd[0] & offs
                if both:
                    bits = self.sigs[key]
                    raise self.fail(f"'{bits[min(both)]}' is read before the block assigns it: this "
                                    f"is a latch or a combinational loop", where=rd[1])
            vals = f.env.get(key)
            bits = self.sigs[key]
            for o in sorted(offs):
                v = vals[o] if vals is not None else None
                if v is None:
                    at = f.first_write.get(key)
                    at = f" (assigned at {at})" if at else ""
                    raise self.fail(f"'{bits[o]}' is not assigned on every path through the "
                                    f"block{at}, which implies a latch (sequential logic); assign "
                                    f"it a value first or add the missing else/default", blk)
                self.drive(bits[o], v, self.where(blk))
        if f.event_keys is not None:
            for key, (offs, _) in f.reads.items():
                missing = offs - f.event_keys.get(key, set()) - f.written.get(key, set())
                if missing:
                    bits = self.sigs[key]
                    name = key[1].name if len(missing) == len(bits) else bits[min(missing)]
                    raise self.fail(f"the sensitivity list does not name '{name}', which the block "
                                    f"reads: simulation would hold old values (a latch); use "
                                    f"always @* or always_comb", blk)

    def exec(self, s) -> None:
        f = self.frame
        if f.returned or f.brk == CONST1 or f.cont == CONST1:
            return
        k = s.kind
        if k == STK.List:
            for x in s.list:
                self.exec(x)
                if f.returned or f.brk == CONST1 or f.cont == CONST1:
                    return
        elif k == STK.Block:
            if s.blockKind != ast.StatementBlockKind.Sequential:
                raise self.unsupported("fork/join", s)
            self.exec(s.body)
        elif k == STK.ExpressionStatement:
            self.set_source(s)
            self.exec_expr(s.expr)
        elif k == STK.VariableDeclaration:
            sym = s.symbol
            key = (self.path, sym)
            f.locals.add(key)
            w = self.width(sym.type, s)
            if sym.initializer is not None:
                self.set_source(s)
                f.env[key] = self.fit(self.ev(sym.initializer), w, sym.initializer.type.isSigned)
            else:
                f.env[key] = [None] * w
        elif k == STK.Conditional:
            self.exec_if(s)
        elif k == STK.Case:
            self.exec_case(s)
        elif k == STK.ForLoop:
            self.exec_for(s)
        elif k == STK.RepeatLoop:
            n = self.const_int(s.count)
            if n is None:
                raise self.unsupported("a repeat loop whose count is not a constant", s)
            for _ in range(max(0, n)):
                self.exec(s.body)
        elif k in (STK.WhileLoop, STK.DoWhileLoop):
            self.exec_while(s, first=k == STK.DoWhileLoop)
        elif k in (STK.Break, STK.Continue):
            if not f.loops:
                raise self.unsupported("break/continue outside a loop", s)
            if k == STK.Break:
                f.brk = CONST1
            else:
                f.cont = CONST1
        elif k == STK.Empty:
            pass
        elif k == STK.Return:
            self.exec_return(s)
        elif k == STK.Timed:
            raise self.fail("a delay or event control inside a combinational block is not "
                            "supported", s)
        elif k == STK.ImmediateAssertion:
            pass  # assertions do not change the logic
        else:
            raise self.unsupported(_stmt_words(k), s)

    def exec_expr(self, e) -> None:
        if e.kind == EK.Assignment:
            self.proc_assign(e)
        elif e.kind == EK.UnaryOp and e.op in (UO.Preincrement, UO.Predecrement,
                                                UO.Postincrement, UO.Postdecrement):
            self.incdec(e)
        elif e.kind == EK.Call and e.isSystemCall:
            name = e.subroutineName
            if name in ("$display", "$write", "$info", "$warning", "$strobe", "$monitor"):
                return
            raise self.unsupported(f"system task '{name}' in a combinational block", e)
        elif e.kind == EK.Call:
            raise self.unsupported(f"task call '{e.subroutineName}'", e)
        else:
            raise self.unsupported("this expression statement", e)

    def proc_targets(self, lhs):
        if lhs.kind == EK.Concatenation:
            out = []
            for op in reversed(list(lhs.operands)):
                out.extend(self.proc_targets(op))
            return out
        r = self.ref(lhs)
        if r is None:
            if lhs.kind == EK.ElementSelect:
                return self.dynamic_targets(lhs)
            return self.targets(lhs)  # raises the right message
        key, bits, offs = r
        return [(key, o) for o in offs]

    def dynamic_targets(self, lhs):
        raise self.unsupported("assigning through an index that is not a constant", lhs)

    def dynamic_write(self, e) -> bool:
        """``x[i] = v`` in a block with a signal index: each element is written when i selects
        it and keeps its current value otherwise. False when the assignment is not of that form."""
        lhs = e.left
        if lhs.kind != EK.ElementSelect or e.isCompound:
            return False
        base = self.ref(lhs.value)
        if base is None or self.ref(lhs) is not None:
            return False
        key, bits, offs = base
        vt = lhs.value.type.canonicalType
        if vt.kind in (SK.PackedArrayType, SK.FixedSizeUnpackedArrayType):
            r, ew = vt.range, self.width(vt.elementType, lhs)
        elif vt.isIntegral and vt.hasFixedRange:
            r, ew = vt.fixedRange, 1
        else:
            return False
        sel = self.ev(lhs.selector)
        signed = lhs.selector.type.isSigned
        value = self.fit(self.ev(e.right), ew, e.right.type.isSigned)
        f = self.frame
        store = f.nonblocking if e.isNonBlocking else f.env
        desc = r.left >= r.right
        b = self.b
        for p in range(r.width):
            idx = r.right + p if desc else r.right - p
            if not _representable(idx, len(sel), signed):
                continue  # no value of the index selects this element
            hit = self.eq_const(sel, idx)
            tg = [(key, offs[p * ew + j]) for j in range(ew)]
            cur = store.get(key)
            old = [cur[o] if cur is not None else None for _, o in tg]
            new = [None if o is None else b.mux(hit, o, v) for o, v in zip(old, value)]
            self.write_targets(tg, new, nonblocking=e.isNonBlocking)
        return True

    def proc_assign(self, e) -> None:
        f = self.frame
        lhs = e.left
        if lhs.kind == EK.ElementSelect and self.dynamic_write(e):
            return
        tg = self.proc_targets(lhs)
        if e.isCompound:
            self._lvref_stack_push(self.read_targets(tg, lhs))
            try:
                value = self.ev(e.right)
            finally:
                self._lvref_stack_pop()
        else:
            value = self.ev(e.right)
        value = self.fit(value, len(tg), e.right.type.isSigned)
        self.write_targets(tg, value, nonblocking=e.isNonBlocking)

    def _lvref_stack_push(self, v):
        self._lvstack = getattr(self, "_lvstack", [])
        self._lvstack.append(self._lvref)
        self._lvref = v

    def _lvref_stack_pop(self):
        self._lvref = self._lvstack.pop()

    def read_targets(self, tg, node) -> list[str]:
        out = []
        for key, o in tg:
            if o is None:
                out.append(self.xbit(self.where(node)))
                continue
            bits = self.sigs.get(key) or [None] * (o + 1)
            out.extend(self.read((key, bits, [o]), node))
        return out

    def write_targets(self, tg, value, *, nonblocking: bool = False) -> None:
        f = self.frame
        store = f.nonblocking if nonblocking else f.env
        if f.brk != CONST0 or f.cont != CONST0:
            # this path may have left the loop: the write happens only where it has not
            b = self.b
            active = b.not_(b.or_(f.brk, f.cont))
            guarded = []
            for (key, o), v in zip(tg, value):
                cur = store.get(key)
                old = cur[o] if (cur is not None and o is not None and o < len(cur)) else None
                guarded.append(None if old is None else b.mux(active, old, v))
            value = guarded
        for (key, o), v in zip(tg, value):
            if o is None:
                continue
            cur = store.get(key)
            if cur is None:
                n = len(self.sigs[key]) if key in self.sigs else o + 1
                if key in f.locals and key in f.env and not nonblocking:
                    n = len(f.env[key])
                cur = [None] * n
            else:
                cur = list(cur)
            cur[o] = v
            store[key] = cur
            f.written.setdefault(key, set()).add(o)
            if key not in f.first_write:
                f.first_write[key] = self.b.source

    def incdec(self, e) -> list[str]:
        if self.frame is None:
            raise self.unsupported("++/-- outside a procedural block", e)
        tg = self.proc_targets(e.operand)
        old = self.read_targets(tg, e)
        b = self.b
        if e.op in (UO.Preincrement, UO.Postincrement):
            new = b.add(old, [CONST0] * len(old), CONST1)[0]
        else:
            new = b.add(old, [CONST1] * len(old), CONST0)[0]
        self.write_targets(tg, new)
        return new if e.op in (UO.Preincrement, UO.Predecrement) else old

    def _branch(self):
        f = self.frame
        return dict(f.env), dict(f.nonblocking), f.brk, f.cont

    def _restore(self, state):
        f = self.frame
        f.env, f.nonblocking = dict(state[0]), dict(state[1])
        f.brk, f.cont = state[2], state[3]

    def _merge(self, c: str, st_true, st_false):
        """Per bit: st_true's value when c is 1, else st_false's."""
        b = self.b
        out = []
        for a_env, b_env in ((st_true[0], st_false[0]), (st_true[1], st_false[1])):
            merged = {}
            for key in dict.fromkeys([*a_env, *b_env]):
                t, f = a_env.get(key), b_env.get(key)
                if t is f:
                    merged[key] = t
                    continue
                n = len(t if t is not None else f)
                t = t if t is not None else [None] * n
                f = f if f is not None else [None] * n
                merged[key] = [x if x == y else (None if x is None or y is None else b.mux(c, y, x))
                               for x, y in zip(t, f)]
            out.append(merged)
        brk = st_true[2] if st_true[2] == st_false[2] else b.mux(c, st_false[2], st_true[2])
        cont = st_true[3] if st_true[3] == st_false[3] else b.mux(c, st_false[3], st_true[3])
        return out[0], out[1], brk, cont

    def exec_if(self, s) -> None:
        f = self.frame
        conds = list(s.conditions)
        if len(conds) != 1 or conds[0].pattern is not None:
            raise self.unsupported("if with patterns (matches)", s)
        self.set_source(s)
        c = self.truth(self.ev(conds[0].expr))
        if c == CONST1:
            self.exec(s.ifTrue)
            return
        if c == CONST0:
            if s.ifFalse is not None:
                self.exec(s.ifFalse)
            return
        if f.returned:
            return
        base = self._branch()
        self.exec(s.ifTrue)
        t_state, t_ret = self._branch(), f.returned
        self._restore(base)
        f.returned = False
        if s.ifFalse is not None:
            self.exec(s.ifFalse)
        e_state, e_ret = self._branch(), f.returned
        if t_ret != e_ret:
            raise self.unsupported("a return on only some paths through a function", s)
        self.set_source(s)
        self._restore(self._merge(c, t_state, e_state))
        f.returned = t_ret

    def exec_case(self, s) -> None:
        f = self.frame
        self.set_source(s)
        CC = ast.CaseStatementCondition
        cond = s.condition
        if cond == CC.Inside:
            raise self.unsupported("case inside", s)
        sel_e = s.expr
        items = list(s.items)
        all_exprs = [x for it in items for x in it.expressions]
        w = max([self.width(sel_e.type, s)] + [self.width(x.type, x) for x in all_exprs])
        # IEEE 1800 12.5: every case expression is extended to the widest one, with sign
        # extension only when all of them are signed
        signed = sel_e.type.isSigned and all(x.type.isSigned for x in all_exprs)
        sel = self.fit(self.ev(sel_e), w, signed)
        wild = {CC.WildcardJustZ: "z?", CC.WildcardXOrZ: "xz?"}.get(cond, "")
        matches = []
        covered: set[int] | None = set() if w <= 12 else None
        for it in items:
            terms = []
            for x in it.expressions:
                terms.append(self.case_match(sel, x, w, wild, covered, signed))
            matches.append(self.truth(terms))
        full = covered is not None and len(covered) == (1 << w)
        base = self._branch()
        # execute every arm from the same starting state, then fold from the last arm upwards
        arms = []
        for it, m in zip(items, matches):
            self._restore(base)
            f.returned = False
            self.exec(it.stmt)
            arms.append((m, self._branch(), f.returned))
        self._restore(base)
        f.returned = False
        if s.defaultCase is not None and not full:
            self.exec(s.defaultCase)
            acc, acc_ret = self._branch(), f.returned
        elif full and arms:
            _, acc, acc_ret = arms.pop()
        else:
            acc, acc_ret = base, False
        self.set_source(s)
        for m, st, ret in reversed(arms):
            if ret != acc_ret:
                raise self.unsupported("a return on only some paths through a function", s)
            if m == CONST1:
                acc = st
            elif m != CONST0:
                acc = self._merge(m, st, acc)
        self._restore(acc)
        f.returned = acc_ret

    def case_match(self, sel: list[str], x, w: int, wild: str, covered, signed: bool) -> str:
        b = self.b
        chars = _literal_chars(x, w, signed)
        if chars is None:
            v = self.try_const(x)  # parameters, enum values, constant expressions
            if v is not None:
                xw = x.type.bitWidth
                chars = ["1" if v >> i & 1 else "0" for i in range(xw)]
                ext = chars[-1] if chars and signed and x.type.isSigned else "0"
                chars = (chars + [ext] * max(0, w - xw))[:w]
        if chars is not None:
            terms = []
            care_mask, val = 0, 0
            for i, ch in enumerate(chars):
                if ch in wild or (ch == "?" and "?" in wild):
                    continue
                if ch in "xz?":
                    return CONST0  # case without wildcards: a 2-state selector never matches x/z
                care_mask |= 1 << i
                if ch == "1":
                    val |= 1 << i
                    terms.append(sel[i])
                else:
                    terms.append(b.not_(sel[i]))
            if covered is not None:
                free = [i for i in range(w) if not care_mask >> i & 1]
                if len(free) <= 12:
                    for k in range(1 << len(free)):
                        v = val
                        for j, i in enumerate(free):
                            if k >> j & 1:
                                v |= 1 << i
                        covered.add(v)
            return b.and_(*terms) if terms else CONST1
        r = self.fit(self.ev(x), w, signed)
        if any(v in self.xnets for v in r):
            raise self.unsupported("a case item with x or z bits that is not a constant", x)
        return self.compare(BO.Equality, sel, r, False, x)

    def exec_for(self, s) -> None:
        f = self.frame
        self.set_source(s)
        for v in s.loopVars:
            key = (self.path, v)
            f.locals.add(key)
            w = self.width(v.type, s)
            init = v.initializer
            f.env[key] = self.fit(self.ev(init), w, init.type.isSigned) if init is not None else [None] * w
        for init in s.initializers:
            self.exec_expr(init)
        loop_keys = {(self.path, v) for v in s.loopVars}
        for init in s.initializers:
            if init.kind == EK.Assignment and init.left.kind == EK.NamedValue:
                loop_keys.add((self.path, init.left.symbol))
        saved = (f.brk, f.cont)
        f.brk = f.cont = CONST0
        f.loops += 1
        try:
            count = 0
            while True:
                if s.stopExpr is not None:
                    cv = self.try_const(s.stopExpr)
                    c = (CONST1 if cv else CONST0) if cv is not None else self.truth(self.ev(s.stopExpr))
                    if c not in _CONSTS:
                        raise self.fail("a for loop whose bound is not a constant (the loop "
                                        "condition depends on a signal)", s.stopExpr)
                    if c == CONST0:
                        break
                count += 1
                if count > _MAX_LOOP:
                    raise self.fail(f"a for loop that runs more than {_MAX_LOOP} times", s)
                f.cont = CONST0
                self.exec(s.body)
                if f.returned:
                    raise self.unsupported("return inside a loop", s)
                f.cont = CONST0
                if f.brk == CONST1:
                    break
                brk = f.brk
                if brk != CONST0:
                    # some paths have left the loop: the loop variable keeps counting so that the
                    # unrolling stays constant, which is only right when nothing reads it after
                    if not loop_keys or not loop_keys <= f.locals:
                        raise self.unsupported("break depending on a signal in a loop whose "
                                               "variable is declared outside it", s)
                    f.brk = CONST0
                for st in s.steps:
                    self.exec_expr(st)
                f.brk = brk
        finally:
            f.loops -= 1
            f.brk, f.cont = saved

    def exec_while(self, s, *, first: bool) -> None:
        """while / do-while whose condition is a constant on every iteration (unrolled)."""
        f = self.frame
        saved = (f.brk, f.cont)
        f.brk = f.cont = CONST0
        f.loops += 1
        try:
            self._while_body(s, first)
        finally:
            f.loops -= 1
            f.brk, f.cont = saved

    def _while_body(self, s, first: bool) -> None:
        f = self.frame
        count = 0
        while True:
            if f.brk == CONST1:
                break
            if not first:
                c = self.truth(self.ev(s.cond))
                if c not in _CONSTS:
                    raise self.fail("a while loop whose condition depends on a signal (only loops "
                                    "with constant bounds can be unrolled)", s.cond)
                if c == CONST0:
                    break
            first = False
            count += 1
            if count > _MAX_LOOP:
                raise self.fail(f"a loop that runs more than {_MAX_LOOP} times", s)
            f.cont = CONST0
            self.exec(s.body)
            f.cont = CONST0
            if f.returned:
                raise self.unsupported("return inside a loop", s)

    # ==== functions =====================================================================
    def inline_function(self, sub, args, e) -> list[str]:
        depth = getattr(self, "_depth", 0)
        if depth > 64:
            raise self.fail(f"function '{sub.name}' calls itself too deeply to be inlined", e)
        formals = list(sub.arguments)
        values = []
        for formal, a in zip(formals, args):
            if formal.direction != ast.ArgumentDirection.In:
                raise self.unsupported(f"function argument '{formal.name}' that is not an input", e)
            values.append(self.fit(self.ev(a), self.width(formal.type, e), a.type.isSigned))
        frame = _Frame(self.where(e))
        frame.parent = self.frame
        for formal, v in zip(formals, values):
            key = (self.path, formal)
            frame.locals.add(key)
            frame.env[key] = v
        rv = sub.returnValVar
        rkey = (self.path, rv)
        frame.locals.add(rkey)
        frame.env[rkey] = [None] * self.width(rv.type, e)
        saved, saved_src = self.frame, self.b.source
        self.frame = frame
        self._depth = depth + 1
        self._ret_key = getattr(self, "_ret_key", None)
        prev_ret = self._ret_key
        self._ret_key = rkey
        try:
            self.exec(sub.body)
        finally:
            self.frame, self.b.source = saved, saved_src
            self._depth = depth
            self._ret_key = prev_ret
        out = frame.env[rkey]
        if any(v is None for v in out):
            raise self.fail(f"function '{sub.name}' does not set its result on every path", e)
        # reads of module-level signals inside the function count as reads of the caller
        if saved is not None:
            for key, (offs, w) in frame.reads.items():
                rd = saved.reads.get(key)
                if rd is None:
                    saved.reads[key] = (set(offs), w)
                else:
                    rd[0].update(offs)
        if frame.written.keys() - frame.locals:
            raise self.unsupported(f"function '{sub.name}' assigning to module-level signals", e)
        return out

    def exec_return(self, s) -> None:
        f = self.frame
        rkey = getattr(self, "_ret_key", None)
        if rkey is None or rkey not in f.env:
            raise self.unsupported("return outside a function", s)
        if s.expr is not None:
            w = len(f.env[rkey])
            f.env[rkey] = self.fit(self.ev(s.expr), w, s.expr.type.isSigned)
        f.returned = True

    # ==== finishing =====================================================================
    def finish(self, name: str, inputs: list[Port], out_ports: list[tuple[str, list[str]]]):
        res = self.res
        gates = self.b.gates
        driver = {g.output: g for g in gates}
        # 1. nothing undefined may reach an output
        seen: set[str] = set()
        for pname, bits in out_ports:
            for pb in bits:
                stack = [pb]
                while stack:
                    n = stack.pop()
                    if n in seen:
                        continue
                    seen.add(n)
                    if n in self.conflicts:
                        raise self.fail(self.conflicts[n], where=self.alias_where.get(n))
                    if n in self.alias:
                        stack.append(self.alias[n])
                        continue
                    if n in self.xnets:
                        raise self.fail(f"{self.xnets[n]} can reach output '{pb}'; a checkable "
                                        f"design is 0/1 everywhere", where=self.sig_where.get(n))
                    g = driver.get(n)
                    if g is not None:
                        stack.extend(g.inputs)
                    elif n in self.placeholders:
                        if n == pb:
                            raise self.fail(f"output '{pb}' is never assigned (it floats at z)",
                                            where=self.sig_where.get(n))
                        raise self.fail(f"net '{n}' is never driven (it floats at z) and reaches "
                                        f"output '{pb}'", where=self.sig_where.get(n))
        # 2. name gate outputs after the nets they drive: output ports first
        rename: dict[str, str] = {}
        order = [pb for _, bits in out_ports for pb in bits]
        order += list(self.placeholders)
        for p in order:
            v = res(p)
            if v != p and v in seen and v in driver and v not in rename and v.startswith("$"):
                rename[v] = p

        def r(n: str) -> str:
            n = res(n)
            return rename.get(n, n)

        out = GateBuilder(prefix="$", fold=False, share=False)
        for g in gates:
            if g.output not in seen:
                continue
            out.source = g.source
            out.gate(g.op, *[r(i) for i in g.inputs], out=r(g.output))
        outputs = {pname: [r(pb) for pb in bits] for pname, bits in out_ports}
        out.source = None
        try:
            return out.netlist(name, inputs, outputs, self.origin)
        except NetlistError as err:
            msg = err.message
            if msg.startswith("combinational loop"):
                m = re.search(r"\(([^;()]+?)(?: [^;()]*)?[;)]", msg)
                raise InputError(msg.replace("combinational loop", "combinational loop through "
                                             "Verilog nets", 1),
                                 m.group(1) if m else self.origin) from None
            raise


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


_COMPARE = {BO.Equality, BO.Inequality, BO.CaseEquality, BO.CaseInequality, BO.GreaterThanEqual,
            BO.GreaterThan, BO.LessThanEqual, BO.LessThan, BO.WildcardEquality,
            BO.WildcardInequality}

_GATE_PRIMS = {"and", "or", "xor", "nand", "nor", "xnor", "not", "buf"}
_TRI_PRIMS = {"bufif0", "bufif1", "notif0", "notif1", "nmos", "pmos", "rnmos", "rpmos", "cmos",
              "rcmos", "tran", "rtran", "tranif0", "tranif1", "rtranif0", "rtranif1", "pullup",
              "pulldown"}

_IGNORED_MEMBERS = {SK.Parameter, SK.TypeParameter, SK.Genvar, SK.Port, SK.MultiPort,
                    SK.TypeAlias, SK.Subroutine, SK.EmptyMember, SK.ExplicitImport,
                    SK.WildcardImport, SK.StatementBlock, SK.TransparentMember, SK.EnumValue,
                    SK.ForwardingTypedef, SK.NetType, SK.ElabSystemTask, SK.DefParam,
                    SK.Specparam, SK.Attribute, SK.LetDecl}


def _kind_words(k) -> str:
    words = {SK.Instance: "module instance", SK.ClockingBlock: "a clocking block",
             SK.Modport: "a modport", SK.SpecifyBlock: "a specify block",
             SK.CheckerInstance: "a checker instance", SK.NetAlias: "a net alias",
             SK.Sequence: "a sequence", SK.Property: "a property",
             SK.InterfacePort: "an interface port", SK.ClassType: "a class",
             SK.CovergroupType: "a covergroup"}
    if k in words:
        return words[k]
    name = k.name
    out = "".join(" " + c.lower() if c.isupper() else c for c in name).strip()
    return f"a {out}"


def _expr_words(e) -> str:
    return {EK.RealLiteral: "a real number", EK.StringLiteral: "a string",
            EK.TimeLiteral: "a time value", EK.SimpleAssignmentPattern: "an assignment pattern",
            EK.StructuredAssignmentPattern: "an assignment pattern",
            EK.ReplicatedAssignmentPattern: "an assignment pattern",
            }.get(e.kind, f"the expression kind {e.kind.name}")


def _stmt_words(k) -> str:
    return {STK.WhileLoop: "a while loop", STK.DoWhileLoop: "a do-while loop",
            STK.ForeverLoop: "a forever loop", STK.ForeachLoop: "a foreach loop",
            STK.Break: "break", STK.Continue: "continue", STK.Disable: "disable",
            STK.Wait: "wait", STK.EventTrigger: "an event trigger",
            STK.PatternCase: "case matches", STK.RandCase: "randcase",
            STK.ProceduralAssign: "a procedural assign/force",
            STK.ProceduralDeassign: "deassign/release"}.get(k, f"the statement kind {k.name}")


Translator._dispatch = {
    EK.IntegerLiteral: Translator._literal,
    EK.UnbasedUnsizedIntegerLiteral: Translator._unbased,
    EK.NamedValue: Translator._named,
    EK.HierarchicalValue: Translator._hier,
    EK.ElementSelect: Translator._select,
    EK.RangeSelect: Translator._select,
    EK.Concatenation: Translator._concat,
    EK.Replication: Translator._replication,
    EK.Conversion: Translator._conversion,
    EK.EmptyArgument: Translator._empty_arg,
    EK.LValueReference: Translator._lvalue_ref,
    EK.ConditionalOp: Translator._conditional,
    EK.UnaryOp: Translator._unary,
    EK.BinaryOp: Translator._binary,
    EK.Inside: Translator._inside,
    EK.Call: Translator._call,
    EK.Assignment: Translator._assignment_expr,
    EK.MemberAccess: Translator._member,
    EK.Streaming: Translator._streaming,
}

