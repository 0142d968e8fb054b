"""Hostile input: mutated JSON netlists, Verilog files, spec strings and manifests, run through
the command line in a subprocess under a 2 GB address-space limit.

Each case must end without a crash (no negative return code, no traceback), with an exit code in
{0, 1, 2, 3, 4} within 10 s; an input the tool refuses gets exit 2 and one line "error: ...".
Mutations (hypothesis draws them, derandomized so a default run is the same every time):
truncation, byte flips, deleted lines, deep nesting, huge widths, shifts and replications, and
unknown names. A few dozen subprocess cases and a few hundred in-process reader cases run by
default; thousands under ``-m slow``.

Failures in the Verilog reader or the spec language (other owners) are saved in
tests/fuzz_findings/ and replayed by ``test_saved_findings`` as expected failures.
"""

from __future__ import annotations

import json
import os
import re
import resource
import subprocess
import sys
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from verify.errors import InputError

ROOT = Path(__file__).resolve().parent.parent
FINDINGS = Path(__file__).resolve().parent / "fuzz_findings"
LIMIT_BYTES = 2 << 30  # 2 GB of address space
SECONDS = 10
CODES = {0, 1, 2, 3, 4}  # 4: internal error, if the entry point adds it

JSON_SEED = (ROOT / "designs" / "larkspur_add8_ripple.json").read_text()
VERILOG_SEED = (ROOT / "designs" / "larkspur_add8_behavioral.v").read_text()
SPEC_SEED = "{cout, sum} = a + b + cin"
MANIFEST_SEED = """\
[[design]]
name = "add"
sources = ["add.json"]
spec = "{cout, sum} = a + b + cin"
method = "random"
vectors = 500
"""


def _limit() -> None:  # runs in the child before exec
    resource.setrlimit(resource.RLIMIT_AS, (LIMIT_BYTES, LIMIT_BYTES))


def run_cli(args: list[str], cwd: Path) -> tuple[int, str, str]:
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    try:
        done = subprocess.run([sys.executable, "-m", "verify", *args], cwd=cwd, env=env,
                              capture_output=True, text=True, timeout=SECONDS,
                              preexec_fn=_limit, errors="replace")
    except subprocess.TimeoutExpired:
        return -999, "", f"no answer within {SECONDS} s"
    return done.returncode, done.stdout, done.stderr


def judge(code: int, out: str, err: str) -> str | None:
    """What is wrong with how the tool answered (None: nothing)."""
    if code == -999:
        return err
    if code < 0:
        return f"crashed with signal {-code}"
    if "Traceback" in err or "Traceback" in out:
        return "traceback: " + err[-400:]
    if code not in CODES:
        return f"exit code {code}"
    if code == 2:
        # notes ('note: ...', what a reader accepted but the user should know) may precede it
        lines = [x for x in err.splitlines() if x.strip() and not x.startswith("note: ")]
        if len(lines) != 1 or not lines[0].startswith("error: "):
            return f"exit 2 without one 'error:' line: {err[-400:]!r}"
    return None


# ---- mutations ---------------------------------------------------------------------------------

@st.composite
def mutated(draw, text: str, kind: str) -> str:
    how = draw(st.sampled_from(["truncate", "flip", "delete-line", "nest", "huge-width", "shift",
                                "replicate", "unknown-name", "duplicate-line"]))
    n = len(text)
    if how == "truncate":
        return text[:draw(st.integers(0, n))]
    if how == "flip":
        data = bytearray(text.encode())
        for _ in range(draw(st.integers(1, 4))):
            i = draw(st.integers(0, len(data) - 1))
            data[i] ^= 1 << draw(st.integers(0, 7))
        return data.decode("utf-8", "replace")
    if how in ("delete-line", "duplicate-line"):
        lines = text.splitlines(keepends=True)
        i = draw(st.integers(0, len(lines) - 1))
        return "".join(lines[:i] + ([lines[i]] * 50 if how == "duplicate-line" else [])
                       + lines[i + 1:])
    if how == "nest":
        # a spec travels on the command line, where one argument holds at most 128 kB
        depth = draw(st.sampled_from([100, 5000, 30_000 if kind == "spec" else 200_000]))
        if kind == "json":
            return "[" * depth + "]" * depth
        if kind == "verilog":
            return text.replace("a + b", "(" * depth + "a" + ")" * depth + " + b")
        if kind == "spec":
            return text.replace("a + b", "(" * depth + "a" + ")" * depth + " + b")
        return text.replace('method = "random"', "x = " + "[" * depth + "]" * depth)
    if how == "huge-width":
        big = draw(st.sampled_from(["65537", "1000000000", "99999999999999999999", "-1", "0"]))
        if kind == "json":
            return re.sub(r'"a": \d+', f'"a": {big}', text, count=1)
        if kind == "verilog":
            return text.replace("[7:0] a", f"[{big}:0] a")
        if kind == "spec":
            return f"sum = a[{big}:0] + b"
        return text.replace("vectors = 500", f"vectors = {big}")
    if how == "shift":
        amount = draw(st.sampled_from(["64", "100000000", "99999999999999999999"]))
        if kind in ("verilog", "spec"):
            return text.replace("a + b", f"(a << {amount}) + b")
        if kind == "json":
            return text.replace('"a[0]"', f'"a[{amount}]"', 1)
        return text.replace("vectors = 500", f"seed = {amount}")
    if how == "replicate":
        count = draw(st.sampled_from(["3", "100000", "1000000000"]))
        if kind in ("verilog", "spec"):
            return text.replace("a + b", "{" + count + "{a}} + b")
        if kind == "json":
            return text.replace('"gates": [', '"gates": [' + '{"out": "q", "op": "and", '
                                '"in": ["a[0]"]},' * min(int(count), 3000), 1)
        return text + ('[[design]]\nname = "x"\nsources = ["add.json"]\nspec = "sum = a"\n'
                       * min(int(count), 2000))
    # unknown names
    name = draw(st.sampled_from(["zz", "a[99]", "sum[8]", "$x", "q, r", "1'bx"]))
    if kind == "json":
        return text.replace('"b[1]"', json.dumps(name), 1)
    if kind in ("verilog", "spec"):
        return text.replace("cin", name, 1) if kind == "spec" else text.replace("+ cin", f"+ {name}")
    return text.replace('"random"', json.dumps(name))


def _case(tmp: Path, kind: str, text: str) -> list[str]:
    """Write the case and return the command line that reads it."""
    if kind == "json":
        (tmp / "d.json").write_text(text, errors="replace")
        return ["check", "d.json", "--spec", SPEC_SEED, "--engine", "random", "--vectors", "300",
                "--no-log", "--no-diagnose"]
    if kind == "verilog":
        (tmp / "d.v").write_text(text, errors="replace")
        return ["check", "d.v", "--engine", "random", "--vectors", "300", "--no-log",
                "--no-diagnose"]
    if kind == "spec":
        (tmp / "d.json").write_text(JSON_SEED)
        return ["check", "d.json", "--spec", text.replace("\x00", ""), "--engine", "random",
                "--vectors", "300", "--no-log", "--no-diagnose"]
    (tmp / "add.json").write_text(JSON_SEED)
    (tmp / "verify.toml").write_text(text, errors="replace")
    return ["run", "verify.toml", "--no-cache", "-q"]


SEEDS = {"json": JSON_SEED, "verilog": VERILOG_SEED, "spec": SPEC_SEED, "manifest": MANIFEST_SEED}
#: kinds whose failures belong to other owners (reported in tests/fuzz_findings, not fixed here)
OTHERS = {"verilog": "Verilog reader", "spec": "spec language"}


def _check_cli(tmp_path_factory, kind: str, text: str) -> None:
    tmp = tmp_path_factory.mktemp(kind)
    code, out, err = run_cli(_case(tmp, kind, text), tmp)
    problem = judge(code, out, err)
    if problem and kind in OTHERS:
        FINDINGS.mkdir(exist_ok=True)
        name = f"{kind}_{abs(hash(text)) % 10 ** 10}.{ 'v' if kind == 'verilog' else 'txt'}"
        (FINDINGS / name).write_text(text, errors="replace")
        pytest.xfail(f"{OTHERS[kind]}: {problem[:200]} (saved as tests/fuzz_findings/{name})")
    assert problem is None, (kind, text[:300], problem)


def _cli_test(kind: str, examples: int):
    @settings(max_examples=examples, deadline=None, derandomize=True,
              suppress_health_check=list(HealthCheck))
    @given(text=mutated(SEEDS[kind], kind))
    def test(tmp_path_factory, text):
        _check_cli(tmp_path_factory, kind, text)
    return test


test_cli_json = _cli_test("json", 10)
test_cli_manifest = _cli_test("manifest", 6)
test_cli_spec = _cli_test("spec", 8)
test_cli_verilog = _cli_test("verilog", 8)
test_cli_json_many = pytest.mark.slow(_cli_test("json", 800))
test_cli_manifest_many = pytest.mark.slow(_cli_test("manifest", 600))
test_cli_spec_many = pytest.mark.slow(_cli_test("spec", 600))
test_cli_verilog_many = pytest.mark.slow(_cli_test("verilog", 600))


# ---- in process: the readers answer every mutation with InputError or a netlist ---------------

@settings(max_examples=300, deadline=None, derandomize=True,
          suppress_health_check=list(HealthCheck))
@given(text=mutated(JSON_SEED, "json"))
def test_json_reader_refuses_with_input_error_only(text):
    from verify.formats import json_netlist
    try:
        json_netlist.parse(text, "d.json")
    except InputError as e:
        assert "\n" not in str(e) and str(e).startswith("d.json")  # one located line


@settings(max_examples=150, deadline=None, derandomize=True,
          suppress_health_check=list(HealthCheck))
@given(text=mutated(MANIFEST_SEED, "manifest"))
def test_manifest_reader_refuses_with_input_error_only(tmp_path_factory, text):
    from verify.manifest.runner import load_manifest
    tmp = tmp_path_factory.mktemp("m")
    (tmp / "add.json").write_text(JSON_SEED)
    (tmp / "verify.toml").write_text(text, errors="replace")
    try:
        load_manifest(tmp / "verify.toml")
    except InputError as e:
        assert "\n" not in str(e)


# ---- the inputs named in the issue ----------------------------------------------------------------

def _netlist(**over) -> str:
    d = json.loads(JSON_SEED)
    d.update(over)
    return json.dumps(d)


@pytest.mark.parametrize("name,text,words", [
    ("deep", "[" * 200_000 + "]" * 200_000, "nested too deep"),
    ("wide gate", _netlist(gates=[{"out": "sum[0]", "op": "xor",
                                   "in": ["a[0]"] * 600_000}]), "inputs; a gate takes at most"),
    ("port name", _netlist(inputs={"q, r": 8, "b": 8, "cin": 1}), "not an identifier"),
])
def test_hostile_json_is_refused_in_one_line(tmp_path, name, text, words):
    (tmp_path / "d.json").write_text(text)
    code, out, err = run_cli(["check", "d.json", "--spec", SPEC_SEED, "--no-log"], tmp_path)
    assert judge(code, out, err) is None and code == 2, (code, err)
    assert words in err


def test_deeply_nested_toml_is_refused_in_one_line(tmp_path):
    (tmp_path / "verify.toml").write_text("x = " + "[" * 100_000 + "]" * 100_000 + "\n")
    code, out, err = run_cli(["run", "verify.toml"], tmp_path)
    assert judge(code, out, err) is None and code == 2, (code, err)
    assert "nested too deep" in err


def _findings():
    if not FINDINGS.is_dir():
        return []
    return sorted(p for p in FINDINGS.iterdir() if p.suffix in (".v", ".txt"))


@pytest.mark.parametrize("path", _findings() or [None], ids=lambda p: p.name if p else "none")
def test_saved_findings(tmp_path, path):
    """Inputs the fuzzer once found answered badly (a hang, a late refusal) are answered now:
    exit 2 and one located line within the time bound."""
    if path is None:
        pytest.skip("no saved findings")
    kind = "verilog" if path.suffix == ".v" else "spec"
    code, out, err = run_cli(_case(tmp_path, kind, path.read_text()), tmp_path)
    problem = judge(code, out, err)
    assert not problem, f"{path.name}: {problem}"
