"""Delay analysis: how soon a design's outputs are right, under a gate delay model.

- ``delays``: delay models (``unit``, a TOML table, a per-gate lookup for library cells).
- ``floating``: exact settle times under the floating-mode model, by SAT (``Analysis``).
- ``events``: event-driven simulation of one input transition (transport delay).
- ``settle``: ``settle_check``, the proof that every output settles by a given time.
- ``report``: per-output reports, width sweeps and plots.
"""

from verify.timing.delays import DelayModel, PerGateModel, TableModel, UnitModel, load_toml, resolve
from verify.timing.floating import Analysis, TimeLimit, TooLarge
from verify.timing.report import analyze
from verify.timing.settle import settle_check

__all__ = ["DelayModel", "PerGateModel", "TableModel", "UnitModel", "load_toml", "resolve",
           "Analysis", "TimeLimit", "TooLarge", "analyze", "settle_check"]
