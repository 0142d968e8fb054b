"""Errors that reach the user, with structured fields set where they arise.

Every mistake in what a user wrote (a design file, a spec, a manifest, an option value) is an
``InputError``. It carries *what* is wrong (``message``) and *where*, as fields: a text location
(``where``: a file, ``file:line:col``, a spec column, a gate), the Python API option it concerns
(``option``: ``"seed"``, ``"params"``, ``"top"``...), and for manifests the entry and key. Each
front end words it for its reader: the command line names the flag (``--seed``), a manifest run
names the manifest line, entry and key, the pytest plugin names the test item. No front end
parses a message's text.

``InternalError`` (and its kind ``EngineDisagreement``) is a bug in this tool or a disagreement
between engines: never a verdict, never exit code 1 (a counterexample) or 0.
"""

from __future__ import annotations

#: the command-line flag of each Python API option (for the CLI's wording)
FLAGS = {"params": "--param", "include_dirs": "-I", "defines": "-D", "top": "--top",
         "seed": "--seed", "vectors": "--vectors", "timeout": "--timeout",
         "exhaustive_limit": "--exhaustive-limit", "shard": "--shard", "engine": "--engine",
         "jobs": "--jobs", "input": "--input", "width": "--width", "spec": "--spec",
         "cells": "--cells", "delays": "--delays", "settle_within": "--settle-within",
         "strength": "--strength", "log_dir": "--log-dir", "vcd": "--vcd", "dot": "--dot",
         "recursive": "--recursive", "time_limit": "--time-limit", "widths": "--widths",
         "from": "--from", "to": "--to", "plot": "--plot"}
_FROM_FLAG = {flag: name for name, flag in FLAGS.items()}


def option_name(option: str | None) -> str | None:
    """The API name of an option given either way ("--param" or "params")."""
    if option is None:
        return None
    return _FROM_FLAG.get(option, option.lstrip("-").replace("-", "_"))


class InputError(Exception):
    """Bad input: says what is wrong (``message``) and where (the fields)."""

    def __init__(self, message: str, where: str | None = None, *, option: str | None = None,
                 detail: str | None = None, entry: str | None = None, key: str | None = None):
        super().__init__(message)
        self.message = message
        self.where = where
        self.option = option
        #: the message without any option wording, for front ends that name the option their way
        self.detail = detail if detail is not None else message
        #: a manifest entry's name and key, when a manifest value is at fault
        self.entry = entry
        self.key = key

    @property
    def option(self) -> str | None:
        """The Python API option whose value is at fault ("seed", "params", "top", ...)."""
        return self._option

    @option.setter
    def option(self, value: str | None) -> None:
        self._option = option_name(value)

    def __str__(self) -> str:
        """The plain wording: ``where: message`` (the API's own words; front ends reword)."""
        text = self.message
        if self.option and not self.where and self.message == self.detail:
            text = f"{self.option} {text}"
        return f"{self.where}: {text}" if self.where else text

    def for_command_line(self) -> str:
        """The one line the command line prints: the flag is named as the user typed it."""
        if self.option and not self.where and self.message == self.detail:
            return f"{FLAGS.get(self.option, '--' + self.option.replace('_', '-'))} {self.message}"
        return str(self)

    def located(self, where: str) -> "InputError":
        """The same error with a location prefixed (used when a caller knows the file)."""
        inner = f"{where}: {self.where}" if self.where else where
        err = type(self)(self.message, inner, option=self.option, detail=self.detail,
                         entry=self.entry, key=self.key)
        return err


class NetlistError(InputError):
    """A structural mistake in a netlist: loop, undriven net, double driver, bad op..."""


class SpecError(InputError):
    """A spec that cannot be parsed or does not fit the design."""


class InternalError(Exception):
    """A bug in this tool: reported as such (exit code 4), never as a verdict."""


class EngineDisagreement(InternalError):
    """Two complete engines reached opposite answers on the same check: a bug in this tool, never
    a verdict and never bad input. Carries both outcomes (``first``, ``second``)."""

    def __init__(self, first, second):
        super().__init__(f"engines disagree: {first.engine} says {first.status} "
                         f"({first.evidence}); {second.engine} says {second.status} "
                         f"({second.evidence})")
        self.first = first
        self.second = second
        self.outcomes = [first, second]


class InputNote(UserWarning):
    """Something a reader accepted but the user should know (an ignored directive or delay, a
    slang warning that could change meaning, an inout port treated as an input).

    Readers issue notes with ``warnings.warn(InputNote(message, where))``; the command line shows
    each one once on stderr as ``note: <where>: <what>``. Catch them with
    ``warnings.catch_warnings(record=True)`` and ``warnings.simplefilter("always", InputNote)``.
    """

    def __init__(self, message: str, where: str | None = None):
        super().__init__(message)
        self.message = message
        self.where = where

    def __str__(self) -> str:
        return f"{self.where}: {self.message}" if self.where else self.message
