"""The examples in README.md and docs/*.md run as written.

Every fenced ```console block is an example: each `$ ` line is a command (lines starting `> `
continue it), the lines after it are its output, and a line `[exit N]` states its exit code
(no such line: 0). The command runs in bash, with `adder-verify`, `pytest` and `python` standing for
`python -m verify`, `python -m pytest` and the interpreter running the tests (on this checkout), in a temporary copy of the shipped
files (designs/, tests/verilog/, logs/README.md, benchmarks/), one copy per page shared by the page's blocks in
order, so nothing in the repository is written. Every output line shown must appear in the real
output (stdout and stderr together), in the order shown; `...` marks lines left out. Times and
speeds (`0.05 s`, `1,234 vectors/s`) and runs of spaces are not compared, and the temporary
folder's path is removed from the output. A block after `<!-- docs-test: slow -->` is marked
slow. See the tests section of DEVELOPERS.md.
"""

from __future__ import annotations

import os
import re
import shutil
import stat
import subprocess
import sys
from dataclasses import dataclass, field
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PAGES = [ROOT / "README.md", *sorted((ROOT / "docs").glob("*.md"))]
SHIPPED = ["designs", "tests/verilog", "logs/README.md", "benchmarks"]
EXIT_LINE = re.compile(r"^\[exit (\d+)\]$")
SLOW_MARK = "<!-- docs-test: slow -->"


@dataclass
class Command:
    text: str
    output: list[str] = field(default_factory=list)
    exit_code: int = 0


@dataclass
class Block:
    page: Path
    line: int
    slow: bool
    commands: list[Command]

    @property
    def name(self) -> str:
        return f"{self.page.relative_to(ROOT)}:{self.line}"


def parse_blocks(page: Path) -> list[Block]:
    lines = page.read_text(encoding="utf-8").splitlines()
    blocks: list[Block] = []
    i = 0
    while i < len(lines):
        if lines[i].strip() != "```console":
            i += 1
            continue
        start = i + 1
        slow = i > 0 and lines[i - 1].strip() == SLOW_MARK
        indent = len(lines[i]) - len(lines[i].lstrip())
        body: list[str] = []
        i += 1
        while i < len(lines) and lines[i].strip() != "```":
            body.append(lines[i][indent:])
            i += 1
        commands: list[Command] = []
        for text in body:
            if text.startswith("$ "):
                commands.append(Command(text[2:]))
            elif text.startswith("> ") and commands and not commands[-1].output:
                commands[-1].text += "\n" + text[2:]
            elif commands and (m := EXIT_LINE.match(text.strip())):
                commands[-1].exit_code = int(m.group(1))
            elif commands:
                commands[-1].output.append(text)
        assert commands, f"{page.name}:{start}: a console block without a '$ ' command"
        blocks.append(Block(page, start, slow, commands))
        i += 1
    return blocks


BLOCKS = [block for page in PAGES for block in parse_blocks(page)]

_TIME = re.compile(r"\d[\d,]*\.\d+ ?s\b")
_SPEED = re.compile(r"[\d,.]+(e[+-]?\d+)? vectors/s")


def normalise(line: str) -> str:
    line = _SPEED.sub("N vectors/s", line)
    line = _TIME.sub("T s", line)
    return " ".join(line.split())


def assert_shown_lines_appear(shown: list[str], actual: str, where: str) -> None:
    actual_lines = [normalise(x) for x in actual.splitlines()]
    pos = 0
    for want in shown:
        if want.strip() in ("", "..."):
            continue
        norm = normalise(want)
        try:
            pos = actual_lines.index(norm, pos) + 1
        except ValueError:
            raise AssertionError(
                f"{where}: this line is shown but not in the output (in this order):\n  {want}\n"
                f"real output:\n{actual}"
            ) from None


_WORKDIRS: dict[Path, Path] = {}


def _workdir(page: Path, tmp_root: Path) -> Path:
    """One copy of the shipped files per page; the page's blocks run in it in order."""
    if page not in _WORKDIRS:
        work = tmp_root / page.stem
        for rel in SHIPPED:
            src = ROOT / rel
            dst = work / rel
            dst.parent.mkdir(parents=True, exist_ok=True)
            if src.is_dir():
                shutil.copytree(src, dst, ignore=shutil.ignore_patterns("__pycache__", ".verify-cache"))
            else:
                shutil.copy2(src, dst)
        _WORKDIRS[page] = work
    return _WORKDIRS[page]


@pytest.fixture(scope="session")
def shims(tmp_path_factory) -> Path:
    """`adder-verify`, `pytest` and `python` on PATH: this interpreter, running this checkout."""
    bin_dir = tmp_path_factory.mktemp("bin")
    for name, run in (("adder-verify", "-m verify"), ("pytest", "-m pytest"), ("python", "")):
        script = bin_dir / name
        script.write_text(f'#!/bin/sh\nexec "{sys.executable}" {run} "$@"\n')
        script.chmod(script.stat().st_mode | stat.S_IXUSR)
    return bin_dir


@pytest.fixture(scope="session")
def pages_root(tmp_path_factory) -> Path:
    return tmp_path_factory.mktemp("pages")


def _params():
    for block in BLOCKS:
        marks = [pytest.mark.slow] if block.slow else []
        yield pytest.param(block, id=block.name, marks=marks)


@pytest.mark.parametrize("block", list(_params()))
def test_console_example(block: Block, shims: Path, pages_root: Path) -> None:
    if shutil.which("bash") is None:
        pytest.skip("bash is not installed")
    work = _workdir(block.page, pages_root)
    env = dict(os.environ)
    env["PATH"] = f"{shims}{os.pathsep}{env.get('PATH', '')}"
    env["PYTHONPATH"] = os.pathsep.join(filter(None, [str(ROOT), env.get("PYTHONPATH")]))
    env.pop("PYTEST_ADDOPTS", None)
    env["COLUMNS"] = "80"
    for command in block.commands:
        where = f"{block.name}: $ {command.text}"
        done = subprocess.run(
            ["bash", "-c", command.text], cwd=work, env=env, stdin=subprocess.DEVNULL,
            stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True, timeout=300,
        )
        output = done.stdout.replace(f"{work}{os.sep}", "").replace(str(work), ".")
        assert done.returncode == command.exit_code, (
            f"{where}: exit {done.returncode}, the page says {command.exit_code}\n{output}"
        )
        assert_shown_lines_appear(command.output, output, where)


def test_every_page_has_examples_and_the_parser_reads_them() -> None:
    # Every docs page shows at least one runnable example; a typo in a fence would hide it.
    for page in PAGES:
        text = page.read_text(encoding="utf-8")
        assert text.count("```console") == len(parse_blocks(page)), page.name
        assert parse_blocks(page), f"{page.name} has no ```console example"


def test_the_matcher_can_fail() -> None:
    # The checker itself: a shown line missing from the output, or out of order, is reported.
    assert_shown_lines_appear(["b", "...", "d   1.20 s"], "a\nb\nc\nd 0.07 s\n", "ok")
    with pytest.raises(AssertionError):
        assert_shown_lines_appear(["d", "b"], "a\nb\nc\nd\n", "order")
    with pytest.raises(AssertionError):
        assert_shown_lines_appear(["EXHAUSTIVE"], "FAIL\n", "missing")


def test_quick_start_is_what_ci_runs() -> None:
    # The README's two quick-start commands are run, exactly as written, by .ci/run.
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    block = re.search(r"## Quick start.*?```sh\n(.*?)```", readme, re.S)
    assert block, "README.md has no quick-start sh block"
    commands = [line for line in block.group(1).splitlines() if line.strip()]
    assert len(commands) == 2, commands
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8").splitlines()
    for command in commands:
        assert command in ci, f".ci/run does not run the README's quick-start command: {command}"


def test_relative_links_resolve() -> None:
    # A moved section must not leave a dead link behind.
    link = re.compile(r"\]\(([^)#\s]+)(#[^)]*)?\)")
    for page in PAGES:
        for target, _anchor in link.findall(page.read_text(encoding="utf-8")):
            if "://" in target or target.startswith("mailto:"):
                continue
            assert (page.parent / target).exists(), f"{page.name}: dead link to {target}"
