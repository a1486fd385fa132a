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
    """Sheet rows of the seeded lines: the script inserts seeded line i at index 7 + 11 i of the
    data rows, under a title, a subtitle, a blank row and the header (data starts at row 5)."""
    spec_path = ROOT / "workbooks" / "make_demos.py"
    import importlib.util

    spec = importlib.util.spec_from_file_location("make_demos", spec_path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return [(5 + 7 + 11 * i, why) for i, (*_, why) in enumerate(module.SEEDED)]


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
    # the substance table's witness: the CAS RN is the cell the others agree against
    "CAS of another substance": [("F", "cas", "error")],
    "CAS of the anhydrous salt": [("F", "cas", "error")],
    "CAS digits swapped": [("F", "cas", "error")],
    "organic formula against name, CAS and molar mass": [("D", "formula", "error")],
    "organic CAS of another substance": [("F", "cas", "error")],
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
    assert "so the formula is the cell to check" in text
    assert "so the name is the cell to check" in text
    # the substance table: a CAS RN checked against the line's substance (CRC, from memory)
    assert "agree on" in text
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
        "--header-row",
        "--min-severity",
        "[SHEET:]ROLE=HEADER_OR_LETTER",
        "[SHEET:]N",
    ):
        assert option in out
    assert out.count("e.g.") >= 10
    assert main(["fill", "--help"]) == 0
    out = " ".join(capsys.readouterr().out.split())
    for option in ("--column", "--header-row", "--add", "--sheet", "--overwrite"):
        assert option in out
    assert "e.g. --header-row 4" in out and "--column 'Stock:formula=C'" in out


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


# -- headings, header rows and columns per sheet --------------------------------------------------


def _book(path: Path, sheets: dict[str, list[list[object]]]) -> Path:
    wb = openpyxl.Workbook()
    wb.remove(wb.active)
    for title, rows in sheets.items():
        ws = wb.create_sheet(title)
        for r in rows:
            ws.append(r)
    wb.save(path)
    return path


def test_german_headings_and_a_table_with_no_name_or_formula_column(tmp_path, capsys):
    book = _book(
        tmp_path / "bestand.xlsx",
        {
            "Bestand": [
                ["Bezeichnung", "Summenformel", "Molmasse", "CAS-Nummer", "Menge", "Einheit"],
                ["Sodium chloride", "NaCl", 58.44, "7647-14-5", 500, "g"],
                # KCl is 74.55 g/mol (CRC Handbook, from memory), not 80
                ["Potassium chloride", "KCl", 80, "7447-40-7", 250, "g"],
            ],
            "Preise": [
                ["Art.-Nr.", "Menge", "Einheit", "Preis"],
                ["A-1", 1, "kg", 12.5],
                ["A-2", 5, "kg", 40],
            ],
            "Hinweise": [["Invented data for a test."], ["Nothing here is a table."]],
        },
    )
    report = tmp_path / "r.json"
    code, out, _ = run([book, "--report", report, "--show", "0"], capsys)
    assert code == 1
    assert (
        "[Bestand]: header row 1; name A 'Bezeichnung', formula B 'Summenformel', molar mass C 'Molmasse'"
        in out
    )
    rows = findings(report)
    assert ("Bestand", 3, "C", "molar-mass", "error") in [
        (r["sheet"], r["row"], r["column"], r["check"], r["severity"]) for r in rows
    ]
    # the price sheet is a table the audit cannot check: a warning, in the summary and the report
    assert "[Preise]: WARNING: a table with no name or formula column, not audited" in out
    warned = [r for r in rows if r["check"] == "columns"]
    assert [(r["sheet"], r["row"], r["severity"]) for r in warned] == [("Preise", 1, "warning")]
    assert "'Art.-Nr.', 'Menge', 'Einheit', 'Preis'" in warned[0]["message"]
    # the notes sheet is no table: no warning
    assert "[Hinweise]: not audited: no header row" in out
    assert "1 warning" in out and "warning  columns" in out


def test_header_row_beyond_the_first_20_rows(tmp_path, capsys):
    rows = [[f"note {i}"] for i in range(24)] + [["Name", "Formula", "MW"], ["Sodium chloride", "NaCl", 80]]
    book = _book(
        tmp_path / "late.xlsx", {"Stock": rows, "Other": [["Name", "Formula"], ["Sodium chloride", "NaCl"]]}
    )
    code, out, _ = run([book, "--sheet", "Stock"], capsys)
    assert code == 2 and "no header row" in out
    for option in ("25", "Stock:25"):
        report = tmp_path / f"r{option.replace(':', '')}.json"
        code, out, _ = run([book, "--header-row", option, "--report", report], capsys)
        assert code == 1, out
        assert "[Stock]: header row 25" in out
        assert [(r["sheet"], r["row"], r["column"]) for r in findings(report)] == [("Stock", 26, "C")]
    # a header row given for every sheet that another sheet does not have there
    code, out, _ = run([book, "--header-row", "25"], capsys)
    assert "[Other]: not audited" in out
    code, out, err = run([book, "--header-row", "Stock:zero"], capsys)
    assert code == 2 and "expected a row number" in err


def test_columns_per_sheet_and_columns_for_every_sheet(tmp_path, capsys):
    book = _book(
        tmp_path / "two.xlsx",
        {
            # the formula heading of this sheet is not one cellchem knows
            "New": [["Item", "MW", "Zusammensetzung"], ["Sodium chloride", 58.44, "NaCl"]],
            # NaCl is 58.44 g/mol (CRC Handbook, from memory): 100 is wrong
            "Old": [["Item", "Formula", "MW"], ["Sodium chloride", "NaCl", 100]],
        },
    )
    report = tmp_path / "r.json"
    # a letter for every sheet: column C is the molar mass of 'Old', so 'Old' is not matched (a note), and its
    # molar masses are never read as formulas
    code, out, _ = run([book, "--column", "formula=C", "--report", report], capsys)
    assert code == 0, out
    assert "[Old]: note: not audited, the columns given do not match this sheet" in out
    assert "column C is headed 'MW' here, which is the molar mass column" in out
    assert "[New]: header row 1; name A 'Item', molar mass B 'MW', formula C 'Zusammensetzung'" in out
    assert findings(report) == []
    # a heading for every sheet that 'Old' lacks: not matched, not audited with other columns
    code, out, _ = run([book, "--column", "formula=Zusammensetzung", "--report", report], capsys)
    assert code == 0 and "[Old]: note: not audited" in out and "no column headed 'Zusammensetzung'" in out
    # the sheet's own column wins on its sheet: 'Old' is audited and its wrong molar mass found
    code, out, _ = run(
        [book, "--column", "formula=C", "--column", "Old:formula=B", "--report", report], capsys
    )
    assert code == 1, out
    assert [(r["sheet"], r["row"], r["column"], r["check"]) for r in findings(report)] == [
        ("Old", 2, "C", "molar-mass")
    ]
    # a sheet name no file has is said
    code, out, _ = run([book, "--column", "Olf:formula=B"], capsys)
    assert "--column or --header-row for sheet 'Olf': no file read has a sheet of that name" in out
    # one column, two roles
    code, out, err = run([book, "--column", "formula=C", "--column", "name=c"], capsys)
    assert code == 2 and "one role" in err


def test_a_column_for_every_sheet_fits_a_workbook_with_one_table(tmp_path, capsys):
    # 'Read me' holds no table, so the column given is meant for 'Stock', where it wins over the heading
    book = _book(
        tmp_path / "one.xlsx",
        {
            "Read me": [["Invented data for a test."]],
            "Stock": [["Item", "Formula", "Checked formula"], ["Sodium chloride", "NaCl2", "NaCl"]],
        },
    )
    code, out, _ = run([book, "--column", "formula=C"], capsys)
    assert code == 0, out
    assert "column B 'Formula' is not read as formula: --column names column C" in out


# -- what is printed, in which order, and what the reports hold -----------------------------------

ORDER_TABLE = (
    "Name,Formula,MW\n"
    "Potasium nitrate,KNO3,101.10\n"  # row 2: a misspelled name (a note)
    "Sodium sulfite,Na2SO4,142.04\n"  # row 3: an error
    "Magnesium sulfate,MgSO4·7H2O,246.47\n"  # row 4: a name silent about the hydrate (a warning)
    "Sodium chloride,NaCl,80\n"  # row 5: an error
)


def _printed_rows(out: str, path: Path) -> list[tuple[int, str]]:
    """(row, severity) of each printed finding, in order."""
    got = []
    for line in out.splitlines():
        if line.startswith(str(path) + " "):
            where, severity = line.split("  ")[:2]
            got.append((int(where.rsplit(" ", 1)[1][1:]), severity))
    return got


def test_errors_first_each_line_together(tmp_path, capsys):
    path = tmp_path / "order.csv"
    path.write_text(ORDER_TABLE, encoding="utf-8")
    code, out, _ = run([path], capsys)
    assert code == 1
    printed = _printed_rows(out, path)
    lines = [row for i, (row, _s) in enumerate(printed) if i == 0 or printed[i - 1][0] != row]
    assert lines == [3, 5, 4, 2]  # lines with errors, then warnings, then notes; in row order within each
    assert len(lines) == len({row for row, _s in printed})  # each line's findings together
    assert (
        out.index("Lines with errors:") < out.index("Lines with warnings:") < out.index("Lines with notes:")
    )


@pytest.mark.parametrize("least, shown", [("error", {"error"}), ("warning", {"error", "warning"})])
def test_min_severity(tmp_path, capsys, least, shown):
    path = tmp_path / "order.csv"
    path.write_text(ORDER_TABLE, encoding="utf-8")
    report = tmp_path / "r.json"
    workbook = tmp_path / "f.xlsx"
    code, out, _ = run([path, "--min-severity", least, "--report", report, "-o", workbook], capsys)
    assert code == 1
    assert {s for _r, s in _printed_rows(out, path)} == shown
    assert {r["severity"] for r in findings(report)} == shown
    sheet = openpyxl.load_workbook(workbook)["Findings"]
    assert {sheet.cell(row=i, column=6).value for i in range(2, sheet.max_row + 1)} == shown
    # the summary counts every finding, the notes too
    assert "1 note" in out and f"not printed or reported: --min-severity {least}" in out
    code, out, err = run([path, "--min-severity", "info"], capsys)
    assert code == 2 and "invalid choice" in err


def test_reports_are_sorted_by_severity_then_sheet_and_row(tmp_path, capsys):
    path = tmp_path / "order.csv"
    path.write_text(ORDER_TABLE, encoding="utf-8")
    report = tmp_path / "r.csv"
    run([INVENTORY, path, "--report", report, "-o", tmp_path / "f.xlsx", "--show", "0"], capsys)
    with report.open(encoding="utf-8-sig", newline="") as fh:
        rows = list(csv.DictReader(fh))
    rank = {"error": 0, "warning": 1, "note": 2}
    files = [str(INVENTORY), str(path)]
    keys = [(rank[r["severity"]], files.index(r["file"]), r["sheet"], int(r["row"])) for r in rows]
    assert keys == sorted(keys)
    sheet = openpyxl.load_workbook(tmp_path / "f.xlsx")["Findings"]
    book = [
        (rank[sheet.cell(row=i, column=6).value], sheet.cell(row=i, column=3).value)
        for i in range(2, sheet.max_row + 1)
    ]
    assert [k[0] for k in book] == sorted(k[0] for k in book)


# -- formula cells with no saved value, grouped digits --------------------------------------------


def _rezip(src: Path, dst: Path, change) -> Path:
    import zipfile

    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            zout.writestr(info.filename, change(info.filename, zin.read(info.filename)))
    return dst


def test_formula_cells_with_no_saved_value(tmp_path, capsys):
    import xlsxwriter

    rows = [["Name", "Formula", "MW"], ["Sodium chloride", "NaCl", "=22.99+35.45"]]
    made_by_openpyxl = _book(tmp_path / "openpyxl.xlsx", {"Stock": rows})  # a formula, no value saved
    made_by_xlsxwriter = tmp_path / "xlsxwriter.xlsx"  # 0 saved as the value, recalculation asked for
    wb = xlsxwriter.Workbook(str(made_by_xlsxwriter))
    ws = wb.add_worksheet("Stock")
    ws.write_row(0, 0, rows[0])
    ws.write_row(1, 0, rows[1][:2])
    ws.write_formula(1, 2, rows[1][2])
    wb.close()
    for book, words in (
        (made_by_openpyxl, "the cell holds a spreadsheet formula with no saved value"),
        (made_by_xlsxwriter, "saved value was never computed"),
    ):
        report = tmp_path / "r.json"
        code, out, _ = run([book, "--report", report], capsys)
        assert code == 0, out
        got = findings(report)
        assert [(r["row"], r["column"], r["check"], r["severity"]) for r in got] == [
            (2, "C", "saved-value", "warning")
        ]
        assert (
            words in got[0]["message"]
            and "open and save the file in your spreadsheet program" in got[0]["message"]
        )
        assert "is not a molar mass" not in out and "None" not in out

    # the same file once a spreadsheet program has saved it: the value is read and checked
    def saved(name, data):
        if name == "xl/worksheets/sheet1.xml":
            return data.replace(b"<v></v>", b"<v>58.44</v>").replace(b"<v />", b"<v>58.44</v>")
        if name == "xl/workbook.xml":
            return data.replace(b' fullCalcOnLoad="1"', b"")
        return data

    computed = _rezip(made_by_openpyxl, tmp_path / "saved.xlsx", saved)
    report = tmp_path / "r.json"
    code, out, _ = run([computed, "--report", report], capsys)
    assert code == 0 and findings(report) == []


def test_grouped_digits_in_a_decimal_comma_export(tmp_path, capsys):
    # ammonium molybdate tetrahydrate, 1235.86 g/mol (CRC Handbook, from memory)
    path = tmp_path / "export.csv"
    path.write_text(
        "Formula;Molar mass\n(NH4)6Mo7O24·4H2O;1.235,86\n(NH4)6Mo7O24·4H2O;1.335,86\n", encoding="utf-8"
    )
    report = tmp_path / "r.json"
    code, _out, _ = run([path, "--report", report], capsys)
    assert code == 1
    got = findings(report)
    assert [(r["row"], r["column"], r["check"]) for r in got] == [(3, "B", "molar-mass")]
    assert "1335.86 g/mol" in got[0]["message"]


# -- lock files, permissions -----------------------------------------------------------------------


def test_spreadsheet_lock_files_are_skipped_with_a_note(tmp_path, capsys):
    data = tmp_path / "list.csv"
    data.write_text("Name,Formula\nSodium chloride,NaCl\n", encoding="utf-8")
    excel = tmp_path / "~$stock.xlsx"
    excel.write_bytes(bytes([5]) + b"Alice" + b"\x00" * 156)  # the owner file Excel keeps while it is open
    calc = tmp_path / ".~lock.stock.xlsx#"
    calc.write_text("Alice,host,alice,08.01.2026 10:00,file:///home/alice/.config/libreoffice/4;\n")
    code, out, _ = run([excel, calc, data], capsys)
    assert code == 0, out
    assert "files: 3 (0 could not be used, 2 skipped)" in out
    assert "'~$stock.xlsx' is the lock file a spreadsheet program keeps while 'stock.xlsx' is open" in out
    assert "'.~lock.stock.xlsx#' is the lock file" in out
    assert "NOT READ" not in out


@pytest.mark.parametrize("mask", [0o022, 0o077, 0o002])
def test_reports_get_the_users_usual_permissions(tmp_path, capsys, mask):
    import os
    import stat

    path = tmp_path / "order.csv"
    path.write_text(ORDER_TABLE, encoding="utf-8")
    old = os.umask(mask)
    try:
        outputs = [tmp_path / "r.json", tmp_path / "r.csv", tmp_path / "f.xlsx"]
        run([path, "--report", outputs[0], "-o", outputs[2]], capsys)
        run([path, "--report", outputs[1]], capsys)
        for out in outputs:
            assert stat.S_IMODE(out.stat().st_mode) == 0o666 & ~mask, out
        # a report written over an older one keeps the older one's permissions
        outputs[0].chmod(0o640)
        run([path, "--report", outputs[0]], capsys)
        assert stat.S_IMODE(outputs[0].stat().st_mode) == 0o640
    finally:
        os.umask(old)


# -- the findings workbook on screen and on paper -------------------------------------------------

LONG = " ".join(f"word{i:03d}" for i in range(70))


def _long_records():
    from cellchem.adapters.files.reports import FindingRecord

    return [
        FindingRecord("stock.xlsx", "Stock", r, "D", "name", "error", f"{LONG} row{r}end", "x " * 40)
        for r in range(2, 30)
    ]


def test_findings_workbook_rows_fit_their_text_and_print_on_a4_landscape(tmp_path):
    from cellchem.adapters.files.reports import write_workbook

    out = tmp_path / "f.xlsx"
    write_workbook(out, _long_records(), [("lines checked: 28", "")])
    ws = openpyxl.load_workbook(out)["Findings"]
    width = ws.column_dimensions["G"].width
    assert ws["G2"].alignment.wrap_text
    # at most about 1.2 characters a unit of width fit on a line of the message column (common practice)
    assert ws.row_dimensions[2].height >= 15 * (len(ws["G2"].value) / (1.2 * width))
    assert ws.page_setup.orientation == "landscape" and int(ws.page_setup.paperSize) == 9
    assert ws.sheet_properties.pageSetUpPr.fitToPage and ws.page_setup.fitToWidth == 1
    assert ws.page_setup.fitToHeight == 0
    assert ws.print_title_rows == "$1:$1"


def _pdf_text(tmp_path: Path, book: Path) -> list[str]:
    """The text of each page of a workbook printed to PDF by LibreOffice."""
    import shutil

    if shutil.which("pdftotext") is None:
        pytest.skip("pdftotext (poppler-utils) is not installed")
    profile = tmp_path / "lo-profile"
    subprocess.run(
        [
            _soffice(),
            f"-env:UserInstallation=file://{profile}",
            "--headless",
            "--convert-to",
            "pdf",
            "--outdir",
            str(tmp_path / "pdf"),
            str(book),
        ],
        check=True,
        capture_output=True,
        timeout=180,
    )
    pdf = tmp_path / "pdf" / (book.stem + ".pdf")
    text = subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True, check=True).stdout
    return text.split("\f")


@pytest.mark.skipif(_soffice() is None, reason="LibreOffice is not installed (CI installs it)")
def test_findings_workbook_printed_by_libreoffice_shows_every_word(tmp_path):
    from cellchem.adapters.files.reports import write_workbook

    out = tmp_path / "f.xlsx"
    write_workbook(out, _long_records(), [("lines checked: 28", "")])
    pages = [p for p in _pdf_text(tmp_path, out) if p.strip()]
    words = " ".join(pages).split()
    # no message is cut off under the row below: every word of every one is printed, in order
    for r in range(2, 30):
        at = words.index(f"row{r}end")
        assert words[at - 70 : at] == LONG.split(), r
    # each page of findings repeats the header, with the cell reference and the message on the same page
    finding_pages = [p for p in pages if "row" in p and "word000" in p]
    assert len(finding_pages) >= 2
    for page in finding_pages:
        assert "Column" in page and "Row" in page and "Message" in page


def test_header_row_of_a_text_file_is_its_line_number(tmp_path, capsys):
    path = tmp_path / "late.csv"
    lines = [f"note {i}" for i in range(22)] + ["", "Name,Formula,MW", "Sodium chloride,NaCl,80"]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    code, out, _ = run([path], capsys)
    assert code == 2
    report = tmp_path / "r.json"
    code, out, _ = run([path, "--header-row", "24", "--report", report], capsys)
    assert code == 1 and "header row 24" in out
    assert [(r["row"], r["column"]) for r in findings(report)] == [(25, "C")]
    code, out, _ = run([path, "--header-row", "23"], capsys)
    assert code == 2 and "the header row 23 is empty" in out
