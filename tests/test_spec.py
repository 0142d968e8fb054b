"""Tests for verify/spec/: parsing, the three translations (ints, gates, z3) and inference.

Outside references used here, named beside each check:
* Python's own integer arithmetic and operator precedence (where it coincides with Verilog);
* IEEE 1364-2005 table 5-4 (Verilog operator precedence), from memory, where Python differs;
* z3's own bit-vector arithmetic;
* the signed-overflow rule "carry into the sign bit differs from the carry out of it"
  (common practice, from memory).
"""

from __future__ import annotations

import itertools
import random

import pytest
import z3
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from verify.errors import InputError, SpecError
from verify.model.netlist import Netlist, Port
from verify.spec import MAX_BITS, Spec, infer, parse

try:  # the project's compiled simulator, when it is there: a second, independent evaluator
    from verify.sim import Simulator
except Exception:  # pragma: no cover - written by someone else at the same time
    Simulator = None


# ---- helpers -------------------------------------------------------------------------------

def design(inputs: dict[str, int], outputs: dict[str, int], name: str = "dut") -> Netlist:
    """Just the ports: parse/infer only read a design's name and ports."""
    return Netlist(name, tuple(Port(n, w) for n, w in inputs.items()),
                   tuple(Port(n, w) for n, w in outputs.items()), ())


RCA4 = design({"a": 4, "b": 4, "cin": 1}, {"sum": 4, "cout": 1}, "rca4")


def simulate(netlist: Netlist, inputs: dict[str, int]) -> dict[str, int]:
    """A tiny per-vector gate evaluator written here, independent of verify/sim.py."""
    val = {"0": 0, "1": 1}
    for p in netlist.inputs:
        for i, bit in enumerate(p.bits):
            val[bit] = inputs[p.name] >> i & 1
    for g in netlist.ordered_gates:
        x = [val[n] for n in g.inputs]
        op = g.op
        if op in ("and", "nand"):
            r = int(all(x))
        elif op in ("or", "nor"):
            r = int(any(x))
        elif op in ("xor", "xnor"):
            r = sum(x) & 1
        elif op in ("not", "buf"):
            r = x[0]
        elif op == "mux":
            r = x[2] if x[0] else x[1]
        elif op == "maj":
            r = int(sum(x) >= 2)
        elif op in ("const0", "const1"):
            r = 0
        else:  # pragma: no cover
            raise AssertionError(op)
        if op in ("nand", "nor", "xnor", "not", "const1"):
            r ^= 1
        val[g.output] = r
    return {p.name: sum(val[b] << i for i, b in enumerate(p.bits)) for p in netlist.outputs}


def z3_values(spec: Spec, d: Netlist, vector: dict[str, int]) -> dict[str, int]:
    """to_z3 on constant inputs, simplified by z3 to numbers."""
    terms = spec.to_z3({p.name: z3.BitVecVal(vector[p.name], p.width) for p in d.inputs})
    out = {}
    for port, term in terms.items():
        assert term.size() == d.width(port)
        out[port] = z3.simplify(term).as_long()
    return out


def vectors(d: Netlist, count: int, seed: int) -> list[dict[str, int]]:
    """Every vector when the inputs are small; otherwise corners plus random ones."""
    total = sum(p.width for p in d.inputs)
    if total <= 10:
        ranges = [range(1 << p.width) for p in d.inputs]
        return [dict(zip([p.name for p in d.inputs], combo)) for combo in itertools.product(*ranges)]
    rng = random.Random(seed)
    out = [{p.name: 0 for p in d.inputs}, {p.name: (1 << p.width) - 1 for p in d.inputs}]
    out += [{p.name: rng.getrandbits(p.width) for p in d.inputs} for _ in range(count)]
    return out


def signed(x: int, w: int) -> int:
    return x - (1 << w) if x >> (w - 1) & 1 else x


def spec_error(text: str, d: Netlist = RCA4) -> str:
    with pytest.raises(SpecError) as info:
        parse(text, d)
    err = info.value
    assert isinstance(err, InputError) and err.where == "spec"
    assert "\n" not in str(err)
    return err.message


# ---- precedence and associativity ------------------------------------------------------------

# Python gives | ^ & << >> + - * (and unary - ~) the same relative precedence and left
# associativity as C and Verilog (Python reference, "Operator precedence"; IEEE 1364-2005
# table 5-4, from memory). So a flat unparenthesized expression must mean the same in both.
_PY_SAME = ["|", "^", "&", "<<", ">>", "+", "-", "*"]

W8 = design({"a": 3, "b": 3, "c": 3, "d": 3}, {"y": 64}, "flat")


@st.composite
def flat_expr(draw):
    names = ["a", "b", "c", "d"]
    n = draw(st.integers(2, 6))
    parts = []
    for k in range(n):
        unary = draw(st.sampled_from(["", "", "-", "~"]))
        atom = draw(st.sampled_from(names + ["1", "2", "5"]))
        parts.append(unary + atom)
        if k < n - 1:
            parts.append(draw(st.sampled_from(_PY_SAME)))
    return " ".join(parts)


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(flat_expr(), st.lists(st.integers(0, 7), min_size=4, max_size=4))
def test_precedence_matches_python_where_the_languages_agree(text, vals):
    env = dict(zip("abcd", vals))
    try:
        spec = parse(f"y = {text}", W8)
    except SpecError as e:  # a shift by an amount that may be negative is refused, by design
        assume("negative" not in e.message)
        raise
    # Source: Python's own evaluation of the same text on integers.
    try:
        want = eval(text, {}, dict(env))  # noqa: S307 - our own generated arithmetic
    except ValueError:  # negative shift count at these values: refused by the spec above
        assume(False)
    assert spec.evaluate(env)["y"] == want % (1 << 64)


_ALL_BINARY = ["||", "&&", "|", "^", "~^", "^~", "&", "==", "!=", "<", "<=", ">", ">=",
               "<<", ">>", "<<<", ">>>", "+", "-", "*"]
_ALL_UNARY = ["+", "-", "!", "~", "&", "~&", "|", "~|", "^", "~^"]


@st.composite
def verilog_expr(draw, depth=3):
    kind = draw(st.sampled_from(["atom", "unary", "binary", "binary", "paren", "cond"]
                                if depth > 0 else ["atom", "unary"]))
    if kind == "atom":
        return draw(st.sampled_from(["a", "b", "c", "d", "1", "4'd3"]))
    if kind == "unary":
        inner = draw(verilog_expr(depth - 1)) if depth > 0 else draw(st.sampled_from(["a", "b"]))
        inner = inner if inner[0].isalnum() else f"({inner})"
        return draw(st.sampled_from(_ALL_UNARY)) + inner
    if kind == "binary":
        return f"{draw(verilog_expr(depth - 1))} {draw(st.sampled_from(_ALL_BINARY))} " \
               f"{draw(verilog_expr(depth - 1))}"
    if kind == "paren":
        return f"({draw(verilog_expr(depth - 1))})"
    return f"{draw(verilog_expr(depth - 1))} ? {draw(verilog_expr(depth - 1))} : " \
           f"{draw(verilog_expr(depth - 1))}"


def _ours_parenthesized(node) -> str:
    from verify import spec as sp
    if isinstance(node, sp.Binary):
        return f"({_ours_parenthesized(node.left)} {node.op} {_ours_parenthesized(node.right)})"
    if isinstance(node, sp.Unary):
        return f"({node.op}{_ours_parenthesized(node.arg)})"
    if isinstance(node, sp.Ternary):
        return (f"({_ours_parenthesized(node.cond)} ? {_ours_parenthesized(node.then)} : "
                f"{_ours_parenthesized(node.other)})")
    return node.name if isinstance(node, sp.Name) else node.text


def _slang_parenthesized(node) -> str:
    kind = type(node).__name__
    same = {"^~": "~^"}
    if kind == "BinaryExpressionSyntax":
        op = node.operatorToken.valueText
        return f"({_slang_parenthesized(node.left)} {same.get(op, op)} {_slang_parenthesized(node.right)})"
    if kind == "PrefixUnaryExpressionSyntax":
        op = node.operatorToken.valueText
        return f"({same.get(op, op)}{_slang_parenthesized(node.operand)})"
    if kind == "ParenthesizedExpressionSyntax":
        return _slang_parenthesized(node.expression)
    if kind == "ConditionalExpressionSyntax":
        return (f"({_slang_parenthesized(node.predicate.conditions[0].expr)} ? "
                f"{_slang_parenthesized(node.left)} : {_slang_parenthesized(node.right)})")
    if kind == "IdentifierNameSyntax":
        return node.identifier.valueText
    if kind in ("LiteralExpressionSyntax", "IntegerVectorExpressionSyntax"):
        return str(node).strip()
    raise AssertionError(kind)  # pragma: no cover


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(verilog_expr())
def test_parse_tree_matches_an_independent_verilog_parser(text):
    from pyslang import syntax
    from verify.spec.syntax import Parser as _Parser
    # Source: pyslang (slang), a standards-following SystemVerilog parser, parsing the same text.
    tree = syntax.SyntaxTree.fromText(f"module m; assign y = {text}; endmodule")
    assert not list(tree.diagnostics), text
    theirs = _slang_parenthesized(tree.root.members[0].assignments[0].right)
    ours = _ours_parenthesized(_Parser(f"y = {text}").equations()[0].rhs)
    assert ours == theirs


@pytest.mark.parametrize("text, verilog_meaning", [
    # IEEE 1364-2005 table 5-4 (from memory): == binds tighter than &, ^, |; Python compares last
    ("a == b & c", "(a == b) & c"),
    ("a & b == c", "a & (b == c)"),
    ("a | b != c", "a | (b != c)"),
    # relational above equality; Verilog does not chain comparisons (Python does)
    ("a < b == c < d", "(a < b) == (c < d)"),
    ("a < b < c", "(a < b) < c"),
    # shifts above relational, + above shifts
    ("a << 1 < b + c", "(a << 1) < (b + c)"),
    ("a + b << c", "(a + b) << c"),
    # && above ||, & above ^ above |
    ("a || b && c", "a || (b && c)"),
    ("a ^ b & c | d", "(a ^ (b & c)) | d"),
    # ?: is right associative and lowest
    ("a ? b : c ? d : 1", "a ? b : (c ? d : 1)"),
    ("a | b ? c : d", "(a | b) ? c : d"),
    # unary binds tightest; reductions apply to the operand after them
    ("-a + b", "(-a) + b"),
    ("~a & b", "(~a) & b"),
    ("!a == b", "(!a) == b"),
    ("&a | b", "(&a) | b"),
    ("a - b - c", "(a - b) - c"),
    ("a >> b >> c", "(a >> b) >> c"),
])
def test_verilog_precedence_where_python_differs(text, verilog_meaning):
    d = design({"a": 3, "b": 3, "c": 3, "d": 3}, {"y": 16})
    plain, explicit = parse(f"y = {text}", d), parse(f"y = {verilog_meaning}", d)
    for v in vectors(d, 0, 0)[::7]:
        assert plain.evaluate(v) == explicit.evaluate(v), v


def test_comparison_precedence_differs_from_python_on_a_known_vector():
    d = design({"a": 3, "b": 3, "c": 3}, {"y": 1})
    # a == b & c with a=1, b=1, c=0: Verilog (1 == 1) & 0 = 0; Python 1 == (1 & 0) is False too;
    # a=0, b=1, c=0: Verilog (0 == 1) & 0 = 0; Python 0 == (1 & 0) is True. Hand-computed.
    assert parse("y = a == b & c", d).evaluate({"a": 0, "b": 1, "c": 0})["y"] == 0
    assert (0 == (1 & 0)) is True  # Python's reading of the same text differs
    assert parse("y = (a == b) & c", d).evaluate({"a": 1, "b": 1, "c": 1})["y"] == 1


# ---- literals ---------------------------------------------------------------------------------

@pytest.mark.parametrize("literal, value", [
    # values by hand from the Verilog literal rules (IEEE 1364-2005 3.5.1, from memory)
    ("8'hFF", 255), ("4'b1010", 10), ("'d5", 5), ("16'h_ff_00", 0xFF00), ("3'o7", 7),
    ("12'd4095", 4095), ("1_000", 1000), ("8 'h 2A", 42), ("6'B10_1010", 42), ("'hdead", 0xDEAD),
    ("4'sb1111 + 0", -1 % (1 << 16)), ("$signed(4'b1111)", -1 % (1 << 16)),
])
def test_sized_and_based_literals(literal, value):
    d = design({"a": 1}, {"y": 16})
    assert parse(f"y = {literal}", d).evaluate({"a": 0})["y"] == value


@pytest.mark.parametrize("text, value", [
    # self-determined widths in a concatenation (IEEE 1364-2005 table 5-22, from memory)
    ("{4'd1, 4'd2}", 0x12),
    ("{'d1, 1'b0}", 2),                 # unsized literal: 32 bits
    ("{3{2'b10}}", 0b101010),
    ("{{2{a}}, b}", 0b1_1_000),         # a=1 (1 bit), b=0 (3 bits)
    ("{a + b, 1'b1}", 0b0011),          # a + b at max(1, 3) = 3 bits: 1 + 0 = 1
    ("{a == a, 2'b01}", 0b101),         # a comparison is 1 bit
    ("{b << 1, 1'b0}", 0),              # a shift keeps its left operand's width: 3 bits
    ("{$signed(b) - 1'b1}", 0b111),     # -1 at the width of b (3)
    ("{$signed(b) - 1}", 0xFF),         # an unsized 1 makes it 32 bits; y keeps 8
    ("{~a}", 0),                        # ~1 at 1 bit
])
def test_concatenation_takes_self_determined_widths(text, value):
    d = design({"a": 1, "b": 3}, {"y": 8})
    assert parse(f"y = {text}", d).evaluate({"a": 1, "b": 0})["y"] == value


# ---- error messages ---------------------------------------------------------------------------

@pytest.mark.parametrize("text, fragment", [
    ("{cout, sum} = (a + b", "column 21: expected ')' to close '(' at column 15, found the end"),
    ("{cout, sum} = a / b", "column 17: division '/' is not supported"),
    ("{cout, sum} = a % b", "column 17: modulo '%' is not supported"),
    ("{cout, sum} = a ** b", "column 17: power '**' is not supported"),
    ("{cout, sum} = a + d", "column 19: 'd' is not a port of rca4 (inputs: a, b, cin; outputs: sum, cout)"),
    ("{cout, a} = a + b", "column 8: 'a' is an input of rca4; the left side names outputs"),
    ("{cout, sum[4:0]} = a + b", "column 8: sum[4:0] selects bits outside sum[3:0]"),
    ("{cout, sum[0:3]} = a + b", "write a part-select high bit first (sum[3:0])"),
    ("{cout, sum} = a[4] + b", "column 15: a[4] selects bits outside a[3:0]"),
    ("{cout, sum} = 8'hxF", "column 18: x/z digits are not supported"),
    ("{cout, sum} = 4'b10z1", "x/z digits are not supported"),
    ("{cout, sum} = 4'd20", "column 15: literal \"4'd20\": value 20 does not fit in 4 bits"),
    ("{cout, sum} = 4'b102", "'2' is not a binary digit"),
    ("{cout, sum} = 0'd0", "a size must be at least 1"),
    ("{cout, sum} = 5'q3", "expected a base letter"),
    ("{cout, sum} = {0{a}}", "column 16: a replication count must be positive, got 0"),
    ("{cout, sum} = {b{a}}", "column 16: a replication count must be a constant"),
    ("cout = sum[3]; sum = a + b", "column 8: output 'sum' is used before it is defined"),
    ("{cout, sum} = a + b + cout", "output 'cout' is used before it is defined"),
    ("{cout, sum} = a + b; sum[0] = 0", "column 22: sum[0] is defined twice (first at column 8)"),
    ("sum = a + b", "the spec leaves outputs undefined: cout"),
    ("sum[3:2] = a; cout = 0", "undefined: sum[1:0]"),
    ("{cout, sum} = $sgned(a)", "column 15: unknown system function '$sgned' (known: $signed, $unsigned)"),
    ("{cout, sum} = a + b @ c", "column 21: unexpected character '@'"),
    ("{cout, sum} = a + b c", "column 21: unexpected 'c' after the expression"),
    ("{cout, sum} = ", "column 15: expected an expression, found the end of the spec"),
    ("{cout, sum} a + b", "column 13: expected '=' after the left side, found 'a'"),
    ("{cout, sum} <= a + b", "expected '=' after the left side, found '<='"),
    ("  ;  ", "the spec has no equations"),
    ("{cout, sum} = a << ($signed(b) - 1)", "the shift amount may be negative"),
    ("{cout, sum} = a[$signed(b)]", "the bit index may be negative"),
    ("{cout, sum} = a[b:0]", "a part-select bound must be a constant"),
    ("{cout, sum} = a ? b", "expected ':' to go with '?' at column 17"),
    ("{cout, sum} = {a, b", "expected '}' to close '{' at column 15"),
    ("{cout, sum = a", "expected '}' to close '{' at column 1"),
    ("{cout, 5} = a", "expected an output port name on the left side, found '5'"),
    ("{cout, sum} = a /* never closed", "comment '/*' is never closed"),
    ("{cout, sum} = a + \u00e9", "column 19: unexpected character '\u00e9'"),
    ("{cout, sum} = a + \u00b2", "unexpected character"),
    (f"{{cout, sum}} = {MAX_BITS + 1}'d1", f"a size over {MAX_BITS} bits"),
    ("{cout, sum} = " + "9" * 5000, "is longer than 4,000 decimal digits (write it in hex)"),
    ("{cout, sum} = 8'h" + "f" * (MAX_BITS // 4 + 2), f"is longer than {MAX_BITS} bits"),
])
def test_error_messages_say_what_and_where(text, fragment):
    assert fragment in spec_error(text)


def test_error_location_on_a_multiline_spec_names_the_line():
    msg = spec_error("sum = a + b;\n  cout = a + q")
    assert msg.startswith("line 2, column 14: 'q' is not a port")


def test_str_of_a_spec_error_is_one_line_with_its_place():
    with pytest.raises(SpecError) as info:
        parse("{cout, sum} = (a + b", RCA4)
    assert str(info.value) == ("spec: column 21: expected ')' to close '(' at column 15, "
                               "found the end of the spec")


def test_results_beyond_the_bit_limit_are_refused():
    d = design({"a": 4, "s": 18}, {"y": 8})
    assert f"more than {MAX_BITS:,} bits" in spec_error("y = a << s", d)
    assert f"limit is {MAX_BITS:,}" in spec_error(f"y = {{{MAX_BITS + 1}{{a[0]}}}}", d)
    # shifting right by a wide amount is fine: it only repeats the sign
    spec = parse("y = $signed(a) >> s", d)
    assert spec.evaluate({"a": 8, "s": 40000})["y"] == 255  # -8 >> big = -1 (Python floor)
    assert simulate(spec.reference(), {"a": 8, "s": 40000})["y"] == 255


def test_a_non_string_spec_is_refused():
    with pytest.raises(SpecError):
        parse(None, RCA4)  # type: ignore[arg-type]


# ---- evaluate against Python integers ----------------------------------------------------------

@settings(max_examples=200, deadline=None)
@given(st.integers(1, 64).flatmap(lambda n: st.tuples(
    st.just(n), st.integers(0, (1 << n) - 1), st.integers(0, (1 << n) - 1), st.integers(0, 1))))
def test_evaluate_adder_matches_python(args):
    n, a, b, cin = args
    d = design({"a": n, "b": n, "cin": 1}, {"sum": n, "cout": 1, "v": 1, "diff": n, "bout": 1})
    spec = parse("{cout, sum} = a + b + cin; v = ($signed(a) + $signed(b) + cin) != $signed(sum);"
                 "{bout, diff} = a - b", d)
    out = spec.evaluate({"a": a, "b": b, "cin": cin})
    total = a + b + cin  # Python integers
    assert out["sum"] == total % (1 << n) and out["cout"] == total >> n
    # signed overflow: carry into the sign bit differs from the carry out of it
    # (common practice, from memory)
    low = (1 << (n - 1)) - 1
    carry_into_sign = ((a & low) + (b & low) + cin) >> (n - 1)
    assert out["v"] == carry_into_sign ^ (total >> n)
    # and, the same thing read as two's complement (Python integers)
    s = signed(a, n) + signed(b, n) + cin
    assert out["v"] == int(not -(1 << (n - 1)) <= s < (1 << (n - 1)))
    # a borrow out of a - b is a < b (Python integers)
    assert out["diff"] == (a - b) % (1 << n) and out["bout"] == int(a < b)


@settings(max_examples=200, deadline=None)
@given(st.integers(1, 40).flatmap(lambda n: st.tuples(
    st.just(n), st.integers(0, (1 << n) - 1), st.integers(0, (1 << n) - 1),
    st.integers(0, 63))))
def test_evaluate_signed_and_mixed_operators_match_python(args):
    n, a, b, k = args
    d = design({"a": n, "b": n, "k": 6}, {"p": 2 * n, "sp": 2 * n, "sa": n, "lt": 1, "slt": 1,
                                          "sh": 64, "bit": 1, "red": 3, "mx": n})
    spec = parse("p = a * b; sp = $signed(a) * $signed(b); sa = $signed(a) >>> 1;"
                 "lt = a < b; slt = $signed(a) < $signed(b); sh = a << k >> 2;"
                 "bit = (a - b)[k]; red = {&a, |b, ^a}; mx = a > b ? a : b", d)
    out = spec.evaluate({"a": a, "b": b, "k": k})
    sa, sb, m = signed(a, n), signed(b, n), (1 << n) - 1
    # Source: Python integers (two's complement infinite for & >> and bit tests)
    assert out["p"] == a * b
    assert out["sp"] == (sa * sb) % (1 << (2 * n))
    assert out["sa"] == (sa >> 1) & m
    assert out["lt"] == int(a < b) and out["slt"] == int(sa < sb)
    assert out["sh"] == ((a << k) >> 2) % (1 << 64)
    assert out["bit"] == ((a - b) >> k) & 1
    assert out["red"] == (int(a == m) << 2) | (int(b != 0) << 1) | (bin(a).count("1") & 1)
    assert out["mx"] == max(a, b)


def test_evaluate_refuses_an_input_that_does_not_fit_its_port():
    spec = parse("{cout, sum} = a + b + cin", RCA4)
    with pytest.raises(ValueError, match="a=16"):
        spec.evaluate({"a": 16, "b": 0, "cin": 0})


def test_an_earlier_output_stands_for_its_specified_value():
    d = design({"a": 4, "b": 4}, {"s": 4, "t": 6})
    spec = parse("s = a + b; t = s + 1", d)  # s is unsigned at its 4 bits
    assert spec.evaluate({"a": 15, "b": 1}) == {"s": 0, "t": 1}  # (15 + 1) mod 16 = 0; 0 + 1


# ---- reference() and to_z3() against evaluate() ---------------------------------------------------

_CASES = [
    ("add_cin", {"a": 4, "b": 4, "cin": 1}, {"sum": 4, "cout": 1}, "{cout, sum} = a + b + cin"),
    ("add_wide", {"a": 24, "b": 24, "cin": 1}, {"sum": 24, "cout": 1}, "{cout, sum} = a + b + cin"),
    ("add", {"a": 5, "b": 5}, {"sum": 5, "cout": 1}, "{cout, sum} = a + b"),
    ("cin_first", {"a": 4, "b": 4, "ci": 1}, {"r": 5}, "r = ci + a + b"),
    ("sub", {"a": 5, "b": 5}, {"d": 5, "bout": 1}, "{bout, d} = a - b"),
    ("addsub", {"a": 4, "b": 4, "m": 1}, {"sum": 4}, "sum = m ? a - b : a + b"),
    ("three", {"a": 3, "b": 3, "c": 3}, {"s": 5}, "s = a + b + c"),
    ("three_wide", {"a": 12, "b": 12, "c": 12}, {"s": 14}, "s = a + b + c"),
    ("inc", {"a": 6}, {"y": 6, "co": 1}, "{co, y} = a + 1"),
    ("dec", {"a": 6}, {"y": 6}, "y = a - 1'b1"),
    ("cmp", {"a": 4, "b": 4}, {"lt": 1, "le": 1, "gt": 1, "ge": 1, "eq": 1, "ne": 1, "slt": 1, "sge": 1},
     "lt = a < b; le = a <= b; gt = a > b; ge = a >= b; eq = a == b; ne = a != b;"
     "slt = $signed(a) < $signed(b); sge = $signed(a) >= $signed(b)"),
    ("shift_const", {"a": 6}, {"l": 8, "r": 6, "sr": 6}, "l = a << 2; r = a >> 1; sr = $signed(a) >>> 2"),
    ("shift_var", {"a": 5, "s": 3}, {"l": 12, "r": 5, "sr": 5, "ll": 5},
     "l = a << s; r = a >> s; sr = $signed(a) >>> s; ll = a <<< s"),
    ("shift_neg", {"a": 4, "s": 2}, {"y": 8}, "y = ($signed(a) - 3) << s"),
    ("concat_select", {"a": 4, "b": 4, "i": 2}, {"y": 6, "z": 1, "q": 2, "t": 1, "u": 3},
     "y = {a[1:0], b[3:2], a[3], b[0]}; z = a[2]; q = {2{b[1]}}; t = a[i]; u = (a + b)[4:2]"),
    ("var_index_expr", {"a": 4, "b": 4, "i": 3}, {"t": 1, "w": 1},
     "t = (a - b)[i]; w = $signed(a)[i + 1]"),
    ("mul", {"a": 4, "b": 4}, {"p": 8}, "p = a * b"),
    ("smul", {"a": 4, "b": 3}, {"p": 7}, "p = $signed(a) * $signed(b)"),
    ("mul_const", {"a": 6}, {"p": 9}, "p = a * 5 + 3"),
    ("overflow", {"a": 4, "b": 4, "cin": 1}, {"sum": 4, "cout": 1, "v": 1},
     "{cout, sum} = a + b + cin; v = ($signed(a) + $signed(b) + cin) != $signed(sum)"),
    ("bitwise", {"a": 4, "b": 4, "c": 1},
     {"y": 4, "r": 1, "o": 1, "x": 1, "n": 1, "m": 1, "e": 1, "l": 1, "k": 1, "xn": 4, "nn": 4},
     "y = a & ~b | a ^ b; r = &a; o = |a; x = ^a; n = ~&a; m = ~|b; e = ~^b; l = !a;"
     "k = a && b || !c; xn = a ~^ b; nn = ~a ^~ -b"),
    ("neg", {"a": 5}, {"y": 5, "z": 6}, "y = -a; z = -$signed(a)"),
    ("abs_diff", {"a": 4, "b": 4}, {"y": 4}, "y = a < b ? b - a : a == b ? 0 : a - b"),
    ("saturate", {"a": 4, "b": 4}, {"y": 4}, "y = a + b > 15 ? 15 : a + b"),
    ("pieces", {"a": 4, "b": 4}, {"sum": 4, "cout": 1},
     "{cout, sum[3:2]} = (a + b) >> 2; sum[1:0] = a + b"),
    ("lhs_concat_split", {"a": 3, "b": 3}, {"hi": 2, "lo": 3, "x": 1}, "{x, hi, lo} = {a, b} + 1"),
    ("chained_outputs", {"a": 4, "b": 4, "cin": 1}, {"s": 4, "co": 1, "ovf": 1, "z": 1},
     "{co, s} = a + b + cin; ovf = (a[3] == b[3]) && (s[3] != a[3]); z = s == 0"),
    ("casts", {"a": 4, "b": 3}, {"y": 8, "z": 8}, "y = $unsigned($signed(a)) + $signed(b); z = $signed(a + b)"),
    ("literals", {"a": 4}, {"y": 8, "z": 8}, "y = a ^ 8'hA5; z = 4'sb1000 + a"),
    ("constant_only", {"a": 2}, {"y": 4}, "y = 3'd5 << 1 >> 0"),
    ("unused_input", {"a": 4, "b": 4, "en": 1}, {"s": 5}, "s = a + b"),
]


@pytest.mark.parametrize("name, ins, outs, text", _CASES, ids=[c[0] for c in _CASES])
def test_reference_and_z3_agree_with_evaluate(name, ins, outs, text):
    d = design(ins, outs, name)
    spec = parse(text, d)
    ref = spec.reference()
    assert [p.name for p in ref.inputs] == [p.name for p in d.inputs]  # every design input
    assert ref.inputs == d.inputs and ref.outputs == d.outputs
    port_bits = set(ref.input_bits) | set(ref.output_bits)
    assert all(g.output in port_bits or g.output.startswith("ref_") for g in ref.gates)
    sim = Simulator(ref) if Simulator is not None else None
    for k, v in enumerate(vectors(d, 150, seed=hash(name) & 0xFFFF)):
        want = spec.evaluate(v)
        assert all(0 <= want[p] < 1 << w for p, w in outs.items())
        assert simulate(ref, v) == want, (v, want)
        if sim is not None:
            assert sim.evaluate(v) == want, v
        if k % 3 == 0:
            assert z3_values(spec, d, v) == want, v


def test_canonical_text_parses_back_to_the_same_function():
    for name, ins, outs, text in _CASES:
        d = design(ins, outs, name)
        spec = parse(text, d)
        again = parse(spec.text, d)
        assert again.text == spec.text
        for v in vectors(d, 20, seed=1)[:64]:
            assert again.evaluate(v) == spec.evaluate(v), (name, v)


def test_canonical_text_adds_clarifying_parentheses():
    d = design({"a": 4, "b": 4, "cin": 1}, {"sum": 4, "v": 1})
    spec = parse("sum = a+b+cin;v=$signed(a)+$signed(b)+cin!=$signed(sum)", d)
    assert spec.text == "sum = a + b + cin; v = ($signed(a) + $signed(b) + cin) != $signed(sum)"
    assert parse("sum = a & b | a ^ b; v = a < b == 1", d).text == \
        "sum = (a & b) | (a ^ b); v = (a < b) == 1"


def test_reference_is_cached_and_a_ripple_for_an_adder():
    spec = parse("{cout, sum} = a + b + cin", RCA4)
    ref = spec.reference()
    assert spec.reference() is ref
    # one full adder per bit, the carry-in riding in as the first carry: 4 x (2 xor + 1 maj)
    assert sorted(g.op for g in ref.gates) == ["maj"] * 4 + ["xor"] * 8


def test_reference_nets_never_clash_with_ports_named_like_them():
    d = design({"ref_1": 4, "b": 4}, {"ref_2": 5})
    spec = parse("ref_2 = ref_1 + b", d)
    ref = spec.reference()
    internal = [g.output for g in ref.gates if g.output not in ref.output_bits]
    assert internal and all(n.startswith("ref__") for n in internal)
    assert simulate(ref, {"ref_1": 9, "b": 12}) == {"ref_2": 21}


def test_inputs_used():
    d = design({"a": 4, "b": 4, "en": 1}, {"s": 5})
    assert parse("s = a + b", d).inputs_used == {"a", "b"}
    assert parse("s = {4'd0, en}", d).inputs_used == {"en"}


def test_z3_terms_are_word_level():
    spec = parse("{cout, sum} = a + b + cin", RCA4)
    a, b, c = z3.BitVecs("a b c", 4)
    cin = z3.BitVec("cin", 1)
    terms = spec.to_z3({"a": a, "b": b, "cin": cin})
    assert terms["sum"].size() == 4 and terms["cout"].size() == 1
    assert "bvadd" in terms["sum"].sexpr()


def test_z3_proves_the_adder_spec_equals_z3_addition_at_8_bits():
    d = design({"a": 8, "b": 8, "cin": 1}, {"sum": 8, "cout": 1})
    spec = parse("{cout, sum} = a + b + cin", d)
    a, b, cin = z3.BitVec("a", 8), z3.BitVec("b", 8), z3.BitVec("cin", 1)
    t = spec.to_z3({"a": a, "b": b, "cin": cin})
    # Source: z3's own bit-vector arithmetic, 9-bit zero-extended sum
    want = z3.ZeroExt(1, a) + z3.ZeroExt(1, b) + z3.ZeroExt(8, cin)
    solver = z3.Solver()
    solver.add(z3.Concat(t["cout"], t["sum"]) != want)
    assert solver.check() == z3.unsat


def test_z3_proves_signed_compare_and_overflow_against_z3_predicates():
    d = design({"a": 8, "b": 8}, {"lt": 1, "v": 1, "s": 8})
    spec = parse("s = a + b; lt = $signed(a) < $signed(b); v = ($signed(a) + $signed(b)) != $signed(s)", d)
    a, b = z3.BitVec("a", 8), z3.BitVec("b", 8)
    t = spec.to_z3({"a": a, "b": b})
    one, zero = z3.BitVecVal(1, 1), z3.BitVecVal(0, 1)
    # Source: z3's bvslt, and z3's own no-overflow predicate for signed addition
    no_ovf = z3.And(z3.BVAddNoOverflow(a, b, True), z3.BVAddNoUnderflow(a, b))
    solver = z3.Solver()
    solver.add(z3.Or(t["lt"] != z3.If(a < b, one, zero), t["v"] != z3.If(no_ovf, zero, one)))
    assert solver.check() == z3.unsat


def test_to_z3_checks_input_widths():
    spec = parse("{cout, sum} = a + b + cin", RCA4)
    with pytest.raises(ValueError, match="port is 4"):
        spec.to_z3({"a": z3.BitVec("a", 5), "b": z3.BitVec("b", 4), "cin": z3.BitVec("c", 1)})


# ---- inference --------------------------------------------------------------------------------

@pytest.mark.parametrize("ins, outs, text", [
    ({"a": 4, "b": 4, "cin": 1}, {"sum": 4, "cout": 1}, "{cout, sum} = a + b + cin"),
    ({"x": 8, "y": 8}, {"s": 8}, "s = x + y"),
    ({"x": 8, "y": 8}, {"s": 8, "co": 1}, "{co, s} = x + y"),
    ({"a": 8, "b": 8, "carry": 1}, {"res": 9}, "res = a + b + carry"),     # the only 1-bit input
    ({"a": 16, "b": 16}, {"r": 17}, "r = a + b"),
    ({"i_a": 4, "i_b": 4, "i_cin": 1}, {"o_sum": 4, "o_cout": 1}, "{o_cout, o_sum} = i_a + i_b + i_cin"),
    ({"a": 4, "b": 4, "cin": 1}, {"sum": 4, "cout": 1, "v": 1},
     "{cout, sum} = a + b + cin; v = ($signed(a) + $signed(b) + cin) != $signed(sum)"),
    ({"a": 4, "b": 4}, {"sum": 4, "ovf": 1}, "sum = a + b; ovf = ($signed(a) + $signed(b)) != $signed(sum)"),
    # 1-bit operands: full and half adders
    ({"a": 1, "b": 1, "cin": 1}, {"s": 1, "cout": 1}, "{cout, s} = a + b + cin"),
    ({"cin": 1, "a": 1, "b": 1}, {"sum": 1, "c": 1}, "{c, sum} = a + b + cin"),
    ({"x": 1, "y": 1, "z": 1}, {"s": 1, "co": 1}, "{co, s} = x + y + z"),  # the third one
    ({"a": 1, "b": 1}, {"s": 1, "c": 1}, "{c, s} = a + b"),
    ({"a": 1, "b": 1}, {"y": 2}, "y = a + b"),
])
def test_infer_shapes(ins, outs, text):
    d = design(ins, outs, "adder")
    spec = infer(d)
    assert spec.inferred and spec.text == text
    explicit = parse(text, d)
    assert not explicit.inferred
    for v in vectors(d, 30, seed=3):
        assert spec.evaluate(v) == explicit.evaluate(v)


def test_inferred_adder_is_integer_addition():
    d = design({"a": 6, "b": 6, "cin": 1}, {"sum": 6, "cout": 1, "v": 1})
    spec = infer(d)
    for v in vectors(d, 200, seed=9):
        a, b, c = v["a"], v["b"], v["cin"]
        out = spec.evaluate(v)
        # Python integers; overflow by the carry-into/out-of-sign rule (common practice, from memory)
        assert (out["cout"] << 6 | out["sum"]) == a + b + c
        assert out["v"] == (((a & 31) + (b & 31) + c) >> 5) ^ ((a + b + c) >> 6)


@pytest.mark.parametrize("ins, outs, fragment", [
    ({"a": 4, "b": 4, "c": 4}, {"s": 4}, "more than two multi-bit inputs (a[3:0], b[3:0], c[3:0])"),
    ({"a": 4, "b": 5}, {"s": 5}, "different widths (a[3:0], b[4:0])"),
    ({"a": 4}, {"s": 4}, "only one multi-bit input (a[3:0])"),
    ({"a": 4, "b": 4, "cin": 1, "m": 1}, {"s": 4}, "several 1-bit inputs (cin, m)"),
    ({"a": 8, "b": 8, "m": 1}, {"y": 8}, "the 1-bit input m looks like a mode or control bit"),
    ({"a": 8, "b": 8, "sub": 1}, {"y": 8, "co": 1}, "the 1-bit input sub looks like a mode"),
    ({"a": 1, "b": 1, "en": 1}, {"s": 1, "co": 1}, "the 1-bit input en looks like a mode"),
    ({"a": 1, "b": 1, "cin": 1, "d": 1}, {"s": 1}, "4 one-bit inputs"),
    ({"a": 1, "b": 1, "ci": 1, "cin": 1}, {"s": 1}, "4 one-bit inputs"),
    ({"a": 1, "ci": 1, "cin": 1}, {"s": 1, "c": 1}, "several inputs look like a carry-in (ci, cin)"),
    ({"a": 1, "b": 1, "cin": 1}, {"p": 1, "q": 1}, "do not tell which one is the sum"),
    ({"a": 4, "b": 4}, {"s": 4, "t": 4}, "expected one 4-bit sum output, found 2 (s[3:0], t[3:0])"),
    ({"a": 4, "b": 4}, {"s": 3}, "output s[2:0] fits no adder shape"),
    ({"a": 4, "b": 4}, {"s": 4, "flag": 1}, "1-bit output flag named neither"),
    ({"a": 4, "b": 4}, {"s": 5, "cout": 1}, "a result of 5 bits (s[4:0]) and other outputs (cout)"),
    ({"a": 4, "b": 4}, {"s": 4, "cout": 1, "co": 1}, "several outputs look like a carry-out (cout, co)"),
])
def test_infer_refuses_when_the_ports_do_not_tell(ins, outs, fragment):
    with pytest.raises(SpecError) as info:
        infer(design(ins, outs, "odd"))
    msg = str(info.value)
    assert msg.startswith("spec: cannot infer a spec for odd: ")
    assert fragment in msg, msg
    assert "--spec" in msg


# ---- lexical details ------------------------------------------------------------------------------

def test_comments_trailing_semicolons_and_line_breaks_are_accepted():
    spec = parse("// the Larkspur accumulator lane\n{cout, sum} = a + b /* operands */ + cin;\n;", RCA4)
    assert spec.text == "{cout, sum} = a + b + cin"
    assert spec.evaluate({"a": 9, "b": 8, "cin": 1}) == {"sum": 2, "cout": 1}  # 18 = 0b1_0010


def test_escaped_names_reach_ports_with_unusual_names():
    d = design({"lane.a": 4, "lane.b": 4}, {"lane.s": 5})
    spec = parse("\\lane.s  = \\lane.a + \\lane.b ", d)
    assert spec.text == "\\lane.s  = \\lane.a  + \\lane.b "
    assert parse(spec.text, d).evaluate({"lane.a": 15, "lane.b": 15}) == {"lane.s": 30}
    assert infer(design({"x.a": 4, "x.b": 4}, {"x.s": 4})).text == "\\x.s  = \\x.a  + \\x.b "


def test_case_equality_and_xnor_spellings_mean_the_same_without_x_or_z():
    d = design({"a": 4, "b": 4}, {"e": 1, "n": 1, "x": 4})
    one = parse("e = a === b; n = a !== b; x = a ^~ b", d)
    two = parse("e = a == b; n = a != b; x = a ~^ b", d)
    assert one.text == two.text
    for v in vectors(d, 0, 0):
        assert one.evaluate(v) == two.evaluate(v)


def test_a_spec_survives_pickling_for_process_pools():
    import pickle
    spec = parse("{cout, sum} = a + b + cin", RCA4)
    again = pickle.loads(pickle.dumps(spec))
    assert again.text == spec.text
    assert again.evaluate({"a": 7, "b": 9, "cin": 1}) == {"sum": 1, "cout": 1}  # 17 = 0b1_0001


# ---- random specs: the three translations agree; bad text only ever raises SpecError -------------

_FUZZ = design({"a": 3, "b": 4, "c": 1, "d": 5}, {"y": 12, "z": 3}, "fuzz")


@st.composite
def rich_expr(draw, depth=4):
    kinds = ["atom", "atom", "unary", "binary", "binary", "cond", "concat", "repeat", "slice",
             "index", "cast"]
    kind = draw(st.sampled_from(kinds if depth > 0 else ["atom"]))

    def sub():
        return draw(rich_expr(depth - 1))
    if kind == "atom":
        return draw(st.sampled_from(["a", "b", "c", "d", "0", "1", "7", "3'd5", "4'sb1010",
                                     "8'hA5", "'d9"]))
    if kind == "unary":
        return f"{draw(st.sampled_from(_ALL_UNARY))}({sub()})"
    if kind == "binary":
        return f"({sub()}) {draw(st.sampled_from(_ALL_BINARY))} ({sub()})"
    if kind == "cond":
        return f"({sub()}) ? ({sub()}) : ({sub()})"
    if kind == "concat":
        return "{" + ", ".join(sub() for _ in range(draw(st.integers(1, 3)))) + "}"
    if kind == "repeat":
        return "{" + str(draw(st.integers(1, 3))) + "{" + sub() + "}}"
    if kind == "slice":
        lsb = draw(st.integers(0, 6))
        return f"({sub()})[{lsb + draw(st.integers(0, 4))}:{lsb}]"
    if kind == "index":
        return f"({sub()})[{draw(st.sampled_from(['0', '2', '5', 'b', 'c', 'd[2:0]', 'a + b']))}]"
    return f"${draw(st.sampled_from(['signed', 'unsigned']))}({sub()})"


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(rich_expr(), st.integers(0, 1 << 16))
def test_random_specs_agree_across_ints_gates_and_z3(expr, seed):
    text = f"y = {expr}; z = y[2:0] ^ {{3{{c}}}}"
    try:
        spec = parse(text, _FUZZ)
    except SpecError as e:  # refusals this generator can provoke, by design
        assert any(why in e.message for why in ("may be negative", "selects bits outside",
                                                  "bits; the limit is", f"more than {MAX_BITS:,}")), e.message
        return
    ref = spec.reference()
    rng = random.Random(seed)
    for _ in range(4):
        v = {p.name: rng.getrandbits(p.width) for p in _FUZZ.inputs}
        want = spec.evaluate(v)  # Python integers: the ground truth
        assert simulate(ref, v) == want, (text, v)
        assert z3_values(spec, _FUZZ, v) == want, (text, v)
        assert parse(spec.text, _FUZZ).evaluate(v) == want, spec.text


_SOUP = ["a", "b", "c", "y", "z", "q", "0", "1", "3'd5", "4'sb1010", "8'hx1", "'d9", "2'b111",
         "(", ")", "{", "}", "[", "]", ":", "?", ",", ";", "=", "+", "-", "*", "/", "<<", ">>>",
         "==", "<=", "&", "|", "^", "~", "!", "~&", "$signed", "$unsigned", "$foo", "@", "\\y ",
         "0'd1", "'", "//x\n", "/*", "4'", "1_0"]


@settings(max_examples=400, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.sampled_from(["", "y = ", "z = 0; y = a + "]), st.lists(st.sampled_from(_SOUP), max_size=12),
       st.booleans())
def test_garbled_specs_raise_only_one_line_spec_errors(prefix, tokens, spaced):
    text = prefix + (" " if spaced else "").join(tokens)
    try:
        parse(text, _FUZZ)
    except SpecError as e:
        assert "\n" not in str(e) and str(e).startswith("spec: ")


def test_a_product_too_wide_for_gates_is_refused_but_z3_and_ints_still_work():
    d = design({"a": 4, "s": 10}, {"y": 8})
    spec = parse("y = (a << s) * (a << s)", d)  # 1028-bit operands: over a million and-gates
    with pytest.raises(SpecError, match="this product is .* bits wide"):
        spec.reference()
    assert spec.evaluate({"a": 3, "s": 1}) == {"y": 36}  # (3 * 2) ** 2, Python integers
    assert z3_values(spec, d, {"a": 3, "s": 1}) == {"y": 36}


# ---- an independent simulator: iverilog on the same equations as Verilog assigns ----------------------

# Chosen so that Verilog's own width rules give the same values as the spec's exact arithmetic:
# each left side is at least as wide as the operands, and signed operands are never mixed with
# unsigned ones. (With a carry-in in a $signed sum, for example, Verilog makes the sum unsigned
# at 8 bits, and the spec deliberately does not.)
_IVERILOG_CASE = (
    {"a": 8, "b": 8, "cin": 1, "m": 1, "s": 3},
    {"sum": 8, "cout": 1, "y": 8, "t": 10, "p": 16, "lt": 1, "slt": 1, "sh": 12, "sr": 8,
     "sel": 6, "bw": 8, "red": 3, "mx": 8},
    "{cout, sum} = a + b + cin; y = m ? a - b : a + b; t = a + b + {7'd0, cin} + 1;"
    "p = a * b; lt = a < b; slt = $signed(a) < $signed(b); sh = a << s;"
    "sr = $signed(a) >>> s; sel = {a[7:5], b[2:0]} ^ {3'd0, a[s]}; bw = a & ~b | a ^ b;"
    "red = {&a, |b, ^a}; mx = a > b ? a : b",
)


@pytest.mark.skipif(__import__("shutil").which("iverilog") is None, reason="iverilog not installed")
def test_evaluate_matches_iverilog_where_verilog_widths_coincide(tmp_path):
    import subprocess
    ins, outs, text = _IVERILOG_CASE
    d = design(ins, outs, "larkspur_mix")
    spec = parse(text, d)
    decl = lambda kind, n, w: f"  {kind} [{w - 1}:0] {n};"  # noqa: E731
    assigns = "\n".join(f"  assign {eq.strip()};" for eq in text.split(";"))
    vecs = vectors(d, 300, seed=11)
    lines = ["module tb;", *(decl("reg", n, w) for n, w in ins.items()),
             *(decl("wire", n, w) for n, w in outs.items()), assigns, "  initial begin"]
    for v in vecs:
        lines.append("    " + " ".join(f"{n} = {ins[n]}'d{v[n]};" for n in ins) + " #1;")
        lines.append('    $display("' + " ".join("%0d" for _ in outs) + '", ' + ", ".join(outs) + ");")
    lines += ["  end", "endmodule"]
    src = tmp_path / "tb.v"
    src.write_text("\n".join(lines))
    subprocess.run(["iverilog", "-o", str(tmp_path / "tb.vvp"), str(src)], check=True,
                   capture_output=True)
    run = subprocess.run(["vvp", "-n", str(tmp_path / "tb.vvp")], check=True,
                         capture_output=True, text=True)
    got = [list(map(int, line.split())) for line in run.stdout.splitlines() if line.strip()]
    assert len(got) == len(vecs)
    for v, row in zip(vecs, got):
        # Source: Icarus Verilog simulating the same expressions
        assert dict(zip(outs, row)) == spec.evaluate(v), v


def test_long_chains_work_and_absurd_nesting_is_refused():
    d = design({"a": 8}, {"y": 16})
    popcount = parse("y = " + " + ".join(f"a[{i % 8}]" for i in range(600)), d)
    # each bit counted 75 times (Python integers)
    assert popcount.evaluate({"a": 0b1011_0001}) == {"y": 75 * 4}
    assert simulate(popcount.reference(), {"a": 0b1011_0001}) == {"y": 300}
    assert z3_values(popcount, d, {"a": 0b1011_0001}) == {"y": 300}
    assert "nested more than 1000 levels deep" in spec_error("y = " + " ^ ".join(["a"] * 1200), d)
    assert "nested more than 1000 levels deep" in spec_error("y = " + "(" * 6000 + "a" + ")" * 6000, d)
