"""Liberty cell libraries: parsing, cell functions, timing tables, and reading a cell-instance
netlist with ``load(..., cells=[lib])``."""

from __future__ import annotations

import itertools
import random
import re
import sys
import time
from pathlib import Path

import pytest

from verify.errors import InputError
from verify.formats import load
from verify.formats.liberty import function_to_verilog, read_liberty
from verify.sim import Simulator

ROOT = Path(__file__).resolve().parent.parent
LIB = ROOT / "tests" / "data" / "plain_cells.lib"
sys.path.insert(0, str(ROOT / "benchmarks"))


def write(tmp_path: Path, name: str, text: str) -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


def test_cells_pins_functions_and_tables():
    lib = read_liberty(LIB)
    assert lib.name == "plain_cells"
    nand = lib.cells["PX_NAND2"]
    assert (nand.inputs, nand.outputs, nand.function) == (["A", "B"], ["Y"], {"Y": "(A B)'"})
    fa = lib.cells["PX_FA"]
    assert fa.outputs == ["S", "CO"] and fa.function["CO"] == "(A B) + (CI (A + B))"
    assert lib.cells["PX_DFF"].sequential == "ff" and lib.cells["PX_INV"].sequential is None
    # the numbers as written in tests/data/plain_cells.lib (including a continued line)
    inv = lib.cells["PX_INV"]
    (arc,) = inv.arcs
    assert (arc.pin, arc.related_pin) == ("Y", "A")
    rise = arc.tables["cell_rise"]
    assert rise.index_1 == [0.01, 0.1] and rise.index_2 == [0.001, 0.01]
    assert rise.values == [[0.020, 0.040], [0.030, 0.050]]
    assert arc.tables["cell_fall"].values == [[0.015, 0.035], [0.025, 0.045]]
    assert [a.related_pin for a in nand.arcs] == ["A", "B"]
    assert nand.arcs[1].tables["cell_fall"].values == [[0.022, 0.042], [0.032, 0.052]]


# Liberty operator precedence (from memory of the Liberty reference): inversion first, then XOR,
# then AND (*, &, juxtaposition), then OR (+, |)
_FUNCTIONS = [
    ("!A", lambda a, b, c: not a),
    ("A'", lambda a, b, c: not a),
    ("(A B)'", lambda a, b, c: not (a and b)),
    ("A B ^ C", lambda a, b, c: a and (b != c)),
    ("A + B C", lambda a, b, c: a or (b and c)),
    ("A | B & C", lambda a, b, c: a or (b and c)),
    ("A * !B + C'", lambda a, b, c: (a and not b) or not c),
    ("!(A ^ B) C", lambda a, b, c: (a == b) and c),
    ("A'' B", lambda a, b, c: a and b),
    ("(A+B)(B+C)", lambda a, b, c: (a or b) and (b or c)),
    ("1", lambda a, b, c: True),
    ("A ^ 1", lambda a, b, c: not a),
]


@pytest.mark.parametrize("text, fn", _FUNCTIONS)
def test_function_expressions_against_python_booleans(tmp_path, text, fn):
    expr = function_to_verilog(text, {"A", "B", "C"}, "test")
    f = write(tmp_path, "f.v", f"module f(input A, B, C, output Y);\n  assign Y = {expr};\n"
              "endmodule\n")
    sim = Simulator(load([f]))
    for a, b, c in itertools.product((0, 1), repeat=3):
        assert sim.evaluate({"A": a, "B": b, "C": c}) == {"Y": int(bool(fn(a, b, c)))}, text


@pytest.mark.parametrize("text", ["A +", "(A B", "A $ B", "D", ""])
def test_bad_functions_are_refused(text):
    with pytest.raises(InputError):
        function_to_verilog(text, {"A", "B"}, "lib:1")


def test_cell_netlist_with_liberty_matches_python_integers(tmp_path):
    from cell_netlist import adder_netlist
    text, count = adder_netlist(8)
    assert count == 8 * 6 + 2 * 2 + 1  # six cells a bit, two buffers every fourth bit, a tie
    f = write(tmp_path, "net.v", text)
    n = load([f], cells=[LIB])
    # each gate names the cell's line in the Liberty file and the instance it came from
    assert all(re.match(r".*plain_cells\.lib:\d+ U\d+$", g.source) for g in n.gates)
    sim = Simulator(n)
    for a in range(0, 256, 7):
        for b in range(0, 256, 11):
            for ci in (0, 1):
                want = a + b + ci  # Python integers
                assert sim.evaluate({"a": a, "b": b, "cin": ci}) == {"s": want & 255,
                                                                      "cout": want >> 8}


def test_sequential_cell_is_refused_when_instantiated(tmp_path):
    f = write(tmp_path, "seq.v", "module seq(input d, ck, output q);\n"
              "  PX_DFF u1 (.D(d), .CK(ck), .Q(q));\nendmodule\n")
    with pytest.raises(InputError, match=r"seq\.v:2:\d+: instance 'u1': cell 'PX_DFF' .*"
                                         r"plain_cells\.lib:\d+\) is sequential"):
        load([f], cells=[LIB])


def test_liberty_syntax_errors_say_where(tmp_path):
    bad = write(tmp_path, "bad.lib", "library (x) {\n  cell (A) {\n    pin (Y) {\n"
                "      direction : output ;\n  }\n")
    with pytest.raises(InputError, match=r"bad\.lib:\d+: Liberty syntax: group .* not closed"):
        read_liberty(bad)
    bad.write_text("library (x) {\n  cell (A) {\n    pin (Y) { direction output ; }\n  }\n}\n")
    with pytest.raises(InputError, match=r"bad\.lib:3: Liberty syntax: expected ':' or '\('"):
        read_liberty(bad)


def test_cells_apply_to_verilog_only(tmp_path):
    j = write(tmp_path, "d.json", "{}")
    with pytest.raises(InputError, match="--cells apply to Verilog files only"):
        load([j], cells=[LIB])


@pytest.mark.slow
def test_1024_bit_cell_netlist_loads_and_is_proven(tmp_path):
    from cell_netlist import adder_netlist
    from verify.check import check
    text, count = adder_netlist(1024)
    assert count == 6657
    f = write(tmp_path, "net.v", text)
    t = time.perf_counter()
    n = load([f], cells=[LIB])
    assert time.perf_counter() - t < 120  # generous floor; benchmarks/cell_netlist.py measures
    rng = random.Random(5)
    sim = Simulator(n)
    for _ in range(5):
        a, b = rng.getrandbits(1024), rng.getrandbits(1024)
        assert sim.evaluate({"a": a, "b": b, "cin": 1}) == {"s": (a + b + 1) % (1 << 1024),
                                                            "cout": (a + b + 1) >> 1024}
    assert check(n).verdict == "proven"


_FA4 = """module fa4 (input [3:0] a, b, input cin, output [3:0] sum, output cout);
  wire [4:0] c;
  assign c[0] = cin;
  PX_FA u0 (.A(a[0]), .B(b[0]), .CI(c[0]), .S(sum[0]), .CO(c[1]));
  PX_FA u1 (.A(a[1]), .B(b[1]), .CI(c[1]), .S(sum[1]), .CO(c[2]));
  PX_FA u2 (.A(a[2]), .B(b[2]), .CI(c[2]), .S(sum[2]), .CO(c[3]));
  PX_FA u3 (.A(a[3]), .B(b[3]), .CI(c[3]), .S(sum[3]), .CO(c[4]));
  assign cout = c[4];
endmodule
"""


def test_cells_on_the_command_line_and_in_a_manifest(tmp_path, capsys):
    """--cells and the manifest key 'cells' give a cell netlist its logic from the .lib file;
    the verdict is checked exhaustively against integer addition (Python integers)."""
    import shutil

    from verify.cli.main import main
    from verify.manifest import runner
    shutil.copy(LIB, tmp_path / "cells.lib")
    (tmp_path / "fa4.v").write_text(_FA4)
    with pytest.raises(SystemExit) as e:
        main(["check", str(tmp_path / "fa4.v"), "--cells", str(tmp_path / "cells.lib"),
              "--no-log", "--spec", "{cout, sum} = a + b + cin"])
    assert e.value.code == 0, capsys.readouterr()
    assert "EXHAUSTIVE" in capsys.readouterr().out
    with pytest.raises(SystemExit) as e:  # without the library the cells are unknown modules
        main(["check", str(tmp_path / "fa4.v"), "--no-log"])
    assert e.value.code == 2
    (tmp_path / "verify.toml").write_text(
        '[[design]]\nname = "fa4"\nsources = ["fa4.v"]\ncells = ["cells.lib"]\n'
        'spec = "{cout, sum} = a + b + cin"\n')
    summary = runner.run(tmp_path / "verify.toml")
    assert summary.exit_code == 0 and summary.records[0].verdict == "exhaustive"
    (tmp_path / "cells.lib").write_text((tmp_path / "cells.lib").read_text()
                                        .replace('"A ^ B ^ CI"', '"A ^ B"'))
    again = runner.run(tmp_path / "verify.toml")  # the library is part of the cache key
    assert again.records[0].cached is False and again.records[0].verdict == "fail"
