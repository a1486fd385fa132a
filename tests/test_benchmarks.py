"""The benchmark scripts run (their timings are not tested: benchmarks print
ratios, they do not assert them), and what they measure is what they say."""

import importlib.util
import shutil
import subprocess
import sys
import zipfile
from pathlib import Path

import hostile
import openpyxl
import pytest

ROOT = Path(__file__).resolve().parents[1]


def _load(name: str):
    """A script of benchmarks/ as a module (by path: benchmarks/ is not put on sys.path,
    where its hostile.py would hide tests/hostile.py)."""
    spec = importlib.util.spec_from_file_location(f"benchmarks_{name}", ROOT / "benchmarks" / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = module
    spec.loader.exec_module(module)
    return module


generate = _load("generate")
bench = _load("run")


def _values(path: Path) -> list[list]:
    """A workbook's rows, empty texts as None and trailing empties cut."""
    out = []
    for row in openpyxl.load_workbook(path, read_only=True)["Stock"].iter_rows(values_only=True):
        row = [None if v == "" else v for v in row]
        while row and row[-1] is None:
            row.pop()
        out.append(row)
    return out


def test_generator_writes_an_inventory_the_audit_reads(tmp_path):
    path = generate.write(200, tmp_path / "inv.xlsx")
    rows = _values(path)
    assert len(rows) == 201 and rows[0][3] == "Formula"
    proc = subprocess.run(
        [sys.executable, "-m", "cellchem", "audit", str(path), "--show", "0"],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert proc.returncode in (0, 1) and "lines checked: " in proc.stdout


def test_generator_stores_texts_as_spreadsheet_programs_do(tmp_path):
    shared = generate.write(300, tmp_path / "shared.xlsx")
    inline = generate.write(300, tmp_path / "inline.xlsx", strings="inline")
    with zipfile.ZipFile(shared) as zf:
        sheet = zf.read("xl/worksheets/sheet1.xml")
        assert b'inlineStr"' not in sheet and b't="s"' in sheet
        assert b"sharedStrings.xml" in zf.read("xl/_rels/workbook.xml.rels")
    with zipfile.ZipFile(inline) as zf:
        assert "xl/sharedStrings.xml" not in zf.namelist()
    assert _values(shared) == _values(inline)


def test_csv_export_holds_the_same_lines(tmp_path):
    import csv

    workbook = _values(generate.write(100, tmp_path / "inv.xlsx"))
    with open(generate.write_csv(100, tmp_path / "inv.csv"), encoding="utf-8", newline="") as fh:
        lines = list(csv.reader(fh))
    assert len(lines) == len(workbook) == 101
    for row, line in zip(workbook, lines):
        assert [str(v) if v is not None else "" for v in row] == line[: len(row)]


def _scan(script: str, path: Path) -> tuple[int, int]:
    proc = subprocess.run(
        [sys.executable, "-c", script, str(path)], capture_output=True, text=True, timeout=120
    )
    assert proc.returncode == 0, proc.stderr
    rows, _, kept, *_ = proc.stdout.split()
    return int(rows), int(kept)


@pytest.mark.parametrize("strings", ["shared", "inline"])
def test_the_xlsx_floor_keeps_the_role_columns(tmp_path, strings):
    path = generate.write(150, tmp_path / "inv.xlsx", strings=strings)
    expected = sum(1 for row in _values(path) for v in row[2:6] if v is not None)
    rows, kept = _scan(bench.SCAN_XLSX, path)
    assert rows == 151
    # the inline form also writes a cell for an empty text
    assert kept == expected if strings == "shared" else kept >= expected


def test_the_ods_and_csv_floors_count_every_line(tmp_path):
    ods = hostile.ods_repeated_rows(tmp_path, repeat=4)  # 1 header + 2 + 4 repeated + 3 lines
    assert _scan(bench.SCAN_ODS, ods)[0] == 10
    csv_path = generate.write_csv(120, tmp_path / "inv.csv")
    assert _scan(bench.SCAN_CSV, csv_path) == (121, 4 * 121)


def test_run_script_prints_its_tables(tmp_path):
    proc = subprocess.run(
        [sys.executable, str(ROOT / "benchmarks" / "run.py"), "--sizes", "300"],
        capture_output=True,
        text=True,
        timeout=600,
    )
    assert proc.returncode == 0, proc.stderr
    out = proc.stdout
    for words in (
        "cellchem audit",
        "cellchem fill",
        "python-calamine read",
        "openpyxl read-only iteration",
        "openpyxl load + save",
        "the floor: expat scan of the role columns",
        "the floor: csv module",
        "target <= 0.3",
        "first sight",
        "layer overhead",
    ):
        assert words in out
    if shutil.which("soffice") or shutil.which("libreoffice"):
        assert "| 300 | ods | cellchem audit |" in out
    else:
        assert "the .ods rows were skipped" in out


def test_hostile_script_prints_seconds_and_memory_per_file():
    proc = subprocess.run(
        [
            sys.executable,
            str(ROOT / "benchmarks" / "hostile.py"),
            "--small",
            "--only",
            "xlsx-whitespace-bomb,csv-long-line",
        ],
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert proc.returncode == 0, proc.stderr
    for command in ("audit", "fill", "annotate"):
        assert (
            f"| xlsx-whitespace-bomb | 1 GiB of whitespace inside <sheetData> | 0.0 | {command} |"
            in proc.stdout
        )
    assert "| csv-long-line |" in proc.stdout and "peak MB" in proc.stdout


def test_substance_lookup_script_prints_its_table():
    proc = subprocess.run(
        [sys.executable, str(ROOT / "benchmarks" / "substance_lookup.py")],
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert proc.returncode == 0, proc.stderr
    assert "first lookup in a process" in proc.stdout and "whole table" in proc.stdout
