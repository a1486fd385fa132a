"""The SDS columns in the audit and ``cellchem survey`` over the demo files: every planted
inconsistency is found at its cell, the right lines draw nothing, and the store's questions
give the figures worked by hand. Check values: EC numbers and GHS label elements from the
EC inventory and GHS/CLP (from memory); masses from molmass (a PyPI library used as an
oracle) and by hand."""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from cellchem.adapters.files.audit import AuditRun, Options, audit_file
from cellchem.adapters.files.survey import survey
from cellchem.cli import main
from cellchem.store import SEGREGATION_CAUTION

ROOT = Path(__file__).resolve().parents[1]
SDS = ROOT / "workbooks" / "demo-sds-summary.xlsx"
STORE = ROOT / "workbooks" / "demo-store.xlsx"


@pytest.fixture(scope="module")
def sds_findings():
    run = AuditRun()
    audit_file(SDS, Options(), run)
    return {(r.column + str(r.row), r.check, r.severity) for r in run.findings if r.severity != "note"}


# (cell, check, severity) of each planted inconsistency of the demo SDS summary (make_demos.py)
PLANTED_SDS = {
    ("E6", "un", "warning"),  # nitric acid with hydrochloric acid's UN1789 (UN2031: UN Model Regulations)
    ("F7", "signal-word", "error"),  # H314 (skin corrosion 1) carries Danger, the line says Warning
    ("I8", "pictograms", "error"),  # H319 and H336 carry GHS07, the line shows GHS02 only
    ("D9", "ec", "error"),  # ethanol is 200-578-6; 200-578-7 fails the check digit
    ("F12", "signal-word", "error"),  # H302 and H319 carry Warning, the line says Danger
    ("H15", "precautionary-statements", "error"),  # P273+P301 joins prevention and response
    ("I16", "pictograms", "warning"),  # GHS06 with H272, H314, H410
    ("G24", "hazard-statements", "error"),  # H3l9: the letter l for a one
    ("G25", "hazard-statements", "error"),  # H999 is no GHS code
    ("D26", "ec", "error"),  # 233-140: a digit group missing
}


def test_every_planted_sds_inconsistency_is_found_and_nothing_else(sds_findings):
    assert sds_findings == PLANTED_SDS


def test_sds_roles_are_read_from_the_headings():
    run = AuditRun()
    audit_file(SDS, Options(), run)
    roles = run.files[0].sheets[0].roles
    for role in ("ec", "un", "signal_word", "hazard_statements", "precautionary_statements", "pictograms"):
        assert role in roles


@pytest.fixture(scope="module")
def store():
    return survey([STORE, SDS], Options())


def _pairs(result):
    return {(c.location, c.family_a, c.family_b) for c in result.conflicts}


def test_the_planted_shelf_conflicts_are_found(store):
    # the pairs of Prudent Practices in the Laboratory (NRC 2011), ch. 5 (from memory): acids with
    # cyanides or sulfides, oxidisers with flammables, strong bases with ammonium salts, water-reactive
    # metals with acids, azides with heavy-metal salts
    assert _pairs(store) == {
        ("Acids cabinet C2", "acid", "cyanide"),
        ("Oxidisers cabinet C3", "oxidiser", "flammable"),
        ("Store B14 shelf 2", "base", "ammonium salt"),
        ("Prep room A cupboard 1", "acid", "sulfide"),
        ("Prep room A cupboard 1", "acid", "water-reactive"),
        ("Poisons cabinet C4", "azide", "heavy metal"),  # sodium azide beside the mercury salts
    }
    # the flammables cabinet holds two solvents and nothing they react with
    assert not [c for c in store.conflicts if c.location.startswith("Flammables")]


def test_totals_duplicates_and_refusals(store):
    by = {(t.formula, t.strength): t for t in store.totals if t.key is not None}
    # NaCl: 3 x 1 kg + 2 x 500 g on shelf 1, 500 g in the prep room (by hand)
    assert by[("NaCl", "")].mass_g == pytest.approx(4500.0)
    # CuSO4.5H2O: 2 x 500 g and 6 x 100 g (by hand)
    assert by[("CuSO4·5H2O", "")].mass_g == pytest.approx(1600.0)
    # 2 x 2.5 L of 37 % hydrochloric acid at 1.18 g/mL (CRC, from memory): about 5.9 kg
    assert by[("HCl", "37 % w/w")].mass_g == pytest.approx(5900, rel=0.01)
    # acetone has no density in the table: its volume is kept in mL, never added to grams
    assert by[("C3H6O", "")].volume_ml == pytest.approx(10_000) and by[("C3H6O", "")].mass_g == 0
    zinc = by[("ZnSO4·7H2O", "")]
    assert zinc.mass_g == 0 and "has no unit" in zinc.refused[0][1]
    assert [(d.key[0], d.location, len(d.lines)) for d in store.duplicates] == [
        ("NaCl", "Store B14 shelf 1", 2)
    ]
    # the SDS summary has no pack sizes or locations: audited, but not part of the store
    assert {line.source for line in store.lines} == {"demo-store.xlsx"}


def test_elements_of_concern_against_molmass(store):
    molmass = pytest.importorskip("molmass")

    def fraction(formula, element):
        f = molmass.Formula(formula)
        return f.composition()[element].fraction

    by = {c.part: c for c in store.concern}
    # 100 g HgCl2 and 2 x 25 g HgO
    assert by["Hg"].mass_g == pytest.approx(
        100 * fraction("HgCl2", "Hg") + 50 * fraction("HgO", "Hg"), rel=1e-4
    )
    # 500 g Pb(NO3)2 and 100 g Pb(CH3COO)2.3H2O
    lead = 500 * fraction("Pb(NO3)2", "Pb") + 100 * fraction("Pb(CH3COO)2(H2O)3", "Pb")
    assert by["Pb"].mass_g == pytest.approx(lead, rel=1e-4)
    # chromium(VI): the chromium of 250 g K2Cr2O7
    assert by["Cr(VI)"].mass_g == pytest.approx(250 * fraction("K2Cr2O7", "Cr"), rel=1e-4)
    assert by["Cd"].mass_g == 0 and not by["Cd"].shares


def test_the_survey_command_writes_its_reports_and_the_caution(tmp_path, capsys):
    before = STORE.read_bytes()
    out, data = tmp_path / "survey.xlsx", tmp_path / "survey.json"
    assert main(["survey", str(STORE), "-o", str(out), "--json", str(data)]) == 1  # conflicts found
    assert STORE.read_bytes() == before  # the input is only read
    printed = capsys.readouterr().out
    assert SEGREGATION_CAUTION in printed and "Acids cabinet C2: acid with cyanide" in printed
    report = json.loads(data.read_text(encoding="utf-8"))
    assert report["caution"] == SEGREGATION_CAUTION
    assert {(c["location"], c["family_a"], c["family_b"]) for c in report["segregation"]} >= {
        ("Acids cabinet C2", "acid", "cyanide")
    }
    from openpyxl import load_workbook

    wb = load_workbook(out, read_only=True)
    assert wb.sheetnames == [
        "Totals",
        "Duplicates",
        "Concern",
        "Segregation",
        "Not compared",
        "Findings",
        "Summary",
    ]
    summary = [r[0] for r in wb["Summary"].iter_rows(values_only=True)]
    assert any(str(v).startswith("CAUTION: An empty list means only") for v in summary)


def test_an_empty_survey_still_says_what_an_empty_list_means(tmp_path, capsys):
    quiet = tmp_path / "quiet.csv"
    quiet.write_text(
        "Location,Item,Formula,Pack size\nShelf 1,Sodium chloride,NaCl,500 g\n", encoding="utf-8"
    )
    assert main(["survey", str(quiet)]) == 0
    printed = capsys.readouterr().out
    assert "none found by these rules" in printed and SEGREGATION_CAUTION in printed


def test_the_survey_refuses_a_part_it_cannot_read(capsys):
    assert main(["survey", str(STORE), "--concern", "Hg,Xq"]) == 2
    assert "--concern" in capsys.readouterr().err


# -- classes found by measuring on stock lists and SDS summaries written for it --------------------


@pytest.mark.parametrize(
    "headings, quantity, count",
    [  # a pack-size heading beside a plain quantity heading: the latter counts the packs (common practice)
        (["Location", "Item", "Pack size", "Qty"], 2, 3),
        (["Room/Cabinet", "Item", "Size", "No. of units"], 2, 3),
        (["Storage location", "Description", "Pack", "Stock (units)"], 2, 3),
        (["Lagerort", "Bezeichnung", "Gebinde", "Menge"], 2, 3),
    ],
)
def test_the_pack_size_and_the_number_of_packs(headings, quantity, count):
    from cellchem.columns import find_layout

    layout = find_layout([headings, ["Shelf 1", "Sodium chloride", "500 g", 2]])
    assert (layout.roles["quantity"], layout.roles["count"]) == (quantity, count)


def test_a_lone_quantity_column_stays_the_amount():
    from cellchem.columns import find_layout

    layout = find_layout([["Item", "Formula", "Qty", "Unit"], ["Sodium chloride", "NaCl", 500, "g"]])
    assert layout.roles["quantity"] == 2 and "count" not in layout.roles


def test_cells_that_say_there_is_nothing_are_not_findings():
    from cellchem import audit_rows

    audit = audit_rows(
        [
            ["Product", "Formula", "CAS No.", "EC No.", "UN No", "Signal word", "H-phrases"],
            ["Buffer solution pH 7.00", None, "mixture", "n/a", "not regulated", "-", "not classified"],
            [
                "Glycine",
                "C2H5NO2",
                "56-40-6",
                "200-272-2",
                "n/a",
                "-",
                "Not a hazardous substance according to Regulation (EC) No 1272/2008",
            ],
            # ammonia solution is registered as ammonium hydroxide, CAS 1336-21-6 (common practice)
            [
                "Ammonia solution 25%",
                None,
                "1336-21-6",
                "215-647-6",
                "UN 2672",
                "Danger",
                "H290, H314, H335, H400",
            ],
        ]
    )
    assert [(row, f.check, f.severity) for row, _col, f in audit.findings if f.severity != "note"] == []


def test_a_multiple_of_a_salt_is_the_same_hydrate_and_a_record_is_one_witness():
    from cellchem.store import StoreLine, concern

    # cadmium sulfate hydrate is 3CdSO4·8H2O (CRC, from memory); the substance table's record for
    # CAS 7790-84-3 gives another ratio, outvoted by the name and the formula
    line = StoreLine("s", "", 2, "Cadmium sulfate hydrate", "3CdSO4·8H2O", "7790-84-3", "250 g")
    (cd,) = concern([line], ["Cd"])
    # 3 x 112.41 / (3 x 208.47 + 8 x 18.015) = 0.4382 (CIAAW weights, by hand)
    assert cd.mass_g == pytest.approx(250 * 3 * 112.41 / (3 * 208.47 + 8 * 18.015), rel=1e-3)
