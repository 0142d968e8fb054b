"""Settle-time proof: every output is stable by time D for every input (floating mode).

``settle_check(design, spec, within, delays)`` returns an ``EngineOutcome`` named ``settle``:

- ``pass``: SAT showed that no input vector leaves any output unsettled at ``within`` (floating
  mode: whatever the nets held before, every output holds its final value from ``within`` on).
  Together with a complete functional verdict (the final value equals the spec) this means every
  output equals the spec at ``within``: ``check(..., settle_within=D)`` combines the two.
- ``fail``: an input vector whose outputs have not settled by ``within``, with a timed waveform.
  The waveform is a concrete transition (from an earlier input vector, found by simulation) in
  which an output is still wrong at ``within`` when one is found; otherwise the floating-mode
  waveform, where every net is unknown (``x``) before time 0 and an output is still unknown at
  ``within``.
- ``undecided``: the solver ran out of time, or the encoding was too large. Never a pass.
"""

from __future__ import annotations

import random
import time
from fractions import Fraction
from pathlib import Path

from verify.model.netlist import Netlist
from verify.model.result import Counterexample, EngineOutcome
from verify.timing.delays import DelayModel, resolve
from verify.timing.events import simulate
from verify.timing.floating import Analysis, TimeLimit, TooLarge

#: earlier vectors tried when looking for a concrete transition that is still wrong at D
CONCRETE_TRIES = 256


def within_ticks(model: DelayModel, within) -> int:
    """``within`` (in the model's unit) as whole ticks, rounded down (settled *by* that time)."""
    return int(Fraction(str(within)) * model.ticks_per_unit // 1)


def _word(design: Netlist, wave_values: dict, port) -> int | None:
    bits = [wave_values[b] for b in port.bits]
    if any(b is None for b in bits):
        return None
    return sum(b << i for i, b in enumerate(bits))


def _at(wave, t: int) -> dict:
    cur = dict(wave.initial)
    for when, net, v in wave.changes:
        if when > t:
            break
        cur[net] = v
    return cur


def concrete_transition(an: Analysis, after: dict, t: int, seed: int = 1):
    """An earlier vector from which the transition to ``after`` leaves an output wrong at ``t``."""
    design = an.design
    final = simulate(design, an.delay, after, after).final
    n = design.input_width
    if n <= 8:
        candidates = range(1 << n)
    else:
        rng = random.Random(seed)
        candidates = [0, (1 << n) - 1] + [rng.getrandbits(n) for _ in range(CONCRETE_TRIES)]
    for packed in candidates:
        before, k = {}, 0
        for p in design.inputs:
            before[p.name] = packed >> k & ((1 << p.width) - 1)
            k += p.width
        wave = simulate(design, an.delay, after, before)
        snap = _at(wave, t)
        if any(snap[o] != final[o] for o in design.output_bits):
            return before, wave, snap
    return None


def settle_check(design: Netlist, spec=None, within=None, delays: DelayModel | str | None = None,
                 *, time_limit: float | None = 60.0, vcd_path: str | Path | None = None
                 ) -> EngineOutcome:
    """Prove every output settled by ``within`` (model units) for every input, or show a vector."""
    from verify import spec as specmod

    started = time.perf_counter()
    model = resolve(delays)
    the_spec = specmod.infer(design) if spec is None else \
        specmod.parse(spec, design) if isinstance(spec, str) else spec
    an = Analysis(design, model, interruptible=bool(time_limit))
    d_ticks = within_ticks(model, within)
    details = {"settle_within": within, "delays": model.name, "unit": model.unit,
               "semantics": "floating mode"}

    def outcome(status: str, evidence: str, cex=None) -> EngineOutcome:
        return EngineOutcome("settle", status, time.perf_counter() - started, evidence,
                             counterexample=cex, details={"settle": details})

    deadline = time.monotonic() + time_limit if time_limit else None
    try:
        vector = an.unsettled_at(design.output_bits, d_ticks, deadline)
    except TimeLimit:
        return outcome("undecided", f"time limit of {time_limit:g} s reached before the settle "
                       f"time was established; nothing is claimed about settling by {within}")
    except TooLarge as e:
        return outcome("undecided", f"settle check not run: {e}")
    finally:
        an.close()
    within = f"{within:g}" if isinstance(within, (int, float)) else within
    if vector is None:
        return outcome("pass", f"SAT (floating mode, delays '{model.name}'): for every input, "
                       f"every output holds its final value from {within} {model.unit} on")
    _, settle, _ = an.settle_times(vector)
    late = {o: model.to_units(settle[o]) for o in design.output_bits if settle[o] > d_ticks}
    assert late, "the solver's vector settles in time: encoding and re-simulation disagree"
    details["late_outputs"] = late
    expected = the_spec.evaluate(vector)
    wave, how, snap, before = _waveform(an, vector, d_ticks, within)
    actual = {p.name: (_word(design, snap, p) or 0) for p in design.outputs}
    if before is not None:
        details["from"] = before
    if vcd_path is not None:
        details["vcd"] = str(write_waveform(vcd_path, wave, model, how, d_ticks))
    worst = max(late.values())
    verb = "settles" if len(late) == 1 else "settle"
    return outcome("fail", f"not settled by {within} {model.unit}: {', '.join(late)} {verb} at up "
                   f"to {worst:g} {model.unit}; {how}",
                   Counterexample(dict(vector), expected, actual))


def _waveform(an: Analysis, vector: dict, d_ticks: int, within):
    """(waveform, sentence, net values at D, earlier vector or None) showing ``vector`` late."""
    model = an.model
    found = concrete_transition(an, vector, d_ticks)
    if found is not None:
        before, wave, snap = found
        return wave, (f"from {_fmt(before)} to {_fmt(vector)} at time 0 an output is still wrong "
                      f"at {within} {model.unit} (event simulation, transport delay)"), snap, before
    wave = simulate(an.design, an.delay, vector, None)
    return wave, (f"for {_fmt(vector)} an output is still unknown at {within} {model.unit} when "
                  f"the nets start unknown (floating mode); no earlier vector tried gave a "
                  f"concrete wrong value at that time"), wave.final, None


def write_waveform(path, wave, model: DelayModel, how: str, d_ticks: int) -> Path:
    """Write the timed waveform with a ``deadline`` mark that rises at D."""
    from verify.files import write_text
    from verify.render import vcd
    text = vcd.dumps_timed(wave, timescale=timescale(model), comment=how,
                           marks={"deadline": [(0, 0), (d_ticks, 1)]})
    return write_text(path, text, what="waveform", replace_reports=True)


def settle_waveform(design: Netlist, delays, vector: dict, within, path) -> Path:
    """Write the waveform of a settle failure for ``vector`` (the command line's --vcd)."""
    an = Analysis(design, resolve(delays))
    d_ticks = within_ticks(an.model, within)
    wave, how, _, _ = _waveform(an, vector, d_ticks, within)
    return write_waveform(path, wave, an.model, how, d_ticks)


def _fmt(v: dict) -> str:
    return ", ".join(f"{k}={x}" for k, x in v.items())


_UNITS = ("s", "ms", "us", "ns", "ps", "fs")


def timescale(model: DelayModel) -> str:
    """A VCD timescale in which one time stamp is one tick of ``model``."""
    unit = "ns" if model.unit not in _UNITS else model.unit  # the unit model: 1 ns per gate
    k = len(str(model.ticks_per_unit)) - 1  # ticks_per_unit is a power of ten
    idx = _UNITS.index(unit) + (k + 2) // 3
    if idx >= len(_UNITS):
        raise ValueError(f"delays finer than 1 fs cannot be written to a VCD ({model.name})")
    return f"{10 ** ((3 - k % 3) % 3)} {_UNITS[idx]}"
