"""Hostile or runaway input to the Verilog reader: refused with one line, never a crash or a
long wait. Inputs that could crash the process run in a subprocess under resource limits."""

from __future__ import annotations

import os
import resource
import subprocess
import sys
import time
from pathlib import Path

import pytest

from verify.errors import InputError
from verify.formats import load

ROOT = Path(__file__).resolve().parent.parent


def write(tmp_path: Path, name: str, text: str) -> Path:
    p = tmp_path / name
    p.write_text(text)
    return p


def _limits():
    resource.setrlimit(resource.RLIMIT_AS, (3 << 30, 3 << 30))
    resource.setrlimit(resource.RLIMIT_CPU, (60, 60))


def load_in_subprocess(paths: list[Path]) -> subprocess.CompletedProcess:
    code = ("import sys\nfrom verify.errors import InputError\nfrom verify.formats import load\n"
            "try:\n    load(sys.argv[1:])\nexcept InputError as e:\n    print('InputError:', e)\n"
            "    sys.exit(2)\nprint('loaded')\n")
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    return subprocess.run([sys.executable, "-c", code, *map(str, paths)], capture_output=True,
                          text=True, timeout=120, preexec_fn=_limits, env=env, cwd=ROOT)


def test_thousands_of_module_keywords_do_not_crash(tmp_path):
    # 30,000 nested 'module' keywords overflow the C++ parser's stack (a segmentation fault)
    f = write(tmp_path, "bomb.v", "\n".join(["module"] * 30000) + "\n")
    r = load_in_subprocess([f])
    assert r.returncode == 2, (r.returncode, r.stderr[-500:])
    assert "InputError:" in r.stdout and "nested more than" in r.stdout


def test_a_huge_port_is_refused_at_once(tmp_path):
    f = write(tmp_path, "wide.v", "module w(input [999999:0] a, output y);\n  assign y = a[0];\n"
              "endmodule\n")
    t = time.perf_counter()
    with pytest.raises(InputError, match=r"1,000,000 bits wide; the widest port supported is 65,536"):
        load([f])
    assert time.perf_counter() - t < 10  # generous floor: it used to take about 4 s and more


def test_a_loop_with_a_huge_bound_is_refused_before_unrolling(tmp_path):
    f = write(tmp_path, "loop.v", "module l(input [7:0] a, output reg [7:0] y);\n  integer i;\n"
              "  always @* begin y = a; for (i = 0; i < 100000000; i = i + 1) y = y ^ a; end\n"
              "endmodule\n")
    t = time.perf_counter()
    with pytest.raises(InputError, match=r"a for loop that runs more than 655,360 times"):
        load([f])
    assert time.perf_counter() - t < 10


def test_a_huge_repeat_is_refused(tmp_path):
    f = write(tmp_path, "rep.v", "module r(input [7:0] a, output reg [7:0] y);\n"
              "  always @* begin y = a; repeat (1000000000) y = y ^ a; end\nendmodule\n")
    with pytest.raises(InputError, match=r"repeat loop that runs 1,000,000,000 times"):
        load([f])


@pytest.mark.slow
def test_nested_loops_are_bounded_in_all(tmp_path):
    f = write(tmp_path, "nest.v", "module l(input [7:0] a, output reg [7:0] y);\n  integer i, j;\n"
              "  always @* begin y = a;\n    for (i = 0; i < 60000; i = i + 1)\n"
              "      for (j = 0; j < 60000; j = j + 1) y = y + a;\n  end\nendmodule\n")
    with pytest.raises(InputError, match=r"more than 500,000 gates|more than 131,072 iterations"):
        load([f])


def test_a_dpi_import_call_is_one_line(tmp_path):
    f = write(tmp_path, "dpi.v", 'module d(input [7:0] a, output [7:0] y);\n'
              '  import "DPI-C" function int f(int x);\n  assign y = f(a);\nendmodule\n')
    with pytest.raises(InputError, match=r"dpi\.v:3:\d+: a call of the DPI import 'f'"):
        load([f])


def test_include_of_dev_zero_is_refused_before_reading(tmp_path):
    f = write(tmp_path, "inc.v", '`include "/dev/zero"\nmodule m(input a, output y);\n'
              "  assign y = a;\nendmodule\n")
    r = load_in_subprocess([f])
    assert r.returncode == 2 and "names a special file" in r.stdout, r.stdout + r.stderr[-300:]


def test_fifo_as_design_file_or_include_is_refused(tmp_path):
    fifo = tmp_path / "pipe.v"
    os.mkfifo(fifo)
    with pytest.raises(InputError, match="not a regular file"):
        load([fifo])
    f = write(tmp_path, "inc.v", '`include "pipe.v"\nmodule m(input a, output y);\n'
              "  assign y = a;\nendmodule\n")
    with pytest.raises(InputError, match=r"inc\.v:1: `include \"pipe.v\" names a special file"):
        load([f])


def test_a_very_long_chain_of_assigns_is_refused_at_once(tmp_path):
    m = 300_000
    body = "".join(f"  assign w[{i + 1}] = ~w[{i}];\n" for i in range(m))
    f = write(tmp_path, "long.v", f"module chain(input a, output y);\n  wire [{m}:0] w;\n"
              f"  assign w[0] = a;\n{body}  assign y = w[{m}];\nendmodule\n")
    t = time.perf_counter()
    with pytest.raises(InputError, match=r"more than 250,000 statements"):
        load([f])
    assert time.perf_counter() - t < 20  # generous floor: refused before parsing
