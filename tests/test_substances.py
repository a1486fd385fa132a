"""Checks of cellchem.substances: the CAS RN table built from open data.

Check values: CAS RNs of common reagents as printed on supplier labels and in the CRC Handbook,
"Physical Constants of Inorganic Compounds" and "Physical Constants of Organic Compounds" (from
memory); the source package `chemicals` (PubChem-derived identifiers, MIT licence) as an oracle
where it is installed (the test extra).
"""

from __future__ import annotations

import sqlite3
import time
from importlib import resources

import pytest

from cellchem import CellchemError, molar_mass, parse_formula
from cellchem.substances import (
    by_composition,
    composition_key,
    edition,
    find_substances,
    meta,
    name_match,
    substance,
)

# CAS RN -> (formula as the line would write it, source)
KNOWN = {
    "7647-14-5": ("NaCl", "CRC (from memory)"),
    "7447-40-7": ("KCl", "CRC (from memory)"),
    "7732-18-5": ("H2O", "CRC (from memory)"),
    "7758-99-8": ("CuSO4·5H2O", "CRC, copper(II) sulfate pentahydrate (from memory)"),
    "7758-98-7": ("CuSO4", "CRC, anhydrous copper(II) sulfate (from memory)"),
    "10034-99-8": ("MgSO4·7H2O", "CRC, Epsom salt (from memory)"),
    "7487-88-9": ("MgSO4", "CRC (from memory)"),
    "1310-73-2": ("NaOH", "CRC (from memory)"),
    "7722-64-7": ("KMnO4", "CRC (from memory)"),
    "7778-50-9": ("K2Cr2O7", "CRC (from memory)"),
    "64-17-5": ("C2H6O", "CRC, ethanol (from memory)"),
    "67-64-1": ("C3H6O", "CRC, acetone (from memory)"),
    "67-56-1": ("CH4O", "CRC, methanol (from memory)"),
    "57-50-1": ("C12H22O11", "CRC, sucrose (from memory)"),
    "57-13-6": ("CH4N2O", "CRC, urea (from memory)"),
    "77-92-9": ("C6H8O7", "CRC, citric acid (from memory)"),
    "6132-04-3": ("Na3C6H5O7·2H2O", "trisodium citrate dihydrate, supplier labels (from memory)"),
    "877-24-7": ("KHC8H4O4", "potassium hydrogen phthalate, supplier labels (from memory)"),
}


@pytest.mark.parametrize(("cas", "formula"), [(c, f) for c, (f, _) in KNOWN.items()], ids=list(KNOWN))
def test_lookup_gives_the_substance(cas, formula):
    record = substance(cas)
    assert record is not None and record.certain, record
    assert composition_key(record.formula) == composition_key(formula)
    assert record.molar_mass == pytest.approx(float(molar_mass(parse_formula(formula))), abs=0.05)


def test_unknown_and_malformed_numbers():
    assert substance("999999-99-4") is None  # a well-formed number of nothing the table holds
    with pytest.raises(CellchemError):
        substance("7647-14-4")  # a wrong check digit is refused, not looked up


def test_open_data_errors_are_marked_uncertain():
    # ammonium heptamolybdate tetrahydrate 12054-85-2 is (NH4)6Mo7O24·4H2O (CRC, from memory); the
    # source record gives the orthomolybdate with no water, so it must not be certain
    record = substance("12054-85-2")
    assert record is not None and not record.certain and "tetrahydrate" in record.doubt


def test_names_match_exactly_and_only_one_substance():
    assert [s.cas for s in find_substances("ETHANOL")] == ["64-17-5"]
    assert [s.cas for s in find_substances("Copper(II) sulphate pentahydrate")] == ["7758-99-8"]
    assert find_substances("etanol") == ()  # no fuzzy matching
    match = name_match("acetone")
    assert match is not None and match[0].cas == "67-64-1" and match[1] == "name"


def test_by_composition_finds_the_hydrate_and_the_anhydrous_salt_apart():
    assert "7758-99-8" in [s.cas for s in by_composition("CuSO4·5H2O")]
    assert "7758-98-7" in [s.cas for s in by_composition("CuSO4")]
    assert "7758-99-8" not in [s.cas for s in by_composition("CuSO4")]


def test_the_table_says_its_source_and_counts():
    m = meta()
    assert "chemicals" in m["edition"] and "PubChem" in m["source"] and "MIT" in m["source"]
    assert int(m["records"]) > 60_000 and 0 < int(m["uncertain"]) < int(m["records"]) // 5
    assert "chemicals" in edition()


def test_every_certain_record_agrees_with_itself():
    """The build's checks hold in the shipped file: a certain record's formula reads and
    its molar mass is the record's weight (checked on every 50th record)."""
    path = resources.files("cellchem.data").joinpath("substances.sqlite")
    with resources.as_file(path) as p:
        db = sqlite3.connect(f"file:{p}?mode=ro", uri=True)
        rows = db.execute(
            "SELECT cas, formula, weight FROM substances WHERE doubt = '' AND id % 50 = 0"
        ).fetchall()
        db.close()
    assert len(rows) > 1000
    for cas, formula, weight in rows:
        assert float(molar_mass(parse_formula(formula))) == pytest.approx(
            weight, abs=max(0.05, 5e-4 * weight)
        ), cas


def test_a_lookup_costs_microseconds():
    substance("7647-14-5")  # the table is open
    start = time.perf_counter()
    for cas in KNOWN:
        substance(cas)
    elapsed = (time.perf_counter() - start) / len(KNOWN)
    assert elapsed < 0.01  # generous: measured about 30 us cold on the development machine


chemicals = pytest.importorskip("chemicals.identifiers", reason="the source package is in the test extra")


@pytest.mark.parametrize("cas", sorted(KNOWN))
def test_lookups_agree_with_the_source_package(cas):
    source = chemicals.search_chemical(cas)
    record = substance(cas)
    assert record is not None
    assert composition_key(record.formula) == composition_key(source.formula)
    assert record.molar_mass == pytest.approx(source.MW, abs=0.01)
