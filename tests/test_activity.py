"""Activity coefficients against published tables and against phreeqpython.

Sources of check values:
- KL = Kaye and Laby, Tables of Physical and Chemical Constants (NPL), section
  3.9.6 "Activity coefficients", table "Some 1-1 electrolytes at 25 C" (molal;
  read from a stored copy of the page).
- HW = CRC Handbook of Chemistry and Physics, "Mean activity coefficients of
  electrolytes as a function of concentration" (25 C, molal), from W. J. Hamer
  and Y.-C. Wu, J. Phys. Chem. Ref. Data 1 (1972) 1047 and later NBS
  evaluations (read from a stored copy of the table).
- Hem = J. D. Hem, USGS Water-Supply Paper 2254, table of the Debye-Huckel A and
  B at 1 bar, as reproduced with Kielland's table (read from a stored copy).
- MM = C. G. Malmberg and A. A. Maryott, J. Res. NBS 56 (1956) 1 (from memory).
- Kell = G. S. Kell, J. Chem. Eng. Data 20 (1975) 97; CRC density of water
  table (from memory).
- tests/reference/mean_activity_coefficients.csv: published mean activity
  coefficients of 1:1 to 3:2 electrolytes at 25 C, 0.001 to 1 mol/kg, each row
  with its source (Robinson and Stokes App. 8.10; the CRC table of Hamer and Wu;
  Kaye and Laby; Lewis and Randall); the file's header says which were read and
  which recalled.
"""

import csv
import io
import math
import re
import warnings
from pathlib import Path

import pytest

from cellchem import CellchemError, activity_coefficient, ionic_strength, ions_of, mean_activity_coefficient
from cellchem.activity import (
    MODELS,
    RangeWarning,
    debye_huckel_constants,
    ion_size,
    water_density,
    water_permittivity,
)

REFERENCE = Path(__file__).parent / "reference" / "mean_activity_coefficients.csv"


def reference_rows() -> list[dict[str, str]]:
    text = REFERENCE.read_text(encoding="utf-8")
    return list(csv.DictReader(io.StringIO("\n".join(x for x in text.splitlines() if not x.startswith("#")))))


ROWS = reference_rows()


@pytest.mark.parametrize("t, eps", [(0, 87.74), (25, 78.30), (100, 55.72)])  # MM (from memory)
def test_permittivity_of_water(t, eps):
    assert water_permittivity(t) == pytest.approx(eps, abs=0.01)


@pytest.mark.parametrize("t, rho", [(4, 999.97), (25, 997.05), (100, 958.35)])  # Kell; CRC (from memory)
def test_density_of_water(t, rho):
    assert water_density(t) == pytest.approx(rho, abs=0.02)


# Hem's table uses older permittivity data (78.54 at 25 C): A agrees to 1 %, B to 0.5 %.
@pytest.mark.parametrize(
    "t, a, b",
    [
        (0, 0.4883, 0.3241),
        (10, 0.4960, 0.3258),
        (20, 0.5042, 0.3273),
        (25, 0.5085, 0.3281),
        (30, 0.5130, 0.3290),
        (40, 0.5221, 0.3305),
        (50, 0.5319, 0.3321),
        (60, 0.5425, 0.3338),
    ],
)
def test_debye_huckel_constants_against_hem(t, a, b):
    ours_a, ours_b = debye_huckel_constants(t, "mol/kg")
    assert ours_a == pytest.approx(a, rel=0.01)
    assert ours_b == pytest.approx(b, rel=0.005)


def test_kielland_sizes():
    # Kielland 1937 Table I (reproduction read): H+ 9, Mg2+ 8, Ca2+ 6, K+ 3, NH4+ 2.5, SO4 2- 4
    assert [ion_size(i) for i in ("H+", "Mg2+", "Ca2+", "K+", "NH4+", "SO4 2-")] == [9, 8, 6, 3, 2.5, 4]


# Kielland's own table of individual coefficients at 25 C (from the reproduction
# read): K+ (a = 3) at I = 0.01: 0.899; Ca2+ (a = 6) at 0.01: 0.675; Al3+ (a = 9) at
# 0.01: 0.445; H+ (a = 9) at 0.1: 0.83. Kielland used older constants: 0.5 %.
# Al3+ at I = 0.01 is past the limit of a 3:1 solution (0.004): the equation is
# checked against Kielland's table all the same, with the warning it gives.
@pytest.mark.parametrize(
    "ion, strength, expected",
    [("K+", 0.01, 0.899), ("Ca2+", 0.01, 0.675), ("Al3+", 0.01, 0.445), ("H+", 0.1, 0.83)],
)
def test_extended_against_kielland_table(ion, strength, expected):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", RangeWarning)
        g = activity_coefficient(ion, strength, "extended", outside_range="warn")
    assert g == pytest.approx(expected, rel=0.01)


# Mean activity coefficients, molal, 25 C. Tolerances: the models are limiting
# laws, so they close on the data as I falls; these are the agreements a careful
# chemist expects at each ionic strength (1:1 salts within 0.6 % at I <= 0.01;
# Davies within 1.5 % at 0.1 for chlorides; the extended law within 3 % at 0.1).
MEAN_CASES = [
    # salt, m, model, published, source, relative tolerance
    ("NaCl", 0.01, "extended", 0.902, "KL", 0.006),
    ("NaCl", 0.01, "davies", 0.902, "KL", 0.006),
    ("KCl", 0.01, "extended", 0.901, "KL", 0.006),
    ("HCl", 0.01, "extended", 0.904, "KL", 0.006),
    ("LiCl", 0.01, "davies", 0.903, "KL", 0.006),
    ("CsCl", 0.001, "limiting", 0.965, "HW", 0.003),
    ("AgNO3", 0.001, "limiting", 0.964, "HW", 0.003),
    ("CsCl", 0.01, "davies", 0.898, "HW", 0.006),
    ("NaCl", 0.02, "extended", 0.870, "KL", 0.008),
    ("NaCl", 0.05, "extended", 0.820, "KL", 0.015),
    ("NaCl", 0.1, "davies", 0.778, "KL", 0.015),
    ("KCl", 0.1, "davies", 0.770, "KL", 0.015),
    ("HCl", 0.1, "extended", 0.796, "KL", 0.03),
    ("NaCl", 0.1, "extended", 0.778, "KL", 0.03),
    ("KCl", 0.1, "extended", 0.770, "KL", 0.03),
    ("CaCl2", 0.001, "extended", 0.888, "HW", 0.005),
    ("CaCl2", 0.001, "limiting", 0.888, "HW", 0.015),
    ("CaCl2", 0.002, "davies", 0.851, "HW", 0.01),
    ("CaCl2", 0.01, "extended", 0.727, "HW", 0.01),
    ("BaCl2", 0.01, "extended", 0.721, "HW", 0.01),
    ("CaCl2", 0.02, "extended", 0.664, "HW", 0.02),
    ("CaCl2", 0.02, "davies", 0.664, "HW", 0.02),
]


@pytest.mark.parametrize("salt, m, model, published, source, tolerance", MEAN_CASES)
def test_mean_activity_coefficients(salt, m, model, published, source, tolerance):
    assert source in ("KL", "HW")
    ours = mean_activity_coefficient(salt, m, model, unit="mol/kg")
    assert ours == pytest.approx(published, rel=tolerance)


def test_nitrates_show_the_limit_of_the_models():
    # KNO3 at 0.1 mol/kg is 0.739 (KL): ion association puts it below both
    # models, the Davies equation by over 5 % -- why its limit is stated.
    davies = mean_activity_coefficient("KNO3", 0.1, "davies", unit="mol/kg")
    assert davies > 0.739 * 1.05


# Every row of the reference table, for every model: cellchem refuses (outside the
# limits it states for the charge type) or is within 10 % of the published value.
# The refusal must name the limit and where it comes from; told to warn, cellchem
# warns exactly where it would refuse.
SOURCES_CITED = ("Stumm and Morgan", "Robinson and Stokes", "Lewis and Randall", "Davies", "Hamer and Wu")


@pytest.mark.parametrize("model", sorted(MODELS))
@pytest.mark.parametrize("row", ROWS, ids=[f"{r['electrolyte']}-{r['molality_mol_per_kg']}" for r in ROWS])
def test_refused_or_within_ten_percent_of_published(row, model):
    salt, m, published = row["electrolyte"], float(row["molality_mol_per_kg"]), float(row["gamma"])
    try:
        ours = mean_activity_coefficient(salt, m, model, unit="mol/kg")
    except CellchemError as exc:
        message = str(exc)
        assert re.search(r"is above [0-9.e-]+, the limit to which the .* is trusted for a", message), message
        assert any(source in message for source in SOURCES_CITED), message
        with pytest.warns(RangeWarning):
            mean_activity_coefficient(salt, m, model, unit="mol/kg", outside_range="warn")
        return
    assert ours == pytest.approx(published, rel=0.10), f"{row['source']}: {published}"
    with warnings.catch_warnings():
        warnings.simplefilter("error", RangeWarning)
        mean_activity_coefficient(salt, m, model, unit="mol/kg", outside_range="warn")


def test_reference_table_covers_the_charge_types():
    # 1:1, 2:1 and 1:2, 2:2, 3:1 and 1:3, 4:1, 3:2, from 0.001 to 1 mol/kg
    types = set()
    for row in ROWS:
        ions = ions_of(row["electrolyte"]).ions
        types.add(max(c.charge for c in ions) * -min(c.charge for c in ions))
        assert 0.001 <= float(row["molality_mol_per_kg"]) <= 1.0
        assert row["source"].split(" ")[0] in ("RS", "CRC", "HW", "KL", "LR", "Goldberg"), row
    assert types == {1, 2, 3, 4, 6}


# The reason for the limits, in the published values themselves: past them the
# models are more than 10 % off (Davies for MgSO4 at 0.1 mol/kg: 0.284 against
# 0.150, Robinson and Stokes App. 8.10; for Na2SO4 at 0.1 mol/kg: 0.538 against
# 0.445; for KNO3 at 0.2 mol/kg: 0.746 against 0.663).
@pytest.mark.parametrize(
    "salt, m, published",
    [
        ("MgSO4", 0.1, 0.150),
        ("CuSO4", 0.1, 0.150),
        ("ZnSO4", 0.1, 0.150),
        ("Na2SO4", 0.1, 0.445),
        ("KNO3", 0.2, 0.663),
    ],
)
def test_davies_is_refused_where_it_is_far_off(salt, m, published):
    with pytest.raises(CellchemError, match="above"):
        mean_activity_coefficient(salt, m, "davies", unit="mol/kg")
    with pytest.warns(RangeWarning):
        far = mean_activity_coefficient(salt, m, "davies", unit="mol/kg", outside_range="warn")
    assert abs(far / published - 1) > 0.10
    assert any("above" in n for n in far.notes)


def test_ion_association_of_2_2_salts_is_named():
    with pytest.raises(CellchemError, match=r"2:2 solution .*ion association.*Robinson and Stokes"):
        mean_activity_coefficient("MgSO4", 0.01, unit="mol/kg")
    # a trace of a 2:2 salt makes the whole solution 2:2 (the highest charges present)
    with pytest.raises(CellchemError, match="2:2"):
        mean_activity_coefficient("NaCl", 0.05, background=[("MgSO4", 1e-5)])
    assert mean_activity_coefficient("NaCl", 0.05, background=[("KNO3", 1e-5)]) > 0
    # 3:2 (Al2(SO4)3): outside every model
    with pytest.raises(CellchemError, match="no model here"):
        mean_activity_coefficient("Al2(SO4)3", 1e-5, "limiting")


def test_activity_coefficient_reads_the_charge_type_of_the_solution():
    # Mg2+ at I = 0.04: within the Davies limit in a chloride solution (2:1, 0.1) but not in
    # a sulfate one (2:2, 0.004)
    chloride = ionic_strength([("MgCl2", 0.04 / 3)])
    sulfate = ionic_strength([("MgSO4", 0.01)])
    assert 0 < activity_coefficient("Mg2+", chloride) < 1
    with pytest.raises(CellchemError, match="2:2"):
        activity_coefficient("Mg2+", sulfate)
    # a plain number: singly charged counter-ions, said in the notes, or as given
    g = activity_coefficient("Mg2+", 0.04)
    assert any("singly charged" in n for n in g.notes)
    with pytest.raises(CellchemError, match="2:2"):
        activity_coefficient("Mg2+", 0.04, counter_charge=2)
    with pytest.raises(CellchemError, match="counter_charge"):
        activity_coefficient("Mg2+", sulfate, counter_charge=2)
    with pytest.raises(CellchemError, match="counter_charge"):
        activity_coefficient("Mg2+", 0.04, counter_charge=7)


def test_models_refuse_or_warn_past_their_limit():
    with pytest.raises(CellchemError, match="limiting law"):
        activity_coefficient("Na+", 0.05, "limiting")
    with pytest.raises(CellchemError, match="extended"):
        activity_coefficient("Na+", 0.2, "extended")
    with pytest.warns(RangeWarning):
        g = activity_coefficient("Na+", 0.2, "extended", outside_range="warn")
    assert any("above 0.1" in n for n in g.notes)
    with pytest.raises(CellchemError, match="no model here"):
        activity_coefficient("Na+", 1.0, "davies")
    # the Davies equation is trusted for 1:1 solutions to I = 0.1 (it was 0.5)
    with pytest.raises(CellchemError, match=r"above 0\.1, .*nitrates"):
        activity_coefficient("Na+", 0.2, "davies")


def test_takes_the_ionic_strength_value_with_its_unit():
    i = ionic_strength([("CaCl2", 0.001)], unit="mol/kg")
    g = activity_coefficient("Ca2+", i, "davies")
    assert "mol/kg" in g.notes[0]


def test_ion_without_kielland_size_needs_one():
    with pytest.raises(CellchemError, match="size"):
        activity_coefficient("[Cu(NH3)4]2+", 0.01, "extended")
    assert 0 < activity_coefficient("[Cu(NH3)4]2+", 0.01, "extended", size=6) < 1


def test_temperature_raises_a_and_lowers_gamma():
    cold = activity_coefficient("Ca2+", 0.01, "davies", temperature_c=5)
    hot = activity_coefficient("Ca2+", 0.01, "davies", temperature_c=60)
    assert hot < cold
    with pytest.raises(CellchemError, match="0-100"):
        activity_coefficient("Ca2+", 0.01, temperature_c=120)


phreeqpython = pytest.importorskip("phreeqpython")


@pytest.fixture(scope="module")
def pp():
    return phreeqpython.PhreeqPython()


# phreeqpython (PHREEQC, phreeqc.dat): major ions use the WATEQ Debye-Huckel
# form with its own ion sizes and a b*I term (Na+ a = 4.0, b = 0.075; Cl- 3.5,
# 0.015; Ca2+ 5.0, 0.165), other ions the Davies equation. At I <= 0.01 those
# differences stay within 1.5 % of cellchem's extended law.
@pytest.mark.parametrize(
    "salt, mmol, species, ion",
    [
        ("NaCl", 10, "Na+", "Na+"),
        ("NaCl", 10, "Cl-", "Cl-"),
        ("KCl", 5, "K+", "K+"),
        ("CaCl2", 2, "Ca+2", "Ca2+"),
        ("CaCl2", 2, "Cl-", "Cl-"),
        ("KNO3", 5, "NO3-", "NO3-"),
    ],
)
def test_individual_coefficients_against_phreeqpython(pp, salt, mmol, species, ion):
    s = pp.add_solution_simple({salt: mmol})
    try:
        theirs = s.species_activities[species] / s.species_molalities[species]
        ours = activity_coefficient(ion, s.I, "extended", unit="mol/kg")
        assert ours == pytest.approx(theirs, rel=0.015)
    finally:
        s.forget()


# Witness for the rows recalled rather than read: PHREEQC's stoichiometric mean
# activity coefficient, (a+^nu+ a-^nu-)^(1/nu) / (m (nu+^nu+ nu-^nu-)^(1/nu)), from
# the free-ion activities. pitzer.dat (Harvie-Moller-Weare) for Na, K, Li, H salts
# with Cl, OH and SO4 agrees within 1.5 %; phreeqc.dat, which holds the ion pairs
# CuSO4(aq) and ZnSO4(aq), is below the dilute 2:2 emf values by up to 10 % of them
# (CuSO4 at 0.005 mol/kg; the CuSO4 values are the older and less certain) and
# agrees with the recalled KNO3 values within 2 %. Tolerances are relative to the
# published value.
WITNESS = {
    # salt: (database, cation species, nu+, anion species, nu-, relative tolerance)
    "HCl": ("pitzer.dat", "H+", 1, "Cl-", 1, 0.015),
    "NaCl": ("pitzer.dat", "Na+", 1, "Cl-", 1, 0.015),
    "KCl": ("pitzer.dat", "K+", 1, "Cl-", 1, 0.015),
    "LiCl": ("pitzer.dat", "Li+", 1, "Cl-", 1, 0.015),
    "Na2SO4": ("pitzer.dat", "Na+", 2, "SO4-2", 1, 0.015),
    "K2SO4": ("pitzer.dat", "K+", 2, "SO4-2", 1, 0.015),
    "KNO3": ("phreeqc.dat", "K+", 1, "NO3-", 1, 0.02),
    "CuSO4": ("phreeqc.dat", "Cu+2", 1, "SO4-2", 1, 0.11),
    "ZnSO4": ("phreeqc.dat", "Zn+2", 1, "SO4-2", 1, 0.11),
}
RECALLED = [
    r
    for r in ROWS
    if "from memory" in r["source"]
    and r["electrolyte"] in WITNESS
    and (float(r["molality_mol_per_kg"]) < 0.1 or WITNESS[r["electrolyte"]][0] == "pitzer.dat")
]


@pytest.fixture(scope="module")
def databases():
    return {name: phreeqpython.PhreeqPython(database=name) for name in ("pitzer.dat", "phreeqc.dat")}


@pytest.mark.parametrize(
    "row", RECALLED, ids=[f"{r['electrolyte']}-{r['molality_mol_per_kg']}" for r in RECALLED]
)
def test_recalled_values_against_phreeqpython(databases, row):
    database, cation, n_plus, anion, n_minus, tolerance = WITNESS[row["electrolyte"]]
    m = float(row["molality_mol_per_kg"])
    s = databases[database].add_solution_simple({row["electrolyte"]: m * 1000})
    try:
        a = s.species_activities
        nu = n_plus + n_minus
        log_a = n_plus * math.log(a[cation]) + n_minus * math.log(a[anion])
        theirs = math.exp(log_a / nu) / (m * (n_plus**n_plus * n_minus**n_minus) ** (1 / nu))
    finally:
        s.forget()
    assert theirs == pytest.approx(float(row["gamma"]), rel=tolerance)
