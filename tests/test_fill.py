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
from cellchem.adapters.fill import _raw_records
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


def test_raw_records_split_like_csv():
    text = 'a,b\r\n"x\r\ny",z\r\nlast'
    assert _raw_records(text) == [("a,b", "\r\n"), ('"x\r\ny",z', "\r\n"), ("last", "")]
    assert [r for r in csv.reader(io.StringIO(text, newline=""))] == [["a", "b"], ["x\r\ny", "z"], ["last"]]


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
    assert main(["fill", str(src), "-o", str(out), "--add", "molar-mass", "--overwrite"]) == 0
    assert openpyxl.load_workbook(out)["Stock"]["C2"].value == "=1+1"


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
    assert findings[0] == ("Sheet", "Row", "Column", "Check", "Severity", "Message", "Suggestion")
    assert any(r[4] == "error" and r[1] == 12 for r in findings[1:])
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
