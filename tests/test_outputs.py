"""Files the tool writes never replace a file the user wrote."""

from __future__ import annotations

import pytest

from verify.cli.main import main
from verify.errors import InputError
from verify.files import write_text


def test_a_design_output_never_replaces_an_existing_file(tmp_path):
    f = tmp_path / "mine.v"
    f.write_text("module mine; endmodule\n")
    with pytest.raises(InputError, match="refusing to overwrite"):
        write_text(f, "new", what="design")
    assert f.read_text() == "module mine; endmodule\n"
    write_text(f, "new", what="design", force=True)
    assert f.read_text() == "new"


JUNIT = '<?xml version="1.0"?>\n<!-- adder-verify report (junit) -->\n<testsuites tests="{}"/>\n'


def test_a_report_replaces_only_an_earlier_report_of_the_same_kind(tmp_path):
    f = tmp_path / "report.xml"
    write_text(f, JUNIT.format(1), replace_reports=True)
    write_text(f, JUNIT.format(2), replace_reports=True)
    assert 'tests="2"' in f.read_text()
    with pytest.raises(InputError, match="not an earlier report of this kind"):
        write_text(f, "<!-- adder-verify report (markdown) -->\n# x\n", replace_reports=True)
    assert 'tests="2"' in f.read_text()


@pytest.mark.parametrize("existing", [
    "<my-notes/>",
    "# Design notes\nWe use adder-verify for sign-off.\n",  # merely mentions the tool
    "// written by adder-verify from 'ks8': 70 gates\nmodule ks8 (\n",  # a design we exported
    "",
    # a hand-written file that happens to contain the mark's words
    "Our CI writes <!-- adder-verify report (junit) --> files to out/\n",
    "notes: the summary line is \"format\": \"verify-run/1\" in each report\n",
])
def test_a_report_never_replaces_a_file_the_user_wrote(tmp_path, existing):
    mine = tmp_path / "NOTES.md"
    mine.write_text(existing)
    with pytest.raises(InputError, match="refusing to overwrite"):
        write_text(mine, JUNIT.format(1), replace_reports=True)
    assert mine.read_text() == existing


def test_generate_refuses_to_overwrite_without_force(tmp_path, capsys):
    out = tmp_path / "ks8.json"
    out.write_text("hand written")
    with pytest.raises(SystemExit) as e:
        main(["generate", "kogge-stone", "--width", "8", "-o", str(out)])
    assert e.value.code == 2 and out.read_text() == "hand written"
    assert "refusing to overwrite" in capsys.readouterr().err
    with pytest.raises(SystemExit) as e:
        main(["generate", "kogge-stone", "--width", "8", "-o", str(out), "--force"])
    assert e.value.code == 0 and '"verify-netlist/1"' in out.read_text()


def test_check_refuses_a_hand_written_waveform_path_before_checking(tmp_path, capsys):
    from tests.helpers import rewire, ripple
    from verify.formats import json_netlist
    bad = tmp_path / "bad.json"
    bad.write_text(json_netlist.dumps(rewire(ripple(4), "sum[2]", op="or")))
    mine = tmp_path / "hand.vcd"
    mine.write_text("$comment my own waveform $end\n")
    with pytest.raises(SystemExit) as e:
        main(["check", str(bad), "--no-log", "--vcd", str(mine)])
    out = capsys.readouterr()
    assert e.value.code == 2 and "refusing to overwrite" in out.err
    assert "FAIL" not in out.out  # nothing was checked
    assert mine.read_text() == "$comment my own waveform $end\n"
    with pytest.raises(SystemExit) as e:
        main(["check", str(bad), "--no-log", "--vcd", str(tmp_path / "w.vcd")])
    assert e.value.code == 1
    with pytest.raises(SystemExit) as e:  # an earlier waveform of ours may be replaced
        main(["check", str(bad), "--no-log", "--vcd", str(tmp_path / "w.vcd")])
    assert e.value.code == 1


@pytest.mark.parametrize("mask,mode", [(0o022, 0o644), (0o002, 0o664), (0o077, 0o600)])
def test_written_files_honour_the_umask(tmp_path, mask, mode):
    """A file the tool writes gets the mode open() would give it (POSIX umask semantics,
    common practice), so CI artifact uploaders and colleagues can read it."""
    import os
    import stat

    from verify.files import write_bytes
    old = os.umask(mask)
    try:
        a = write_text(tmp_path / "design.v", "module m; endmodule\n", what="design")
        b = write_text(tmp_path / "r.xml", JUNIT.format(1), replace_reports=True)
        c = write_bytes(tmp_path / "p.png", b"\x89PNG", what="picture")
        for p in (a, b, c):
            assert stat.S_IMODE(p.stat().st_mode) == mode, p
        # the manifest runner's result cache too
        from verify.manifest.cache import Cache
        cache = Cache(tmp_path / "cache")
        cache.put("0" * 64, {}, {"verdict": "proven"})
        assert stat.S_IMODE((tmp_path / "cache" / ("0" * 64 + ".json")).stat().st_mode) == mode
    finally:
        os.umask(old)
