"""``adder-verify explain``: one input vector through the design, bit by bit, and where it goes wrong.

Exit codes: 0 the vector gives the outputs the spec expects, 1 it does not, 2 bad input; without
``--input`` the design is checked first (as ``adder-verify check`` does) and its counterexample is
explained: then the code is the check's (0 meets the spec, 1 fail, 3 undecided).
"""

from __future__ import annotations

import json

import click

from verify.cli.options import (check_report_paths, error_json, parse_defines, single_point,
                                verilog_options)
from verify.errors import InputError


@click.command("explain")
@click.argument("paths", nargs=-1, required=True, metavar="DESIGN...")
@click.option("--spec", help='What the outputs must equal, e.g. "{cout, sum} = a + b + cin". '
              "Default: inferred from port names and widths.")
@click.option("--input", "input_text", metavar="PORT=V,...",
              help="The vector to explain, e.g. a=5,b=0x1f,cin=1 (ports left out are 0). "
                   "Default: check the design and explain its counterexample.")
@click.option("--vcd", "vcd_path", metavar="FILE", help="Write the vector (and up to 7 other "
              "failing ones) as a VCD waveform.")
@click.option("--dot", "dot_path", metavar="FILE", help="Write the fan-in cone of the first wrong "
              "output as Graphviz DOT (and SVG beside it when 'dot' is installed).")
@click.option("--vectors", type=click.IntRange(64, 1 << 16), default=2048, show_default=True,
              help="Vectors simulated to rank the suspects.")
@click.option("--seed", type=click.IntRange(min=0), default=1, show_default=True,
              help="Seed of the vectors that rank the suspects (and of the check without --input).")
@verilog_options(sweep=False)
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object.")
def explain_cmd(paths, spec, input_text, vcd_path, dot_path, vectors, seed, top, params,
                include_dirs, defines, cells, as_json):
    """Show every bit's expected and actual sum and carry for one vector, the suspect gates and
    the path along which the first wrong value travels.

    \b
    Exit codes: 0 the vector gives the outputs the spec expects; 1 it does not; without --input
    the design is checked first and the code is the check's (0 meets the spec, 1 counterexample,
    3 undecided); 2 bad input; 4 internal error of this tool.
    """
    try:
        return _explain(paths, spec, input_text, vcd_path, dot_path, vectors, seed, top,
                        params, include_dirs, defines, cells, as_json)
    except InputError as e:
        if as_json:
            click.echo(json.dumps(error_json(e)))
        raise


def _explain(paths, spec_text, input_text, vcd_path, dot_path, vectors, seed, top, params,
             include_dirs, defines, cells, as_json) -> int:
    from verify.diagnosis import explain as diagnose
    from verify.check import check, resolve_spec
    from verify.formats import load
    from verify.render.text import render_text as check_text

    check_report_paths(vcd_path, dot_path)
    design = load(list(paths), top=top, params=single_point(params, "explain"),
                  include_dirs=include_dirs, defines=parse_defines(defines), cells=cells)
    the_spec = resolve_spec(design, spec_text)
    checked = None
    if input_text is not None:
        inputs = diagnose.parse_inputs(input_text, design)
    else:
        checked = check(design, the_spec, seed=seed)
        if checked.counterexample is None:
            if as_json:
                click.echo(json.dumps({**checked.to_json(), "explained": None}, indent=2))
            else:
                click.echo(check_text(checked))
                click.echo("\nnothing to explain: no counterexample. Give --input to follow one "
                           "vector through the design.")
            return checked.exit_code
        inputs = checked.counterexample.inputs
    findings = diagnose.explain(design, the_spec, inputs, vcd_path=vcd_path, dot_path=dot_path,
                                vectors=vectors, seed=seed)
    from verify.sim import Simulator

    full = {p.name: inputs.get(p.name, 0) for p in design.inputs}
    expected = the_spec.evaluate(full)
    actual = Simulator(design).evaluate(full)
    right = all(expected[p.name] == actual[p.name] for p in design.outputs)
    code = (0 if right else 1) if checked is None else checked.exit_code
    if as_json:
        out = {"design": design.name, "origin": design.origin, "spec": the_spec.text,
               "spec_inferred": the_spec.inferred, "inputs": full,
               "expected": {p.name: expected[p.name] for p in design.outputs},
               "actual": {p.name: actual[p.name] for p in design.outputs},
               "right_on_this_vector": right, **findings}
        if checked is not None:
            out["check"] = checked.to_json()
        click.echo(json.dumps(out, indent=2))
        return code
    from verify.model.result import Counterexample

    cex = Counterexample(full, {p.name: expected[p.name] for p in design.outputs},
                         {p.name: actual[p.name] for p in design.outputs})
    where = f"  ({design.origin})" if design.origin else ""
    click.echo(f"design  {design.name}{where}")
    how = "  (inferred from port names and widths)" if the_spec.inferred else ""
    click.echo(f"spec    {the_spec.text}{how}")
    if checked is not None:
        click.echo(f"check   {checked.verdict.value.upper()}: {checked.coverage}")
    given = "" if input_text is None else (
        "  (not given, so 0: " + ", ".join(n for n in full if n not in inputs) + ")"
        if any(n not in inputs for n in full) else "")
    click.echo(f"vector  {', '.join(f'{k}={v}' for k, v in full.items())}{given}")
    click.echo("result  " + ("every output is what the spec expects" if right else
                             "wrong: " + ", ".join(
                                 f"{p.name} is {actual[p.name]}, expected {expected[p.name]}"
                                 for p in design.outputs if actual[p.name] != expected[p.name])))
    for line in diagnose.render_text(design, the_spec, cex, findings):
        click.echo(line)
    return code
