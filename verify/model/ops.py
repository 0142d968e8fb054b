"""The one table of gate ops: what each op means, everywhere the project needs it.

Every gate has one output bit. The simulator, every engine, the builder's folding, the Verilog
writer and the diagnosis draw an op's meaning from ``OPS`` and nowhere else, so adding an op is
adding one row here.

=========  ============  =======================================================
op         inputs        output
=========  ============  =======================================================
and        2 or more     1 when every input is 1
or         2 or more     1 when any input is 1
xor        2 or more     1 when an odd number of inputs are 1
nand       2 or more     not and
nor        2 or more     not or
xnor       2 or more     not xor
not        1             the inverted input
buf        1             the input (a plain connection)
mux        3: sel,d0,d1  d1 when sel is 1, else d0
maj        3             1 when at least two inputs are 1
const0     0             0
const1     0             1
=========  ============  =======================================================

Each row gives the op's meaning in five forms:

- ``word(args)``: Python source over *words* (bit j of a word is the value in vector j); ``M`` is
  the all-ones mask of a word, so ``not x`` is ``x ^ M``. The same source serves Python integers
  and numpy ``uint64`` arrays.
- ``bit(values)``: the value on one vector of 0/1 integers (derived from ``word`` with ``M = 1``).
- ``z3(args)``: a z3 Boolean term of z3 Boolean terms.
- ``verilog(args)``: a Verilog expression of net expressions.
- ``clauses(out, args, fresh)``: CNF clauses (lists of non-zero ints, DIMACS style) that hold
  exactly when the literal ``out`` equals the op of the literals ``args`` (the Tseitin encoding);
  ``fresh()`` hands out new variable numbers (only XOR/XNOR of three or more inputs need them).
- ``settle(k)``: the floating-mode rule, as the minimal sets of inputs that settle the output of
  a ``k``-input gate. Each set is a tuple of ``(input index, value)``: the output is determined
  once every input of some set is stable, at ``value`` where that is 0 or 1 (``None``: at
  whatever value). ``determined(stable, values)`` applies it to one vector. The rule in words:
  one input at the controlling value settles and/or/nand/nor, otherwise all of them; xor/xnor
  need every input; a mux needs its select and the selected input, or both data inputs equal; a
  majority gate needs two equal inputs; not/buf need their input; a constant needs nothing.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import reduce
from typing import Callable, Sequence


@dataclass(frozen=True)
class Op:
    name: str
    min_inputs: int
    max_inputs: int | None  # None: no limit
    word: Callable[[Sequence[str]], str]
    z3: Callable[[Sequence], object]
    verilog: Callable[[Sequence[str]], str]
    clauses: Callable[..., list[list[int]]]
    #: the value that, on any one input, fixes the output whatever the others are (and: 0,
    #: or: 1); None where no single input decides (xor, mux, maj, not, buf)
    controlling: int | None = None
    #: floating-mode rule (see the module doc): k -> minimal settling input sets; derived from
    #: ``controlling`` when that is given
    settle: Callable[[int], list[tuple[tuple[int, int | None], ...]]] | None = None

    def __post_init__(self) -> None:
        if self.settle is None and self.controlling is not None:
            object.__setattr__(self, "settle", _settle_controlled(self.controlling))

    def arity_ok(self, n: int) -> bool:
        return n >= self.min_inputs and (self.max_inputs is None or n <= self.max_inputs)

    def evaluate(self, words: Sequence, mask) -> object:
        """The output word for input words (Python ints or numpy arrays), ``mask`` all ones."""
        return _word_function(self.name, len(words))(*words, mask)

    def bit(self, values: Sequence[int]) -> int:
        """The output for one vector of 0/1 inputs."""
        return self.evaluate(values, 1) & 1

    def settling_sets(self, k: int) -> list[tuple[tuple[int, int | None], ...]]:
        """The floating-mode rule for ``k`` inputs: the minimal input sets that settle the output."""
        return self.settle(k)

    def determined(self, stable: Sequence[bool], values: Sequence[int]) -> bool:
        """Whether the inputs marked stable, at their ``values``, fix the output (floating mode)."""
        return any(all(stable[i] and (v is None or values[i] == v) for i, v in group)
                   for group in self.settle(len(stable)))


def _settle_all(k: int):
    return [tuple((i, None) for i in range(k))]


def _settle_controlled(c: int):
    def rule(k: int):
        return [((i, c),) for i in range(k)] + _settle_all(k)
    return rule


def _settle_mux(k: int):
    return [((0, 0), (1, None)), ((0, 1), (2, None)), ((1, 0), (2, 0)), ((1, 1), (2, 1))]


def _settle_maj(k: int):
    return [((i, v), (j, v)) for i in range(3) for j in range(i + 1, 3) for v in (0, 1)]


def _settle_nothing(k: int):
    return [()]


def _join(sym: str, a: Sequence[str]) -> str:
    return f" {sym} ".join(a)


def _z3():
    import z3
    return z3


def _z3_xor(a):
    z3 = _z3()
    return reduce(z3.Xor, a)


# ---- CNF (Tseitin) ---------------------------------------------------------------------------

def _and_cnf(o: int, a: Sequence[int], fresh=None) -> list[list[int]]:
    return [[-o, x] for x in a] + [[o, *(-x for x in a)]]


def _or_cnf(o: int, a: Sequence[int], fresh=None) -> list[list[int]]:
    return [[o, -x] for x in a] + [[-o, *a]]


def _xor2_cnf(o: int, x: int, y: int) -> list[list[int]]:
    return [[-o, x, y], [-o, -x, -y], [o, -x, y], [o, x, -y]]


def _xor_cnf(o: int, a: Sequence[int], fresh: Callable[[], int]) -> list[list[int]]:
    """A chain of two-input XORs through fresh variables (linear, not 2^n clauses)."""
    out: list[list[int]] = []
    acc = a[0]
    for k, x in enumerate(a[1:]):
        t = o if k == len(a) - 2 else fresh()
        out += _xor2_cnf(t, acc, x)
        acc = t
    return out


def _negated(cnf: Callable[..., list[list[int]]]):
    def clauses(o: int, a: Sequence[int], fresh=None) -> list[list[int]]:
        return cnf(-o, a, fresh)
    return clauses


def _mux_cnf(o: int, a: Sequence[int], fresh=None) -> list[list[int]]:
    s, d0, d1 = a
    return [[s, -d0, o], [s, d0, -o], [-s, -d1, o], [-s, d1, -o],
            [-d0, -d1, o], [d0, d1, -o]]  # the last two are redundant but help propagation


def _maj_cnf(o: int, a: Sequence[int], fresh=None) -> list[list[int]]:
    x, y, z = a
    return [[-x, -y, o], [-x, -z, o], [-y, -z, o], [x, y, -o], [x, z, -o], [y, z, -o]]


def _xor_clauses(o: int, a: Sequence[int], fresh: Callable[[], int]) -> list[list[int]]:
    if len(a) == 2:
        return _xor2_cnf(o, a[0], a[1])
    return _xor_cnf(o, a, fresh)


def _same(o: int, a: Sequence[int], fresh=None) -> list[list[int]]:
    return [[-o, a[0]], [o, -a[0]]]


OPS: dict[str, Op] = {op.name: op for op in (
    Op("and", 2, None, lambda a: _join("&", a), lambda a: _z3().And(*a),
       lambda a: _join("&", a), _and_cnf, controlling=0),
    Op("or", 2, None, lambda a: _join("|", a), lambda a: _z3().Or(*a),
       lambda a: _join("|", a), _or_cnf, controlling=1),
    Op("xor", 2, None, lambda a: _join("^", a), _z3_xor, lambda a: _join("^", a), _xor_clauses,
       settle=_settle_all),
    Op("nand", 2, None, lambda a: f"({_join('&', a)}) ^ M", lambda a: _z3().Not(_z3().And(*a)),
       lambda a: f"~({_join('&', a)})", _negated(_and_cnf), controlling=0),
    Op("nor", 2, None, lambda a: f"({_join('|', a)}) ^ M", lambda a: _z3().Not(_z3().Or(*a)),
       lambda a: f"~({_join('|', a)})", _negated(_or_cnf), controlling=1),
    Op("xnor", 2, None, lambda a: f"({_join('^', a)}) ^ M", lambda a: _z3().Not(_z3_xor(a)),
       lambda a: f"~({_join('^', a)})", _negated(_xor_clauses),
       settle=_settle_all),
    Op("not", 1, 1, lambda a: f"{a[0]} ^ M", lambda a: _z3().Not(a[0]), lambda a: f"~{a[0]}",
       lambda o, a, fresh=None: _same(-o, a), settle=_settle_all),
    Op("buf", 1, 1, lambda a: a[0], lambda a: a[0], lambda a: a[0], _same,
       settle=_settle_all),
    Op("mux", 3, 3, lambda a: f"{a[1]} ^ ({a[0]} & ({a[1]} ^ {a[2]}))",
       lambda a: _z3().If(a[0], a[2], a[1]), lambda a: f"{a[0]} ? {a[2]} : {a[1]}", _mux_cnf,
       settle=_settle_mux),
    Op("maj", 3, 3, lambda a: f"({a[0]} & {a[1]}) | ({a[2]} & ({a[0]} | {a[1]}))",
       lambda a: _z3().Or(_z3().And(a[0], a[1]), _z3().And(a[2], _z3().Or(a[0], a[1]))),
       lambda a: f"({a[0]} & {a[1]}) | ({a[2]} & ({a[0]} | {a[1]}))", _maj_cnf,
       settle=_settle_maj),
    Op("const0", 0, 0, lambda a: "0", lambda a: _z3().BoolVal(False), lambda a: "1'b0",
       lambda o, a, fresh=None: [[-o]], settle=_settle_nothing),
    Op("const1", 0, 0, lambda a: "M", lambda a: _z3().BoolVal(True), lambda a: "1'b1",
       lambda o, a, fresh=None: [[o]], settle=_settle_nothing),
)}


_COMPILED: dict[tuple[str, int], Callable] = {}


def _word_function(name: str, n: int) -> Callable:
    """``OPS[name].word`` compiled once per op and input count into a function of words and M."""
    fn = _COMPILED.get((name, n))
    if fn is None:
        args = [f"x{k}" for k in range(n)]
        fn = eval(f"lambda {', '.join(args + ['M'])}: {OPS[name].word(args)}")  # noqa: S307 - our table
        _COMPILED[(name, n)] = fn
    return fn


def arity_text(op: Op) -> str:
    if op.min_inputs == op.max_inputs:
        return str(op.min_inputs)
    return f"at least {op.min_inputs}"
