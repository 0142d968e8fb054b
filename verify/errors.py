"""Errors that reach the user.

Every mistake in what a user wrote (a design file, a spec, a manifest, a command-line value) is an
``InputError``: the command line prints it as one line, ``error: <where>: <what>``, and exits with
code 2. Anything else escaping an engine is a bug in this tool, never a verdict.
"""

from __future__ import annotations


class InputError(Exception):
    """Bad input: says what is wrong and where (a file, a file:line:col, a spec column, a gate)."""

    def __init__(self, message: str, where: str | None = None):
        super().__init__(message)
        self.message = message
        self.where = where

    def __str__(self) -> str:
        return f"{self.where}: {self.message}" if self.where else self.message

    def located(self, where: str) -> "InputError":
        """The same error with a location prefixed (used when a caller knows the file)."""
        inner = f"{where}: {self.where}" if self.where else where
        err = type(self)(self.message, inner)
        return err


class NetlistError(InputError):
    """A structural mistake in a netlist: loop, undriven net, double driver, bad op..."""


class SpecError(InputError):
    """A spec that cannot be parsed or does not fit the design."""


class EngineDisagreement(Exception):
    """Two complete engines reached opposite answers on the same check: a bug in this tool, never
    a verdict and never bad input. Carries both outcomes (``first``, ``second``)."""

    def __init__(self, first, second):
        super().__init__(f"engines disagree: {first.engine} says {first.status} "
                         f"({first.evidence}); {second.engine} says {second.status} "
                         f"({second.evidence})")
        self.first = first
        self.second = second
