"""Writing files the user asked for, without ever replacing a file the user wrote.

A report (JUnit XML, JSON or Markdown summary, VCD, DOT, SVG) carries a mark in its first lines:
``adder-verify report (KIND)``, or for the JSON run summary its ``"format": "verify-run/1"``
line. A new report may replace an existing file only when that file carries the same mark, i.e.
it is an earlier report of the same kind. Anything else that exists already (a design, a README
that merely mentions the tool, a design this tool exported) is refused with a one-line error
unless ``force`` is given. Files are written to a temporary name beside the target and renamed,
so a failed write leaves the old file whole; the file gets the permissions the user's umask
gives a new file (normally 644), not the temporary file's private 600.
"""

from __future__ import annotations

import os
import re
import tempfile
from pathlib import Path

from verify.errors import InputError

#: a mark is a whole comment that opens one of the first lines (or the JSON summary's format
#: line): a file that merely mentions the words somewhere is not a report
_MARK = re.compile(r'^\s*(?:(?:<!--|//|\$comment|#)\s*adder-verify report \((?P<kind>[a-z]+)\)'
                   r'|adder-verify report \((?P<alone>[a-z]+)\)\s*$'
                   r'|"format": "(?P<json>verify-run/1)",?\s*$)')
_HEAD_LINES = 3


def report_mark(kind: str) -> str:
    """The mark a report of ``kind`` carries in one of its first lines."""
    return f"adder-verify report ({kind})"


def _mark_of(text: str) -> str | None:
    for line in text.splitlines()[:_HEAD_LINES]:
        m = _MARK.search(line)
        if m:
            return m["kind"] or m["alone"] or m["json"]
    return None


def _existing_mark(path: Path) -> str | None:
    try:
        with path.open("rb") as fh:
            head = fh.read(1024).decode("utf-8", "replace")
    except OSError:
        return None
    return _mark_of(head)


def can_write(path: str | Path, *, what: str = "file", force: bool = False,
              replace_reports: bool = False, kind: str | None = None) -> Path:
    """Raise InputError if ``path`` may not be written; call it before doing the work."""
    p = Path(path)
    if p.is_dir():
        raise InputError(f"is a folder; give a file name for the {what}", str(p))
    if p.exists() or p.is_symlink():
        if force:
            return p
        mark = _existing_mark(p) if replace_reports and p.is_file() and not p.is_symlink() else None
        if mark is None or (kind is not None and mark != kind):
            if replace_reports:
                raise InputError("refusing to overwrite: the file is not an earlier report of "
                                 f"this kind ({what}) written by adder-verify", str(p))
            raise InputError("refusing to overwrite: the file exists already (use --force to "
                             "replace it)", str(p))
    return p


def write_text(path: str | Path, text: str, *, what: str = "file", force: bool = False,
               replace_reports: bool = False) -> Path:
    """Write ``text`` to ``path``; refuse to replace a file this tool did not write.

    ``replace_reports``: the text is a report (it carries a mark, see the module text) and may
    replace an earlier report of the same kind. Designs pass False, so even a design generated
    earlier is kept unless ``force``.
    """
    kind = _mark_of(text) if replace_reports else None
    if replace_reports and kind is None:  # pragma: no cover - a writer without its mark
        raise ValueError(f"a report ({what}) must carry its mark in its first lines")
    p = can_write(path, what=what, force=force, replace_reports=replace_reports, kind=kind)
    return _write_atomically(p, text.encode("utf-8"), what)


def write_bytes(path: str | Path, data: bytes, *, what: str = "file", force: bool = False) -> Path:
    """Write binary ``data`` (a picture) to ``path``; an existing file is kept unless ``force``."""
    p = can_write(path, what=what, force=force)
    return _write_atomically(p, data, what)


def new_file_mode() -> int:
    """The permissions ``open()`` would give a new file under the user's umask (normally 644)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return 0o666 & ~mask


def _write_atomically(p: Path, data: bytes, what: str) -> Path:
    try:
        if p.parent != Path("") and not p.parent.exists():
            p.parent.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", dir=str(p.parent or Path(".")))
        try:
            with os.fdopen(fd, "wb") as fh:
                fh.write(data)
            os.chmod(tmp, new_file_mode())
            os.replace(tmp, p)
        except BaseException:
            if os.path.exists(tmp):
                os.unlink(tmp)
            raise
    except OSError as e:
        raise InputError(f"cannot write the {what}: {e.strerror or e}", str(p)) from None
    return p
