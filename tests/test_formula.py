"""Tests of the formula reader: ``parse_formula``, ``Formula`` and
``case_readings`` (cellchem/formula.py), against the notation in
docs/grammar.md.

Check values and where they come from:

* canonical texts, counts, charges and water counts are worked out by hand
  from the notation rules in docs/grammar.md (the arithmetic of counts,
  groups and multipliers);
* the formulas of the salts, hydrates and ions used as inputs, and which
  readings are ions (NH4+ ammonium, Fe3+ iron(III), O2- superoxide against
  O2- oxide, N3- azide against nitride, [Al(OH)4]- tetrahydroxidoaluminate,
  [Ag(NH3)2]+ diamminesilver(I)), are from memory; the catalog names quoted
  in messages are those of cellchem/data/ions.csv;
* the ways supplier sheets and inventories write formulas (middle dot,
  asterisk or full stop for the hydrate dot, ½ for hemihydrates, SO4 2- for a
  charge, pasted subscripts) are common practice.

Every table row has a comment naming the rule it exercises. Tests of known
faults are marked ``xfail(strict=True)`` with the reason; they state what
cellchem should do.
"""

from __future__ import annotations

import pickle
import subprocess
import sys
import textwrap
from fractions import Fraction
from pathlib import Path

import pytest

from cellchem import CellchemError, parse_formula
from cellchem.errors import FormulaError
from cellchem.formula import case_readings

ROOT = Path(__file__).resolve().parent.parent


def _ids(table) -> list[str]:
    """Test ids are the inputs (repr, so invisible characters show)."""
    return [repr(row[0]) for row in table]


def _error(text) -> FormulaError:
    with pytest.raises(FormulaError) as info:
        parse_formula(text)
    return info.value


# ---------------------------------------------------------------------------
# Canonical text
# ---------------------------------------------------------------------------

CANONICAL = [
    ("Na2SO4 10H2O", "Na2SO4·10H2O"),  # a space before water, as pasted, is the hydrate dot (common practice)
    ("CuSO4 5 H2O", "CuSO4·5H2O"),  # the same, a space after the multiplier too (common practice)
    ("CuSO4(H2O)5", "CuSO4·5H2O"),  # water in brackets at the end is the hydrate part (common practice)
    ("D2O", "D2O"),  # deuterium oxide: D is read (IUPAC 2005 IR-3.3.2, from memory)
    # -- element symbols (case-sensitive) ---------------------------------
    ("NaCl", "NaCl"),  # two-letter symbols: capital then small letter
    ("KBr", "KBr"),  # one- and two-letter symbols side by side
    ("Co", "Co"),  # 'Co' is one symbol (cobalt)
    ("CO", "CO"),  # 'CO' is two symbols (carbon, oxygen)
    ("HgCl2", "HgCl2"),  # two-letter symbols with a count
    ("CUSO4", "CUSO4"),  # all capitals are read as written (C, U, S, O4); no carbide in C compounds
    # -- counts -----------------------------------------------------------
    ("C6H12O6", "C6H12O6"),  # counts after symbols; a molecular formula keeps its order
    ("H2O1", "H2O"),  # an explicit count of 1 is not written back
    ("H100000", "H100000"),  # the largest count, 100,000
    ("CH3COOH", "CH3COOH"),  # a symbol may appear more than once
    # -- groups () and [] -------------------------------------------------
    ("Ca(NO3)2", "Ca(NO3)2"),  # a round group counted twice keeps its brackets
    ("(NH4)2SO4", "(NH4)2SO4"),  # a group may come first
    ("Fe2(SO4)3", "Fe2(SO4)3"),  # a group count after the closing bracket
    ("Ca3(PO4)2", "Ca3(PO4)2"),  # a group count after the closing bracket
    ("Mg(OH)2", "Mg(OH)2"),  # a diatomic group
    ("Na(Cl)", "NaCl"),  # round brackets around a group counted once are dropped
    ("Ca((OH))2", "Ca(OH)2"),  # a nested group counted once loses its brackets
    ("Ca((OH)2)3", "Ca((OH)2)3"),  # nested groups both counted keep both brackets
    ("K4[Fe(CN)6]", "K4[Fe(CN)6]"),  # square brackets are kept even when counted once
    ("[Cu(NH3)4]SO4", "[Cu(NH3)4]SO4"),  # a coordination entity first
    ("[Co(NH3)6]Cl3", "[Co(NH3)6]Cl3"),  # square brackets around round ones
    ("Ca[Fe[CN]6]", "Ca[Fe[CN]6]"),  # square brackets nested in square brackets
    ("Hg(I)2", "Hg(I)2"),  # a counted group of iodine is not a Stock number
    ("((((((((H))))))))", "H"),  # eight levels of nesting are allowed
    ("KAl(SO4)2·12H2O", "KAl(SO4)2·12H2O"),  # a double salt with a group and a hydrate
    # -- cations first ----------------------------------------------------
    ("CH3COONa", "NaCH3COO"),  # the cation run moves before the acetate
    ("Cl2Ca", "CaCl2"),  # cation first
    ("SO4Na2", "Na2SO4"),  # cation first, with counts kept on their symbols
    ("ClNH4", "NH4Cl"),  # a polyatomic cation moves first
    ("OHNa", "NaOH"),  # cation before hydroxide
    ("CO3Ca", "CaCO3"),  # cation before carbonate
    ("(SO4)Na2", "Na2SO4"),  # a group counted once moves as a unit, then loses its brackets
    ("NH3", "NH3"),  # hydrogen stays where it was written
    ("NaHCO3", "NaHCO3"),  # already cation first
    # -- hydrate and adduct dots -------------------------------------------
    ("MgSO4·7H2O", "MgSO4·7H2O"),  # middle dot U+00B7, the canonical dot
    ("MgSO4•7H2O", "MgSO4·7H2O"),  # bullet U+2022
    ("MgSO4∙7H2O", "MgSO4·7H2O"),  # bullet operator U+2219
    ("MgSO4⋅7H2O", "MgSO4·7H2O"),  # dot operator U+22C5
    ("MgSO4×7H2O", "MgSO4·7H2O"),  # multiplication sign U+00D7
    ("MgSO4*7H2O", "MgSO4·7H2O"),  # asterisk
    ("MgSO4.7H2O", "MgSO4·7H2O"),  # full stop
    ("Na2B4O7.10H2O", "Na2B4O7·10H2O"),  # a full stop after a count of 7 is a dot, not a decimal point
    ("CaSO4.0.5H2O", "CaSO4·0.5H2O"),  # a full stop dot before a decimal multiplier
    ("Na2SO4.10H2O", "Na2SO4·10H2O"),  # a full stop between digits before a part of several items is a dot
    ("CuSO4·5H2O·H2O", "CuSO4·5H2O·H2O"),  # several parts are kept as written
    ("Na2CO3·H2O2", "Na2CO3·H2O2"),  # an adduct part that is not water
    ("CuSO4．5H2O", "CuSO4·5H2O"),  # fullwidth full stop U+FF0E
    # -- leading multipliers ----------------------------------------------
    ("CaSO4·½H2O", "CaSO4·0.5H2O"),  # the character ½
    ("CaSO4·0.5H2O", "CaSO4·0.5H2O"),  # a decimal multiplier
    ("CaSO4·.5H2O", "CaSO4·0.5H2O"),  # a decimal without its leading 0
    ("CaSO4·1/2H2O", "CaSO4·0.5H2O"),  # a fraction that terminates is written as a decimal
    ("CaSO4·2/4H2O", "CaSO4·0.5H2O"),  # a fraction is reduced
    ("CaSO4·1/3H2O", "CaSO4·1/3H2O"),  # a fraction that does not terminate stays a fraction
    ("CaSO4·0.25H2O", "CaSO4·0.25H2O"),  # two decimal places
    ("CaSO4·3/2H2O", "CaSO4·1.5H2O"),  # an improper fraction as a decimal
    ("CaSO4·4/2H2O", "CaSO4·2H2O"),  # a whole fraction becomes a whole number
    ("CaSO4·1H2O", "CaSO4·H2O"),  # a multiplier of 1 is not written back
    ("CaSO4·007H2O", "CaSO4·7H2O"),  # leading zeros of a multiplier are ignored
    ("CaSO4·1/128H2O", "CaSO4·0.0078125H2O"),  # a terminating fraction is written exactly, all 7 places
    ("CaSO4·0.0000001H2O", "CaSO4·0.0000001H2O"),  # a decimal is written exactly, not rounded
    ("Na2CO3·xH2O", "Na2CO3·xH2O"),  # x: an unknown count
    ("Na2CO3·nH2O", "Na2CO3·xH2O"),  # n: an unknown count, written back as x
    ("Na2CO3·yH2O", "Na2CO3·xH2O"),  # y: an unknown count, written back as x
    ("2Na2CO3·3H2O2", "2Na2CO3·3H2O2"),  # the first part may have a multiplier
    ("2NaCl", "2NaCl"),  # a multiplier on a one-part formula
    # -- charges: explicit forms ------------------------------------------
    ("SO4^2-", "SO4^2-"),  # caret, digits then sign (the canonical form)
    ("SO4^-2", "SO4^2-"),  # caret, sign then digits
    ("SO4^--", "SO4^2-"),  # caret, repeated sign
    ("Fe ^ 3+", "Fe^3+"),  # spaces around the caret
    ("SO4 2-", "SO4^2-"),  # a space before the charge
    ("SO4 -2", "SO4^2-"),  # a space, sign then digits
    ("Fe ++", "Fe^2+"),  # a space, repeated sign
    ("SO4--", "SO4^2-"),  # repeated sign: the number of signs is the charge
    ("Fe+++", "Fe^3+"),  # repeated plus
    ("Fe+3", "Fe^3+"),  # sign then digits, no space
    ("SO4(2-)", "SO4^2-"),  # charge in brackets
    ("SO4 (2-)", "SO4^2-"),  # charge in brackets after a space
    ("Fe(+3)", "Fe^3+"),  # charge in brackets, sign first
    ("Fe(+)", "Fe^+"),  # a lone sign in brackets
    ("Hg2 2+", "Hg2^2+"),  # a space keeps the count: mercury(I)
    ("Hg2++", "Hg2^2+"),  # repeated sign keeps the count
    ("Hg2(2+)", "Hg2^2+"),  # a bracketed charge keeps the count
    ("[Fe(CN)6] 4-", "[Fe(CN)6]^4-"),  # a spaced charge after a coordination entity
    ("Fe(CN)6 4-", "Fe(CN)6^4-"),  # a spaced charge after a round group
    ("Fe^12+", "Fe^12+"),  # the largest charge, 12
    ("NaCl·5H2O 2-", "NaCl·5H2O^2-"),  # a charge after a hydrate part is the formula's charge
    # -- charges: a lone sign after a count --------------------------------
    ("NH4+", "NH4^+"),  # only the count reading is a catalog ion (ammonium)
    ("Fe3+", "Fe^3+"),  # only the charge reading is a catalog ion (iron(III))
    ("NO3-", "NO3^-"),  # count reading: nitrate
    ("MnO4-", "MnO4^-"),  # count reading: permanganate
    ("H3O+", "H3O^+"),  # count reading: oxonium
    ("S2-", "S^2-"),  # charge reading: sulfide
    ("SO42-", "SO4^2-"),  # the last digit of a longer count is the charge: sulfate
    ("PO43-", "PO4^3-"),  # charge reading: phosphate
    ("Cr2O72-", "Cr2O7^2-"),  # charge reading: dichromate
    ("C2O42-", "C2O4^2-"),  # charge reading: oxalate
    ("Hg2+", "Hg^2+"),  # charge reading: mercury(II)
    ("O22-", "O2^2-"),  # charge reading: peroxide
    ("Cl-", "Cl^-"),  # no count before the sign: nothing to resolve
    ("OH-", "OH^-"),  # no count before the sign
    ("Fe10+", "Fe10^+"),  # a count ending in 0 cannot hold a charge digit
    ("[Fe(CN)6]4-", "[Fe(CN)6]^4-"),  # after a square-bracket group the digit is the charge
    ("[Cu(H2O)6]2+", "[Cu(H2O)6]^2+"),  # after a square-bracket group the digit is the charge
    ("Fe(CN)64-", "Fe(CN)6^4-"),  # charge reading is the catalog ion (hexacyanidoferrate(II))
    ("Al(OH)4-", "Al(OH)4^-"),  # count reading is the catalog ion (tetrahydroxidoaluminate)
    ("Ag(NH3)2+", "Ag(NH3)2^+"),  # count reading is the catalog ion (diamminesilver(I))
    ("C(NH2)3+", "C(NH2)3^+"),  # count reading is the catalog ion (guanidinium)
    ("[Co(NH3)5Cl]2+", "[Co(NH3)5Cl]^2+"),  # neither is a catalog ion: a bracketed group takes the charge
    ("(NH4)2+", "NH4^2+"),  # neither is a catalog ion: a round group takes the charge too
    ("Fe4+", "Fe^4+"),  # neither is a catalog ion: a lone metal the catalog gives several charges takes it
    ("Mn7+", "Mn^7+"),  # neither is a catalog ion: manganese has several catalog charges
    ("Fe1+", "Fe^+"),  # an explicit count of 1 before the sign: both readings are Fe with charge 1+
    ("CuSO4·5H2O+", "CuSO4·5H2O^+"),  # after a hydrate part, a sign after a symbol with no count
    ("2Cl-", "2Cl^-"),  # with a multiplier, a sign after a symbol with no count
    # -- Unicode pasted from documents -------------------------------------
    ("CuSO₄·5H₂O", "CuSO4·5H2O"),  # subscript digits are counts
    ("K₄[Fe(CN)₆]", "K4[Fe(CN)6]"),  # subscripts after a bracket
    ("SO₄²⁻", "SO4^2-"),  # a superscript run is a charge
    ("Fe³⁺", "Fe^3+"),  # superscript charge on an element
    ("Fe ³⁺", "Fe^3+"),  # a space before a superscript charge
    ("Fe³+", "Fe^3+"),  # a superscript digit with a plain sign
    ("NH₄⁺", "NH4^+"),  # superscript lone sign: explicit, no ambiguity
    ("O₂⁻", "O2^-"),  # superscript after subscript: superoxide, not ambiguous
    ("[Fe(CN)₆]⁴⁻", "[Fe(CN)6]^4-"),  # superscript charge after a bracket
    ("SO4^2\u2212", "SO4^2-"),  # minus sign U+2212
    ("SO4 2\u2013", "SO4^2-"),  # en dash U+2013
    ("SO4 2\u2014", "SO4^2-"),  # em dash U+2014
    ("SO4\u2010\u2010", "SO4^2-"),  # hyphen U+2010, twice
    ("SO4\u2011\u2012", "SO4^2-"),  # non-breaking hyphen U+2011 and figure dash U+2012
    ("SO4 2\ufe63", "SO4^2-"),  # small hyphen-minus U+FE63
    ("Na\u00a0Cl", "NaCl"),  # no-break space is a space
    ("NaCl\u3000", "NaCl"),  # ideographic space is a space (and trailing)
    ("Na\u200bCl", "NaCl"),  # zero-width space is removed
    ("Na\u200c\u200dCl", "NaCl"),  # zero-width non-joiner and joiner are removed
    ("Na\u2060Cl", "NaCl"),  # word joiner is removed
    ("\ufeffNaCl", "NaCl"),  # byte-order mark is removed
    ("Na\u00adCl", "NaCl"),  # soft hyphen is removed
    ("ＣａＣｌ２", "CaCl2"),  # fullwidth letters and digits
    ("Ｃａ（ＮＯ３）２", "Ca(NO3)2"),  # fullwidth brackets
    ("Fe\uff0b3", "Fe^3+"),  # fullwidth plus U+FF0B
    ("SO4\uff0d\uff0d", "SO4^2-"),  # fullwidth hyphen-minus U+FF0D
    ("Ｆｅ＾３＋", "Fe^3+"),  # fullwidth caret
    # -- whitespace --------------------------------------------------------
    ("  NaCl  ", "NaCl"),  # leading and trailing spaces are dropped
    ("\tNaCl\n", "NaCl"),  # tabs and line breaks are spaces
    ("Na2 SO4", "Na2SO4"),  # a space before a symbol
    ("Ca( NO3 )2", "Ca(NO3)2"),  # spaces inside brackets
    ("CuSO4 · 5H2O", "CuSO4·5H2O"),  # spaces around a dot
    ("CuSO₄ . 5 H₂O", "CuSO4·5H2O"),  # spaces around a full stop dot and after a multiplier
    ("CaSO4·1/2 H2O", "CaSO4·0.5H2O"),  # a space after a fraction multiplier
    ("2 NaCl", "2NaCl"),  # a space after a first-part multiplier
    ("Fe2 3+", "Fe2^3+"),  # digits after a space are the charge, digits before it a count
    ("Fe3 +", "Fe3^+"),  # a spaced lone sign: the digits before it are all count
]


@pytest.mark.parametrize("text, canonical", CANONICAL, ids=_ids(CANONICAL))
def test_canonical_text(text, canonical):
    f = parse_formula(text)
    assert str(f) == canonical
    assert f.text() == canonical
    # the canonical text reads back as a formula with the same canonical text
    assert str(parse_formula(canonical)) == canonical


def test_canonical_table_is_large_and_has_no_duplicate_inputs():
    inputs = [t for t, _ in CANONICAL]
    assert len(inputs) >= 80
    assert len(set(inputs)) == len(inputs)


# ---------------------------------------------------------------------------
# Counts
# ---------------------------------------------------------------------------

COUNTS = [
    ("NaCl", {"Na": 1, "Cl": 1}),  # one of each
    ("CH3COOH", {"C": 2, "H": 4, "O": 2}),  # repeated symbols are summed
    ("Ca(NO3)2", {"Ca": 1, "N": 2, "O": 6}),  # a group count multiplies the group
    ("Ca((OH)2)3", {"Ca": 1, "O": 6, "H": 6}),  # nested group counts multiply
    ("K4[Fe(CN)6]·3H2O", {"K": 4, "Fe": 1, "C": 6, "N": 6, "H": 6, "O": 3}),  # square, round and hydrate
    ("CuSO4·5H2O", {"Cu": 1, "S": 1, "O": 9, "H": 10}),  # the hydrate part adds its atoms
    ("Al2(SO4)3·18H2O", {"Al": 2, "S": 3, "O": 30, "H": 36}),  # group and hydrate
    ("2Na2CO3·3H2O2", {"Na": 4, "C": 2, "O": 12, "H": 6}),  # multipliers on both parts
    ("CaSO4·½H2O", {"Ca": 1, "S": 1, "O": Fraction(9, 2), "H": 1}),  # a half multiplier gives fractions
    ("CaSO4·1/3H2O", {"Ca": 1, "S": 1, "O": Fraction(13, 3), "H": Fraction(2, 3)}),  # a third
    ("Na2CO3·xH2O", {"Na": 2, "C": 1, "O": 3}),  # a part with an unknown count is left out
    ("xNaCl", {}),  # an unknown first part leaves nothing
    ("Fe3+", {"Fe": 1}),  # the charge digit is not a count
    ("SO42-", {"S": 1, "O": 4}),  # the last digit went to the charge
    ("Hg2 2+", {"Hg": 2}),  # the spaced charge leaves the count
    ("CuSO4·5(H2O)", {"Cu": 1, "S": 1, "O": 9, "H": 10}),  # a bracketed part counts as its items
    ("CuSO₄·5H₂O", {"Cu": 1, "S": 1, "O": 9, "H": 10}),  # subscripts are counts
    ("H100000", {"H": 100000}),  # the largest count
]


@pytest.mark.parametrize("text, counts", COUNTS, ids=_ids(COUNTS))
def test_counts(text, counts):
    assert parse_formula(text).counts == counts


def test_counts_are_in_order_of_first_appearance():
    # rule: counts list symbols in the order they are first written
    assert list(parse_formula("CuSO4·5H2O").counts) == ["Cu", "S", "O", "H"]
    assert list(parse_formula("CH3COONa").counts) == ["C", "H", "O", "Na"]


def test_whole_counts_are_ints_not_fractions():
    # rule: a fraction that comes out whole is stored as an int
    counts = parse_formula("CaSO4·4/2H2O").counts
    assert counts == {"Ca": 1, "S": 1, "O": 6, "H": 4}
    assert all(type(n) is int for n in counts.values())
    assert type(parse_formula("CaSO4·½H2O").counts["O"]) is Fraction


def test_parts_structure():
    # rule: parts keep the items as written, square brackets marked
    from cellchem.formula import Atom, Group, Part

    f = parse_formula("[Fe(CN)6]4-")
    inner = Group((Atom("C"), Atom("N")), 6, "(")
    assert f.parts == (Part((Group((Atom("Fe"), inner), 1, "["),), 1),)
    g = parse_formula("CaSO4·½H2O")
    assert g.parts[1] == Part((Atom("H", 2), Atom("O")), Fraction(1, 2))
    assert parse_formula("Na2CO3·xH2O").parts[1].multiplier is None


# ---------------------------------------------------------------------------
# Charge
# ---------------------------------------------------------------------------

CHARGES = [
    ("NaCl", 0),  # no charge written
    ("SO4^2-", -2),  # caret form
    ("SO4 2-", -2),  # spaced form
    ("SO4--", -2),  # repeated sign
    ("SO₄²⁻", -2),  # superscripts
    ("PO4 3-", -3),  # spaced form, three
    ("NH4+", 1),  # lone sign, count reading
    ("Fe3+", 3),  # lone sign, charge reading
    ("Fe+3", 3),  # sign then digits
    ("Fe+++", 3),  # repeated plus
    ("Fe(+)", 1),  # bracketed lone plus
    ("Fe(-)", -1),  # bracketed lone minus
    ("O2 -", -1),  # spaced lone sign
    ("[Fe(CN)6]4-", -4),  # charge after a coordination entity
    ("Fe^12+", 12),  # upper limit
    ("SO4^12-", -12),  # lower limit
]


@pytest.mark.parametrize("text, charge", CHARGES, ids=_ids(CHARGES))
def test_charge(text, charge):
    assert parse_formula(text).charge == charge


def test_equality_ignores_source_text():
    # rule: formulas compare by parts and charge, not by source text
    assert parse_formula("SO4^2-") == parse_formula("SO4 2-") == parse_formula("SO₄²⁻")
    assert parse_formula("SO4^2-") != parse_formula("SO4")
    assert parse_formula("CuSO₄·5H₂O").source == "CuSO₄·5H₂O"


# ---------------------------------------------------------------------------
# Hydrates and water
# ---------------------------------------------------------------------------

HYDRATES = [
    # (text, water, is_hydrate, has_unknown_count, anhydrous text)
    ("CuSO4·5H2O", 5, True, False, "CuSO4"),  # one water part
    ("CuSO4", 0, False, False, "CuSO4"),  # no water
    ("MgSO4*7H2O", 7, True, False, "MgSO4"),  # asterisk dot
    ("CuSO4·5H2O·H2O", 6, True, False, "CuSO4"),  # water parts are summed
    ("CaSO4·½H2O", Fraction(1, 2), True, False, "CaSO4"),  # a fractional water count
    ("Na2CO3·xH2O", None, True, True, "Na2CO3"),  # an unknown water count
    ("Na2CO3·H2O2", 0, False, False, "Na2CO3·H2O2"),  # an adduct is not water and is kept
    ("Na2CO3·H2O2·1.5H2O", Fraction(3, 2), True, False, "Na2CO3·H2O2"),  # adduct kept, water dropped
    ("H2O", 0, False, False, "H2O"),  # water as the first part is the substance, not hydrate water
    ("2Na2CO3·3H2O2", 0, False, False, "2Na2CO3·3H2O2"),  # a first-part multiplier is kept
    ("CuSO4·5H2O1", 5, True, False, "CuSO4"),  # an explicit count of 1 on O is still water
    ("CuSO4·5(H2O)", 5, True, False, "CuSO4"),  # water in round brackets is water, as its text CuSO4·5H2O is
]


@pytest.mark.parametrize("text, water, is_hydrate, unknown, anhydrous", HYDRATES, ids=_ids(HYDRATES))
def test_hydrate_water(text, water, is_hydrate, unknown, anhydrous):
    f = parse_formula(text)
    assert f.water == water
    assert f.is_hydrate is is_hydrate
    assert f.has_unknown_count is unknown
    assert str(f.anhydrous()) == anhydrous
    assert f.anhydrous().water == 0
    assert f.anhydrous().charge == f.charge


WITH_WATER = [
    ("CuSO4·5H2O", 3, "CuSO4·3H2O", 3),  # replaces the water count
    ("CuSO4·5H2O", 0, "CuSO4", 0),  # 0 gives the anhydrous salt
    ("CuSO4", 5, "CuSO4·5H2O", 5),  # adds water to an anhydrous salt
    ("Na2CO3·xH2O", 10, "Na2CO3·10H2O", 10),  # fixes an unknown count
    ("CuSO4·5H2O", None, "CuSO4·xH2O", None),  # None gives an unknown count
    ("CaSO4", Fraction(1, 2), "CaSO4·0.5H2O", Fraction(1, 2)),  # a fraction
    ("CaSO4", 0.5, "CaSO4·0.5H2O", Fraction(1, 2)),  # a float that is exactly a half
    (
        "CaSO4",
        0.1,
        "CaSO4·0.1H2O",
        Fraction(1, 10),
    ),  # a float is taken by its decimal text, not its binary value
    ("CaSO4", 100_000, "CaSO4·100000H2O", 100_000),  # the largest multiplier
    ("CaSO4", Fraction(4, 2), "CaSO4·2H2O", 2),  # a whole fraction becomes an int
    ("CuSO4·5H2O·H2O", 2, "CuSO4·2H2O", 2),  # all water parts are replaced by one
    ("Na2CO3·H2O2·H2O", 2, "Na2CO3·H2O2·2H2O", 2),  # an adduct part is kept
    ("SO4^2-", 1, "SO4·H2O^2-", 1),  # the charge is kept
]


@pytest.mark.parametrize("text, n, expected, water", WITH_WATER, ids=_ids(WITH_WATER))
def test_with_water(text, n, expected, water):
    f = parse_formula(text).with_water(n)
    assert str(f) == expected
    assert f.water == water
    assert type(f.water) is type(water)
    assert f.charge == parse_formula(text).charge
    # the new formula reads back from its own canonical text
    assert parse_formula(str(f)) == f


WITH_WATER_ERRORS = [
    (
        -1,
        "a water count of -1 is out of range (expected 0, or a number above 0 and up to 100,000)",
    ),  # below 0
    (
        100_001,
        "a water count of 100001 is out of range (expected 0, or a number above 0 and up to 100,000)",
    ),  # above the multiplier limit
    (
        Fraction(-1, 2),
        "a water count of -1/2 is out of range (expected 0, or a number above 0 and up to 100,000)",
    ),  # a negative fraction
    (
        100000.5,
        "a water count of 100000.5 is out of range (expected 0, or a number above 0 and up to 100,000)",
    ),  # a float just above the limit
    (float("nan"), "a water count of nan is not a number of waters"),  # a spreadsheet reader's empty cell
    (float("inf"), "a water count of inf is not a number of waters"),  # infinite
]


@pytest.mark.parametrize("n, message", WITH_WATER_ERRORS, ids=_ids(WITH_WATER_ERRORS))
def test_with_water_refuses_out_of_range(n, message):
    # rule: with_water takes the counts a multiplier may have, so its text reads
    # back, and refuses anything else with a FormulaError
    with pytest.raises(FormulaError) as info:
        parse_formula("CuSO4").with_water(n)
    assert info.value.message == message


# ---------------------------------------------------------------------------
# Renderings
# ---------------------------------------------------------------------------

RENDERINGS = [
    # (text, ascii text, pretty text)
    ("CuSO4·5H2O", "CuSO4.5H2O", "CuSO₄·5H₂O"),  # ascii dot; subscript counts
    ("Al2(SO4)3·18H2O", "Al2(SO4)3.18H2O", "Al₂(SO₄)₃·18H₂O"),  # group count subscripted
    ("K4[Fe(CN)6]·3H2O", "K4[Fe(CN)6].3H2O", "K₄[Fe(CN)₆]·3H₂O"),  # square brackets kept
    ("SO4^2-", "SO4^2-", "SO₄²⁻"),  # superscript charge
    ("NH4+", "NH4^+", "NH₄⁺"),  # a charge of one has no digit
    ("Cl-", "Cl^-", "Cl⁻"),  # minus one
    ("[Fe(CN)6]4-", "[Fe(CN)6]^4-", "[Fe(CN)₆]⁴⁻"),  # charge after a bracket
    ("Hg2 2+", "Hg2^2+", "Hg₂²⁺"),  # subscript count then superscript charge
    ("Fe^12+", "Fe^12+", "Fe¹²⁺"),  # two-digit charge
    ("CaSO4·½H2O", "CaSO4.0.5H2O", "CaSO₄·0.5H₂O"),  # a multiplier stays on the line
    ("CaSO4·1/3H2O", "CaSO4.1/3H2O", "CaSO₄·1/3H₂O"),  # a fraction multiplier stays on the line
    ("Na2CO3·xH2O", "Na2CO3.xH2O", "Na₂CO₃·xH₂O"),  # an unknown multiplier
    ("2Na2CO3·3H2O2", "2Na2CO3.3H2O2", "2Na₂CO₃·3H₂O₂"),  # first-part multiplier stays on the line
    ("H100000", "H100000", "H₁₀₀₀₀₀"),  # a long count
    ("NaCl", "NaCl", "NaCl"),  # nothing to change
]


@pytest.mark.parametrize("text, ascii_text, pretty", RENDERINGS, ids=_ids(RENDERINGS))
def test_ascii_and_pretty(text, ascii_text, pretty):
    f = parse_formula(text)
    assert f.text(ascii=True) == ascii_text
    assert f.pretty() == pretty
    # rule: every rendering reads back as the same formula
    assert parse_formula(ascii_text) == parse_formula(str(f))
    assert parse_formula(pretty) == parse_formula(str(f))


# ---------------------------------------------------------------------------
# Refusals: exact messages
# ---------------------------------------------------------------------------

ERRORS = [
    # (bad input, message, position, choices)
    # -- parse_formula: empty text
    ("", "no formula given (the text is empty)", None, ()),  # empty
    ("   ", "no formula given (the text is empty)", None, ()),  # only spaces
    ("\u200b\ufeff", "no formula given (the text is empty)", None, ()),  # only zero-width characters
    # -- _check_brackets: nesting depth
    ("(((((((((H)))))))))", "'(((((((((H)))))))))' nests brackets more than 8 deep", 9, ()),  # 9 round
    ("[[[[[[[[[H]]]]]]]]]", "'[[[[[[[[[H]]]]]]]]]' nests brackets more than 8 deep", 9, ()),  # 9 square
    # -- _check_brackets: a closing bracket with no opener
    ("Ca]", "the ']' at position 3 of 'Ca]' has no matching '['", 3, ()),  # lone ]
    ("Ca(NO3)2)", "the ')' at position 9 of 'Ca(NO3)2)' has no matching '('", 9, ()),  # one ) too many
    # -- _check_brackets: the wrong closing bracket
    (
        "Ca(NO3]2",
        "the '(' at position 3 of 'Ca(NO3]2' is closed by ']' at position 7 (expected ')')",
        7,
        (),
    ),  # ( ]
    (
        "K4[Fe(CN)6)",
        "the '[' at position 3 of 'K4[Fe(CN)6)' is closed by ')' at position 11 (expected ']')",
        11,
        (),
    ),  # [ )
    # -- _check_brackets: empty brackets
    ("Ca()2", "the brackets at position 3 of 'Ca()2' are empty", 3, ()),  # ()
    ("Ca[]", "the brackets at position 3 of 'Ca[]' are empty", 3, ()),  # []
    # -- _check_brackets: never closed (the innermost still open is named)
    ("Ca(NO3 2", "the '(' at position 3 of 'Ca(NO3 2' is never closed (expected ')')", 3, ()),  # (
    ("K4[Fe(CN)6", "the '[' at position 3 of 'K4[Fe(CN)6' is never closed (expected ']')", 3, ()),  # [
    ("((H)", "the '(' at position 1 of '((H)' is never closed (expected ')')", 1, ()),  # outer ( open
    (
        "Na₂(SO₄",
        "the '(' at position 4 of 'Na₂(SO₄' is never closed (expected ')')",
        4,
        (),
    ),  # position in pasted text
    (
        "Ｃａ（ＮＯ３",
        "the '(' at position 3 of 'Ｃａ（ＮＯ３' is never closed (expected ')')",
        3,
        (),
    ),  # fullwidth (
    # -- parse_formula: Stock numbers (Roman numerals in brackets after a symbol)
    (
        "Fe(III)",
        "'Fe(III)' has a Stock number '(III)' at position 3; a formula gives the charge with its counts"
        " (FeCl3) or as a charge (Fe^3+), not in Roman numerals",
        3,
        (),
    ),  # iron(III) pasted from a name
    (
        "Cu(II)SO4",
        "'Cu(II)SO4' has a Stock number '(II)' at position 3; a formula gives the charge with its counts"
        " (FeCl3) or as a charge (Fe^3+), not in Roman numerals",
        3,
        (),
    ),  # a Stock number inside a salt formula
    # -- parse_formula: two hydrate dots together
    (
        "CaSO4..5H2O",
        "'CaSO4..5H2O' has two hydrate dots together at position 6"
        " (expected one dot and a multiplier, e.g. '·5H2O' or '·0.5H2O')",
        6,
        (),
    ),  # two full stops: a typo for .5H2O or .0.5H2O
    (
        "CaSO4·*5H2O",
        "'CaSO4·*5H2O' has two hydrate dots together at position 6"
        " (expected one dot and a multiplier, e.g. '·5H2O' or '·0.5H2O')",
        6,
        (),
    ),  # two different dots
    (
        "CaSO4. .5H2O",
        "'CaSO4. .5H2O' has two hydrate dots together at position 6"
        " (expected one dot and a multiplier, e.g. '·5H2O' or '·0.5H2O')",
        6,
        (),
    ),  # two full stops with a space between
    # -- parse_formula: decimal counts
    (
        "Fe0.95O",
        "'Fe0.95O' has a decimal count at position 3: decimal counts are not read;"
        " if the '.' joins a hydrate part, write it with '·'",
        3,
        (),
    ),  # 0.x after a symbol
    (
        "TiO1.8",
        "'TiO1.8' has a decimal count at position 4: decimal counts are not read;"
        " if the '.' joins a hydrate part, write it with '·'",
        4,
        (),
    ),  # 1.x after a symbol
    (
        "Ca(OH)1.5",
        "'Ca(OH)1.5' has a decimal count at position 7: decimal counts are not read;"
        " if the '.' joins a hydrate part, write it with '·'",
        7,
        (),
    ),  # 1.x after a bracket
    (
        "Fe2.5O",
        "'Fe2.5O' has a decimal count at position 3: decimal counts are not read;"
        " if the '.' joins a hydrate part, write it with '·'",
        3,
        (),
    ),  # a '.' between digits before a lone atom: a decimal count, not Fe2 and five O
    (
        "Cu2.5S2",
        "'Cu2.5S2' has a decimal count at position 3: decimal counts are not read;"
        " if the '.' joins a hydrate part, write it with '·'",
        3,
        (),
    ),  # the lone atom after the '.' may have a count
    (
        "H2.1H",
        "'H2.1H' has a decimal count at position 2: decimal counts are not read;"
        " if the '.' joins a hydrate part, write it with '·'",
        2,
        (),
    ),  # a '.' between digits before a lone atom, a decimal of 1 after the dot
    # -- _syntax_error 1: a character that never belongs in a formula
    (
        "NaCl!",
        "unexpected character '!' at position 5 in 'NaCl!'"
        " (expected element symbols, counts, brackets, a hydrate dot or a charge)",
        5,
        (),
    ),  # punctuation
    (
        "Na,Cl",
        "unexpected character ',' at position 3 in 'Na,Cl'"
        " (expected element symbols, counts, brackets, a hydrate dot or a charge)",
        3,
        (),
    ),  # a comma
    (
        "Na₂SO₄;",
        "unexpected character ';' at position 7 in 'Na₂SO₄;'"
        " (expected element symbols, counts, brackets, a hydrate dot or a charge)",
        7,
        (),
    ),  # position counted in the pasted text
    (
        "NaClé",
        "unexpected character 'é' at position 5 in 'NaClé'"
        " (expected element symbols, counts, brackets, a hydrate dot or a charge)",
        5,
        (),
    ),  # a non-ASCII letter
    (
        "Na\nCl;",
        "unexpected character ';' at position 6 in 'Na\\nCl;'"
        " (expected element symbols, counts, brackets, a hydrate dot or a charge)",
        6,
        (),
    ),  # an inner line break is quoted as an escape, so the message stays one line
    # -- _syntax_error 2: an unknown symbol before the failure point
    ("Qq 2", "unknown element symbol 'Qq' at position 1 in 'Qq 2'", 1, ()),  # syntax error after it
    # -- _syntax_error 3: letters in the wrong case
    (
        "nacl",
        "'nacl' is not a valid formula: element symbols are case-sensitive and start with"
        " a capital letter ('nacl' at position 1); did you mean 'NaCl'?",
        1,
        ("NaCl",),
    ),  # all small letters, one reading
    (
        "co",
        "'co' is not a valid formula: element symbols are case-sensitive and start with"
        " a capital letter ('co' at position 1); did you mean 'Co' or 'CO'?",
        1,
        ("Co", "CO"),
    ),  # two readings, fewer symbols first
    (
        "Nacl",
        "'Nacl' is not a valid formula: element symbols are case-sensitive and start with"
        " a capital letter ('Nacl' at position 1); did you mean 'NaCl'?",
        1,
        ("NaCl",),
    ),  # a small letter that should be a capital
    (
        "NaCl·5h2o",
        "'NaCl·5h2o' is not a valid formula: element symbols are case-sensitive and start with"
        " a capital letter ('h' at position 7); did you mean 'NaCl·5H2O'?",
        7,
        ("NaCl·5H2O",),
    ),  # wrong case in a hydrate part
    (
        "abc",
        "'abc' is not a valid formula: element symbols are case-sensitive and start with"
        " a capital letter ('abc' at position 1)",
        1,
        (),
    ),  # no reading at all
    # -- _syntax_error 4: a dangling dot or multiplier
    (
        "CuSO4·",
        "nothing follows the '·' at position 6 of 'CuSO4·' (expected a hydrate or adduct part, e.g. '5H2O')",
        6,
        (),
    ),  # middle dot at the end
    (
        "H2O*",
        "nothing follows the '*' at position 4 of 'H2O*' (expected a hydrate or adduct part, e.g. '5H2O')",
        4,
        (),
    ),  # the dot is quoted as written
    (
        "CuSO4· ",
        "nothing follows the '·' at position 6 of 'CuSO4· ' (expected a hydrate or adduct part, e.g. '5H2O')",
        6,
        (),
    ),  # trailing space after the dot
    (
        "CuSO4·5",
        "the multiplier '5' at position 7 of 'CuSO4·5' is not followed by a formula (expected e.g. '5H2O')",
        7,
        (),
    ),  # a multiplier alone after a dot
    (
        "CuSO4·0.5",
        "the multiplier '0.5' at position 7 of 'CuSO4·0.5' is not followed by a formula"
        " (expected e.g. '5H2O')",
        7,
        (),
    ),  # a decimal multiplier alone
    (
        "5",
        "the multiplier '5' at position 1 of '5' is not followed by a formula (expected e.g. '5H2O')",
        1,
        (),
    ),  # a number alone
    # -- _syntax_error 5: anything else
    (
        "SO4^",
        "'SO4^' is not a valid formula: unexpected '^' at position 4"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        4,
        (),
    ),  # a caret with no charge
    (
        "Fe 3",
        "'Fe 3' is not a valid formula: unexpected '3' at position 4"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        4,
        (),
    ),  # digits after a space without a sign
    (
        "Fe+-",
        "'Fe+-' is not a valid formula: unexpected '-' at position 4"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        4,
        (),
    ),  # mixed signs
    (
        "·H2O",
        "'·H2O' is not a valid formula: unexpected '·' at position 1"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        1,
        (),
    ),  # a leading dot
    (
        "Na 2SO4",
        "'Na 2SO4' is not a valid formula: unexpected '2' at position 4"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        4,
        (),
    ),  # a space before a count
    (
        "Na2CO3 10NaCl",
        "'Na2CO3 10NaCl' is not a valid formula: unexpected '1' at position 8"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        8,
        (),
    ),  # a space is a hydrate dot only before water
    (
        "CuSO⁴",
        "'CuSO⁴' is not a valid formula: unexpected '⁴' at position 5"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        5,
        (),
    ),  # a superscript used as a count is quoted as pasted
    (
        "Fe²⁺·6H₂O",
        "'Fe²⁺·6H₂O' is not a valid formula: unexpected '·' at position 5"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        5,
        (),
    ),  # a charge in the middle
    (
        "Fe(2-)(3+)",
        "'Fe(2-)(3+)' is not a valid formula: unexpected '(' at position 7"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        7,
        (),
    ),  # two charges
    # -- _Builder.item: unknown element symbols
    ("Xx", "unknown element symbol 'Xx' at position 1 in 'Xx'", 1, ()),  # not an element
    ("J2", "unknown element symbol 'J' at position 1 in 'J2'", 1, ()),  # a letter with no element
    (
        "NACL",
        "unknown element symbol 'A' at position 2 in 'NACL'; element symbols are case-sensitive:"
        " did you mean 'NaCl'?",
        2,
        ("NaCl",),
    ),  # capitals with a case reading
    (
        "HE",
        "unknown element symbol 'E' at position 2 in 'HE'; element symbols are case-sensitive:"
        " did you mean 'He'?",
        2,
        ("He",),
    ),  # capitals with a case reading
    (
        "Na2SO4·XH2O",
        "unknown element symbol 'X' at position 8 in 'Na2SO4·XH2O'",
        8,
        (),
    ),  # capital X is no multiplier
    (
        "Na₂SO₄·Xx",
        "unknown element symbol 'Xx' at position 8 in 'Na₂SO₄·Xx'",
        8,
        (),
    ),  # position in pasted text
    (
        "Xx\n",
        "unknown element symbol 'Xx' at position 1 in 'Xx\\n'",
        1,
        (),
    ),  # a trailing line break is quoted as an escape, so the message stays one line
    # -- _Builder._count
    (
        "H0",
        "a count of 0 after 'H' at position 1 in 'H0' (counts are whole numbers from 1)",
        1,
        (),
    ),  # a zero count on a symbol
    (
        "Ca(OH)0",
        "a count of 0 in 'Ca(OH)0' (counts are whole numbers from 1)",
        None,
        (),
    ),  # a zero count on a group
    (
        "H007",
        "a count of 0 after 'H' at position 1 in 'H007' (counts are whole numbers from 1)",
        1,
        (),
    ),  # a count with a leading zero is read as 0
    (
        "Fe03+",
        "a count of 0 after 'Fe' at position 1 in 'Fe03+' (counts are whole numbers from 1)",
        1,
        (),
    ),  # a leading zero before a lone sign: refused, not read as Fe^3+
    (
        "Ca(OH)02",
        "a count of 0 in 'Ca(OH)02' (counts are whole numbers from 1)",
        None,
        (),
    ),  # a group count with a leading zero
    ("H100001", "the count 100001 in 'H100001' is larger than 100,000", None, ()),  # count too large
    (
        "(H)100001",
        "the count 100001 in '(H)100001' is larger than 100,000",
        None,
        (),
    ),  # group count too large
    # -- _Builder.part: multipliers
    ("CaSO4·1/0H2O", "the multiplier '1/0' in 'CaSO4·1/0H2O' is not a number", None, ()),  # zero denominator
    (
        "CaSO4·0H2O",
        "the multiplier '0' in 'CaSO4·0H2O' is out of range (expected a number above 0 and up to 100,000)",
        None,
        (),
    ),  # zero multiplier
    (
        "CaSO4·0.0H2O",
        "the multiplier '0.0' in 'CaSO4·0.0H2O' is out of range"
        " (expected a number above 0 and up to 100,000)",
        None,
        (),
    ),  # zero decimal
    (
        "CaSO4·0/2H2O",
        "the multiplier '0/2' in 'CaSO4·0/2H2O' is out of range"
        " (expected a number above 0 and up to 100,000)",
        None,
        (),
    ),  # zero fraction
    (
        "CaSO4·100001H2O",
        "the multiplier '100001' in 'CaSO4·100001H2O' is out of range"
        " (expected a number above 0 and up to 100,000)",
        None,
        (),
    ),  # multiplier too large
    (
        "CaSO4·200001/2H2O",
        "the multiplier '200001/2' in 'CaSO4·200001/2H2O' is out of range"
        " (expected a number above 0 and up to 100,000)",
        None,
        (),
    ),  # fraction just above the limit
    # -- parse_formula: charge range
    ("Fe^13+", "the charge +13 in 'Fe^13+' is out of range (at most 12)", None, ()),  # positive
    ("SO4^13-", "the charge -13 in 'SO4^13-' is out of range (at most 12)", None, ()),  # negative
    (
        "Fe" + "+" * 13,
        "the charge +13 in 'Fe+++++++++++++' is out of range (at most 12)",
        None,
        (),
    ),  # 13 signs
    # -- parse_formula: a charge of 0
    (
        "Fe^0+",
        "'Fe^0+' is written with a charge of 0 (expected a charge such as 2- or 3+, or none)",
        None,
        (),
    ),  # caret form
    (
        "Fe 0+",
        "'Fe 0+' is written with a charge of 0 (expected a charge such as 2- or 3+, or none)",
        None,
        (),
    ),  # spaced form
    (
        "Fe(0+)",
        "'Fe(0+)' is written with a charge of 0 (expected a charge such as 2- or 3+, or none)",
        None,
        (),
    ),  # bracket form
    (
        "Fe^+0",
        "'Fe^+0' is written with a charge of 0 (expected a charge such as 2- or 3+, or none)",
        None,
        (),
    ),  # sign then digits
    # -- _resolve_attached_charge: both or neither readings are ions
    (
        "O2-",
        "'O2-' is ambiguous: it reads as O2 with charge 1- (superoxide) or as O with charge 2- (oxide);"
        " write 'O2^-' or 'O^2-'",
        None,
        ("O2^-", "O^2-"),
    ),  # both readings are catalog ions
    (
        "N3-",
        "'N3-' is ambiguous: it reads as N3 with charge 1- (azide) or as N with charge 3- (nitride);"
        " write 'N3^-' or 'N^3-'",
        None,
        ("N3^-", "N^3-"),
    ),  # both readings are catalog ions
    (
        "Cl2-",
        "'Cl2-' is ambiguous: it reads as Cl2 with charge 1- or as Cl with charge 2-;"
        " write 'Cl2^-' or 'Cl^2-'",
        None,
        ("Cl2^-", "Cl^2-"),
    ),  # neither reading is a catalog ion
    (
        "Fe23+",
        "'Fe23+' is ambiguous: it reads as Fe23 with charge 1+ or as Fe2 with charge 3+;"
        " write 'Fe23^+' or 'Fe2^3+'",
        None,
        ("Fe23^+", "Fe2^3+"),
    ),  # a two-digit count, neither reading an ion
    (
        "CO3-",
        "'CO3-' is ambiguous: it reads as CO3 with charge 1- or as CO with charge 3-;"
        " write 'CO3^-' or 'CO^3-'",
        None,
        ("CO3^-", "CO^3-"),
    ),  # a polyatomic body, neither reading an ion
    (
        "Na2+",
        "'Na2+' is ambiguous: it reads as Na2 with charge 1+ or as Na with charge 2+;"
        " write 'Na2^+' or 'Na^2+'",
        None,
        ("Na2^+", "Na^2+"),
    ),  # a lone metal the catalog gives one charge (Na+) does not take the charge reading
    (
        "Ca3+",
        "'Ca3+' is ambiguous: it reads as Ca3 with charge 1+ or as Ca with charge 3+;"
        " write 'Ca3^+' or 'Ca^3+'",
        None,
        ("Ca3^+", "Ca^3+"),
    ),  # calcium: one catalog charge (Ca2+)
]


@pytest.mark.parametrize("text, message, position, choices", ERRORS, ids=_ids(ERRORS))
def test_error_message(text, message, position, choices):
    err = _error(text)
    assert err.message == message
    assert str(err) == message
    assert err.position == position
    assert err.choices == choices
    assert err.text == text
    assert "\n" not in message  # one line: it may land in a spreadsheet cell


@pytest.mark.parametrize("text, message, position, choices", ERRORS, ids=_ids(ERRORS))
def test_error_is_a_cellchem_error_and_a_value_error(text, message, position, choices):
    err = _error(text)
    assert isinstance(err, CellchemError)
    assert isinstance(err, ValueError)
    assert type(err) is FormulaError


@pytest.mark.parametrize("text, message, position, choices", ERRORS, ids=_ids(ERRORS))
def test_error_survives_pickle(text, message, position, choices):
    err = _error(text)
    back = pickle.loads(pickle.dumps(err))
    assert type(back) is FormulaError
    assert (back.message, back.text, back.position, back.choices) == (
        err.message,
        err.text,
        err.position,
        err.choices,
    )
    assert str(back) == message


NOT_TEXT = [
    (5, "5 is not a formula (expected text such as 'NaCl')", "5"),  # an int
    (None, "None is not a formula (expected text such as 'NaCl')", "None"),  # None (an empty cell)
    (b"NaCl", "b'NaCl' is not a formula (expected text such as 'NaCl')", "b'NaCl'"),  # bytes are not text
    (2.5, "2.5 is not a formula (expected text such as 'NaCl')", "2.5"),  # a float
    (["NaCl"], "['NaCl'] is not a formula (expected text such as 'NaCl')", "['NaCl']"),  # unhashable: a list
]


@pytest.mark.parametrize("value, message, text", NOT_TEXT, ids=_ids(NOT_TEXT))
def test_not_text_is_refused(value, message, text):
    err = _error(value)
    assert (err.message, err.text, err.position, err.choices) == (message, text, None, ())
    back = pickle.loads(pickle.dumps(err))
    assert (back.message, back.text) == (message, text)


def test_too_long_is_refused():
    # rule: more than 300 characters is refused; the error keeps the first 300
    text = "H" * 301
    err = _error(text)
    assert err.message == (
        "the text beginning 'HHHHHHHHHHHHHHHHHHHH' is 301 characters long,"
        " too long to be a formula (at most 300)"
    )
    assert err.text == "H" * 300
    assert err.position is None
    assert isinstance(err, ValueError)
    back = pickle.loads(pickle.dumps(err))
    assert (back.message, back.text) == (err.message, err.text)


def test_length_limit_is_300_exactly():
    # rule: 300 characters is still read
    assert parse_formula("H" * 300).counts == {"H": 300}


# rule: a Stock number (a Roman numeral in brackets after a symbol, with no
# count after it), pasted from a name such as iron(III) chloride, is not a formula
STOCK_NUMBERS = [
    ("Fe(III)", "(III)", 3),  # not Fe and three iodine atoms
    ("Cu(II)SO4", "(II)", 3),  # inside a salt formula
    ("Mn(IV)O2", "(IV)", 3),  # not iodine and vanadium
    ("Fe(II)Cl2", "(II)", 3),  # before the anion
    (" Fe(III)", "(III)", 4),  # the position counts the text as given, leading space included
    ("Fe(III)Cl3", "(III)", 3),  # a Stock number beside the counts it repeats
    ("Fe (III)", "(III)", 4),  # a space before the bracket, as in 'iron (III) chloride'
    ("Cu (II)SO4", "(II)", 4),  # a space before the bracket, inside a salt formula
    ("Mn (IV)O2", "(IV)", 4),  # a space before the bracket
]


@pytest.mark.parametrize("text, stock, position", STOCK_NUMBERS, ids=_ids(STOCK_NUMBERS))
def test_stock_number_is_refused(text, stock, position):
    err = _error(text)
    assert err.message == (
        f"'{text}' has a Stock number '{stock}' at position {position}; a formula gives the charge with"
        " its counts (FeCl3) or as a charge (Fe^3+), not in Roman numerals"
    )
    assert err.position == position


@pytest.mark.parametrize("text", ["Fe2.5O", "Cu2.5S", "Fe2.5(O)"])  # a lone atom, bare or in brackets
def test_decimal_count_before_a_lone_atom_is_refused(text):
    # rule: a '.' between digits that would join a lone atom is a decimal count
    # (non-stoichiometric formulas are written so), not a hydrate dot
    err = _error(text)
    assert err.message.startswith(f"'{text}' has a decimal count at position 3:")


# rule: a lone sign after a count with a multiplier, after a hydrate or adduct
# part, or after digits whose leading part is 1, is refused: both readings are
# plausible and neither is checked against the catalog. Rows: the input, its
# reading with the digits all count, and its reading with the last digit the charge.
AMBIGUOUS_WITH_MORE = [
    ("2Fe3+", "2Fe3^+", "2Fe^3+"),  # a leading multiplier
    ("2NH4+", "2NH4^+", "2NH^4+"),  # a leading multiplier, even before a catalog ion
    ("Na2CO3·H2O2-", "Na2CO3·H2O2^-", "Na2CO3·H2O^2-"),  # after a hydrate or adduct part
]
AMBIGUOUS_LEADING_ONE = [
    ("Fe13+", "Fe13^+", "Fe^3+"),  # the digits before the charge digit are 1
    ("Na11+", "Na11^+", "Na^+"),  # the digits before the charge digit are 1
    ("[Fe(CN)6]14-", "[Fe(CN)6]14^-", "[Fe(CN)6]^4-"),  # after a group, the digits before are 1
]
AMBIGUOUS_DIGITS = AMBIGUOUS_WITH_MORE + AMBIGUOUS_LEADING_ONE


def _ambiguous_digits_message(text: str) -> str:
    return (
        f"'{text}' is ambiguous: the digits before its sign may be a count or a charge;"
        " write the charge with '^' (for example 'Fe^3+') or with a space ('SO4 2-')"
    )


def _meaning(f) -> tuple:
    return (f.counts, f.charge, f.water, len(f.parts))


@pytest.mark.parametrize("text, count_reading, charge_reading", AMBIGUOUS_DIGITS, ids=_ids(AMBIGUOUS_DIGITS))
def test_ambiguous_digits_are_refused(text, count_reading, charge_reading):
    err = _error(text)
    assert err.message == _ambiguous_digits_message(text)
    assert (err.text, err.position) == (text, None)
    assert err.choices  # something to offer instead
    back = pickle.loads(pickle.dumps(err))
    assert (back.message, back.choices) == (err.message, err.choices)
    # the two readings are different formulas, each written explicitly
    assert _meaning(parse_formula(count_reading)) != _meaning(parse_formula(charge_reading))


@pytest.mark.parametrize(
    "text, count_reading, charge_reading", AMBIGUOUS_LEADING_ONE, ids=_ids(AMBIGUOUS_LEADING_ONE)
)
def test_ambiguous_digits_choices_are_readings_of_the_input(text, count_reading, charge_reading):
    # rule: each choice a refusal offers is one of the readings of the input
    readings = {repr(_meaning(parse_formula(r))) for r in (count_reading, charge_reading)}
    for choice in _error(text).choices:
        assert repr(_meaning(parse_formula(choice))) in readings


def test_error_table_covers_every_raise_in_formula_py():
    # Each FormulaError( in formula.py is one message template; the tables
    # must hold an example of each, identified by a fixed fragment. Two raises
    # share the decimal-count message: a 0.x or 1.x count after a symbol or a
    # bracket, and a '.' between digits before a lone atom.
    source = (ROOT / "cellchem" / "formula.py").read_text(encoding="utf-8")
    raises = source.count("FormulaError(")
    fragments = {
        "is not a formula (expected text": 1,
        "too long to be a formula": 1,
        "no formula given": 1,
        "nests brackets more than": 1,
        "has no matching": 1,
        "is closed by": 1,
        "are empty": 1,
        "is never closed": 1,
        "has a Stock number": 1,
        "has two hydrate dots together": 1,
        "has a decimal count": 2,
        "unexpected character": 1,
        "unknown element symbol": 1,
        "element symbols are case-sensitive and start with": 1,
        "nothing follows the": 1,
        "is not followed by a formula": 1,
        "is not a valid formula: unexpected": 1,
        "a count of 0": 1,
        "is larger than": 1,
        "is not a number": 1,
        "is out of range (expected a number": 1,
        "is out of range (at most": 1,
        "is written with a charge of 0": 1,
        "is ambiguous: the digits before its sign": 1,
        "is ambiguous: it reads as": 1,
        "is out of range (expected 0, or a number above 0": 1,
        "is not a number of waters": 1,
    }
    messages = (
        [m for _, m, _, _ in ERRORS]
        + [m for _, m, _ in NOT_TEXT]
        + ["too long to be a formula"]
        + [_ambiguous_digits_message(t) for t, _, _ in AMBIGUOUS_DIGITS]
        + [m for _, m in WITH_WATER_ERRORS]
    )
    for fragment in fragments:
        assert any(fragment in m for m in messages), fragment
    # the decimal-count table rows hit both raises: a 0.x/1.x count, and a lone atom
    assert any(m.startswith("'Fe0.95O' has a decimal count") for m in messages)
    assert any(m.startswith("'Fe2.5O' has a decimal count") for m in messages)
    # one entry per raise: a new raise in formula.py needs a new row here
    assert raises == sum(fragments.values())


# A lone sign after a round group: the catalog decides, as for an element.
ROUND_GROUP_LONE_SIGN = [
    ("Al(OH)4-", {"Al": 1, "O": 4, "H": 4}, -1),  # tetrahydroxidoaluminate, from memory
    ("B(OH)4-", {"B": 1, "O": 4, "H": 4}, -1),  # tetrahydroxidoborate, from memory
    ("Ag(NH3)2+", {"Ag": 1, "N": 2, "H": 6}, 1),  # diamminesilver(I), from memory
    ("Ag(CN)2-", {"Ag": 1, "C": 2, "N": 2}, -1),  # dicyanidoargentate(I), from memory
]


@pytest.mark.parametrize("text, counts, charge", ROUND_GROUP_LONE_SIGN, ids=_ids(ROUND_GROUP_LONE_SIGN))
def test_lone_sign_after_round_group_follows_catalog(text, counts, charge):
    # rule: a lone sign after a count is resolved against the ion catalog
    f = parse_formula(text)
    assert (f.counts, f.charge) == (counts, charge)


# ---------------------------------------------------------------------------
# case_readings
# ---------------------------------------------------------------------------

CASE_READINGS = [
    ("CUSO4", ("CuSO4",)),  # an all-capital text with a valid reading of its own
    ("NACL", ("NaCl",)),  # one other reading
    ("co", ("Co", "CO")),  # two readings, fewer symbols first
    ("CO", ("Co",)),  # the text itself is left out
    ("COCL2", ("CoCl2", "COCl2")),  # readings keep the digits
    ("cuso4·5h2o", ("CuSO4·5H2O", "CUSO4·5H2O")),  # a hydrate part
    ("NaCl", ()),  # no other reading
    ("XX", ()),  # letters that spell no symbols
    ("  nacl ", ("NaCl",)),  # surrounding spaces are dropped
    ("CUSO4·xH2O", ("CuSO4·xH2O",)),  # an unknown-count multiplier is kept as written
    ("NACL·nH2O", ("NaCl·nH2O",)),  # an 'n' multiplier is kept, not read as nitrogen
]


@pytest.mark.parametrize("text, readings", CASE_READINGS, ids=_ids(CASE_READINGS))
def test_case_readings(text, readings):
    assert case_readings(text) == readings


def test_case_readings_are_at_most_six():
    # rule: a handful of readings at most
    readings = case_readings("cococo")
    assert 1 < len(readings) <= 6
    for r in readings:
        assert parse_formula(r).counts  # each is a formula cellchem reads


def test_all_capital_formula_is_accepted_as_written():
    # rule: symbols are case-sensitive, so CUSO4 is carbon, uranium, sulfur and
    # oxygen; case_readings lets an audit flag it
    f = parse_formula("CUSO4")
    assert f.counts == {"C": 1, "U": 1, "S": 1, "O": 4}
    assert "CuSO4" in case_readings("CUSO4")


# ---------------------------------------------------------------------------
# Rules that earlier versions broke
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, water",
    [
        ("CaSO4·1/128H2O", Fraction(1, 128)),  # a fraction with 7 decimal places
        ("CaSO4·0.0078125H2O", Fraction(1, 128)),  # the same, written as a decimal
        ("CaSO4·0.0000001H2O", Fraction(1, 10**7)),  # a decimal with 7 places
    ],
)
def test_canonical_text_keeps_multiplier_exactly(text, water):
    # rule: the canonical text of a multiplier is exact, so it reads back to the same water
    f = parse_formula(text)
    assert parse_formula(str(f)).water == f.water == water


def test_bracketed_water_part_is_water():
    # rule: a water part written in round brackets ('5(H2O)') is water, as its
    # canonical text CuSO4·5H2O is
    f = parse_formula("CuSO4·5(H2O)")
    assert str(f) == "CuSO4·5H2O"
    assert f.water == parse_formula(str(f)).water == 5
    assert str(f.anhydrous()) == "CuSO4"


@pytest.mark.parametrize(
    "text, canonical",
    [
        ("(ClNa)", "NaCl"),  # a whole part in round brackets counted once: cations first
        ("(HLi)", "LiH"),  # found by hypothesis as '2H·2((H Li))'
        ("K(ClNa)", "KClNa"),  # K+ Cl- Na+ does not balance, so it is left as written, as 'KClNa' is
    ],
)
def test_canonical_text_is_a_fixed_point(text, canonical):
    # rule: the canonical text reads back to itself, and equal meanings have one text
    first = str(parse_formula(text))
    assert str(parse_formula(first)) == first
    assert first == canonical
    assert first == str(parse_formula(text.replace("(", "").replace(")", "")))


# rule: every message is one line; rows: line feed, inner line feed, NEL, line separator
@pytest.mark.parametrize("text", ["Xx\n", "Na\nCl;", "0\n", "0\x85", "NaCl\u20282"])
def test_message_is_one_line_for_multiline_input(text):
    err = _error(text)
    assert len(err.message.splitlines()) == 1
    assert err.text == text  # the input itself is kept as given


def test_case_readings_of_long_letter_run_is_fast():
    # rule: a wrong-case cell is answered at once, however its letters split
    # ('co' * 30 + 'q', 61 characters, has 2**30 splits into symbols).
    # Run in a child process so that a slow answer cannot hold up the suite.
    code = textwrap.dedent(
        """
        from cellchem import parse_formula, CellchemError
        try:
            parse_formula("co" * 30 + "q")
        except CellchemError:
            pass
        """
    )
    try:
        subprocess.run([sys.executable, "-c", code], cwd=ROOT, timeout=5, check=True)
    except subprocess.TimeoutExpired:
        pytest.fail("parse_formula('co' * 30 + 'q') took more than 5 seconds")


# rule: a counted group of iodine or vanadium ('(I)2') is not a Stock number,
# so a formula whose canonical text has one reads back. Rows: a space, cations
# first, a nested group, a written count of 1 (found by
# test_one_character_changed_gives_formula_or_cellchem_error)
@pytest.mark.parametrize(
    "text, counts",
    [
        ("Hg (I)2", {"Hg": 1, "I": 2}),
        ("(I)2Ca", {"I": 2, "Ca": 1}),
        ("Hg((I)2)", {"Hg": 1, "I": 2}),
        ("H(V1)2", {"H": 1, "V": 2}),
    ],
)
def test_canonical_text_with_counted_iodine_group_reads_back(text, counts):
    f = parse_formula(text)
    assert f.counts == counts
    assert _meaning(parse_formula(str(f))) == _meaning(f)


# ---------------------------------------------------------------------------
# Known faults (xfail, strict): what cellchem should do
# ---------------------------------------------------------------------------


@pytest.mark.xfail(
    reason="cellchem bug: when a lone sign follows a count with a multiplier or after a hydrate part,"
    " the choice offered drops the rest of the formula: '2Fe3+' offers 'Fe3^+' (three iron atoms,"
    " not six), 'Na2CO3·H2O2-' offers 'H2O2^-'",
    strict=True,
)
@pytest.mark.parametrize(
    "text, count_reading, charge_reading", AMBIGUOUS_WITH_MORE, ids=_ids(AMBIGUOUS_WITH_MORE)
)
def test_ambiguous_digits_choices_keep_the_whole_formula(text, count_reading, charge_reading):
    # rule: each choice a refusal offers is one of the readings of the input
    readings = {repr(_meaning(parse_formula(r))) for r in (count_reading, charge_reading)}
    for choice in _error(text).choices:
        assert repr(_meaning(parse_formula(choice))) in readings


@pytest.mark.xfail(
    reason="cellchem bug: the refusal 'the digits before its sign may be a count or a charge' offers"
    " only the count reading as a choice ('Fe13+' offers 'Fe13^+' but not 'Fe^3+'), while the"
    " other ambiguity refusal ('O2-') offers both readings",
    strict=True,
)
@pytest.mark.parametrize("text, count_reading, charge_reading", AMBIGUOUS_DIGITS, ids=_ids(AMBIGUOUS_DIGITS))
def test_ambiguous_digits_offer_both_readings(text, count_reading, charge_reading):
    # rule: the choices are the two readings the message names, count reading first
    choices = _error(text).choices
    assert [_meaning(parse_formula(c)) for c in choices] == [
        _meaning(parse_formula(count_reading)),
        _meaning(parse_formula(charge_reading)),
    ]


@pytest.mark.xfail(
    reason="cellchem bug: the cations of a round group counted once beside other items (or inside"
    " another such group) are not put first before its brackets are dropped, so 'K(SO4Na)' is"
    " written 'KSO4Na', which is written 'KNaSO4' (found by"
    " test_one_character_changed_gives_formula_or_cellchem_error as '2(HLi2) H')",
    strict=True,
)
@pytest.mark.parametrize(
    "text, canonical",
    [
        ("K(SO4Na)", "KNaSO4"),  # sodium potassium sulfate, the sodium sulfate in brackets
        ("K(ClNa)Cl", "KNaClCl"),  # a group counted once between a cation and an anion
        ("((ClNa))", "NaCl"),  # a group counted once inside the whole-part group
        ("(HLi2)H", "Li2HH"),  # found by hypothesis
    ],
)
def test_canonical_text_of_inner_group_is_a_fixed_point(text, canonical):
    # rule: the canonical text reads back to itself, and equal meanings have one text
    first = str(parse_formula(text))
    assert str(parse_formula(first)) == first
    assert first == canonical == str(parse_formula(text.replace("(", "").replace(")", "")))


@pytest.mark.xfail(
    reason="cellchem bug: text(ascii=True) joins parts with '.', so a lone-atom part after a count"
    " is written 'H2.2H', which is refused as a decimal count"
    " (found by test_round_trip in test_formula_properties.py as '2H·2H2·2H')",
    strict=True,
)
@pytest.mark.parametrize("text", ["H2·2H", "Fe2·3O", "CuCl2·2Cl"])  # a lone atom after a count
def test_ascii_text_reads_back(text):
    # rule: text(ascii=True) reads back as the same formula (docs/grammar.md, section 13)
    f = parse_formula(text)
    assert parse_formula(f.text(ascii=True)) == parse_formula(str(f))


@pytest.mark.xfail(
    reason="cellchem bug: only a water part in one pair of round brackets is water: 'CuSO4·5((H2O))'"
    " and 'CuSO4·5(H2)O' have water 0, but their canonical text 'CuSO4·5H2O' has water 5",
    strict=True,
)
@pytest.mark.parametrize("text", ["CuSO4·5((H2O))", "CuSO4·5(H2)O"])  # nested brackets, part in brackets
def test_water_in_other_brackets_is_water(text):
    # rule: the canonical text means what the formula means, water included
    f = parse_formula(text)
    assert f.water == parse_formula(str(f)).water


@pytest.mark.xfail(
    reason="cellchem bug: a dangling multiplier is misreported: 'CuSO4·x' is called a case error;"
    " '1/2', '½' and '.5' point at the dot or at the wrong character",
    strict=True,
)
@pytest.mark.parametrize(
    "text, multiplier, position",
    [
        ("CuSO4·x", "x", 7),  # an unknown multiplier alone after the dot
        ("x", "x", 1),  # an unknown multiplier alone
        ("CuSO4·1/2", "1/2", 7),  # a fraction alone after the dot
        ("CuSO4·½", "½", 7),  # ½ alone after the dot
        ("CuSO4·.5", ".5", 7),  # a decimal without its 0 alone after the dot
        ("2/2", "2/2", 1),  # a fraction alone ("unexpected the end")
    ],
)
def test_dangling_multiplier_message(text, multiplier, position):
    err = _error(text)
    assert err.message == (
        f"the multiplier '{multiplier}' at position {position} of '{text}' is not followed by a formula"
        " (expected e.g. '5H2O')"
    )
    assert err.position == position
    assert err.choices == ()


@pytest.mark.xfail(
    reason="cellchem bug: 'CaSO4·1½H2O' is refused pointing at the dot (position 6);"
    " it should be read as 1.5 or refused at the '½' (position 8)",
    strict=True,
)
def test_mixed_number_multiplier():
    try:
        f = parse_formula("CaSO4·1½H2O")
    except FormulaError as err:
        assert err.position == 8
    else:
        assert f.water == Fraction(3, 2)
