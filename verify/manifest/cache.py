"""The result cache of ``adder-verify run``: a definite verdict, kept until anything it rests on changes.

A cache key is the sha256 of one canonical JSON text holding:

* the sha256 of the content of every file the design is read from (the listed files, and for
  Verilog every file it includes, found by following `` `include "..." `` directives through the
  including file's folder and the include folders, plus every file under the include folders),
* the parameter values, the spec text, the options that decide the outcome (engine, require,
  timeout, seed, vectors, exhaustive limit, top, include folders, defines),
* the tool build: its version, a hash of its own source files, and the versions of z3, pyslang and numpy (a record made by any other build never matches).

Each stored record also lists the files and their hashes; a lookup re-hashes them and ignores a
record whose files changed (so a stale record is never reported even if two keys collided).

Only definite verdicts are stored: ``proven``, ``exhaustive`` and ``fail`` (a counterexample that
was re-simulated on the design and re-evaluated on the spec). ``tested``, ``undecided`` and
errors are always run again. Records live one JSON file per key in ``.verify-cache/`` next to the
manifest; deleting the folder is always safe.
"""

from __future__ import annotations

import functools
import hashlib
import json
import os
import re
import tempfile
from pathlib import Path
from typing import Any, Iterable, Mapping, Sequence

from verify import __version__
from verify.files import new_file_mode

#: verdicts worth keeping: an engine established them, and they do not depend on luck or time
CACHEABLE = ("proven", "exhaustive", "fail")
#: the folder, next to the manifest, where records are kept
CACHE_DIR = ".verify-cache"
#: bump when the record layout changes
RECORD_FORMAT = 1

_VERILOG = (".v", ".sv", ".vh", ".svh")
_INCLUDE = re.compile(r'`include\s+"([^"\n]+)"')


def sha256_file(path: str | Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 16), b""):
            h.update(block)
    return h.hexdigest()


def dependencies(files: Sequence[str | Path], include_dirs: Sequence[str | Path] = ()) -> list[Path]:
    """Every file a design read from ``files`` may depend on, in a stable order.

    The listed files; for Verilog, the targets of `` `include "..." `` found by following the
    directives (resolved like the preprocessor does: the including file's folder first, then the
    include folders), and every file under the include folders (a conservative extra: an include
    spelled through a macro is still covered). Targets that do not exist are left out; the reader
    reports them.
    """
    seen: dict[Path, None] = {}
    todo = [Path(f) for f in files]
    while todo:
        p = todo.pop(0)
        key = p.resolve()
        if key in seen or not p.is_file():
            continue
        seen[key] = None
        if p.suffix not in _VERILOG:
            continue
        try:
            text = p.read_text(encoding="utf-8", errors="replace")
        except OSError:
            continue
        for name in _INCLUDE.findall(text):
            for folder in (p.parent, *map(Path, include_dirs)):
                cand = folder / name
                if cand.is_file():
                    todo.append(cand)
                    break
    for d in include_dirs:
        d = Path(d)
        if d.is_dir():
            for f in sorted(d.rglob("*")):
                if f.is_file() and not any(part.startswith(".") for part in f.relative_to(d).parts):
                    seen.setdefault(f.resolve(), None)
    return list(seen)


def file_hashes(paths: Iterable[Path], root: str | Path | None = None) -> dict[str, str]:
    """{path (relative to root where possible, / separated): sha256}."""
    out = {}
    base = Path(root).resolve() if root is not None else None
    for p in paths:
        name = str(p)
        if base is not None:
            try:
                name = Path(p).resolve().relative_to(base).as_posix()
            except ValueError:
                name = Path(p).resolve().as_posix()
        out[name] = sha256_file(p)
    return dict(sorted(out.items()))


@functools.lru_cache(maxsize=1)
def tool_build() -> str:
    """The tool as it runs now: its version, a hash of every source file of the package, and the
    versions of the libraries a verdict rests on (z3, pyslang, numpy). A record made by any other
    build, an older release or a locally patched checkout, never matches."""
    from importlib import metadata

    package = Path(__file__).resolve().parent
    digest = hashlib.sha256()
    for src in sorted(package.rglob("*.py")):
        digest.update(src.relative_to(package).as_posix().encode() + b"\0")
        digest.update(src.read_bytes() + b"\0")
    libs = []
    for dist in ("z3-solver", "pyslang", "numpy"):
        try:
            libs.append(f"{dist}={metadata.version(dist)}")
        except metadata.PackageNotFoundError:  # pragma: no cover - all are dependencies
            libs.append(f"{dist}=none")
    return f"{__version__}+{digest.hexdigest()[:16]} ({', '.join(libs)})"


def make_key(files: Mapping[str, str], params: Mapping[str, int], spec: str,
             options: Mapping[str, Any], version: str | None = None) -> str:
    """The cache key: sha256 over everything the verdict rests on (see the module text)."""
    canon = {"format": RECORD_FORMAT, "tool_version": version or tool_build(), "files": dict(sorted(files.items())),
             "params": dict(sorted(params.items())), "spec": spec,
             "options": dict(sorted(options.items()))}
    text = json.dumps(canon, sort_keys=True, separators=(",", ":"), default=str)
    return hashlib.sha256(text.encode()).hexdigest()


class Cache:
    """Records in one folder, one ``<key>.json`` each. Writes are atomic (write, then rename)."""

    def __init__(self, folder: str | Path):
        self.folder = Path(folder)
        self.hits = 0
        self.misses = 0

    def _path(self, key: str) -> Path:
        if not re.fullmatch(r"[0-9a-f]{64}", key):
            raise ValueError(f"not a cache key: {key!r}")
        return self.folder / f"{key}.json"

    def get(self, key: str, root: str | Path | None = None) -> dict | None:
        """The stored record for ``key``, or None (missing, unreadable, or its files changed)."""
        path = self._path(key)
        try:
            record = json.loads(path.read_text(encoding="utf-8"))
        except (OSError, ValueError):
            self.misses += 1
            return None
        if (not isinstance(record, dict) or record.get("format") != RECORD_FORMAT
                or record.get("key") != key or record.get("tool_version") != tool_build()
                or not self._files_unchanged(record.get("files", {}), root)):
            self.misses += 1
            return None
        self.hits += 1
        return record

    @staticmethod
    def _files_unchanged(files: Mapping[str, str], root: str | Path | None) -> bool:
        base = Path(root) if root is not None else Path(".")
        for name, digest in files.items():
            p = Path(name) if Path(name).is_absolute() else base / name
            try:
                if sha256_file(p) != digest:
                    return False
            except OSError:
                return False
        return True

    def put(self, key: str, files: Mapping[str, str], result: Mapping[str, Any]) -> bool:
        """Store ``result`` (a record's payload) when its verdict is definite; True if stored."""
        if result.get("verdict") not in CACHEABLE:
            return False
        record = {"format": RECORD_FORMAT, "key": key, "tool_version": tool_build(),
                  "files": dict(files), "result": dict(result)}
        self.folder.mkdir(parents=True, exist_ok=True)
        gitignore = self.folder / ".gitignore"
        if not gitignore.exists():
            try:
                gitignore.write_text("# written by adder-verify run: the result cache is never committed\n*\n",
                                     encoding="utf-8")
            except OSError:
                pass
        fd, tmp = tempfile.mkstemp(dir=self.folder, prefix=".tmp-", suffix=".json")
        try:
            with os.fdopen(fd, "w", encoding="utf-8") as fh:
                json.dump(record, fh, sort_keys=True)
            os.chmod(tmp, new_file_mode())
            os.replace(tmp, self._path(key))
        except BaseException:
            try:
                os.unlink(tmp)
            except OSError:
                pass
            raise
        return True

    def clear(self) -> int:
        """Delete every record; returns how many were deleted."""
        n = 0
        if self.folder.is_dir():
            for p in self.folder.glob("*.json"):
                p.unlink()
                n += 1
        return n
