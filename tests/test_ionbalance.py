"""Cation-anion balance and the Standard Methods 1030 E acceptance criteria
(Standard Methods for the Examination of Water and Wastewater, 1030 E; from
memory: anion sum 0-3.0 meq/L within 0.2 meq/L, 3.0-10.0 within 2 %, 10-800
within 5 %). Milliequivalents are worked by hand from the ion molar masses
(CIAAW 2021) and charges."""

import pytest

from cellchem import CellchemError, ion_balance


def test_a_balanced_hard_water_in_mg_per_litre():
    # Ca 80.16 mg/L = 4.000 meq/L; Mg 24.305 = 2.000; Na 22.99 = 1.000  -> 7.000
    # HCO3 244.07 = 4.000; SO4 96.06 = 2.000; Cl 35.45 = 1.000          -> 7.000
    b = ion_balance(
        {"Ca2+": 80.16, "Mg2+": 24.305, "Na+": 22.99, "HCO3-": 244.07, "SO4 2-": 96.06, "Cl-": 35.45},
        unit="mg/L",
    )
    assert b.cations == pytest.approx(7.000, abs=0.002)
    assert b.anions == pytest.approx(7.000, abs=0.002)
    assert abs(b.error_percent) < 0.05
    assert b.acceptable
    assert "3.0-10.0" in b.criterion


def test_low_sum_uses_the_absolute_criterion():
    b = ion_balance({"Na+": 1.0, "Cl-": 0.85})  # meq/L; difference 0.15 <= 0.2
    assert b.acceptable and "0.2 meq/L" in b.criterion
    b = ion_balance({"Na+": 1.0, "Cl-": 0.75})  # difference 0.25
    assert not b.acceptable


def test_percent_criteria():
    assert ion_balance({"Na+": 5.15, "Cl-": 5.0}).acceptable  # 1.48 %
    assert not ion_balance({"Na+": 5.25, "Cl-": 5.0}).acceptable  # 2.44 %
    assert ion_balance({"Na+": 20.9, "Cl-": 20.0}).acceptable  # 2.20 %, 5 % applies
    assert not ion_balance({"Na+": 23.0, "Cl-": 20.0}).acceptable  # 6.98 %


def test_mmol_and_names():
    b = ion_balance({"calcium": 1.0, "sodium": 1.0, "bicarbonate": 2.0, "chloride": 1.0}, unit="mmol/L")
    assert b.cations == pytest.approx(3.0) and b.anions == pytest.approx(3.0)


def test_refusals():
    with pytest.raises(CellchemError, match="another basis"):
        ion_balance({"NO3-N": 1.0, "Na+": 1.0})
    with pytest.raises(CellchemError, match="more than one ion"):
        ion_balance({"Fe": 1.0, "Cl-": 1.0})
    with pytest.raises(CellchemError, match="same ion"):
        ion_balance({"Na+": 1.0, "sodium": 1.0, "Cl-": 2.0})
    with pytest.raises(CellchemError, match="both cations and anions"):
        ion_balance({"Na+": 1.0})
