"""The benchmark scripts run (their timings are not tested: benchmarks print
ratios, they do not assert them)."""

import subprocess
import sys
from pathlib import Path

import openpyxl

ROOT = Path(__file__).resolve().parents[1]


def test_generator_writes_an_inventory_the_audit_reads(tmp_path):
    sys.path.insert(0, str(ROOT / "benchmarks"))
    import generate

    path = generate.write(200, tmp_path / "inv.xlsx")
    rows = list(openpyxl.load_workbook(path, read_only=True)["Stock"].iter_rows(values_only=True))
    assert len(rows) == 201 and rows[0][3] == "Formula"
    proc = subprocess.run(
        [sys.executable, "-m", "cellchem", "audit", str(path), "--show", "0"],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert proc.returncode in (0, 1) and "lines checked: " in proc.stdout


def test_run_script_prints_its_tables(tmp_path):
    proc = subprocess.run(
        [sys.executable, str(ROOT / "benchmarks" / "run.py"), "--sizes", "300"],
        capture_output=True,
        text=True,
        timeout=600,
    )
    assert proc.returncode == 0, proc.stderr
    out = proc.stdout
    for words in ("cellchem audit", "cellchem fill", "python-calamine read", "first sight", "layer overhead"):
        assert words in out


def test_substance_lookup_script_prints_its_table():
    proc = subprocess.run(
        [sys.executable, str(ROOT / "benchmarks" / "substance_lookup.py")],
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert proc.returncode == 0, proc.stderr
    assert "first lookup in a process" in proc.stdout and "whole table" in proc.stdout
