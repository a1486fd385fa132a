"""`cellchem audit` end to end: the demo files, CSV exports in each encoding
and separator, column overrides, reports, and files it must refuse.

The expected findings are those the demo script seeds (workbooks/make_demos.py,
invented data); each kind of discrepancy is checked at the row where it was
planted. Chemistry check values behind them are tested against their sources in
test_audit.py, test_cas.py and test_names.py.
"""

from __future__ import annotations

import csv
import hashlib
import io
import json
import subprocess
import sys
from pathlib import Path

import openpyxl
import pytest

from cellchem import audit_rows, cas_is_valid
from cellchem.cli import main

ROOT = Path(__file__).resolve().parents[1]
INVENTORY = ROOT / "workbooks" / "demo-inventory.xlsx"
SUPPLIER = ROOT / "workbooks" / "demo-supplier-table.csv"


def run(args, capsys):
    code = main(["audit", *map(str, args)])
    out = capsys.readouterr()
    return code, out.out, out.err


def findings(path: Path) -> list[dict]:
    return json.loads(path.read_text(encoding="utf-8"))


@pytest.fixture(scope="module")
def demo_report(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo") / "findings.json"
    code = main(["audit", str(INVENTORY), str(SUPPLIER), "--report", str(out), "--show", "0"])
    return code, findings(out)


def test_the_python_api_is_public():
    assert cas_is_valid("7732-18-5")
    audit = audit_rows([["Item", "Formula"], ["Sodium chloride", "NaCl"]])
    assert audit.summary.checked == 1 and not audit.findings


def test_demo_exit_code_and_report_fields(demo_report):
    code, rows = demo_report
    assert code == 1
    assert rows
    for r in rows:
        assert set(r) >= {"file", "sheet", "row", "column", "check", "severity", "message", "suggestion"}
        assert r["severity"] in ("error", "warning", "note")


def _at(rows, file_end, row):
    return [
        (r["column"], r["check"], r["severity"])
        for r in rows
        if r["file"].endswith(file_end) and r["row"] == row
    ]


def _seeded_rows():
    """Sheet rows of the seeded lines: the script inserts seeded line i at index 7 + 13 i of the
    data rows, under a title, a subtitle, a blank row and the header (data starts at row 5)."""
    spec_path = ROOT / "workbooks" / "make_demos.py"
    import importlib.util

    spec = importlib.util.spec_from_file_location("make_demos", spec_path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return [(5 + 7 + 13 * i, why) for i, (*_, why) in enumerate(module.SEEDED)]


EXPECTED = {
    "capitals read as U, C, O": [("D", "formula-case", "warning"), ("D", "name", "error")],
    "formula does not read": [("D", "formula", "error")],
    "formula not balanced": [("D", "charge", "error")],
    "name and formula differ in water": [("D", "name-hydrate", "error")],
    # the formula and the stated molar mass agree: the name is the cell to check
    "a different charge": [("C", "name", "error")],
    "a different ion": [("C", "name", "error")],
    "missing parentheses": [("D", "name", "error")],
    "misspelled name (a note)": [("C", "name-spelling", "note")],
    "open charge settled (a note)": [("C", "name", "note")],
    "name silent about the hydrate": [("C", "name-hydrate", "warning")],
    "wrong molar mass": [("E", "molar-mass", "error")],
    "molar mass of the heptahydrate": [("E", "molar-mass", "error")],
    "molar mass of the anhydrous salt": [("E", "molar-mass", "error")],
    "CAS check digit wrong": [("F", "cas", "error")],
    "CAS without hyphens (a note)": [("F", "cas", "note")],
    "CAS malformed": [("F", "cas", "error")],
    "unknown water count": [("D", "molar-mass", "warning")],
    "open charge that fits no reading": [("C", "name", "error")],
    "a different cation": [("C", "name", "error")],
}


@pytest.mark.parametrize("row, why", _seeded_rows(), ids=[w for _, w in _seeded_rows()])
def test_each_seeded_discrepancy_is_found_where_it_was_planted(demo_report, row, why):
    _, rows = demo_report
    found = _at(rows, "demo-inventory.xlsx", row)
    for expected in EXPECTED[why]:
        assert expected in found, (why, found)


def test_the_messages_say_how_name_and_formula_differ(demo_report):
    _, rows = demo_report
    text = " ".join(r["message"] for r in rows)
    assert "a different charge: the name has iron(II) (Fe2+), the formula iron(III) (Fe3+)" in text
    assert "a different ion: the name has sulfite (SO3 2-), the formula sulfate (SO4 2-)" in text
    assert "missing parentheses" in text
    assert "159.61 g/mol is the molar mass of CuSO4" in text
    assert "the name and the stated molar mass agree, so the formula is the cell to check" in text
    assert "the formula and the stated molar mass agree, so the name is the cell to check" in text
    assert "call for 5" in text or "call for" in text


def test_clean_lines_give_no_findings(demo_report):
    # the catalogue lines of the demo are consistent: no errors outside the seeded rows
    _, rows = demo_report
    seeded = {row for row, _ in _seeded_rows()}
    stray = [
        r for r in rows if r["file"].endswith(".xlsx") and r["severity"] == "error" and r["row"] not in seeded
    ]
    assert stray == []


def test_supplier_table_in_cp1252_with_semicolons(demo_report):
    _, rows = demo_report
    csv_rows = [r for r in rows if r["file"].endswith("demo-supplier-table.csv")]
    assert {r["sheet"] for r in csv_rows} == {""}
    messages = " ".join(r["message"] for r in csv_rows)
    assert "159.61 g/mol is the molar mass of CuSO4" in messages  # 159,61 read with a decimal comma
    assert "CAS RN '144-55-9' fails its check digit" in messages
    assert "147.01 g/mol is the molar mass of CaCl2·2H2O" in messages


def test_summary_says_what_was_read_and_not(capsys):
    code, out, err = run([INVENTORY, SUPPLIER, "--show", "0"], capsys)
    assert code == 1
    assert "hidden sheets not read: 'Old stock 2019'" in out
    assert "[Read me]: not audited" in out
    assert "read as cp1252, fields separated by semicolons, numbers with a decimal comma" in out
    assert "lines checked:" in out and "lines not checked:" in out
    assert "no formula, and the name is not one cellchem reads" in out
    assert "findings:" in out
    assert err == ""  # no progress bar when stderr is not a terminal


def test_hidden_and_chosen_sheets(tmp_path, capsys):
    report = tmp_path / "hidden.json"
    code, out, _ = run([INVENTORY, "--hidden", "--report", report, "--show", "0"], capsys)
    old = [r for r in findings(report) if r["sheet"] == "Old stock 2019"]
    assert any(r["check"] == "molar-mass" for r in old)  # CuSO4 stated as 100 g/mol there
    code, out, _ = run([INVENTORY, "--sheet", "Read me"], capsys)
    assert code == 2 and "no header row" in out
    code, out, _ = run([INVENTORY, "--sheet", "Nope"], capsys)
    assert code == 2 and "has no sheet named 'Nope'" in out


def test_input_is_never_changed(tmp_path, capsys):
    before = hashlib.sha256(INVENTORY.read_bytes()).hexdigest()
    run([INVENTORY, "-o", tmp_path / "f.xlsx", "--report", tmp_path / "f.csv"], capsys)
    assert hashlib.sha256(INVENTORY.read_bytes()).hexdigest() == before
    code, _, err = run([INVENTORY, "--report", INVENTORY], capsys)
    assert code == 2 and "would overwrite the input" in err


def test_report_over_the_input_is_refused(tmp_path, capsys):
    data = tmp_path / "list.csv"
    data.write_text("Name,Formula\nSodium chloride,NaCl\n", encoding="utf-8")
    code, _, err = run([data, "--report", data], capsys)
    assert code == 2 and "would overwrite the input" in err
    assert data.read_text(encoding="utf-8") == "Name,Formula\nSodium chloride,NaCl\n"


# -- CSV exports in each encoding and separator -----------------------------------------------

TABLE = [
    ["Stores list (exported)"],
    [],
    ["Name", "Formula", "Mol. wt.", "CAS No."],
    ["Sodium chloride", "NaCl", "58.44", "7647-14-5"],
    ["Copper(II) sulfate pentahydrate", "CuSO4·5H2O", "159.61", "7758-99-8"],
    ["Ferric chloride, µ-grade", "FeCl3", "162.20", "7705-08-1"],
    ["Potassium nitrate; prilled", "KNO3", "101.10", "7757-79-1"],
]


def _export(rows, delimiter, decimal_comma):
    buf = io.StringIO()
    w = csv.writer(buf, delimiter=delimiter, lineterminator="\r\n")
    for r in rows:
        w.writerow(
            [c.replace(".", ",") if decimal_comma and c[:1].isdigit() and "-" not in c else c for c in r]
        )
    return buf.getvalue()


@pytest.mark.parametrize("encoding", ["utf-8", "utf-8-sig", "utf-16", "cp1252"])
@pytest.mark.parametrize("delimiter", [",", ";", "\t"])
def test_exports_in_each_encoding_and_separator_give_the_same_findings(tmp_path, capsys, encoding, delimiter):
    path = tmp_path / "export.csv"
    path.write_bytes(_export(TABLE, delimiter, decimal_comma=(delimiter == ";")).encode(encoding))
    report = tmp_path / "r.json"
    code, out, err = run([path, "--report", report, "--show", "0"], capsys)
    assert code == 1, out + err
    rows = findings(report)
    got = sorted((r["row"], r["column"], r["check"]) for r in rows if r["severity"] == "error")
    assert got == [(5, "C", "molar-mass"), (6, "D", "cas")]
    assert any("CuSO4·5H2O" in r["message"] for r in rows)  # the middle dot survived the encoding


def test_overrides_and_unknown_headings(tmp_path, capsys):
    path = tmp_path / "odd.csv"
    path.write_text("Stuff,Chem,Weight\nSodium chloride,NaCl,58.44\nx,KCl,10\n", encoding="utf-8")
    code, out, err = run([path], capsys)
    assert code == 2 and "'Stuff', 'Chem', 'Weight'" in out and "--column" in out
    code, out, err = run(
        [path, "--column", "formula=B", "--column", "molar_mass=Weight", "--report", tmp_path / "r.json"],
        capsys,
    )
    assert code == 1
    assert [(r["row"], r["column"]) for r in findings(tmp_path / "r.json")] == [(3, "C")]
    code, out, err = run([path, "--column", "colour=B"], capsys)
    assert code == 2 and "not a role" in err


def test_duplicate_headings_are_reported(tmp_path, capsys):
    path = tmp_path / "dup.csv"
    path.write_text("Name,Formula,Formula\nSodium chloride,NaCl,KCl\n", encoding="utf-8")
    code, out, _ = run([path], capsys)
    assert code == 0 and "duplicate heading 'Formula' in column C" in out


# -- reports --------------------------------------------------------------------------------

HOSTILE_NAME = '=HYPERLINK("http://example.invalid","x")'
FORMULA_FILE = "=1+2.csv"  # a file name that a spreadsheet would compute if it were a live formula


@pytest.fixture()
def hostile_table(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    path = Path(FORMULA_FILE)
    rows = [
        ["Name", "Formula", "MW"],
        [HOSTILE_NAME, "NaCl", "58.44"],
        ["@SUM(1+1)", "KCl", "80"],
        ["+cmd", "NaCl", "1"],
    ]
    with path.open("w", encoding="utf-8", newline="") as fh:
        csv.writer(fh).writerows(rows)
    return path


def test_csv_report_defuses_formulas(hostile_table, tmp_path, capsys):
    report = tmp_path / "r.csv"
    run([hostile_table, "--report", report], capsys)
    with report.open(encoding="utf-8-sig", newline="") as fh:
        cells = [c for row in csv.reader(fh) for c in row]
    assert all(not c.startswith(("=", "+", "-", "@")) for c in cells)
    assert "'" + FORMULA_FILE in cells  # the file column, defused


def test_findings_workbook_structure(hostile_table, tmp_path, capsys):
    out = tmp_path / "f.xlsx"
    code, _, _ = run([hostile_table, "-o", out], capsys)
    assert code == 1
    wb = openpyxl.load_workbook(out)
    ws = wb["Findings"]
    assert [c.value for c in ws[1]] == [
        "File",
        "Sheet",
        "Row",
        "Column",
        "Check",
        "Severity",
        "Message",
        "Suggestion",
    ]
    assert ws.freeze_panes == "A2"
    assert "Findings" in ws.tables
    assert ws.tables["Findings"].ref.startswith("A1:H")
    severities = {ws.cell(row=r, column=6).value for r in range(2, ws.max_row + 1)}
    assert severities <= {"error", "warning", "note"} and "error" in severities
    for row in ws.iter_rows(min_row=2):
        for cell in row:
            assert cell.data_type != "f"  # no cell is a live formula
    assert ws["A2"].value == FORMULA_FILE
    assert "Summary" in wb.sheetnames
    assert any("lines checked" in str(c.value) for c in wb["Summary"]["A"])


def test_findings_workbook_read_by_calamine(hostile_table, tmp_path, capsys):
    calamine = pytest.importorskip("python_calamine")
    out = tmp_path / "f.xlsx"
    run([hostile_table, "-o", out], capsys)
    rows = calamine.CalamineWorkbook.from_path(str(out)).get_sheet_by_name("Findings").to_python()
    assert rows[0][:6] == ["File", "Sheet", "Row", "Column", "Check", "Severity"]
    messages = [r[6] for r in rows[1:]]
    assert any("80 g/mol" in m for m in messages)
    assert any(HOSTILE_NAME in m for m in messages)
    assert rows[1][0] == FORMULA_FILE  # text, not the number 3


def _soffice():
    import shutil

    return shutil.which("soffice") or shutil.which("libreoffice")


@pytest.mark.skipif(_soffice() is None, reason="LibreOffice is not installed (CI installs it)")
def test_findings_workbook_opens_in_libreoffice(hostile_table, tmp_path, capsys):
    out = tmp_path / "f.xlsx"
    run([hostile_table, "-o", out], capsys)
    profile = tmp_path / "lo-profile"
    subprocess.run(
        [
            _soffice(),
            f"-env:UserInstallation=file://{profile}",
            "--headless",
            "--convert-to",
            "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1",
            "--outdir",
            str(tmp_path / "lo"),
            str(out),
        ],
        check=True,
        capture_output=True,
        timeout=180,
    )
    produced = sorted((tmp_path / "lo").glob("*.csv"))
    assert produced, "LibreOffice wrote no CSV"
    text = "\n".join(p.read_text(encoding="utf-8") for p in produced)
    assert "Severity" in text and "error" in text
    assert FORMULA_FILE in text  # kept as text: a computed formula would show 3
    assert "lines checked" in text


# -- files it refuses -----------------------------------------------------------------------


@pytest.mark.parametrize(
    "name, content, words",
    [
        ("locked.xlsx", b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 600, "password"),
        ("page.xlsx", b"<html><body>not a workbook</body></html>", "not a workbook"),
        ("broken.xlsx", b"PK\x03\x04broken", "damaged"),
        ("old.xls", b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1", ".xlsx"),
    ],
)
def test_hostile_files_exit_2_with_one_line(tmp_path, name, content, words):
    path = tmp_path / name
    path.write_bytes(content)
    proc = subprocess.run(
        [sys.executable, "-m", "cellchem", "audit", str(path)], capture_output=True, text=True, timeout=60
    )
    assert proc.returncode == 2
    assert "Traceback" not in proc.stderr + proc.stdout
    line = [ln for ln in proc.stdout.splitlines() if "NOT READ" in ln]
    assert len(line) == 1 and words in line[0]


def test_one_bad_file_does_not_stop_the_others(tmp_path, capsys):
    bad = tmp_path / "bad.xlsx"
    bad.write_bytes(b"nonsense")
    code, out, _ = run([bad, SUPPLIER, "--show", "0"], capsys)
    assert code == 2
    assert "bad.xlsx: NOT READ" in out and "demo-supplier-table.csv: header row 3" in out


def test_help_explains_each_option_with_an_example(capsys):
    assert main(["audit", "--help"]) == 0
    out = capsys.readouterr().out
    for option in (
        "--sheet",
        "--hidden",
        "--column",
        "--report",
        "-o",
        "--encoding",
        "--delimiter",
        "--mass-allowance",
        "--show",
    ):
        assert option in out
    assert out.count("e.g.") >= 8


def test_an_entity_declaration_in_any_part_is_refused(tmp_path, capsys):
    import zipfile

    bomb = tmp_path / "bomb.xlsx"
    with zipfile.ZipFile(INVENTORY) as src, zipfile.ZipFile(bomb, "w") as dst:
        for info in src.infolist():
            dst.writestr(info.filename, src.read(info.filename))
        dst.writestr(
            "xl/sharedStrings.xml",
            '<?xml version="1.0"?><!DOCTYPE sst [<!ENTITY a "aaaa"><!ENTITY b "&a;&a;&a;&a;">]>'
            '<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><si><t>&b;</t></si></sst>',
        )
    code, out, _ = run([bomb], capsys)
    assert code == 2
    assert "entity declaration in 'xl/sharedStrings.xml'" in out
