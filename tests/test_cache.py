"""The result cache of 'adder-verify run': keys, dependencies, hits, misses and what is never stored."""

from __future__ import annotations

import hashlib
import json

import pytest

from tests.helpers import rewire, ripple
from verify import __version__
from verify.manifest import runner as gate
from verify.manifest.cache import CACHEABLE, Cache, dependencies, file_hashes, make_key
from verify.formats.json_netlist import dumps

ADD = "{cout, sum} = a + b + cin"


def test_key_changes_with_everything_the_verdict_rests_on():
    base = dict(files={"rtl/a.sv": "0" * 64}, params={"W": 8}, spec=ADD,
                options={"engine": "auto", "timeout": 60.0})
    k0 = make_key(**base)
    assert k0 == make_key(**base)  # stable
    assert len(k0) == 64 and int(k0, 16) >= 0
    variants = [
        dict(base, files={"rtl/a.sv": "1" + "0" * 63}),
        dict(base, files={"rtl/a.sv": "0" * 64, "rtl/inc.vh": "0" * 64}),
        dict(base, params={"W": 16}),
        dict(base, spec="sum = a + b"),
        dict(base, options={"engine": "smt", "timeout": 60.0}),
        dict(base, options={"engine": "auto", "timeout": 61.0}),
    ]
    keys = {make_key(**v) for v in variants} | {make_key(**base, version=__version__ + "+1")}
    assert len(keys) == len(variants) + 1 and k0 not in keys


def test_file_hashes_are_sha256_of_the_content(tmp_path):
    f = tmp_path / "x.v"
    f.write_bytes(b"module x; endmodule\n")
    # hashlib is the reference here: the cache must use the plain sha256 of the bytes
    assert file_hashes([f], tmp_path) == {"x.v": hashlib.sha256(b"module x; endmodule\n").hexdigest()}


def test_dependencies_follow_includes_and_take_include_folders(tmp_path):
    (tmp_path / "rtl").mkdir()
    (tmp_path / "inc").mkdir()
    (tmp_path / "inc" / "sub").mkdir()
    top = tmp_path / "rtl" / "top.sv"
    top.write_text('`include "local.vh"\n`include "widths.vh"\nmodule top; endmodule\n')
    (tmp_path / "rtl" / "local.vh").write_text('`include "deep.vh"\n')
    (tmp_path / "rtl" / "deep.vh").write_text("// deep\n")
    (tmp_path / "inc" / "widths.vh").write_text("`define W 8\n")
    (tmp_path / "inc" / "sub" / "other.svh").write_text("// not included by name\n")
    (tmp_path / "rtl" / "unrelated.vh").write_text("// never included\n")
    deps = {p.relative_to(tmp_path.resolve()).as_posix() for p in dependencies([top], [tmp_path / "inc"])}
    assert deps == {"rtl/top.sv", "rtl/local.vh", "rtl/deep.vh", "inc/widths.vh", "inc/sub/other.svh"}
    # an include loop ends
    (tmp_path / "rtl" / "deep.vh").write_text('`include "local.vh"\n')
    assert len(dependencies([top], [])) == 3


def test_only_definite_verdicts_are_stored(tmp_path):
    cache = Cache(tmp_path / "c")
    files = {}
    for verdict in ("proven", "exhaustive", "fail", "tested", "undecided", "error"):
        key = hashlib.sha256(verdict.encode()).hexdigest()
        stored = cache.put(key, files, {"verdict": verdict})
        assert stored == (verdict in CACHEABLE)
        assert (cache.get(key, tmp_path) is not None) == (verdict in CACHEABLE)
    assert set(CACHEABLE) == {"proven", "exhaustive", "fail"}


def test_a_record_whose_files_changed_or_that_is_damaged_is_a_miss(tmp_path):
    f = tmp_path / "d.json"
    f.write_text("one")
    files = file_hashes([f], tmp_path)
    cache = Cache(tmp_path / "c")
    key = make_key(files, {}, ADD, {})
    cache.put(key, files, {"verdict": "proven"})
    assert cache.get(key, tmp_path)["result"] == {"verdict": "proven"}
    f.write_text("two")  # same key asked for, but the file under it changed
    assert cache.get(key, tmp_path) is None
    f.write_text("one")
    assert cache.get(key, tmp_path) is not None
    (tmp_path / "c" / f"{key}.json").write_text("{broken")
    assert cache.get(key, tmp_path) is None
    record = {"format": 1, "key": key, "tool_version": "0.0.0-other", "files": files,
              "result": {"verdict": "proven"}}
    (tmp_path / "c" / f"{key}.json").write_text(json.dumps(record))
    assert cache.get(key, tmp_path) is None  # another tool version's record
    with pytest.raises(ValueError):
        cache.get("../../etc/passwd")
    assert (tmp_path / "c" / ".gitignore").read_text().strip().endswith("*")


def write_manifest(root, entries: str):
    (root / "verify.toml").write_text(entries, encoding="utf-8")
    return root / "verify.toml"


@pytest.fixture
def repo(tmp_path):
    (tmp_path / "rtl").mkdir()
    (tmp_path / "rtl" / "add4.json").write_text(dumps(ripple(4, name="larkspur_add4")))
    (tmp_path / "rtl" / "add6.json").write_text(dumps(ripple(6, name="larkspur_add6")))
    write_manifest(tmp_path, f"""
[[design]]
name = "larkspur_add4"
sources = ["rtl/add4.json"]
spec = "{ADD}"

[[design]]
name = "larkspur_add6"
sources = ["rtl/add6.json"]
spec = "{ADD}"
""")
    return tmp_path


def test_second_run_comes_from_the_cache_and_no_cache_checks_again(repo):
    first = gate.run(repo / "verify.toml")
    assert [r.cached for r in first.records] == [False, False]
    assert [r.verdict for r in first.records] == ["exhaustive", "exhaustive"]
    second = gate.run(repo / "verify.toml")
    assert [r.cached for r in second.records] == [True, True]
    assert [r.verdict for r in second.records] == ["exhaustive", "exhaustive"]
    assert [r.key for r in second.records] == [r.key for r in first.records]
    third = gate.run(repo / "verify.toml", use_cache=False)
    assert [r.cached for r in third.records] == [False, False]


def test_changing_one_file_misses_only_its_entry(repo):
    gate.run(repo / "verify.toml")
    (repo / "rtl" / "add6.json").write_text(dumps(rewire(ripple(6), "sum[2]", op="or")))
    again = gate.run(repo / "verify.toml")
    assert [r.cached for r in again.records] == [True, False]
    assert [r.verdict for r in again.records] == ["exhaustive", "fail"]
    # the failure is definite, so it is cached too
    assert gate.run(repo / "verify.toml").records[1].cached is True


def test_changing_an_option_or_the_spec_misses(repo):
    gate.run(repo / "verify.toml")
    text = (repo / "verify.toml").read_text()
    write_manifest(repo, text.replace(f'spec = "{ADD}"\n', f'spec = "{ADD}"\ntime_limit = 30\n', 1))
    again = gate.run(repo / "verify.toml")
    assert [r.cached for r in again.records] == [False, True]
    write_manifest(repo, text.replace(ADD, "{cout, sum} = cin + a + b"))
    assert [r.cached for r in gate.run(repo / "verify.toml").records] == [False, False]


def test_expect_is_read_fresh_from_the_manifest_on_a_hit(repo):
    gate.run(repo / "verify.toml")
    text = (repo / "verify.toml").read_text()
    write_manifest(repo, text.replace(f'spec = "{ADD}"\n', f'spec = "{ADD}"\ndeliberately_broken = true\n', 1))
    again = gate.run(repo / "verify.toml")
    assert again.records[0].cached is True
    assert again.records[0].status == "unexpected pass" and again.exit_code == 1


def test_a_changed_include_file_changes_the_key(tmp_path):
    (tmp_path / "rtl").mkdir()
    (tmp_path / "inc").mkdir()
    (tmp_path / "inc" / "larkspur_cfg.vh").write_text("`define LARKSPUR_EXTRA 0\n")
    (tmp_path / "rtl" / "larkspur_acc.sv").write_text(
        '`include "larkspur_cfg.vh"\n'
        "module larkspur_acc #(parameter W = 4) (input [W-1:0] a, b, input cin,\n"
        "  output [W-1:0] sum, output cout);\n"
        "  assign {cout, sum} = a + b + cin + `LARKSPUR_EXTRA;\n"
        "endmodule\n")
    write_manifest(tmp_path, f"""
[[design]]
name = "larkspur_acc"
sources = ["rtl/larkspur_acc.sv"]
include_dirs = ["inc"]
params = {{ W = [3, 5] }}
spec = "{ADD}"
""")
    first = gate.run(tmp_path / "verify.toml")
    assert [r.verdict for r in first.records] == ["exhaustive", "exhaustive"]
    assert "inc/larkspur_cfg.vh" in first.records[0].file_hashes
    assert [r.cached for r in gate.run(tmp_path / "verify.toml").records] == [True, True]
    (tmp_path / "inc" / "larkspur_cfg.vh").write_text("`define LARKSPUR_EXTRA 1\n")
    again = gate.run(tmp_path / "verify.toml")
    assert [r.cached for r in again.records] == [False, False]
    # 1 + a + b + cin is not the spec: Python integers, 1 + 0 + 0 + 0 = 1 != 0
    assert [r.verdict for r in again.records] == ["fail", "fail"]
    assert {r.key for r in again.records}.isdisjoint({r.key for r in first.records})


def test_a_changed_submodule_file_changes_the_key(tmp_path):
    (tmp_path / "top.v").write_text("module top(input a, output sum); half h(a, sum); endmodule\n")
    (tmp_path / "half.v").write_text("module half(input a, output y); assign y = a; endmodule\n")
    e = gate.Entry(name="top", sources=("top.v", "half.v"), spec="sum = a")
    k1, files = gate.entry_key(e, {}, tmp_path)
    assert set(files) == {"top.v", "half.v"}
    (tmp_path / "half.v").write_text("module half(input a, output y); assign y = ~a; endmodule\n")
    k2, _ = gate.entry_key(e, {}, tmp_path)
    assert k1 != k2 and gate.entry_key(e, {"W": 1}, tmp_path)[0] not in (k1, k2)


def test_a_record_from_another_build_of_the_tool_never_matches(tmp_path, monkeypatch):
    # A record stored by a different build (older release, patched checkout) must be ignored,
    # even when the version string is the same: the build id hashes the package's sources.
    from verify.manifest import cache as cachemod
    build = cachemod.tool_build()
    assert "+" in build and "z3-solver=" in build and "pyslang=" in build
    files = {"x.json": "0" * 64}
    key_now = cachemod.make_key(files, {}, "s", {})
    monkeypatch.setattr(cachemod, "tool_build", lambda: "0.1.0+someotherbuild (z3-solver=1)")
    assert cachemod.make_key(files, {}, "s", {}) != key_now


def test_an_unwritable_cache_is_a_warning_not_silence(tmp_path):
    from tests.helpers import ripple
    from verify.manifest import runner as gate
    from verify.formats import json_netlist
    (tmp_path / "r.json").write_text(json_netlist.dumps(ripple(4)))
    (tmp_path / "verify.toml").write_text(
        '[[design]]\nname = "r"\nsources = ["r.json"]\nspec = "{cout, sum} = a + b + cin"\n')
    blocker = tmp_path / "not_a_folder"
    blocker.write_text("a file where the cache folder would go")
    summary = gate.run(tmp_path / "verify.toml", cache_dir=blocker / "cache")
    assert summary.exit_code == 0  # the verdict still stands
    assert any("could not be written" in w for w in summary.warnings)
