"""Questions of the whole store: totals, duplicates, elements of concern and segregation.

The store below is invented (a fictional school site; the locations are made up). Check
values: totals worked by hand from the pack sizes; densities from suppliers' labels
(common practice, from memory); mass fractions from molmass (an independent oracle with
its own atomic weights: agreement to 1e-4 relative); the segregation pairs from National
Research Council, Prudent Practices in the Laboratory (2011), chapter 5 (from memory) and
the CLP meanings of the H statements (Regulation (EC) No 1272/2008, Annex III, from memory).
"""

import random

import molmass
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from cellchem import CellchemError
from cellchem.store import (
    CONCERN_NOTE,
    DEFAULT_CONCERN,
    SEGREGATION_CAUTION,
    TOTALS_NOTE,
    StoreLine,
    concern,
    duplicates,
    families,
    fold_location,
    hazard_codes,
    identify,
    line_strength,
    segregation,
    substance_key,
    totals,
    unchecked,
    weigh_line,
)

FAST = settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])

FILE = "stores-2024.xlsx"


def line(row, name=None, formula=None, cas=None, quantity=None, count=1, location=None, hazards=None, **kw):
    return StoreLine(FILE, "Stock", row, name, formula, cas, quantity, count, location, hazards, **kw)


# Hillside Academy science stores (invented).
STORE = [
    line(
        2,
        "Hydrochloric acid 37%",
        "HCl",
        "7647-01-0",
        "2.5 L",
        2,
        "Acid cabinet, shelf 1",
        "H290, H314, H335",
    ),
    line(3, "Sulfuric acid 96%", "H2SO4", "7664-93-9", "2.5 L", 1, "Acid cabinet, shelf 1", "H290 H314"),
    line(4, "Nitric acid 65%", "HNO3", "7697-37-2", "1 L", 1, "Acid cabinet, shelf 2", "H272, H290, H314"),
    line(5, "Hydrochloric acid 2 M", "HCl", None, "1 L", 3, "Prep room B, shelf 3"),
    line(6, "Sodium hydroxide pellets", "NaOH", "1310-73-2", "1 kg", 2, "Prep room B, shelf 3", "H290, H314"),
    line(
        7,
        "Potassium cyanide",
        "KCN",
        "151-50-8",
        "100 g",
        1,
        "Poisons cupboard",
        "H290, H300+H310+H330, EUH032",
    ),
    line(8, "Mercury(II) chloride", "HgCl2", "7487-94-7", "100 g", 1, "Poisons cupboard", "H300, H314"),
    line(9, "Potassium dichromate", "K2Cr2O7", "7778-50-9", "500 g", 1, "Oxidisers, shelf 1", "H272, H350"),
    line(10, "Lead(II) nitrate", "Pb(NO3)2", "10099-74-8", "250 g", 1, "Oxidisers, shelf 1", "H272, H360"),
    line(11, "Ethanol absolute", None, "64-17-5", "2.5 L", 4, "Solvent store", "H225, H319"),
    line(12, "Acetone", None, "67-64-1", "2.5 L", 2, "Solvent store", "H225, H319, H336"),
    line(
        13, "Copper(II) sulfate pentahydrate", "CuSO4·5H2O", "7758-99-8", "500 g", 1, "Prep room B, shelf 1"
    ),
    line(14, "Copper(II) sulfate anhydrous", "CuSO4", "7758-98-7", "250 g", 1, "Prep room B, shelf 1"),
    line(15, "copper(II) sulfate pentahydrate", "CuSO4.5H2O", None, "1 kg", 1, "prep room b,  shelf 1"),
    line(16, "Silver nitrate solution 0.1 M", "AgNO3", None, "1 L", 1, "Prep room B, shelf 2"),
    line(
        17,
        "Barium chloride dihydrate",
        "BaCl2·2H2O",
        "10326-27-9",
        "500 g",
        1,
        "Prep room B, shelf 2",
        "H301, H332",
    ),
    line(18, "Sodium metal", "Na", "7440-23-5", "100 g", 1, "Water-reactives", "H260, H314"),
    line(
        19, "Ammonia solution 25%", "NH3", "1336-21-6", "2.5 L", 1, "Prep room B, shelf 3", "H314, H335, H400"
    ),
    line(20, "Ammonium chloride", "NH4Cl", "12125-02-9", "500 g", 1, "Prep room B, shelf 3", "H302, H319"),
    line(21, "Potassium iodide", "KI", "7681-11-0", "2 x 50 tablets", 1, "Prep room B, shelf 2"),
    line(22, "Sodium chloride", "NaCl", "7647-14-5", "6 x 500 g", 1, "Prep room B, shelf 1"),
    line(23, "Sodium chloride", "NaCl", None, "3 kg", 1, "Main store, bay 4"),
    line(
        24,
        "Potassium permanganate",
        "KMnO4",
        "7722-64-7",
        "500 g",
        1,
        "Oxidisers, shelf 2",
        "H272, H302, H410",
    ),
    line(25, "Glycerol", None, "56-81-5", "1 L", 1, "Oxidisers, shelf 2"),
    line(26, "Hydrogen peroxide 30%", "H2O2", "7722-84-1", "1 L", 1, "Oxidisers, shelf 2", "H302, H318"),
    line(
        27, "Sodium thiosulfate pentahydrate", "Na2S2O3·5H2O", "10102-17-7", "500", 1, "Prep room B, shelf 1"
    ),
    line(28, "Magnesium ribbon", "Mg", "7439-95-4", "25 g", 1, "Metals", "H228, H252, H261"),
    line(29, "Sodium azide", "NaN3", "26628-22-8", "25 g", 1, "Poisons cupboard", "H300, H410, EUH032"),
    line(
        30,
        "Lead(II) acetate trihydrate",
        "Pb(CH3COO)2·3H2O",
        "6080-56-4",
        "250 g",
        1,
        "Poisons cupboard",
        "H360",
    ),
    line(31, "Methanol", None, None, "2.5 L", 1, "Oxidisers, shelf 1", "H225, H301+H311+H331, H370"),
    line(32, "Sulfuric acid 95-97%", "H2SO4", "7664-93-9", "2.5 L", 1, "Acid cabinet, shelf 1", "H290, H314"),
    line(33, "Sodium sulfide nonahydrate", "Na2S·9H2O", None, "500 g", 1, None, "H290, H301, H314, EUH031"),
    line(34, "Universal indicator solution", None, None, "500 mL", 1, "Prep room B, shelf 2", "H225"),
]
ROW = {ln.row: ln for ln in STORE}


def frac(formula: str, symbol: str) -> float:
    """Mass fraction of an element by molmass (the oracle)."""
    return molmass.Formula(formula).composition()[symbol].fraction


# ---------------------------------------------------------------------------
# What a line holds
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "kwargs, key",
    [
        ({"formula": "CuSO4.5H2O"}, ("CuSO4·5H2O", "")),
        ({"formula": "CuSO4"}, ("CuSO4", "")),  # the anhydrous salt is another substance
        ({"name": "copper(II) sulfate pentahydrate"}, ("CuSO4·5H2O", "")),
        ({"formula": "CuSO4·5H2O", "cas": "7758-99-8"}, ("CuSO4·5H2O", "7758-99-8")),
        ({"cas": "7758-99-8"}, ("CuSO4·5H2O", "7758-99-8")),  # the record's name read back
        ({"cas": "7758998"}, ("CuSO4·5H2O", "7758-99-8")),  # a CAS RN without hyphens
        ({"name": "Ethanol absolute", "cas": "64-17-5"}, ("C2H6O", "64-17-5")),  # an organic name: by CAS RN
        ({"formula": "CuSO4·5H2O", "name": "copper(II) sulfate"}, ("CuSO4·5H2O", "")),  # water not stated
        ({"formula": "NH3", "name": "Ammonia solution 25%", "cas": "1336-21-6"}, ("NH3", "1336-21-6")),
        ({"formula": "NaCl", "name": "Natriumchlorid"}, ("NaCl", "")),  # a name cellchem does not read
    ],
    ids=lambda v: str(v),
)
def test_substance_key(kwargs, key):
    assert substance_key(line(99, **kwargs)) == key


@pytest.mark.parametrize(
    "kwargs, reason",
    [
        ({}, "the line has no formula, name or CAS RN; give the formula"),
        (
            {"formula": "NaQ"},
            "formula 'NaQ' cannot be read: unknown element symbol 'Q' at position 3 in 'NaQ'",
        ),
        ({"formula": "SO4 2-"}, "formula 'SO4 2-' is an ion, not a substance on a shelf; give a compound"),
        (
            {"formula": "NaCl", "name": "potassium chloride"},
            "the name 'potassium chloride' reads as KCl but the formula cell holds NaCl; correct one of them",
        ),
        (
            {"formula": "CuSO4·5H2O", "name": "copper(II) sulfate anhydrous"},
            "the name 'copper(II) sulfate anhydrous' reads as CuSO4 but the formula cell holds CuSO4·5H2O;"
            " correct one of them",
        ),
        (
            {"formula": "NaCl", "cas": "7647-14-6"},
            "CAS RN '7647-14-6' fails its check digit: the digits 7647-14 call for 5, not 6; correct the CAS"
            " RN or leave its cell empty",
        ),
        (
            {"formula": "CuSO4", "cas": "7758-99-8"},
            "CAS RN 7758-99-8 is copper(II) sulfate pentahydrate (CuH10O9S) in cellchem's substance table,"
            " but the line's formula is CuSO4; correct one of them",
        ),
        (
            {"cas": "9999999-98-4"},  # a valid check digit, no record
            "CAS RN 9999999-98-4 is not in cellchem's substance table and the line has no formula or name"
            " cellchem reads; give the formula",
        ),
        (
            {"name": "iron chloride"},
            "name 'iron chloride' cannot be read ('iron chloride' leaves the charge of iron open; it may be"
            " iron(III) chloride: FeCl3; iron(II) chloride: FeCl2 (give a Stock number such as 'iron(III)'));"
            " give the formula or a CAS RN the substance table holds",
        ),
    ],
    ids=lambda v: str(v)[:40],
)
def test_lines_that_cannot_be_identified(kwargs, reason):
    ln = line(99, **kwargs)
    assert substance_key(ln) is None
    assert identify(ln).reason == reason


@pytest.mark.parametrize(
    "kwargs, label",
    [
        ({"name": "Hydrochloric acid 37%"}, "37 % w/w"),  # a reagent of the density table: % w/w
        ({"name": "Hydrochloric acid, 37 %", "formula": "HCl"}, "37 % w/w"),
        ({"name": "Silver nitrate solution 0.1 M"}, "0.1 mol/L"),
        ({"name": "silver nitrate solution 0,1 mol/L"}, "0.1 mol/L"),
        ({"name": "Hydrogen peroxide 30% w/w"}, "30 % w/w"),
        ({"formula": "NaCl", "name": "Saline 0.9 % w/v"}, "0.9 % w/v"),
        ({"formula": "NaCl", "strength": "5 g/L"}, "5 g/L"),
        ({"formula": "HCl", "strength": 37}, "37 % w/w"),
        ({"name": "Copper standard solution", "formula": "Cu(NO3)2", "strength": "1000 ppm"}, "1 g/L"),
    ],
    ids=lambda v: str(v),
)
def test_strengths(kwargs, label):
    s = line_strength(line(99, **kwargs))
    assert s is not None and s.label == label and s.reason == ""


@pytest.mark.parametrize(
    "kwargs",
    [
        {"name": "Sodium chloride 99.5%"},  # a purity
        {"name": "Sodium chloride >=99 %"},
        {"name": "Copper(II) sulfate pentahydrate 99+%"},
        {"name": "Acetic acid glacial"},
        {"formula": "NaCl"},
    ],
    ids=lambda v: str(v),
)
def test_no_strength(kwargs):
    assert line_strength(line(99, **kwargs)) is None


@pytest.mark.parametrize(
    "kwargs, reason",
    [
        (
            {"name": "Sulfuric acid 95-97%"},
            "the strength '95-97%' is a range; give one strength (such as the lower figure)",
        ),
        (
            {"name": "Sodium hypochlorite solution 12%"},
            "the strength '12%' does not say % w/w or % w/v; write the strength as '% w/w' or '% w/v'",
        ),
        ({"name": "Ammonia solution"}, "the name 'Ammonia solution' says solution but gives no strength"),
        (
            {"name": "Ammonia solution 0.88"},  # a specific gravity, the old name of about 35 % NH3
            "the strength '0.88' is a volume strength or a specific gravity, which cellchem does not convert;"
            " give the strength as % w/w",
        ),
        (
            {"name": "Hydrogen peroxide 100 vol"},
            "the strength '100 vol' is a volume strength or a specific gravity, which cellchem does not"
            " convert; give the strength as % w/w",
        ),
        (
            {"name": "Sodium hydroxide solution 1 N"},
            "the strength '1 N' cannot be read: unit 'N': normality (N) depends on the reaction the solution"
            " is for (acid-base or redox); give mol/L, or eq/L for charge equivalents",
        ),
        (
            {"name": "Hydrochloric acid 37%, 2 M"},
            "the name 'Hydrochloric acid 37%, 2 M' states more than one strength (37%, 2 M); give the"
            " strength apart",
        ),
        (
            {"formula": "NaCl", "strength": "5 % v/v"},
            "the strength '5 % v/v' is % v/v, which needs the densities of the liquids mixed",
        ),
    ],
    ids=lambda v: str(v)[:40],
)
def test_strengths_not_read(kwargs, reason):
    s = line_strength(line(99, **kwargs))
    assert s is not None and s.label == "" and s.reason == reason


# ---------------------------------------------------------------------------
# Totals
# ---------------------------------------------------------------------------


def by_key(results, formula, strength=""):
    found = [t for t in results if t.formula == formula and t.strength == strength]
    assert len(found) == 1, (formula, strength, [(t.formula, t.strength) for t in results])
    return found[0]


def test_totals_of_the_store():
    t = totals(STORE)
    # 6 x 500 g with its CAS RN and 3 kg without: one substance, 6000 g (by hand)
    nacl = by_key(t, "NaCl")
    assert nacl.key == ("NaCl", "7647-14-5") and nacl.mass_g == 6000.0
    assert {ln.row for ln in nacl.lines} == {22, 23}
    # hydrates are separate: 500 g + 1 kg of the pentahydrate, 250 g of the anhydrous salt
    assert by_key(t, "CuSO4·5H2O").mass_g == 1500.0
    assert by_key(t, "CuSO4").mass_g == 250.0
    # 2 x 2.5 L of 37 % HCl at the label density 1.18-1.19 g/mL: 5900-5950 g (common practice)
    hcl = by_key(t, "HCl", "37 % w/w")
    assert 5900 - 25 <= hcl.mass_g <= 5950 + 25
    assert hcl.volume_ml == 0.0
    assert any("density table" in n for e in hcl.entries for n in e.notes)
    # 3 x 1 L of 2 M HCl: no density known, kept as 3000 mL, never added to grams
    dilute = by_key(t, "HCl", "2 mol/L")
    assert (dilute.mass_g, dilute.volume_ml) == (0.0, 3000.0)
    # ethanol by its CAS RN: 4 x 2.5 L, a volume
    assert by_key(t, "C2H6O").volume_ml == 10000.0
    # counted items are kept apart: 2 x 50 tablets
    ki = by_key(t, "KI")
    assert (ki.mass_g, ki.volume_ml, ki.items) == (0.0, 0.0, 100.0)
    # a range of strength is not read: the volume is kept
    assert by_key(t, "H2SO4", "solution, strength not read (95-97%)").volume_ml == 2500.0
    # a pack with no unit is refused with the reason
    thio = by_key(t, "Na2S2O3·5H2O")
    assert thio.mass_g == 0.0
    assert thio.refused == (
        (ROW[27], "pack '500' has no unit; give the amount with its unit, such as '500 g' or '1 L'"),
    )
    # the unidentified lines come last, with the reason
    last = t[-1]
    assert last.key is None and {ln.row for ln in last.lines} == {31, 34}
    assert all(reason.startswith("substance not identified: name ") for _, reason in last.refused)


def test_count_multiplies_the_packs():
    one = weigh_line(line(1, formula="NaCl", quantity="500 g"))
    three = weigh_line(line(1, formula="NaCl", quantity="500 g", count=3))
    assert (one.mass_g, three.mass_g) == (500.0, 1500.0)
    assert weigh_line(line(1, formula="NaCl", quantity="500 g", count=0)).mass_g == 0.0
    for bad in (-1, True, "3", float("nan")):
        with pytest.raises(CellchemError, match="is not a number of packs"):
            weigh_line(line(1, formula="NaCl", quantity="500 g", count=bad))
    with pytest.raises(CellchemError, match=r"no pack size given \(read None\)"):
        weigh_line(line(1, formula="NaCl"))


def test_a_density_on_the_line_wins_over_the_table():
    ln = line(1, "Hydrochloric acid 37%", "HCl", quantity="1 L", density=1.18)
    assert weigh_line(ln).mass_g == pytest.approx(1180.0)
    assert weigh_line(
        line(1, "Bromine", "Br2", quantity="100 mL", density="3.10 g/mL")
    ).mass_g == pytest.approx(310.0)


# totals are additive: splitting a list in two and adding the totals of each part gives the
# totals of the whole (per formula and strength; a line without a CAS RN may join a different
# key in a part, so the property is stated per formula)
@FAST
@given(st.lists(st.booleans(), min_size=len(STORE), max_size=len(STORE)))
def test_totals_are_additive_over_splitting(mask):
    a = [ln for ln, m in zip(STORE, mask, strict=True) if m]
    b = [ln for ln, m in zip(STORE, mask, strict=True) if not m]

    def per_formula(results):
        out: dict[tuple[str, str], list[float]] = {}
        for t in results:
            acc = out.setdefault((t.formula, t.strength), [0.0, 0.0, 0.0, 0])
            acc[0] += t.mass_g
            acc[1] += t.volume_ml
            acc[2] += t.items
            acc[3] += len(t.refused)
        return out

    whole, left, right = per_formula(totals(STORE)), per_formula(totals(a)), per_formula(totals(b))
    for key, values in whole.items():
        parts = [left.get(key, [0.0, 0.0, 0.0, 0]), right.get(key, [0.0, 0.0, 0.0, 0])]
        for i in range(4):
            assert values[i] == pytest.approx(parts[0][i] + parts[1][i])
    assert set(left) | set(right) == set(whole)


# ---------------------------------------------------------------------------
# Duplicates
# ---------------------------------------------------------------------------


def test_duplicates():
    found = duplicates(STORE)
    # the pentahydrate twice on 'Prep room B, shelf 1' (case and spaces folded); the anhydrous salt
    # beside them and NaCl in another room are not duplicates
    assert [(d.key, d.location, [ln.row for ln in d.lines]) for d in found] == [
        (("CuSO4·5H2O", "7758-99-8"), "Prep room B, shelf 1", [13, 15])
    ]
    assert found[0].strength == ""


def test_different_strengths_on_one_shelf_are_not_duplicates():
    lines = [
        line(1, "Hydrochloric acid 37%", "HCl", quantity="2.5 L", location="Shelf 1"),
        line(2, "Hydrochloric acid 2 M", "HCl", quantity="1 L", location="shelf 1"),
        line(3, "Hydrochloric acid 2 M", "HCl", quantity="1 L", location="Shelf 1 "),
        line(4, "Hydrochloric acid 2 M", "HCl", quantity="1 L", location=None),
        line(5, "Hydrochloric acid 2 M", "HCl", quantity="1 L", location="Shelf 2"),
    ]
    [d] = duplicates(lines)
    assert [ln.row for ln in d.lines] == [2, 3] and d.strength == "2 mol/L"


def test_fold_location():
    assert (
        fold_location("  Prep room B ,shelf 3 ")
        == fold_location("prep room b, shelf 3")
        == "prep room b, shelf 3"
    )
    assert fold_location(None) == "" == fold_location("   ")
    assert fold_location("Shelf 3") != fold_location("Shelf 4")


# ---------------------------------------------------------------------------
# Elements and ions of concern
# ---------------------------------------------------------------------------


def test_concern_in_the_store():
    result = {c.part: c for c in concern(STORE)}
    assert tuple(result) == DEFAULT_CONCERN
    # mercury: 100 g of HgCl2 (molmass: Hg 73.88 %)
    assert result["Hg"].mass_g == pytest.approx(100 * frac("HgCl2", "Hg"), rel=1e-4)
    # lead: 250 g of Pb(NO3)2 and 250 g of lead(II) acetate trihydrate
    lead = 250 * frac("Pb(NO3)2", "Pb") + 250 * frac("Pb(C2H3O2)2(H2O)3", "Pb")
    assert result["Pb"].mass_g == pytest.approx(lead, rel=1e-4)
    assert {s.line.row for s in result["Pb"].shares} == {10, 30}
    # chromium(VI): 500 g of K2Cr2O7, all its chromium
    assert result["Cr(VI)"].mass_g == pytest.approx(500 * frac("K2Cr2O7", "Cr"), rel=1e-4)
    # barium: 500 g of BaCl2·2H2O
    assert result["Ba"].mass_g == pytest.approx(500 * frac("BaCl2(H2O)2", "Ba"), rel=1e-4)
    # silver: 1 L of 0.1 mol/L AgNO3 holds 0.1 mol of Ag, 107.8682 g/mol (CIAAW 2021): 10.787 g
    assert result["Ag"].mass_g == pytest.approx(10.78682, rel=1e-5)
    assert result["Cd"].mass_g == 0.0 and result["Cd"].shares == ()
    # lines whose substance is not known are listed apart for every part (they might hold it)
    assert {ln.row for ln, _ in result["Cd"].unweighed} == {31, 34}


def test_concern_of_solutions_worked_by_hand():
    lines = [
        # 0.05 mol/L x 0.5 L x 200.59 g/mol Hg = 5.015 g
        line(1, "Mercury(II) chloride solution 0.05 M", quantity="500 mL"),
        # 5 % w/v: 50 g of HgCl2 in 1 L
        line(2, "mercury(II) chloride 5% w/v", "HgCl2", quantity="1 L"),
        # 2 % w/w of 1 kg: 20 g of HgCl2
        line(3, None, "HgCl2", quantity="1 kg", strength="2 % w/w"),
        # 0.1 mol/L in 1 kg at 1.02 g/mL: 980.4 mL, 0.09804 mol of Hg
        line(4, None, "HgCl2", quantity="1 kg", strength="0.1 M", density=1.02),
    ]
    [hg] = concern(lines, ["Hg"])
    by_row = {s.line.row: s.mass_g for s in hg.shares}
    assert by_row[1] == pytest.approx(0.025 * 200.59, rel=1e-4)
    assert by_row[2] == pytest.approx(50 * frac("HgCl2", "Hg"), rel=1e-4)
    assert by_row[3] == pytest.approx(20 * frac("HgCl2", "Hg"), rel=1e-4)
    assert by_row[4] == pytest.approx(1000 / 1.02 / 1000 * 0.1 * 200.59, rel=1e-4)


def test_what_cannot_be_weighed_is_listed_apart():
    lines = [
        line(1, "Mercury", quantity="100 mL"),  # a liquid with no density
        line(2, "Mercury", quantity="1 kg"),
        line(3, None, "HgCl2", quantity="1 kg", strength="0.1 M"),  # a mass of a molar solution
        line(4, None, "HgCl2", quantity="10 tablets"),
        line(5, "mercury(II) chloride solution", "HgCl2", quantity="1 L"),  # strength not stated
        line(6, None, "HgCl2", quantity="500"),
    ]
    [hg] = concern(lines, ["Hg"])
    assert hg.mass_g == 1000.0  # the element, by hand
    assert dict((ln.row, reason) for ln, reason in hg.unweighed) == {
        1: "pack '100 mL' is a volume with no known density; give the density or the mass",
        3: "pack '1 kg' is a mass of a solution at 0.1 mol/L, whose volume needs the solution's density;"
        " give the density or the volume",
        4: "pack '10 tablets' counts items, which have no mass",
        5: "the name 'mercury(II) chloride solution' says solution but gives no strength",
        6: "pack '500' has no unit; give the amount with its unit, such as '500 g' or '1 L'",
    }


def test_chromium_vi_is_read_from_the_ions():
    lines = [
        line(1, None, "K2Cr2O7", quantity="100 g"),
        line(2, None, "CrO3", quantity="100 g"),
        line(3, None, "PbCrO4", quantity="100 g"),
        line(4, None, "Na2Cr2O7·2H2O", quantity="100 g"),
        line(5, None, "Cr2O3", quantity="1 kg"),  # chromium(III): not counted, not listed
        line(6, None, "CrCl3·6H2O", quantity="1 kg"),
        line(7, None, "Cr", quantity="1 kg"),
        line(8, None, "[Cr(H2O)6]Cl3", quantity="100 g"),  # Cr in a complex: state not read
        line(9, None, "CrO2Cl2", quantity="100 g"),  # chromyl chloride, Cr(VI), which the ions misread
    ]
    [cr6, cr3] = concern(lines, ["Cr(VI)", "Cr(III)"])
    expected = 100 * (
        frac("K2Cr2O7", "Cr") + frac("CrO3", "Cr") + frac("PbCrO4", "Cr") + frac("Na2Cr2O7(H2O)2", "Cr")
    )
    assert cr6.mass_g == pytest.approx(expected, rel=1e-4)
    assert {s.line.row for s in cr6.shares} == {1, 2, 3, 4}
    assert {ln.row for ln, _ in cr6.not_counted} == {8, 9}
    assert dict((ln.row, r) for ln, r in cr6.not_counted)[9] == (
        "the charge balance reads Cr in CrO2Cl2 as +2 but the usual oxidation numbers of its other elements"
        " give +6; its oxidation state is not read"
    )
    assert {s.line.row for s in cr3.shares} == {5, 6}
    assert cr3.mass_g == pytest.approx(
        1000 * frac("Cr2O3", "Cr") + 1000 * frac("CrCl3(H2O)6", "Cr"), rel=1e-4
    )


def test_an_ion_of_concern():
    lines = [
        line(1, None, "KCN", quantity="100 g"),
        line(2, None, "K3[Fe(CN)6]", quantity="500 g"),  # cyanide bound in a complex
        line(3, None, "CH3CN", quantity="1 L", hazards="H225"),  # a nitrile
        line(4, None, "NaCl", quantity="1 kg"),
    ]
    [cn] = concern(lines, ["CN"])
    # molmass: (C + N) / KCN
    assert cn.mass_g == pytest.approx(100 * (frac("KCN", "C") + frac("KCN", "N")), rel=1e-4)
    assert {ln.row for ln, _ in cn.not_counted} == {2, 3}
    assert cn.unweighed == ()


@pytest.mark.parametrize(
    "part, message",
    [
        (
            "Xx",
            "part 'Xx' is not an element symbol ('Hg'), an element with an oxidation state ('Cr(VI)') or an"
            " ion or group ('CN')",
        ),
        (
            "Cr(XV)",
            "part 'Cr(XV)': expected an element symbol with an oxidation state in Roman numerals, such as"
            " 'Cr(VI)'",
        ),
        ("", "part '': give an element symbol ('Hg'), 'Cr(VI)' or an ion or group ('CN')"),
    ],
)
def test_parts_that_cannot_be_read(part, message):
    with pytest.raises(CellchemError) as info:
        concern(STORE, [part])
    assert str(info.value) == message


@FAST
@given(st.lists(st.booleans(), min_size=len(STORE), max_size=len(STORE)))
def test_concern_is_additive_over_splitting(mask):
    a = [ln for ln, m in zip(STORE, mask, strict=True) if m]
    b = [ln for ln, m in zip(STORE, mask, strict=True) if not m]
    for whole, left, right in zip(concern(STORE), concern(a), concern(b), strict=True):
        assert whole.mass_g == pytest.approx(left.mass_g + right.mass_g, abs=1e-9)
        assert len(whole.unweighed) == len(left.unweighed) + len(right.unweighed)


# ---------------------------------------------------------------------------
# Families and segregation
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "kwargs, names",
    [
        ({"formula": "HCl"}, ["acid"]),
        ({"formula": "HNO3"}, ["oxidiser", "acid"]),
        ({"formula": "H3PO4"}, ["acid"]),
        ({"formula": "CH3COOH", "hazards": "H226, H314"}, ["acid", "flammable"]),
        ({"formula": "CH3COOH"}, []),  # a weak organic acid with no H statements
        ({"formula": "NaOH"}, ["base"]),
        ({"formula": "NH3"}, ["base"]),
        ({"formula": "NH4OH"}, ["base"]),  # ammonia solution, not an ammonium salt
        ({"formula": "Na2CO3"}, []),  # carbonates are not bases here
        ({"formula": "NaCN"}, ["cyanide"]),
        ({"formula": "K3[Fe(CN)6]"}, []),
        ({"formula": "Na2S·9H2O"}, ["sulfide"]),
        ({"formula": "NaOCl"}, ["oxidiser", "hypochlorite"]),
        ({"formula": "KMnO4"}, ["oxidiser", "chlorate or permanganate"]),
        ({"formula": "K2Cr2O7"}, ["oxidiser"]),
        ({"formula": "H2O2"}, ["oxidiser"]),
        ({"formula": "Na"}, ["water-reactive"]),
        ({"formula": "CaC2"}, ["water-reactive"]),
        ({"formula": "C6H6"}, []),  # a hydrocarbon is not taken for a carbide
        ({"formula": "LiAlH4"}, ["water-reactive"]),
        ({"formula": "NaN3"}, ["azide"]),
        ({"formula": "NH4Cl"}, ["ammonium salt"]),
        ({"formula": "Pb(NO3)2"}, ["oxidiser", "heavy metal"]),
        ({"formula": "C2H5OH"}, []),  # never flammable by formula
        ({"formula": "C2H5OH", "hazards": "H225, H319"}, ["flammable"]),
        ({"name": "Methanol", "hazards": "H225, H301+H311+H331"}, ["flammable"]),  # H statements only
        ({"name": "Product X", "hazards": "H271"}, ["oxidiser"]),
        ({"name": "Product Y", "hazards": "EUH014"}, ["water-reactive"]),
        ({"name": "Product Z", "hazards": "EUH032"}, ["gas with acids"]),
        ({"name": "Product W", "hazards": "H314"}, []),  # H314 without an acid formula
    ],
    ids=lambda v: str(v),
)
def test_families(kwargs, names):
    assert [f.name for f in families(line(99, **kwargs))] == names


def test_hazard_codes():
    assert hazard_codes("H290, H314; H302+H332 EUH071 h225") == (
        "H290",
        "H314",
        "H302",
        "H332",
        "EUH071",
        "H225",
    )
    assert hazard_codes("H360FD P280") == ("H360",)
    assert hazard_codes(None) == ()


def conflicts(result):
    return {(fold_location(c.location), c.family_a, c.family_b) for c in result}


def test_segregation_in_the_store():
    result = segregation(STORE)
    assert conflicts(result) == {
        # 2 M HCl beside NaOH pellets and ammonia solution
        ("prep room b, shelf 3", "acid", "base"),
        # NaOH and ammonia solution beside ammonium chloride
        ("prep room b, shelf 3", "base", "ammonium salt"),
        # sodium azide beside mercury(II) chloride and lead acetate
        ("poisons cupboard", "azide", "heavy metal"),
        # dichromate and lead nitrate (H272) beside methanol (H225)
        ("oxidisers, shelf 1", "oxidiser", "flammable"),
        # not on 'Prep room B, shelf 2': the universal indicator solution (H225) stands beside
        # 0.1 M silver nitrate, the solution of an oxidising salt, which is no oxidiser without H272
    }
    azide = next(c for c in result if c.family_a == "azide")
    assert [ln.row for ln in azide.lines_a] == [29] and [ln.row for ln in azide.lines_b] == [8, 30]
    assert (
        azide.caution == "azides with lead, copper, mercury or silver form shock-sensitive, explosive azides"
    )
    assert "Prudent Practices" in azide.source


def test_an_acid_beside_a_cyanide():
    lines = [
        line(1, "Hydrochloric acid 37%", "HCl", quantity="2.5 L", location="Prep room B, shelf 3"),
        line(2, "Potassium cyanide", "KCN", quantity="100 g", location="prep room B,shelf 3"),
    ]
    [c] = segregation(lines)
    assert (c.family_a, c.family_b, c.location) == ("acid", "cyanide", "Prep room B, shelf 3")
    assert c.caution == "acids with cyanides release hydrogen cyanide, a highly toxic gas"
    assert [ln.row for ln in c.lines_a] == [1] and [ln.row for ln in c.lines_b] == [2]


def test_an_oxidiser_beside_a_flammable_by_h_statements():
    lines = [
        line(1, "Oxidiser A", None, quantity="1 kg", location="Shelf 5", hazards="H272"),
        line(2, "Solvent B", None, quantity="1 L", location="Shelf 5", hazards="H225"),
    ]
    [c] = segregation(lines)
    assert (c.family_a, c.family_b) == ("oxidiser", "flammable")
    assert c.caution == "oxidisers with flammable substances can start or intensify a fire, or explode"


def test_the_same_pair_on_different_shelves_is_no_conflict():
    lines = [
        line(1, None, "HCl", quantity="2.5 L", location="Acid cabinet, shelf 1"),
        line(2, None, "KCN", quantity="100 g", location="Poisons cupboard"),
        line(3, None, "HNO3", quantity="1 L", location="Acid cabinet, shelf 2", hazards="H272"),
        line(4, None, "C2H5OH", quantity="1 L", location="Solvent store", hazards="H225"),
    ]
    assert segregation(lines) == []


def test_lines_with_no_location_are_never_put_together():
    lines = [
        line(1, None, "HCl", quantity="2.5 L", location=None),
        line(2, None, "KCN", quantity="100 g", location=None),
        line(3, None, "NaN3", quantity="25 g", location="  "),
        line(4, None, "H2SO4", quantity="1 L", location=""),
    ]
    assert segregation(lines) == []
    assert [reason for _, reason in unchecked(lines)] == ["no location: not compared with any other line"] * 4


def test_the_solution_of_an_oxidising_salt_is_an_oxidiser_only_by_its_h_statements():
    solvent = line(1, "Ethanol", "C2H5OH", quantity="1 L", location="S", hazards="H225")
    solid = line(2, "Potassium permanganate", "KMnO4", quantity="500 g", location="S")
    dilute = line(3, "Potassium permanganate solution 0.02 M", "KMnO4", quantity="1 L", location="S")
    labelled = line(
        4, "Potassium permanganate solution 0.02 M", "KMnO4", quantity="1 L", location="S", hazards="H272"
    )
    nitric = line(5, "Nitric acid 65%", "HNO3", quantity="1 L", location="S")
    assert conflicts(segregation([solvent, solid])) == {("s", "oxidiser", "flammable")}
    assert segregation([solvent, dilute]) == []
    assert conflicts(segregation([solvent, labelled])) == {("s", "oxidiser", "flammable")}
    assert conflicts(segregation([solvent, nitric])) == {("s", "oxidiser", "flammable")}
    assert families(dilute) == ()
    acid = line(6, "Sulfuric acid 96%", "H2SO4", quantity="2.5 L", location="S")
    assert conflicts(segregation([acid, solid])) == {("s", "acid", "chlorate or permanganate")}
    assert segregation([acid, dilute]) == []
    bleach = line(7, "Sodium hypochlorite solution 12% w/w", "NaOCl", quantity="5 L", location="S")
    assert conflicts(segregation([acid, bleach])) == {("s", "acid", "hypochlorite")}


def test_one_line_in_both_families_is_not_a_conflict_with_itself():
    # calcium hypochlorite is an oxidiser and a hypochlorite; alone on a shelf it conflicts with nothing
    assert segregation([line(1, None, "Ca(OCl)2", quantity="1 kg", location="S")]) == []
    # beside an acid it does: acids with hypochlorites release chlorine
    result = segregation(
        [
            line(1, None, "Ca(OCl)2", quantity="1 kg", location="S"),
            line(2, None, "HCl", quantity="1 L", location="S"),
        ]
    )
    assert ("s", "acid", "hypochlorite") in conflicts(result)


def test_unchecked_lines_are_said():
    reasons = dict((ln.row, r) for ln, r in unchecked(STORE))
    assert reasons[33] == "no location: not compared with any other line"
    assert reasons[31].endswith("placed by its H statements only")
    assert set(reasons) == {31, 33, 34}


@FAST
@given(st.randoms(use_true_random=False))
def test_segregation_does_not_depend_on_the_order_of_lines(rnd: random.Random):
    shuffled = list(STORE)
    rnd.shuffle(shuffled)

    def rows(result):
        return {
            (
                fold_location(c.location),
                c.family_a,
                c.family_b,
                frozenset(ln.row for ln in c.lines_a + c.lines_b),
            )
            for c in result
        }

    assert rows(segregation(shuffled)) == rows(segregation(STORE))


def test_the_notes_for_reports_say_what_an_empty_answer_means():
    assert "empty list means only" in SEGREGATION_CAUTION
    assert "safety data sheet (sections 7 and 10)" in SEGREGATION_CAUTION
    assert "safety officer" in SEGREGATION_CAUTION
    assert "never added to grams" in TOTALS_NOTE
    assert "may be larger" in CONCERN_NOTE
