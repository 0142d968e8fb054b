"""One explicit stack instead of recursion, for the parser and every translation.

A grammar rule or a visit method is a generator: ``value = yield sub`` hands a sub-generator
(or, in a :class:`Visitor`, a child node) to the driver, which runs it on its own stack and sends
the result back. A spec nested thousands of levels deep costs memory, never Python stack, and
the process recursion limit is never touched.
"""

from __future__ import annotations

import types
from typing import Any, Generator


def run(start: Generator) -> Any:
    """Drive a generator that yields sub-generators: each yielded generator runs to its end and
    its return value is sent back to the one that yielded it. No Python recursion."""
    stack = [start]
    value = None
    while True:
        try:
            item = stack[-1].send(value)
        except StopIteration as stop:
            stack.pop()
            if not stack:
                return stop.value
            value = stop.value
            continue
        stack.append(item)
        value = None


class Visitor:
    """One method ``visit_<Kind>`` per node kind. A method that needs a child's value is a
    generator and writes ``value = yield child``; :meth:`visit` runs them all on one stack."""

    def visit(self, node) -> Any:
        r = self.node(node)
        return run(self._expand(r)) if isinstance(r, types.GeneratorType) else r

    def node(self, node) -> Any:
        """The hook every node goes through (override to short-circuit, e.g. constants)."""
        return getattr(self, "visit_" + type(node).__name__)(node)

    def _expand(self, gen: Generator) -> Generator:
        value = None
        while True:
            try:
                child = gen.send(value)
            except StopIteration as stop:
                return stop.value
            r = self.node(child)
            value = (yield self._expand(r)) if isinstance(r, types.GeneratorType) else r
