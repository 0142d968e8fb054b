"""Delay analysis: the floating-mode rule, exact delays by SAT, timed simulation, settle proofs.

Outside references, each named beside its check:
- the floating-mode rule as the issue states it and as ternary logic defines it (an output is
  determined when every completion of the unknown inputs gives the same value);
- exhaustive event-driven simulation of every input transition (transport delay), an
  implementation independent of the SAT encoding;
- the ripple-carry formula (n-1)*t_carry + max(t_carry, t_sum) (common practice);
- prefix levels log2(n) for Kogge-Stone and Sklansky, 2*log2(n)-1 for Brent-Kung (Harris 2003,
  from memory);
- the false path through the skip multiplexer of a carry-skip adder (common practice).
"""

from __future__ import annotations

import itertools
import json
import math

import pytest
from pathlib import Path

from verify.cli.main import main
from verify.errors import InputError
from verify.library import architectures as A
from verify.model.ops import OPS
from verify.timing import analyze, settle_check
from verify.timing.delays import UnitModel, load_toml, resolve
from verify.timing.events import simulate
from verify.timing.floating import Analysis

TYPICAL = "designs/delays/typical.toml"


def vectors(design):
    """Every input vector of a small design."""
    widths = [(p.name, p.width) for p in design.inputs]
    for packed in range(1 << design.input_width):
        v, k = {}, 0
        for name, w in widths:
            v[name] = packed >> k & ((1 << w) - 1)
            k += w
        yield v


# ---- the rule in the op table ----------------------------------------------------------------

def test_settle_rule_is_ternary_determination_for_every_op():
    # reference: ternary logic - determined iff every completion of the unstable inputs agrees
    for name, op in OPS.items():
        for k in range(op.min_inputs, (op.max_inputs or 4) + 1):
            for stable in itertools.product((False, True), repeat=k):
                for vals in itertools.product((0, 1), repeat=k):
                    free = [i for i in range(k) if not stable[i]]
                    outs = set()
                    for fill in itertools.product((0, 1), repeat=len(free)):
                        v = list(vals)
                        for i, x in zip(free, fill):
                            v[i] = x
                        outs.add(op.bit(v))
                    assert op.determined(list(stable), list(vals)) == (len(outs) == 1), \
                        (name, stable, vals)


def test_settle_rule_in_the_words_of_the_issue():
    # the issue's statement: one controlling input settles and/or; a mux needs select and the
    # selected input or equal data inputs; a majority two equal inputs; xor every input
    assert OPS["and"].determined([True, False], [0, 1])
    assert not OPS["and"].determined([True, False], [1, 0])
    assert OPS["or"].determined([False, True], [0, 1])
    assert OPS["mux"].determined([True, True, False], [0, 1, 0])
    assert not OPS["mux"].determined([True, False, True], [0, 1, 0])
    assert OPS["mux"].determined([False, True, True], [0, 1, 1])
    assert OPS["maj"].determined([True, True, False], [1, 1, 0])
    assert not OPS["maj"].determined([True, True, False], [1, 0, 0])
    assert not OPS["xor"].determined([True, False, True], [1, 1, 1])


# ---- delay models ----------------------------------------------------------------------------

def test_unit_model_counts_gates_and_not_buffers():
    d = A.generate("ripple", 2)
    m = UnitModel()
    from verify.model.netlist import Gate
    assert m.ticks(Gate("buf", ("a",), "y")) == 0 and m.ticks(Gate("xor", ("a", "b"), "y")) == 1
    assert {m.ticks(g) for g in d.gates} <= {0, 1}


def test_typical_table_orders_gates_as_common_practice_says():
    m = load_toml(TYPICAL)
    from verify.model.netlist import Gate

    def t(op, k=2):
        return m.ticks(Gate(op, tuple(f"i{j}" for j in range(k)), "y"))
    two = {op: t(op) for op in ("and", "or", "nand", "nor", "xor", "xnor")}
    # common practice: XOR is the slowest two-input gate; AND slightly faster than OR;
    # a three-input gate is slower than a two-input one; inverting gates are faster
    assert two["xor"] == max(two.values())
    assert two["and"] < two["or"]
    assert all(t(op, 3) > t(op, 2) for op in ("and", "or", "nand", "nor", "xor"))
    assert t("nand") < t("and") and t("nor") < t("or") and t("not", 1) < t("nand")


@pytest.mark.parametrize("text, message", [
    ("[delay]\nand = 1\n", "gives no delay for"),
    ("[delay]\nfoo = 1\n", "unknown op 'foo'"),
    ("[delay]\nand = -1\n", ">= 0"),
    ("nonsense = [\n", "not valid TOML"),
    ("colour = 1\n[delay]\nand = 1\n", "unknown key 'colour'"),
])
def test_bad_delay_tables_are_input_errors(tmp_path, text, message):
    p = tmp_path / "d.toml"
    p.write_text(text)
    with pytest.raises(InputError) as e:
        resolve(str(p))
    assert message in str(e.value) and str(p) in str(e.value)


# ---- exact delay against independent evidence ------------------------------------------------

SMALL = [("ripple", 3, {}), ("carry-skip", 3, {"block": 2}), ("kogge-stone", 3, {}),
         ("brent-kung", 3, {}), ("carry-select", 3, {"block": 2}), ("conditional-sum", 3, {}),
         ("ripple-maj", 3, {}), ("sklansky", 3, {})]


@pytest.mark.parametrize("arch, width, kw", SMALL)
@pytest.mark.parametrize("delays", ["unit", TYPICAL])
def test_exact_delay_is_the_worst_floating_settle_over_every_vector(arch, width, kw, delays):
    # reference: the floating-mode rule applied vector by vector (all 2^7 vectors) and the
    # event-driven simulator started from unknown nets (an implementation of its own)
    d = A.generate(arch, width, **kw)
    an = Analysis(d, delays)
    worst_rule = {o: 0 for o in d.output_bits}
    worst_sim = {o: 0 for o in d.output_bits}
    for v in vectors(d):
        settle = an.settle_times(v)[1]
        wave = simulate(d, an.delay, v, None)
        for o in d.output_bits:
            worst_rule[o] = max(worst_rule[o], settle[o])
            worst_sim[o] = max(worst_sim[o], wave.last_change([o]))
            assert wave.final[o] is not None
    exact = {o: an.exact(o).exact for o in d.output_bits}
    assert exact == worst_rule == worst_sim
    assert all(exact[o] <= an.arrival[o] for o in d.output_bits)


def _all_transitions(d, an):
    worst = {o: 0 for o in d.output_bits}
    vs = list(vectors(d))
    for after in vs:
        for before in vs:
            wave = simulate(d, an.delay, after, before)
            for o in d.output_bits:
                worst[o] = max(worst[o], wave.last_change([o]))
    return worst


def test_carry_skip_false_path_by_exhaustive_transitions():
    # common practice: the longest path of a carry-skip adder (ripple through a block, then the
    # skip multiplexer) is false: when every bit of a block propagates the mux takes the skip
    # input. Reference: every one of the 2^7 x 2^7 input transitions simulated with transport
    # delay; floating mode is an upper bound on it, equal here.
    d = A.generate("carry-skip", 3, block=2)
    an = Analysis(d, "unit")
    exact = {o: an.exact(o).exact for o in d.output_bits}
    assert an.arrival["cout"] > exact["cout"]  # the false path
    assert _all_transitions(d, an) == exact
    rep = analyze(d, "unit")
    assert rep["per_output"]["cout"]["topological"] > rep["per_output"]["cout"]["exact"]
    assert [fp["output"] for fp in rep["false_paths"]] == ["cout"]
    assert rep["false_paths"][0]["path"][-1] == "cout"


@pytest.mark.slow
@pytest.mark.parametrize("arch, width, kw", SMALL)
@pytest.mark.parametrize("delays", ["unit", TYPICAL])
def test_transitions_never_outlast_the_exact_delay(arch, width, kw, delays):
    # what holds in general: whatever the earlier vector, with transport delay every output is
    # final from its floating-mode settle time on, so the last change of any transition is at
    # most the exact delay; for these designs the two are equal (some transition needs it all)
    d = A.generate(arch, width, **kw)
    an = Analysis(d, delays)
    exact = {o: an.exact(o).exact for o in d.output_bits}
    sim = _all_transitions(d, an)
    assert all(sim[o] <= exact[o] for o in d.output_bits)
    assert sim == exact


def test_witness_and_sensitized_path():
    d = A.generate("carry-skip", 8)
    rep = analyze(d, "unit")
    an = Analysis(d, "unit")
    w = rep["witness"]
    # re-simulated with the rule: the witness needs exactly the exact delay at its output
    assert an.settle_times(w)[1][rep["critical_output"]] == rep["exact_delay"]
    path = rep["critical_path"]
    assert path[0] in d.input_bits and path[-1] == rep["critical_output"]
    for a, b in zip(path, path[1:]):
        assert a in d.driver[b].inputs  # a chain of gates
    assert sum(an.delay[n] for n in path[1:]) == rep["exact_delay"]


# ---- outside figures -------------------------------------------------------------------------

def _between(d, delay, src, dst):
    """Longest path delay from net src to net dst (None if dst is not reached)."""
    t = {src: 0}
    for g in d.ordered_gates:
        ins = [t[i] for i in g.inputs if i in t]
        if ins:
            t[g.output] = max(ins) + delay[g.output]
    return t.get(dst)


@pytest.mark.parametrize("n", [2, 4, 8, 16])
@pytest.mark.parametrize("delays", ["unit", TYPICAL])
def test_ripple_carry_formula(n, delays):
    # common practice: a chain of n full adders settles in (n-1)*t_carry + max(t_carry, t_sum)
    # after the carry chain starts; here it starts when the first propagate signal is ready
    # (t_p). t_carry, t_sum and t_p are read off the full adder of bit 1 of the circuit itself.
    d = A.generate("ripple", n)
    an = Analysis(d, delays)
    fa_sum = "sum[1]" if n > 1 else "sum"
    t_carry = _between(d, an.delay, "c1", "c2") if n > 2 else _between(d, an.delay, "c1", "cout")
    t_sum = _between(d, an.delay, "c1", fa_sum)
    t_p = _between(d, an.delay, "a[0]", "p0")
    expected = t_p + (n - 1) * t_carry + max(t_carry, t_sum)
    rep = analyze(d, delays)
    scale = an.model.ticks_per_unit
    assert rep["exact_delay"] * scale == expected
    assert rep["topological_delay"] == rep["exact_delay"]  # no false path in a ripple chain


@pytest.mark.parametrize("arch", ["kogge-stone", "sklansky", "brent-kung"])
@pytest.mark.parametrize("n", [4, 8, 16, 32])
def test_prefix_levels_and_unit_delay(arch, n):
    # Harris 2003 (from memory): log2(n) prefix levels for Kogge-Stone and Sklansky, 2*log2(n)-1
    # for Brent-Kung. The rows are read from the circuit's schedule; the delay from its gates.
    rows = [r for r in A.prefix_schedule(arch, n) if r]
    published = 2 * int(math.log2(n)) - 1 if arch == "brent-kung" else int(math.log2(n))
    assert len(rows) == published
    d = A.generate(arch, n)
    an = Analysis(d, "unit")
    t_pg = an.delay["p1"]
    t_node = an.delay["G_1_0_t"] + an.delay["G_1_0"]  # and + or of a prefix cell
    t_sum = an.delay[d.driver["sum[1]"].output]
    rep = analyze(d, "unit")
    # the carry-in joins position 0 through one more prefix cell (the fold) before the tree
    if arch == "kogge-stone":  # the carry out crosses every row
        expected = t_pg + (1 + len(rows)) * t_node
    elif arch == "sklansky":  # the carry into the top bit crosses every row, then its sum
        expected = t_pg + (1 + len(rows)) * t_node + t_sum
    else:  # Brent-Kung: up-sweep and down-sweep but the last row, then a sum
        expected = t_pg + len(rows) * t_node + t_sum
    assert rep["exact_delay"] == expected == rep["topological_delay"]


# ---- settle proofs ---------------------------------------------------------------------------

def test_settle_check_proves_at_the_exact_delay_and_fails_just_before(tmp_path):
    d = A.generate("ripple", 4)
    exact = analyze(d, "unit")["exact_delay"]
    ok = settle_check(d, None, exact, "unit")
    assert ok.status == "pass"
    bad = settle_check(d, None, exact - 1, "unit", vcd_path=tmp_path / "late.vcd")
    assert bad.status == "fail"
    cex = bad.counterexample
    # reference: Python integers for the expected sum; the late output differs at D
    total = cex.inputs["a"] + cex.inputs["b"] + cex.inputs["cin"]
    assert cex.expected == {"sum": total % 16, "cout": total >> 4}
    assert cex.actual != cex.expected
    text = (tmp_path / "late.vcd").read_text()
    assert "adder-verify report (vcd)" in text.splitlines()[1]
    stamps = [int(line[1:]) for line in text.splitlines() if line.startswith("#")]
    assert max(stamps) >= exact and stamps == sorted(stamps)


def test_settle_check_time_limit_is_undecided_never_a_pass():
    d = A.generate("carry-skip", 64)
    out = settle_check(d, None, 10, "unit", time_limit=1e-9)
    assert out.status == "undecided"


def test_check_api_combines_function_and_settling():
    from verify.check import check
    d = A.generate("kogge-stone", 8)
    assert check(d, settle_within=9).verdict.value == "exhaustive"
    r = check(d, settle_within=8)
    assert r.verdict.value == "fail" and r.engines[-1].engine == "settle"
    with pytest.raises(InputError):
        check(d, settle_within=-1)


# ---- command line ----------------------------------------------------------------------------

def run(argv, capsys):
    with pytest.raises(SystemExit) as e:
        main(argv)
    out = capsys.readouterr()
    return e.value.code, out.out, out.err


def test_timing_json_has_the_promised_keys(tmp_path, capsys):
    from verify.formats import json_netlist
    p = tmp_path / "cs8.json"
    p.write_text(json_netlist.dumps(A.generate("carry-skip", 8)))
    code, out, _ = run(["timing", str(p), "--json"], capsys)
    rep = json.loads(out)
    assert code == 0
    assert rep["topological_delay"] == 19 and rep["exact_delay"] == 17
    assert set(rep["witness"]) == {"a", "b", "cin"}
    assert rep["per_output"]["cout"] == {**rep["per_output"]["cout"], "topological": 19,
                                         "exact": 11}
    assert rep["critical_path"][-1] in rep["per_output"]


def test_timing_transition_writes_a_timed_vcd(tmp_path, capsys):
    from verify.formats import json_netlist
    p = tmp_path / "r8.json"
    p.write_text(json_netlist.dumps(A.generate("ripple", 8)))
    vcd = tmp_path / "carry.vcd"
    code, out, _ = run(["timing", str(p), "--from", "a=0,b=255,cin=0", "--to", "a=0,b=255,cin=1",
                        "--vcd", str(vcd), "--json"], capsys)
    rep = json.loads(out)
    # the carry from cin travels all 8 full adders, an AND and an OR each (the propagate
    # signals are steady): cout changes once, at 8 * 2 gate delays
    assert code == 0 and rep["last_change"]["cout"] == 16 and rep["output_changes"]["cout"] == 1
    from vcd.reader import TokenKind, tokenize
    with open(vcd, "rb") as fh:
        times = [t.time_change for t in tokenize(fh) if t.kind is TokenKind.CHANGE_TIME]
    assert 16 in times and times == sorted(times)


def test_timing_sweep_and_plot(tmp_path, capsys):
    png = tmp_path / "d.png"
    code, out, _ = run(["timing", "--arch", "ripple,kogge-stone", "--widths", "4,8",
                        "--plot", str(png), "--json"], capsys)
    rep = json.loads(out)
    assert code == 0 and png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    ripple = [r["exact"] for r in rep["sweeps"]["ripple"]]
    assert ripple == [9, 17]  # 1 + 2n under the unit model (the ripple formula above)
    code, _, err = run(["timing", "--arch", "ripple", "--widths", "4", "--plot", str(png)],
                       capsys)
    assert code == 2 and "refusing to overwrite" in err


@pytest.mark.parametrize("argv, message", [
    (["timing"], "name a design"),
    (["timing", "--arch", "ripple"], "--widths and --arch go together"),
    (["timing", "--arch", "nope", "--widths", "4"], "nope"),
    (["timing", "--arch", "ripple", "--widths", "x"], "--widths"),
])
def test_timing_bad_usage_is_one_line_exit_2(argv, message, capsys):
    code, _, err = run(argv, capsys)
    assert code == 2 and message in err and "Traceback" not in err
    assert len(err.strip().splitlines()) == 1


def test_check_settle_within_on_the_command_line(tmp_path, capsys):
    from verify.formats import json_netlist
    p = tmp_path / "r4.json"
    p.write_text(json_netlist.dumps(A.generate("ripple", 4)))
    code, out, _ = run(["check", str(p), "--settle-within", "9", "--no-log"], capsys)
    assert code == 0 and "settle" in out
    code, out, _ = run(["check", str(p), "--settle-within", "8", "--no-log", "--vcd",
                        str(tmp_path / "w.vcd")], capsys)
    assert code == 1 and "not settled by 8" in out and (tmp_path / "w.vcd").exists()
    code, _, err = run(["check", str(p), "--settle-within", "8", "--delays",
                        str(tmp_path / "none.toml"), "--no-log"], capsys)
    assert code == 2 and "no such delay file" in err


def test_per_gate_model_looks_up_each_gate_and_falls_back():
    # the plug for library cells: a delay per gate by its source, the unit model for the rest
    from verify.timing.delays import PerGateModel
    d = A.generate("ripple", 4)
    slow_carry = PerGateModel("cells", "ns", lambda g: 2.5 if g.op == "or" else None, UnitModel())
    an = Analysis(d, slow_carry)
    assert {an.delay[g.output] for g in d.gates if g.op == "or"} == {2500}
    assert {an.delay[g.output] for g in d.gates if g.op == "xor"} == {1000}
    # ripple formula again (common practice): t_p + (n-1)*t_carry + max(t_carry, t_sum)
    assert analyze(d, slow_carry)["exact_delay"] == 1 + 3 * 3.5 + 3.5


def test_verilog_parameter_sweep_follows_the_ripple_formula(capsys):
    from verify.formats import load
    code, out, _ = run(["timing", "designs/larkspur_add_rca_generate.v", "--param", "W=4,8",
                        "--delays", TYPICAL, "--json"], capsys)
    rows = json.loads(out)["sweeps"]["W"]
    assert code == 0 and [r["width"] for r in rows] == [4, 8]
    for r in rows:
        # common practice: t_p + (n-1)*t_carry + max(t_carry, t_sum), the stage delays read off
        # the Verilog full adder of bit 1 (carry c[1] -> c[2] and c[1] -> sum[1])
        d = load(["designs/larkspur_add_rca_generate.v"], params={"W": r["width"]})
        an = Analysis(d, TYPICAL)
        t_carry = _between(d, an.delay, "c[1]", "c[2]")
        t_sum = _between(d, an.delay, "c[1]", "sum[1]")
        t_p = _between(d, an.delay, "a[0]", "c[1]") - t_carry  # the first stage's set-up
        expected = t_p + (r["width"] - 1) * t_carry + max(t_carry, t_sum)
        assert r["exact"] * an.model.ticks_per_unit == expected


def test_vcd_without_a_transition_is_refused(capsys):
    code, _, err = run(["timing", "designs/larkspur_add8_ripple.json", "--vcd", "x.vcd"], capsys)
    assert code == 2 and "--to" in err


def test_manifest_settle_within_and_delays(tmp_path):
    import shutil
    from verify.manifest.runner import check_entry, load_manifest
    shutil.copy(TYPICAL, tmp_path / "typical.toml")
    from verify.formats import json_netlist
    (tmp_path / "r4.json").write_text(json_netlist.dumps(A.generate("ripple", 4)))
    exact_ps = analyze(A.generate("ripple", 4), TYPICAL)["exact_delay"]
    (tmp_path / "verify.toml").write_text(f"""
[[design]]
name = "in-time"
sources = ["r4.json"]
spec = "{{cout, sum}} = a + b + cin"
settle_within = {exact_ps}
delays = "typical.toml"

[[design]]
name = "late"
sources = ["r4.json"]
spec = "{{cout, sum}} = a + b + cin"
settle_within = {exact_ps - 1}
delays = "typical.toml"
""")
    m = load_manifest(tmp_path / "verify.toml")
    ok, late = (check_entry(e, {}, tmp_path) for e in m.entries)
    assert ok.verdict == "exhaustive" and ok.engines[-1]["engine"] == "settle"
    assert late.verdict == "fail" and late.engines[-1]["status"] == "fail"
    # the table's content is part of the cache key: a changed table is a changed check
    before = m.entries[0].options()
    (tmp_path / "typical.toml").write_text((tmp_path / "typical.toml").read_text() + "\n# x\n")
    assert load_manifest(tmp_path / "verify.toml").entries[0].options() != before
    (tmp_path / "verify.toml").write_text('[[design]]\nname = "x"\nsources = ["r4.json"]\n'
                                          'spec = "sum = a + b"\ndelays = "unit"\n')
    with pytest.raises(InputError, match="settle_within"):
        load_manifest(tmp_path / "verify.toml")


def test_library_model_takes_one_delay_per_cell_from_its_tables():
    # a stand-in for a read Liberty library (cells -> timing arcs -> cell_rise/cell_fall tables)
    from types import SimpleNamespace as NS
    from verify.timing.delays import cell_delays, library_model

    def arc(rise, fall):
        return NS(tables={"cell_rise": NS(values=rise), "cell_fall": NS(values=fall)})
    lib = NS(name="demo", cells={
        "XOR2": NS(arcs=[arc([[0.050, 0.09]], [[0.046, 0.08]]), arc([[0.052, 0.1]], [[0.04, 0.1]])]),
        "AND2": NS(arcs=[arc([[0.031, 0.07]], [[0.035, 0.06]])]),
        "OR2": NS(arcs=[arc([[0.038, 0.07]], [[0.033, 0.06]])]),
        "TIE": NS(arcs=[])})
    assert cell_delays(lib) == {"XOR2": 0.052, "AND2": 0.035, "OR2": 0.038}
    d = A.generate("ripple", 4)
    model = library_model(lib, lambda g: {"xor": "XOR2", "and": "AND2", "or": "OR2"}.get(g.op))
    an = Analysis(d, model)
    t_carry = 0.035 + 0.038  # ripple formula again (common practice), cells read from the tables
    expected = 0.052 + 3 * t_carry + max(t_carry, 0.052)
    assert analyze(d, model)["exact_delay"] == pytest.approx(expected)
    assert an.model.unit == "ns"


_INV_NAND = """module chain (input a, input b, output y);
  wire n1, n2;
  PX_INV   u0 (.A(a), .Y(n1));
  PX_NAND2 u1 (.A(n1), .B(b), .Y(n2));
  PX_INV   u2 (.A(n2), .Y(y));
endmodule
"""


def test_liberty_delays_count_every_cell_once(tmp_path, capsys):
    """--delays FILE.lib times each cell by its worst arc at the tables' first index point. The
    expected figures are read from tests/data/plain_cells.lib itself (the outside reference):
    PX_INV max(0.020, 0.015) = 0.020 ns, PX_NAND2 max(0.03, 0.02, 0.032, 0.022) = 0.032 ns. The
    two inverters around the NAND must both count, although their logic would fold away."""
    import json

    from verify.cli.main import main
    lib = Path(__file__).parent / "data" / "plain_cells.lib"
    (tmp_path / "chain.v").write_text(_INV_NAND)
    with pytest.raises(SystemExit) as e:
        main(["timing", str(tmp_path / "chain.v"), "--cells", str(lib), "--delays", str(lib),
              "--json"])
    assert e.value.code == 0
    rep = json.loads(capsys.readouterr().out)
    path = 0.020 + 0.032 + 0.020  # a -> u0 -> u1 -> u2 -> y; no input can skip a cell here
    assert rep["topological_delay"] == pytest.approx(path)
    assert rep["exact_delay"] == pytest.approx(path)
    with pytest.raises(SystemExit) as e:  # the function is still checked as before
        main(["check", str(tmp_path / "chain.v"), "--cells", str(lib), "--spec", "y = ~a & b",
              "--no-log"])
    assert e.value.code == 0
    (tmp_path / "fa.v").write_text(
        "module fa (input a, b, c, output s, co);\n"
        "  PX_FA u0 (.A(a), .B(b), .CI(c), .S(s), .CO(co));\nendmodule\n")
    capsys.readouterr()
    with pytest.raises(SystemExit) as e:  # a cell without timing tables is not timed as 0
        main(["timing", str(tmp_path / "fa.v"), "--cells", str(lib), "--delays", str(lib)])
    assert e.value.code == 2 and "PX_FA" in capsys.readouterr().err
