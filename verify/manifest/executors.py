"""Where checks run: in this process, in a local process pool, or on a Dask cluster.

Every caller (manifest runs, ``check_many``, sharded exhaustive checks) talks to the same small
interface, so that a run gives the same results wherever its checks are computed::

    with executors.open_executor("local:2") as ex:       # or "tcp://scheduler:8786", or jobs=4
        handles = [ex.submit(fn, arg) for arg in args]
        while handles:
            done, handles = ex.wait_any(handles)
            for h in done:
                value = ex.outcome(h)                    # raises TaskLost when it cannot finish

Tasks are plain module-level functions of picklable arguments (JSON netlist text, entry records),
never engine state. Two kinds of failure are told apart:

* a worker that died (killed, out of memory) or a connection that broke: Dask moves the task to
  another worker by itself, and ``retries`` more attempts are made; if it still cannot finish,
  ``outcome`` raises ``TaskLost`` and the caller reports that one check as an error - never as a
  pass;
* an exception raised by the check itself (a bug of this tool): re-raised by ``outcome``, as it
  would be in a local run.

Dask is optional (``pip install 'adder-verify[cluster]'``); it is imported only when a cluster is
asked for.
"""

from __future__ import annotations

import concurrent.futures as cf
import logging
import uuid
from typing import Any, Callable, Iterable

from verify.errors import InputError

#: how many more times Dask runs a task whose attempt raised (a lost worker is moved regardless)
DASK_RETRIES = 2
#: seconds to wait for a cluster's scheduler to answer, and for its first worker
CONNECT_TIMEOUT = 30


class TaskLost(Exception):
    """A task could not be finished by any worker (workers died, the connection broke)."""


class Executor:
    """Runs tasks somewhere; see the module text."""

    #: how many tasks run at once (used to size batches and shards)
    workers: int = 1
    #: a short description for reports, "local pool of 4 processes"
    where: str = "this process"

    def submit(self, fn: Callable, *args: Any):
        raise NotImplementedError

    def wait_any(self, handles: Iterable) -> tuple[list, list]:
        """Block until at least one handle is done: (done, still running)."""
        raise NotImplementedError

    def outcome(self, handle) -> Any:
        raise NotImplementedError

    def cancel(self, handles: Iterable) -> None:
        for h in handles:
            h.cancel()

    def close(self) -> None:
        pass

    def __enter__(self) -> "Executor":
        return self

    def __exit__(self, *exc) -> bool:
        self.close()
        return False


class InProcess(Executor):
    """Runs each task at once, in this process (``jobs=1``)."""

    def submit(self, fn, *args):
        fut: cf.Future = cf.Future()
        try:
            fut.set_result(fn(*args))
        except BaseException as e:  # re-raised by outcome(), as a pool would
            fut.set_exception(e)
        return fut

    def wait_any(self, handles):
        handles = list(handles)
        return handles, []

    def outcome(self, handle):
        return handle.result()


class LocalPool(Executor):
    """A pool of ``jobs`` worker processes on this machine (``run --jobs N``)."""

    def __init__(self, jobs: int):
        if isinstance(jobs, bool) or not isinstance(jobs, int) or jobs < 1:
            raise InputError(f"must be a whole number >= 1, got {jobs!r}", option="jobs")
        self.workers = jobs
        self.where = f"a local pool of {jobs} process{'es' if jobs > 1 else ''}"
        self._pool = cf.ProcessPoolExecutor(max_workers=jobs)

    def submit(self, fn, *args):
        return self._pool.submit(fn, *args)

    def wait_any(self, handles):
        done, rest = cf.wait(list(handles), return_when=cf.FIRST_COMPLETED)
        return list(done), list(rest)

    def outcome(self, handle):
        try:
            return handle.result()
        except cf.process.BrokenProcessPool as e:
            raise TaskLost(f"a worker process of the local pool died ({e})") from None
        except cf.CancelledError:
            raise TaskLost("the task was cancelled") from None

    def close(self) -> None:
        self._pool.shutdown(wait=True, cancel_futures=True)


def _in_dask_worker(fn, *args):
    """Run a task in a Dask worker. The worker's own threads use the ``random`` module; when
    that happens while hypothesis shrinks a counterexample, hypothesis warns that the strategy
    used ``random``; it is about the worker's threads, not the check, and is dropped here (the
    shrunk vector is re-checked against the spec either way)."""
    import warnings
    with warnings.catch_warnings():
        try:
            from hypothesis.errors import HypothesisDeprecationWarning
            warnings.filterwarnings("ignore", message=r"Do not use the `random` module",
                                    category=HypothesisDeprecationWarning)
        except ImportError:  # pragma: no cover - hypothesis is a dependency
            pass
        return fn(*args)


class DaskCluster(Executor):
    """Tasks on a Dask cluster: ``address`` of a running scheduler, or ``local:N`` for a cluster
    of N single-threaded worker processes on this machine (loopback only, no dashboard)."""

    def __init__(self, address: str, *, retries: int = DASK_RETRIES):
        try:
            from distributed import Client, LocalCluster
        except ImportError:
            raise InputError("needs Dask: pip install 'adder-verify[cluster]'",
                             option="cluster") from None
        self.retries = retries
        self._cluster = None
        address = address.strip()
        if address.startswith("local:"):
            n = address[len("local:"):]
            if not n.isdigit() or not 1 <= int(n) <= 512:
                raise InputError(f"'{address}': write local:N with N from 1 to 512, or a scheduler "
                                 f"address such as tcp://scheduler:8786", option="cluster")
            self._cluster = LocalCluster(n_workers=int(n), processes=True, threads_per_worker=1,
                                         host="127.0.0.1", dashboard_address=None,
                                         silence_logs=logging.CRITICAL,
                                         # the scheduler's health routes: any free loopback port
                                         scheduler_kwargs={"dashboard_address": "127.0.0.1:0"})
            self.client = Client(self._cluster)
            self.where = f"a local Dask cluster of {n} worker processes"
        else:
            if not address:
                raise InputError("give a scheduler address such as tcp://scheduler:8786, or local:N",
                                 option="cluster")
            try:
                self.client = Client(address, timeout=CONNECT_TIMEOUT)
            except (OSError, TimeoutError) as e:
                raise InputError(f"cannot reach a Dask scheduler at {address}: {e}",
                                 option="cluster") from None
            self.where = f"the Dask cluster at {address}"
        try:
            self.client.wait_for_workers(1, timeout=CONNECT_TIMEOUT)
        except (OSError, TimeoutError):
            self.close()
            raise InputError(f"the Dask scheduler at {address} has no workers (waited "
                             f"{CONNECT_TIMEOUT} s)", option="cluster") from None
        self.workers = max(1, sum(w.get("nthreads", 1) for w in
                                  self.client.scheduler_info()["workers"].values()))

    @classmethod
    def from_client(cls, client, *, retries: int = DASK_RETRIES) -> "DaskCluster":
        """Use a ``distributed.Client`` the caller already holds (not closed by ``close``)."""
        self = cls.__new__(cls)
        self.retries, self._cluster, self.client = retries, None, client
        self._own_client = False
        self.where = f"the Dask cluster at {client.scheduler.address}"
        self.workers = max(1, sum(w.get("nthreads", 1) for w in
                                  client.scheduler_info()["workers"].values()))
        return self

    def submit(self, fn, *args):
        # a fresh key: two equal designs are still two tasks, each reported in its own place
        key = f"{getattr(fn, '__name__', 'task')}-{uuid.uuid4().hex}"
        return self.client.submit(_in_dask_worker, fn, *args, key=key, retries=self.retries)

    def wait_any(self, handles):
        from distributed import wait
        done, rest = wait(list(handles), return_when="FIRST_COMPLETED")
        return list(done), list(rest)

    def outcome(self, handle):
        from distributed import KilledWorker
        from distributed.comm.core import CommClosedError
        try:
            return handle.result()
        except KilledWorker as e:
            raise TaskLost(f"every worker that ran it died ({e})") from None
        except (CommClosedError, cf.CancelledError, OSError) as e:
            raise TaskLost(f"the cluster connection was lost ({type(e).__name__}: {e})") from None

    def cancel(self, handles):
        handles = list(handles)
        if handles:
            self.client.cancel(handles)

    def close(self) -> None:
        if getattr(self, "_own_client", True):
            self.client.close()
        if self._cluster is not None:
            self._cluster.close()


def each_done(executor: Executor, tasks: Iterable[tuple[Any, Callable, tuple]]):
    """Submit every (tag, fn, args) and yield (tag, value, None) as each finishes, or
    (tag, None, why) for one no worker could finish. Tasks still running when the caller stops
    early are cancelled."""
    handles = {executor.submit(fn, *args): tag for tag, fn, args in tasks}
    waiting = list(handles)
    try:
        while waiting:
            finished, waiting = executor.wait_any(waiting)
            for h in finished:
                try:
                    value = executor.outcome(h)
                except TaskLost as lost:
                    yield handles[h], None, str(lost)
                    continue
                yield handles[h], value, None
    finally:
        if waiting:
            executor.cancel(waiting)


def open_executor(cluster: str | None = None, jobs: int = 1) -> Executor:
    """The executor for ``--cluster ADDRESS`` (Dask) or ``--jobs N`` (local processes)."""
    if cluster is not None:
        return DaskCluster(cluster)
    if jobs == 1:
        return InProcess()
    return LocalPool(jobs)

