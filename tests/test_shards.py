"""Exhaustive shards: every vector in exactly one shard, and 'adder-verify merge' verdicts."""

from __future__ import annotations

import json

import pytest
from hypothesis import given, settings, strategies as st

from tests.helpers import ripple
from verify.model.builder import GateBuilder
from verify.cli.main import main
from verify.engines import Options, exhaustive
from verify.engines.exhaustive import shard_range
from verify.errors import InputError
from verify.formats.json_netlist import dumps
from verify.model.netlist import Port
from verify.manifest.shards import merge
from verify.spec import parse

ADD = "{cout, sum} = a + b + cin"


def one_wrong_vector(width: int, v: int):
    """A ripple adder that is wrong on input vector number ``v`` only (sum[0] flipped there).

    Vector numbering is the exhaustive engine's: input bit k (a LSB first, then b, then cin) is
    bit k of the vector number.
    """
    b = GateBuilder(fold=False, share=False)
    ins = [Port("a", width), Port("b", width), Port("cin", 1)]
    bits = [x for p in ins for x in p.bits]
    s, c = b.add(Port("a", width).bits, Port("b", width).bits, "cin")
    lits = [x if v >> k & 1 else b.not_(x) for k, x in enumerate(bits)]
    hit = b.and_(*lits)
    s = [b.xor_(s[0], hit)] + s[1:]
    return b.netlist(f"wrong_at_{v}", ins, {"sum": s, "cout": [c]})


@pytest.mark.parametrize("total", [1, 2, 7, 64, 1000, 4096, 1 << 20])
@pytest.mark.parametrize("count", [1, 2, 3, 5, 8, 13, 64])
def test_shard_ranges_cover_every_vector_exactly_once(total, count):
    seen = bytearray(total) if total <= 4096 else None
    expect_lo = 0
    for k in range(1, count + 1):
        lo, hi = shard_range(total, (k, count))
        assert lo == expect_lo and lo <= hi  # contiguous, in order
        expect_lo = hi
        if seen is not None:
            for v in range(lo, hi):
                seen[v] += 1
        # balanced: sizes differ by at most one (floor division splits evenly)
        assert total // count <= hi - lo <= -(-total // count)
    assert expect_lo == total
    if seen is not None:
        assert set(seen) <= {1}


@pytest.mark.parametrize("width,v", [(3, 0), (3, 77), (3, 127), (10, 0), (10, 1 << 20),
                                     (10, (1 << 21) - 1), (10, 699_050)])
def test_only_the_shard_holding_a_wrong_vector_fails(width, v):
    """The engine really scans its range: the one bad vector is found by its shard and no other."""
    design = one_wrong_vector(width, v)
    spec = parse(ADD, design)
    total = 1 << design.input_width
    for count in (1, 3, 7):
        failing = []
        covered = 0
        for k in range(1, count + 1):
            out = exhaustive.run(design, spec, Options(shard=(k, count)))
            sh = out.details["shard"]
            assert (sh["index"], sh["count"]) == (k, count)
            assert sh["vectors"] == sh["last"] - sh["first"] + 1
            covered += sh["vectors"]
            if out.status == "fail":
                failing.append(k)
                cex = out.counterexample.inputs
                got = cex["a"] | cex["b"] << width | cex["cin"] << (2 * width)
                assert got == v and sh["first"] <= v <= sh["last"]
                # Python integers: the design's sum is the true sum with bit 0 flipped
                s = cex["a"] + cex["b"] + cex["cin"]
                assert out.counterexample.expected["sum"] == s % (1 << width)
                assert out.counterexample.actual["sum"] == (s % (1 << width)) ^ 1
            else:
                assert out.status == "pass", out.evidence
        assert covered == total
        assert len(failing) == 1


# ---- adder-verify merge ----------------------------------------------------------------------------

def run_cli(capsys, *argv):
    with pytest.raises(SystemExit) as exc:
        main(list(argv))
    out, err = capsys.readouterr()
    return exc.value.code, out, err


@pytest.fixture
def shard_files(tmp_path, capsys):
    """Write 'adder-verify check --shard K/N --json' outputs for a design; returns a maker."""

    def make(netlist, count, spec=ADD, name=None):
        path = tmp_path / f"{name or netlist.name}.json"
        path.write_text(dumps(netlist), encoding="utf-8")
        files = []
        for k in range(1, count + 1):
            code, out, err = run_cli(capsys, "check", str(path), "--spec", spec, "--engine",
                                     "exhaustive", "--shard", f"{k}/{count}", "--json", "--no-log")
            assert code in (0, 1), err
            f = tmp_path / f"{path.stem}.{k}of{count}.json"
            f.write_text(out, encoding="utf-8")
            files.append(str(f))
        return files

    return make


def test_merge_all_shards_passing_is_exhaustive(shard_files, capsys):
    files = shard_files(ripple(5), 4)
    merged = merge(files)
    assert merged["verdict"] == "exhaustive" and merged["exit_code"] == 0
    assert merged["vectors"] == {"total": 2 ** 11, "checked_passing": 2 ** 11}
    code, out, err = run_cli(capsys, "merge", *reversed(files))  # order does not matter
    assert code == 0 and "EXHAUSTIVE" in out


def test_merge_missing_shards_is_undecided(shard_files, capsys):
    files = shard_files(ripple(5), 5)
    code, out, _ = run_cli(capsys, "merge", "--json", files[0], files[2], files[4])
    data = json.loads(out)
    assert code == 3 and data["verdict"] == "undecided"
    assert data["shards"]["missing"] == [2, 4]


def test_merge_a_failing_shard_fails_even_with_shards_missing(shard_files, capsys):
    v = 1500  # in shard 3 of 4 over 2^11 vectors: 1536 > 1500 >= 1024
    files = shard_files(one_wrong_vector(5, v), 4)
    code, out, _ = run_cli(capsys, "merge", "--json", *files)
    data = json.loads(out)
    assert code == 1 and data["verdict"] == "fail" and data["shards"]["failed"] == [3]
    cex = data["counterexample"]["inputs"]
    assert cex["a"] | cex["b"] << 5 | cex["cin"] << 10 == v
    code, out, _ = run_cli(capsys, "merge", "--json", files[2])  # the failing one alone
    assert code == 1


@pytest.mark.parametrize("problem", ["duplicate", "other design", "other spec", "other count",
                                     "not a shard", "tampered range", "not json", "error report"])
def test_merge_refuses_what_does_not_belong_together(shard_files, tmp_path, capsys, problem):
    files = shard_files(ripple(4), 3)
    if problem == "duplicate":
        given = files + [files[1]]
        words = "given twice"
    elif problem == "other design":
        other = shard_files(one_wrong_vector(4, 3), 3)
        given = files[:2] + other[2:]
        words = "different designs"
    elif problem == "other spec":
        other = shard_files(ripple(4), 3, spec="{cout, sum} = b + a + cin", name="ripple4_b")
        given = files[:2] + other[2:]
        words = "different specs"
    elif problem == "other count":
        other = shard_files(ripple(4), 2, name="ripple4_c")
        given = files[:2] + other[1:]
        words = "shards, this one of 2"
    elif problem == "not a shard":
        code, out, _ = run_cli(capsys, "check", str(tmp_path / "ripple4.json"), "--spec", ADD,
                               "--engine", "exhaustive", "--json", "--no-log")
        whole = tmp_path / "whole.json"
        whole.write_text(out)
        given = files[:2] + [str(whole)]
        words = "not a shard result"
    elif problem == "tampered range":
        data = json.loads(open(files[2]).read())
        data["shard"]["first"] -= 10
        data["shard"]["vectors"] += 10
        bad = tmp_path / "tampered.json"
        bad.write_text(json.dumps(data))
        given = files[:2] + [str(bad)]
        words = "covers vectors"
    elif problem == "not json":
        bad = tmp_path / "junk.json"
        bad.write_text("{not json")
        given = files[:2] + [str(bad)]
        words = "not JSON"
    else:
        bad = tmp_path / "err.json"
        bad.write_text(json.dumps({"ok": False, "verdict": "error", "error": "x.json: no such file"}))
        given = files[:2] + [str(bad)]
        words = "did not run"
    with pytest.raises(InputError, match=words):
        merge(given)
    code, out, err = run_cli(capsys, "merge", *given)
    assert code == 2
    assert err.startswith("error: ") and err.count("\n") == 1 and "Traceback" not in err


@settings(max_examples=300, deadline=None)
@given(bits=st.integers(0, 40), count=st.integers(1, 1000), k=st.integers(1, 1000))
def test_neighbouring_shards_meet_exactly(bits, count, k):
    """Over any space: shard k ends where shard k+1 starts, the first at 0 and the last at 2^bits."""
    total = 1 << bits
    k = (k - 1) % count + 1
    lo, hi = shard_range(total, (k, count))
    assert 0 <= lo <= hi <= total
    if k == 1:
        assert lo == 0
    if k == count:
        assert hi == total
    else:
        assert shard_range(total, (k + 1, count))[0] == hi


@pytest.mark.parametrize("edit", ["name", "width", "spec"])
def test_merge_refuses_a_shard_whose_name_width_or_spec_was_edited(shard_files, tmp_path, edit):
    files = shard_files(ripple(4), 3)
    data = json.loads(open(files[1]).read())
    for item in [data]:
        if edit == "name":
            item["design"]["name"] = "someone_else"
        elif edit == "width":
            item["design"]["outputs"]["sum"] = 5
        else:
            item["spec"] = item["spec"] + " "
    bad = tmp_path / "edited.json"
    bad.write_text(json.dumps(data))
    # the other shards keep the original design and spec, so edit them alike: the binding alone
    # must catch the change
    given = []
    for n, f in enumerate(files):
        if n == 1:
            given.append(str(bad))
            continue
        other = json.loads(open(f).read())
        other["design"], other["spec"] = data["design"], data["spec"]
        path = tmp_path / f"edited{n}.json"
        path.write_text(json.dumps(other))
        given.append(str(path))
    with pytest.raises(InputError, match="binding hash"):
        merge(given)
