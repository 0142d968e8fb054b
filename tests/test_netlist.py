"""The netlist model, its validation pass, and the JSON and Verilog writers."""

from __future__ import annotations

import json

import pytest

from tests.helpers import ripple
from verify.errors import InputError, NetlistError
from verify.formats import json_netlist, load
from verify.formats.verilog import writer as verilog_writer
from verify.model.netlist import Gate, Netlist, Port


def make(gates, inputs=(("a", 2), ("b", 2)), outputs=(("y", 2),)):
    return Netlist("t", tuple(Port(*p) for p in inputs), tuple(Port(*p) for p in outputs),
                   tuple(Gate(*g) for g in gates))


GOOD = [("and", ("a[0]", "b[0]"), "y[0]"), ("or", ("a[1]", "b[1]"), "y[1]")]


def test_a_good_netlist_validates():
    n = make(GOOD).validate()
    assert n.input_bits == ["a[0]", "a[1]", "b[0]", "b[1]"]
    assert [g.output for g in n.ordered_gates] == ["y[0]", "y[1]"]


@pytest.mark.parametrize("gates, message", [
    ([("and", ("a[0]", "b[0]"), "y[0]")], "output bit 'y[1]' is not driven"),
    ([*GOOD, ("or", ("a[0]", "b[0]"), "y[0]")], "net 'y[0]' has more than one driver"),
    ([*GOOD, ("not", ("b[0]",), "a[0]")], "'a[0]' is an input bit and cannot be driven"),
    ([("andd", ("a[0]", "b[0]"), "y[0]"), GOOD[1]], "unknown op 'andd'"),
    ([("not", ("a[0]", "b[0]"), "y[0]"), GOOD[1]], "op 'not' takes 1 input, got 2"),
    ([("mux", ("a[0]", "b[0]"), "y[0]"), GOOD[1]], "op 'mux' takes 3 inputs, got 2"),
    ([("and", ("a[0]",), "y[0]"), GOOD[1]], "op 'and' takes at least 2 inputs, got 1"),
    ([("and", ("a[0]", "q"), "y[0]"), GOOD[1]], "signal 'q' is not driven by any gate"),
    ([("and", ("a[0]", "a[5]"), "y[0]"), GOOD[1]], "bit index 5 is out of range for port a[1:0]"),
    ([("and", ("a", "b[0]"), "y[0]"), GOOD[1]], "'a' is a 2-bit port; name one bit"),
    ([GOOD[0], ("buf", ("a[1]",), "y[2]")], "bit index 2 is out of range for port y[1:0]"),
])
def test_validation_names_the_problem(gates, message):
    with pytest.raises(NetlistError) as e:
        make(gates).validate()
    assert message in str(e.value)
    assert "\n" not in str(e.value)


def test_a_loop_is_printed_as_a_cycle():
    gates = [("and", ("a[0]", "x2"), "x1"), ("or", ("x1", "b[0]"), "x2"),
             ("buf", ("x2",), "y[0]"), GOOD[1]]
    with pytest.raises(NetlistError) as e:
        make(gates).validate()
    text = str(e.value)
    assert text.startswith("combinational loop: ")
    cycle = text.split(": ", 1)[1].split(" -> ")
    assert cycle[0] == cycle[-1] and set(cycle) == {"x1", "x2"}


def test_duplicate_ports_are_refused():
    with pytest.raises(NetlistError, match="declared more than once"):
        make(GOOD, inputs=(("a", 2), ("a", 2))).validate()


def test_json_round_trip_keeps_the_function_and_the_structure(tmp_path):
    n = ripple(6)
    text = json_netlist.dumps(n)
    back = json_netlist.parse(text, "x.json")
    assert back.content_hash() == n.content_hash()
    assert json_netlist.dumps(back) == text
    f = tmp_path / "r.json"
    f.write_text(text)
    assert load(f).content_hash() == n.content_hash()


def test_json_refs_accept_bit_zero_of_a_one_bit_port():
    data = {"format": "verify-netlist/1", "name": "h", "inputs": {"a": 1, "b": 1},
            "outputs": {"s": 1, "c": 1},
            "gates": [{"out": "s", "op": "xor", "in": ["a[0]", "b"]},
                      {"out": "c[0]", "op": "and", "in": ["a", "b"]}]}
    n = json_netlist.from_dict(data)
    assert {g.output for g in n.gates} == {"s", "c"}


@pytest.mark.parametrize("text, message", [
    ("{", "not valid JSON"),
    ("[]", "expected a JSON object"),
    ('{"format": "other"}', "'format' must be"),
    ('{"format": "verify-netlist/1", "inputs": {}, "outputs": {}}', "missing key 'gates'"),
    ('{"format": "verify-netlist/1", "inputs": {"a": "4"}, "outputs": {}, "gates": []}',
     "inputs.a: width must be a whole number"),
    ('{"format": "verify-netlist/1", "inputs": {"a": 1}, "outputs": {"y": 1}, "gates": [{"out": "y"}]}',
     "gates[0]: 'op' must be a non-empty string"),
    ('{"format": "verify-netlist/1", "inputs": {"a": 1}, "outputs": {"y": 1}, "gates": [], "gate": 1}',
     "unknown key gate"),
    ('{"format": "verify-netlist/1", "inputs": {"a": 1, "a": 2}, "outputs": {}, "gates": []}',
     "key 'a' appears twice"),
    ('{"format": "verify-netlist/1", "inputs": {"a": 100000000}, "outputs": {}, "gates": []}',
     "over the widest port supported"),
    ('{"inputs": {}, "outputs": {}, "gates": []}', "missing key 'format'"),
])
def test_bad_json_gives_one_located_line(text, message):
    with pytest.raises(InputError) as e:
        json_netlist.parse(text, "bad.json")
    assert message in str(e.value)
    assert str(e.value).startswith("bad.json")
    assert "\n" not in str(e.value)


def test_verilog_writer_declares_ports_and_one_primitive_per_gate():
    n = ripple(4)
    text = verilog_writer.dumps(n)
    assert "module ripple4 (" in text
    assert "input  wire [3:0] a" in text and "output wire cout" in text
    assert text.count("xor g_xor_") == 8  # two xor per full adder (common practice)
    assert text.count("assign") == 4  # one majority carry per bit
    assert text.rstrip().endswith("endmodule")


def test_json_writer_output_is_json():
    data = json.loads(json_netlist.dumps(ripple(3)))
    assert data["inputs"] == {"a": 3, "b": 3, "cin": 1}
    assert len(data["gates"]) == 9  # xor, xor and majority per bit
