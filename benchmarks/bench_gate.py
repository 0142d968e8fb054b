"""Merge-gate speed: a manifest run cold, warm (every verdict from the cache) and in parallel.

    python benchmarks/bench_gate.py [MANIFEST]

Default manifest: designs/verify.toml (the Larkspur library), copied with its designs to a
temporary folder so that the repo's own cache is neither used nor touched. Figures, each beside
its baseline from the same run:

- cold run, --jobs 1 (the baseline) and --jobs 2;
- warm run: nothing changed, every verdict from the cache, beside the cold --jobs 1 run;
- one changed file: only its entry is checked again;
- a 2^27-vector exhaustive check in one piece beside the same space in 4 shards run one after
  the other (the total work must not grow when it is split).

Floors: a warm run takes under a tenth of the cold run and under 1 s; the four shards together
take under 1.5 times the single piece. Exits 1 if a floor was missed.
"""

from __future__ import annotations

import shutil
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from verify.manifest import runner as gate  # noqa: E402
from verify.library.architectures import generate  # noqa: E402
from verify.check import check  # noqa: E402


def timed(fn):
    t0 = time.perf_counter()
    out = fn()
    return out, time.perf_counter() - t0


def main(argv: list[str]) -> int:
    source = Path(argv[0]) if argv else Path(__file__).resolve().parents[1] / "designs" / "verify.toml"
    failed = []
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp) / "repo"
        shutil.copytree(source.parent, work, ignore=shutil.ignore_patterns(".verify-cache"))
        manifest = work / source.name
        n = sum(len(e.points()) for e in gate.load_manifest(manifest).entries)

        cold1, t_cold1 = timed(lambda: gate.run(manifest, jobs=1, use_cache=False))
        cold2, t_cold2 = timed(lambda: gate.run(manifest, jobs=2, use_cache=False))
        warm, t_warm = timed(lambda: gate.run(manifest, jobs=1))
        same = [r["verdict"] for r in cold1.records] == [r["verdict"] for r in cold2.records] \
            == [r["verdict"] for r in warm.records]
        print(f"manifest {source} ({n} checks), exit {cold1.exit_code}")
        print(f"  cold, --jobs 1      {t_cold1:7.2f} s   (baseline)")
        print(f"  cold, --jobs 2      {t_cold2:7.2f} s   {t_cold1 / t_cold2:4.2f}x the baseline")
        hits = sum(r["cached"] for r in warm.records)
        print(f"  warm (all cached)   {t_warm:7.3f} s   {t_cold1 / t_warm:6.0f}x faster; {hits} of {n} "
              f"from the cache")
        print(f"  same verdicts in all three runs: {same}")
        if not same:
            failed.append("verdicts differ between runs")
        if not (t_warm < t_cold1 / 10 and t_warm < 1.0):
            failed.append(f"warm run {t_warm:.3f} s is not under a tenth of {t_cold1:.2f} s and 1 s")

        first = gate.load_manifest(manifest).entries[0]
        target = work / first.files[0]
        target.write_text(target.read_text() + ("\n" if target.suffix == ".json" else "// edited\n"))
        one, t_one = timed(lambda: gate.run(manifest))
        missed = [r["label"] for r in one.records if not r["cached"]]
        print(f"  one file edited     {t_one:7.3f} s   checked again: {', '.join(missed)}")

    design = generate("kogge_stone", 13) if _has_generate() else None
    if design is not None:
        spec = "{cout, sum} = a + b + cin"
        whole, t_whole = timed(lambda: check(design, spec, engine="exhaustive", timeout=600,
                                          exhaustive_limit=28))
        parts, t_parts = timed(lambda: [check(design, spec, engine="exhaustive", shard=(k, 4),
                                              timeout=600, exhaustive_limit=28) for k in range(1, 5)])
        bits = design.input_width
        print(f"exhaustive 2^{bits} vectors, 13-bit Kogge-Stone adder")
        print(f"  one piece           {t_whole:7.2f} s   (baseline) {whole.verdict.value}")
        print(f"  4 shards in a row   {t_parts:7.2f} s   {t_parts / t_whole:4.2f}x the baseline; "
              f"{', '.join(p.verdict.value for p in parts)}")
        if t_parts > 1.5 * t_whole:
            failed.append(f"4 shards took {t_parts / t_whole:.2f}x one piece (floor 1.5x)")
    for f in failed:
        print(f"MISSED: {f}")
    return 1 if failed else 0


def _has_generate() -> bool:
    try:
        generate("kogge_stone", 4)
        return True
    except Exception:  # pragma: no cover - another architectures API
        return False


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
