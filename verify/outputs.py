"""Writing files the user asked for, without ever replacing a file the user wrote.

A report (JUnit XML, JSON or Markdown summary, VCD, DOT) may replace an earlier report of this tool:
its first bytes carry a mark saying so. Anything else that exists already (a design, a hand-written
file, an unrecognised report) is refused with a one-line error unless ``force`` is given. Files
are written to a temporary name beside the target and renamed, so a failed write leaves the old
file whole.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from verify.errors import InputError

#: text that this tool's own reports carry near their start
MARKS = ("adder-verify", "verify-run/1")


def written_by_us(path: Path) -> bool:
    try:
        with path.open("rb") as fh:
            head = fh.read(512).decode("utf-8", "replace")
    except OSError:
        return False
    return any(m in head for m in MARKS)


def write_text(path: str | Path, text: str, *, what: str = "file", force: bool = False,
               replace_reports: bool = False) -> Path:
    """Write ``text`` to ``path``; refuse to replace a file this tool did not write.

    ``replace_reports``: an existing file with this tool's mark may be replaced (reports);
    designs pass False, so even a file generated earlier is kept unless ``force``.
    """
    p = Path(path)
    if p.is_dir():
        raise InputError(f"is a folder; give a file name for the {what}", str(p))
    if p.exists() and not force and not (replace_reports and written_by_us(p)):
        hint = "" if replace_reports else " (use --force to replace it)"
        reason = "was not written by adder-verify" if replace_reports else "exists already"
        raise InputError(f"refusing to overwrite: the file {reason}{hint}", str(p))
    try:
        if p.parent != Path("") and not p.parent.exists():
            p.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", dir=str(p.parent or Path(".")))
        with os.fdopen(fd, "w", encoding="utf-8") as fh:
            fh.write(text)
        os.replace(tmp, p)
    except OSError as e:
        raise InputError(f"cannot write the {what}: {e.strerror or e}", str(p)) from None
    return p
