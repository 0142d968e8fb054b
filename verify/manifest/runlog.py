"""The run log: one JSON line per check in ``<log dir>/runs.jsonl``."""

from __future__ import annotations

import datetime as _dt
import hashlib
import json
from pathlib import Path
from typing import Iterable

from verify import __version__
from verify.model.result import CheckResult


def file_hashes(paths: Iterable[str | Path]) -> dict[str, str]:
    out = {}
    for p in paths:
        try:
            out[str(p)] = hashlib.sha256(Path(p).read_bytes()).hexdigest()
        except OSError:
            continue
    return out


def record(result: CheckResult, log_dir: str | Path, files: Iterable[str | Path] = (),
           params: dict | None = None) -> Path:
    """Append one line describing ``result``; returns the log file's path."""
    folder = Path(log_dir)
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / "runs.jsonl"
    line = {
        "time": _dt.datetime.now(_dt.timezone.utc).isoformat(timespec="seconds"),
        "tool_version": __version__,
        "design": result.design,
        "design_hash": result.design_hash,
        "files": file_hashes(files),
        "params": params or {},
        "spec": result.spec,
        "spec_inferred": result.spec_inferred,
        "verdict": result.verdict.value,
        "ok": result.ok,
        "seconds": round(result.seconds, 6),
        "engines": [{"engine": e.engine, "status": e.status, "seconds": round(e.seconds, 6),
                     "vectors": e.vectors} for e in result.engines],
        "counterexample": result.counterexample.to_json() if result.counterexample else None,
    }
    with path.open("a", encoding="utf-8") as fh:
        fh.write(json.dumps(line, sort_keys=True) + "\n")
    return path


def read(log_dir: str | Path) -> list[dict]:
    path = Path(log_dir) / "runs.jsonl"
    if not path.exists():
        return []
    return [json.loads(line) for line in path.read_text(encoding="utf-8").splitlines() if line.strip()]
