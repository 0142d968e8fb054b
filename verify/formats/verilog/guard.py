"""Checks on Verilog source files made before pyslang reads them.

pyslang (a C++ library) reads what it is given: a special file named in an ``include`` (a FIFO,
``/dev/zero``) would block it or exhaust memory, and some malformed inputs (thousands of
``module`` keywords without ``endmodule``) overflow its parser's stack and kill the process.
These checks scan the text first, cheaply, and refuse such input with a one-line error. They
also find what the notes need: Verilog-XL directives and which files set a `timescale.
"""

from __future__ import annotations

import os
import re
import stat
from dataclasses import dataclass, field
from pathlib import Path
from typing import Sequence

from verify.errors import InputError

MAX_FILE_BYTES = 512 * 1024 * 1024  # one source file
MAX_UNIT_NESTING = 64  # module/program declarations nested inside each other
MAX_INCLUDE_DEPTH = 64
# statements (counted as ';') in all sources together: translating one takes about 0.3 ms, so
# this bounds a load to about a minute and a half; an adder of 1,024 bits written gate by gate
# needs some 50,000
MAX_STATEMENTS = 250_000

# Verilog-XL and vendor directives that do not change the logic of a design (fault simulation,
# delay modes, protection and acceleration controls); slang is told to skip them
XL_DIRECTIVES = (
    "suppress_faults", "nosuppress_faults", "enable_portfaults", "disable_portfaults",
    "delay_mode_path", "delay_mode_unit", "delay_mode_zero", "delay_mode_distributed",
    "accelerate", "noaccelerate", "expand_vectornets", "noexpand_vectornets",
    "autoexpand_vectornets", "remove_gatenames", "noremove_gatenames", "remove_netnames",
    "noremove_netnames", "protect", "endprotect",
)

_COMMENT = re.compile(r"//[^\n]*|/\*.*?\*/", re.S)
_STRING = re.compile(r'"(?:\\.|[^"\\\n])*"')
_INCLUDE = re.compile(r'`include\s*(?:"([^"\n]*)"|<([^>\n]*)>)')
_UNIT = re.compile(r"\b(module|macromodule|program|endmodule|endprogram)\b")
_DIRECTIVE = re.compile(r"`(" + "|".join(XL_DIRECTIVES) + r")\b")
_TIMESCALE = re.compile(r"`timescale\b")


@dataclass
class SourceFacts:
    directives: dict[str, str] = field(default_factory=dict)  # directive -> first file:line
    timescale: list[str] = field(default_factory=list)  # files that set one
    statements: int = 0
    no_timescale: list[str] = field(default_factory=list)  # files with modules but none


def regular_file(path: Path, what: str = "design file") -> os.stat_result:
    """The file's status if it is a regular file, else an InputError (before anything reads it)."""
    try:
        st = os.stat(path)
    except OSError:
        raise InputError("no such file", str(path)) from None
    if stat.S_ISDIR(st.st_mode):
        raise InputError(f"is a folder, not a {what}", str(path))
    if not stat.S_ISREG(st.st_mode):
        raise InputError(f"not a regular file (a device, FIFO or socket): refused as a {what}",
                         str(path))
    if st.st_size > MAX_FILE_BYTES:
        raise InputError(f"{what} of {st.st_size:,} bytes: the limit is {MAX_FILE_BYTES:,}",
                         str(path))
    return st


def check_sources(paths: Sequence[Path], include_dirs: Sequence[str]) -> SourceFacts:
    """Scan each source and every file it includes; raise InputError on input pyslang must not
    be given. Returns what was found for the notes."""
    facts = SourceFacts()
    seen: set[str] = set()
    for p in paths:
        _scan(Path(p), include_dirs, facts, seen, 0)
    return facts


def _scan(path: Path, include_dirs: Sequence[str], facts: SourceFacts, seen: set[str],
          depth: int) -> None:
    regular_file(path)
    key = str(path.resolve())
    if key in seen:
        return
    seen.add(key)
    text = path.read_bytes().decode("latin-1")
    code = _COMMENT.sub(lambda m: "\n" * m.group(0).count("\n"), text)
    for m in _INCLUDE.finditer(code):
        name = m.group(1) if m.group(1) is not None else m.group(2)
        line = code.count("\n", 0, m.start()) + 1
        if depth >= MAX_INCLUDE_DEPTH:
            raise InputError(f"`include nested more than {MAX_INCLUDE_DEPTH} files deep",
                             f"{path}:{line}")
        target = _resolve_include(name, path, include_dirs)
        if target is None:
            continue  # slang reports a missing include itself, with its location
        try:
            st = os.stat(target)
        except OSError:
            continue
        if not stat.S_ISREG(st.st_mode):
            raise InputError(f"`include \"{name}\" names a special file (not a regular file): "
                             f"refused", f"{path}:{line}")
        _scan(target, include_dirs, facts, seen, depth + 1)
    code = _STRING.sub('""', code)
    facts.statements += code.count(";")
    if facts.statements > MAX_STATEMENTS:
        raise InputError(f"the sources hold more than {MAX_STATEMENTS:,} statements (counting "
                         f"';'); refused as too large to translate in reasonable time", str(path))
    nest = 0
    modules = False
    for m in _UNIT.finditer(code):
        if m.group(1).startswith("end"):
            nest = max(0, nest - 1)
            continue
        modules = True
        nest += 1
        if nest > MAX_UNIT_NESTING:
            line = code.count("\n", 0, m.start()) + 1
            raise InputError(f"module declarations nested more than {MAX_UNIT_NESTING} deep "
                             f"('{m.group(1)}' without its end keyword?)", f"{path}:{line}")
    for m in _DIRECTIVE.finditer(code):
        if m.group(1) not in facts.directives:
            facts.directives[m.group(1)] = f"{path}:{code.count(chr(10), 0, m.start()) + 1}"
    if _TIMESCALE.search(code):
        facts.timescale.append(str(path))
    elif modules:
        facts.no_timescale.append(str(path))


def _resolve_include(name: str, including: Path, include_dirs: Sequence[str]) -> Path | None:
    p = Path(name)
    if p.is_absolute():
        return p if os.path.lexists(p) else None
    for base in (including.parent, *map(Path, include_dirs)):
        q = base / p
        if os.path.lexists(q):
            return q
    return None


_UNIT_KINDS = ("ModuleDeclaration", "InterfaceDeclaration", "ProgramDeclaration",
               "PackageDeclaration", "UdpDeclaration")


def duplicate_definitions(trees, locator) -> None:
    """Refuse two definitions of one module (or primitive, interface, package) name, naming both
    places: slang would keep one of them without a word."""
    from pyslang import syntax
    kinds = {getattr(syntax.SyntaxKind, k) for k in _UNIT_KINDS}
    first: dict[str, str | None] = {}
    for tree in trees:
        for m in tree.root.members:
            if m.kind not in kinds:
                continue
            tok = m.name if m.kind == syntax.SyntaxKind.UdpDeclaration else m.header.name
            name = tok.valueText
            if not name:
                continue
            where = locator.where(tok.location)
            if name in first:
                raise InputError(f"'{name}' is defined twice: at {first[name] or '?'} and at "
                                 f"{where or '?'}; give each definition once", where)
            first[name] = where
