"""The fast path for simple formulas gives exactly what the grammar gives.

Simple formulas (element symbols with counts, and at most one hydrate or
adduct part) skip the pyparsing grammar for speed; everything else goes to
the grammar. For any text, the fast path either declines or returns the same
Formula (parts, items, counts, multipliers, charge) as the grammar."""

from hypothesis import given, settings
from hypothesis import strategies as st

from cellchem.elements import symbols
from cellchem.errors import CellchemError
from cellchem.formula import _fast_parse, _parse_with_grammar

SYMBOLS = sorted(symbols())

atom = st.tuples(
    st.sampled_from(SYMBOLS + ["Xx", "h", "CU"]), st.one_of(st.just(""), st.integers(0, 120).map(str))
)
part = st.lists(atom, min_size=1, max_size=6).map(lambda xs: "".join(s + n for s, n in xs))
formula = st.tuples(
    part,
    st.one_of(
        st.just(""),
        st.tuples(
            st.sampled_from(["·", ".", "*"]), st.one_of(st.just(""), st.integers(0, 20).map(str)), part
        ).map("".join),
    ),
).map("".join)


@settings(max_examples=1500, deadline=None)
@given(formula)
def test_fast_path_agrees_with_the_grammar(text):
    fast = _fast_parse(text)
    if fast is None:
        return
    try:
        slow = _parse_with_grammar(text)
    except CellchemError as exc:  # the grammar refuses what the fast path read
        raise AssertionError(f"{text!r}: fast path read {fast}, grammar refused: {exc}") from None
    assert fast == slow and fast.parts == slow.parts and fast.charge == slow.charge
    assert fast.text() == slow.text()


@settings(max_examples=300, deadline=None)
@given(st.text(max_size=20))
def test_fast_path_declines_or_agrees_on_any_text(text):
    fast = _fast_parse(text)
    if fast is not None:
        assert fast == _parse_with_grammar(text)


def test_fast_path_takes_the_common_cases():
    for text in ("NaCl", "CuSO4·5H2O", "MgSO4.7H2O", "C6H12O6", "KMnO4"):
        assert _fast_parse(text) is not None
    for text in ("Al2(SO4)3", "K4[Fe(CN)6]·3H2O", "(NH4)2Fe(SO4)2·6H2O"):
        assert _fast_parse(text) is not None
    for text in ("SO4 2-", "Fe2.5O", "CuSO₄", "co Cl2", "Na2CO3·xH2O", "Fe(III)Cl3", "Al2(SO4", "()"):
        assert _fast_parse(text) is None
