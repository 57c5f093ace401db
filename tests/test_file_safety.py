"""Outputs never destroy inputs or system files; inputs that are not regular files never hang.

Each case runs the command line through ``audit.cli.run`` (the entry point's own error net),
and checks the exit status, the file left behind and our own wording, never a library's.
"""

from __future__ import annotations

import errno
import os
import signal
import stat
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

from audit.cli import run
from audit.core.outfiles import Output, OutputError, check_outputs, write_outputs
from tests.conftest import ROOT, base_model


@pytest.fixture
def model_file(write_model):
    return write_model(base_model())


def _review(capsys, *args) -> tuple[int, str]:
    code = run(["review", *map(str, args)])
    err = capsys.readouterr().err
    return code, err


def _one_clear_line(err: str) -> bool:
    lines = err.strip().splitlines()
    return len(lines) == 1 and lines[0].startswith("error: ") and "internal error" not in err


def test_output_that_is_the_model_is_refused_and_the_model_kept(model_file, capsys):
    before = model_file.read_bytes()
    code, err = _review(capsys, model_file, "--memo", model_file)
    assert code == 2 and _one_clear_line(err) and "--memo" in err
    assert model_file.read_bytes() == before


def test_output_that_is_the_model_by_another_spelling_is_refused(model_file, capsys):
    other = model_file.parent / "." / model_file.name
    code, err = _review(capsys, model_file, "--csv", other)
    assert code == 2 and "input MODEL" in err


def test_output_that_is_a_hard_link_to_the_claims_is_refused(model_file, tmp_path, capsys):
    claims = tmp_path / "claims.yaml"
    claims.write_text("claims: []\n")
    link = tmp_path / "out.json"
    os.link(claims, link)
    code, err = _review(capsys, model_file, "--claims", claims, "--json", link)
    assert code == 2 and "--claims" in err
    assert claims.read_text() == "claims: []\n"


def test_two_outputs_to_one_file_are_refused(model_file, tmp_path, capsys):
    out = tmp_path / "same.out"
    code, err = _review(capsys, model_file, "--json", out, "--csv", out)
    assert code == 2 and "--json" in err and not out.exists()


def test_output_that_is_a_symbolic_link_is_not_replaced(model_file, tmp_path, capsys):
    target = tmp_path / "precious.txt"
    target.write_text("keep me")
    link = tmp_path / "memo.html"
    link.symlink_to(target)
    code, err = _review(capsys, model_file, "--memo", link)
    assert code == 2 and _one_clear_line(err) and "symbolic link" in err
    assert link.is_symlink() and target.read_text() == "keep me"


def test_output_that_is_a_directory_or_fifo_is_refused(model_file, tmp_path, capsys):
    folder = tmp_path / "a-folder"
    folder.mkdir()
    fifo = tmp_path / "a-fifo"
    os.mkfifo(fifo)
    for path, word in ((folder, "directory"), (fifo, "FIFO")):
        code, err = _review(capsys, model_file, "--csv", path)
        assert code == 2 and word in err
    assert folder.is_dir() and stat.S_ISFIFO(os.lstat(fifo).st_mode)


def test_output_that_is_a_character_device_is_refused_before_anything_is_written():
    # checked at the function (no run follows it), so the device is never at risk in a test
    with pytest.raises(OutputError, match="device"):
        check_outputs([("--csv", Path(os.devnull))], [])
    assert stat.S_ISCHR(os.stat(os.devnull).st_mode)


@pytest.mark.parametrize("kind", ["missing", "a file"])
def test_output_whose_folder_is_missing_or_a_file_gives_one_line(model_file, tmp_path, capsys, kind):
    parent = tmp_path / "no-such-folder"
    if kind == "a file":
        parent.write_text("")
    code, err = _review(capsys, model_file, "--memo", parent / "memo.html")
    assert code == 2 and _one_clear_line(err)


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes into any folder")
def test_output_in_an_unwritable_folder_gives_one_line(model_file, tmp_path, capsys):
    locked = tmp_path / "locked"
    locked.mkdir()
    locked.chmod(0o500)
    code, err = _review(capsys, model_file, "--memo", locked / "memo.html")
    assert code == 2 and "not writable" in err


def test_a_full_disk_writes_nothing_and_keeps_the_previous_outputs(tmp_path, monkeypatch):
    memo = tmp_path / "memo.html"
    memo.write_text("previous memo")
    real_fdopen = os.fdopen

    class FullDisk:
        def __init__(self, handle):
            self.handle = handle

        def __enter__(self):
            return self

        def __exit__(self, *exc):
            self.handle.close()

        def write(self, text):
            raise OSError(errno.ENOSPC, "No space left on device")

    monkeypatch.setattr(os, "fdopen", lambda *a, **k: FullDisk(real_fdopen(*a, **k)))
    with pytest.raises(OutputError, match="nothing was written"):
        write_outputs([Output("--memo", memo, lambda: "new"), Output("--csv", tmp_path / "f.csv", lambda: "a")])
    assert memo.read_text() == "previous memo"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["memo.html"]


def test_a_failure_in_the_second_output_leaves_the_first_untouched(tmp_path):
    first = tmp_path / "a.html"
    first.write_text("old a")

    def broken():
        yield "half"
        raise RuntimeError("render failed")

    with pytest.raises(RuntimeError):
        write_outputs([Output("--memo", first, lambda: "new a"), Output("--json", tmp_path / "b.json", broken)])
    assert first.read_text() == "old a"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["a.html"]


CHILD = textwrap.dedent(
    """
    import sys, time
    from pathlib import Path
    from audit.core.outfiles import Output, write_outputs
    folder = Path(sys.argv[1])

    def slow():
        yield "start"
        (folder / "started").write_text("")
        time.sleep(30)
        yield "end"

    try:
        write_outputs([Output("--memo", folder / "a.html", lambda: "A"), Output("--json", folder / "b.json", slow)])
    except BaseException:
        sys.exit(3)
    """
)


@pytest.mark.parametrize("signum", [signal.SIGINT, signal.SIGTERM, signal.SIGHUP], ids=["SIGINT", "SIGTERM", "SIGHUP"])
def test_an_interrupted_write_leaves_no_outputs_and_no_temporary_files(tmp_path, signum):
    child = subprocess.Popen([sys.executable, "-c", CHILD, str(tmp_path)], cwd=ROOT)
    deadline = time.monotonic() + 20
    while not (tmp_path / "started").exists():
        assert time.monotonic() < deadline, "child never started writing"
        time.sleep(0.02)
    child.send_signal(signum)
    assert child.wait(timeout=20) == 3
    assert sorted(p.name for p in tmp_path.iterdir()) == ["started"]


def test_model_that_is_a_directory_gives_one_line(tmp_path, capsys):
    code, err = _review(capsys, tmp_path)
    assert code == 2 and _one_clear_line(err) and "directory" in err


def test_model_that_is_a_fifo_with_no_writer_does_not_hang(tmp_path):
    fifo = tmp_path / "model.yaml"
    os.mkfifo(fifo)
    code = "import sys; from audit.cli import run; sys.exit(run(sys.argv[1:]))"
    done = subprocess.run(
        [sys.executable, "-c", code, "review", str(fifo)], capture_output=True, text=True, timeout=30, cwd=ROOT
    )
    assert done.returncode == 2 and "FIFO" in done.stderr and str(fifo) in done.stderr


def test_claims_and_map_that_are_not_files_are_named(model_file, tmp_path, capsys):
    code, err = _review(capsys, model_file, "--claims", tmp_path)
    assert code == 2 and "--claims" in err
    code, err = _review(capsys, model_file, "--claims", tmp_path / "absent.yaml")
    assert code == 2 and "not found" in err and "absent.yaml" in err


@pytest.mark.skipif(os.geteuid() == 0, reason="root reads any file")
def test_unreadable_model_gives_one_line(model_file, capsys):
    model_file.chmod(0)
    code, err = _review(capsys, model_file)
    assert code == 2 and "permission denied" in err


def test_extract_refuses_an_output_that_is_the_pdf(tmp_path, capsys):
    pdf = ROOT / "fixtures" / "pdf" / "ruled.pdf"
    copy = tmp_path / "calc.pdf"
    copy.write_bytes(pdf.read_bytes())
    code = run(["extract", str(copy), "-o", str(copy)])
    err = capsys.readouterr().err
    assert code == 2 and "input PDF" in err
    assert copy.read_bytes() == pdf.read_bytes()


def test_an_output_over_its_bound_writes_nothing(tmp_path):
    # the bound is checked as the text is made: 100 characters over a limit of 64
    memo = tmp_path / "memo.html"
    with pytest.raises(OutputError, match="nothing was written"):
        write_outputs([Output("--memo", memo, lambda: ("x" * 10 for _ in range(10)))], limit=64)
    assert list(tmp_path.iterdir()) == []


def test_an_output_onto_a_bundled_rule_pack_is_refused_and_the_pack_kept(model_file, capsys):
    from audit.standards.bundled import builtin_rules_dir

    pack = builtin_rules_dir() / "o86-2019-recalled.yaml"
    before = pack.read_bytes()
    code, err = _review(capsys, model_file, "--memo", pack)
    assert code == 2 and _one_clear_line(err) and "rule pack" in err
    assert pack.read_bytes() == before


def test_expand_refuses_an_output_onto_a_pack_of_the_rules_dir(tmp_path, capsys):
    from audit.standards.bundled import builtin_rules_dir

    own = tmp_path / "own"
    own.mkdir()
    pack = own / "mine.yaml"
    pack.write_text(
        (builtin_rules_dir() / "o86-2019-recalled.yaml").read_text().replace("id: o86-2019-recalled", "id: mine", 1)
    )
    before = pack.read_bytes()
    model = ROOT / "fixtures" / "demo-layout" / "model.yaml"
    code = run(["expand", str(model), "--rules-dir", str(own), "-o", str(pack)])
    err = capsys.readouterr().err
    assert code == 2 and _one_clear_line(err) and "rule pack" in err and pack.read_bytes() == before


@pytest.mark.parametrize(("signum", "status"), [(signal.SIGTERM, 143), (signal.SIGHUP, 129)])
def test_a_run_ended_by_a_signal_exits_with_128_plus_its_number(monkeypatch, capsys, signum, status):
    from audit import cli
    from audit.core.outfiles import Interrupted

    def ended(*args, **kwargs):
        raise Interrupted(signum)  # as the handler raises it while outputs are written

    monkeypatch.setattr(cli, "app", ended)
    assert cli.run(["review", "x.yaml"]) == status  # the shell's convention: 128 + the signal's number
    assert "interrupted" in capsys.readouterr().err
