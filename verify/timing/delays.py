"""Gate delay models: how long each gate takes, in whole ticks of a stated time unit.

A model is an object with ``name``, ``unit`` (the time unit its figures are in, e.g. ``"ns"`` or
``"gate delay"``), ``ticks_per_unit`` (an integer; every delay is a whole number of ticks, so
sums of delays are exact) and ``ticks(gate) -> int``. ``seconds``-free: the models say nothing
about wires, slews or loads; a delay is one number per gate.

Models shipped here:

- ``unit``: every gate takes 1; ``buf`` (a plain connection) and the constants take 0.
- a TOML table (``load_toml``): a delay per op and an increase per input beyond two; see
  ``designs/delays/typical.toml`` for the layout.
- ``PerGateModel``: a delay looked up per gate (by its cell or ``source``) with another model for
  the gates it does not know; ``library_model(library, cell_of)`` is this with one delay per cell
  read from a Liberty library (``verify.formats.liberty.read_liberty``, duck-typed here).

``resolve(text)`` turns a ``--delays`` value (``unit`` or a path to a TOML file) into a model.
"""

from __future__ import annotations

from decimal import Decimal, InvalidOperation
from fractions import Fraction
from pathlib import Path
from typing import Callable, Mapping

from verify.errors import InputError
from verify.model.ops import OPS

try:
    import tomllib
except ModuleNotFoundError:  # pragma: no cover - Python 3.10
    import tomli as tomllib  # type: ignore[no-redef]

#: ops that take no time in every model: a plain connection and the constants
ZERO_DELAY_OPS = ("buf", "const0", "const1")


class DelayModel:
    """Base: a name, a unit, integer ticks per gate."""

    name = "model"
    unit = "gate delay"
    ticks_per_unit = 1

    def ticks(self, gate) -> int:  # pragma: no cover - overridden
        raise NotImplementedError

    def to_units(self, ticks: int | float) -> float:
        """Ticks as a number in the model's unit."""
        return float(Fraction(int(ticks), self.ticks_per_unit))

    def describe(self) -> str:
        return f"{self.name} ({self.unit})"


class UnitModel(DelayModel):
    """Every gate 1, except ``buf`` and the constants: 0 (a connection is not a gate)."""

    name = "unit"
    unit = "gate delay"
    ticks_per_unit = 1

    def ticks(self, gate) -> int:
        return 0 if gate.op in ZERO_DELAY_OPS else 1


class TableModel(DelayModel):
    """A delay per op plus an increase per input beyond two, from a TOML file."""

    def __init__(self, name: str, unit: str, delay: Mapping[str, Decimal],
                 extra_input: Mapping[str, Decimal], origin: str | None = None):
        self.name, self.unit, self.origin = name, unit, origin
        self.delay, self.extra_input = dict(delay), dict(extra_input)
        places = max([_places(v) for v in (*self.delay.values(), *self.extra_input.values())] + [0])
        self.ticks_per_unit = 10 ** places
        self._cache: dict[tuple[str, int], int] = {}

    def ticks(self, gate) -> int:
        key = (gate.op, len(gate.inputs))
        t = self._cache.get(key)
        if t is None:
            if gate.op in ZERO_DELAY_OPS and gate.op not in self.delay:
                value = Decimal(0)
            else:
                value = self.delay[gate.op] + max(0, len(gate.inputs) - 2) * \
                    self.extra_input.get(gate.op, self.extra_input.get("default", Decimal(0)))
            t = int(value * self.ticks_per_unit)
            self._cache[key] = t
        return t


class PerGateModel(DelayModel):
    """A delay looked up per gate, e.g. per library cell; ``fallback`` for gates it lacks.

    ``lookup(gate)`` returns a delay in this model's unit or None. A Liberty-based model is this
    class with ``lookup`` reading a cell's delay from the library by the gate's ``source``.
    """

    def __init__(self, name: str, unit: str, lookup: Callable[[object], float | None],
                 fallback: DelayModel, ticks_per_unit: int = 1000):
        self.name, self.unit, self.lookup, self.fallback = name, unit, lookup, fallback
        self.ticks_per_unit = ticks_per_unit

    def ticks(self, gate) -> int:
        d = self.lookup(gate)
        if d is None:
            return round(Fraction(self.fallback.ticks(gate), self.fallback.ticks_per_unit)
                         * self.ticks_per_unit)
        return round(Fraction(str(d)) * self.ticks_per_unit)


#: the Liberty tables a cell delay is read from
CELL_DELAY_TABLES = ("cell_rise", "cell_fall")


def cell_delays(library) -> dict[str, float]:
    """One delay per cell of a Liberty library (``verify.formats.liberty.read_liberty``).

    A cell's delay is the largest entry at the first index point (the smallest input transition
    and output load the table lists) of its ``cell_rise``/``cell_fall`` tables over all of its
    timing arcs: one number per cell, in the library's time unit. Cells without such tables are
    left out (the fallback model times them).
    """
    out: dict[str, float] = {}
    for name, cell in library.cells.items():
        worst = None
        for arc in getattr(cell, "arcs", ()):
            for key in CELL_DELAY_TABLES:
                table = arc.tables.get(key)
                if table is None or not table.values or not table.values[0]:
                    continue
                v = float(table.values[0][0])
                worst = v if worst is None else max(worst, v)
        if worst is not None:
            out[name] = worst
    return out


def library_model(library, cell_of: Callable[[object], str | None], *, unit: str = "ns",
                  fallback: DelayModel | None = None) -> PerGateModel:
    """A per-gate model from a Liberty library: ``cell_of(gate)`` names the cell a gate stands
    for (None: a gate that is not a cell's output, timed by ``fallback``, default 0 for none).

    A cell modeled by several gates should map only the gate driving the cell's output to the
    cell; the others to None with a zero fallback, so a cell's delay is counted once.
    """
    delays = cell_delays(library)
    name = getattr(library, "name", "liberty")

    def lookup(gate):
        cell = cell_of(gate)
        return None if cell is None else delays.get(cell)
    return PerGateModel(str(name), unit, lookup, fallback or _ZeroModel())


class _ZeroModel(DelayModel):
    name = "zero"

    def ticks(self, gate) -> int:
        return 0


def _places(d: Decimal) -> int:
    exp = d.normalize().as_tuple().exponent
    return max(0, -exp) if isinstance(exp, int) else 0


def _number(value, where: str) -> Decimal:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"a delay is a number, got {value!r}", where)
    try:
        d = Decimal(str(value))
    except InvalidOperation:  # pragma: no cover - str of a number always parses
        raise InputError(f"a delay is a number, got {value!r}", where) from None
    if not d.is_finite() or d < 0:
        raise InputError(f"a delay is a number >= 0, got {value!r}", where)
    if _places(d) > 6:
        raise InputError(f"{value!r} has more than 6 decimal places; round it", where)
    return d


def load_toml(path: str | Path) -> TableModel:
    """Read a delay table (layout: ``designs/delays/typical.toml``); InputError on mistakes."""
    path = Path(path)
    where = str(path)
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except FileNotFoundError:
        raise InputError("no such delay file (give 'unit' or a TOML delay table)", where) from None
    except (OSError, UnicodeDecodeError) as e:
        raise InputError(f"cannot read the delay file: {e}", where) from None
    except tomllib.TOMLDecodeError as e:
        raise InputError(f"not valid TOML: {e}", where) from None
    known = {"name", "unit", "delay", "extra_input"}
    for key in data:
        if key not in known:
            raise InputError(f"unknown key '{key}' (known: {', '.join(sorted(known))})", where)
    table = data.get("delay")
    if not isinstance(table, dict) or not table:
        raise InputError("a delay table needs a [delay] section with a delay per op", where)
    delay = {}
    for op, value in table.items():
        if op not in OPS:
            raise InputError(f"[delay]: unknown op '{op}' (known: {', '.join(OPS)})", where)
        delay[op] = _number(value, f"{where}: [delay] {op}")
    missing = [op for op in OPS if op not in delay and op not in ZERO_DELAY_OPS]
    if missing:
        raise InputError(f"[delay] gives no delay for {', '.join(missing)}", where)
    extra = {}
    for op, value in (data.get("extra_input") or {}).items():
        if op not in OPS and op != "default":
            raise InputError(f"[extra_input]: unknown op '{op}'", where)
        extra[op] = _number(value, f"{where}: [extra_input] {op}")
    unit = data.get("unit", "ns")
    if not isinstance(unit, str) or unit not in TIME_UNITS:
        raise InputError(f"unit must be one of {', '.join(TIME_UNITS)}, got {unit!r}", where)
    name = data.get("name", path.stem)
    return TableModel(str(name), unit, delay, extra, origin=where)


#: time units a table may use, with the next finer unit (for VCD time stamps)
TIME_UNITS = ("s", "ms", "us", "ns", "ps", "fs")


def liberty_model(path: str | Path) -> PerGateModel:
    """Per-cell delays from a Liberty file, for netlists read with that file (``--cells``).

    The reader keeps one buffer at each output pin of each cell instance (source
    ``<lib file>:<cell line>:<col> <instance>``); the cell's delay (``cell_delays``: the worst arc
    at the tables' first index point) is placed on that buffer, and every other gate (the logic
    of a cell's function, glue logic outside cells) takes 0. So a path costs the delays of the
    cells it passes through, each once. A cell used without timing tables is refused rather than
    timed as 0. The unit is the library's ``time_unit`` (default ns).
    """
    from verify.formats.liberty import read_liberty

    lib = read_liberty(path)
    delays = cell_delays(lib)
    by_line = {cell.line: name for name, cell in lib.cells.items()}
    unit = _liberty_unit(Path(path))
    prefix = f"{lib.path}:"

    def lookup(gate):
        src = gate.source or ""
        if gate.op != "buf" or not src.startswith(prefix):
            return 0.0
        head = src[len(prefix):].split(" ", 1)[0].split(":")[0]
        cell = by_line.get(int(head)) if head.isdigit() else None
        if cell is None:
            return 0.0
        if cell not in delays:
            raise InputError(f"cell '{cell}' has no cell_rise/cell_fall tables: no delay to use "
                             f"for it (give a TOML table or 'unit' instead)", f"{lib.path}:{head}")
        return delays[cell]
    return PerGateModel(str(lib.name), unit, lookup, _ZeroModel())


def _liberty_unit(path: Path) -> str:
    import re
    try:
        text = path.read_text(errors="replace")
    except OSError:
        return "ns"
    m = re.search(r'time_unit\s*:\s*"?\s*1\s*(fs|ps|ns|us|ms|s)\b', text)
    return m.group(1) if m else "ns"


def resolve(spec: str | DelayModel | None) -> DelayModel:
    """``None`` or ``"unit"`` -> the unit model; a ``.lib`` path -> per-cell Liberty delays; another
    path -> its TOML table; a model -> itself."""
    if spec is None or (isinstance(spec, str) and spec.strip().lower() == "unit"):
        return UnitModel()
    if isinstance(spec, DelayModel):
        return spec
    if not isinstance(spec, (str, Path)):
        raise InputError(f"--delays takes 'unit', a TOML file or a Liberty file, not "
                         f"{type(spec).__name__}")
    if str(spec).endswith(".lib"):
        if not Path(spec).is_file():
            raise InputError("no such Liberty file", str(spec))
        return liberty_model(spec)
    return load_toml(spec)
