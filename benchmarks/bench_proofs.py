"""Proof times of the sweeping engine (and auto) beside the plain z3 miter, measured in one run.

    python benchmarks/bench_proofs.py [--widths 256,1024,4096] [--miter-limit 60] [--quick]

For every architecture of ``verify.library.architectures`` and each width: CPU seconds (time.process_time)
and wall seconds of the sweeping engine alone and of ``check()`` with default options (auto:
random vectors, then sweeping); the plain z3 miter (the smt engine) at 256 bits with a short limit
as the baseline; a 64-bit adder-subtractor with overflow in the a - b form; peak RSS. Widths the
spec refuses (over its limit) are run through the engine functions directly, with the spec of a
narrower-limit-free form built the same way.
"""

from __future__ import annotations

import argparse
import resource
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from verify.check import check, resolve_spec  # noqa: E402
from verify.engines import Options, smt, sweep  # noqa: E402
from verify.library.architectures import ARCHITECTURES, generate  # noqa: E402


class PlainSum:
    """A stand-in for ``Spec`` of ``{cout, sum} = a + b + cin`` at widths the spec language still
    refuses (its 4,096-bit value limit): evaluates on Python integers, and its reference netlist
    is the library's ripple adder (the spec's own gate translation is a ripple adder too)."""

    def __init__(self, width: int):
        self.width = width
        self.text = "{cout, sum} = a + b + cin"
        self.inferred = False
        self._ref = None

    def evaluate(self, inputs):
        total = inputs["a"] + inputs["b"] + inputs["cin"]
        return {"sum": total & ((1 << self.width) - 1), "cout": total >> self.width & 1}

    def reference(self):
        if self._ref is None:
            self._ref = generate("ripple", self.width)
        return self._ref


def spec_for(design, width):
    try:
        return resolve_spec(design, None), True
    except Exception:  # noqa: BLE001 - the spec's width limit; fall back to the stand-in
        return PlainSum(width), False


def timed(fn):
    c, w = time.process_time(), time.perf_counter()
    out = fn()
    return out, time.process_time() - c, time.perf_counter() - w


def peak_mb() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--widths", default="256,1024,4096")
    ap.add_argument("--miter-limit", type=float, default=60.0)
    ap.add_argument("--archs", default=",".join(ARCHITECTURES))
    args = ap.parse_args()
    widths = [int(w) for w in args.widths.split(",")]
    print(f"{'architecture':<16} {'width':>6} {'sweep cpu s':>11} {'auto cpu s':>10} "
          f"{'auto wall s':>11} {'verdict':<9} {'z3 miter':>12}")
    for arch in args.archs.split(","):
        for width in widths:
            design = generate(arch, width)
            spec, real = spec_for(design, width)
            o, sweep_cpu, _ = timed(lambda: sweep.run(design, spec, Options(timeout=600)))
            if real:
                r, auto_cpu, auto_wall = timed(lambda: check(design, spec))
                verdict = r.verdict.value
            else:  # check() refuses the spec at this width: the sweep engine alone, stand-in spec
                auto_cpu = auto_wall = float("nan")
                verdict = "(no spec)"
            miter = ""
            if real and (width == 256 or width == min(widths)):
                m, mc, mw = timed(lambda: smt.run(design, spec, Options(timeout=args.miter_limit)))
                miter = f"{mw:.1f} s" if m.status == "pass" else f"over {args.miter_limit:g} s"
            print(f"{arch:<16} {width:>6} {sweep_cpu:>11.2f} {auto_cpu:>10.2f} {auto_wall:>11.2f} "
                  f"{verdict:<9} {miter:>12}  ({o.status}; {o.details.get('internal_equivalences')} "
                  f"equivalences, {o.details.get('solver_calls')} solver calls)", flush=True)
    from tests.test_engines_proofs import ADDSUB_SPEC, adder_subtractor
    design = adder_subtractor(64)
    r, c, w = timed(lambda: check(design, ADDSUB_SPEC))
    m, mc, mw = timed(lambda: smt.run(design, resolve_spec(design, ADDSUB_SPEC),
                                      Options(timeout=args.miter_limit)))
    print(f"adder-subtractor 64 bits (a - b form, overflow): auto {r.verdict.value} in {c:.2f} CPU s "
          f"({w:.2f} wall s); z3 miter: "
          f"{f'{mw:.1f} s' if m.status == 'pass' else f'over {args.miter_limit:g} s ({m.status})'}")
    print(f"peak RSS: {peak_mb():.0f} MB")


if __name__ == "__main__":
    main()
