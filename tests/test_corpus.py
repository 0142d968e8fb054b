"""The corpus of real public adders (tests/corpus/): every design gets the verdict its index entry
records, and every loadable design is simulated by Icarus Verilog and compared with the spec on
Python integers and with our own simulator.

* ``test_corpus_verdict``: ``expected = "pass"`` must be proven or exhaustive; ``"fail"`` must
  give a counterexample that Icarus Verilog confirms is wrong; ``"load-error"`` entries are strict
  xfails, so when the Verilog reader learns the construct the test XPASSes, fails the run, and
  the index entry (``loads``/``expected``/``load_error``) is updated.
* ``test_corpus_in_icarus``: an independent simulation (Icarus Verilog) of corner, long-carry and
  seeded random vectors, exhaustive for designs with few input bits.
"""

from __future__ import annotations

import random
import re
import shutil
import subprocess
import sys
import zlib
from pathlib import Path
from typing import Mapping, Sequence

import pytest

from verify.check import check
from verify.errors import InputError
from verify.formats import load
from verify.model.netlist import Netlist
from verify.sim import Simulator
from verify.spec import parse

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover - Python 3.10
    import tomli as tomllib

CORPUS = Path(__file__).parent / "corpus"
INDEX = tomllib.loads((CORPUS / "index.toml").read_text(encoding="utf-8"))["design"]
IVERILOG = shutil.which("iverilog")
VVP = shutil.which("vvp")
HAVE_ICARUS = bool(IVERILOG and VVP)
NO_ICARUS = "iverilog/vvp not installed: the cross-check against an independent simulator cannot run"

#: designs of at most this many input bits are simulated on every input vector
EXHAUSTIVE_BITS = 8
#: seeded random vectors per design (on top of the corner vectors)
RANDOM_VECTORS = 300


def _source(entry: Mapping) -> dict:
    return tomllib.loads((CORPUS / entry["id"] / "SOURCE.toml").read_text(encoding="utf-8"))


def _icarus_refusal(entry: Mapping) -> str | None:
    """The SOURCE.toml note's sentence saying Icarus Verilog cannot compile the design, if any."""
    note = _source(entry).get("note", "")
    m = re.search(r"Icarus Verilog[^.;]*?(?:cannot compile|aborts on)[^;]*?\)", note)
    return m.group(0) if m else None


def _paths(entry: Mapping) -> list[Path]:
    return [CORPUS / s for s in entry["sources"]]


def _load(entry: Mapping) -> Netlist:
    return load(_paths(entry), top=entry["top"], params=entry.get("params") or None)


# ---- vectors ---------------------------------------------------------------------------------

def _vectors(design: Netlist, seed: int) -> list[dict[str, int]]:
    """Corner vectors then seeded random ones; every vector when the inputs are few bits.

    The first two multi-bit inputs are the operands a and b; every other input (a carry-in, a
    third operand, a mode bit) takes the "carry" value c of the vector (0 or 1, masked to width).
    """
    ports = list(design.inputs)
    widths = {p.name: p.width for p in ports}
    total = sum(widths.values())
    if total <= EXHAUSTIVE_BITS:
        out = []
        for x in range(1 << total):
            v, shift = {}, 0
            for p in ports:
                v[p.name] = (x >> shift) & ((1 << p.width) - 1)
                shift += p.width
            out.append(v)
        return out
    wide = [p.name for p in ports if p.width > 1]
    a_name = wide[0] if wide else None
    b_name = wide[1] if len(wide) > 1 else None
    n = max(widths.values())
    full = (1 << n) - 1
    alt = int("01" * n, 2) & full

    def vec(a: int, b: int, c: int) -> dict[str, int]:
        v = {}
        for name, w in widths.items():
            value = a if name == a_name else b if name == b_name else c
            v[name] = value & ((1 << w) - 1)
        return v

    bases = [(0, 0), (full, full), (alt, alt), (alt ^ full, alt ^ full), (alt, alt ^ full),
             (full, 0), (0, full), (full, 1), (1, full)]
    for i in range(n):
        bit = 1 << i
        bases.append((bit, bit))              # a carry generated at bit i
        bases.append((full, bit))             # ... rippling from bit i to the top
        bases.append((alt, (alt ^ full) ^ bit))  # b = ~a except bit i: the long chain broken at i
    seen, corners = set(), []
    for a, b in bases:
        for c in (0, 1):  # c = 1 with b = ~a: the carry-in runs through every bit
            v = vec(a, b, c)
            key = tuple(v.values())
            if key not in seen:
                seen.add(key)
                corners.append(v)
    rng = random.Random(seed)
    randoms = [{name: rng.getrandbits(w) for name, w in widths.items()}
               for _ in range(RANDOM_VECTORS)]
    return corners + randoms


# ---- Icarus Verilog --------------------------------------------------------------------------

def _icarus(entry: Mapping, design: Netlist, vecs: Sequence[Mapping[str, int]],
            tmp_path: Path) -> list[dict[str, int | None]]:
    """Simulate the top with its parameters in Icarus Verilog: one {output: int} per vector
    (None where an output has an x or z bit)."""
    ins = {p.name: p.width for p in design.inputs}
    outs = {p.name: p.width for p in design.outputs}
    params = entry.get("params") or {}
    lines = ["module corpus_tb;"]
    lines += [f"  reg [{w - 1}:0] {name};" for name, w in ins.items()]
    lines += [f"  wire [{w - 1}:0] {name};" for name, w in outs.items()]
    overrides = (" #(" + ", ".join(f".{k}({v})" for k, v in params.items()) + ")") if params else ""
    conns = ", ".join(f".{name}({name})" for name in [*ins, *outs])
    lines.append(f"  {entry['top']}{overrides} dut ({conns});")
    lines.append("  initial begin")
    fmt = " ".join("%h" for _ in outs)
    args = ", ".join(outs)
    for k, v in enumerate(vecs):
        assigns = " ".join(f"{name} = {w}'h{v[name]:x};" for name, w in ins.items())
        lines.append(f"    {assigns} #1 $display(\"V {k} {fmt}\", {args});")
    lines += ["    $finish;", "  end", "endmodule", ""]
    tb = tmp_path / "corpus_tb.sv"
    tb.write_text("\n".join(lines), encoding="utf-8")
    exe = tmp_path / "corpus_tb.vvp"
    include = ["-I", str(CORPUS / entry["id"])]
    r = subprocess.run([IVERILOG, "-g2012", *include, "-s", "corpus_tb", "-o", str(exe), str(tb),
                        *map(str, _paths(entry))], capture_output=True, text=True, timeout=120)
    assert r.returncode == 0, f"iverilog could not compile {entry['id']}:\n{r.stderr or r.stdout}"
    r = subprocess.run([VVP, "-n", str(exe)], capture_output=True, text=True, timeout=120,
                       cwd=tmp_path)
    assert r.returncode == 0, f"vvp failed on {entry['id']}:\n{r.stderr or r.stdout}"
    rows = [ln.split() for ln in r.stdout.splitlines() if ln.startswith("V ")]
    assert [int(row[1]) for row in rows] == list(range(len(vecs))), r.stdout[-500:]
    out = []
    for row in rows:
        out.append({name: (int(text, 16) if re.fullmatch(r"[0-9a-fA-F]+", text) else None)
                    for name, text in zip(outs, row[2:])})
    return out


# ---- the verdict the index records -----------------------------------------------------------

def _verdict_param(entry: Mapping):
    marks = []
    if entry["expected"] == "load-error":
        marks.append(pytest.mark.xfail(strict=True, raises=InputError, reason=entry["load_error"]))
    return pytest.param(entry, id=entry["id"], marks=marks)


@pytest.mark.parametrize("entry", [_verdict_param(e) for e in INDEX])
def test_corpus_verdict(entry, tmp_path):
    assert entry["expected"] in ("pass", "fail", "load-error"), entry
    assert entry["loads"] == (entry["expected"] != "load-error"), entry
    try:
        design = _load(entry)
    except InputError as e:
        if entry["expected"] == "load-error" and not str(e).endswith(entry["load_error"]):
            # still refused, but not for the recorded reason: the index entry is stale
            raise AssertionError(f"load error changed; update index.toml:\n  now:    {e}\n"
                                 f"  index:  {entry['load_error']}") from e
        raise  # expected: InputError makes this a strict xfail; for other entries a failure
    result = check(design, entry["spec"])
    if entry["expected"] in ("pass", "load-error"):
        # a load-error entry that loads must prove too; XPASS then flags the stale index entry
        assert result.verdict.value in ("proven", "exhaustive"), (
            result.verdict.value, result.counterexample, [o.evidence for o in result.engines])
        return
    assert result.verdict.value == "fail", (result.verdict.value,
                                            [o.evidence for o in result.engines])
    cex = result.counterexample
    assert cex is not None
    spec = parse(entry["spec"], design)
    want = spec.evaluate(cex.inputs)  # Python integers
    assert cex.expected == want
    assert cex.actual == Simulator(design).evaluate(cex.inputs)
    assert cex.actual != want
    if not HAVE_ICARUS:
        pytest.skip(f"verdict checked; counterexample not confirmed: {NO_ICARUS}")
    refusal = _icarus_refusal(entry)
    if refusal:
        pytest.skip(f"verdict checked; counterexample not confirmed: {refusal}")
    (got,) = _icarus(entry, design, [cex.inputs], tmp_path)  # outside reference: Icarus Verilog
    assert got == cex.actual, (cex.inputs, got, cex.actual)
    assert got != want, (cex.inputs, got, want)  # Python integers: the design really is wrong


# ---- the independent simulation ---------------------------------------------------------------

@pytest.mark.parametrize("entry", [pytest.param(e, id=e["id"]) for e in INDEX])
def test_corpus_in_icarus(entry, tmp_path):
    if not entry["loads"]:
        pytest.skip(f"does not load yet ({entry['load_error']}); "
                    "test_corpus_verdict's strict xfail flags when it does")
    refusal = _icarus_refusal(entry)
    if refusal:
        pytest.skip(refusal)
    if not HAVE_ICARUS:
        pytest.skip(NO_ICARUS)
    design = _load(entry)
    spec = parse(entry["spec"], design)
    vecs = _vectors(design, seed=zlib.crc32(entry["id"].encode()))
    assert len(vecs) <= 600
    icarus = _icarus(entry, design, vecs, tmp_path)  # outside reference: Icarus Verilog
    ours = Simulator(design).evaluate_many(vecs)
    wanted = [spec.evaluate(v) for v in vecs]  # Python integers
    # our simulator against Icarus Verilog, on every vector, whatever the verdict
    differ = [(v, i, o) for v, i, o in zip(vecs, icarus, ours) if i != o]
    assert not differ, f"{len(differ)} of {len(vecs)} differ (input, Icarus, ours): {differ[:3]}"
    wrong = [(v, i, w) for v, i, w in zip(vecs, icarus, wanted) if i != w]
    if entry["expected"] == "fail":
        # the bug is real and the corner vectors reach it (b = ~a with carry-in 1)
        assert wrong, "Icarus Verilog shows no vector where the design differs from the spec"
    else:
        assert not wrong, (f"{len(wrong)} of {len(vecs)} differ from the spec "
                           f"(input, Icarus, spec): {wrong[:3]}")
