"""verify.library.shape and the generate/stats commands.

Figures are checked against hand-counted small circuits (counted in the comments), the ripple
adder's textbook depth (common practice), and D. Harris, "A Taxonomy of Parallel Prefix Networks"
(2003) for the prefix figures (values from memory, as quoted in the issue).
"""

from __future__ import annotations

import json
from math import log2

import click
import pytest
from click.testing import CliRunner

from tests.helpers import HARRIS_2003
from verify.library.architectures import ARCHITECTURES, generate
from verify.cli.main import cli as main_group
from verify.formats import json_netlist
from verify.model.netlist import Gate, Netlist, Port
from verify.library.shape import format_text, prefix_figures, stats


def _full_adder() -> Netlist:
    # s = (x ^ y) ^ ci ; co = (x & y) | ((x ^ y) & ci): 2 xor, 2 and, 1 or
    gates = (
        Gate("xor", ("x", "y"), "p"),
        Gate("xor", ("p", "ci"), "s"),
        Gate("and", ("x", "y"), "g"),
        Gate("and", ("p", "ci"), "t"),
        Gate("or", ("g", "t"), "co"),
    )
    return Netlist("fa", (Port("x", 1), Port("y", 1), Port("ci", 1)),
                   (Port("s", 1), Port("co", 1)), gates).validate()


def test_full_adder_by_hand():
    s = stats(_full_adder())
    assert s["gates"] == {"and": 2, "or": 1, "xor": 2}
    assert s["gate_count"] == 5
    # by hand: s = xor(xor) is 2 levels; co = or(and(xor)) is 3 levels via x -> p -> t -> co
    assert s["depth_per_output"] == {"s": 2, "co": 3}
    assert s["depth"] == 3 and s["deepest_output"] == "co"
    assert s["longest_path"] == ["x", "p", "t", "co"]
    # p feeds s and t: fanout 2; x, y feed p and g: 2; ci feeds s and t: 2; the first is x
    assert s["max_fanout"] == 2 and s["max_fanout_net"] == "x"
    assert "prefix_nodes" not in s


def test_buf_and_constants_add_no_level():
    gates = (Gate("and", ("a", "b"), "n1"), Gate("buf", ("n1",), "y"), Gate("const1", (), "k"),
             Gate("buf", ("n1",), "z"))
    n = Netlist("b", (Port("a", 1), Port("b", 1)), (Port("y", 1), Port("z", 1), Port("k", 1)),
                gates).validate()
    s = stats(n)
    assert s["depth_per_output"] == {"y": 1, "z": 1, "k": 0}
    assert s["max_fanout"] == 2 and s["max_fanout_net"] == "n1"  # two bufs read n1


def test_wide_fanout_counts_output_port_loads():
    # one and gate driving four output bits through bufs and one directly read by another gate
    gates = [Gate("and", ("a", "b"), "n")] + [Gate("buf", ("n",), f"y[{i}]") for i in range(4)] + \
        [Gate("not", ("n",), "z")]
    n = Netlist("f", (Port("a", 1), Port("b", 1)), (Port("y", 4), Port("z", 1)), tuple(gates)).validate()
    assert stats(n)["max_fanout"] == 5


def test_ripple_depth_is_linear():
    # common practice: through two-half-adder full adders the carry chain adds 2 levels a bit
    # (AND then OR) after the first XOR: cout of an n-bit ripple is 2n + 1 levels deep
    for n in (1, 4, 8, 16):
        s = stats(generate("ripple", n))
        assert s["depth_per_output"]["cout"] == 2 * n + 1
        assert s["depth"] == 2 * n + 1


HARRIS = HARRIS_2003  # D. Harris, "A Taxonomy of Parallel Prefix Networks" (2003), from memory


@pytest.mark.parametrize("arch", list(HARRIS))
@pytest.mark.parametrize("n", [4, 8, 16, 32, 64, 128])
def test_stats_prefix_figures_match_harris(arch, n):
    L = int(log2(n))
    levels, nodes = HARRIS[arch](n, L)  # Harris (2003), from memory
    s = stats(generate(arch, n))
    assert (s["prefix_levels"], s["prefix_nodes"]) == (levels, nodes)
    if arch == "sklansky":
        assert s["max_fanout"] == n // 2 + 1  # Harris (2003), from memory: fanout n/2 + 1


@pytest.mark.parametrize("n", [4, 8, 16, 32, 64])
def test_brent_kung_chain_is_one_shorter_than_its_rows(n):
    # derived by hand: the chain G[1:0] -> G[3:0] -> ... -> G[n/2-1:0] is log2 n - 1 nodes; the
    # down-sweep then adds one node per row below, and its first row's node (G[3n/4-1:0]) does
    # not wait for the last up-sweep node G[n-1:0]: 2 log2 n - 2 nodes against 2 log2 n - 1 rows
    s = stats(generate("brent-kung", n))
    L = int(log2(n))
    assert s["prefix_depth"] == 2 * L - 2
    assert s["prefix_levels"] == 2 * L - 1
    ks = stats(generate("kogge-stone", n))
    assert ks["prefix_depth"] == ks["prefix_levels"] == L


def test_prefix_figures_survive_a_json_round_trip():
    n = generate("han-carlson", 32)
    back = json_netlist.parse(json_netlist.dumps(n), "hc32.json")
    assert prefix_figures(back) == prefix_figures(n)
    assert prefix_figures(back)["prefix_nodes"] == 16 * 5  # Harris (2003), from memory: (n/2)log2 n


def test_prefix_nodes_found_by_net_names_without_sources():
    # as after reading the structural Verilog back: the sources are gone, the names stay
    for arch in ("kogge-stone", "sklansky", "brent-kung"):
        n = generate(arch, 16)
        bare = Netlist(n.name, n.inputs, n.outputs,
                       tuple(Gate(g.op, g.inputs, g.output) for g in n.gates)).validate()
        want = prefix_figures(n)
        got = prefix_figures(bare)
        assert got["prefix_nodes"] == want["prefix_nodes"]
        assert got["prefix_depth"] == want["prefix_depth"]
        assert got["prefix_levels"] == want["prefix_depth"]  # rows are not known: the chain


def test_non_prefix_designs_have_no_prefix_keys():
    for arch, spec in ARCHITECTURES.items():
        s = stats(generate(arch, 8))
        assert ("prefix_nodes" in s) == (spec.family == "prefix"), arch


def test_text_form_names_the_figures():
    text = format_text(stats(generate("kogge-stone", 8)))
    assert "kogge_stone8: inputs a[7:0], b[7:0], cin; outputs sum[7:0], cout" in text
    assert "prefix nodes   17 in 3 levels" in text  # Harris (2003), from memory: 8*3 - 8 + 1 = 17
    assert "longest path   a[0] -> p0" in text


# ---- the commands ----------------------------------------------------------------------------

@pytest.fixture
def cli():
    return main_group


def test_generate_json_and_verilog(cli, tmp_path):
    r = CliRunner().invoke(cli, ["generate", "brent-kung", "--width", "8", "--overflow"])
    assert r.exit_code == 0, r.output
    n = json_netlist.parse(r.output, "<stdout>")
    assert [p.name for p in n.outputs] == ["sum", "cout", "v"]
    out = tmp_path / "ks.v"
    r = CliRunner().invoke(cli, ["generate", "kogge-stone", "-w", "4", "--no-cin", "--no-cout",
                                 "--format", "verilog", "-o", str(out)])
    assert r.exit_code == 0, r.output
    text = out.read_text()
    assert "module kogge_stone4" in text and "cin" not in text and "cout" not in text


def test_generate_parameters_reach_the_architecture(cli):
    r = CliRunner().invoke(cli, ["generate", "carry-skip", "-w", "10", "--sizes", "3,3,4"])
    assert r.exit_code == 0, r.output
    n = json_netlist.parse(r.output, "<stdout>")
    assert sorted(g.source for g in n.gates if g.op == "mux") == [
        "carry-skip block [2:0] skip", "carry-skip block [5:3] skip", "carry-skip block [9:6] skip"]


@pytest.mark.parametrize("args,words", [
    (["generate", "wallace", "-w", "8"], ["unknown architecture 'wallace'"]),
    (["generate", "ripple", "-w", "0"], ["width must be a whole number >= 1"]),
    (["generate", "ripple", "-w", "8", "--block", "2"], ["no parameter 'block'"]),
    (["generate", "ripple"], ["--width is required"]),
    (["generate", "carry-select", "-w", "8", "--sizes", "4,5"], ["add up to 9"]),
])
def test_generate_bad_input_is_one_line_exit_2(cli, args, words):
    r = CliRunner().invoke(cli, args)
    assert r.exit_code == 2
    err = r.stderr if hasattr(r, "stderr") else r.output
    assert err.count("\n") == 1 and err.startswith("error: ")
    for w in words:
        assert w in err
    assert "Traceback" not in r.output


def test_generate_list(cli):
    r = CliRunner().invoke(cli, ["generate", "--list"])
    assert r.exit_code == 0
    for name in ARCHITECTURES:
        assert name in r.output


def test_stats_command_json_and_text(cli, tmp_path):
    path = tmp_path / "sk16.json"
    path.write_text(json_netlist.dumps(generate("sklansky", 16)))
    r = CliRunner().invoke(cli, ["shape", str(path), "--json"])
    assert r.exit_code == 0, r.output
    data = json.loads(r.output)
    assert data["prefix_nodes"] == 32 and data["prefix_levels"] == 4  # Harris (2003), from memory
    assert data["max_fanout"] == 9
    assert isinstance(data["depth"], int) and set(data["gates"]) == {"and", "or", "xor"}
    r = CliRunner().invoke(cli, ["shape", str(path)])
    assert r.exit_code == 0 and "prefix nodes   32 in 4 levels" in r.output


def test_stats_command_bad_file(cli, tmp_path):
    bad = tmp_path / "bad.json"
    bad.write_text('{"format": "verify-netlist/1", "inputs": {"a": 1}, "outputs": {"y": 1}, '
                   '"gates": [{"out": "y", "op": "and", "in": ["a", "q"]}]}')
    r = CliRunner().invoke(cli, ["shape", str(bad)])
    assert r.exit_code == 2
    err = r.stderr if hasattr(r, "stderr") else r.output
    assert "bad.json" in err and "'q'" in err and err.count("\n") == 1


_PARAM_ADDER = """\
`include "widths.vh"
`ifndef LARKSPUR_EXTRA
`define LARKSPUR_EXTRA 0
`endif
module larkspur_pa #(parameter W = 4) (input [W-1:0] a, b, output [W+`LARKSPUR_EXTRA:0] s);
  assign s = a + b;
endmodule
"""


def test_stats_takes_the_verilog_options(cli, tmp_path):
    inc = tmp_path / "inc"
    inc.mkdir()
    (inc / "widths.vh").write_text("// nothing but a comment\n")
    src = tmp_path / "pa.sv"
    src.write_text(_PARAM_ADDER)
    r = CliRunner().invoke(cli, ["shape", str(src), "--param", "W=8", "-I", str(inc), "--json",
                                 "-D", "LARKSPUR_EXTRA=2", "--top", "larkspur_pa"])
    assert r.exit_code == 0, r.output
    data = json.loads(r.output)
    assert data["inputs"] == {"a": 8, "b": 8} and data["outputs"] == {"s": 11}
    r = CliRunner().invoke(cli, ["shape", str(src), "--param", "W=3", "-I", str(inc)])
    assert r.exit_code == 0, r.output
    assert r.output.startswith("larkspur_pa: inputs a[2:0], b[2:0]; outputs s[3:0]")


@pytest.mark.parametrize("args,words", [
    (["--param", "W=8,16"], ["--param W: shape takes one value per parameter"]),
    (["--param", "X=8"], ["--param X", "no parameter 'X'", "(parameters: W)"]),
    (["--param", "W"], ["--param 'W': write NAME=VALUE"]),
    (["-D", "A B"], ["'A B'", "macro name"]),
])
def test_stats_verilog_option_errors_are_one_line(cli, tmp_path, args, words):
    inc = tmp_path / "inc"
    inc.mkdir()
    (inc / "widths.vh").write_text("\n")
    src = tmp_path / "pa.sv"
    src.write_text(_PARAM_ADDER)
    r = CliRunner().invoke(cli, ["shape", str(src), "-I", str(inc), *args])
    assert r.exit_code == 2
    err = r.stderr if hasattr(r, "stderr") else r.output
    assert err.startswith("error: ") and err.count("\n") == 1, err
    for w in words:
        assert w in err, err
    assert "Traceback" not in r.output
