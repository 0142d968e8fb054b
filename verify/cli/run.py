"""``adder-verify run`` (check every entry of a manifest) and ``adder-verify merge`` (join exhaustive shards).

"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import click

from verify.cli.options import error_json
from verify.errors import InputError


class _PlainProgress:
    """One line per finished check on stderr (when stderr is not a terminal)."""

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        return False

    def __call__(self, event, done, total, record, label):
        if event == "done" and record is not None:
            how = "cached" if record.cached else f"{record.seconds:.2f} s"
            click.echo(f"[{done}/{total}] {label}: {record.verdict} ({how})", err=True)


class _RichProgress:
    """A rich progress bar on stderr, with the check in hand and each result as it lands."""

    def __enter__(self):
        from rich.console import Console
        from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, TimeElapsedColumn

        self.console = Console(stderr=True)
        self.bar = Progress(TextColumn("verifying"), BarColumn(), MofNCompleteColumn(),
                            TimeElapsedColumn(), TextColumn("{task.description}"),
                            console=self.console, transient=True,
                            auto_refresh=False)  # no thread: worker processes fork safely
        self.bar.__enter__()
        self.task = None
        return self

    def __exit__(self, *exc):
        return self.bar.__exit__(*exc)

    def __call__(self, event, done, total, record, label):
        if self.task is None:
            self.task = self.bar.add_task("", total=total)
        if event == "start":
            self.bar.update(self.task, description=label, refresh=True)
            return
        self.bar.update(self.task, completed=done, description=label, refresh=True)
        if record is not None:
            how = "cached" if record.cached else f"{record.seconds:.2f} s"
            mark = "ok" if record.ok else record.status
            self.console.print(f"  {label}: {record.verdict} ({how}) {mark}", highlight=False,
                               markup=False)


def _progress(quiet: bool):
    if quiet:
        return None
    return _RichProgress() if sys.stderr.isatty() else _PlainProgress()


def _write(path: str, text: str, what: str) -> None:
    from verify.files import write_text
    write_text(path, text, what=what, replace_reports=True)


def _check_report_paths(reports) -> None:
    """Refuse, before anything is checked, a report path that could not be written at the end (a
    hand-written file, another kind of report, a folder) or that two reports share."""
    from verify.files import can_write
    seen: dict[str, str] = {}
    for path, what, option, kind in reports:
        if not path:
            continue
        same = seen.get(str(Path(path).resolve()))
        if same:
            raise InputError(f"{same} and {option} name the same file; give each report its own",
                             path)
        seen[str(Path(path).resolve())] = option
        can_write(path, what=what, replace_reports=True, kind=kind)


def _write_html(summary, html_path: str) -> None:
    """The waveforms first (``<page stem>-waves/`` beside the page), then the page linking them."""
    from verify.render import html

    links = {}
    for label, path in html.waveform_paths(summary, html_path).items():
        record = next(r for r in summary.records if r.label == label)
        _write(str(path), record.diagnosis.waveform_vcd, "waveform")
        links[label] = html.relative_href(path, html_path)
    _write(html_path, html.render_html(summary, links), "HTML report")


def _report_entry_errors(summary) -> None:
    """One line on stderr per entry that could not be checked (the table lists them too)."""
    shown = set()
    for r in summary.records:
        if r.verdict != "error":
            continue
        line = r.error if r.error_key else f"{r.label}: {r.error}"
        if line not in shown:  # an unknown parameter is the same mistake at every point
            shown.add(line)
            click.echo(f"error: {line}", err=True)


@click.command("run")
@click.argument("manifest", required=False, metavar="[MANIFEST]")
@click.option("--jobs", "-j", type=click.IntRange(1, 512), default=1, show_default=True,
              help="Checks run at once, in separate processes (results do not depend on it).")
@click.option("--cluster", metavar="ADDRESS", help="Run the checks on this Dask cluster "
              "(tcp://scheduler:8786, or local:N for N worker processes here) instead of --jobs.")
@click.option("--junit", "junit_path", metavar="FILE", help="Write JUnit XML: a test case per "
              "design and parameter value.")
@click.option("--json", "json_path", metavar="FILE", help="Write the JSON summary ('-' prints it "
              "instead of the table).")
@click.option("--markdown", "md_path", metavar="FILE", help="Write a short Markdown summary for a "
              "pull-request comment.")
@click.option("--html", "html_path", metavar="FILE", help="Write one self-contained HTML page: "
              "every entry, and for each counterexample its bit table, suspects, cone picture, "
              "waveform (written beside it) and the command that reproduces it.")
@click.option("--no-cache", is_flag=True, help="Check everything again, ignoring recorded verdicts.")
@click.option("--cache-dir", metavar="DIR", help="Where verdicts are recorded (default: "
              ".verify-cache next to the manifest).")
@click.option("--only", "only", multiple=True, metavar="NAME", help="Check only this design "
              "(repeatable).")
@click.option("--quiet", "-q", is_flag=True, help="No progress display.")
def run_cmd(manifest, jobs, cluster, junit_path, json_path, md_path, html_path, no_cache,
            cache_dir, only, quiet):
    """Check every design of MANIFEST (default ./verify.toml) at every parameter value.

    \b
    Exit codes: 0 every entry meets its manifest; 1 a result contradicts it (a counterexample,
    or a proof for an entry marked deliberately_broken = true); 2 a bad manifest or a design that
    cannot be read; 3 a result is undecided or weaker than its require; 4 internal error.
    """
    from verify.manifest import runner as gate
    from verify.render import batch as rb

    try:
        _check_report_paths([(junit_path, "JUnit report", "--junit", "junit"),
                             (md_path, "Markdown summary", "--markdown", "markdown"),
                             (html_path, "HTML report", "--html", "html"),
                             (None if json_path == "-" else json_path, "JSON summary", "--json",
                              rb.JSON_FORMAT)])
        loaded = gate.load_manifest(manifest)
        if cluster is not None and jobs != 1:
            raise InputError("give --cluster or --jobs, not both (the cluster's workers run the "
                             "checks)", option="cluster")
        executor = None
        if cluster is not None:
            from verify.manifest.executors import open_executor
            executor = open_executor(cluster)
    except InputError as e:
        if json_path == "-":
            click.echo(json.dumps({"ok": False, "exit_code": 2, "error": e.for_command_line(),
                                   "entries": []}))
        raise
    show = _progress(quiet or json_path == "-")
    try:
        if show is None:
            summary = gate.run(loaded, jobs=jobs, use_cache=not no_cache, cache_dir=cache_dir,
                               only=only or None, executor=executor,
                               diagnose=bool(html_path))
        else:
            with show:
                summary = gate.run(loaded, jobs=jobs, use_cache=not no_cache, cache_dir=cache_dir,
                                   progress=show, only=only or None, executor=executor,
                               diagnose=bool(html_path))
    finally:
        if executor is not None:
            executor.close()
    _report_entry_errors(summary)
    for note in summary.warnings:
        click.echo(f"warning: {note}", err=True)
    if junit_path:
        _write(junit_path, rb.render_junit(summary), "JUnit report")
    if md_path:
        _write(md_path, rb.render_markdown(summary), "Markdown summary")
    if html_path:
        _write_html(summary, html_path)
    if json_path == "-":
        click.echo(rb.dumps_json(summary), nl=False)
    else:
        if json_path:
            _write(json_path, rb.dumps_json(summary), "JSON summary")
        click.echo(rb.render_table(summary))
    return summary.exit_code


@click.command("merge")
@click.argument("files", nargs=-1, required=True, metavar="FILE...")
@click.option("--json", "as_json", is_flag=True, help="Print the merged result as JSON.")
def merge_cmd(files, as_json):
    """Join the JSON results of 'adder-verify check --engine exhaustive --shard K/N --json'.

    Exit 0 (exhaustive) only when all N shards are present, cover the input space once and pass;
    1 when any shard found a counterexample; 3 when shards are missing or one stopped without an
    answer; 2 when the files are not shards of one design and spec, or repeat or overlap, or a
    file's design name, ports, spec or range was edited (each shard carries a binding hash).

    A merge checks that the shard files are consistent; it cannot tell a forged file from a real
    one (anyone can write such JSON). Trust it as far as you trust whoever wrote the files.
    """
    from verify.manifest import shards

    try:
        merged = shards.merge(files)
    except InputError as e:
        if as_json:
            click.echo(json.dumps(error_json(e, exit_code=2)))
        raise
    if as_json:
        click.echo(json.dumps(merged, indent=2))
    else:
        click.echo(shards.render_text(merged))
    return merged["exit_code"]
