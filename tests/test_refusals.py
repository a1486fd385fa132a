"""Never a confident wrong answer: names, formulas and audit findings that refuse rather than
invent. Each class of wrong answer has cases of its own here, with the source of each expected
value beside it; the property tests check the rules over the whole catalog.

Sources: CRC Handbook of Chemistry and Physics, "Physical Constants of Inorganic Compounds"
(formulas and molar masses, from memory); IUPAC 2005 = Nomenclature of Inorganic Chemistry,
IUPAC Recommendations 2005 (from memory); Merck Index monographs (from memory); common practice =
the names on supplier labels and in store lists (from memory).
"""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from cellchem import CellchemError, audit_rows, charge_balance, molar_mass, parse_formula
from cellchem.audit import ERROR, NOTE, WARNING, check_line, respell
from cellchem.ions import catalog
from cellchem.names import formula_from_name, name_from_formula, read_name


def _same(a: str, b: str) -> bool:
    fa, fb = parse_formula(a), parse_formula(b)
    return fa.counts == fb.counts and fa.water == fb.water


def _reason(name: str) -> str:
    with pytest.raises(CellchemError) as info:
        formula_from_name(name)
    return getattr(info.value, "reason", "")


# ---------------------------------------------------------------------------
# Ratios a name does not state
# ---------------------------------------------------------------------------

NO_RATIO = [
    "sodium zinc chloride",  # Na2ZnCl4 and others exist; no prefixes: common practice (from memory)
    "lithium sodium carbonate",  # no such established double salt: common practice (from memory)
    "potassium sodium sulfate",  # glaserite is K3Na(SO4)2, not KNaSO4: CRC (from memory)
    "calcium sodium phosphate",  # several compositions: common practice (from memory)
    "magnesium zinc sulfate",  # no prefixes: common practice (from memory)
]


@pytest.mark.parametrize("name", NO_RATIO)
def test_a_ratio_the_name_does_not_state_is_refused(name):
    assert _reason(name) in ("ratio", "may-be")


ESTABLISHED = [
    # name, formula, source
    ("ammonium cerium(IV) sulfate dihydrate", "(NH4)4Ce(SO4)4·2H2O", "CRC (from memory)"),
    ("chromium potassium sulfate dodecahydrate", "KCr(SO4)2·12H2O", "CRC, chrome alum (from memory)"),
    ("potassium chromium(III) sulfate dodecahydrate", "KCr(SO4)2·12H2O", "CRC, chrome alum (from memory)"),
    ("ammonium nickel sulfate hexahydrate", "(NH4)2Ni(SO4)2·6H2O", "CRC, a Tutton's salt (from memory)"),
    ("ferric ammonium sulfate dodecahydrate", "NH4Fe(SO4)2·12H2O", "CRC, iron alum (from memory)"),
    ("sodium potassium tartrate tetrahydrate", "KNaC4H4O6·4H2O", "Merck, Rochelle salt (from memory)"),
    ("calcium magnesium carbonate", "CaMg(CO3)2", "CRC, dolomite (from memory)"),
    ("iron(II,III) oxide", "Fe3O4", "IUPAC 2005 IR-5.4.2.2 (from memory)"),
    ("cobalt(II,III) oxide", "Co3O4", "CRC (from memory)"),
    ("sodium hexafluoroaluminate", "Na3AlF6", "CRC, cryolite (from memory)"),
]


@pytest.mark.parametrize(("name", "formula", "source"), ESTABLISHED, ids=[e[0] for e in ESTABLISHED])
def test_established_compounds_are_read_from_the_table(name, formula, source):
    assert _same(formula_from_name(name), formula), source


def test_the_established_reading_does_not_depend_on_word_order():
    # Mohr's salt (NH4)2Fe(SO4)2·6H2O: CRC (from memory)
    for name in (
        "ammonium iron(II) sulfate hexahydrate",
        "iron(II) ammonium sulfate hexahydrate",
        "ferrous ammonium sulfate hexahydrate",
        "ammonium ferrous sulfate hexahydrate",
    ):
        assert _same(formula_from_name(name), "(NH4)2Fe(SO4)2·6H2O"), name


# ---------------------------------------------------------------------------
# A prefix or ligand that cannot be read makes the whole reading fail
# ---------------------------------------------------------------------------

DROPPED = [
    "sodium hexafluoroaluminate(II)",  # aluminium is +3 in [AlF6] 3-: the Stock number disagrees
    "potassium ferrocyanide(III)",  # ferrocyanide is iron(II): IUPAC 2005 IR-9 (from memory)
    "sodium dodecafluoroaluminate(III)",  # no such ligand count is read as aluminate
    "potassium tetrathiocyanatomanganate(VII)",  # Mn(VII) with four NCS gives a cation, not an anion
]


@pytest.mark.parametrize("name", DROPPED)
def test_words_that_do_not_read_are_never_skipped(name):
    try:
        got = formula_from_name(name)
    except CellchemError:
        return
    # if it reads, every element the words name is in the formula (no word skipped)
    counts = parse_formula(got).counts
    assert "F" in counts or "C" in counts or "N" in counts or "S" in counts, got


def test_stock_numbers_that_agree_with_a_known_name_are_read():
    # potassium ferricyanide K3[Fe(CN)6]; sodium hexafluorosilicate Na2SiF6: CRC (from memory)
    assert _same(formula_from_name("potassium ferricyanide(III)"), "K3[Fe(CN)6]")
    assert _same(formula_from_name("sodium hexafluorosilicate(IV)"), "Na2SiF6")
    assert _same(formula_from_name("sodium hexafluoroaluminate(III)"), "Na3AlF6")


# ---------------------------------------------------------------------------
# Acid salts of every polyprotic anion
# ---------------------------------------------------------------------------

ACID_SALTS = [
    ("dipotassium citrate", "K2HC6H5O7", "common practice (from memory)"),
    ("monopotassium tartrate", "KHC4H4O6", "cream of tartar, Merck (from memory)"),
    ("sodium tartrate monobasic", "NaHC4H4O6", "common practice (from memory)"),
    ("potassium carbonate monobasic", "KHCO3", "common practice (from memory)"),
    ("sodium sulfate, monobasic", "NaHSO4", "common practice (from memory)"),
    ("di-Potassium oxalate monohydrate", "K2C2O4·H2O", "CRC (from memory)"),
    ("trisodium EDTA", "Na3HC10H12N2O8", "common practice (from memory)"),
    ("tetrasodium EDTA", "Na4C10H12N2O8", "common practice (from memory)"),
    ("Potassium phthalate monobasic", "KHC8H4O4", "the primary standard KHP, Merck (from memory)"),
    ("calcium phosphate, monobasic, monohydrate", "Ca(H2PO4)2·H2O", "CRC (from memory)"),
    ("citric acid, disodium salt", "Na2HC6H5O7", "common practice (from memory)"),
]


@pytest.mark.parametrize(("name", "formula", "source"), ACID_SALTS, ids=[a[0] for a in ACID_SALTS])
def test_acid_salts_of_every_polyprotic_anion(name, formula, source):
    assert _same(formula_from_name(name), formula), source


def test_a_salt_of_a_polyprotic_acid_without_a_count_is_refused():
    # tartaric acid has two acid hydrogens: which salt is not said (common practice)
    assert _reason("tartaric acid, potassium salt") == "ratio"


# ---------------------------------------------------------------------------
# The spelling hint never turns a real name into another compound
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "name",
    ["sodium malonate", "potassium sorbate", "sodium dithionate", "sodium percarbonate", "calcium fumarate",
     "potassium bromite", "sodium selenite", "sodium nitrite", "sodium sulfite", "potassium chlorite"],
)  # fmt: skip
def test_real_names_are_not_respelled(name):
    assert respell(name) is None


@pytest.mark.parametrize(
    ("typo", "respelled"),
    [("Potassium Permanganat", "Potassium Permanganate"), ("amonium chloride", "ammonium chloride"),
     ("magnesium sulfte", None)],  # sulfte: sulfate or sulfite, one slip from each: no respelling
)  # fmt: skip
def test_typing_slips_are_respelled_only_when_one_word_fits(typo, respelled):
    assert respell(typo) == respelled


def test_a_respelling_is_never_the_ground_of_an_error():
    # 'Sodium cloride' respells to sodium chloride; on a KCl line the line is not checked by name
    findings = check_line("KCl", "74.55", "Sodium cloride").findings
    assert all(f.severity != ERROR for f in findings)


# ---------------------------------------------------------------------------
# Organic formulas: no carbide, acetylide or nitride ions
# ---------------------------------------------------------------------------

ORGANIC_SALTS = [
    # Hill formula as safety data sheets print it, the salt it is (CRC / Merck, from memory)
    "C7H5NaO2",  # sodium benzoate
    "C3H5NaO3",  # sodium lactate
    "C6H11NaO7",  # sodium gluconate
    "C4H4KNaO6·4H2O",  # Rochelle salt
    "C2H7NO2",  # ammonium acetate (read as a molecule: no metal)
    "C6H5K3O7·H2O",  # tripotassium citrate monohydrate
    "C10H12CaN2Na2O8",  # calcium disodium edetate
    "C6H7KO2",  # potassium sorbate
]


@pytest.mark.parametrize("formula", ORGANIC_SALTS)
def test_organic_salts_are_never_reported_unbalanced(formula):
    result = charge_balance(formula)
    assert result.kind in ("ionic", "molecular", "organic"), result.explanation
    assert "carbide" not in result.explanation and "acetylide" not in result.explanation


@pytest.mark.parametrize("formula", ["CaC2", "Al4C3", "Li3N", "Mg3N2", "SiC", "WC", "Be2C"])
def test_binary_carbides_and_nitrides_still_read(formula):
    # calcium carbide, aluminium carbide, lithium and magnesium nitride: CRC (from memory)
    assert charge_balance(formula).balanced


def test_an_unknown_organic_salt_is_not_applicable_rather_than_unbalanced():
    # sodium HEPES-like formula with a made-up anion: C9H19N2NaO4S (no catalog anion): common practice
    result = charge_balance("C9H19N2NaO4S")
    assert result.kind == "organic" and not result.balanced
    assert check_line("C9H19N2NaO4S").findings == ()


@pytest.mark.parametrize(
    ("formula", "kind"),
    [("C2H8O", "unbalanced"), ("C5H14O2", "unbalanced"), ("CH5Cl", "unbalanced"),  # more H than C binds
     ("C6H13O6", "radical"), ("C2H6NaO2", "radical")],  # odd electrons: a radical or a slip
)  # fmt: skip
def test_formulas_no_stable_molecule_has_are_said_so(formula, kind):
    # rings-plus-double-bonds count of any organic chemistry text (common practice)
    assert charge_balance(formula).kind == kind


def test_a_radical_is_a_warning_not_an_error():
    # TEMPO, C9H18NO, is sold (Merck, from memory): an odd electron count must not be an error
    findings = check_line("C9H18NO", "156.25").findings
    assert [(f.check, f.severity) for f in findings] == [("charge", WARNING)]


# ---------------------------------------------------------------------------
# Real compounds the catalog now holds
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "formula",
    ["K2S2O7", "Na2S2O6", "K2FeO4", "NaBO3·H2O", "Mg2Si", "N2H6SO4", "N2H5Cl", "NaBH3CN", "KHF2", "NH4HF2",
     "CaCN2", "K2OsO4·2H2O", "Na2MoO4·2H2O"],
)  # fmt: skip
def test_real_compounds_balance(formula):
    # each a reagent of the CRC tables or the Merck Index (from memory)
    assert charge_balance(formula).balanced, charge_balance(formula).explanation


# ---------------------------------------------------------------------------
# Hydrates in brackets, with a space; deuterium
# ---------------------------------------------------------------------------


def test_bracketed_and_spaced_water_are_hydrates():
    assert str(parse_formula("MgSO4(H2O)7")) == "MgSO4·7H2O"
    assert str(parse_formula("Na2CO3 10H2O")) == "Na2CO3·10H2O"
    # cobalt(II) chloride hexahydrate: IUPAC 2005 IR-5.5 naming pattern (from memory)
    assert name_from_formula("CoCl2(H2O)6") == "cobalt(II) chloride hexahydrate"


def test_deuterium_is_read_and_weighed():
    # heavy water 20.03 g/mol, deuterated chloroform 120.38 g/mol: CRC (from memory)
    assert molar_mass("D2O") == pytest.approx(20.03, abs=0.01)
    assert molar_mass("CDCl3") == pytest.approx(120.38, abs=0.01)
    assert charge_balance("D2O").balanced


# ---------------------------------------------------------------------------
# Hints name only hydrates that exist
# ---------------------------------------------------------------------------


def test_no_hint_of_a_hydrate_nobody_makes():
    # KNO3 is 101.10 g/mol and forms no hydrate: CRC (from memory)
    message = " ".join(f.message for f in check_line("KNO3", "110.1").findings)
    assert "is the molar mass of" not in message


def test_a_hint_of_a_hydrate_that_exists():
    # Na2CO3·10H2O is 286.14 g/mol: CRC (from memory)
    message = " ".join(f.message for f in check_line("Na2CO3", "286.14").findings)
    assert "286.14 g/mol is the molar mass of Na2CO3·10H2O" in message


# ---------------------------------------------------------------------------
# Words set aside: strengths, grades, forms, hydrates, brackets, inversions
# ---------------------------------------------------------------------------

SET_ASIDE = [
    ("nitric acid 68-70%", "HNO3", "common practice"),
    ("hydrogen peroxide 6% (20 vol)", "H2O2", "common practice"),
    ("ammonia solution s.g. 0.91", "NH3", "common practice"),
    ("sodium hypochlorite solution, 12% active chlorine", "NaOCl", "common practice"),
    ("potassium chloride GPR", "KCl", "common practice"),
    ("sodium acetate trihydrate, for molecular biology", "NaCH3COO·3H2O", "CRC (from memory)"),
    ("copper, foil, 99.99% trace metals basis", "Cu", "common practice"),
    ("sodium chloride, low in bromide", "NaCl", "common practice"),
    ("magnesium powder, -50 mesh", "Mg", "common practice"),
    ("red phosphorus", "P", "common practice"),
    ("sodium carbonate crystals", "Na2CO3·10H2O", "washing soda, CRC (from memory)"),
    ("copper(II) sulfate-5-water", "CuSO4·5H2O", "BP form of hydrate words (from memory)"),
    ("zinc sulfate hemi(heptahydrate)", "ZnSO4·3.5H2O", "the word's meaning (common practice)"),
    ("sodium sulfate decahydrate (Glauber's salt)", "Na2SO4·10H2O", "CRC (from memory)"),
    ("nitric acid, silver salt", "AgNO3", "registry style (common practice)"),
    ("phosphorus(V) oxychloride", "POCl3", "CRC (from memory)"),
    ("sulphuryl chloride", "SO2Cl2", "CRC (from memory)"),
    ("tetrammine copper(II) sulfate monohydrate", "[Cu(NH3)4]SO4·H2O", "CRC (from memory)"),
    ("ammonium hydrogen difluoride", "NH4HF2", "CRC (from memory)"),
    ("potassium bifluoride", "KHF2", "CRC (from memory)"),
]


@pytest.mark.parametrize(("name", "formula", "source"), SET_ASIDE, ids=[s[0] for s in SET_ASIDE])
def test_words_around_the_compound_are_set_aside(name, formula, source):
    assert _same(formula_from_name(name), formula), source


@pytest.mark.parametrize(
    "name", ["white arsenic", "black lead", "white lead", "yellow arsenic"]
)  # these are compounds or mixtures, never the element (common practice)
def test_a_colour_before_an_element_is_not_read_as_the_element(name):
    try:
        got = formula_from_name(name)
    except CellchemError:
        return
    assert len(parse_formula(got).counts) > 1, got


def test_candidates_come_in_the_order_stores_stock_them():
    # tin(II) chloride is the usual reagent (common practice, from memory)
    with pytest.raises(CellchemError) as info:
        formula_from_name("tin chloride")
    assert info.value.choices[0] == "SnCl2"


# ---------------------------------------------------------------------------
# Audit findings built on these readings
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "formula"),
    [("sodium phosphate", "Na2HPO4·12H2O"), ("ammonium molybdate", "(NH4)6Mo7O24·4H2O"),
     ("potassium sodium sulfate", "K3Na(SO4)2"), ("copper(II) carbonate", "CuCO3·Cu(OH)2"),
     ("magnesium zinc sulfate", "MgSO4"), ("potash", "KOH")],
)  # fmt: skip
def test_no_error_rests_on_a_refused_name(name, formula):
    findings = check_name_findings(name, formula)
    assert all(f.severity != ERROR for f in findings), findings


def check_name_findings(name, formula):
    return [f for f in check_line(formula, None, name).findings if f.check.startswith("name")]


def test_a_row_that_fails_inside_cellchem_is_reported_and_the_rest_audited(monkeypatch):
    import cellchem.audit as audit

    real = audit.check_line

    def failing(formula, *args, **kwargs):
        if formula == "Fe2O3":
            raise RuntimeError("simulated defect")
        return real(formula, *args, **kwargs)

    monkeypatch.setattr(audit, "check_line", failing)
    monkeypatch.setattr(audit, "_LINES", audit.Memo(10))  # nothing remembered from other tests
    result = audit_rows([["Name", "Formula"], ["iron(III) oxide", "Fe2O3"], ["sodium chloride", "NaCl2"]])
    checks = [(row, f.check, f.severity) for row, _, f in result.findings]
    assert (2, "internal", WARNING) in checks
    assert (3, "charge", ERROR) in checks
    assert result.summary.not_checked


# ---------------------------------------------------------------------------
# Properties over the catalog
# ---------------------------------------------------------------------------

_CATIONS = sorted((i for i in catalog() if i.charge > 0 and i.is_monatomic), key=lambda i: i.name)
_ANIONS = sorted((i for i in catalog() if i.charge < 0 and not i.is_complex), key=lambda i: i.name)


@settings(max_examples=150, deadline=None)
@given(st.sampled_from(_CATIONS), st.sampled_from(_CATIONS), st.sampled_from(_ANIONS))
def test_two_cations_and_an_anion_never_get_an_invented_ratio(a, b, anion):
    """A name of two cations and one anion, without prefixes, is read only as a compound a
    table holds with exactly those ions; otherwise it is refused."""
    if a.text == b.text or "H" in (a.text, b.text):
        return  # 'hydrogen phosphate' names the acid anion HPO4 2- (IUPAC 2005 IR-8.5), not two cations
    name = f"{a.name} {b.name} {anion.name}"
    try:
        reading = read_name(name)
    except CellchemError:
        return
    assert any("established" in form or "trivial" in form for form in reading.forms), (name, reading.formula)


_QUALIFIERS = ["AR", "GPR", "99.5%", "ACS reagent", "powder", "for analysis", "extra pure", "≥98%", "LR"]


@settings(max_examples=150, deadline=None)
@given(st.sampled_from(_CATIONS), st.sampled_from(_ANIONS), st.sampled_from(_QUALIFIERS))
def test_qualifier_words_never_change_the_compound(cation, anion, word):
    """Grade, purity and form words are set aside: the name with them reads as the same
    compound as without them, or both are refused."""
    plain = f"{cation.name} {anion.name}"
    try:
        expected = formula_from_name(plain)
    except CellchemError:
        with pytest.raises(CellchemError):
            formula_from_name(f"{plain}, {word}")
        return
    assert formula_from_name(f"{plain}, {word}") == expected


@settings(max_examples=100, deadline=None)
@given(st.sampled_from(_CATIONS), st.sampled_from(_ANIONS))
def test_a_refused_name_never_gives_an_audit_error_against_a_candidate(cation, anion):
    """Whatever a name's refusal lists, a line whose formula is one of the candidates gets no
    error from the name."""
    name = f"{cation.name.split('(')[0]} {anion.name}"
    try:
        formula_from_name(name)
        return
    except CellchemError as exc:
        choices = exc.choices
    for choice in choices[:3]:
        try:
            parse_formula(choice)
        except CellchemError:
            continue
        assert all(f.severity in (WARNING, NOTE) for f in check_name_findings(name, choice)), (name, choice)


@pytest.mark.parametrize(
    ("formula", "name"),
    [
        ("CaSi2", "calcium silicide"),
        ("MoSi2", "molybdenum silicide"),
        ("Pr6O11", "praseodymium(III,IV) oxide"),
    ],
)  # real compounds with no simple ionic reading: CRC (from memory)
def test_established_compounds_that_read_as_no_simple_ions_are_not_errors(formula, name):
    result = charge_balance(formula)
    assert result.balanced and result.kind == "established"
    assert all(f.severity != ERROR for f in check_line(formula).findings)
    assert name_from_formula(formula) == name
