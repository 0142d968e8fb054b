"""Notes from the readers: issued through Python's ``warnings`` with ``verify.errors.InputNote``.

``note(message, where)`` issues one. ``collect()`` is a context manager that records every note
issued inside it (each distinct one once) into the list it yields, for callers that print them
(the command line, on stderr) or test them.
"""

from __future__ import annotations

import contextlib
import warnings
from typing import Iterator

from verify.errors import InputNote


def note(message: str, where: str | None = None) -> None:
    warnings.warn(InputNote(message, where), stacklevel=2)


@contextlib.contextmanager
def collect() -> Iterator[list[InputNote]]:
    """Record notes issued inside the block, each distinct one once, in order."""
    out: list[InputNote] = []
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", InputNote)
        try:
            yield out
        finally:
            seen = set()
            for w in caught:
                if isinstance(w.message, InputNote):
                    key = str(w.message)
                    if key not in seen:
                        seen.add(key)
                        out.append(w.message)
                else:  # anything else goes on as it would have
                    warnings.warn_explicit(w.message, w.category, w.filename, w.lineno)
