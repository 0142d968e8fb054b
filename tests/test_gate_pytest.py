"""The pytest plugin: a hardware repo's own pytest run collects verify.toml entries as test items."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

from tests.helpers import rewire, ripple
from verify.formats.json_netlist import dumps

ADD = "{cout, sum} = a + b + cin"


def pytest_in(repo: Path, *args: str) -> subprocess.CompletedProcess:
    # autoload off, plugin by name: the test does not depend on the entry point being installed
    env = dict(os.environ, PYTEST_DISABLE_PLUGIN_AUTOLOAD="1")
    return subprocess.run([sys.executable, "-m", "pytest", "-p", "verify.pytest_plugin",
                           "-p", "no:cacheprovider", "-rA", *args], cwd=repo, env=env,
                          capture_output=True, text=True, timeout=120)


def make_repo(root: Path, bad_on_purpose: bool = False) -> Path:
    (root / "rtl").mkdir(parents=True, exist_ok=True)
    (root / "rtl" / "larkspur_add4.json").write_text(dumps(ripple(4, name="larkspur_add4")))
    (root / "rtl" / "larkspur_bad5.json").write_text(dumps(rewire(ripple(5), "sum[2]", op="or")))
    (root / "rtl" / "larkspur_acc.v").write_text(
        "module larkspur_acc #(parameter W = 8) (input [W-1:0] a, b, input cin,\n"
        "  output [W-1:0] sum, output cout);\n  assign {cout, sum} = a + b + cin;\nendmodule\n")
    (root / "verify.toml").write_text(f"""
[[design]]
name = "larkspur_add4"
sources = ["rtl/larkspur_add4.json"]
spec = "{ADD}"

[[design]]
name = "larkspur_acc"
sources = ["rtl/larkspur_acc.v"]
params = {{ W = [4, 32] }}
spec = "{ADD}"

[[design]]
name = "larkspur_bad5"
sources = ["rtl/larkspur_bad5.json"]
spec = "{ADD}"
deliberately_broken = {str(bad_on_purpose).lower()}
""")
    (root / "test_own.py").write_text("def test_the_repo_s_own_test():\n    assert 1 + 1 == 2\n")
    return root


def test_entries_are_collected_beside_the_repo_s_own_tests(tmp_path):
    repo = make_repo(tmp_path / "r")
    p = pytest_in(repo, "--collect-only", "-q")
    assert p.returncode == 0, p.stdout + p.stderr
    items = [line for line in p.stdout.splitlines() if "::" in line]
    assert items == ["test_own.py::test_the_repo_s_own_test", "verify.toml::larkspur_add4",
                     "verify.toml::larkspur_acc W=4", "verify.toml::larkspur_acc W=32",
                     "verify.toml::larkspur_bad5"]


def test_a_broken_adder_fails_its_item_with_the_counterexample(tmp_path):
    repo = make_repo(tmp_path / "r")
    p = pytest_in(repo)
    assert p.returncode == 1, p.stdout + p.stderr
    assert "4 passed" in p.stdout and "1 failed" in p.stdout
    assert "FAILED verify.toml::larkspur_bad5" in p.stdout
    assert "counterexample a=" in p.stdout and "sum expected" in p.stdout
    assert "Traceback" not in p.stdout


def test_expect_fail_passes_and_the_cache_is_shared_with_verify_run(tmp_path):
    repo = make_repo(tmp_path / "r", bad_on_purpose=True)
    p = pytest_in(repo)
    assert p.returncode == 0 and "5 passed" in p.stdout, p.stdout + p.stderr
    assert len(list((repo / ".verify-cache").glob("*.json"))) == 4
    p = pytest_in(repo, "--verify-no-cache", "verify.toml")
    assert p.returncode == 0 and "4 passed" in p.stdout


def test_a_bad_manifest_is_a_collection_error_that_says_where(tmp_path):
    repo = make_repo(tmp_path / "r")
    text = (repo / "verify.toml").read_text().replace('deliberately_broken = false', 'method_ = "auto"')
    (repo / "verify.toml").write_text(text)
    p = pytest_in(repo)
    assert p.returncode == 2, p.stdout + p.stderr
    assert "design 'larkspur_bad5': key 'method_': unknown key (did you mean 'method'?)" in p.stdout
    assert "verify.toml:17: design" in p.stdout  # the line of the misspelt key
