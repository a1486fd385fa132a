"""Long inputs: the name and formula readers refuse a text longer than a name or
a formula may be before they read it, with one line that says how long it is,
how it begins and the limit; no input of any length up to 1 MB makes the
readers or the audit's line check raise anything but CellchemError, or take
more than a moment.

The limits are cellchem's own (``cellchem.formula.MAX_LENGTH``, 300 characters;
``cellchem.names.to_formula.MAX_NAME_LENGTH``, 500 characters: the longest name
of the substance table, a registry name of an organic compound, is 428)."""

import random
import time

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from cellchem import CellchemError, name_from_formula, parse_formula, read_name
from cellchem.audit import check_line
from cellchem.errors import FormulaError, NameReadError
from cellchem.formula import MAX_LENGTH
from cellchem.names.to_formula import MAX_NAME_LENGTH

ALPHABET = "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ()[]0123456789 "
LENGTHS = [10**3, 10**4, 10**5, 10**6]
SECONDS = 2.0  # each call returns or refuses within this


def _text(kind: str, n: int) -> str:
    rng = random.Random(n)
    if kind == "mixed":
        return "".join(rng.choice(ALPHABET) for _ in range(n))
    pieces = {
        "words": "sodium chloride ",
        "ligands": "hexaammine",
        "symbols": "NaCl",
        "brackets": "(",
        "digits": "1",
        "spaces": " ",
    }[kind]
    text = (pieces * (n // len(pieces) + 1))[:n]
    if kind == "brackets":
        text = "(" * (n // 2) + ")" * (n - n // 2)
    return text


KINDS = ["mixed", "words", "ligands", "symbols", "brackets", "digits", "spaces"]
READERS = {
    "read_name": read_name,
    "parse_formula": parse_formula,
    "check_line formula": lambda text: check_line(text),
    "check_line name": lambda text: check_line(None, None, text),
    "check_line every cell": lambda text: check_line(text, text, text, text),
}


@pytest.mark.parametrize("reader", list(READERS), ids=list(READERS))
@pytest.mark.parametrize("kind", KINDS, ids=KINDS)
@pytest.mark.parametrize("n", LENGTHS, ids=[f"{n:,}" for n in LENGTHS])
def test_a_long_input_is_read_or_refused_at_once(reader, kind, n):
    text = _text(kind, n)
    start = time.perf_counter()
    try:
        READERS[reader](text)
    except CellchemError:
        pass
    assert time.perf_counter() - start < SECONDS


@pytest.mark.parametrize("n", LENGTHS, ids=[f"{n:,}" for n in LENGTHS])
def test_a_long_name_is_refused_unread(n):
    text = _text("words", n)
    with pytest.raises(NameReadError) as info:
        read_name(text)
    assert str(info.value) == (
        f"the text beginning 'sodium chloride sodi' is {n} characters long, too long to be a name"
        " (at most 500)"
    )
    assert info.value.reason == "too-long"
    assert info.value.text == text[:MAX_NAME_LENGTH]


@pytest.mark.parametrize("n", LENGTHS, ids=[f"{n:,}" for n in LENGTHS])
def test_a_long_formula_is_refused_unread(n):
    text = _text("symbols", n)
    with pytest.raises(FormulaError) as info:
        parse_formula(text)
    assert str(info.value) == (
        f"the text beginning 'NaClNaClNaClNaClNaCl' is {n} characters long, too long to be a formula"
        " (at most 300)"
    )
    assert info.value.text == text[:MAX_LENGTH]


def test_the_limits():
    assert (MAX_LENGTH, MAX_NAME_LENGTH) == (300, 500)
    read_name("sodium chloride" + " " * (MAX_NAME_LENGTH - 15))  # at the limit: read
    with pytest.raises(NameReadError, match="is 501 characters long"):
        read_name("sodium chloride" + " " * (MAX_NAME_LENGTH - 14))


def test_the_name_that_once_ran_out_of_stack_is_refused():
    # 6,800 characters of words once recursed a level per word past Python's limit
    text = ("copper (ii) sulfate, " * 400)[:6800]
    with pytest.raises(NameReadError, match="is 6800 characters long, too long to be a name"):
        read_name(text)


def test_more_ligands_than_a_prefix_counts_are_not_read():
    # 240 'en' ligands: more than the prefix table counts (its prefixes go to icosa, 20); the
    # entity is not read, and the name is refused as one cellchem does not read
    text = "en" * 240 + "cobalt(iii) chloride"
    with pytest.raises(NameReadError) as info:
        read_name(text)
    assert str(info.value).startswith(f"'{text}' is not a name cellchem can read: no ion, element or known")


def test_a_complex_with_more_ligands_than_a_prefix_counts_is_not_named():
    with pytest.raises(NameReadError) as info:
        name_from_formula("[Co(NH3)21]Cl3")
    assert str(info.value) == (
        "'[Co(NH3)21]' cannot be named: the prefix table has no multiplicative prefix for 21 'ammine'"
        " ligands (it counts up to 20)"
    )


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.text(alphabet=ALPHABET, max_size=MAX_NAME_LENGTH))
def test_any_text_up_to_the_name_limit_is_read_or_refused(text):
    for reader in (read_name, parse_formula):
        try:
            reader(text)
        except CellchemError:
            pass


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(
    st.lists(
        st.sampled_from(
            ["en", "ammine", "hexa", "bis(", ")", "chlorido", "cobalt", "(iii)", " ", "sodium", "di"]
        ),
        max_size=120,
    ).map("".join)
)
def test_any_run_of_name_words_up_to_the_limit_is_read_or_refused(text):
    try:
        read_name(text[:MAX_NAME_LENGTH])
    except CellchemError:
        pass
