"""Loops with constant bounds, unrolled, and functions, inlined at each call."""

from __future__ import annotations

from pyslang import ast

from verify.model.netlist import CONST0, CONST1
from verify.formats.verilog.constants import _to_int
from verify.formats.verilog.common import BO, EK, UO, _CONSTS, _MAX_LOOP
from verify.formats.verilog.procedural import _Frame


MAX_TOTAL_ITERATIONS = 1 << 17


class Unroll:
    """for / while / repeat loops and function calls inside procedural code."""

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
        trips = self._trip_count(s, loop_keys)
        if trips is not None and trips > _MAX_LOOP:
            runs = f"{trips:,}" if trips <= 10 * _MAX_LOOP else f"more than {10 * _MAX_LOOP:,}"
            raise self.fail(f"a for loop that runs {runs} times (the limit is {_MAX_LOOP:,})", s)
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
                self.count_iteration(s)
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

    _iterations = 0

    def count_iteration(self, s) -> None:
        """Loops are unrolled: all of them together may run MAX_TOTAL_ITERATIONS times."""
        self._iterations += 1
        if self._iterations > MAX_TOTAL_ITERATIONS:
            raise self.fail(f"loops in this design run more than {MAX_TOTAL_ITERATIONS:,} "
                            f"iterations in all (nested or repeated loops); each is unrolled "
                            f"into gates, so the design is refused as too large", s)

    def _trip_count(self, s, loop_keys) -> int | None:
        """How many times ``for (i = c0; i OP c1; i = i +/- c2)`` runs, counted with integers
        before anything is unrolled (up to ten times the limit); None for any other shape."""
        if len(loop_keys) != 1 or s.stopExpr is None or len(list(s.steps)) != 1:
            return None
        key = next(iter(loop_keys))
        cur = self.frame.env.get(key)
        if cur is None or not all(v in _CONSTS for v in cur):
            return None
        sym = key[1]
        i = _to_int(cur, sym.type.isSigned)
        stop = s.stopExpr
        if stop.kind != EK.BinaryOp or _strip(stop.left).kind != EK.NamedValue or \
                _strip(stop.left).symbol is not sym:
            return None
        bound = self.try_const(stop.right)
        if bound is None:
            return None
        rt = stop.right.type
        if rt.isSigned and rt.bitWidth and bound >> (rt.bitWidth - 1) & 1:
            bound -= 1 << rt.bitWidth
        tests = {BO.LessThan: lambda a: a < bound, BO.LessThanEqual: lambda a: a <= bound,
                 BO.GreaterThan: lambda a: a > bound, BO.GreaterThanEqual: lambda a: a >= bound,
                 BO.Inequality: lambda a: a != bound}
        test = tests.get(stop.op)
        step = next(iter(s.steps))
        delta = None
        if step.kind == EK.UnaryOp and _strip(step.operand).kind == EK.NamedValue and \
                _strip(step.operand).symbol is sym:
            delta = 1 if step.op in (UO.Preincrement, UO.Postincrement) else -1
        elif step.kind == EK.Assignment and step.left.kind == EK.NamedValue and \
                step.left.symbol is sym:
            r = _strip(step.right)
            if r.kind == EK.BinaryOp and r.op in (BO.Add, BO.Subtract):
                left = _strip(r.left)
                if left.kind == EK.LValueReference or (left.kind == EK.NamedValue
                                                       and left.symbol is sym):
                    d = self.try_const(r.right)
                    if d is not None:
                        rw = r.right.type.bitWidth
                        if r.right.type.isSigned and rw and d >> (rw - 1) & 1:
                            d -= 1 << rw
                        delta = d if r.op == BO.Add else -d
        if test is None or not delta:
            return None
        limit = 10 * _MAX_LOOP
        if stop.op in (BO.LessThan, BO.LessThanEqual) and delta > 0 or \
                stop.op in (BO.GreaterThan, BO.GreaterThanEqual) and delta < 0:
            span = bound - i + (1 if stop.op in (BO.LessThanEqual, BO.GreaterThanEqual) else 0) \
                if delta > 0 else i - bound + (1 if stop.op == BO.GreaterThanEqual else 0)
            return max(0, -(-span // abs(delta)))  # ceiling division
        n = 0
        while test(i) and n <= limit:
            n += 1
            i += delta
        return n

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
            self.count_iteration(s)
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



def _strip(e):
    """The expression under any conversions slang inserted."""
    while e.kind == EK.Conversion:
        e = e.operand
    return e
