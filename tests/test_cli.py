"""`adder-verify check` end to end: output, --json, exit codes, the run log, and bad input."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

from tests.helpers import rewire, ripple
from verify.manifest import runlog as logbook
from verify.cli.main import main
from verify.formats import json_netlist


@pytest.fixture()
def files(tmp_path):
    good = tmp_path / "good8.json"
    good.write_text(json_netlist.dumps(ripple(8)))
    bad = tmp_path / "bad8.json"
    bad.write_text(json_netlist.dumps(rewire(ripple(8), "sum[5]", op="or")))
    return tmp_path, good, bad


def run(argv, capsys):
    with pytest.raises(SystemExit) as e:
        main(argv)
    out = capsys.readouterr()
    return e.value.code, out.out, out.err


def test_a_correct_design_passes_with_exit_0(files, capsys):
    tmp, good, _ = files
    code, out, err = run(["check", str(good), "--log-dir", str(tmp / "logs")], capsys)
    assert code == 0
    assert "EXHAUSTIVE: all 2^17 = 131,072 input combinations" in out
    assert "inferred from port names" in out
    assert "not X-propagation, wire delays" in out and "gate-delay model" in out


def test_a_wrong_design_fails_with_exit_1_and_shows_the_counterexample(files, capsys):
    tmp, _, bad = files
    code, out, _ = run(["check", str(bad), "--log-dir", str(tmp / "logs")], capsys)
    assert code == 1
    assert "FAIL" in out and "counterexample:" in out and "wrong bits: 5" in out
    assert "0x" in out  # hex beside decimal


def test_json_output_and_the_run_log(files, capsys):
    tmp, _, bad = files
    code, out, _ = run(["check", str(bad), "--json", "--log-dir", str(tmp / "logs")], capsys)
    data = json.loads(out)
    assert code == 1 and data["ok"] is False and data["verdict"] == "fail"
    assert all({"engine", "status", "seconds"} <= set(e) for e in data["engines"])
    cex = data["counterexample"]
    total = cex["inputs"]["a"] + cex["inputs"]["b"] + cex["inputs"]["cin"]  # Python integers
    assert cex["expected"] == {"sum": total % 256, "cout": total >> 8}
    assert cex["actual"] != cex["expected"]
    log = logbook.read(tmp / "logs")
    assert len(log) == 1 and log[0]["verdict"] == "fail"
    assert log[0]["design_hash"] == data["design"]["hash"]
    assert log[0]["counterexample"]["inputs"] == cex["inputs"]


def test_require_complete_turns_a_sample_into_exit_3(files, capsys):
    tmp, good, _ = files
    args = ["check", str(good), "--engine", "random", "--vectors", "1000", "--no-log"]
    assert run(args, capsys)[0] == 0
    code, out, _ = run(args + ["--require", "complete"], capsys)
    assert code == 3 and "TESTED" in out


def test_a_folder_checks_every_design_and_summarises(files, capsys):
    tmp, _, _ = files
    code, out, _ = run(["check", str(tmp), "--no-log"], capsys)
    assert code == 1
    assert "summary:" in out and "1 fail" in out and "1 exhaustive" in out


@pytest.mark.parametrize("argv_tail, message", [
    (["--spec", "{cout, sum} = a + + "], "spec"),
    (["--spec", "{cout, sum} = a + d"], "'d'"),
    (["--engine", "magic"], "magic"),
    (["--shard", "3/2", "--engine", "exhaustive"], "shard"),
    (["--vectors", "0", "--engine", "random"], "--vectors"),
    (["--param", "W"], "--param"),
    (["--param", "W=8", "--param", "W=16"], "given twice"),
    (["--seed", "-1"], "--seed"),
    (["--timeout", "inf"], "--timeout"),
    (["--timeout", "nan"], "--timeout"),
    (["--engine", "exhaustive", "--shard", "1/1000000"], "only 2^17"),
])
def test_bad_usage_is_one_line_and_exit_2(files, capsys, argv_tail, message):
    _, good, _ = files
    code, out, err = run(["check", str(good), "--no-log", *argv_tail], capsys)
    assert code == 2
    assert message in err
    assert err.startswith("error: ") and err.count("\n") == 1
    assert "Traceback" not in err + out


def test_bad_files_are_one_line_and_exit_2(tmp_path, capsys):
    broken = tmp_path / "broken.json"
    broken.write_text('{"format": "verify-netlist/1", "inputs": {"a": 1}, "outputs": {"y": 1}, '
                      '"gates": [{"out": "y", "op": "and", "in": ["a", "q"]}]}')
    code, _, err = run(["check", str(broken), "--no-log"], capsys)
    assert code == 2 and "signal 'q' is not driven" in err and err.count("\n") == 1
    code, _, err = run(["check", str(tmp_path / "missing.json"), "--no-log"], capsys)
    assert code == 2 and "no such file" in err
    (tmp_path / "x.txt").write_text("hello")
    code, _, err = run(["check", str(tmp_path / "x.txt"), "--no-log"], capsys)
    assert code == 2 and "unknown design format" in err


def test_bad_input_in_json_mode_still_prints_json(tmp_path, capsys):
    code, out, err = run(["check", str(tmp_path / "missing.json"), "--json", "--no-log"], capsys)
    assert code == 2 and json.loads(out)["verdict"] == "error"


def test_the_installed_command_and_python_dash_m(files):
    tmp, good, _ = files
    for cmd in ([sys.executable, "-m", "verify"],):
        p = subprocess.run([*cmd, "check", str(good), "--no-log", "--json"], capture_output=True,
                           text=True, timeout=120)
        assert p.returncode == 0, p.stderr
        assert json.loads(p.stdout)["verdict"] == "exhaustive"
        p = subprocess.run([*cmd, "check", str(good), "--spec", "sum = a +"], capture_output=True,
                           text=True, timeout=120)
        assert p.returncode == 2 and "Traceback" not in p.stderr and p.stderr.count("\n") == 1


def test_export_round_trips_through_verilog_and_json(files, capsys):
    tmp, _, bad = files
    import itertools

    from verify.formats import load
    from verify.sim import Simulator
    v = tmp / "out.v"
    j = tmp / "out.json"
    assert run(["export", str(bad), "--format", "verilog", "-o", str(v)], capsys)[0] == 0
    assert run(["export", str(v), "--format", "json", "-o", str(j)], capsys)[0] == 0
    assert run(["export", str(v), "--format", "json", "-o", str(j)], capsys)[0] == 2  # no --force
    first, back = Simulator(load(bad)), Simulator(load(j))
    vectors = [{"a": a, "b": b, "cin": c} for a, b, c in itertools.product(range(256), range(0, 256, 7), (0, 1))]
    assert first.evaluate_many(vectors) == back.evaluate_many(vectors)


def test_no_arguments_prints_the_help(capsys):
    code, out, err = run([], capsys)
    assert code == 0 and "Commands:" in out and "check" in out and not err


def test_several_json_netlists_are_several_designs(files, capsys):
    tmp, good, bad = files
    code, out, _ = run(["check", str(good), str(bad), "--no-log", "--no-diagnose"], capsys)
    assert code == 1 and "1 exhaustive" in out and "1 fail" in out


def test_the_api_refuses_bad_options_as_input_errors():
    import verify
    from verify.errors import InputError
    d = ripple(4)
    for kwargs in ({"seed": -1}, {"timeout": float("inf")}, {"timeout": float("nan")},
                   {"vectors": 0}, {"exhaustive_limit": 99}, {"spec": 123}):
        spec = kwargs.pop("spec", None)
        with pytest.raises(InputError):
            verify.check(d, spec, **kwargs)


def test_a_folder_checks_designs_only_and_not_subfolders_unless_recursive(tmp_path, capsys,
                                                                          monkeypatch):
    """A folder that also holds shard results and notes: only netlists and Verilog are checked."""
    d = tmp_path / "rtl"
    (d / "sub").mkdir(parents=True)
    (d / "good8.json").write_text(json_netlist.dumps(ripple(8)))
    (d / "shard.1of4.json").write_text('{"ok": true, "verdict": "tested"}\n')
    (d / "notes.txt").write_text("not a design\n")
    (d / "sub" / "add4.v").write_text(
        "module add4(input [3:0] a, b, input cin, output [3:0] sum, output cout);\n"
        "  assign {cout, sum} = a + b + cin;\nendmodule\n")
    monkeypatch.chdir(tmp_path)
    code, out, err = run(["check", str(d), "--no-log"], capsys)
    assert code == 0, out + err
    assert "good8" in out and "add4" not in out
    assert "skipped 2 files that are not designs" in err and "shard.1of4.json" in err
    code, out, err = run(["check", str(d), "--no-log", "--recursive"], capsys)
    assert code == 0, out + err
    assert "add4" in out and "summary:" in out


def test_no_log_folder_is_created_outside_a_project(files, capsys, monkeypatch):
    tmp, good, _ = files
    work = tmp / "elsewhere"
    work.mkdir()
    monkeypatch.chdir(work)
    from verify.batch import project_log_dir
    if project_log_dir(work) is not None:  # pragma: no cover - a verify.toml above /tmp
        pytest.skip("a project folder lies above the test's temporary folder")
    code, _, err = run(["check", str(good)], capsys)
    assert code == 0
    assert not (work / "logs").exists()
    assert "no run log kept" in err
    (work / "verify.toml").write_text("")  # now it is a project: logs/ beside the manifest
    code, _, err = run(["check", str(good)], capsys)
    assert code == 0 and (work / "logs" / "runs.jsonl").is_file()


def test_an_empty_path_names_nothing(capsys):
    code, _, err = run(["check", "", "--no-log"], capsys)
    assert code == 2 and err.startswith("error: ") and "empty path" in err


def test_a_log_dir_that_is_a_file_is_refused_before_any_check(files, capsys):
    tmp, _, bad = files
    blocker = tmp / "logfile"
    blocker.write_text("mine\n")
    code, out, err = run(["check", str(bad), "--log-dir", str(blocker)], capsys)
    assert code == 2 and "--log-dir" in err and "names a file" in err
    assert blocker.read_text() == "mine\n"


@pytest.mark.parametrize("command", ["check", "export", "explain", "generate", "shape", "run",
                                     "merge", "timing"])
def test_every_command_help_lists_its_exit_codes(command, capsys):
    code, out, _ = run([command, "--help"], capsys)
    assert code == 0
    text = " ".join(out.split())
    import re
    assert re.search(r"Exit (codes: )?0\b", text), text  # where the codes start
    assert re.search(r"[;,] 2\b", text) and re.search(r"[;,] (1|3|4)\b", text), text
