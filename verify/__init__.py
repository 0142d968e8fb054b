"""adder-verify: prove, exhaustively check and randomly test adder circuits against integer addition.

The Python API a hardware repo's own tests can call::

    import verify
    design = verify.load("designs/rca8.json")
    result = verify.check(design, spec="{cout, sum} = a + b + cin")
    assert result.ok, result.verdict
"""

__version__ = "0.1.0"

from verify.errors import InputError  # noqa: E402
from verify.netlist import Gate, Netlist, Port  # noqa: E402
from verify.result import CheckResult, Verdict  # noqa: E402


def load(paths, **options):
    """Read a design (JSON netlist or Verilog files) into a validated Netlist."""
    from verify.formats import load as _load
    return _load(paths, **options)


def check(design, spec=None, **options):
    """Check a design against a spec; see verify.check.check for the options."""
    from verify.check import check as _check
    return _check(design, spec, **options)


__all__ = ["load", "check", "Netlist", "Gate", "Port", "CheckResult", "Verdict", "InputError",
           "__version__"]
