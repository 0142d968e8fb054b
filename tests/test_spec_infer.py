"""Inference from port-name styles: decorated names, bit-blasted ports, and short refusals.

Outside reference: Python integer addition (a + b + cin; signed overflow as "the sum read as
two's complement is out of range", common practice).
"""

from __future__ import annotations

import random
import re

import pytest

from verify.errors import SpecError
from verify.spec import infer, parse
from tests.test_spec import design


def blasted(stem: str, n: int, style: str) -> dict[str, int]:
    """n one-bit ports named stem_0.., stem0.. or stem[0].."""
    fmt = {"_": "{}_{}", "": "{}{}", "[]": "{}[{}]"}[style]
    return {fmt.format(stem, i): 1 for i in range(n)}


def word(vector: dict[str, int], names: list[str]) -> int:
    """The integer whose bit i is the port names[i] (LSB first)."""
    return sum(vector[n] << i for i, n in enumerate(names))


def check_adds(spec, ins: dict[str, int], a: list[str], b: list[str], cin: str | None,
               total: list[str], seed: int = 1) -> None:
    """spec's outputs, read as the word ``total`` (LSB first), equal a + b + cin: Python ints."""
    rng = random.Random(seed)
    for _ in range(40):
        v = {p: rng.getrandbits(w) for p, w in ins.items()}
        out = spec.evaluate(v)
        got, shift = 0, 0
        for name in total:
            w = next(p.width for p in spec.outputs if p.name == name)
            got |= out[name] << shift
            shift += w
        want = word(v, a) + word(v, b) + (v[cin] if cin else 0)  # Python integers
        assert got == want % (1 << shift), v


@pytest.mark.parametrize("ins, outs, text", [
    ({"a_i": 8, "b_i": 8, "cin_i": 1}, {"sum_o": 8, "cout_o": 1}, "{cout_o, sum_o} = a_i + b_i + cin_i"),
    ({"op_a": 8, "op_b": 8}, {"res": 8, "co": 1}, "{co, res} = op_a + op_b"),
    ({"in1": 8, "in2": 8}, {"out": 9}, "out = in1 + in2"),
    ({"in_b": 8, "in_a": 8, "c_in": 1}, {"result": 8, "c_out": 1}, "{c_out, result} = in_a + in_b + c_in"),
    ({"operand_a": 6, "operand_b": 6, "carry_in": 1}, {"y": 6, "carry_out": 1},
     "{carry_out, y} = operand_a + operand_b + carry_in"),
    ({"x": 4, "y": 4, "i_carry_in": 1}, {"ow_sum": 4, "ow_cout": 1}, "{ow_cout, ow_sum} = x + y + i_carry_in"),
    ({"a": 4, "b": 4, "ci_i": 1}, {"f": 4, "co_o": 1}, "{co_o, f} = a + b + ci_i"),
    ({"i_a": 1, "i_b": 1, "i_ci": 1}, {"o_s": 1, "o_co": 1}, "{o_co, o_s} = i_a + i_b + i_ci"),
])
def test_decorated_operand_sum_and_carry_names(ins, outs, text):
    d = design(ins, outs, "styled")
    spec = infer(d)
    assert spec.text == text
    names = list(ins)
    cin = next((n for n in names if ins[n] == 1 and "c" in n), None) if len(ins) == 3 else None
    a, b = sorted((n for n in names if n != cin), key=lambda n: text.index(n))
    lhs = re.findall(r"[A-Za-z_][A-Za-z0-9_]*", text.split("=")[0])[::-1]  # LSB piece first
    check_adds(spec, ins, [a], [b], cin, lhs)


@pytest.mark.parametrize("flag", ["ovf", "overflow", "v", "ovf_o", "o_overflow"])
def test_overflow_flag_names(flag):
    d = design({"a": 8, "b": 8}, {"sum": 8, flag: 1}, "ov")
    spec = infer(d)
    assert spec.text == f"sum = a + b; {flag} = ($signed(a) + $signed(b)) != $signed(sum)"
    for a in range(0, 256, 7):
        for b in range(0, 256, 11):
            sa, sb = a - 256 * (a >> 7), b - 256 * (b >> 7)
            # Python integers: the signed sum out of range [-128, 127]
            assert spec.evaluate({"a": a, "b": b})[flag] == int(not -128 <= sa + sb <= 127)


@pytest.mark.parametrize("style", ["_", "", "[]"])
def test_bit_blasted_ports_are_joined_into_words(style):
    n = 6
    fmt = {"_": "{}_{}", "": "{}{}", "[]": "{}[{}]"}[style]
    ins = {**blasted("a", n, style), **blasted("b", n, style), "cin": 1}
    outs = {**blasted("s", n, style), "cout": 1}
    d = design(ins, outs, "blasted")
    spec = infer(d)
    esc = (lambda s: f"\\{s} ") if style == "[]" else (lambda s: s)

    def cat(stem: str) -> str:
        return ", ".join(esc(fmt.format(stem, i)) for i in reversed(range(n)))
    assert spec.text == (f"{{cout, {cat('s')}}} = {{{cat('a')}}} + {{{cat('b')}}} + cin")
    bits = lambda stem: [fmt.format(stem, i) for i in range(n)]  # noqa: E731
    check_adds(spec, ins, bits("a"), bits("b"), "cin", [*bits("s"), "cout"])


def test_bit_blasted_operands_with_a_multi_bit_result():
    ins = {**blasted("x", 16, "_"), **blasted("y", 16, "_")}
    d = design(ins, {"o_result": 17}, "mixed")
    spec = infer(d)
    assert spec.text.startswith("o_result = {x_15, x_14, ")
    check_adds(spec, ins, [f"x_{i}" for i in range(16)], [f"y_{i}" for i in range(16)], None,
               ["o_result"])


def refusal(ins, outs) -> str:
    with pytest.raises(SpecError) as info:
        infer(design(ins, outs, "odd"))
    msg = str(info.value)
    assert "\n" not in msg and msg.startswith("spec: cannot infer a spec for odd: ")
    return msg


def guessed(msg: str) -> str:
    m = re.search(r"--spec '(.*)'$", msg)
    assert m, msg
    return m.group(1)


def test_a_refusal_summarises_bit_blasted_groups_and_guesses_a_spec_line():
    ins = {**blasted("a", 128, "_"), **blasted("b", 128, "_"), **blasted("c", 128, "_")}
    outs = {**blasted("s", 128, "_")}
    msg = refusal(ins, outs)
    assert "more than two multi-bit inputs (a_0..a_127, b_0..b_127, c_0..c_127)" in msg
    assert "cannot tell which are the operands" in msg
    # the line to write abbreviates each group instead of listing 128 names
    assert guessed(msg) == "{s_127, ..., s_0} = {a_127, ..., a_0} + {b_127, ..., b_0}"
    assert len(msg) < 300


@pytest.mark.parametrize("ins, outs, guess", [
    ({"x": 8, "y": 8, "z": 8}, {"q": 8}, "q = x + y"),
    ({"a": 8, "b": 8, "cin": 1, "en": 1}, {"sum": 8, "cout": 1}, "{cout, sum} = a + b + cin"),
    ({"i_a": 8, "i_b": 8, "i_sel": 1}, {"o_sum": 8, "o_cout": 1}, "{o_cout, o_sum} = i_a + i_b"),
    ({"a": 8, "b": 8, "c": 8}, {"sum": 8, "cout": 1}, "{cout, sum} = a + b"),
    ({"a": 8, "b": 8, "sub": 1}, {"res": 8, "cout": 1, "ovf": 1},
     "{cout, res} = a + b; ovf = ($signed(a) + $signed(b)) != $signed(res)"),
])
def test_refusals_show_a_spec_line_to_write(ins, outs, guess):
    msg = refusal(ins, outs)
    assert guessed(msg) == guess
    assert len(msg) < 300
    parse(guess, design(ins, outs, "odd"))  # a line this design accepts as a spec


def test_a_long_list_of_ports_is_cut_short():
    ins = {f"p{k}x": 3 for k in range(40)}
    msg = refusal(ins, {"q": 3})
    assert "(40 in all)" in msg and len(msg) < 300
