"""Translate a design elaborated by pyslang into the netlist model, bit by bit.

The work is shared by collaborating parts, each one a class holding the methods for its kind of
node, combined into ``Translator``:

- ``hierarchy.Hierarchy``: ports, scopes, instances, primitives, continuous assignments, and
  references to signals (which bits an lvalue or a read names);
- ``constants.Constants``: constant values and constant integer expressions;
- ``expressions.Expressions``: one method per expression kind, word arithmetic from
  ``verify.model.words``;
- ``procedural.Procedural`` and ``unroll.Unroll``: always blocks, statements, loops, functions;
- ``drivers.Drivers``: which value drives each net (and every net with more than one driver),
  and the final netlist.

Values are lists of nets, least significant bit first. Unpacked arrays are stored flat: element
position k (counted from the right-hand bound of the declared range) holds bits k*w .. k*w+w-1.
"""

from __future__ import annotations

from verify.errors import InputError
from verify.formats.verilog.constants import Constants
from verify.formats.verilog.drivers import Drivers, _Builder
from verify.formats.verilog.expressions import Expressions
from verify.formats.verilog.hierarchy import Hierarchy
from verify.formats.verilog.procedural import Procedural, _Frame
from verify.formats.verilog.unroll import Unroll


class Translator(Hierarchy, Expressions, Constants, Procedural, Unroll, Drivers):
    def __init__(self, locator, origin: str):
        self.loc = locator
        self.origin = origin
        self.b = _Builder(prefix="$", fold=True, share=False)
        self.sigs: dict[tuple, list[str]] = {}
        self.sig_where: dict[str, str | None] = {}  # placeholder -> where declared
        self.placeholders: dict[str, None] = {}  # ordered set
        self.alias: dict[str, str] = {}
        self.alias_where: dict[str, str | None] = {}
        self.conflicts: dict[str, list[str | None]] = {}  # net -> where each driver is
        self.block_drives: dict[str, tuple] = {}  # net -> signal key, driven by a block
        self.outside_reads: set[tuple] = set()  # signals whose module-level value is read
        self.port_keys: set[tuple] = set()  # signals that are ports (of the top or an instance)
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

