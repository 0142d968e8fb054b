"""The design hierarchy: signals and their bits, ports, instances, primitives, continuous
assignments, and references to (parts of) signals on either side of an assignment."""

from __future__ import annotations

import re

from pyslang import ast

from verify.model.netlist import CONST0, CONST1
from verify.formats.verilog.common import EK, SK, _kind_words
from verify.formats.verilog.common import _GATE_PRIMS, _TRI_PRIMS, _IGNORED_MEMBERS
from verify.model.netlist import MAX_PORT_WIDTH, Port, bit_name
from verify.formats.verilog.drivers import MAX_SIGNAL_BITS, MAX_TOTAL_BITS
from verify.formats.notes import note


MAX_UDP_INPUTS = 12


class Hierarchy:
    """Walks scopes and instances; owns the map from Verilog signals to placeholder nets."""

    _specify_noted = False
    refused_cells: dict[str, str] = {}  # Liberty cells that cannot be used, and why

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
        if w > MAX_SIGNAL_BITS:
            raise self.fail(f"'{sym.name}' is {w:,} bits wide; the limit for one signal is "
                            f"{MAX_SIGNAL_BITS:,} bits", sym)
        if len(self.placeholders) + w > MAX_TOTAL_BITS:
            raise self.fail(f"the design's signals hold more than {MAX_TOTAL_BITS:,} bits in all; "
                            f"refused as too large", sym)
        where = self.loc.where(sym.location)
        bits = self._bit_names(t, self.name_of(sym))
        for b in bits:
            self.placeholders[b] = None
            self.sig_where[b] = where
        self.sigs[k] = bits
        return bits


    # ==== the hierarchy =================================================================
    def run(self, inst):
        self.inst_hp = inst.hierarchicalPath
        self.path = ""
        inputs: list[Port] = []
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
            if w > MAX_PORT_WIDTH:
                raise self.fail(f"top-level port '{port.name}' is {w:,} bits wide; the widest port "
                                f"supported is {MAX_PORT_WIDTH:,} bits", port)
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
                self.port_keys.add((self.path, internal))
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
                self.delay_note(m)
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
            elif k == SK.SpecifyBlock:
                if not self._specify_noted:
                    self._specify_noted = True
                    note("specify blocks (path delays, timing checks) are ignored: only the logic "
                         "is checked", self.loc.line(m.location))
            elif k in _IGNORED_MEMBERS:
                continue
            elif k == SK.UninstantiatedDef:
                raise self.fail(f"instance of an unknown module '{getattr(m, 'definitionName', m.name)}'", m)
            else:
                raise self.unsupported(f"{_kind_words(k)} ('{m.name}')" if m.name else _kind_words(k), m)

    def instance(self, inst) -> None:
        if not inst.isModule:
            raise self.unsupported(f"interface instance '{inst.name}'", inst)
        why = self.refused_cells.get(inst.definition.name)
        if why is not None:
            raise self.fail(f"instance '{inst.name}': {why}", inst)
        parent_path, parent_hp = self.path, self.inst_hp
        child_rel = inst.hierarchicalPath
        if parent_hp and child_rel.startswith(parent_hp + "."):
            child_rel = child_rel[len(parent_hp) + 1:]
        child_path = parent_path + child_rel + "."
        body = inst.body
        is_cell = getattr(self.loc, "is_library_cell", None)
        cell_where = self.where(inst.definition) if is_cell and is_cell(inst.definition) else None
        if cell_where:  # "lib:line", as the gates of the cell's function name it
            cell_where = re.sub(r":\d+$", "", cell_where) if cell_where.count(":") > 1 else cell_where
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
        self.port_keys.update((child_path, internal) for _, _, internal in connections)
        self.path, self.inst_hp = parent_path, parent_hp
        for (pc, port, internal), cbits in zip(connections, child_bits):
            d = port.direction
            expr = pc.expression
            if d == ast.ArgumentDirection.InOut and expr is not None:
                d = self.inout_as(inst, port, internal, body, expr)
            if d not in (ast.ArgumentDirection.In, ast.ArgumentDirection.Out):
                raise self.fail(f"port '{port.name}' of module '{inst.definition.name}' is "
                                f"{d.name.lower()}: inout (tristate) and ref ports are not supported",
                                expr if expr is not None else inst)
            if expr is None:
                continue  # unconnected: an input floats (caught if it matters), an output is unused
            self.set_source(expr)
            w = self.where(expr)
            if port.direction == ast.ArgumentDirection.InOut:
                outer = expr.left if expr.kind == EK.Assignment else expr
                if d == ast.ArgumentDirection.In:
                    bits = self.fit(self.ev(outer), len(cbits), outer.type.isSigned)
                    for p, v in zip(cbits, bits):
                        self.drive(p, v, w)
                else:
                    self.assign_lvalue(outer, [self.res(x) for x in cbits], w)
            elif d == ast.ArgumentDirection.In:
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
                if cell_where is not None:  # one gate per cell output: timing counts each cell
                    source, self.b.source = self.b.source, f"{cell_where} {child_rel}"
                    value = [self.b.gate("buf", v, keep=True) for v in value]
                    self.b.source = source
                self.assign_lvalue(expr.left, value, w)
        self.path, self.inst_hp = child_path, inst.hierarchicalPath
        try:
            self.scope(body)
        finally:
            self.path, self.inst_hp = parent_path, parent_hp

    def inout_as(self, inst, port, internal, body, expr):
        """The direction an inout port of an inner module really has: In when the module only
        reads it, Out when the module drives it (then nothing else may: the driver check
        refuses a second one); InOut (refused) when it passes it on to another inout port."""
        driven = False
        both = False

        def names_it(e) -> bool:
            while True:
                k = e.kind
                if k == EK.NamedValue:
                    return e.symbol is internal
                if k == EK.Concatenation:
                    return any(names_it(x) for x in e.operands)
                if k in (EK.ElementSelect, EK.RangeSelect, EK.MemberAccess):
                    e = e.value
                elif k == EK.Conversion:
                    e = e.operand
                else:
                    return False

        def visit(n):
            nonlocal driven, both
            if isinstance(n, ast.AssignmentExpression) and names_it(n.left):
                driven = True
            elif isinstance(n, ast.PrimitiveInstanceSymbol):
                conns = list(n.portConnections)
                outs = conns[:-1] if n.primitiveType.name in ("buf", "not") else conns[:1]
                for c in outs:
                    if names_it(c.left if c.kind == EK.Assignment else c):
                        driven = True
            elif isinstance(n, ast.InstanceSymbol):
                for pc in n.portConnections:
                    e = pc.expression
                    if e is None:
                        continue
                    if names_it(e.left if e.kind == EK.Assignment else e):
                        if pc.port.direction == ast.ArgumentDirection.Out:
                            driven = True
                        elif pc.port.direction != ast.ArgumentDirection.In:
                            both = True

        body.visit(visit)
        if both:
            return ast.ArgumentDirection.InOut
        d = ast.ArgumentDirection.Out if driven else ast.ArgumentDirection.In
        what = "drives it: treated as an output" if driven else "only reads it: treated as an input"
        note(f"inout port '{port.name}' of module '{inst.definition.name}': the module {what}",
             self.loc.line(expr.sourceRange.start) if hasattr(expr, "sourceRange") else None)
        return d

    def primitive(self, prim) -> None:
        ptype = prim.primitiveType
        name = ptype.name
        self.delay_note(prim)
        if ptype.primitiveKind == ast.PrimitiveSymbol.PrimitiveKind.UserDefined:
            return self.udp(prim, ptype)
        if name not in _GATE_PRIMS:
            what = "tristate or switch primitive" if name in _TRI_PRIMS else "primitive"
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

    def udp(self, prim, ptype) -> None:
        """A combinational user-defined primitive: its table read in two-valued logic (a row
        matches an input 0 with 0, 1 with 1, ? and b with either; an x in a row matches neither)
        and built as a multiplexer tree over the inputs. Input values no row covers give x."""
        name = ptype.name
        if ptype.isSequential:
            raise self.fail(f"user-defined primitive '{name}' is sequential (it has a state "
                            f"column): only combinational designs can be checked", prim)
        conns = list(prim.portConnections)
        n = len(conns) - 1
        if n > MAX_UDP_INPUTS:
            raise self.unsupported(f"user-defined primitive '{name}' with {n} inputs (the limit "
                                   f"is {MAX_UDP_INPUTS})", prim)
        rows = [(e.inputs, e.output) for e in ptype.table]
        table: list[str] = []
        for i in range(1 << n):
            out = "x"
            for ins, o in rows:
                if len(ins) == n and all(c in "?b" or c == ("1" if i >> j & 1 else "0")
                                         for j, c in enumerate(ins)):
                    out = o if o in "01" else "x"
                    break
            table.append(out)
        self.set_source(prim)
        w = self.where(prim)
        x = None
        if "x" in table:
            x = self.xbit(w, f"an x from user-defined primitive '{name}' (no table row matches "
                             f"some input values)")
        vals = [CONST1 if t == "1" else CONST0 if t == "0" else x for t in table]
        ins = []
        for e in conns[1:]:
            bits = self.ev(e)
            ins.append(bits[0] if bits else self.xbit(self.where(e)))
        b = self.b
        for sel in ins:  # input j is bit j of the table index: fold the table one input at a time
            vals = [b.mux(sel, vals[k], vals[k + 1]) for k in range(0, len(vals), 2)]
        v = vals[0]
        out = conns[0]
        lhs = out.left if out.kind == EK.Assignment else out
        self.assign_lvalue(lhs, [v] * max(1, self.width(lhs.type, out)), w)

    def delay_note(self, node) -> None:
        """Delays (#d on gates, nets and assignments) do not change the logic: one note."""
        if self._delay_noted or getattr(node, "delay", None) is None:
            return
        self._delay_noted = True
        note("delays (#...) are ignored: only the logic is checked", self.loc.line(node.location))

    _delay_noted = False

    def continuous(self, ca) -> None:
        self.delay_note(ca)
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

