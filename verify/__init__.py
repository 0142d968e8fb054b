"""adder-verify: prove, exhaustively check and randomly test adder circuits against integer addition.

The Python API a hardware repo's own tests can call::

    import verify
    design = verify.load("designs/rca8.json")
    result = verify.check(design, spec="{cout, sum} = a + b + cin")
    assert result.ok, result.verdict
"""

__version__ = "0.1.0"

from verify.errors import InputError  # noqa: E402
from verify.model.netlist import Gate, Netlist, Port  # noqa: E402
from verify.model.result import CheckResult, Verdict  # noqa: E402
from verify.formats import load  # noqa: E402
# Bound after the submodule is imported, so that ``verify.check`` is the function, not the module.
from verify.check import check  # noqa: E402
from verify.batch import BatchCheck, check_many  # noqa: E402


__all__ = ["load", "check", "check_many", "BatchCheck", "Netlist", "Gate", "Port", "CheckResult", "Verdict", "InputError",
           "__version__"]
