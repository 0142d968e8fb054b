"""Spec equations: what a design's outputs must equal.

A spec is one or more equations in Verilog expression syntax, separated by ``;``::

    {cout, sum} = a + b + cin
    sum = a + b; v = ($signed(a) + $signed(b)) != $signed(sum)

Meaning (exact):

* The right side is computed on unbounded Python integers. Ports are unsigned; ``$signed(x)``
  reads x as two's complement at x's self-determined width, ``$unsigned(x)`` reads its low bits at
  that width. The low bits that fit the left side are kept (value mod 2^L, split MSB first over a
  concatenation on the left).
* An identifier is an input port, or an output port completely defined by earlier equations (it
  stands for its specified value, unsigned at its port width).
* Every output bit of the design is defined exactly once over all equations.

Pipeline, one module per job: ``syntax`` (lexer with positions, precedence-climbing parser to an
immutable syntax tree, the explicit-stack visitor), ``resolve`` (names against the design, every
node's Verilog self-determined width and exact integer interval ``[lo, hi]``, width limits),
then three translations, each a visitor with one method per node kind: ``evaluate`` (Python
integers, the ground truth, :meth:`Spec.evaluate`), ``to_gates`` (:meth:`Spec.reference`) and
``to_z3`` (:meth:`Spec.to_z3`); ``printer`` (canonical text), ``model`` (the :class:`Spec`) and
``infer`` (the usual adder spec from port names).
"""

from verify.spec.infer import infer
from verify.spec.model import Spec, parse
from verify.spec.resolve import signed_width
from verify.spec.syntax import (MAX_BITS, MAX_DEPTH, MAX_PRODUCT_BITS, MAX_PRODUCT_GATES,
                                MAX_REFERENCE_GATES, MAX_SHIFT_GATES, UNSIZED_WIDTH, Binary, Cast,
                                Concat, Equation, Index, Name, Node, Number, Repeat, Slice, Target,
                                Ternary, Unary)

__all__ = ["Spec", "parse", "infer", "MAX_BITS"]
