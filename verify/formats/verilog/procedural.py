"""Procedural blocks: always/always_comb bodies executed symbolically, statement by statement.

A block's variables live in a ``_Frame``; each branch is executed from a copy of the frame and
the results are merged with multiplexers. Loops are unrolled and functions inlined (unroll.py).
"""

from __future__ import annotations

from pyslang import ast

from verify.formats.notes import note
from verify.formats.verilog.coverage import impossible
from verify.model import words
from verify.model.netlist import CONST0, CONST1
from verify.formats.verilog.common import _MAX_LOOP, BO, EK, SK, STK, UO, _stmt_words
from verify.formats.verilog.constants import _literal_chars, _representable


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
        self.path: list[str] = []  # nets that are 1 on the path being executed (if conditions)



# waveform-dump set-up only: an initial block that prints or stops is still refused, as before
_SIM_TASKS = {"$dumpfile", "$dumpvars", "$dumpon", "$dumpoff", "$dumpall", "$dumplimit",
              "$dumpflush", "$timeformat"}


def _only_system_tasks(stmt) -> bool:
    """Whether a statement only calls simulation system tasks (no assignment, no timing)."""
    stack = [stmt]
    while stack:
        s = stack.pop()
        k = s.kind
        if k == STK.List:
            stack.extend(s.list)
        elif k == STK.Block:
            stack.append(s.body)
        elif k == STK.Empty:
            continue
        elif k == STK.ExpressionStatement:
            e = s.expr
            if not (e.kind == EK.Call and e.isSystemCall and e.subroutineName in _SIM_TASKS):
                return False
        else:
            return False
    return True


class Procedural:
    """always blocks: statements, if/case merging, assignments into the block's frame."""

    def procedural(self, blk) -> None:
        pk = blk.procedureKind
        PK = ast.ProceduralBlockKind
        body = blk.body
        if pk in (PK.Initial, PK.Final) and _only_system_tasks(body):
            # $dumpfile/$dumpvars: waveform bookkeeping for a simulator, no logic
            note(f"an {'initial' if pk == PK.Initial else 'final'} block that only calls "
                 f"waveform-dump system tasks ($dumpfile, $dumpvars...) is ignored",
                 self.loc.line(blk.location))
            return
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
                self.drive(bits[o], v, self.where(blk), block_key=key)
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
        self.enter(s)
        try:
            self._exec(s)
        finally:
            self._nest -= 1

    def _exec(self, s) -> None:
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
            if n > _MAX_LOOP:
                raise self.fail(f"a repeat loop that runs {n:,} times (the limit is "
                                f"{_MAX_LOOP:,})", s)
            for _ in range(max(0, n)):
                self.count_iteration(s)
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
            new = words.increment(b, old)
        else:
            new = words.decrement(b, old)
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
        f.path.append(c)
        try:
            self.exec(s.ifTrue)
        finally:
            f.path.pop()
        t_state, t_ret = self._branch(), f.returned
        if s.ifFalse is None and self.impossible(f.path + [self.b.not_(c)]):
            # no else, but on this path the condition cannot be false in two-valued logic (an
            # if/else-if chain that covers every value): the missing else is never taken
            self.two_valued_note(s, "if/else-if chain")
            self._restore(t_state)
            f.returned = t_ret
            return
        self._restore(base)
        f.returned = False
        if s.ifFalse is not None:
            f.path.append(self.b.not_(c))
            try:
                self.exec(s.ifFalse)
            finally:
                f.path.pop()
        e_state, e_ret = self._branch(), f.returned
        if t_ret != e_ret:
            raise self.unsupported("a return on only some paths through a function", s)
        self.set_source(s)
        self._restore(self._merge(c, t_state, e_state))
        f.returned = t_ret

    def impossible(self, literals: list[str]) -> bool:
        return impossible(self.b, literals)

    def two_valued_note(self, s, what: str) -> None:
        note(f"this {what} covers every value of its conditions in two-valued logic, so no latch "
             f"is implied; x or z values on those conditions are not modeled",
             self.loc.line(s.sourceRange.start))

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
        if not full and s.defaultCase is None and matches and \
                self.impossible(f.path + [self.b.not_(self.truth(matches))]):
            full = True  # the items cover every value the selector can take here (two-valued)
            self.two_valued_note(s, "case statement")
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

