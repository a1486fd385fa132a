"""CAS Registry Numbers: format and check digit.

Source: CAS, "Check Digit Verification of CAS Registry Numbers" (the rule:
digits other than the check digit, weighted 1, 2, 3 ... from the right,
summed modulo 10; CAS's worked example is water, 7732-18-5: 8x1 + 1x2 + 2x3 +
3x4 + 7x5 + 7x6 = 105, check digit 5; from memory). The other numbers are
well-known CAS RNs (from memory); each one's check digit is worked by hand in
the comment beside it.
"""

import pytest
from hypothesis import given
from hypothesis import strategies as st

from cellchem import CellchemError, cas_is_valid
from cellchem.cas import read_cas

VALID = [
    "7732-18-5",  # water: 105 -> 5 (CAS's example)
    "7647-14-5",  # sodium chloride: 4x1+1x2+7x3+4x4+6x5+7x6 = 4+2+21+16+30+42 = 115 -> 5
    "64-17-5",  # ethanol: 7x1+1x2+4x3+6x4 = 7+2+12+24 = 45 -> 5
    "50-00-0",  # formaldehyde: 0+0+0+5x4 = 20 -> 0
    "7758-99-8",  # copper(II) sulfate pentahydrate: 9+18+24+20+35+42 = 148 -> 8
]


def _weighted(digits: str) -> int:
    return sum(int(d) * i for i, d in enumerate(reversed(digits), 1)) % 10


def test_hand_worked_check_digits():
    # the comments above, worked in code from the published rule (not from cellchem)
    assert _weighted("773218") == 5
    assert _weighted("764714") == 5
    assert _weighted("6417") == 5
    assert _weighted("5000") == 0
    # 7758-99: 9x1 + 9x2 + 8x3 + 5x4 + 7x5 + 7x6 = 9+18+24+20+35+42 = 148 -> 8
    assert _weighted("775899") == 8


@pytest.mark.parametrize("number", VALID)
def test_valid_numbers(number):
    assert cas_is_valid(number)
    assert read_cas(number).number == number


@pytest.mark.parametrize(
    "text, number, form",
    [
        ("7732185", "7732-18-5", "without hyphens"),
        ("CAS 7732-18-5", "7732-18-5", "with a prefix"),
        ("CAS No. 7647-14-5", "7647-14-5", "with a prefix"),
        ("7647 14 5", "7647-14-5", "with spaces"),
    ],
)
def test_other_written_forms_are_read_and_named(text, number, form):
    reading = read_cas(text)
    assert reading.number == number and form in reading.forms
    assert not cas_is_valid(text)  # valid means the standard form


def test_pasted_dashes_are_hyphens():
    assert read_cas("7732‑18‑5").number == "7732-18-5"  # non-breaking hyphens from a PDF


@pytest.mark.parametrize(
    "text, words",
    [
        ("7732-18-4", "call for 5, not 4"),
        ("7732-18", "groups"),
        ("1-23-4", "groups"),
        ("0050-00-0", "may not start with 0"),
        ("abc", "not a CAS RN"),
        ("", "not a CAS RN"),
        ("12345678901", "digits without hyphens"),
    ],
)
def test_refusals(text, words):
    with pytest.raises(CellchemError, match=words):
        read_cas(text)
    assert not cas_is_valid(text)


def test_the_suggestion_is_the_corrected_number():
    with pytest.raises(CellchemError) as info:
        read_cas("7732-18-4")
    assert info.value.choices == ("7732-18-5",)


@given(st.text(max_size=20))
def test_never_raises_anything_else(text):
    try:
        read_cas(text)
    except CellchemError:
        pass
    assert cas_is_valid(text) in (True, False)


@given(st.integers(min_value=10000, max_value=999999999))
def test_every_number_has_exactly_one_check_digit(body):
    digits = str(body)
    first, second = digits[:-2], digits[-2:]
    good = [d for d in range(10) if cas_is_valid(f"{first}-{second}-{d}")]
    assert good == [_weighted(first + second)]
