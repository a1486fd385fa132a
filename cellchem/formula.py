"""The formula notation: formulas as inventories and supplier sheets write them.

The accepted notation is written down, with examples that run as tests, in
``docs/grammar.md``. In short: case-sensitive element symbols with counts,
nested groups in ``()`` and ``[]``, hydrate and adduct parts joined by ``·``,
``•``, ``∙``, ``⋅``, ``×``, ``*`` or ``.`` with a leading multiplier (which may
be a decimal, a fraction such as ``1/2`` or ``½``, or ``x``/``n`` for an
unknown count), and an ion charge at the end (``SO4^2-``, ``SO4 2-``,
``SO4--``, ``Fe+3``, ``NH4+``, ``SO4(2-)``, ``SO₄²⁻``).

The grammar (pyparsing) only recognises symbol-shaped tokens; looking a symbol
up in the element table is a separate step, so that a message can say
"unknown element symbol 'Xx'" rather than "Expected ...".

This module knows the notation and the element table only: ``read_notation``
gives a formula as written, with a sign right after a count ('NH4+' against
'Fe3+') left as a ``LoneSign`` for the ion catalog to settle. The reader to
call is ``cellchem.reading.parse_formula``, which settles the sign
(``cellchem.ions.settle``) and sets the cations-first order of the canonical
text (``Formula.order``) with the charge solver.
"""

from __future__ import annotations

import math
import re
import unicodedata
from collections.abc import Callable
from dataclasses import dataclass, field
from fractions import Fraction
from functools import cache, cached_property
from itertools import product

import pyparsing as pp

from .elements import is_symbol, symbols
from .errors import FormulaError

Number = int | Fraction

MAX_LENGTH = 300  # characters; a formula cell longer than this is refused
MAX_DEPTH = 8  # bracket nesting
MAX_COUNT = 100_000  # largest count or multiplier accepted
MAX_CHARGE = 12

HYDRATE_DOTS = "·•∙⋅×*."
CANONICAL_DOT = "·"


# ---------------------------------------------------------------------------
# The value
# ---------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class Atom:
    """An element symbol with its count, e.g. ``O4`` in ``SO4``."""

    symbol: str
    count: int = 1

    def counts(self) -> dict[str, Number]:
        return {self.symbol: self.count}


@dataclass(frozen=True, slots=True)
class Group:
    """A bracketed group with its count, e.g. ``(NO3)2`` or ``[Fe(CN)6]``.

    ``bracket`` is ``"("`` or ``"["``: square brackets mark a coordination
    entity and are kept in the canonical text even when the count is 1.
    """

    items: tuple[Atom | Group, ...]
    count: int = 1
    bracket: str = "("

    def counts(self) -> dict[str, Number]:
        return _scaled(_sum_counts(self.items), self.count)


Item = Atom | Group


@dataclass(frozen=True, slots=True)
class Part:
    """One component of a formula: the salt itself, or a hydrate/adduct part
    after a dot. ``multiplier`` is None when the count is unknown (``xH2O``)."""

    items: tuple[Item, ...]
    multiplier: Number | None = 1

    @property
    def is_water(self) -> bool:
        return self.items == (Atom("H", 2), Atom("O", 1))

    def counts(self) -> dict[str, Number]:
        """Element counts of this part including its multiplier (callers check
        ``multiplier is None`` first: an unknown count gives no atoms)."""
        return _scaled(_sum_counts(self.items), self.multiplier or 0)


@dataclass(frozen=True)
class Formula:
    """A parsed formula: the parts as written, and the charge.

    ``str()`` gives the canonical text: cations first, a polyatomic ion in
    parentheses only when counted more than once, coordination entities in
    square brackets, hydrate water after ``·``, a charge as ``^2-``.
    ``text(ascii=True)`` writes ``.`` instead of ``·``; ``pretty()`` writes
    Unicode subscripts and superscripts for labels.

    Attributes:
        parts: the salt and its hydrate or adduct parts, in order.
        charge: the net charge written in the formula (0 if none).
        source: the text the formula was read from.
        order: the parts as the canonical text writes them (cations first:
            CH3COONa is written NaCH3COO), where that differs from ``parts``;
            set by the reader (``cellchem.reading``), which knows the ions.
            Empty: the text writes the parts as they are.
    """

    parts: tuple[Part, ...]
    charge: int = 0
    source: str = field(default="", compare=False)
    order: tuple[Part, ...] = field(default=(), compare=False, repr=False)

    # -- composition ------------------------------------------------------
    @property
    def has_unknown_count(self) -> bool:
        """True when a part has an unknown multiplier (``Na2CO3·xH2O``)."""
        return any(part.multiplier is None for part in self.parts)

    @cached_property
    def counts(self) -> dict[str, Number]:
        """Element counts over the parts whose count is known, in order of
        first appearance. Use ``has_unknown_count`` to know whether any part
        was left out."""
        total: dict[str, Number] = {}
        for part in self.parts:
            if part.multiplier is None:
                continue
            for symbol, n in part.counts().items():
                total[symbol] = _norm(total.get(symbol, 0) + n)
        return total

    @property
    def water(self) -> Number | None:
        """Water of crystallisation per formula unit: the summed multipliers of
        the ``H2O`` parts after the first part; 0 for none; None if unknown."""
        total: Number = 0
        for part in self.parts[1:]:
            if part.is_water:
                if part.multiplier is None:
                    return None
                total = _norm(total + part.multiplier)
        return total

    @property
    def is_hydrate(self) -> bool:
        return any(part.is_water for part in self.parts[1:])

    def anhydrous(self) -> Formula:
        """The formula without its water of crystallisation."""
        kept = [0] + [i for i, p in enumerate(self.parts[1:], 1) if not p.is_water]
        order = tuple(self.order[i] for i in kept) if self.order else ()
        return Formula(tuple(self.parts[i] for i in kept), self.charge, self.source, order)

    def with_water(self, n: Number | None) -> Formula:
        """The same salt with ``n`` waters of crystallisation (0 for anhydrous,
        None for an unknown count)."""
        base = self.anhydrous()
        if n == 0:
            return base
        if n is not None:
            if isinstance(n, float) and not math.isfinite(n):
                raise FormulaError(f"a water count of {n} is not a number of waters")
            value = Fraction(str(n)) if isinstance(n, float) else Fraction(n)
            if value <= 0 or value > MAX_COUNT:
                raise FormulaError(
                    f"a water count of {n} is out of range (expected 0, or a number above 0 and up to"
                    f" {MAX_COUNT:,})"
                )
            n = _norm(value)
        water = Part((Atom("H", 2), Atom("O", 1)), n)
        order = base.order + (water,) if base.order else ()
        return Formula(base.parts + (water,), self.charge, self.source, order)

    # -- text -------------------------------------------------------------
    def text(self, ascii: bool = False) -> str:
        """Canonical text; ``ascii=True`` writes ``.`` for the hydrate dot."""
        dot = "." if ascii else CANONICAL_DOT
        return dot.join(_render_part(p) for p in self._ordered_parts) + (_render_charge(self.charge))

    def pretty(self) -> str:
        """Text for a label: Unicode subscript counts and superscript charge
        (``CuSO₄·5H₂O``, ``SO₄²⁻``)."""
        body = CANONICAL_DOT.join(_subscript_counts(_render_part(p)) for p in self._ordered_parts)
        if self.charge:
            magnitude = "" if abs(self.charge) == 1 else str(abs(self.charge))
            sign = "+" if self.charge > 0 else "-"
            body += (magnitude + sign).translate(_TO_SUPERSCRIPT)
        return body

    def __str__(self) -> str:
        return self.text()

    def __repr__(self) -> str:
        return f"Formula({self.text()!r})"

    @cached_property
    def _ordered_parts(self) -> tuple[Part, ...]:
        if self.order or ORDER_PARTS is None:
            return self.order or self.parts
        return ORDER_PARTS(self) or self.parts


# The cations-first order of a formula's parts, for its canonical text. It needs the ion
# catalog and the charge solver, which sit above this module, so ``cellchem.reading`` sets it
# when it is imported (as ``import cellchem`` does); it is computed on first printing, not on
# every parse.
ORDER_PARTS: Callable[[Formula], tuple[Part, ...]] | None = None


def _norm(value: Number) -> Number:
    if isinstance(value, Fraction) and value.denominator == 1:
        return int(value)
    return value


def _sum_counts(items: tuple[Item, ...]) -> dict[str, Number]:
    total: dict[str, Number] = {}
    for item in items:
        for symbol, n in item.counts().items():
            total[symbol] = total.get(symbol, 0) + n
    return total


def _scaled(counts: dict[str, Number], factor: Number) -> dict[str, Number]:
    if factor == 1:
        return counts
    if type(factor) is int:
        return {symbol: n * factor if type(n) is int else _norm(n * factor) for symbol, n in counts.items()}
    return {symbol: _norm(n * factor) for symbol, n in counts.items()}


# ---------------------------------------------------------------------------
# Rendering
# ---------------------------------------------------------------------------


def _render_number(n: Number) -> str:
    if isinstance(n, Fraction):
        # Exact decimal text when it terminates (0.5, 0.0078125), else a fraction.
        d = n.denominator
        twos = fives = 0
        while d % 2 == 0:
            d //= 2
            twos += 1
        while d % 5 == 0:
            d //= 5
            fives += 1
        if d == 1:
            places = max(twos, fives)
            scaled = n.numerator * 10**places // n.denominator
            whole, frac = divmod(scaled, 10**places)
            return f"{whole}.{frac:0{places}d}".rstrip("0").rstrip(".")
        return f"{n.numerator}/{n.denominator}"
    return str(n)


def render_items(items: tuple[Item, ...], in_brackets: bool = False) -> str:
    """Canonical text of a run of items (no multiplier, no charge). Inside a
    coordination entity a polyatomic ligand keeps its parentheses even when
    there is one of it ([Fe(CN)5(NO)], IUPAC 2005 IR-9.2.3.2)."""
    out = []
    for item in items:
        if isinstance(item, Atom):
            out.append(item.symbol + (str(item.count) if item.count != 1 else ""))
        elif item.bracket == "[":
            inner = render_items(item.items, True)
            out.append("[" + inner + "]" + (str(item.count) if item.count != 1 else ""))
        elif item.count == 1 and not in_brackets:
            out.append(render_items(item.items))
        else:
            count = str(item.count) if item.count != 1 else ""
            out.append("(" + render_items(item.items, in_brackets) + ")" + count)
    return "".join(out)


def _render_part(part: Part) -> str:
    if part.multiplier is None:
        prefix = "x"
    elif part.multiplier == 1:
        prefix = ""
    else:
        prefix = _render_number(part.multiplier)
    return prefix + render_items(part.items)


def _render_charge(charge: int) -> str:
    if not charge:
        return ""
    magnitude = "" if abs(charge) == 1 else str(abs(charge))
    return "^" + magnitude + ("+" if charge > 0 else "-")


_TO_SUBSCRIPT = str.maketrans("0123456789", "₀₁₂₃₄₅₆₇₈₉")
_TO_SUPERSCRIPT = str.maketrans("0123456789+-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻")


def _subscript_counts(text: str) -> str:
    # Digits right after a symbol or a closing bracket are counts; a leading
    # number (the multiplier) stays on the line.
    return re.sub(r"(?<=[A-Za-z\)\]])\d+", lambda m: m.group().translate(_TO_SUBSCRIPT), text)


# ---------------------------------------------------------------------------
# Normalising pasted text
# ---------------------------------------------------------------------------

_SUBSCRIPTS = dict(zip("₀₁₂₃₄₅₆₇₈₉", "0123456789"))
_SUPERSCRIPTS = dict(zip("⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻", "0123456789+-"))
_MINUS_SIGNS = "−–—‐‑‒﹣－"
_ZERO_WIDTH = "\u200b\u200c\u200d\u2060\ufeff\u00ad"


def _normalise(text: str) -> tuple[str, list[int]]:
    """Map pasted Unicode to the ASCII notation the grammar reads.

    Returns the normalised text and, for each of its characters, the 0-based
    index of the character of ``text`` it came from (for error positions).
    Subscript digits become counts; a run of superscript digits and signs
    becomes a charge written with ``^``; minus signs and dashes become ``-``;
    every kind of space becomes a plain space; zero-width characters go.
    """
    out: list[str] = []
    where: list[int] = []
    in_superscript = False
    for i, ch in enumerate(text):
        if ch in _ZERO_WIDTH:
            continue
        if ch in _SUPERSCRIPTS:
            if not in_superscript:
                out.append("^")
                where.append(i)
                in_superscript = True
            out.append(_SUPERSCRIPTS[ch])
            where.append(i)
            continue
        in_superscript = False
        if ch in _SUBSCRIPTS:
            mapped = _SUBSCRIPTS[ch]
        elif ch in _MINUS_SIGNS:
            mapped = "-"
        elif ch == "＋":
            mapped = "+"
        elif ch.isspace():
            mapped = " "
        elif "\uff01" <= ch <= "\uff5e":  # fullwidth forms pasted from East Asian fonts
            mapped = unicodedata.normalize("NFKC", ch)
        else:
            mapped = ch
        out.append(mapped)
        where.append(i)
    return "".join(out), where


# ---------------------------------------------------------------------------
# The grammar
# ---------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class _Symbol:
    text: str
    loc: int


@dataclass(frozen=True, slots=True)
class _Charge:
    value: int
    attached_sign: bool  # a lone sign written right after a count: 'NH4+', 'Fe3+'


_NO_CHARGE = _Charge(0, False)


def _charge_value(text: str) -> int:
    """'2-' -> -2, '+3' -> 3, '--' -> -2, '+' -> 1."""
    digits = "".join(c for c in text if c.isdigit())
    signs = [c for c in text if c in "+-"]
    if len(set(signs)) != 1:
        raise pp.ParseException(text, 0, "a charge with one kind of sign")
    sign = 1 if signs[0] == "+" else -1
    if digits:
        if len(signs) != 1:
            raise pp.ParseException(text, 0, "a charge such as 2- or --, not both")
        return sign * int(digits)
    return sign * len(signs)


@cache
def _grammar() -> pp.ParserElement:
    count = pp.Regex(r"\d+").leave_whitespace().set_name("count")
    # a count with a leading zero ("03") is read as 0, which is refused
    count.set_parse_action(lambda t: 0 if t[0].startswith("0") else int(t[0]))
    symbol = pp.Regex(r"[A-Z][a-z]?").set_name("element symbol")
    symbol.set_parse_action(lambda s, loc, t: _Symbol(t[0], loc))
    atom = (symbol + pp.Opt(count, default=1)).set_name("element")
    atom.set_parse_action(lambda t: ("atom", t[0], t[1]))

    items = pp.Forward().set_name("formula")
    paren = (pp.Suppress("(") + pp.Group(items) + pp.Suppress(")") + pp.Opt(count, default=1)).set_name(
        "group in ()"
    )
    paren.set_parse_action(lambda t: ("group", "(", tuple(t[0]), t[1]))
    square = (pp.Suppress("[") + pp.Group(items) + pp.Suppress("]") + pp.Opt(count, default=1)).set_name(
        "group in []"
    )
    square.set_parse_action(lambda t: ("group", "[", tuple(t[0]), t[1]))
    items <<= pp.OneOrMore(atom | paren | square)

    multiplier = pp.Regex(r"\d+/\d+|\d+(?:\.\d+)?|\.\d+|½|[xny]").set_name("multiplier")
    part = (pp.Opt(multiplier, default="1") + pp.Group(items)).set_name("formula part")
    part.set_parse_action(lambda t: ("part", t[0], tuple(t[1])))
    dot = pp.one_of(list(HYDRATE_DOTS)).set_name("hydrate dot")

    sign_run = r"(?:\++|-+)"
    # Every charge form states its own leading space, so that 'SO4 2-' (a
    # spaced charge) and 'NH4+' (a sign right after a count) can be told apart.
    caret = pp.Regex(rf"\s*\^\s*(?:\d+[+-]|[+-]\d+|{sign_run})").leave_whitespace()
    caret.set_parse_action(lambda t: _Charge(_charge_value(t[0].strip()[1:]), False))
    bracketed = pp.Regex(r"\s*\(\s*(?:\d*[+-]|[+-]\d+)\s*\)").leave_whitespace()
    bracketed.set_parse_action(lambda t: _Charge(_charge_value(t[0].strip()[1:-1]), False))
    spaced = pp.Regex(rf"\s+(?:\d+[+-]|[+-]\d+|{sign_run})").leave_whitespace()
    spaced.set_parse_action(lambda t: _Charge(_charge_value(t[0].strip()), False))
    attached = pp.Regex(rf"[+-]\d+|{sign_run}").leave_whitespace()
    attached.set_parse_action(lambda t: _Charge(_charge_value(t[0]), len(t[0]) == 1))
    charge = pp.MatchFirst([caret, bracketed, spaced, attached]).leave_whitespace(recursive=False)
    charge.set_name("charge")

    # The repetition must not swallow the space before a spaced charge.
    dot.set_parse_action(lambda s, loc, t: ("dot", loc, t[0]))
    more_parts = pp.ZeroOrMore(dot + part).leave_whitespace(recursive=False)
    formula = part + more_parts + pp.Opt(charge) + pp.StringEnd()
    formula.set_name("formula")
    return formula


# ---------------------------------------------------------------------------
# Building the value, and the messages
# ---------------------------------------------------------------------------


def _multiplier_value(text: str) -> Number | None:
    if text in ("x", "n", "y"):
        return None
    if text == "½":
        return Fraction(1, 2)
    if "/" in text:
        num, den = text.split("/")
        if int(den) == 0:
            raise ValueError("zero denominator")
        return _norm(Fraction(int(num), int(den)))
    return _norm(Fraction(text))


class _Builder:
    """Turns the parse tree into Atom/Group/Part, checking symbols and counts."""

    def __init__(self, text: str, normal: str, where: list[int]):
        self.text = text
        self.normal = normal
        self.where = where

    def pos(self, loc: int) -> int:
        """1-based position in the original text of normalised index ``loc``."""
        if not self.where:
            return 1
        loc = min(max(loc, 0), len(self.where) - 1)
        return self.where[loc] + 1

    def item(self, node) -> Item:
        if node[0] == "atom":
            sym: _Symbol = node[1]
            if not is_symbol(sym.text):
                raise _unknown_symbol(self.text, sym.text, self.pos(sym.loc))
            return Atom(sym.text, self._count(node[2], sym))
        _, bracket, inner, n = node
        return Group(tuple(self.item(x) for x in inner), self._count(n, None), bracket)

    def _count(self, n: int, sym: _Symbol | None) -> int:
        if n == 0:
            where = f" after '{sym.text}' at position {self.pos(sym.loc)}" if sym else ""
            raise FormulaError(
                f"a count of 0{where} in '{self.text}' (counts are whole numbers from 1)",
                text=self.text,
                position=self.pos(sym.loc) if sym else None,
            )
        if n > MAX_COUNT:
            raise FormulaError(f"the count {n} in '{self.text}' is larger than {MAX_COUNT:,}", text=self.text)
        return n

    def part(self, node) -> Part:
        _, mult_text, items = node
        try:
            multiplier = _multiplier_value(mult_text)
        except (ValueError, ZeroDivisionError):
            raise FormulaError(
                f"the multiplier '{mult_text}' in '{self.text}' is not a number", text=self.text
            ) from None
        if multiplier is not None and (multiplier <= 0 or multiplier > MAX_COUNT):
            raise FormulaError(
                f"the multiplier '{mult_text}' in '{self.text}' is out of range"
                f" (expected a number above 0 and up to {MAX_COUNT:,})",
                text=self.text,
            )
        built = tuple(self.item(x) for x in items)
        if (
            len(built) == 1
            and isinstance(built[0], Group)
            and built[0].bracket == "("
            and built[0].count == 1
        ):
            built = built[0].items  # '5(H2O)' is 5 H2O
        return Part(built, multiplier)


def _unknown_symbol(text: str, sym: str, position: int) -> FormulaError:
    readings = case_readings(text)
    hint = ""
    if readings:
        hint = "; element symbols are case-sensitive: did you mean " + _or_list(readings) + "?"
    return FormulaError(
        f"unknown element symbol '{sym}' at position {position} in '{text}'{hint}",
        text=text,
        position=position,
        choices=readings,
    )


def _or_list(readings: tuple[str, ...]) -> str:
    quoted = [f"'{r}'" for r in readings]
    if len(quoted) == 1:
        return quoted[0]
    return ", ".join(quoted[:-1]) + " or " + quoted[-1]


_OPEN = {"(": ")", "[": "]"}
_CLOSE = {")": "(", "]": "["}


def _check_brackets(text: str, normal: str, b: _Builder) -> None:
    stack: list[tuple[str, int]] = []
    for i, ch in enumerate(normal):
        if ch in _OPEN:
            # '(2-)' at the end is a charge, not a group
            if ch == "(" and re.fullmatch(r"\(\s*(?:\d*[+-]|[+-]\d+)\s*\)\s*", normal[i:]):
                break
            stack.append((ch, i))
            if len(stack) > MAX_DEPTH:
                raise FormulaError(
                    f"'{text}' nests brackets more than {MAX_DEPTH} deep", text=text, position=b.pos(i)
                )
        elif ch in _CLOSE:
            if not stack:
                raise FormulaError(
                    f"the '{ch}' at position {b.pos(i)} of '{text}' has no matching '{_CLOSE[ch]}'",
                    text=text,
                    position=b.pos(i),
                )
            opener, at = stack.pop()
            if _OPEN[opener] != ch:
                raise FormulaError(
                    f"the '{opener}' at position {b.pos(at)} of '{text}' is closed by '{ch}'"
                    f" at position {b.pos(i)} (expected '{_OPEN[opener]}')",
                    text=text,
                    position=b.pos(i),
                )
            if i == at + 1:
                raise FormulaError(
                    f"the brackets at position {b.pos(at)} of '{text}' are empty",
                    text=text,
                    position=b.pos(at),
                )
    if stack:
        opener, at = stack[-1]
        raise FormulaError(
            f"the '{opener}' at position {b.pos(at)} of '{text}' is never closed"
            f" (expected '{_OPEN[opener]}')",
            text=text,
            position=b.pos(at),
        )


_ALLOWED = re.compile(r"[A-Za-z0-9()\[\]^+\-/ ½" + re.escape(HYDRATE_DOTS) + r"]")


def _syntax_error(text: str, normal: str, b: _Builder, exc: pp.ParseBaseException) -> FormulaError:
    # 1. characters that never belong in a formula
    for i, ch in enumerate(normal):
        if not _ALLOWED.match(ch):
            return FormulaError(
                f"unexpected character '{text[b.pos(i) - 1]}' at position {b.pos(i)} in '{text}'"
                " (expected element symbols, counts, brackets, a hydrate dot or a charge)",
                text=text,
                position=b.pos(i),
            )
    # 2. an unknown symbol-shaped token before the failure point
    for m in re.finditer(r"[A-Z][a-z]?", normal):
        if m.start() > exc.loc:
            break
        if not is_symbol(m.group()):
            return _unknown_symbol(text, m.group(), b.pos(m.start()))
    # 3. letters in the wrong case: a run of letters that is not a sequence of
    #    capitalised symbols (and not an 'x'/'n' multiplier before a symbol)
    for m in re.finditer(r"[A-Za-z]+", normal):
        run = m.group()
        if re.fullmatch(r"(?:[A-Z][a-z]?)+", run) or re.fullmatch(r"[xny](?:[A-Z][a-z]?)+", run):
            continue
        readings = case_readings(text)
        hint = "; did you mean " + _or_list(readings) + "?" if readings else ""
        return FormulaError(
            f"'{text}' is not a valid formula: element symbols are case-sensitive and start with"
            f" a capital letter ('{run}' at position {b.pos(m.start())}){hint}",
            text=text,
            position=b.pos(m.start()),
            choices=readings,
        )
    # 4. a dangling hydrate dot or multiplier
    stripped = normal.rstrip()
    if stripped and stripped[-1] in HYDRATE_DOTS:
        i = len(stripped) - 1
        return FormulaError(
            f"nothing follows the '{text[b.pos(i) - 1]}' at position {b.pos(i)} of '{text}'"
            " (expected a hydrate or adduct part, e.g. '5H2O')",
            text=text,
            position=b.pos(i),
        )
    m = re.search(r"(^|[" + re.escape(HYDRATE_DOTS) + r"]\s*)(\d+(?:\.\d+)?|[xny])\s*$", stripped)
    if m:
        i = m.start(2)
        return FormulaError(
            f"the multiplier '{m.group(2)}' at position {b.pos(i)} of '{text}' is not followed by a"
            " formula (expected e.g. '5H2O')",
            text=text,
            position=b.pos(i),
        )
    # 5. anything else: say where and what was expected
    loc = exc.loc
    found = normal[loc] if loc < len(normal) else ""
    if found == " ":
        found = "a space"
    elif found:
        found = f"'{text[b.pos(loc) - 1]}'"
    else:
        found = "the end"
    return FormulaError(
        f"'{text}' is not a valid formula: unexpected {found} at position {b.pos(loc)}"
        " (expected an element symbol, a count, a bracket, a hydrate dot or a charge at the end)",
        text=text,
        position=b.pos(loc),
    )


@dataclass(frozen=True)
class LoneSign:
    """A lone sign right after a count ('NH4+', 'Fe3+', 'O2-', '[Co(NH3)5Cl]2+'):
    the digits before the sign are the count in one reading, and the last digit
    is the charge in the other. The notation cannot say which is meant; the ion
    catalog settles it (``cellchem.ions.settle``).

    Attributes:
        text: the input.
        as_count: the reading with the digits as a count (NH4, charge +1).
        as_charge: the reading with the last digit as the charge (NH, charge +4).
        group: the digits follow a bracketed group ('[Co(NH3)5Cl]2+').
        lone_element: the symbol when the charge reading is one atom of one
            element with a positive charge ('Ti4+'), else ''.
        bodies: the two readings' formulas as written, without the charge
            (for the refusal's message).
    """

    text: str
    as_count: Formula
    as_charge: Formula
    group: bool
    lone_element: str
    bodies: tuple[str, str]

    def refusal(self, count_name: str | None = None, charge_name: str | None = None) -> FormulaError:
        """The refusal when the catalog does not settle the sign: both readings,
        with the catalog names of those that are ions, and how to write each."""
        body_a, body_b = self.bodies
        charge_a = _render_charge(self.as_count.charge)
        charge_b = _render_charge(self.as_charge.charge)
        name_a = f" ({count_name})" if count_name else ""
        name_b = f" ({charge_name})" if charge_name else ""
        words_a, words_b = _charge_words(self.as_count.charge), _charge_words(self.as_charge.charge)
        return FormulaError(
            f"'{self.text}' is ambiguous: it reads as {body_a} with charge {words_a}{name_a}"
            f" or as {body_b} with charge {words_b}{name_b};"
            f" write '{body_a}{charge_a}' or '{body_b}{charge_b}'",
            text=self.text,
            choices=(body_a + charge_a, body_b + charge_b),
        )


def _lone_sign(f: Formula, text: str) -> Formula | LoneSign:
    """A formula whose charge is a lone sign written right after a count: the
    formula itself where the notation fixes the reading (a count of 1 or one
    ending in 0 before the sign), a refusal where no reading would be safe
    (a hydrate, a multiplier, or digits such as '12' before the sign), else the
    two readings for the catalog to settle."""
    last_part = f.parts[-1]
    last = last_part.items[-1]
    digits = str(last.count)
    if last.count == 1 or digits[-1] == "0":
        return f
    if len(f.parts) > 1 or last_part.multiplier != 1 or digits[:-1] == "1":
        body = render_items(last_part.items)
        raise FormulaError(
            f"'{text}' is ambiguous: the digits before its sign may be a count or a charge;"
            " write the charge with '^' (for example 'Fe^3+') or with a space ('SO4 2-')",
            text=text,
            choices=(body + _render_charge(f.charge),),
        )
    new_count = int(digits[:-1]) if len(digits) > 1 else 1
    sign = 1 if f.charge > 0 else -1
    if isinstance(last, Group):
        moved: Item = Group(last.items, new_count, last.bracket)
    else:
        moved = Atom(last.symbol, new_count)
    as_charge = Formula((Part(last_part.items[:-1] + (moved,), 1),), sign * int(digits[-1]), text)
    lone = (
        last.symbol
        if isinstance(last, Atom) and len(f.counts) == 1 and new_count == 1 and f.charge > 0
        else ""
    )
    return LoneSign(
        text,
        _bracketed_water(f),
        _bracketed_water(as_charge),
        isinstance(last, Group),
        lone,
        (render_items(last_part.items), render_items(as_charge.parts[0].items)),
    )


def _charge_words(charge: int) -> str:
    return f"{abs(charge)}{'+' if charge > 0 else '-'}"


_DECIMAL_COUNT = re.compile(r"(?<![\d.])(?:1|0\d*)\.\d")


def too_long(text: str, what: str, limit: int) -> str | None:
    """The message refusing a text longer than ``limit`` characters, or None.
    It says how long the text is and how it begins, so that a user can find
    the cell (the formula and the name readers share it)."""
    if len(text) <= limit:
        return None
    return (
        f"the text beginning '{text[:20]}' is {len(text)} characters long, too long to be {what}"
        f" (at most {limit})"
    )


def check_text(text: object) -> str:
    """The text, if it may be a formula: refused when it is not text, or longer
    than ``MAX_LENGTH`` characters (before any reading, or any memory of one)."""
    if not isinstance(text, str):
        raise FormulaError(f"{text!r} is not a formula (expected text such as 'NaCl')", text=str(text))
    long = too_long(text, "a formula", MAX_LENGTH)
    if long:
        raise FormulaError(long, text=text[:MAX_LENGTH])
    return text


def read_notation(text: str) -> Formula | LoneSign:
    """A formula as written: the notation and the element table alone.

    Returns the Formula, or a ``LoneSign`` where a sign written right after a
    count ('NH4+', 'Fe3+') leaves the count and the charge for the ion catalog
    to tell apart. The canonical order of the text is not set here: call
    ``cellchem.reading.parse_formula``, which does both.

    Raises:
        CellchemError: (a FormulaError) the text is not a formula; the message
            quotes it, gives the position counted from 1 and says what was
            expected.

    >>> read_notation("CuSO₄ . 5 H₂O").text()
    'CuSO4·5H2O'
    >>> read_notation("NH4+").bodies
    ('NH4', 'NH')
    """
    check_text(text)
    fast = _fast_parse(text)
    if fast is not None:
        return _bracketed_water(fast)
    found = _parse_with_grammar(text)
    return found if isinstance(found, LoneSign) else _bracketed_water(found)


_SIMPLE = re.compile(r"([A-Z(\[][A-Za-z0-9()\[\]]*)(?:([·.])([1-9][0-9]{0,2})?([A-Z(][A-Za-z0-9()\[\]]*))?")


_STOCK_NUMBER = re.compile(r"(?<=[A-Za-z])\s*(\((?:I{1,3}|IV|VI{0,3}|IX|X)\))(?!\d)")
_SIMPLE_TOKEN = re.compile(r"([A-Z][a-z]?)([1-9][0-9]{0,4})?|([(\[])|([)\]])([1-9][0-9]{0,4})?")


def _simple_items(text: str) -> tuple[Item, ...] | None:
    """Atoms and bracketed groups with counts, or None for anything else."""
    known = symbols()
    stack: list[tuple[str, list[Item]]] = [("", [])]
    pos = 0
    for m in _SIMPLE_TOKEN.finditer(text):
        if m.start() != pos:
            return None
        pos = m.end()
        symbol, count, opening, closing, group_count = m.groups()
        if symbol:
            n = int(count) if count else 1
            if symbol not in known or n > MAX_COUNT:
                return None
            stack[-1][1].append(Atom(symbol, n))
        elif opening:
            if len(stack) > 2:
                return None  # deep nesting: the grammar decides (and bounds it)
            stack.append((opening, []))
        else:
            bracket, items = stack.pop() if len(stack) > 1 else ("", [])
            if not bracket or {"(": ")", "[": "]"}[bracket] != closing or not items:
                return None
            n = int(group_count) if group_count else 1
            if n > MAX_COUNT or (n == 1 and bracket == "("):
                return None  # a '(...)' without a count: the grammar decides how to read it
            stack[-1][1].append(Group(tuple(items), n, bracket))
    if pos != len(text) or len(stack) != 1 or not stack[0][1]:
        return None
    return tuple(stack[0][1])


def _fast_parse(text: str) -> Formula | None:
    """The common formulas (element symbols and bracketed groups with counts,
    and at most one hydrate or adduct part such as '·5H2O') read without the grammar;
    None for anything else, which the grammar then reads (or refuses). Gives
    exactly the Formula the grammar gives (a property test checks it)."""
    if len(text) > MAX_LENGTH or ("(" in text and _STOCK_NUMBER.search(text)):
        return None  # the grammar refuses a Stock number in a formula, with its message
    m = _SIMPLE.fullmatch(text)
    if m is None:
        return None
    first = _simple_items(m.group(1))
    if first is None:
        return None
    if m.group(2) is None:
        return Formula((Part(first, 1),), 0, text)
    second = _simple_items(m.group(4))
    if second is None or len(second) < 2 or not all(isinstance(i, Atom) for i in second):
        # a lone atom after '.' may be a decimal count, brackets after a dot are rare: the grammar decides
        return None
    if m.group(2) == "." and m.group(1)[-1].isdigit() and _DECIMAL_COUNT.search(text):
        return None
    multiplier = int(m.group(3)) if m.group(3) else 1
    return Formula((Part(first, 1), Part(second, multiplier)), 0, text)


_WATER_ITEMS = (Atom("H", 2), Atom("O", 1))


def _bracketed_water(f: Formula) -> Formula:
    """Water of crystallisation written in brackets at the end of the formula,
    'CuSO4(H2O)5', is the hydrate part CuSO4·5H2O (common practice)."""
    first = f.parts[0]
    last = first.items[-1]
    if (
        len(first.items) < 2
        or not isinstance(last, Group)
        or last.bracket != "("
        or last.items != _WATER_ITEMS
        or any(p.is_water for p in f.parts[1:])
    ):
        return f
    parts = (Part(first.items[:-1], first.multiplier), Part(_WATER_ITEMS, last.count), *f.parts[1:])
    return Formula(parts, f.charge, f.source)


def _parse_with_grammar(text: str) -> Formula | LoneSign:
    normal, where = _normalise(text)
    # strip, keeping the position map in step
    lead = len(normal) - len(normal.lstrip())
    normal_stripped = normal.strip()
    where = where[lead : lead + len(normal_stripped)]
    normal = normal_stripped
    spaced = _SPACED_WATER.search(normal)
    if spaced and any(d in normal[: spaced.start()] for d in HYDRATE_DOTS):
        spaced = None  # a hydrate dot is written already: the space is not one
    if spaced:
        # 'CuSO4 5H2O', as pasted: the space stands for the hydrate dot
        normal = normal[: spaced.start()] + CANONICAL_DOT + normal[spaced.end() :]
        where = where[: spaced.start() + 1] + where[spaced.end() :]
    b = _Builder(text, normal, where)
    if not normal:
        raise FormulaError("no formula given (the text is empty)", text=text)
    _check_brackets(text, normal, b)
    # a Stock number, with or without a space ('Fe(III)', 'Fe (III)'); '(I)2' is iodine, counted
    roman = _STOCK_NUMBER.search(normal)
    if roman:
        raise FormulaError(
            f"'{text}' has a Stock number '{roman.group(1)}' at position {b.pos(roman.start(1))}; a formula"
            " gives the charge with its counts (FeCl3) or as a charge (Fe^3+), not in Roman numerals",
            text=text,
            position=b.pos(roman.start(1)),
        )
    # two dots together ('CaSO4..5H2O'); a dot before a decimal multiplier ('·.5H2O') is fine
    doubled = re.search(
        r"\.\s*\.|[" + re.escape(HYDRATE_DOTS) + r"]\s*[" + re.escape(HYDRATE_DOTS.replace(".", "")) + "]",
        normal,
    )
    if doubled:
        raise FormulaError(
            f"'{text}' has two hydrate dots together at position {b.pos(doubled.start())}"
            " (expected one dot and a multiplier, e.g. '·5H2O' or '·0.5H2O')",
            text=text,
            position=b.pos(doubled.start()),
        )
    m = _DECIMAL_COUNT.search(normal)
    if m and m.start() > 0 and (normal[m.start() - 1].isalpha() or normal[m.start() - 1] in ")]"):
        raise FormulaError(
            f"'{text}' has a decimal count at position {b.pos(m.start())}: decimal counts are not"
            " read; if the '.' joins a hydrate part, write it with '·'",
            text=text,
            position=b.pos(m.start()),
        )
    try:
        tree = _grammar().parse_string(normal, parse_all=True)
    except pp.ParseBaseException as exc:
        raise _syntax_error(text, normal, b, exc) from None
    parts = []
    charge = _NO_CHARGE
    after_dot: tuple | None = None
    for node in tree:
        if isinstance(node, _Charge):
            charge = node
        elif node[0] == "dot":
            after_dot = node
        else:
            part = b.part(node)
            if after_dot is not None:
                _check_decimal_count(text, normal, b, after_dot, part)
            parts.append(part)
    if abs(charge.value) > MAX_CHARGE:
        raise FormulaError(
            f"the charge {charge.value:+d} in '{text}' is out of range (at most {MAX_CHARGE})", text=text
        )
    if charge.value == 0 and charge is not _NO_CHARGE:
        raise FormulaError(
            f"'{text}' is written with a charge of 0 (expected a charge such as 2- or 3+, or none)",
            text=text,
        )
    formula = Formula(tuple(parts), charge.value, text)
    if charge.attached_sign:
        return _lone_sign(formula, text)
    return formula


_SPACED_WATER = re.compile(r"(?<=[A-Za-z0-9)\]])\s+(?=(?:\d+(?:\.\d+)?|½|[xn])?\s*H2O\s*$)")


def _check_decimal_count(text: str, normal: str, b: _Builder, dot: tuple, part: Part) -> None:
    """'Fe2.5O' is a decimal count, not Fe2 and an adduct of five O atoms: a
    '.' between digits that would join a lone atom is refused."""
    _, loc, char = dot
    between_digits = char == "." and 0 < loc < len(normal) - 1 and normal[loc - 1].isdigit()
    if (
        between_digits
        and normal[loc + 1].isdigit()
        and len(part.items) == 1
        and isinstance(part.items[0], Atom)
    ):
        raise FormulaError(
            f"'{text}' has a decimal count at position {b.pos(loc - 1)}: decimal counts are not"
            " read; if the '.' joins a hydrate part, write it with '·'",
            text=text,
            position=b.pos(loc - 1),
        )


# ---------------------------------------------------------------------------
# Case readings
# ---------------------------------------------------------------------------

MAX_READINGS = 6


@cache
def _symbols_casefolded() -> dict[str, str]:
    return {s.casefold(): s for s in symbols()}


def _letter_run_readings(run: str, limit: int) -> list[str]:
    table = _symbols_casefolded()
    results: list[str] = []
    dead: set[int] = set()  # positions from which no reading completes

    def walk(i: int, acc: list[str]) -> bool:
        if len(results) >= limit:
            return True
        if i == len(run):
            results.append("".join(acc))
            return True
        if i in dead:
            return False
        found = False
        for n in (1, 2):
            piece = run[i : i + n].casefold()
            if len(piece) == n and piece in table:
                acc.append(table[piece])
                found = walk(i + n, acc) or found
                acc.pop()
        if not found:
            dead.add(i)
        return found

    walk(0, [])
    return results


def case_readings(text: str) -> tuple[str, ...]:
    """The formulas the letters of ``text`` allow when their case is ignored.

    Used to explain a wrong-case input ('NACL' gives ('NaCl',); 'co' gives
    ('Co', 'CO')). The reading that is ``text`` itself, if any, is left out.
    At most a handful are returned, and none for a text too long to be a
    formula (``MAX_LENGTH``).

    >>> case_readings("co")
    ('Co', 'CO')
    """
    if len(text) > MAX_LENGTH:
        return ()
    normal, _ = _normalise(text.strip())
    pieces = re.split(r"([A-Za-z]+)", normal)
    options: list[list[str]] = []
    for i, piece in enumerate(pieces):
        if i % 2 == 1:
            lead = ""
            before = pieces[i - 1].rstrip()
            if (
                piece[0] in "xny"
                and len(piece) > 1
                and piece[1].isupper()
                and (not before or before[-1] in HYDRATE_DOTS)
            ):
                lead, piece = piece[0], piece[1:]  # an unknown-count multiplier: 'xH2O'
            found = _letter_run_readings(piece, MAX_READINGS * 4)
            found = [lead + f for f in found]
            if not found:
                return ()
            options.append(found)
        else:
            options.append([piece])
    out: list[str] = []
    for combo in product(*options):
        reading = "".join(combo)
        if reading != normal and reading not in out:
            out.append(reading)
        if len(out) >= MAX_READINGS:
            break
    # Prefer readings with fewer, longer symbols first ('Co' before 'CO').
    out.sort(key=lambda r: sum(1 for c in r if c.isupper()))
    return tuple(out)
