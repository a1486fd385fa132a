"""The command line on the demo list and on bad input (exit codes 0/1/2);
`check-formulas` is `audit FILE --show all` under its old name."""

import subprocess
import sys
from pathlib import Path

from cellchem.cli import main

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "workbooks" / "demo-stock-list.csv"


def test_demo_list_reports_the_planted_defects(capsys):
    code = main(["check-formulas", str(DEMO)])
    out = capsys.readouterr().out
    assert code == 1  # the demo holds lines with errors
    # line 4: the anhydrous molar mass given against the pentahydrate formula
    assert "159.61 g/mol is the molar mass of CuSO4" in out
    # line 13: NaCl2 does not balance
    assert "NaCl2 is not balanced: sodium forms only Na+; two chloride ions carry 2-" in out
    # line 14: wrong case is refused with the readings
    assert "did you mean 'Co Cl2·6H2O' or 'CO Cl2·6H2O'?" in out
    # line 15: all capitals read as written, flagged
    assert "'CUO' is written in capitals" in out
    assert "lines checked: 24" in out
    # line 15: the name says copper(II) oxide, the formula reads as C, U, O
    assert "the name 'Copper(II) oxide' and the molar mass 79.55 agree on CuO; the formula says CUO" in out


def test_clean_list_exits_0(tmp_path, capsys):
    f = tmp_path / "clean.csv"
    f.write_text("Item,Formula,MW\nsalt,NaCl,58.44\nwater,H2O,18.015\n", encoding="utf-8")
    assert main(["check-formulas", str(f)]) == 0
    assert "lines checked: 2" in capsys.readouterr().out


def test_semicolon_list_and_bom(tmp_path, capsys):
    f = tmp_path / "semi.csv"
    f.write_bytes("\ufeffArtikel;Formel;Molar mass\nKochsalz;NaCl;58,44\n".encode())
    assert main(["check-formulas", str(f)]) == 0
    assert "lines checked: 1" in capsys.readouterr().out


def test_the_old_name_reads_what_audit_reads(capsys):
    """The shipped supplier table (cp1252, semicolons, decimal commas) is
    read by both names with the same findings."""
    table = ROOT / "workbooks" / "demo-supplier-table.csv"
    old = main(["check-formulas", str(table)])
    old_out = capsys.readouterr().out
    new = main(["audit", str(table), "--show", "all"])
    assert (old, old_out) == (new, capsys.readouterr().out)
    assert "read as cp1252" in old_out


def test_column_options_are_passed_on(tmp_path, capsys):
    f = tmp_path / "odd.csv"
    f.write_text("Item,Chem,Weight\nsalt,NaCl,58.44\nsoda,Na2CO3,105.99\n", encoding="utf-8")
    assert main(["check-formulas", str(f), "--formula-column", "Chem", "--mass-column", "Weight"]) == 0
    assert "lines checked: 2" in capsys.readouterr().out


def test_missing_column_exits_2(tmp_path, capsys):
    f = tmp_path / "nocol.csv"
    f.write_text("Qty,Price\n1,2\n", encoding="utf-8")
    assert main(["check-formulas", str(f)]) == 2


def test_unreadable_file_exits_2(tmp_path, capsys):
    assert main(["check-formulas", str(tmp_path / "absent.csv")]) == 2


def test_latin1_is_read(tmp_path, capsys):
    f = tmp_path / "latin.csv"
    f.write_bytes("Item,Formula\nsulfate de cuivre \xe9,CuSO4\n".encode("latin-1"))
    main(["check-formulas", str(f)])
    assert "read as cp1252" in capsys.readouterr().out


def test_bad_usage_exits_2():
    assert main(["no-such-command"]) == 2


def test_python_dash_m_runs(tmp_path):
    out = subprocess.run(
        [sys.executable, "-m", "cellchem", "check-formulas", str(DEMO)], capture_output=True, text=True
    )
    assert out.returncode == 1
    assert "lines checked" in out.stdout


def test_input_file_is_not_written(tmp_path):
    before = DEMO.read_bytes()
    main(["check-formulas", str(DEMO)])
    assert DEMO.read_bytes() == before
