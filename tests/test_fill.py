"""The values `cellchem fill` computes for a line (cellchem.fill), and the
command's handling of CSV files, names, overwriting and annotated copies.
Molar masses checked against the CRC Handbook values in test_mass.py; here the
check is that fill writes what the core computes and refuses what it must.
Names: IUPAC 2005 IR-5 (from memory)."""

from __future__ import annotations

import csv
import io
from pathlib import Path

import openpyxl
import pytest

from cellchem import CellchemError, molar_mass
from cellchem.adapters.files.text import open_text_table
from cellchem.cli import main
from cellchem.fill import DEFAULT_COLUMNS, fill_line, read_columns

ROOT = Path(__file__).resolve().parents[1]


def test_default_columns():
    assert [c.key for c in read_columns(None)] == list(DEFAULT_COLUMNS)
    assert [c.header for c in read_columns(None)] == [
        "Formula (canonical)",
        "Systematic name",
        "Molar mass (g/mol)",
        "Water of crystallisation",
        "Cations",
        "Anions",
    ]


@pytest.mark.parametrize(
    "spec, words",
    [
        ("colour", "not a column"),
        ("mass-fraction=", "name the element"),
        ("mass-fraction=Qq", "Qq"),
        ("formula,formula", "twice"),
    ],
)
def test_bad_column_lists(spec, words):
    with pytest.raises(CellchemError, match=words):
        read_columns(spec)


def test_a_good_line():
    cols = read_columns("formula,name,molar-mass,water,cations,anions,mass-fraction=Cu,verdict")
    line = fill_line(cols, "CuSO4.5H2O", "Copper(II) sulfate pentahydrate", 249.68)
    assert line.filled
    formula, name, mass, water, cations, anions, copper, verdict = line.values
    assert formula == "CuSO4·5H2O"
    assert name == "copper(II) sulfate pentahydrate"  # IUPAC 2005 IR-5 hydrate name
    assert mass == pytest.approx(float(molar_mass("CuSO4·5H2O")))
    assert water == 5 and cations == "Cu2+" and anions == "SO4 2-"
    # Cu 63.546 / 249.68 = 25.45 % (CRC molar masses, worked by hand)
    assert copper == pytest.approx(25.45, abs=0.01)
    assert verdict == "ok"


def test_name_only_line_is_filled_from_the_name():
    line = fill_line(read_columns("formula,cations,anions"), None, "ammonium iron(II) sulfate hexahydrate")
    assert line.values == ("(NH4)2Fe(SO4)2·6H2O", "2 NH4+, Fe2+", "2 SO4 2-")


@pytest.mark.parametrize(
    "formula, name",
    [
        ("FeCl3", "iron(II) chloride"),  # name and formula disagree: which one is right is not known
        ("NaCl2", "sodium chloride"),  # formula does not balance
        ("co Cl2", None),  # formula does not read
        (None, "iron chloride"),  # the name leaves the charge open and there is no formula
        (None, "Universal indicator solution"),  # nothing reads
    ],
)
def test_lines_that_are_not_filled(formula, name):
    line = fill_line(read_columns("formula,molar-mass,verdict"), formula, name)
    assert not line.filled
    assert line.values[:2] == (None, None)
    assert line.values[2] != "ok"


def test_ionic_strength_needs_a_unit():
    cols = read_columns("ionic-strength")
    assert fill_line(cols, "MgCl2", None, concentration="0.1 M").values == (pytest.approx(0.3),)
    assert fill_line(cols, "MgCl2", None, concentration=0.1, unit="mol/L").values == (pytest.approx(0.3),)
    assert fill_line(cols, "MgCl2", None, concentration=0.1).values == (None,)  # no unit: not guessed


def test_raw_records_split_like_csv(tmp_path):
    text = 'a,b\r\n"x\r\ny",z\r\n5" disk,"q\n"\nlast'
    path = tmp_path / "list.csv"
    path.write_bytes(text.encode("utf-8"))
    records = list(open_text_table(path, delimiter=",").records())
    assert [r.raw for r in records] == ["a,b\r\n", '"x\r\ny",z\r\n', '5" disk,"q\n"\n', "last"]
    assert [r.line for r in records] == [1, 2, 4, 6]
    # a quote inside a cell that does not start with one is an ordinary character
    expected = [["a", "b"], ["x\r\ny", "z"], ['5" disk', "q\n"], ["last"]]
    assert [r.fields for r in records] == expected
    assert list(csv.reader(io.StringIO(text, newline=""))) == expected


def test_csv_fill_keeps_every_byte_and_the_dialect(tmp_path, capsys):
    src = tmp_path / "list.csv"
    lines = [
        "Stores list",
        "Item;Formula;Mol. wt.",
        "Sodium chloride;NaCl;58,44",
        '"Copper sulphate; 5-hydrate";CuSO4·5H2O;249,68',
        "=cmd|' /C calc'!A0;KCl;74,55",
        "",
    ]
    raw = "\r\n".join(lines).encode("cp1252")
    src.write_bytes(raw)
    out = tmp_path / "list-filled.csv"
    assert main(["fill", str(src), "--add", "formula,molar-mass"]) == 0
    data = out.read_bytes()
    text = data.decode("cp1252")
    got = text.split("\r\n")
    for original, written in zip(lines, got):
        assert written.startswith(original)
    assert got[1].endswith(";Formula (canonical);Molar mass (g/mol)")
    assert got[2].endswith(";NaCl;58,44")
    assert got[4].startswith("=cmd")  # the user's cell is kept as it was
    new_cells = [row[3:] for row in csv.reader(io.StringIO(text, newline=""), delimiter=";")]
    assert all(not c.startswith(("=", "+", "-", "@")) for row in new_cells for c in row)
    assert src.read_bytes() == raw


def test_fill_refuses_the_input_as_output_and_an_existing_default(tmp_path, capsys):
    src = tmp_path / "list.csv"
    src.write_text("Item,Formula\nSodium chloride,NaCl\n", encoding="utf-8")
    assert main(["fill", str(src), "-o", str(src)]) == 2
    (tmp_path / "list-filled.csv").write_text("x", encoding="utf-8")
    assert main(["fill", str(src)]) == 2
    assert "already exists" in capsys.readouterr().err


def _workbook(path: Path, rows) -> Path:
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Stock"
    for r in rows:
        ws.append(r)
    wb.save(path)
    return path


def test_refill_fills_in_place_and_keeps_values(tmp_path, capsys):
    src = _workbook(tmp_path / "s.xlsx", [["Item", "Formula"], ["Sodium chloride", "NaCl"], ["x", "KCl"]])
    first = tmp_path / "first.xlsx"
    assert main(["fill", str(src), "-o", str(first), "--add", "molar-mass"]) == 0
    # a user edits a computed cell and empties another; a refill keeps the edit, fills the gap
    wb = openpyxl.load_workbook(first)
    ws = wb["Stock"]
    assert ws["C1"].value == "Molar mass (g/mol)"
    ws["C2"] = 1.0
    ws["C3"] = None
    wb.save(first)
    second = tmp_path / "second.xlsx"
    assert main(["fill", str(first), "-o", str(second), "--add", "molar-mass"]) == 0
    ws = openpyxl.load_workbook(second)["Stock"]
    assert ws["C2"].value == 1.0
    assert ws["C3"].value == pytest.approx(float(molar_mass("KCl")))
    assert ws["D1"].value is None  # no second column
    third = tmp_path / "third.xlsx"
    assert main(["fill", str(first), "-o", str(third), "--add", "molar-mass", "--overwrite"]) == 0
    assert openpyxl.load_workbook(third)["Stock"]["C2"].value == pytest.approx(float(molar_mass("NaCl")))


def test_formulas_are_never_overwritten(tmp_path, capsys):
    src = _workbook(
        tmp_path / "s.xlsx", [["Item", "Formula", "Molar mass (g/mol)"], ["Sodium chloride", "NaCl", "=1+1"]]
    )
    out = tmp_path / "o.xlsx"
    # the molar-mass cell is a formula openpyxl saved without a value: its content is not known, so the
    # line is not filled (exit 1), and the verdict says why
    assert main(["fill", str(src), "-o", str(out), "--add", "molar-mass,verdict", "--overwrite"]) == 1
    ws = openpyxl.load_workbook(out)["Stock"]
    assert ws["C2"].value == "=1+1"
    assert "spreadsheet formula with no saved value" in ws["D2"].value


def test_protected_sheet_is_refused(tmp_path, capsys):
    path = tmp_path / "p.xlsx"
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.append(["Item", "Formula"])
    ws.append(["Sodium chloride", "NaCl"])
    ws.protection.sheet = True
    wb.save(path)
    out = tmp_path / "o.xlsx"
    assert main(["fill", str(path), "-o", str(out)]) == 2
    assert "protected" in capsys.readouterr().err
    assert not out.exists()


def test_audit_annotate_adds_a_check_column_and_a_findings_sheet(tmp_path, capsys):
    out = tmp_path / "annotated.xlsx"
    code = main(
        ["audit", str(ROOT / "workbooks" / "demo-inventory.xlsx"), "--annotate", str(out), "--show", "0"]
    )
    assert code == 1
    wb = openpyxl.load_workbook(out, read_only=True)
    assert wb.sheetnames[-1] == "cellchem findings"
    findings = list(wb["cellchem findings"].iter_rows(values_only=True))
    assert findings[0] == ("Cell", "Sheet", "Row", "Column", "Check", "Severity", "Message", "Suggestion")
    assert any(r[5] == "error" and r[2] == 12 and r[0] == f"{r[3]}12" for r in findings[1:])
    stock = list(wb["Stock"].iter_rows(min_row=4, max_row=12, values_only=True))
    assert stock[0][9] == "cellchem check"
    assert stock[1][9] == "ok"
    assert stock[8][9].startswith("error: the name 'Copper(II) oxide'")


def test_damaged_workbooks_are_refused_without_a_traceback(tmp_path, capsys):
    # bytes flipped in the package or in its XML parts: exit 2 and no output, never an exception
    import random
    import zipfile

    src = (ROOT / "workbooks" / "demo-inventory.xlsx").read_bytes()
    rng = random.Random(11)
    for i in range(40):
        if i % 2:
            data = bytearray(src)
            for _ in range(rng.randint(1, 20)):
                data[rng.randrange(len(data))] = rng.randrange(256)
        else:
            with zipfile.ZipFile(io.BytesIO(src)) as z:
                parts = {n: z.read(n) for n in z.namelist()}
            name = rng.choice(sorted(parts))
            part = bytearray(parts[name])
            for _ in range(rng.randint(1, 10)):
                part[rng.randrange(len(part))] = rng.choice(b'<>"/=&x0 ')
            parts[name] = bytes(part)
            buf = io.BytesIO()
            with zipfile.ZipFile(buf, "w") as z:
                for n, d in parts.items():
                    z.writestr(n, d)
            data = bytearray(buf.getvalue())
        path = tmp_path / f"damaged-{i}.xlsx"
        path.write_bytes(bytes(data))
        out = tmp_path / f"out-{i}.xlsx"
        code = main(["fill", str(path), "-o", str(out)])
        assert code in (0, 1, 2)
        if code == 2:
            assert not out.exists()
        assert main(["audit", str(path), "--show", "0"]) in (0, 1, 2)
    capsys.readouterr()


# -- nothing written that a cell of the line contradicts ------------------------------------------


def _filled_csv(tmp_path: Path, text: str, *args: str) -> tuple[int, list[list[str]], str]:
    src = tmp_path / "list.csv"
    src.write_text(text, encoding="utf-8")
    out = tmp_path / "out.csv"
    code = main(["fill", str(src), "-o", str(out), *args])
    rows = list(csv.reader(out.open(encoding="utf-8", newline=""))) if out.exists() else []
    return code, rows, str(out)


def test_a_formula_in_a_column_fill_cannot_see_stops_the_line(tmp_path, capsys):
    # 'Zusammensetzung' is not a heading cellchem reads: fill sees only the name column
    text = (
        "Substance,Zusammensetzung,Hazardous\n"
        "Iron(III) sulfate,FeSO4,No\n"  # the hidden formula is iron(II) sulfate: nothing may be written
        "Sodium chloride,NaCl,No\n"  # the hidden formula agrees: filled ('No' is no formula here)
        "Potassium nitrate,,Yes\n"  # nothing contradicts the name: filled
    )
    code, rows, _ = _filled_csv(tmp_path, text, "--add", "formula,molar-mass,verdict")
    assert code == 1
    assert rows[1][3:5] == ["", ""]
    assert "'FeSO4' reads as the formula of FeSO4, not Fe2(SO4)3" in rows[1][5]
    assert rows[2][3] == "NaCl" and rows[3][3] == "KNO3"
    # once the formula column is named, the name and the formula disagree: still nothing written
    code, rows, _ = _filled_csv(tmp_path, text, "--add", "formula,verdict", "--column", "formula=B")
    assert code == 1 and rows[1][3] == "" and rows[1][4].startswith("error")


def test_a_name_in_a_column_fill_cannot_see_stops_the_line(tmp_path, capsys):
    text = "Formula,Bemerkung\nFeSO4,Iron(III) sulfate\nNaCl,sodium chloride\n"
    code, rows, _ = _filled_csv(tmp_path, text, "--add", "formula,verdict")
    assert code == 1
    assert rows[1][2] == "" and "reads as the name of Fe2(SO4)3" in rows[1][3]
    assert rows[2][2] == "NaCl"


def test_no_name_and_no_formula_column_writes_nothing(tmp_path, capsys):
    code, rows, out = _filled_csv(tmp_path, "Code,Qty,CAS No.\nA-1,5,7647-14-5\n")
    assert code == 2 and rows == [] and not Path(out).exists()
    assert "nothing was written" in capsys.readouterr().err
    book = _workbook(tmp_path / "codes.xlsx", [["Code", "Qty", "CAS No."], ["A-1", 5, "7647-14-5"]])
    assert main(["fill", str(book), "-o", str(tmp_path / "o.xlsx")]) == 2
    assert not (tmp_path / "o.xlsx").exists()
    assert "fill needs a table with a name or formula column" in capsys.readouterr().err


def test_a_name_silent_about_water_fills_only_what_water_leaves_alone():
    cols = read_columns("formula,name,molar-mass,water,cations,anions,verdict")
    # magnesium sulfate has hydrates (MgSO4·7H2O, Epsom salt; CRC Handbook, from memory): the name alone
    # does not say which is on the shelf
    line = fill_line(cols, None, "Magnesium sulfate")
    assert line.filled and line.partly
    assert line.values[:4] == (None, None, None, None)
    assert line.values[4:6] == ("Mg2+", "SO4 2-")
    assert "does not say the water of crystallisation" in line.values[6]
    # a name that says the hydrate, or anhydrous, fixes it
    assert fill_line(cols, None, "Magnesium sulfate heptahydrate").values[0] == "MgSO4·7H2O"
    assert fill_line(cols, None, "Magnesium sulfate, anhydrous").values[0] == "MgSO4"
    # sodium chloride has no hydrate a store holds: the name fixes it
    assert fill_line(cols, None, "Sodium chloride").values[0] == "NaCl"
    # with a formula cell the formula says the water
    assert fill_line(cols, "MgSO4·7H2O", "Magnesium sulfate").values[0] == "MgSO4·7H2O"


def test_a_stated_molar_mass_is_a_second_opinion():
    cols = read_columns("formula,molar-mass,verdict")
    # CuSO4·5H2O is 249.68 g/mol, CuSO4 159.61 g/mol (CRC Handbook, from memory): which one the shelf holds
    # is not known from the formula alone
    line = fill_line(cols, "CuSO4·5H2O", None, "159.61")
    assert not line.filled and "159.61 g/mol does not match CuSO4·5H2O" in line.values[2]
    # a name that agrees with the formula outvotes the molar mass, and the computed value is written
    line = fill_line(cols, "CuSO4·5H2O", "copper(II) sulfate pentahydrate", "159.61")
    assert line.filled and line.values[1] == pytest.approx(249.68, abs=0.01)
    # a name alone against the molar mass: NaCl is 58.44 g/mol (CRC Handbook, from memory)
    assert not fill_line(cols, None, "Sodium chloride", "80").filled
    assert fill_line(cols, None, "Sodium chloride", "58.44").filled


def test_a_formula_cell_with_no_saved_value_is_not_filled_around():
    from cellchem.audit import NO_SAVED_VALUE

    line = fill_line(read_columns("formula,verdict"), NO_SAVED_VALUE, "Sodium chloride")
    assert not line.filled and "no saved value" in line.values[1]


# -- header rows, columns per sheet, lock files, permissions --------------------------------------


def test_fill_with_a_header_row_and_columns_per_sheet(tmp_path, capsys):
    path = tmp_path / "two.xlsx"
    wb = openpyxl.Workbook()
    wb.active.title = "Notes"
    wb.active.append(["Invented data for a test."])
    ws = wb.create_sheet("Stock")
    for i in range(24):
        ws.append([f"note {i}"])
    ws.append(["Item", "Zusammensetzung"])
    ws.append(["Sodium chloride", "NaCl"])
    wb.save(path)
    out = tmp_path / "o.xlsx"
    assert main(["fill", str(path), "-o", str(out)]) == 2  # no header in the first 20 rows
    args = ["fill", str(path), "-o", str(out), "--add", "formula", "--header-row", "Stock:25"]
    assert main([*args, "--column", "Stock:formula=B"]) == 0
    assert openpyxl.load_workbook(out)["Stock"]["C26"].value == "NaCl"
    assert "header row 25" in capsys.readouterr().out


def test_fill_refuses_a_lock_file(tmp_path, capsys):
    lock = tmp_path / "~$stock.xlsx"
    lock.write_bytes(bytes([5]) + b"Alice" + b"\x00" * 156)
    assert main(["fill", str(lock), "-o", str(tmp_path / "o.xlsx")]) == 2
    assert "lock file" in capsys.readouterr().err


@pytest.mark.parametrize("mask", [0o022, 0o027])
def test_fill_output_gets_the_users_usual_permissions(tmp_path, capsys, mask):
    import os
    import stat

    src = _workbook(tmp_path / "s.xlsx", [["Item", "Formula"], ["Sodium chloride", "NaCl"]])
    csv_src = tmp_path / "s.csv"
    csv_src.write_text("Item,Formula\nSodium chloride,NaCl\n", encoding="utf-8")
    old = os.umask(mask)
    try:
        for source, out in ((src, tmp_path / "o.xlsx"), (csv_src, tmp_path / "o.csv")):
            assert main(["fill", str(source), "-o", str(out)]) == 0
            assert stat.S_IMODE(out.stat().st_mode) == 0o666 & ~mask
    finally:
        os.umask(old)


def test_fill_reads_grouped_digits_in_a_decimal_comma_export(tmp_path, capsys):
    # ammonium molybdate tetrahydrate, 1235.86 g/mol (CRC Handbook, from memory)
    code, _rows, _ = _filled_csv(
        tmp_path, "Formula;MW\n(NH4)6Mo7O24·4H2O;1.235,86\n", "--add", "formula,verdict"
    )
    assert code == 0
    out = (tmp_path / "out.csv").read_text(encoding="utf-8").splitlines()
    assert out[1].endswith(";ok")


def test_annotated_findings_sheet_is_made_to_be_read(tmp_path, capsys):
    out = tmp_path / "annotated.xlsx"
    main(["audit", str(ROOT / "workbooks" / "demo-inventory.xlsx"), "--annotate", str(out), "--show", "0"])
    wb = openpyxl.load_workbook(out)
    ws = wb["cellchem findings"]
    assert all(c.font.b for c in ws[1])
    assert ws.column_dimensions["G"].width >= 60 and ws["G2"].alignment.wrap_text
    assert ws.page_setup.orientation == "landscape" and int(ws.page_setup.paperSize) == 9
    assert ws.sheet_properties.pageSetUpPr.fitToPage and ws.print_title_rows == "$1:$1"
    rank = {"error": 0, "warning": 1, "note": 2}
    keys = [
        (rank[ws.cell(row=r, column=6).value], ws.cell(row=r, column=3).value)
        for r in range(2, ws.max_row + 1)
    ]
    assert keys == sorted(keys)
    for r in range(2, ws.max_row + 1):
        cell = ws.cell(row=r, column=1)
        sheet, row, column = (ws.cell(row=r, column=c).value for c in (2, 3, 4))
        assert cell.hyperlink is not None and cell.hyperlink.location == f"'{sheet}'!{column or 'A'}{row}"
        target = wb[sheet][f"{column or 'A'}{row}"]
        assert target.row == row
    # the user's own sheet is untouched by the new formats: its header keeps its style
    source = openpyxl.load_workbook(ROOT / "workbooks" / "demo-inventory.xlsx")
    assert wb["Stock"]["C4"].font.b == source["Stock"]["C4"].font.b
