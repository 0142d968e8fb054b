"""The command line: a thin click layer over the Python API (verify.check, verify.batch, ...).

``main`` is the one place where an error becomes an exit code: bad input (``InputError``, click's
usage errors) is one line on stderr and exit code 2; two engines disagreeing is exit code 2 with
both outcomes; any other exception is an internal error of this tool, reported as such with exit
code 4 (never 1, which means a counterexample was found, and never 0).
"""

from __future__ import annotations

import contextlib
import sys
import warnings

import click

from verify import __version__
from verify.cli import check as check_commands
from verify.cli import explain as explain_commands
from verify.cli import library as library_commands
from verify.cli import run as run_commands
from verify.cli import timing as timing_commands
from verify.cli.options import EXIT_CODES
from verify.errors import EngineDisagreement, InputError, InputNote

PROG = "adder-verify"
EXIT_INTERNAL = 4


class _Commands(click.Group):
    """The command group: a command's return value is its exit code, and every exception a
    command raises goes through ``report_error`` (so click's test runner sees the same codes)."""

    def invoke(self, ctx: click.Context):
        try:
            with _notes_on_stderr():
                code = super().invoke(ctx)
        except (click.exceptions.ClickException, click.exceptions.Exit, click.exceptions.Abort):
            raise
        except Exception as e:  # noqa: BLE001 - every other outcome is worded and coded here
            code = report_error(e)
        if isinstance(code, int) and code:
            ctx.exit(code)
        return code


@contextlib.contextmanager
def _notes_on_stderr():
    """Show each distinct InputNote a reader issues once, as ``note: ...`` on stderr."""
    seen: set[str] = set()

    def show(message, category, *args, **kwargs):
        if issubclass(category, InputNote):
            text = str(message)
            if text not in seen:
                seen.add(text)
                click.echo(f"note: {text}", err=True)
        else:  # pragma: no cover - other libraries' warnings keep Python's format
            click.echo(warnings.formatwarning(message, category, *args, **kwargs), err=True, nl=False)

    with warnings.catch_warnings():
        warnings.simplefilter("always", InputNote)
        warnings.showwarning = show
        yield


@click.group(cls=_Commands, context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100},
             epilog=EXIT_CODES)
@click.version_option(__version__, prog_name=PROG)
def cli() -> None:
    """Prove, exhaustively check and randomly test adder circuits against integer addition."""


for _command in (check_commands.check_cmd, check_commands.export_cmd,
                 library_commands.generate_cmd, library_commands.shape_cmd,
                 explain_commands.explain_cmd, run_commands.run_cmd, run_commands.merge_cmd,
                 timing_commands.timing_cmd):
    cli.add_command(_command)


def main(argv: list[str] | None = None) -> None:
    """Console entry point: every outcome leaves through ``sys.exit`` with a documented code."""
    if not (sys.argv[1:] if argv is None else argv):
        click.echo(cli.get_help(click.Context(cli, info_name=PROG)))
        sys.exit(0)
    sys.exit(run_command(argv))


def run_command(argv: list[str] | None) -> int:
    """Run one command line and return its exit code (the one error-to-exit-code path)."""
    try:
        code = cli.main(args=argv, prog_name=PROG, standalone_mode=False)
    except click.exceptions.Exit as e:
        return e.exit_code
    except click.exceptions.Abort:
        click.echo("error: interrupted", err=True)
        return 130
    except click.exceptions.UsageError as e:
        hint = f" (see '{PROG} {e.ctx.info_name} --help')" if e.ctx and e.ctx.parent else f" (see '{PROG} --help')"
        click.echo(f"error: {e.format_message()}{hint}", err=True)
        return 2
    except click.exceptions.ClickException as e:
        click.echo(f"error: {e.format_message()}", err=True)
        return 2
    except Exception as e:  # noqa: BLE001 - raised outside a command (e.g. while parsing)
        return report_error(e)
    return code or 0


def report_error(e: BaseException) -> int:
    """Word an exception for the command line and give its exit code: the one place that does."""
    if isinstance(e, InputError):
        click.echo(f"error: {e.for_command_line()}", err=True)
        return 2
    if isinstance(e, EngineDisagreement):
        click.echo(f"internal error (EngineDisagreement): two complete engines disagree; this is "
                   f"a bug in {PROG}, not a verdict about the design:", err=True)
        for outcome in e.outcomes:
            click.echo(f"  {outcome.engine}: {outcome.status}: {outcome.evidence}", err=True)
        return 2
    if isinstance(e, RecursionError):
        click.echo("internal error: a structure nested too deeply for this tool; please report "
                   "the input that caused it", err=True)
        return EXIT_INTERNAL
    if isinstance(e, MemoryError):
        click.echo("error: out of memory: the design or spec is too large for this machine", err=True)
        return EXIT_INTERNAL
    click.echo(f"internal error: {type(e).__name__}: {e} (a bug in {PROG}; please report it "
               f"with the command line)", err=True)
    return EXIT_INTERNAL


if __name__ == "__main__":  # pragma: no cover
    main()
