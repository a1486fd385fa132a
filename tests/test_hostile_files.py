"""Hostile and oversized files through `cellchem audit`, `cellchem fill` and
`cellchem audit --annotate`, each in a child process with an address space of
1 GiB, umask 022 and a wall-clock limit (10 s for the cell and whitespace
bombs, 30 s for everything else).

Whatever the file, a command must end by itself with exit code 0, 1 or 2 and
no traceback, leave its input as it was, write nothing beside the input, and
leave the output folder holding either the finished output (with the
permissions umask 022 gives, 0644) or nothing at all. An output that cannot be
written (its folder is a file, a read-only folder, a full disk) is exit 2 with
a message naming the output, and a process killed mid-write leaves nothing.

The files are built by tests/hostile.py (no binary fixtures). Every file has
a small twin of the same shape that must be read as an ordinary file: that
shows the full-size file reaches the readers and is not turned away for its
name or headings.
"""

from __future__ import annotations

import hashlib
import os
import re
import shutil
import stat
import time
from dataclasses import dataclass
from pathlib import Path

import hostile
import openpyxl
import periodictable
import pytest

pytestmark = pytest.mark.slow

GRACE = 2.0  # seconds past a rule before the child is killed (the rule is asserted, not the kill)


def fingerprint(path: Path) -> tuple:
    """What would change if anything wrote to the file: its inode, size, times of
    change (which no process can set back) and a hash (of all of it up to 64 MiB,
    else of its first and last 8 MiB)."""
    info = path.stat()
    digest = hashlib.sha256()
    with open(path, "rb") as fh:
        if info.st_size <= 64 * hostile.MIB:
            for block in iter(lambda: fh.read(hostile.MIB), b""):
                digest.update(block)
        else:
            digest.update(fh.read(8 * hostile.MIB))
            fh.seek(info.st_size - 8 * hostile.MIB)
            digest.update(fh.read())
    return (info.st_ino, info.st_size, info.st_mtime_ns, info.st_ctime_ns, digest.hexdigest())


def listing(folder: Path) -> dict[str, int]:
    """Every entry of a folder, hidden ones included, with its size."""
    return {entry.name: entry.stat(follow_symlinks=False).st_size for entry in os.scandir(folder)}


def rows_read(run: hostile.Run) -> int | None:
    found = re.search(r"data rows read: ([\d,]+)", run.stdout)
    return int(found.group(1).replace(",", "")) if found else None


def lines_checked(run: hostile.Run) -> int | None:
    found = re.search(r"lines checked: ([\d,]+)", run.stdout)
    return int(found.group(1).replace(",", "")) if found else None


def assert_ended_cleanly(run: hostile.Run, seconds: float = hostile.LIMIT_SECONDS) -> None:
    assert not run.timed_out, f"did not end within {seconds:.0f} s: {run.describe()}"
    assert run.code in (0, 1, 2), run.describe()
    assert "Traceback" not in run.output, run.describe()
    assert "MemoryError" not in run.output, run.describe()
    assert run.seconds <= seconds, f"took longer than {seconds:.0f} s: {run.describe()}"


def assert_names_the_output(run: hostile.Run, output: Path) -> None:
    assert run.code == 2, run.describe()
    assert str(output) in run.output or str(output.parent) in run.output, run.describe()
    assert "save it again" not in run.output, run.describe()


# ---------------------------------------------------------------------------
# Each hostile file, each command


@dataclass
class Outcome:
    run: hostile.Run
    path: Path  # the input
    out: Path  # the output folder (empty before the run)
    output: Path | None  # the file the command writes, if any
    input_untouched: bool
    beside_input: dict[str, int]  # entries that appeared beside the input
    left: dict[str, int]  # the output folder afterwards
    output_mode: int | None  # the output's permissions, None when it was not written


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    """Each case's full-size file, built once for the module; removed at the end
    (the text exports are large on disk, and pytest keeps old temporary folders)."""
    base = tmp_path_factory.mktemp("hostile")
    files: dict[str, Path] = {}

    def get(name: str) -> Path:
        if name not in files:
            folder = base / name
            folder.mkdir()
            files[name] = hostile.CASE[name].build(folder)
        return files[name]

    yield get
    shutil.rmtree(base, ignore_errors=True)


@pytest.fixture(scope="module")
def outcome(built, tmp_path_factory):
    """The run of one command on one case's file (run once, looked at by several tests)."""
    done: dict[tuple[str, str], Outcome] = {}

    def get(name: str, command: str) -> Outcome:
        if (name, command) not in done:
            case = hostile.CASE[name]
            path = built(name)
            out = tmp_path_factory.mktemp(f"{name}-{command}-out")
            argv = hostile.commands(case, path, out)[command]
            output = Path(argv[-1]) if command != "audit" else None
            before, beside = fingerprint(path), listing(path.parent)
            run = hostile.run_cellchem(argv, timeout=case.seconds + GRACE)
            after = listing(path.parent)
            written = output is not None and output.exists()
            done[name, command] = Outcome(
                run,
                path,
                out,
                output,
                fingerprint(path) == before,
                {k: v for k, v in after.items() if k not in beside},
                listing(out),
                stat.S_IMODE(output.stat().st_mode) if written else None,
            )
            shutil.rmtree(out, ignore_errors=True)  # outputs of the large files are large too
        return done[name, command]

    return get


RUNS = [
    pytest.param(case.name, command, id=f"{case.name}-{command}")
    for case in hostile.CASES
    for command in ("audit", "fill", "annotate")
    if command != "annotate" or case.annotate
]


@pytest.mark.parametrize(("name", "command"), RUNS)
def test_ends_by_itself_within_the_limits(outcome, name, command):
    done = outcome(name, command)
    assert_ended_cleanly(done.run, hostile.CASE[name].seconds)


@pytest.mark.parametrize(("name", "command"), RUNS)
def test_input_is_left_as_it_was(outcome, name, command):
    done = outcome(name, command)
    assert done.input_untouched
    assert done.beside_input == {}, f"written beside the input: {done.beside_input}"


@pytest.mark.parametrize(("name", "command"), RUNS)
def test_output_folder_holds_the_output_or_nothing(outcome, name, command):
    done = outcome(name, command)
    run = done.run
    if done.output is None or done.output_mode is None:
        assert done.left == {}, f"left behind: {done.left}; {run.describe()}"
        if command == "fill" and run.code in (0, 1) and "Traceback" not in run.output:
            pytest.fail(f"fill said it wrote (exit {run.code}) but wrote nothing: {run.describe()}")
        return
    assert run.code in (0, 1), f"an output after a refusal: {done.left}; {run.describe()}"
    assert done.left == {done.output.name: done.left[done.output.name]}, done.left
    assert done.left[done.output.name] > 0
    assert done.output_mode == 0o644


# A text over the spreadsheet limit, a row as wide as a sheet, a long name or line is
# that row's problem: the file's other lines are read. (The 100 MB texts and the row
# of 9.5 million cells compress 400 to 500 to 1: a refusal of the whole file as a
# zip bomb is as good an answer there, so they are held only to the rules above.)
ORDINARY_LINES = {
    "xlsx-text-over-limit-inline": len(hostile.LINES),
    "xlsx-text-over-limit-shared": len(hostile.LINES),
    "xlsx-full-width-row": len(hostile.LINES) - 1,
    "xlsx-long-name": len(hostile.LINES),
    "csv-long-line": len(hostile.LINES),
}


@pytest.mark.parametrize("name", sorted(ORDINARY_LINES))
def test_one_long_row_or_text_does_not_cost_the_other_lines(outcome, name):
    run = outcome(name, "audit").run
    assert run.code in (0, 1), run.describe()
    assert (rows_read(run) or 0) >= ORDINARY_LINES[name], run.stdout[-1500:]
    assert (lines_checked(run) or 0) >= ORDINARY_LINES[name], run.stdout[-1500:]


def _data_lines(path: Path) -> int:
    """Lines below the header of a text export without line breaks inside fields."""
    with open(path, "rb") as fh:
        return sum(block.count(b"\n") for block in iter(lambda: fh.read(hostile.MIB), b"")) - 1


def test_a_large_export_is_read_in_bounded_memory(outcome):
    """200 MB of ordinary lines (within the documented 1 GiB and 1,048,576 rows): read
    and filled as they stream, not refused for want of memory."""
    audit = outcome("csv-large", "audit")
    assert audit.run.code in (0, 1), audit.run.describe()
    assert rows_read(audit.run) == _data_lines(audit.path), audit.run.stdout[-1500:]
    fill = outcome("csv-large", "fill")
    assert fill.run.code in (0, 1), fill.run.describe()
    assert fill.output_mode is not None, fill.run.describe()


def test_a_part_is_read_no_further_than_its_declared_size(outcome):
    run = outcome("xlsx-under-declared", "audit").run
    assert_ended_cleanly(run)
    if run.code in (0, 1):  # read: then only what the declared bytes hold
        assert (rows_read(run) or 0) <= hostile.DECLARED_ROWS, run.stdout[-1500:]


# ---------------------------------------------------------------------------
# The small twins are ordinary files, read as such


@pytest.mark.parametrize("name", [case.name for case in hostile.CASES])
def test_the_small_twin_is_read(tmp_path, name):
    case = hostile.CASE[name]
    path = case.small(tmp_path)
    run = hostile.run_cellchem(["audit", path])
    assert_ended_cleanly(run)
    assert run.code in (0, 1), run.describe()
    if case.rows_read >= 0:
        assert rows_read(run) == case.rows_read, run.stdout[-1500:]
    assert (lines_checked(run) or 0) >= 1, run.stdout[-1500:]


# ---------------------------------------------------------------------------
# Rows and cells without an r attribute (valid SpreadsheetML)


def _oracle_mass(formula: str) -> float:
    return periodictable.formula(hostile.ORACLE_FORMULAS[formula]).mass


@pytest.mark.parametrize("variant", ["none", "rows", "cells"])
def test_rows_without_r_are_audited(tmp_path, variant):
    path = hostile.xlsx_rows_without_r(tmp_path, variant)
    run = hostile.run_cellchem(["audit", path])
    assert_ended_cleanly(run)
    assert run.code in (0, 1), run.describe()
    assert rows_read(run) == len(hostile.LINES), run.stdout[-1500:]
    assert lines_checked(run) == len(hostile.LINES), run.stdout[-1500:]


@pytest.mark.parametrize("variant", ["none", "rows", "cells"])
def test_rows_without_r_are_filled(tmp_path, variant):
    path = hostile.xlsx_rows_without_r(tmp_path, variant)
    out = tmp_path / "out"
    out.mkdir()
    filled = out / "filled.xlsx"
    run = hostile.run_cellchem(["fill", path, "-o", filled])
    assert_ended_cleanly(run)
    assert run.code == 0, run.describe()
    assert listing(out) == {"filled.xlsx": filled.stat().st_size}
    assert stat.S_IMODE(filled.stat().st_mode) == 0o644
    rows = list(openpyxl.load_workbook(filled, read_only=True).worksheets[0].iter_rows(values_only=True))
    assert rows[0][:4] == hostile.HEADER
    assert "Molar mass (g/mol)" in rows[0], f"no column added: {rows[0]}; {run.stdout[-800:]}"
    mass_column = rows[0].index("Molar mass (g/mol)")
    assert len(rows) == len(hostile.LINES) + 1
    for line, row in zip(hostile.LINES, rows[1:]):
        assert row[:4] == line  # the line's own cells, where they were
        assert row[mass_column] == pytest.approx(_oracle_mass(line[1]), abs=0.01), row


# ---------------------------------------------------------------------------
# Outputs that cannot be written

SMALL_INPUTS = {
    "xlsx": lambda folder: hostile.xlsx_inventory(folder, 3_000),
    "csv": lambda folder: hostile.csv_large(folder, 600_000),
    "ods": lambda folder: hostile.ods_inventory(folder, 3_000),
}
WRITERS = [
    pytest.param("xlsx", "fill", id="xlsx-fill"),
    pytest.param("xlsx", "annotate", id="xlsx-annotate"),
    pytest.param("csv", "fill", id="csv-fill"),
    pytest.param("ods", "fill", id="ods-fill"),
]


def _write_command(command: str, path: Path, output: Path) -> list:
    if command == "fill":
        return ["fill", path, "-o", output]
    return ["audit", path, "--annotate", output]


def _unwritable(tmp_path: Path, kind: str, command: str, output: Path, **limits) -> None:
    source = tmp_path / "in"
    source.mkdir()
    path = SMALL_INPUTS[kind](source)
    before, beside = fingerprint(path), listing(source)
    run = hostile.run_cellchem(_write_command(command, path, output), **limits)
    assert_ended_cleanly(run)
    assert_names_the_output(run, output)
    assert fingerprint(path) == before
    assert listing(source) == beside


@pytest.mark.parametrize(("kind", "command"), WRITERS)
def test_output_folder_that_is_a_file(tmp_path, kind, command):
    blocker = tmp_path / "reports"
    blocker.write_text("not a folder\n")
    before = fingerprint(blocker)
    _unwritable(tmp_path, kind, command, blocker / f"out.{kind}")
    assert fingerprint(blocker) == before


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes into a read-only folder")
@pytest.mark.parametrize(("kind", "command"), WRITERS)
def test_read_only_output_folder(tmp_path, kind, command):
    out = tmp_path / "out"
    out.mkdir()
    out.chmod(0o555)
    try:
        _unwritable(tmp_path, kind, command, out / f"out.{kind}")
        assert listing(out) == {}
    finally:
        out.chmod(0o755)


@pytest.mark.parametrize(("kind", "command"), WRITERS)
def test_full_disk(tmp_path, kind, command):
    """RLIMIT_FSIZE in the child, SIGXFSZ ignored: a write past 16 KiB fails with EFBIG,
    as on a full disk."""
    out = tmp_path / "out"
    out.mkdir()
    _unwritable(tmp_path, kind, command, out / f"out.{kind}", fsize=16 * 1024)
    assert listing(out) == {}


# Large enough that fill is still writing seconds after it starts (40,000 lines of the
# wide layout: 2.7 MB as .xlsx, 1.1 MB as .ods; the export 30 MB).
LARGE_INPUTS = {
    "xlsx": lambda folder: hostile.xlsx_inventory(folder, 40_000),
    "csv": lambda folder: hostile.csv_large(folder, 30_000_000),
    "ods": lambda folder: hostile.ods_inventory(folder, 40_000),
}


def _writing_into(folder: Path, give_up: float) -> tuple[dict, object]:
    """A watch for run_cellchem: true once the process holds a file in ``folder``
    (named, or anonymous: /proc shows "folder/#inode (deleted)") with bytes in it,
    or once ``give_up`` seconds have passed."""
    seen: dict = {"write": False}
    start = time.perf_counter()
    prefix = str(folder) + os.sep

    def watch(pid: int) -> bool:
        try:
            fds = os.listdir(f"/proc/{pid}/fd")
        except OSError:
            return False
        for fd in fds:
            try:
                target = os.readlink(f"/proc/{pid}/fd/{fd}")
                if target.startswith(prefix) and os.stat(f"/proc/{pid}/fd/{fd}").st_size > 0:
                    seen["write"] = True
                    return True
            except OSError:
                continue
        return time.perf_counter() - start > give_up

    return seen, watch


@pytest.mark.parametrize("kind", sorted(LARGE_INPUTS))
def test_killed_mid_write_leaves_nothing(tmp_path, kind):
    source = tmp_path / "in"
    source.mkdir()
    path = LARGE_INPUTS[kind](source)
    out = tmp_path / "out"
    out.mkdir()
    before, beside = fingerprint(path), listing(source)
    seen, watch = _writing_into(out, give_up=12.0)
    run = hostile.run_cellchem(["fill", path, "-o", out / f"filled.{kind}"], watch=watch)
    if not run.killed:
        pytest.fail(f"fill ended by itself before it could be killed mid-write: {run.describe()}")
    assert listing(out) == {}, f"left after kill -9 (write seen: {seen['write']}): {listing(out)}"
    assert fingerprint(path) == before
    assert listing(source) == beside


# ---------------------------------------------------------------------------
# Outputs get the permissions the umask gives

PLAIN = {
    "xlsx": hostile.xlsx_plain,
    "csv": hostile.csv_plain,
    "ods": hostile.ods_plain,
}


@pytest.mark.parametrize(
    ("kind", "command"),
    [("xlsx", "fill"), ("xlsx", "annotate"), ("csv", "fill"), ("csv", "annotate"), ("ods", "fill")],
)
def test_output_gets_the_umask_permissions(tmp_path, kind, command):
    path = PLAIN[kind](tmp_path)
    out = tmp_path / "out"
    out.mkdir()
    output = out / f"out.{kind}"
    run = hostile.run_cellchem(_write_command(command, path, output))
    assert_ended_cleanly(run)
    assert run.code in (0, 1), run.describe()
    assert listing(out) == {output.name: output.stat().st_size}
    assert stat.S_IMODE(output.stat().st_mode) == 0o644
