"""The manifest (``verify.toml``): its keys, their checks and the typed entries they give.

Every mistake is an InputError naming the manifest line, the entry and the key; keys of earlier
versions are refused with the key that replaced them. ``verify.manifest.runner`` runs what this
module reads.
"""

from __future__ import annotations

import itertools
import re
import tomllib as _toml
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Sequence

from verify.errors import InputError

MANIFEST_NAME = "verify.toml"
from verify.check import ENGINE_NAMES as ENGINES  # noqa: E402 - one list of engine names
REQUIRES = ("complete", "tested")
DEFAULT_TIMEOUT = 60.0
KEYS = ("name", "sources", "spec", "top", "params", "require", "method", "time_limit",
        "deliberately_broken", "include_dirs", "defines", "cells", "seed", "vectors",
        "exhaustive_limit", "settle_within", "delays", "strength", "cross_check")
REQUIRED = ("name", "sources", "spec")
#: keys of earlier versions, refused with the key that replaced them
RENAMED = {"files": ("sources", 'sources = ["rtl/adder.sv"]'),
           "engine": ("method", 'method = "auto"'),
           "timeout": ("time_limit", "time_limit = 120"),
           "expect": ("deliberately_broken", "deliberately_broken = true")}
_VERILOG = (".v", ".sv", ".vh", ".svh")


# ---- the manifest -----------------------------------------------------------------------------

@dataclass(frozen=True)
class Entry:
    """One ``[[design]]`` table, checked and with defaults filled in."""

    name: str
    sources: tuple[str, ...]
    spec: str
    top: str | None = None
    params: tuple[tuple[str, tuple[int, ...]], ...] = ()
    require: str = "complete"
    method: str = "auto"
    time_limit: float = DEFAULT_TIMEOUT
    deliberately_broken: bool = False
    include_dirs: tuple[str, ...] = ()
    cells: tuple[str, ...] = ()
    defines: tuple[tuple[str, str | None], ...] = ()
    seed: int = 1
    vectors: int | None = None
    exhaustive_limit: int | None = None
    #: prove every output settled by this time (verify.timing), under ``delays`` (a TOML path)
    settle_within: float | None = None
    delays: str | None = None
    delays_hash: str | None = None
    strength: int | None = None  # faults injected to estimate a sample's strength
    #: two independent complete engines must agree before a complete verdict
    cross_check: bool = False
    #: where the entry starts, "verify.toml:12", for messages
    where: str = ""
    #: where each key of the entry is written, (("spec", "verify.toml:14"), ...), for messages
    key_where: tuple[tuple[str, str], ...] = ()

    def where_key(self, key: str) -> str:
        """The manifest line of ``key`` in this entry (the entry's first line if not written)."""
        return dict(self.key_where).get(key) or self.where

    def points(self) -> list[dict[str, int]]:
        """Every parameter combination, in manifest order ([{}] when there are no parameters)."""
        names = [n for n, _ in self.params]
        combos = itertools.product(*(vals for _, vals in self.params))
        return [dict(zip(names, c)) for c in combos] or [{}]

    def options(self) -> dict[str, Any]:
        """The options that decide the outcome (part of the cache key)."""
        return {"method": self.method, "require": self.require, "time_limit": self.time_limit,
                "seed": self.seed, "vectors": self.vectors,
                "exhaustive_limit": self.exhaustive_limit, "top": self.top,
                "include_dirs": list(self.include_dirs), "defines": dict(self.defines),
                "cells": list(self.cells), "strength": self.strength,
                "cross_check": self.cross_check,
                **({"settle_within": self.settle_within, "delays": self.delays,
                    "delays_hash": self.delays_hash} if self.settle_within is not None else {})}


@dataclass(frozen=True)
class Manifest:
    path: Path
    entries: tuple[Entry, ...]

    @property
    def root(self) -> Path:
        return self.path.parent


def _lines(text: str) -> tuple[list[int], list[str]]:
    """Line numbers (1-based) of each ``[[design]]`` header, and the text's lines."""
    lines = text.splitlines()
    heads = [i + 1 for i, line in enumerate(lines) if re.match(r"\s*\[\[\s*design\s*\]\]", line)]
    return heads, lines


def _key_line(lines: list[str], start: int, end: int, key: str) -> int | None:
    pat = re.compile(rf"\s*(\"?){re.escape(key)}\1\s*=")
    for n in range(start, min(end, len(lines) + 1)):
        if pat.match(lines[n - 1]):
            return n
    return None


def load_manifest(path: str | Path | None = None) -> Manifest:
    """Read and check a manifest; every mistake is an InputError naming the entry and the key."""
    path = Path(path) if path is not None else Path(MANIFEST_NAME)
    if path.is_dir():
        path = path / MANIFEST_NAME
    if not path.is_file():
        raise InputError("no such manifest (write a verify.toml, or give its path)", str(path))
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as e:
        raise InputError(f"cannot read the manifest: {e}", str(path)) from None
    try:
        data = _toml.loads(text)
    except RecursionError:  # the TOML reader recurses once a nested array or table
        raise InputError("arrays or tables nested too deep to read", str(path)) from None
    except _toml.TOMLDecodeError as e:
        msg = str(e)
        m = re.search(r"\(at line (\d+), column (\d+)\)", msg)
        where = f"{path}:{m.group(1)}:{m.group(2)}" if m else str(path)
        if not m and "(at end of document)" in msg:
            where = f"{path}:{len(text.splitlines()) or 1}"
            msg = msg.replace("(at end of document)", "(at the end of the file)")
        msg = re.sub(r"\s*\(at line \d+, column \d+\)", "", msg)
        raise InputError(f"not valid TOML: {msg}", where) from None
    heads, lines = _lines(text)
    for key in data:
        if key != "design":
            raise InputError(f"unknown top-level key '{key}' (a manifest holds [[design]] tables)",
                             str(path))
    designs = data.get("design")
    if designs is None:
        raise InputError("no [[design]] entries", str(path))
    if not isinstance(designs, list) or not all(isinstance(d, dict) for d in designs):
        raise InputError("'design' must be a list of tables: write each one as [[design]]", str(path))
    if not designs:
        raise InputError("no [[design]] entries", str(path))
    entries: list[Entry] = []
    seen: dict[str, str] = {}
    for i, table in enumerate(designs):
        start = heads[i] if i < len(heads) else 0
        end = heads[i + 1] if i + 1 < len(heads) else len(lines) + 1
        entry = _entry(table, i, path, lines, start, end)
        if entry.name in seen:
            raise InputError(f"design '{entry.name}': the name is used twice (first at "
                             f"{seen[entry.name]}); names must be unique", entry.where)
        seen[entry.name] = entry.where
        entries.append(entry)
    return Manifest(path, tuple(entries))


def _entry(table: dict, index: int, path: Path, lines: list[str], start: int, end: int) -> Entry:
    where = f"{path}:{start}" if start else str(path)
    label = f"design '{table['name']}'" if isinstance(table.get("name"), str) and table["name"] \
        else f"design #{index + 1}"

    def bad(key: str, msg: str) -> InputError:
        n = _key_line(lines, start, end, key) if start else None
        return InputError(f"{label}: key '{key}': {msg}", f"{path}:{n}" if n else where)

    for key in table:
        if key in RENAMED and key not in KEYS:
            new, example = RENAMED[key]
            raise bad(key, f"this key is now called '{new}': write {example}")
        if key not in KEYS:
            close = [k for k in KEYS if _similar(k, key)]
            hint = f" (did you mean '{close[0]}'?)" if close else f" (known keys: {', '.join(KEYS)})"
            raise bad(key, f"unknown key{hint}")
    for key in REQUIRED:
        if key not in table:
            raise InputError(f"{label}: the key '{key}' is required", where)

    name = table["name"]
    if not isinstance(name, str) or not name.strip():
        raise bad("name", "must be a non-empty string")
    if any(c in name for c in "\n\r\t"):
        raise bad("name", "must be on one line")

    files = table["sources"]
    if isinstance(files, str):
        raise bad("sources", f'must be a list of paths, e.g. sources = ["{files}"]')
    if not isinstance(files, list) or not files or not all(isinstance(f, str) and f.strip() for f in files):
        raise bad("sources", "must be a non-empty list of paths")
    root = path.parent
    for f in files:
        p = root / f
        if not p.is_file():
            raise bad("sources", f"no such file '{f}' (paths are relative to the manifest's folder)")
        if p.suffix not in (".json", *_VERILOG):
            raise bad("sources", f"'{f}': unknown design format (expected .json, .v or .sv)")
    kinds = {Path(f).suffix == ".json" for f in files}
    if kinds == {True} and len(files) > 1:
        raise bad("sources", "give one JSON netlist per entry")
    if len(kinds) > 1:
        raise bad("sources", "give either one JSON netlist or Verilog files, not both")
    is_json = kinds == {True}

    spec = table["spec"]
    if not isinstance(spec, str) or not spec.strip():
        raise bad("spec", 'must be a non-empty string, e.g. "{cout, sum} = a + b + cin"')

    def choice(key: str, allowed: Sequence[str], default: str) -> str:
        v = table.get(key, default)
        if v not in allowed:
            raise bad(key, f"{v!r} is not one of {', '.join(map(repr, allowed))}")
        return v

    def whole(key: str, lo: int, hi: int | None = None) -> int | None:
        if key not in table:
            return None
        v = table[key]
        if isinstance(v, bool) or not isinstance(v, int):
            raise bad(key, f"must be a whole number, got {v!r}")
        if v < lo or (hi is not None and v > hi):
            rng = f"from {lo} to {hi}" if hi is not None else f"at least {lo}"
            raise bad(key, f"must be {rng}, got {v}")
        return v

    top = table.get("top")
    if top is not None and (not isinstance(top, str) or not top.strip()):
        raise bad("top", "must be a module name")

    params_in = table.get("params", {})
    if not isinstance(params_in, dict):
        raise bad("params", "must be a table, e.g. params = { W = [16, 32] }")
    params: list[tuple[str, tuple[int, ...]]] = []
    for pname, val in params_in.items():
        vals = val if isinstance(val, list) else [val]
        if not vals:
            raise bad("params", f"parameter '{pname}' has an empty list of values")
        for v in vals:
            if isinstance(v, bool) or not isinstance(v, int):
                raise bad("params", f"parameter '{pname}': {v!r} is not a whole number")
        if len(set(vals)) != len(vals):
            raise bad("params", f"parameter '{pname}' lists a value twice")
        params.append((pname, tuple(vals)))

    def paths(key: str, kind: str, exists, example: str, where_hint: str = "") -> list[str]:
        """A key holding a list of paths beside the manifest, each of which must exist."""
        given = table.get(key, [])
        if not isinstance(given, list) or not all(isinstance(x, str) and x for x in given):
            raise bad(key, f"must be a list of {kind}s{example}")
        for x in given:
            if not exists(root / x):
                raise bad(key, f"no such {kind} '{x}'{where_hint}")
        return given

    include_dirs = paths("include_dirs", "folder", Path.is_dir, "")

    defines_in = table.get("defines", {})
    if not isinstance(defines_in, dict):
        raise bad("defines", 'must be a table, e.g. defines = { FAST = "1" }')
    defines: list[tuple[str, str | None]] = []
    for dname, val in defines_in.items():
        if val is True:
            defines.append((dname, None))
        elif isinstance(val, str) or (isinstance(val, int) and not isinstance(val, bool)):
            defines.append((dname, str(val)))
        else:
            raise bad("defines", f"'{dname}': give a string, a number or true")

    cells = paths("cells", "Liberty file", Path.is_file, ', e.g. cells = ["lib/cells.lib"]',
                  " (paths are relative to the manifest's folder)")

    if is_json and (top or params or include_dirs or defines or cells):
        used = [k for k in ("top", "params", "include_dirs", "defines", "cells") if table.get(k)]
        raise bad(used[0], "applies to Verilog files only; this entry is a JSON netlist")

    timeout = table.get("time_limit", DEFAULT_TIMEOUT)
    if isinstance(timeout, bool) or not isinstance(timeout, (int, float)) or not timeout > 0:
        raise bad("time_limit", f"must be a positive number of seconds, got {timeout!r}")
    broken = table.get("deliberately_broken", False)
    if not isinstance(broken, bool):
        raise bad("deliberately_broken", f"must be true or false, got {broken!r}")

    seed = whole("seed", 0)
    settle, delays, delays_hash = _settle_keys(table, path, bad)
    cross_check = table.get("cross_check", False)
    if not isinstance(cross_check, bool):
        raise bad("cross_check", f"must be true or false, got {cross_check!r}")
    key_where = []
    for key in table:
        n = _key_line(lines, start, end, key) if start else None
        if n:
            key_where.append((key, f"{path}:{n}"))
    return Entry(
        name=name, sources=tuple(files), spec=spec, top=top, params=tuple(params),
        require=choice("require", REQUIRES, "complete"), method=choice("method", ENGINES, "auto"),
        time_limit=float(timeout), deliberately_broken=broken,
        include_dirs=tuple(include_dirs), defines=tuple(defines), cells=tuple(cells),
        seed=1 if seed is None else seed, vectors=whole("vectors", 1),
        exhaustive_limit=whole("exhaustive_limit", 1, 40), where=where,
        key_where=tuple(key_where), settle_within=settle, delays=delays, delays_hash=delays_hash,
        strength=whole("strength", 1, 100_000), cross_check=cross_check)



def _settle_keys(table: dict, path: Path, bad) -> tuple:
    """A manifest entry's ``settle_within`` (a time >= 0) and ``delays`` ('unit' or a TOML file
    beside the manifest at ``path``): (time, delays, sha256 of the table); ``bad(key, message)``
    makes the manifest's InputError."""
    import hashlib
    settle, delays = table.get("settle_within"), table.get("delays")
    if settle is not None and (isinstance(settle, bool) or not isinstance(settle, (int, float))
                               or not settle >= 0):
        raise bad("settle_within", f"must be a time >= 0 in the delay model's unit, got {settle!r}")
    if delays is not None and (not isinstance(delays, str) or not delays.strip()):
        raise bad("delays", f"give 'unit' or the path of a TOML delay table, got {delays!r}")
    if delays is not None and settle is None:
        raise bad("delays", "applies with settle_within only")
    digest = None
    if delays is not None and delays.strip().lower() != "unit":
        f = path.parent / delays
        if not f.is_file():
            raise bad("delays", f"'{delays}': no such file")
        digest = hashlib.sha256(f.read_bytes()).hexdigest()
    return (None if settle is None else float(settle)), delays, digest


def _similar(a: str, b: str) -> bool:
    """Close spellings (one edit apart, or the same letters swapped)."""
    if a == b:
        return True
    if sorted(a) == sorted(b):
        return True
    if abs(len(a) - len(b)) > 1:
        return False
    if len(a) == len(b):
        return sum(x != y for x, y in zip(a, b)) == 1
    short, long_ = sorted((a, b), key=len)
    return any(long_[:i] + long_[i + 1:] == short for i in range(len(long_)))
