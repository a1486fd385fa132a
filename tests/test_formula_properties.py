"""Property tests of the formula reader (hypothesis).

The strategies build formula texts from a model (element symbols, counts,
nested groups, hydrate parts with multipliers, a charge) and compute the
expected element counts, charge and water from that model by their own
arithmetic, so the expected values never come from cellchem.

Check values: the element symbols below are the 118 IUPAC symbols (from
memory); the notation rules are those of docs/grammar.md.
"""

from __future__ import annotations

import itertools
import re
from dataclasses import dataclass
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from cellchem import CellchemError, parse_formula
from cellchem.errors import FormulaError

FAST = settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])

# The 118 element symbols (IUPAC; from memory).
SYMBOLS = (
    "H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn Ga Ge As Se Br Kr "
    "Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho Er Tm "
    "Yb Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn Fr Ra Ac Th Pa U Np Pu Am Cm Bk Cf Es Fm Md No "
    "Lr Rf Db Sg Bh Hs Mt Ds Rg Cn Nh Fl Mc Lv Ts Og"
).split()

DOTS = "·•∙⋅×*."
SUB = str.maketrans("0123456789", "₀₁₂₃₄₅₆₇₈₉")
SUP = str.maketrans("0123456789+-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻")


def test_symbol_list_is_the_element_table():
    # the strategies draw from this list; it must be exactly what cellchem reads
    from cellchem.elements import symbols

    assert len(SYMBOLS) == len(set(SYMBOLS)) == 118
    assert set(SYMBOLS) == set(symbols())


# ---------------------------------------------------------------------------
# The model
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class MAtom:
    symbol: str
    count: int  # 1 when not written

    def counts(self) -> dict[str, Fraction]:
        return {self.symbol: Fraction(self.count)}


@dataclass(frozen=True)
class MGroup:
    bracket: str
    items: tuple
    count: int

    def counts(self) -> dict[str, Fraction]:
        return scale(total(self.items), self.count)


def total(items) -> dict[str, Fraction]:
    out: dict[str, Fraction] = {}
    for item in items:
        for s, n in item.counts().items():
            out[s] = out.get(s, 0) + n
    return out


def scale(counts: dict[str, Fraction], k: Fraction) -> dict[str, Fraction]:
    return {s: n * k for s, n in counts.items()}


def add(a: dict[str, Fraction], b: dict[str, Fraction]) -> dict[str, Fraction]:
    out = dict(a)
    for s, n in b.items():
        out[s] = out.get(s, 0) + n
    return out


def flatten_single_round(items) -> tuple:
    """The items as the canonical text writes them: round groups counted once
    lose their brackets."""
    out = []
    for item in items:
        if isinstance(item, MGroup):
            inner = flatten_single_round(item.items)
            if item.bracket == "(" and item.count == 1:
                out.extend(inner)
            else:
                out.append(MGroup(item.bracket, inner, item.count))
        else:
            out.append(item)
    return tuple(out)


WATER = (MAtom("H", 2), MAtom("O", 1))


@dataclass(frozen=True)
class MPart:
    items: tuple
    multiplier: Fraction | None  # None: unknown (x, n, y)

    @property
    def is_water(self) -> bool:
        """Exactly H2O, or H2O in one pair of round brackets ('5(H2O)')."""
        return self.items == WATER or (
            len(self.items) == 1
            and isinstance(self.items[0], MGroup)
            and self.items[0].bracket == "("
            and self.items[0].count == 1
            and self.items[0].items == WATER
        )

    @property
    def reads_as_water_only_in_canonical_text(self) -> bool:
        # 'CuSO4·5((H2O))', 'CuSO4·5(H2)O': not water as written, water once the
        # brackets go (a known fault, see test_water_in_other_brackets_is_water)
        return not self.is_water and flatten_single_round(self.items) == WATER

    @property
    def is_lone_atom(self) -> bool:
        """One atom, bare or in one pair of round brackets counted once: after
        '<digit>.<digit>' such a part makes the '.' a decimal point."""
        items = self.items
        if (
            len(items) == 1
            and isinstance(items[0], MGroup)
            and items[0].bracket == "("
            and items[0].count == 1
        ):
            items = items[0].items
        return len(items) == 1 and isinstance(items[0], MAtom)


@dataclass(frozen=True)
class Model:
    parts: tuple
    charge: int

    def counts(self) -> dict[str, Fraction]:
        out: dict[str, Fraction] = {}
        for p in self.parts:
            if p.multiplier is not None:
                out = add(out, scale(total(p.items), p.multiplier))
        return out

    def water(self) -> Fraction | None:
        w = Fraction(0)
        for p in self.parts[1:]:
            if p.is_water:
                if p.multiplier is None:
                    return None
                w += p.multiplier
        return w

    @property
    def has_unknown(self) -> bool:
        return any(p.multiplier is None for p in self.parts)

    @property
    def has_inner_round_group_counted_once(self) -> bool:
        """A part holds, beside other items or inside its one bracketed group, a
        round group counted once ('K(SO4Na)', '((ClNa))')."""
        for p in self.parts:
            items = p.items
            if (
                len(items) == 1
                and isinstance(items[0], MGroup)
                and items[0].bracket == "("
                and items[0].count == 1
            ):
                items = items[0].items
            if any(isinstance(i, MGroup) and i.bracket == "(" and i.count == 1 for i in items):
                return True
        return False


# ---------------------------------------------------------------------------
# Strategies: a model and one of the texts that write it
# ---------------------------------------------------------------------------

symbols = st.sampled_from(SYMBOLS)
counts = st.one_of(st.integers(2, 12), st.integers(13, 120))


@st.composite
def count_text(draw, n: int, unicode: bool) -> str:
    """The text of a count n (n == 1 may be written or not)."""
    if n == 1:
        text = draw(st.sampled_from(["", "", "", "1"]))
    else:
        text = str(n)
    return text.translate(SUB) if unicode else text


# A round group of I and V atoms with no count after it is a Stock number
# ('Fe(III)', 'Mn (IV)'), which is rightly refused after a symbol.
STOCK_LIKE = re.compile(r"I{1,3}|IV|VI{0,3}|IX|X")


@st.composite
def item(draw, depth: int, unicode: bool):
    """(model item, text).

    A group whose text inside the brackets spells a Roman numeral ('(III)')
    and that has no count written after it gets square brackets: in round
    brackets after a symbol it is refused as a Stock number.
    """
    if depth >= 3 or draw(st.integers(0, 3)) > 0:
        sym = draw(symbols)
        n = draw(st.one_of(st.just(1), counts))
        return MAtom(sym, n), sym + draw(count_text(n, unicode))
    bracket = draw(st.sampled_from("(["))
    inner = draw(items(depth + 1, unicode, max_size=3))
    n = draw(st.one_of(st.just(1), counts))
    written_count = draw(count_text(n, unicode))
    if not written_count and STOCK_LIKE.fullmatch("".join(t for _, t in inner)):
        bracket = "["
    close = ")" if bracket == "(" else "]"
    text = bracket + "".join(t for _, t in inner) + close + written_count
    return MGroup(bracket, tuple(m for m, _ in inner), n), text


@st.composite
def items(draw, depth: int, unicode: bool, max_size: int = 4):
    drawn = draw(st.lists(item(depth, unicode), min_size=1, max_size=max_size))
    out = []
    for i, (m, t) in enumerate(drawn):
        # a space may stand before any item but the first
        if i and draw(st.integers(0, 5)) == 0:
            t = " " + t
        out.append((m, t))
    return out


@st.composite
def multiplier(draw) -> tuple[Fraction | None, str]:
    """A hydrate multiplier and how it is written."""
    kind = draw(st.sampled_from(["int", "int", "int", "decimal", "fraction", "half", "unknown"]))
    if kind == "int":
        n = draw(st.integers(1, 30))
        return Fraction(n), str(n)
    if kind == "decimal":
        # up to eight decimal places: the canonical text keeps them all
        whole = draw(st.integers(0, 20))
        places = draw(st.integers(1, 8))
        frac = draw(st.integers(1, 10**places - 1))
        text = f"{whole}.{frac:0{places}d}".rstrip("0")
        if whole == 0 and draw(st.booleans()):
            text = text[1:]  # '.5'
        return Fraction(text if not text.startswith(".") else "0" + text), text
    if kind == "fraction":
        # denominators up to 1024: terminating ones give up to ten decimal places
        den = draw(st.one_of(st.integers(2, 100), st.sampled_from([128, 256, 512, 1024, 625, 3125])))
        num = draw(st.integers(1, 4 * den))
        return Fraction(num, den), f"{num}/{den}"
    if kind == "half":
        return Fraction(1, 2), "½"
    return None, draw(st.sampled_from("xny"))


@st.composite
def formula(draw, charged: bool = True, unicode: bool | None = None):
    """(model, text) of a formula whose charge, if any, is written explicitly.

    The full stop is not used as the dot where it would be read otherwise, as
    the parser rightly does: after a written count of 1 ('TiO1.8' is a decimal
    count), before a multiplier starting with '.' ('..5' is a typo), and
    between digits before a part that is a lone atom ('Fe2.5O' is a decimal
    count). Those inputs are refusals, tested in test_formula.py.
    """
    if unicode is None:
        unicode = draw(st.booleans())
    first = draw(items(0, unicode))
    parts = []
    text = ""
    first_mult = Fraction(1)
    if draw(st.integers(0, 7)) == 0:
        k = draw(st.integers(2, 9))
        first_mult = Fraction(k)
        text = str(k) + draw(st.sampled_from(["", " "]))
    text += "".join(t for _, t in first)
    parts.append(MPart(tuple(m for m, _ in first), first_mult))
    for _ in range(draw(st.integers(0, 3))):
        mult, mult_text = draw(multiplier())
        if draw(st.booleans()):
            body = [(MAtom("H", 2), "H₂" if unicode else "H2"), (MAtom("O", 1), "O")]
        else:
            body = draw(items(1, unicode, max_size=3))
        dot = draw(st.sampled_from(DOTS))
        space = draw(st.sampled_from(["", "", " "]))
        if mult == 1 and mult_text == "1" and draw(st.booleans()):
            mult_text = ""
        part = MPart(tuple(m for m, _ in body), mult)
        if dot == "." and _full_stop_is_not_a_dot(text + space, space + mult_text, part):
            dot = "·"
        text += (
            space
            + dot
            + space
            + mult_text
            + draw(st.sampled_from(["", "", " "]))
            + "".join(t for _, t in body)
        )
        parts.append(part)
    charge = 0
    if charged and draw(st.booleans()):
        q = draw(st.integers(1, 12))
        sign = draw(st.sampled_from("+-"))
        charge = q if sign == "+" else -q
        forms = [f"^{q}{sign}", f"^{sign}{q}", f" ^ {q}{sign}"]
        if q <= 3:
            forms.append("^" + sign * q)
        if unicode:
            forms.append((str(q) if q > 1 else "") + sign)
            forms[-1] = forms[-1].translate(SUP)
        text += draw(st.sampled_from(forms))
    return Model(tuple(parts), charge), text


_PLAIN_DIGITS = {ord(s): str(i) for i, s in enumerate("₀₁₂₃₄₅₆₇₈₉")}


def _ends_with_count_one(text: str) -> bool:
    digits = ""
    for ch in reversed(text.translate(_PLAIN_DIGITS)):
        if not ch.isdigit():
            break
        digits = ch + digits
    return digits == "1"


def _full_stop_is_not_a_dot(before: str, after: str, part: MPart) -> bool:
    """Whether a '.' between the text ``before`` and the text ``after`` (the
    spaces and multiplier of the next part, which is ``part``) is read as
    something other than a hydrate dot, by the rules of docs/grammar.md
    (sections 3 and 5)."""
    before = before.translate(_PLAIN_DIGITS)
    if after.lstrip().startswith(".") or _ends_with_count_one(before):
        return True  # two dots together; a count of 1 before the '.'
    between_digits = before[-1:].isdigit() and after[:1].isdigit()
    return between_digits and part.is_lone_atom  # a decimal count


# ---------------------------------------------------------------------------
# (a) round trip
# ---------------------------------------------------------------------------


@FAST
@given(formula())
def test_round_trip(model_and_text):
    """Reading a generated text gives the modelled formula, and its canonical
    text stands for the same formula.

    The invariant is not ``parse(str(f)) == f``: the canonical text drops the
    brackets of round groups counted once and moves cations first, so the
    parts of ``g = parse(str(f))`` may be arranged differently from ``f``'s.
    What the canonical text must keep is what the formula means: the element
    counts, the charge, the water, the unknown-count flag and the number of
    parts. And it must be a fixed point: ``str(g) == str(f)``, so reading and
    writing again changes nothing (``parse(str(g)) == g`` follows). The ASCII
    and pretty texts must read back as exactly ``g``.
    """
    model, text = model_and_text
    f = parse_formula(text)
    # the text means what the model says
    assert f.counts == model.counts()
    assert f.charge == model.charge
    assert f.water == model.water()
    assert f.has_unknown_count is model.has_unknown
    assert len(f.parts) == len(model.parts)

    canonical = str(f)
    g = parse_formula(canonical)
    assert g.counts == f.counts
    assert g.charge == f.charge
    assert g.has_unknown_count is f.has_unknown_count
    assert len(g.parts) == len(f.parts)
    if not any(p.reads_as_water_only_in_canonical_text for p in model.parts[1:]):
        assert g.water == f.water
    if model.has_inner_round_group_counted_once:
        # a known fault (test_canonical_text_of_inner_group_is_a_fixed_point in
        # test_formula.py): the cations of such a group are not put first until
        # its brackets are gone, so the fixed point is reached one pass later
        h = parse_formula(str(g))
        assert str(parse_formula(str(h))) == str(h)
        assert (h.counts, h.charge) == (f.counts, f.charge)
    else:
        assert str(g) == canonical

    if not _ascii_joins_lone_atom(canonical):
        assert parse_formula(f.text(ascii=True)) == g
    assert parse_formula(f.pretty()) == g
    assert f.text(ascii=True) == canonical.replace("·", ".")


def _ascii_joins_lone_atom(canonical: str) -> bool:
    """Whether the ASCII text of ``canonical`` has a '.' between digits before
    a lone-atom part, which the parser reads as a decimal count (a known
    fault of text(ascii=True), see test_ascii_text_reads_back)."""
    body = canonical.split("^")[0]
    pieces = body.split("·")
    return any(
        prev[-1:].isdigit() and re.fullmatch(r"[\d./]+[A-Z][a-z]?\d*", piece)
        for prev, piece in itertools.pairwise(pieces)
    )


def _subscript_counts(text: str) -> str:
    return re.sub(r"(?<=[A-Za-z\)\]])\d+", lambda m: m.group().translate(SUB), text)


def _fullwidth(text: str) -> str:
    return "".join(chr(ord(c) + 0xFEE0) if "!" <= c <= "~" else c for c in text)


@FAST
@given(
    formula(unicode=False),
    st.lists(st.integers(0, 80), max_size=4),
    st.sampled_from(["\u200b", "\ufeff", "\u00ad", "\u2060"]),
)
def test_pasted_unicode_does_not_change_the_reading(model_and_text, where, invisible):
    """The pasted forms of a text (subscript counts, fullwidth characters,
    no-break spaces, zero-width characters anywhere) read as the text itself."""
    _, text = model_and_text
    plain = parse_formula(text)
    assert parse_formula(_subscript_counts(text)) == plain
    assert parse_formula(_fullwidth(text)) == plain
    assert parse_formula(text.replace(" ", "\u00a0")) == plain
    spotted = text
    for at in sorted(where, reverse=True):
        at = at % (len(spotted) + 1)
        spotted = spotted[:at] + invisible + spotted[at:]
    assert parse_formula(spotted) == plain


# ---------------------------------------------------------------------------
# (b) any text: a formula or a CellchemError, nothing else
# ---------------------------------------------------------------------------

FORMULA_CHARS = (
    "HONaClCuSFeKCaMgAlPBrIZnxny"  # symbols and unknown multipliers
    "HOCUSNACL"  # capitals (wrong-case and all-capital inputs)
    "0123456789"
    "₀₁₂₃₄₅₆₇₈₉⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻"
    "()[]{}"
    "·•∙⋅×*./½^+-−–"
    " \u00a0\u200b\ufeff\t"
    "ＮａＣｌ２（）"
    ",;:!?é"
)


def _check_any_text(text: str) -> None:
    try:
        f = parse_formula(text)
    except CellchemError as err:
        assert isinstance(err, ValueError)
        assert len(err.message.splitlines()) == 1  # one line, even for an input with line breaks
        assert err.position is None or 1 <= err.position <= len(text)
        return
    # anything accepted renders, and its canonical text is accepted too
    canonical = str(f)
    f.pretty()
    f.text(ascii=True)
    assert f.counts is not None
    _ = f.water
    g = parse_formula(canonical)
    assert g.counts == f.counts
    assert g.charge == f.charge
    # the fixed point may take a second pass (a known fault, see test_round_trip)
    h = parse_formula(str(g))
    assert str(parse_formula(str(h))) == str(h)


@FAST
@given(st.text(max_size=60))
def test_arbitrary_text_gives_formula_or_cellchem_error(text):
    _check_any_text(text)


@FAST
@given(st.text(alphabet=FORMULA_CHARS, max_size=30))
def test_formula_like_text_gives_formula_or_cellchem_error(text):
    _check_any_text(text)


@FAST
@given(formula(), st.integers(0, 40), st.sampled_from(FORMULA_CHARS))
def test_one_character_changed_gives_formula_or_cellchem_error(model_and_text, at, ch):
    # near-misses of valid formulas: the inputs most like real typing errors
    _, text = model_and_text
    at = at % (len(text) + 1)
    _check_any_text(text[:at] + ch + text[at + 1 :])
    _check_any_text(text[:at] + ch + text[at:])


# ---------------------------------------------------------------------------
# (c) counts are additive over hydrate and adduct parts
# ---------------------------------------------------------------------------


@FAST
@given(
    formula(charged=False, unicode=False), items(1, False, max_size=3), multiplier(), st.sampled_from(DOTS)
)
def test_counts_are_additive(a, b_items, mult, dot):
    """counts(A·nB) == counts(A) + n·counts(B); with n unknown, counts(A) and
    the unknown flag set. The full stop is replaced where it would not be read
    as a dot, as in formula()."""
    _, a_text = a
    b_text = "".join(t for _, t in b_items).lstrip()
    n, n_text = mult
    if dot == "." and _full_stop_is_not_a_dot(a_text, n_text, MPart(tuple(m for m, _ in b_items), n)):
        dot = "·"  # the '.' would not be a dot here (see formula())
    whole = parse_formula(f"{a_text}{dot}{n_text}{b_text}")
    a_counts = parse_formula(a_text).counts
    b_counts = parse_formula(b_text).counts
    if n is None:
        assert whole.counts == a_counts
        assert whole.has_unknown_count
    else:
        assert whole.counts == add(a_counts, scale(b_counts, n))
        assert len(whole.parts) == len(parse_formula(a_text).parts) + 1


@FAST
@given(formula(charged=False, unicode=False), st.integers(1, 30))
def test_water_is_additive(a, n):
    """(A·nH2O).water == A.water + n, and its counts add n H2O."""
    model, a_text = a
    w = model.water()
    whole = parse_formula(f"{a_text}·{n}H2O")
    if w is None:
        assert whole.water is None
    else:
        assert whole.water == w + n
    if not model.has_unknown:
        assert whole.counts == add(model.counts(), {"H": Fraction(2 * n), "O": Fraction(n)})
    assert whole.anhydrous().water == 0
    assert str(whole.with_water(n).anhydrous()) == str(whole.anhydrous())


# ---------------------------------------------------------------------------
# Charges: explicit forms agree; a lone sign gives one of its two readings
# ---------------------------------------------------------------------------


@FAST
@given(formula(charged=False, unicode=False), st.integers(1, 12), st.sampled_from("+-"))
def test_explicit_charge_forms_agree(a, q, sign):
    """Every explicit way of writing a charge gives the same formula."""
    _, body = a
    forms = [
        f"{body}^{q}{sign}",
        f"{body}^{sign}{q}",
        f"{body} {q}{sign}",
        f"{body} {sign}{q}",
        f"{body}({q}{sign})",
        f"{body} ({sign}{q})",
        f"{body}{sign}{q}",
        body + (str(q) if q > 1 else "").translate(SUP) + sign.translate(SUP),
    ]
    if q > 1:
        forms.append(body + sign * q)
    read = [parse_formula(t) for t in forms]
    assert all(r == read[0] for r in read)
    assert read[0].charge == (q if sign == "+" else -q)


# Counts before a lone sign whose digits before the last are '1' (11 to 19):
# both readings are plausible ('Fe13+': Fe13 1+ or Fe 3+), so they are refused
# whatever the catalog says; test_lone_sign_after_leading_one_is_refused.
lone_sign_counts = st.integers(2, 129).filter(lambda n: n % 10 != 0 and str(n)[:-1] != "1")
leading_one_counts = st.integers(11, 19)


def _meaning(f) -> tuple:
    return (f.counts, f.charge)


@FAST
@given(items(0, False, max_size=3), symbols, lone_sign_counts, st.sampled_from("+-"))
def test_lone_sign_after_count_is_one_reading_or_refused(head, last_symbol, n, sign):
    """'<body>E<n><sign>': the digits are all count, or the last digit is the
    charge; the formula is one of those two readings, or it is refused with
    exactly those two as its choices.

    The counts exclude those ending in 0 (only the count reading exists) and
    11 to 19 (always refused, see test_lone_sign_after_leading_one_is_refused).
    """
    body = "".join(t for _, t in head).lstrip()
    count_reading = f"{body}{last_symbol}{n}^{sign}"
    rest = str(n)[:-1]
    charge_reading = f"{body}{last_symbol}{rest}^{str(n)[-1]}{sign}"
    expected = (parse_formula(count_reading), parse_formula(charge_reading))
    try:
        f = parse_formula(f"{body}{last_symbol}{n}{sign}")
    except FormulaError as err:
        assert "is ambiguous" in err.message
        assert len(err.choices) == 2
        # the choices are written canonically (round brackets of a group counted
        # once dropped), so they are compared by what they mean
        assert tuple(_meaning(parse_formula(c)) for c in err.choices) == tuple(_meaning(e) for e in expected)
        return
    assert f in expected


@FAST
@given(items(0, False, max_size=3), st.sampled_from("(["), lone_sign_counts, st.sampled_from("+-"))
def test_lone_sign_after_group_is_one_reading_or_refused(head, bracket, n, sign):
    """'<body>(G)<n><sign>' and '[G]<n><sign>': as for an element, the group
    count is all count or its last digit is the charge, or it is refused with
    those two readings as choices (counts as in the test above)."""
    group = "".join(t for _, t in head).lstrip()
    close = ")" if bracket == "(" else "]"
    body = f"{bracket}{group}{close}"
    expected = (
        _meaning(parse_formula(f"{body}{n}^{sign}")),
        _meaning(parse_formula(f"{body}{str(n)[:-1]}^{str(n)[-1]}{sign}")),
    )
    try:
        f = parse_formula(f"{body}{n}{sign}")
    except FormulaError as err:
        assert "is ambiguous" in err.message
        assert tuple(_meaning(parse_formula(c)) for c in err.choices) == expected
        return
    assert _meaning(f) in expected


@FAST
@given(
    items(0, False, max_size=3),
    st.one_of(symbols, st.sampled_from(["()", "[]"])),
    leading_one_counts,
    st.sampled_from("+-"),
)
def test_lone_sign_after_leading_one_is_refused(head, last, n, sign):
    """'<body>E<n><sign>', '<body>(G)<n><sign>' and '[G]<n><sign>' with n from
    11 to 19: always refused as ambiguous (the count may be n, or 1 with the
    charge n - 10), and each choice it offers is one of those two readings."""
    inner = "".join(t for _, t in head).lstrip()
    body = f"{last[0]}{inner}{last[1]}" if last in ("()", "[]") else inner + last
    readings = (
        _meaning(parse_formula(f"{body}{n}^{sign}")),
        _meaning(parse_formula(f"{body}1^{n - 10}{sign}")),
    )
    with pytest.raises(FormulaError) as info:
        parse_formula(f"{body}{n}{sign}")
    err = info.value
    assert "is ambiguous: the digits before its sign may be a count or a charge" in err.message
    assert err.choices
    assert all(_meaning(parse_formula(c)) in readings for c in err.choices)


@pytest.mark.parametrize("text", ["O2-", "N3-", "Cl2-"])  # rows of the ambiguity rule, see test_formula.py
def test_refused_lone_sign_choices_are_accepted(text):
    # rule: each of the choices a refusal offers is itself read without refusal
    with pytest.raises(FormulaError) as info:
        parse_formula(text)
    for choice in info.value.choices:
        assert parse_formula(choice).charge != 0
