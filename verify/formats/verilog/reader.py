"""Verilog / SystemVerilog reader: pyslang parses and elaborates, verilog_translate makes gates.

``load(paths, top=, params=, include_dirs=, defines=)`` returns a validated ``Netlist`` whose ports
are the top module's ports. Bit 0 of a port is the least significant bit of its value, i.e. the
*right-hand* index of the declared range: for ``input [7:0] a`` bit 0 is ``a[0]``, for
``input [0:7] a`` bit 0 is ``a[7]`` (Verilog's own reading of the vector as a number).

Syntax trees are parsed once per (files, defines, include folders) and reused while the files are
unchanged, so a width sweep (the same files with ``params`` W=8, 16, 32...) only re-elaborates.
"""

from __future__ import annotations

import os
import re
from pathlib import Path
from typing import Mapping, Sequence

from verify.errors import InputError
from verify.formats.notes import note
from verify.formats.verilog.guard import XL_DIRECTIVES, check_sources, duplicate_definitions
from verify.model.netlist import Netlist

_TREE_CACHE: dict[tuple, list] = {}
_TREE_CACHE_MAX = 16


def _import_pyslang():
    try:
        import pyslang  # noqa: F401
    except ImportError:  # pragma: no cover - pyslang is a dependency
        raise InputError("reading Verilog needs the pyslang package (pip install pyslang)") from None
    return pyslang


def _file_key(paths: Sequence[Path]) -> tuple:
    key = []
    for p in paths:
        try:
            st = p.stat()
        except OSError:
            raise InputError("no such file", str(p)) from None
        key.append((str(p.resolve()), st.st_mtime_ns, st.st_size))
    return tuple(key)


def _define_strings(defines: Mapping[str, str | None]) -> list[str]:
    out = []
    for name, value in defines.items():
        if not name or not (name[0].isalpha() or name[0] == "_") or \
                not all(c.isalnum() or c in "_$" for c in name):
            what = "a Verilog identifier: a letter or _, then letters, digits, _ or $"
            raise option_error(f"-D {name!r}: not a macro name ({what})", None, option="-D",
                               detail=f"{name!r} is not a macro name ({what})")
        out.append(name if value is None else f"{name}={value}")
    return out


def option_error(message: str, where: str | None, *, option: str, detail: str) -> InputError:
    """An error in the value of a reader option (``--top``, ``--param``, ``-D``, ``-I``).

    ``message`` speaks in command-line terms; the error also carries ``option`` and ``detail``
    (what is wrong, naming no option and no design file location) so that a caller that took the
    value from elsewhere, a manifest key, can say it in its own terms.
    """
    err = InputError(message, where)
    err.option, err.detail = option, detail  # type: ignore[attr-defined]
    return err


def _parse(pyslang, paths: Sequence[Path], include_dirs: Sequence[str],
           defines: Mapping[str, str | None], cells: Sequence[Path] = ()):
    """(source manager, syntax trees, {cell: why refused}), cached while the files and options
    are unchanged. ``cells``: Liberty files whose cells become Verilog modules."""
    for d in include_dirs:
        if not Path(d).is_dir():
            raise option_error("include folder does not exist", f"-I {d}", option="-I",
                               detail=f"include folder '{d}' does not exist")
    key = (_file_key(paths), _file_key(cells), tuple(str(Path(d).resolve()) for d in include_dirs),
           tuple(sorted((k, v) for k, v in defines.items())))
    hit = _TREE_CACHE.get(key)
    if hit is not None and _deps_unchanged(hit[2]):
        return hit[0], hit[1], hit[3]
    from pyslang import parsing, syntax
    sm = pyslang.SourceManager()
    pp = parsing.PreprocessorOptions()
    pp.predefines = _define_strings(defines)
    pp.additionalIncludePaths = [str(Path(d)) for d in include_dirs]
    pp.ignoreDirectives = set(XL_DIRECTIVES)
    bag = pyslang.Bag([pp])
    trees = []
    for p in paths:
        try:
            trees.append(syntax.SyntaxTree.fromFile(str(p), sm, bag))
        except Exception as e:  # pyslang raises plain exceptions for unreadable files
            raise InputError(f"cannot read the file: {e}", str(p)) from None
    _TREE_CACHE.pop(key, None)
    if len(_TREE_CACHE) >= _TREE_CACHE_MAX:
        _TREE_CACHE.pop(next(iter(_TREE_CACHE)))
    refused: dict[str, str] = {}
    for lib_path in cells:
        from verify.formats.liberty import read_liberty, verilog_models
        lib = read_liberty(lib_path)
        text, why = verilog_models(lib)
        refused.update(why)
        tree = syntax.SyntaxTree.fromText(text, sm, f"{lib_path} (cell models)", "", bag)
        trees.append(tree)
        refused[_GENERATED + str(_buffer_id(tree.root.sourceRange.start.buffer))] = str(lib_path)
    _TREE_CACHE[key] = [sm, trees, _dependencies(sm), refused]
    return sm, trees, refused


def _dependencies(sm) -> list[tuple[str, int, int]]:
    """Every file the parse read (the sources and their `include files), with mtime and size."""
    deps = []
    for buf in sm.getAllBuffers():
        try:
            path = str(sm.getFullPath(buf))
            st = os.stat(path)
        except (OSError, ValueError):
            continue
        if os.path.isfile(path):
            deps.append((path, st.st_mtime_ns, st.st_size))
    return deps


def _deps_unchanged(deps) -> bool:
    for path, mtime, size in deps:
        try:
            st = os.stat(path)
        except OSError:
            return False
        if st.st_mtime_ns != mtime or st.st_size != size:
            return False
    return True


_GENERATED = "\0buffer:"  # key prefix, in the refused-cells map, of generated cell-model buffers


def _buffer_id(buf) -> int:
    return buf.id if hasattr(buf, "id") else hash(buf)


class Locator:
    """Source locations as ``file:line:col`` using the paths the user gave."""

    def __init__(self, sm, paths: Sequence[Path], generated: dict[int, str] | None = None):
        self.sm = sm
        self.names = {str(p.resolve()): str(p) for p in paths}
        # text made from a Liberty file (its `line directives give the lines): that file's name
        self._cache: dict[int, str] = dict(generated or {})
        self.generated = set(generated or {})

    def is_library_cell(self, definition) -> bool:
        """Whether a module definition was made from a Liberty cell (``--cells``)."""
        try:
            return _buffer_id(definition.location.buffer) in self.generated
        except Exception:  # pragma: no cover - a definition without a location
            return False

    def file(self, loc) -> str:
        buf = loc.buffer
        bid = _buffer_id(buf)
        name = self._cache.get(bid)
        if name is None:
            try:
                full = str(self.sm.getFullPath(buf))
            except Exception:  # pragma: no cover - macro buffers and the like
                full = str(self.sm.getFileName(loc))
            if not full:
                full = str(self.sm.getFileName(loc)) or "<verilog>"
            name = self.names.get(str(Path(full).resolve()) if full and not full.startswith("<")
                                  else full, full)
            if name == full and full.startswith(os.getcwd() + os.sep):
                name = os.path.relpath(full)
            self._cache[bid] = name
        return name

    def where(self, loc) -> str | None:
        if loc is None:
            return None
        try:
            loc = self.sm.getFullyOriginalLoc(loc)
            line = self.sm.getLineNumber(loc)
            if line == 0:
                return None
            return f"{self.file(loc)}:{line}:{self.sm.getColumnNumber(loc)}"
        except Exception:  # pragma: no cover - a location pyslang cannot map
            return None

    def line(self, loc) -> str | None:
        w = self.where(loc)
        return w.rsplit(":", 1)[0] if w else None


# slang errors about delays only: this tool ignores time, so a `timescale in one file and not in
# another does not matter
_TIME_ONLY = ("MissingTimeScale", "MismatchedTimeScales", "TimeScaleFirstInScope")
# slang warnings that can change what a design means: shown as notes, once each
_MEANINGFUL = {"WidthTruncate": None, "PortWidthTruncate": None, "PortWidthExpand": None,
               "ImplicitNet": None, "UnconnectedInputPort": None, "UnconnectedInOutPort": None,
               "UnconnectedOutputPort": None, "UnconnectedUnnamedPort": None}


def _diagnostics(pyslang, comp, sm, locator: Locator) -> None:
    """Raise the first error slang reports (with a count of the rest); meaningful warnings
    become notes; errors about time scales only become one note."""
    engine = pyslang.DiagnosticEngine(sm)
    time_only = {getattr(pyslang.Diags, n) for n in _TIME_ONLY if hasattr(pyslang.Diags, n)}
    meaningful = {getattr(pyslang.Diags, n) for n in _MEANINGFUL if hasattr(pyslang.Diags, n)}
    errors = []
    timescale_at = None
    for d in comp.getAllDiagnostics():
        if d.code in time_only:
            timescale_at = timescale_at or locator.where(d.location) or "?"
            continue
        sev = engine.getSeverity(d.code, d.location)
        if sev in (pyslang.DiagnosticSeverity.Error, pyslang.DiagnosticSeverity.Fatal) or d.isError():
            errors.append(d)
        elif d.code in meaningful:
            note(f"warning from the Verilog front end: {engine.formatMessage(d)}",
                 locator.line(d.location))
    if timescale_at and not errors:
        note("`timescale is set in some files and not in others; delays are ignored (only the "
             "logic is checked), so this does not matter here", timescale_at)
    if not errors:
        return
    d = errors[0]
    msg = engine.formatMessage(d)
    more = len(errors) - 1
    if more:
        msg += f" (and {more} more error{'s' if more > 1 else ''})"
    raise InputError(msg, locator.where(d.location) or locator.names.get(next(iter(locator.names)), None))


_IDENT = re.compile(r"[A-Za-z_][A-Za-z0-9_$]*(::[A-Za-z_][A-Za-z0-9_$]*)?\Z")


def _elaborate(pyslang, trees, top: str | None, params: Mapping[str, int | str]):
    """A compilation with the parameter overrides: a whole number; a name (an enum member, or
    for a string parameter its text); a text in double quotes, or any other text, as a string."""
    from pyslang import ast
    opts = ast.CompilationOptions()
    if top:
        opts.topModules = {top}
    overrides = []
    string_params = None
    for name, value in params.items():
        if isinstance(value, bool) or not isinstance(value, (int, str)):
            what = "a whole number, an enum member or a string"
            raise option_error(f"--param {name}: value must be {what}, got {value!r}",
                               None, option="--param",
                               detail=f"'{name}': value must be {what}, got {value!r}")
        if isinstance(value, str):
            text = value.strip()
            if _IDENT.match(text):
                if string_params is None:
                    string_params = _string_params(pyslang, trees, top)
                if name in string_params:
                    text = _quote(text)
            elif not (len(text) >= 2 and text[0] == text[-1] == '"'):
                text = _quote(text)
            overrides.append(f"{name}={text}")
        else:
            overrides.append(f"{name}={value}")
    opts.paramOverrides = overrides
    comp = ast.Compilation(pyslang.Bag([opts]))
    for t in trees:
        comp.addSyntaxTree(t)
    return comp


def _quote(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _string_params(pyslang, trees, top: str | None) -> set[str]:
    """Names of the top module's parameters of type string (one elaboration without
    overrides; only needed when a --param value is a bare name)."""
    from pyslang import ast
    opts = ast.CompilationOptions()
    if top:
        opts.topModules = {top}
    comp = ast.Compilation(pyslang.Bag([opts]))
    for t in trees:
        comp.addSyntaxTree(t)
    out = set()
    for inst in comp.getRoot().topInstances:
        if top and inst.name != top:
            continue
        for m in inst.body:
            if m.kind == ast.SymbolKind.Parameter and m.type.canonicalType.isString:
                out.add(m.name)
    return out


def load(paths: list[Path], *, top: str | None = None, params: dict[str, int] | None = None,
         include_dirs: list[str] | None = None,
         defines: dict[str, str | None] | None = None,
         cells: list[Path] | None = None) -> Netlist:
    """Elaborate the Verilog files and translate the top module into a validated Netlist."""
    pyslang = _import_pyslang()
    from verify.formats.verilog.translate import Translator
    paths = [Path(p) for p in paths]
    params = dict(params or {})
    facts = check_sources(paths, list(include_dirs or []))
    cells = [Path(c) for c in cells or []]
    sm, trees, refused_cells = _parse(pyslang, paths, list(include_dirs or []),
                                      dict(defines or {}), cells)
    generated = {int(k[len(_GENERATED):]): v for k, v in refused_cells.items()
                 if k.startswith(_GENERATED)}
    refused_cells = {k: v for k, v in refused_cells.items() if not k.startswith(_GENERATED)}
    locator = Locator(sm, paths + cells, generated)
    duplicate_definitions(trees, locator)
    if facts.directives:
        listed = ", ".join(f"`{d}" for d in facts.directives)
        note(f"Verilog-XL directives that do not change the logic are ignored: {listed}",
             next(iter(facts.directives.values())))
    comp = _elaborate(pyslang, trees, top, params)
    root = comp.getRoot()
    first = str(paths[0])
    if top and top not in {d.name for d in _definitions(comp) if _is_module(d)}:
        raise _no_such_top(comp, top, first)  # before slang's own, less helpful, error about it
    _diagnostics(pyslang, comp, sm, locator)
    tops = list(root.topInstances)
    if top:
        tops = [t for t in tops if t.name == top]
        if not tops:
            raise _no_such_top(comp, top, first)
    if not tops:
        modules = sorted({d.name for d in _definitions(comp) if _is_module(d)})
        if modules:
            # slang takes as top only a module nobody instantiates; a module that instantiates
            # itself (a recursive adder under a generate-if) or a set of cells that all use one
            # another leaves none
            why = "every module is instantiated by another (recursive, or a library of cells)"
            listed = f"(modules: {', '.join(modules)})"
            raise option_error(f"{why}; name the top with --top {listed}", first, option="--top",
                               detail=f"{why}; name the top module {listed}")
        raise InputError("no module found in the given files", first)
    if len(tops) > 1 and not top:
        # cells of a library (from --cells, or Verilog models between `celldefine and
        # `endcelldefine) that the netlist does not use are not candidates for the top
        design = [t for t in tops if not t.definition.cellDefine]
        if len(design) == 1:
            tops = design
    if len(tops) > 1:
        names = ", ".join(sorted(t.name for t in tops))
        raise option_error(f"several candidate top modules ({names}); choose one with --top NAME",
                           first, option="--top",
                           detail=f"several candidate top modules ({names}); name the top module")
    inst = tops[0]
    _check_params(inst, params, locator)
    translator = Translator(locator, origin=", ".join(str(p) for p in paths))
    translator.refused_cells = refused_cells
    return _translate(translator, inst, str(paths[0]))


def _translate(translator, inst, where: str):
    """Run the translation. Nesting is bounded (common.MAX_NEST) well inside the interpreter's
    own recursion limit, which is never changed; a RecursionError that still escapes (a design
    nested in a way the bound does not count) becomes an input error, not a crash."""
    try:
        return translator.run(inst)
    except RecursionError:
        raise InputError("the design is nested too deeply to translate", where) from None


def _definitions(comp):
    try:
        return [d for d in comp.getDefinitions() if getattr(d, "name", None)]
    except Exception:  # pragma: no cover - older pyslang
        return []


def _no_such_top(comp, top: str, where: str) -> InputError:
    defs = sorted({d.name for d in _definitions(comp) if _is_module(d)})
    text = f"no module named '{top}' (modules: {', '.join(defs) or 'none'})"
    return option_error(text, where, option="--top", detail=text)


def _is_module(definition) -> bool:
    from pyslang import ast
    return getattr(definition, "definitionKind", None) == ast.DefinitionKind.Module


def _check_params(inst, params: Mapping[str, int], locator: Locator) -> None:
    """Every --param must name a parameter of the top module that can be overridden."""
    from pyslang import ast
    known = {}
    for m in inst.body:
        if m.kind == ast.SymbolKind.Parameter:
            known[m.name] = m
    for name in params:
        sym = known.get(name)
        if sym is None:
            listed = ", ".join(n for n, s in known.items() if not s.isLocalParam) or "none"
            text = f"module '{inst.name}' has no parameter '{name}' (parameters: {listed})"
            raise option_error(f"--param {name}: {text}", locator.where(inst.location),
                               option="--param", detail=text)
        if sym.isLocalParam:
            text = f"'{name}' is a localparam of '{inst.name}' and cannot be overridden"
            raise option_error(f"--param {name}: {text}", locator.where(sym.location),
                               option="--param", detail=text)
