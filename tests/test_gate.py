"""'adder-verify run': the manifest, exit codes, reports, parallel runs, and a git repo going red and green."""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest

from tests.helpers import rewire, ripple
from verify.manifest import runner as gate
from verify.cli.main import main
from verify.errors import InputError
from verify.formats.json_netlist import dumps
from verify.render.batch import render_json, render_junit, render_markdown

ADD = "{cout, sum} = a + b + cin"
REPO = Path(__file__).resolve().parents[1]


def run_cli(capsys, *argv, cwd: Path | None = None):
    old = os.getcwd()
    if cwd is not None:
        os.chdir(cwd)
    try:
        with pytest.raises(SystemExit) as exc:
            main(list(argv))
    finally:
        os.chdir(old)
    out, err = capsys.readouterr()
    return exc.value.code, out, err


def entry(name, file, **extra):
    lines = ["[[design]]", f'name = "{name}"', f'sources = ["{file}"]', f'spec = "{ADD}"']
    for k, v in extra.items():
        lines.append(f"{k} = {json.dumps(v) if not isinstance(v, str) or not v.startswith('{') else v}")
    return "\n".join(lines) + "\n\n"


def broken(width: int):
    """A ripple adder with the sum bit 2 xor made an or: wrong whenever both inputs of it are 1."""
    return rewire(ripple(width), "sum[2]", op="or")


@pytest.fixture
def lib(tmp_path):
    """A small Larkspur library: two good adders and one broken on purpose."""
    (tmp_path / "rtl").mkdir()
    (tmp_path / "rtl" / "larkspur_add4.json").write_text(dumps(ripple(4, name="larkspur_add4")))
    (tmp_path / "rtl" / "larkspur_add6.json").write_text(dumps(ripple(6, name="larkspur_add6")))
    (tmp_path / "rtl" / "larkspur_bad5.json").write_text(dumps(broken(5)))
    return tmp_path


def manifest(root: Path, text: str) -> Path:
    (root / "verify.toml").write_text(text, encoding="utf-8")
    return root / "verify.toml"


# ---- the manifest ---------------------------------------------------------------------------

def test_the_issue_example_reads_with_every_key(tmp_path):
    (tmp_path / "rtl").mkdir()
    (tmp_path / "rtl" / "acc_adder.sv").write_text("module acc_adder; endmodule\n")
    m = manifest(tmp_path, """
[[design]]
name = "acc_adder"
sources = ["rtl/acc_adder.sv"]
top = "acc_adder"
params = { W = [16, 32, 64] }
spec = "{cout, sum} = a + b + cin"
require = "complete"      # or "tested"
method = "auto"
time_limit = 120
""")
    (e,) = gate.load_manifest(m).entries
    assert (e.name, e.sources, e.top, e.require, e.method, e.time_limit,
            e.deliberately_broken) == (
        "acc_adder", ("rtl/acc_adder.sv",), "acc_adder", "complete", "auto", 120.0, False)
    assert e.points() == [{"W": 16}, {"W": 32}, {"W": 64}]


def test_several_parameters_give_every_combination(tmp_path):
    (tmp_path / "a.v").write_text("module a; endmodule\n")
    m = manifest(tmp_path, entry("a", "a.v", params="{ W = [4, 8], D = 2 }"))
    assert gate.load_manifest(m).entries[0].points() == [
        {"W": 4, "D": 2}, {"W": 8, "D": 2}]


@pytest.mark.parametrize("text,words,line", [
    (entry("acc", "rtl/larkspur_add4.json", time_limt=5), "design 'acc': key 'time_limt': unknown "
     "key (did you mean 'time_limit'?)", 5),
    (entry("acc", "rtl/larkspur_add4.json", timeout=5), "design 'acc': key 'timeout': this key is "
     "now called 'time_limit': write time_limit = 120", 5),
    (entry("acc", "rtl/larkspur_add4.json", expect="fail"), "key 'expect': this key is now called "
     "'deliberately_broken': write deliberately_broken = true", 5),
    (entry("acc", "rtl/larkspur_add4.json", engine="smt"), "key 'engine': this key is now called "
     "'method'", 5),
    ('[[design]]\nname = "acc"\nfiles = ["rtl/larkspur_add4.json"]\nspec = "x"\n',
     "key 'files': this key is now called 'sources'", 3),
    (entry("acc", "rtl/larkspur_add4.json", colour="red"), "key 'colour': unknown key (known keys:", 5),
    ('[[design]]\nname = "acc"\nsources = ["rtl/larkspur_add4.json"]\n',
     "design 'acc': the key 'spec' is required", 1),
    (entry("acc", "rtl/larkspur_add4.json", require="proven"),
     "design 'acc': key 'require': 'proven' is not one of 'complete', 'tested'", 5),
    (entry("acc", "rtl/larkspur_add4.json", method="sat"), "key 'method': 'sat' is not one of", 5),
    (entry("acc", "rtl/larkspur_add4.json", time_limit=-1), "key 'time_limit': must be a positive", 5),
    (entry("acc", "rtl/larkspur_add4.json", time_limit=True), "key 'time_limit': must be a positive", 5),
    (entry("acc", "rtl/larkspur_add4.json", deliberately_broken="maybe"),
     "key 'deliberately_broken': must be true or false", 5),
    (entry("acc", "rtl/larkspur_add4.json", vectors=0), "key 'vectors': must be at least 1", 5),
    (entry("acc", "rtl/nope.json"), "key 'sources': no such file 'rtl/nope.json'", 3),
    (entry("acc", "rtl/larkspur_add4.json", params="{ W = [8] }"),
     "key 'params': applies to Verilog files only", 5),
    ('[[design]]\nname = "acc"\nsources = "rtl/larkspur_add4.json"\nspec = "sum = a"\n',
     "key 'sources': must be a list of paths", 3),
    (entry("acc", "rtl/larkspur_add4.json") + entry("acc", "rtl/larkspur_add6.json"),
     "design 'acc': the name is used twice (first at", 6),
    ('[[design]]\nname = "acc"\nsources = ["rtl/larkspur_add4.json"\n', "not valid TOML", 3),
    ('[[design]]\nname = acc\n', "not valid TOML: Invalid value", "2:8"),
    ('[design]\nname = "acc"\n', "write each one as [[design]]", None),
    ('[[designs]]\nname = "acc"\n', "unknown top-level key 'designs'", None),
    ("# nothing yet\n", "no [[design]] entries", None),
    ('[[design]]\nname = ""\nsources = ["rtl/larkspur_add4.json"]\nspec = "x"\n',
     "design #1: key 'name': must be a non-empty string", 2),
])
def test_a_bad_manifest_names_the_entry_the_key_and_the_line(lib, capsys, text, words, line):
    m = manifest(lib, text)
    with pytest.raises(InputError) as exc:
        gate.load_manifest(m)
    assert words in str(exc.value)
    if line is not None:
        assert str(exc.value).startswith(f"{m}:{line}")
    code, out, err = run_cli(capsys, "run", str(m))
    assert code == 2
    assert err.startswith("error: ") and err.count("\n") == 1 and "Traceback" not in err
    assert words in err


def test_a_missing_manifest_is_exit_2(tmp_path, capsys):
    code, _, err = run_cli(capsys, "run", cwd=tmp_path)
    assert code == 2 and "verify.toml: no such manifest" in err


# ---- exit codes -----------------------------------------------------------------------------

def test_exit_codes_follow_what_each_entry_asks(lib, capsys):
    cases = [
        (entry("good", "rtl/larkspur_add4.json"), 0),
        (entry("bad", "rtl/larkspur_bad5.json"), 1),
        (entry("bad", "rtl/larkspur_bad5.json", deliberately_broken=True), 0),
        (entry("good", "rtl/larkspur_add4.json", deliberately_broken=True), 1),  # a proof contradicts it
        # 2^9 inputs fit the random budget: every one is simulated, so the verdict is complete
        (entry("good", "rtl/larkspur_add4.json", method="random"), 0),
        (entry("good", "rtl/larkspur_add4.json", method="random", require="tested"), 0),
        # 9 input bits over a limit of 4: the exhaustive engine cannot answer
        (entry("good", "rtl/larkspur_add4.json", method="exhaustive", exhaustive_limit=4), 3),
        (entry("good", "rtl/larkspur_add4.json", method="exhaustive", exhaustive_limit=4,
               deliberately_broken=True), 3),
        (entry("good", "rtl/larkspur_add4.json") + entry("bad", "rtl/larkspur_bad5.json") +
         entry("weak", "rtl/larkspur_add6.json", method="random"), 1),
    ]
    for text, want in cases:
        m = manifest(lib, text)
        code, out, err = run_cli(capsys, "run", str(m), "--no-cache", "-q")
        assert code == want, (text, out, err)
        assert gate.run(m, use_cache=False).exit_code == want


def test_a_design_that_cannot_be_read_is_an_error_entry(lib, capsys):
    (lib / "rtl" / "junk.json").write_text('{"format": "verify-netlist/1"')
    m = manifest(lib, entry("good", "rtl/larkspur_add4.json") + entry("junk", "rtl/junk.json"))
    summary = gate.run(m)
    assert [r.verdict for r in summary.records] == ["exhaustive", "error"]
    assert "junk.json" in summary.records[1].error and summary.exit_code == 2
    xml = ET.fromstring(render_junit(summary))
    assert xml.get("errors") == "1" and xml.find(".//testcase[@name='junk']/error") is not None


# ---- reports --------------------------------------------------------------------------------

def test_reports_carry_the_counterexample(lib, tmp_path, capsys):
    m = manifest(lib, entry("larkspur_add4", "rtl/larkspur_add4.json") +
                 entry("larkspur_bad5", "rtl/larkspur_bad5.json"))
    out_dir = tmp_path / "out"
    code, out, err = run_cli(capsys, "run", str(m), "--junit", str(out_dir / "j.xml"),
                             "--json", str(out_dir / "s.json"), "--markdown", str(out_dir / "s.md"))
    assert code == 1
    assert "larkspur_bad5" in out and "FAIL" in out and "COUNTEREXAMPLE" in out
    summary = json.loads((out_dir / "s.json").read_text())
    assert [(e["name"], e["ok"], e["verdict"], e["cached"]) for e in summary["entries"]] == [
        ("larkspur_add4", True, "exhaustive", False), ("larkspur_bad5", False, "fail", False)]
    for e in summary["entries"]:
        assert set(e) >= {"name", "params", "ok", "verdict", "cached", "seconds"}
    cex = summary["entries"][1]["counterexample"]
    a, b, cin = cex["inputs"]["a"], cex["inputs"]["b"], cex["inputs"]["cin"]
    assert cex["expected"]["sum"] == (a + b + cin) % 32  # Python integers
    assert cex["actual"]["sum"] != (a + b + cin) % 32
    root = ET.parse(out_dir / "j.xml").getroot()
    assert (root.get("tests"), root.get("failures"), root.get("errors")) == ("2", "1", "0")
    cases = root.findall(".//testcase")
    assert [c.get("name") for c in cases] == ["larkspur_add4", "larkspur_bad5"]
    assert cases[0].find("failure") is None
    failure = cases[1].find("failure")
    assert failure.get("type") == "counterexample"
    assert f"a={a:#x}" in failure.get("message") or f"a={a} " in failure.get("message")
    assert "sum expected" in failure.get("message")
    md = (out_dir / "s.md").read_text()
    assert md.splitlines()[1].startswith("### ❌") and "larkspur_bad5" in md and "sum expected" in md
    assert len(md) < 2000


def test_junit_escapes_awkward_names(lib):
    name = 'larkspur <add> & "x" \x01'
    m = manifest(lib, entry(name.replace('"', '\\"').replace("\x01", "\\u0001"), "rtl/larkspur_bad5.json"))
    summary = gate.run(m)
    root = ET.fromstring(render_junit(summary))  # well-formed XML
    assert root.find(".//testcase").get("name") == 'larkspur <add> & "x" ?'


def test_markdown_stays_short_for_a_big_manifest(lib):
    text = "".join(entry(f"larkspur_add4_{i}", "rtl/larkspur_add4.json") for i in range(60))
    text += entry("larkspur_bad5", "rtl/larkspur_bad5.json")
    summary = gate.run(manifest(lib, text))
    md = render_markdown(summary)
    assert "60 more checks met the manifest" in md and "larkspur_bad5" in md
    assert md.count("\n") < 20
    assert summary.records[1].cached is True  # same file, same options: one key


def test_parallel_runs_give_the_same_results(lib):
    text = (entry("larkspur_add4", "rtl/larkspur_add4.json") +
            entry("larkspur_bad5", "rtl/larkspur_bad5.json") +
            entry("larkspur_add6", "rtl/larkspur_add6.json", method="smt") +
            entry("weak", "rtl/larkspur_add6.json", method="random"))
    m = manifest(lib, text)
    one = render_json(gate.run(m, jobs=1, use_cache=False))
    two = render_json(gate.run(m, jobs=3, use_cache=False))
    drop = {"seconds", "checked_seconds", "engines"}
    strip = lambda s: [{k: v for k, v in e.items() if k not in drop} for e in s["entries"]]  # noqa: E731
    assert strip(one) == strip(two)
    assert [[x["status"] for x in e["engines"]] for e in one["entries"]] == \
        [[x["status"] for x in e["engines"]] for e in two["entries"]]
    assert one["exit_code"] == two["exit_code"] == 1


def test_progress_lines_when_stderr_is_not_a_terminal(lib, capsys):
    m = manifest(lib, entry("larkspur_add4", "rtl/larkspur_add4.json") +
                 entry("larkspur_add6", "rtl/larkspur_add6.json"))
    code, out, err = run_cli(capsys, "run", str(m))
    assert code == 0
    assert err.splitlines() == [l for l in err.splitlines() if l.startswith("[")]
    assert err.splitlines()[0].startswith("[1/2] larkspur_add4: exhaustive (")
    assert out.count("EXHAUSTIVE") == 2 and "exit 0" in out


def test_json_to_stdout(lib, capsys):
    m = manifest(lib, entry("larkspur_add4", "rtl/larkspur_add4.json"))
    code, out, err = run_cli(capsys, "run", str(m), "--json", "-")
    assert code == 0 and err == ""
    data = json.loads(out)
    assert data["entries"][0]["verdict"] == "exhaustive" and data["exit_code"] == 0


def test_verilog_entries_at_each_width(tmp_path):
    (tmp_path / "rtl").mkdir()
    (tmp_path / "rtl" / "larkspur_acc.sv").write_text(
        "module larkspur_acc #(parameter W = 8) (input [W-1:0] a, b, input cin,\n"
        "  output [W-1:0] sum, output cout);\n"
        "  assign {cout, sum} = a + b + cin;\n"
        "endmodule\n")
    m = manifest(tmp_path, entry("larkspur_acc", "rtl/larkspur_acc.sv", top="larkspur_acc",
                                 params="{ W = [3, 16, 64] }"))
    summary = gate.run(m)
    assert [(r.params, r.verdict) for r in summary.records] == [
        ({"W": 3}, "exhaustive"), ({"W": 16}, "proven"), ({"W": 64}, "proven")]
    assert [r.design["inputs"]["a"] for r in summary.records] == [3, 16, 64]


# ---- a git repo going red and green ---------------------------------------------------------

def git(repo: Path, *args: str) -> str:
    env = dict(os.environ, GIT_AUTHOR_NAME="Larkspur CI", GIT_AUTHOR_EMAIL="ci@larkspur.example",
               GIT_COMMITTER_NAME="Larkspur CI", GIT_COMMITTER_EMAIL="ci@larkspur.example")
    return subprocess.run(["git", *args], cwd=repo, env=env, check=True, capture_output=True,
                          text=True).stdout


def verify_run(repo: Path, *args: str) -> subprocess.CompletedProcess:
    """The command as CI runs it: a fresh process in the repo."""
    code = "from verify.cli.main import main; main()"
    return subprocess.run([sys.executable, "-c", code, "run", *args], cwd=repo,
                          capture_output=True, text=True, timeout=120)


@pytest.mark.skipif(shutil.which("git") is None, reason="needs git")
def test_a_commit_that_breaks_an_adder_turns_the_gate_red_and_a_fix_green(tmp_path):
    repo = tmp_path / "larkspur"
    (repo / "rtl").mkdir(parents=True)
    git(repo, "init", "-q")
    (repo / ".gitignore").write_text(".verify-cache/\nout/\n")
    (repo / "rtl" / "larkspur_add6.json").write_text(dumps(ripple(6, name="larkspur_add6")))
    (repo / "rtl" / "larkspur_cfg.vh").write_text("`define LARKSPUR_BIAS 0\n")
    (repo / "rtl" / "larkspur_acc.sv").write_text(
        '`include "larkspur_cfg.vh"\n'
        "module larkspur_acc #(parameter W = 8) (input [W-1:0] a, b, input cin,\n"
        "  output [W-1:0] sum, output cout);\n"
        "  assign {cout, sum} = a + b + cin + `LARKSPUR_BIAS;\n"
        "endmodule\n")
    manifest(repo, entry("larkspur_add6", "rtl/larkspur_add6.json") +
             entry("larkspur_acc", "rtl/larkspur_acc.sv", params="{ W = [4, 24] }"))
    git(repo, "add", ".")
    git(repo, "commit", "-q", "-m", "Larkspur adders")

    def gate_run():
        p = verify_run(repo, "--junit", "out/junit.xml", "--json", "out/summary.json")
        assert "Traceback" not in p.stderr, p.stderr
        root = ET.parse(repo / "out" / "junit.xml").getroot()
        entries = json.loads((repo / "out" / "summary.json").read_text())["entries"]
        return p.returncode, int(root.get("failures")), entries

    code, failures, entries = gate_run()
    assert (code, failures) == (0, 0)
    assert [e["cached"] for e in entries] == [False, False, False]
    code, failures, entries = gate_run()
    assert (code, failures) == (0, 0) and [e["cached"] for e in entries] == [True, True, True]
    assert not git(repo, "status", "--porcelain")  # the cache and reports are ignored

    # break the included file: both widths of larkspur_acc go red, larkspur_add6 stays cached
    (repo / "rtl" / "larkspur_cfg.vh").write_text("`define LARKSPUR_BIAS 1\n")
    git(repo, "commit", "-q", "-am", "bias the accumulator")
    code, failures, entries = gate_run()
    assert (code, failures) == (1, 2)
    assert [(e["name"], e["params"], e["verdict"], e["cached"]) for e in entries] == [
        ("larkspur_add6", {}, "exhaustive", True), ("larkspur_acc", {"W": 4}, "fail", False),
        ("larkspur_acc", {"W": 24}, "fail", False)]
    cex = entries[1]["counterexample"]
    a, b, cin = (cex["inputs"][k] for k in ("a", "b", "cin"))
    assert cex["actual"]["sum"] == (a + b + cin + 1) % 16  # Python integers: the bias of 1

    # fix it: green again, and the fixed files' verdicts come straight from the cache
    git(repo, "revert", "--no-edit", "HEAD")
    code, failures, entries = gate_run()
    assert (code, failures) == (0, 0) and [e["cached"] for e in entries] == [True, True, True]

    # break a netlist: only that entry goes red; --no-cache checks all again with the same verdicts
    (repo / "rtl" / "larkspur_add6.json").write_text(dumps(broken(6)))
    git(repo, "commit", "-q", "-am", "hand-edit the adder")
    code, failures, entries = gate_run()
    assert (code, failures) == (1, 1) and [e["ok"] for e in entries] == [False, True, True]
    p = verify_run(repo, "--no-cache", "--jobs", "2", "--json", "-")
    again = json.loads(p.stdout)["entries"]
    assert p.returncode == 1 and [e["cached"] for e in again] == [False, False, False]
    assert [e["verdict"] for e in again] == [e["verdict"] for e in entries]


def test_the_terminal_progress_bar_starts_no_thread(lib, capsys):
    """Workers are forked while the bar is shown: the bar must not leave a thread running."""
    import threading

    from verify.cli.run import _RichProgress

    m = manifest(lib, entry("larkspur_add4", "rtl/larkspur_add4.json") +
                 entry("larkspur_bad5", "rtl/larkspur_bad5.json"))
    before = threading.active_count()
    with _RichProgress() as bar:
        summary = gate.run(m, jobs=2, use_cache=False, progress=bar)
        assert threading.active_count() == before
    err = capsys.readouterr().err
    assert "larkspur_add4: exhaustive" in err and "larkspur_bad5: fail" in err
    assert summary.exit_code == 1


# ---- entries whose manifest values are wrong ------------------------------------------------

_ACC = ("module larkspur_acc #(parameter W = 4) (input [W-1:0] a, b, input cin,\n"
        "  output [W-1:0] sum, output cout);\n"
        "  assign {cout, sum} = a + b + cin;\n"
        "endmodule\n")


def test_entry_errors_name_the_manifest_line_the_entry_and_the_key(tmp_path, capsys):
    (tmp_path / "rtl").mkdir()
    (tmp_path / "rtl" / "larkspur_acc.sv").write_text(_ACC)
    f = "rtl/larkspur_acc.sv"
    text = (entry("good", f, params="{ W = 4 }") +           # lines 1-5
            entry("sk", f, params="{ X = [8, 16] }") +       # lines 7-11, params on 11
            entry("sub", f, defines='{ "A B" = "1" }') +     # lines 13-17, defines on 17
            "[[design]]\nname = \"badspec\"\n" f'sources = ["{f}"]\n' 'spec = "sum = a + q"\n\n'
            + entry("badtop", f, top="nosuch"))               # lines 24-28, top on 28
    m = manifest(tmp_path, text)
    code, out, err = run_cli(capsys, "run", str(m), "--no-cache", "-q")
    assert code == 2
    where = str(m)
    want = [
        f"{where}:11: design 'sk': key 'params': module 'larkspur_acc' has no parameter 'X' "
        "(parameters: W)",
        f"{where}:17: design 'sub': key 'defines': 'A B' is not a macro name",
        f"{where}:22: design 'badspec': key 'spec': column 11: 'q' is not a port",
        f"{where}:28: design 'badtop': key 'top': no module named 'nosuch' (modules: larkspur_acc)",
    ]
    err_lines = err.splitlines()
    assert len(err_lines) == len(want), err  # one line each; X=8 and X=16 are one mistake
    for line, w in zip(err_lines, want):
        assert line.startswith(f"error: {w}"), (line, w)
    problems = out.split("\n\n")[1].splitlines()  # the table's problem lines
    assert [p.split(": ", 1)[0] for p in problems] == ["sk X=8", "sk X=16", "sub", "badspec", "badtop"]
    for p in problems:
        assert p.split(": ", 1)[1].startswith(where + ":"), p
    for word in ("--param", "-D", "--top", "--spec"):  # options the manifest does not have
        assert word not in out + err, word
    assert "exhaustive" in out.lower() and "good" in out  # the other entries are still checked


def test_a_manifest_fault_in_a_twin_entry_names_that_entry(tmp_path):
    (tmp_path / "a.sv").write_text(_ACC)
    m = manifest(tmp_path, entry("one", "a.sv", params="{ Q = 3 }") +
                 entry("two", "a.sv", params="{ Q = 3 }"))
    summary = gate.run(m, use_cache=False)
    assert [r.error.split(": ")[:3] for r in summary.records] == [
        [f"{m}:5", "design 'one'", "key 'params'"], [f"{m}:11", "design 'two'", "key 'params'"]]


def test_a_design_file_error_keeps_its_own_location(tmp_path, capsys):
    (tmp_path / "bad.sv").write_text("module larkspur_bad(input a, output y);\n  assign y = a +;\n"
                                     "endmodule\n")
    m = manifest(tmp_path, entry("bad", "bad.sv"))
    code, out, err = run_cli(capsys, "run", str(m), "--no-cache", "-q")
    assert code == 2
    assert err.startswith("error: bad: ") and "bad.sv:2:" in err and err.count("\n") == 1


# ---- report paths are checked before anything runs -------------------------------------------

@pytest.mark.parametrize("option", ["--junit", "--json", "--markdown"])
def test_a_report_path_that_cannot_be_written_stops_the_run_before_any_check(lib, capsys,
                                                                             monkeypatch, option):
    m = manifest(lib, entry("larkspur_add4", "rtl/larkspur_add4.json"))
    hand = lib / "hand.txt"
    hand.write_text("notes the Larkspur team wrote by hand\n")
    checked = []
    monkeypatch.setattr(gate, "check_entry", lambda *a, **k: checked.append(a) or {})
    code, out, err = run_cli(capsys, "run", str(m), "--no-cache", "-q", option, str(hand))
    assert code == 2 and checked == []
    assert err.startswith(f"error: {hand}: refusing to overwrite") and err.count("\n") == 1
    assert hand.read_text() == "notes the Larkspur team wrote by hand\n"
    assert out == ""


def test_report_paths_are_checked_before_the_run(lib, capsys, monkeypatch):
    m = manifest(lib, entry("larkspur_add4", "rtl/larkspur_add4.json"))
    checked = []
    monkeypatch.setattr(gate, "check_entry", lambda *a, **k: checked.append(a) or {})
    code, _, err = run_cli(capsys, "run", str(m), "-q", "--junit", str(lib / "r.xml"),
                           "--markdown", str(lib / "." / "r.xml"))
    assert code == 2 and checked == [] and "--junit and --markdown name the same file" in err
    (lib / "md.md").write_text("<!-- adder-verify report (markdown) -->\n### ok\n")  # another kind
    code, _, err = run_cli(capsys, "run", str(m), "-q", "--junit", str(lib / "md.md"))
    assert code == 2 and checked == [] and "not an earlier report of this kind" in err
    code, _, err = run_cli(capsys, "run", str(m), "-q", "--json", str(lib))
    assert code == 2 and checked == [] and "is a folder" in err


def test_an_earlier_report_is_still_replaced(lib, capsys):
    m = manifest(lib, entry("larkspur_add4", "rtl/larkspur_add4.json"))
    j = lib / "j.xml"
    for _ in range(2):
        code, _, err = run_cli(capsys, "run", str(m), "-q", "--junit", str(j), "--json",
                               str(lib / "s.json"), "--markdown", str(lib / "s.md"))
        assert code == 0, err
    assert ET.parse(j).getroot().get("tests") == "1"


def test_an_error_shared_by_identical_entries_is_never_marked_cached(lib):
    text = "".join(f'[[design]]\nname = "{n}"\nsources = ["rtl/larkspur_add4.json"]\n'
                   f'spec = "{{cout, sum}} = a + q"\n\n' for n in ("first", "second"))
    summary = gate.run(manifest(lib, text))
    assert [r.status for r in summary.records] == ["error", "error"]
    assert [r.cached for r in summary.records] == [False, False]
    assert summary.exit_code == 2
