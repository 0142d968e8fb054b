"""pytest plugin: a hardware repo's own ``pytest`` run collects its manifest entries as test items.

Installed with adder-verify (entry point ``pytest11``: ``adder_verify = verify.pytest_plugin``), or
loaded by hand with ``-p verify.pytest_plugin``. Any collected file named ``verify.toml`` (the
``verify_manifest_names`` ini option changes the names) becomes one test per design and parameter
value, named like ``verify.toml::larkspur_acc W=32``. A test passes when the entry meets its
manifest (see ``verify.manifest.runner``), and shows the verdict, the engines' evidence and any counterexample
when it does not. The result cache is used as by ``adder-verify run``; ``--verify-no-cache`` turns it off.

``pytest`` collects a root ``verify.toml`` when the root is collected; with ``testpaths`` set, name
it: ``pytest tests verify.toml``.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from verify.errors import InputError


def pytest_addoption(parser):
    group = parser.getgroup("adder-verify")
    group.addoption("--verify-no-cache", action="store_true", default=False,
                    help="adder-verify: check manifest entries again, ignoring recorded verdicts")
    parser.addini("verify_manifest_names", type="args", default=["verify.toml"],
                  help="adder-verify: file names collected as manifests (default: verify.toml)")


def pytest_collect_file(file_path: Path, parent):
    if file_path.name in parent.config.getini("verify_manifest_names"):
        return ManifestFile.from_parent(parent, path=file_path)
    return None


class ManifestFile(pytest.File):
    def collect(self):
        from verify.manifest import runner as gate
        try:
            manifest = gate.load_manifest(self.path)
        except InputError as e:
            raise self.CollectError(f"error: {e}") from None
        for entry in manifest.entries:
            for point in entry.points():
                yield EntryItem.from_parent(self, name=gate.label(entry.name, point),
                                            manifest=manifest, entry=entry, point=point)


class EntryNotMet(Exception):
    """An entry that does not meet its manifest; carries the record for the report."""

    def __init__(self, record):
        super().__init__(record.status.value)
        self.record = record


class EntryItem(pytest.Item):
    def __init__(self, *, manifest, entry, point, **kw):
        super().__init__(**kw)
        self.manifest = manifest
        self.entry = entry
        self.point = point
        self.record = None
        self.add_marker(pytest.mark.adder_verify)

    def runtest(self):
        from verify.manifest import runner as gate
        summary = gate.run(self.manifest, use_cache=not self.config.getoption("verify_no_cache"),
                           only=[self.entry.name], point=self.point)
        self.record = summary.records[0]
        self.user_properties.append(("verdict", self.record.verdict.value))
        self.user_properties.append(("cached", str(self.record.cached).lower()))
        if not self.record.ok:
            raise EntryNotMet(self.record)

    def repr_failure(self, excinfo, style=None):
        if isinstance(excinfo.value, EntryNotMet):
            from verify.render.batch import _details, problem_text
            r = excinfo.value.record
            return f"{r.label}: {problem_text(r)}\n{_details(r)}"
        return super().repr_failure(excinfo, style=style)

    def reportinfo(self):
        return self.path, None, f"adder-verify {self.name}"


def pytest_configure(config):
    config.addinivalue_line("markers", "adder_verify: a design entry of an adder-verify manifest")
