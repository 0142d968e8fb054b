"""Checks on a Dask cluster give the results of a local run; a lost worker never passes an entry.

A local Dask cluster of two single-threaded worker processes is started here (loopback only, no
dashboard). The local run of the same code is compared against, and every counterexample is
re-checked against Python integer addition (the spec "{cout, sum} = a + b + cin" - common
practice for an adder's function).
"""

from __future__ import annotations

import os
import shutil
import signal
import sys
import threading
import time
from pathlib import Path

import pytest

distributed = pytest.importorskip("distributed")
import cloudpickle  # noqa: E402 - installed with distributed
import dask  # noqa: E402

from tests.test_shards import one_wrong_vector  # noqa: E402
from verify.batch import check_files, check_many  # noqa: E402
from verify.cli.main import run_command  # noqa: E402
from verify.library.architectures import generate  # noqa: E402
from verify.manifest import remote, runner  # noqa: E402
from verify.manifest.executors import DaskCluster, LocalPool  # noqa: E402
from verify.manifest.shards import check_split  # noqa: E402
from verify.model.result import Verdict  # noqa: E402

ADD = "{cout, sum} = a + b + cin"
DESIGNS = Path(__file__).resolve().parents[1] / "designs"

# the slow wrappers below are defined in this test module: ship them by value, so the workers
# need not import the tests package
cloudpickle.register_pickle_by_value(sys.modules[__name__])


@pytest.fixture(scope="module")
def client():
    # one death of the worker running a task is survived (the task moves); a second is
    # reported (KilledWorker), which keeps the "every worker died" test short
    with dask.config.set({"distributed.scheduler.allowed-failures": 1}):
        cluster = distributed.LocalCluster(n_workers=2, processes=True, threads_per_worker=1,
                                           host="127.0.0.1", dashboard_address=None,
                                           silence_logs=50,
                                           scheduler_kwargs={"dashboard_address": "127.0.0.1:0"})
        c = distributed.Client(cluster)
        c.wait_for_workers(2, timeout=60)
        yield c
        c.close()
        cluster.close()


@pytest.fixture
def designs(tmp_path):
    """The shipped manifest and its designs, in a folder of the test's own."""
    shutil.copytree(DESIGNS, tmp_path / "designs")
    return tmp_path / "designs" / "verify.toml"


@pytest.fixture(scope="module")
def local(tmp_path_factory):
    """The shipped manifest run in this process: what every cluster run must reproduce."""
    folder = tmp_path_factory.mktemp("local")
    shutil.copytree(DESIGNS, folder / "designs")
    return runner.run(folder / "designs" / "verify.toml", use_cache=False,
                      cache_dir=folder / "cache")


def comparable(record) -> dict:
    """What a record establishes, without the times (which differ from run to run)."""
    data = record.to_json()
    for key in ("seconds", "checked_seconds", "cached"):
        data.pop(key)
    # the command that reproduces a failure names the folder each run read its manifest from
    data.pop("reproduce", None)
    if data.get("design"):  # where the design was read from: each run has its own folder
        data["design"] = {k: v for k, v in data["design"].items() if k != "origin"}
    data["engines"] = [{k: v for k, v in e.items() if k != "seconds"
                        and not (k == "evidence" and "/s)" in v)} for e in data["engines"]]
    return data


def integer_sum_checks(record, widths) -> None:
    """A failing entry's counterexample: the expected outputs are a + b + cin (Python ints)
    and the design's actual outputs differ from them."""
    cex = record.counterexample
    a, b, cin = cex["inputs"]["a"], cex["inputs"]["b"], cex["inputs"].get("cin", 0)
    w = widths["a"]
    total = a + b + cin  # Python integer addition: the outside reference
    assert cex["expected"]["sum"] == total % (1 << w)
    if "cout" in cex["expected"]:
        assert cex["expected"]["cout"] == total >> w
    assert cex["actual"] != cex["expected"]


def test_manifest_on_the_cluster_equals_the_local_run(client, designs, tmp_path, local):
    on_cluster = runner.run(designs, use_cache=False, cache_dir=tmp_path / "cache-cluster",
                            executor=DaskCluster.from_client(client))
    assert on_cluster.exit_code == local.exit_code == 0
    assert [r.label for r in on_cluster.records] == [r.label for r in local.records]
    assert [comparable(r) for r in on_cluster.records] == [comparable(r) for r in local.records]
    broken = [r for r in on_cluster.records if r.deliberately_broken]
    assert len(broken) == 5 and all(r.verdict is Verdict.FAIL for r in broken)
    for r in broken:
        if "v" not in r.counterexample["expected"]:
            integer_sum_checks(r, r.design["inputs"])
    # the cluster's results were cached like a local run's: a second run answers from the cache
    again = runner.run(designs, cache_dir=tmp_path / "cache-cluster",
                       executor=DaskCluster.from_client(client))
    assert all(r.cached for r in again.records)
    assert [comparable(r.but(cached=False)) for r in again.records] == \
        [comparable(r) for r in local.records]


def _batch():
    good = [generate(a, 6, name=f"{a}6") for a in ("ripple", "kogge-stone", "brent-kung",
                                                      "sklansky", "carry-select")]
    # wrong on input vector 1000 only: a+b+cin differs from sum there (tests.test_shards)
    return good + [one_wrong_vector(5, 1000)]


def test_check_many_gives_the_same_results_everywhere(client):
    designs = _batch()
    where = {"one process": dict(jobs=1), "local pool": dict(executor=LocalPool(2)),
             "dask": dict(executor=DaskCluster.from_client(client))}
    seen = {}
    for name, how in where.items():
        items = list(check_many(designs, spec=ADD, engine="exhaustive", **how))
        assert sorted(i.index for i in items) == list(range(len(designs)))
        seen[name] = {i.index: (i.verdict, i.exit_code, i.result.counterexample)
                      for i in items}
        if name == "local pool":
            how["executor"].close()
    assert seen["one process"] == seen["local pool"] == seen["dask"]
    verdicts = [seen["dask"][k][0] for k in range(len(designs))]
    assert verdicts == [Verdict.EXHAUSTIVE] * 5 + [Verdict.FAIL]
    cex = seen["dask"][5][2]
    a, b, cin = cex.inputs["a"], cex.inputs["b"], cex.inputs["cin"]
    assert a + (b << 5) + (cin << 10) == 1000  # the one wrong vector (bit k of v is input bit k)
    assert cex.expected["sum"] == (a + b + cin) % 32 and cex.actual != cex.expected


def test_check_many_takes_paths_and_reports_unreadable_ones(client, tmp_path):
    bad = tmp_path / "bad.json"
    bad.write_text("{not json", encoding="utf-8")
    paths = [DESIGNS / "larkspur_add8_ripple.json", bad, DESIGNS / "larkspur_add8_ripple_maj.v"]
    items = {i.index: i for i in check_many(paths, spec=ADD, engine="exhaustive",
                                            executor=DaskCluster.from_client(client))}
    assert items[0].verdict is Verdict.EXHAUSTIVE and items[2].verdict is Verdict.EXHAUSTIVE
    assert items[1].verdict is Verdict.ERROR and items[1].exit_code == 2
    assert "not valid JSON" in items[1].error and str(bad) in items[1].error


@pytest.mark.parametrize("v", [0, 1000, 4095])
def test_split_exhaustive_check_merges_like_merge(client, v):
    ex = DaskCluster.from_client(client)
    good = check_split(generate("kogge-stone", 9), ADD, ex)
    assert good.verdict is Verdict.EXHAUSTIVE and good.engines[0].vectors == 1 << 19
    assert good.engines[0].details["shards"]["count"] == 8  # 4 per worker
    wrong = one_wrong_vector(5, v)  # 11 input bits: vector v is the only wrong one
    split = check_split(wrong, ADD, ex)
    from verify.check import check
    local = check(wrong, ADD, engine="exhaustive")
    assert split.verdict is local.verdict is Verdict.FAIL
    assert split.counterexample == local.counterexample
    assert split.exit_code == local.exit_code == 1


def test_split_never_makes_more_shards_than_vectors(client):
    tiny = generate("ripple", 1, cin=False)  # 2 input bits: 4 vectors
    result = check_split(tiny, "{cout, sum} = a + b", DaskCluster.from_client(client))
    assert result.verdict is Verdict.EXHAUSTIVE
    assert result.engines[0].details["shards"]["count"] == 4


def test_check_files_with_a_cluster_refuses_other_engines(client):
    from verify.errors import InputError
    with pytest.raises(InputError, match="exhaustive"):
        check_files([DESIGNS / "larkspur_add8_ripple.json"], ADD, engine="auto",
                    executor=DaskCluster.from_client(client))


# ---- lost workers ---------------------------------------------------------------------------

def _slowly(seconds, fn, *args):
    time.sleep(seconds)
    return fn(*args)


def _die(*args):
    os._exit(1)


class _Slow(DaskCluster):
    """Each task sleeps first, so that a worker can be killed while it holds one; the task of
    ``doomed`` kills whichever worker runs it."""

    def __init__(self, client, seconds=3.0, doomed=None):
        base = DaskCluster.from_client(client)
        self.__dict__.update(base.__dict__)
        self.seconds, self.doomed = seconds, doomed

    def submit(self, fn, *args):
        if self.doomed is not None and args and getattr(args[0], "name", None) == self.doomed:
            return super().submit(_die, *args)
        return super().submit(_slowly, self.seconds, fn, *args)


def _worker_running_a_task(client, timeout=30.0) -> str:
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        busy = [w for w, keys in client.processing().items() if keys]
        if busy:
            return busy[0]
        time.sleep(0.05)
    raise AssertionError("no worker took a task")


def test_a_killed_worker_loses_and_passes_no_entry(client, designs, tmp_path, local):
    only = ["larkspur_add8_ripple", "larkspur_add16_cla", "broken_carry_skip_missing_propagate"]
    out = {}
    job = threading.Thread(target=lambda: out.setdefault("summary", runner.run(
        designs, use_cache=False, cache_dir=tmp_path / "cache-kill", only=only,
        executor=_Slow(client, seconds=2.0))))
    job.start()
    victim = _worker_running_a_task(client)
    time.sleep(0.5)  # inside the task's sleep
    pid = client.run(os.getpid, workers=[victim])[victim]
    os.kill(pid, signal.SIGKILL)
    job.join(timeout=120)
    assert not job.is_alive()
    summary = out["summary"]
    # the task moved to the other worker: every entry has its local result, none lost
    expected = [r for r in local.records if r.name in only]
    assert [comparable(r) for r in summary.records] == [comparable(r) for r in expected]
    assert summary.exit_code == 0 and len(summary.records) == 3
    client.wait_for_workers(2, timeout=60)  # the nanny restarted the killed worker


def test_a_task_that_kills_every_worker_is_an_error_never_a_pass(client, designs, tmp_path):
    only = ["larkspur_add8_ripple", "larkspur_add16_cla"]
    summary = runner.run(designs, use_cache=False, cache_dir=tmp_path / "cache-die", only=only,
                         executor=_Slow(client, seconds=0.0, doomed="larkspur_add16_cla"))
    by_name = {r.name: r for r in summary.records}
    assert by_name["larkspur_add8_ripple"].verdict is Verdict.EXHAUSTIVE
    lost = by_name["larkspur_add16_cla"]
    assert lost.verdict is Verdict.ERROR and not lost.ok
    assert "did not finish" in lost.error
    assert summary.exit_code == 2  # an error, not a pass
    # nothing was cached for it: the next run checks it again
    again = runner.run(designs, cache_dir=tmp_path / "cache-die", only=only)
    assert not {r.name: r for r in again.records}["larkspur_add16_cla"].cached
    client.wait_for_workers(2, timeout=60)


# ---- the command line ---------------------------------------------------------------------

def test_cluster_option_refuses_what_it_cannot_do(designs, capsys):
    assert run_command(["check", str(DESIGNS / "larkspur_add8_ripple.json"), "--cluster",
                        "local:1", "--no-log"]) == 2  # not the exhaustive engine
    assert "--engine exhaustive" in capsys.readouterr().err
    assert run_command(["run", str(designs), "--cluster", "local:1", "--jobs", "2"]) == 2
    assert run_command(["check", str(DESIGNS / "larkspur_add8_ripple.json"), "--engine",
                        "exhaustive", "--cluster", "local:x", "--no-log"]) == 2
    assert "local:N" in capsys.readouterr().err


@pytest.mark.slow
def test_cli_check_and_run_on_a_local_cluster(designs, capsys):
    path = str(DESIGNS / "larkspur_add8_ripple.json")
    assert run_command(["check", path, "--engine", "exhaustive", "--no-log", "--json"]) == 0
    local = capsys.readouterr().out
    assert run_command(["check", path, "--engine", "exhaustive", "--no-log", "--json",
                        "--cluster", "local:2"]) == 0
    split = capsys.readouterr().out
    assert '"verdict": "exhaustive"' in local and '"verdict": "exhaustive"' in split
    assert run_command(["run", str(designs), "--no-cache", "-q", "--cluster", "local:2"]) == 0


class _Elsewhere(DaskCluster):
    """Workers on machines without the checkout: every task is told the manifest's folder is at
    a path that does not exist there."""

    def __init__(self, client):
        self.__dict__.update(DaskCluster.from_client(client).__dict__)
        self.shipped = 0

    def submit(self, fn, *args):
        if fn is remote.check_entry_on_worker:
            self.shipped += len(args) > 3
            args = (args[0], args[1], "/nonexistent/checkout", *args[3:])
        return super().submit(fn, *args)


def test_workers_without_the_checkout_get_the_designs_and_the_same_results(client, designs,
                                                                             tmp_path, local):
    elsewhere = _Elsewhere(client)
    summary = runner.run(designs, use_cache=False, cache_dir=tmp_path / "cache-elsewhere",
                         executor=elsewhere)
    assert elsewhere.shipped == len(local.records)  # every design went as JSON netlist text
    assert [comparable(r) for r in summary.records] == [comparable(r) for r in local.records]
    # the origin is where the design was read here, as in a local run (not a worker's path)
    assert all(r.design["origin"].startswith(str(designs.parent)) for r in summary.records)
    assert summary.exit_code == 0


def test_a_design_read_here_for_remote_workers_reports_bad_input_as_a_local_run(client, tmp_path):
    shutil.copy(DESIGNS / "larkspur_add8_ripple.json", tmp_path / "good.json")
    (tmp_path / "bad.v").write_text("module bad(input a, output y);\n  assign y = a &;\nendmodule\n",
                                    encoding="utf-8")
    (tmp_path / "verify.toml").write_text(
        '[[design]]\nname = "good"\nsources = ["good.json"]\nspec = "{cout, sum} = a + b + cin"\n'
        '[[design]]\nname = "bad"\nsources = ["bad.v"]\nspec = "y = a"\n', encoding="utf-8")
    here = runner.run(tmp_path / "verify.toml", use_cache=False, cache_dir=tmp_path / "c1")
    away = runner.run(tmp_path / "verify.toml", use_cache=False, cache_dir=tmp_path / "c2",
                      executor=_Elsewhere(client))
    assert [r.verdict for r in here.records] == [Verdict.EXHAUSTIVE, Verdict.ERROR]
    assert [comparable(r) for r in away.records] == [comparable(r) for r in here.records]
    assert "bad.v:2" in away.records[1].error and away.exit_code == here.exit_code == 2


@pytest.mark.parametrize("options,option", [({"engine": "guess"}, "engine"), ({"jobs": 0}, "jobs"),
                                            ({"timeout": -1}, "timeout"),
                                            ({"shard": (1, 2)}, "shard")])
def test_check_many_refuses_bad_options_when_called(options, option):
    from verify.errors import InputError
    with pytest.raises(InputError) as caught:
        check_many([generate("ripple", 2)], **options)  # not iterated: refused at the call
    assert caught.value.option == option
