"""Safety-data-sheet (SDS) summary cells: EC number, UN number, hazard (H),
EU supplemental (EUH) and precautionary (P) statements, signal word and GHS
pictograms; read, and checked against one another.

Sources:

- EC numbers (EINECS, ELINCS and NLP list numbers) are written ``NNN-NNN-N``;
  the last digit is a check digit: the first six digits, each multiplied by its
  position (1 to 6), summed, modulo 11; a remainder of 10 is never assigned.
  That is the European Commission's and ECHA's description of the EC number
  format (from memory); all 1,794 distinct EINECS/EC numbers found among the
  synonyms of the PubChem-derived tables of the ``chemicals`` package (1.5.2)
  pass it.
- UN numbers and their substances: ``data/un_numbers.csv`` (UN Recommendations
  on the Transport of Dangerous Goods, Model Regulations, Dangerous Goods List).
- H, EUH and P codes, the signal word and pictograms of each H code:
  ``data/ghs_statements.csv`` (GHS Annex 3, CLP Annexes I and II).
- Signal word: where Danger applies, Warning does not appear (GHS 1.4.10.5.3.2,
  CLP Article 20(3), from memory).
- Pictograms: the precedence rules of CLP Article 26(1) (read in the consolidated
  text): (a) where GHS01 applies, GHS02 and GHS03 are optional, except where
  they are compulsory (here: where one category carries both, as organic
  peroxides and self-reactive substances of type B do: H241); (b) where GHS06
  applies, GHS07 does not appear; (c) where GHS05 applies, GHS07 does not appear
  for skin or eye irritation; (d) where GHS08 applies for respiratory
  sensitisation, GHS07 does not appear for skin sensitisation or skin or eye
  irritation; (e) where GHS02 or GHS06 applies, GHS04 is optional. GHS
  1.4.10.5.3.1 gives (b) to (d) (from memory). A pictogram a rule takes away is
  *allowed* (never reported when shown) but not *required*.

These checks test that the cells agree with one another and with the codes'
published label elements; they never replace the supplier's SDS, which decides.
"""

from __future__ import annotations

import itertools
import re
import unicodedata
from collections.abc import Iterable
from dataclasses import dataclass
from functools import cache

from .cas import read_cas
from .errors import CellchemError
from .tables import read_table, split_names

# The severities of cellchem.audit (the same plain strings; tests check they agree).
# Not imported from there: the audit will import this module.
ERROR = "error"
WARNING = "warning"
NOTE = "note"

DANGER = "Danger"
WARNING_WORD = "Warning"

_DASHES = dict.fromkeys(map(ord, "‐‑‒–—―−﹣－"), "-")

# ---------------------------------------------------------------------------
# Findings
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class SdsFinding:
    """One thing found in an SDS summary's cells.

    Attributes:
        severity: ``'error'``, ``'warning'`` or ``'note'`` (the words of cellchem.audit).
        field: ``'ec'``, ``'un'``, ``'hazard statements'``, ``'precautionary statements'``,
            ``'signal word'`` or ``'pictograms'``.
        message: one line saying what was found, quoting the cell.
        suggestion: what would resolve it, or None.
    """

    severity: str
    field: str
    message: str
    suggestion: str | None = None


def _text(value: object, what: str) -> str:
    if isinstance(value, bool) or value is None:
        raise CellchemError(f"no {what} given (read {value!r})")
    if isinstance(value, int):
        return str(value)
    if isinstance(value, str):
        return value
    raise CellchemError(f"{what} is text; read {value!r}")


def _blank(value: object) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


# What SDS summaries write in a cell that has no number or code: a dash, "none", "not regulated"
# (no UN number: not dangerous goods for transport), "see SDS" (common practice, English and German).
_NO_VALUE = re.compile(
    r"^(?:[-–—/]+|none|n\.?\s?a\.?|n/a|nil|keine?|not (?:regulated|applicable|available|listed|classified)"
    r"|not (?:a )?dangerous goods?|no dangerous goods?|kein gefahrgut|nicht (?:reguliert|anwendbar|verfügbar"
    r"|gelistet|eingestuft)|see (?:the )?sds|siehe (?:sdb|sicherheitsdatenblatt))\.?$",
    re.IGNORECASE,
)


def not_given(value: object) -> bool:
    """A blank cell, or one that says there is no value (a dash, "none", "not regulated",
    "see SDS"): nothing to check.

    >>> not_given("not regulated"), not_given("-"), not_given("Kein Gefahrgut"), not_given("UN1789")
    (True, True, True, False)
    """
    return _blank(value) or (isinstance(value, str) and bool(_NO_VALUE.match(" ".join(value.split()))))


# ---------------------------------------------------------------------------
# EC numbers
# ---------------------------------------------------------------------------

_EC_PREFIX = re.compile(
    r"^(?:EC|EG|EINECS|ELINCS)(?:[\s-]*(?:No|Nr|Number|Nummer)\b\.?)?\s*[:#.-]?\s*", re.IGNORECASE
)
_EC_GROUPED = re.compile(r"^([0-9]{3})[-\s]([0-9]{3})[-\s]([0-9])$")
_EC_PLAIN = re.compile(r"^([0-9]{3})([0-9]{3})([0-9])$")


def _ec_remainder(six: str) -> int:
    return sum(int(d) * i for i, d in enumerate(six, 1)) % 11


def read_ec(text: object) -> str:
    """Read and verify an EC number (EINECS, ELINCS, NLP), in the form ``'NNN-NNN-N'``.

    Accepts the hyphenated form, seven plain digits, surrounding spaces and an
    "EC", "EG" or "EINECS" prefix ("EC No.", "EG-Nr.:").

    Raises:
        CellchemError: not the format of an EC number, or a wrong check digit
            (the message gives the digit expected and the digit found).

    >>> read_ec("231-791-2"), read_ec("EC 2005786"), read_ec(" EINECS: 200-662-2 ")
    ('231-791-2', '200-578-6', '200-662-2')
    >>> read_ec("231-791-3")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.CellchemError: EC number '231-791-3' fails its check digit: ... call for 2, found 3; ...
    """
    shown = _text(text, "EC number").strip()
    s = unicodedata.normalize("NFKC", shown).translate(_DASHES).strip()
    body = _EC_PREFIX.sub("", s, count=1).strip()
    m = _EC_GROUPED.match(body) or _EC_PLAIN.match(body)
    if not m:
        raise CellchemError(
            f"'{shown}' is not an EC number (expected three groups of 3, 3 and 1 digits joined by"
            " hyphens, such as '231-791-2', or the seven digits alone)",
            text=shown,
        )
    first, second, check = m.groups()
    remainder = _ec_remainder(first + second)
    if remainder == 10:
        raise CellchemError(
            f"'{shown}' is not an EC number: the digits {first}-{second} leave 10 in the check-digit"
            " sum, which no EC number is given; it may be a typo",
            text=shown,
        )
    if remainder != int(check):
        raise CellchemError(
            f"EC number '{shown}' fails its check digit: the digits {first}-{second} call for"
            f" {remainder}, found {check}; it may be a typo (check it against the SDS)",
            text=shown,
            choices=(f"{first}-{second}-{remainder}",),
        )
    return f"{first}-{second}-{check}"


def ec_is_valid(text: object) -> bool:
    """True when the text reads as an EC number with a correct check digit, in
    any form :func:`read_ec` accepts; False for anything else, never an error.

    >>> ec_is_valid("231-598-3"), ec_is_valid("2315983"), ec_is_valid("231-598-4")
    (True, True, False)
    """
    try:
        read_ec(text)
    except CellchemError:
        return False
    return True


def check_ec(text: object) -> list[SdsFinding]:
    """Check an EC number cell: one error finding for a wrong format or check
    digit; a blank cell is "not given".

    >>> check_ec("200-578-6"), check_ec("")
    ([], [])
    """
    if not_given(text):
        return []
    try:
        read_ec(text)
    except CellchemError as exc:
        hint = f"{exc.choices[0]} if only the check digit is wrong" if exc.choices else None
        return [SdsFinding(ERROR, "ec", str(exc), hint or "copy the EC number from SDS section 1 or 3")]
    return []


# ---------------------------------------------------------------------------
# UN numbers
# ---------------------------------------------------------------------------

_UN = re.compile(r"^(?:UN)?\s*-?\s*([0-9]+)$", re.IGNORECASE)


def read_un(text: object) -> str:
    """Read a UN number as ``'UN1789'`` from "UN1789", "UN 1789", "UN-1789" or "1789".

    Raises:
        CellchemError: not "UN" and four digits, or UN0000.

    >>> read_un("UN 1789"), read_un("1830"), read_un("un-2796")
    ('UN1789', 'UN1830', 'UN2796')
    """
    shown = _text(text, "UN number").strip()
    s = unicodedata.normalize("NFKC", shown).translate(_DASHES).strip()
    m = _UN.match(s)
    if not m:
        raise CellchemError(
            f"'{shown}' is not a UN number (expected 'UN' and four digits, such as 'UN1789')", text=shown
        )
    digits = m.group(1)
    if len(digits) != 4:
        raise CellchemError(
            f"UN number '{shown}' has {len(digits)} digits: a UN number has four (such as 'UN1789';"
            " the explosives of class 1 are written with leading zeros, 'UN0222')",
            text=shown,
        )
    if digits == "0000":
        raise CellchemError(f"'{shown}' is not a UN number: UN0000 is not assigned", text=shown)
    return f"UN{digits}"


@dataclass(frozen=True)
class UNEntry:
    """One row of the UN number table.

    Attributes:
        un: ``'UN1789'``.
        shipping_name: the proper shipping name.
        condition: the form or strength the number is for ('' if it covers all).
        cas: the substance's CAS RN.
        formula: the formula the table finds the row by ('' if none).
    """

    un: str
    shipping_name: str
    condition: str
    cas: str
    formula: str

    def describe(self) -> str:
        """``'UN1789 (HYDROCHLORIC ACID, solution)'``."""
        parts = [self.shipping_name]
        if self.condition and self.condition.casefold() not in self.shipping_name.casefold():
            parts.append(self.condition)
        what = ", ".join(part for part in parts if part)
        return f"{self.un} ({what})"


@cache
def _un_rows() -> tuple[tuple[UNEntry, tuple[str, ...]], ...]:
    rows = []
    for row in read_table("un_numbers.csv"):
        formulas = split_names(row["formula"])
        entry = UNEntry(
            row["un"], row["shipping_name"], row["condition"], row["cas"], formulas[0] if formulas else ""
        )
        rows.append((entry, formulas))
    return tuple(rows)


def _formula_key(formula: str) -> str:
    return "".join(unicodedata.normalize("NFKC", formula).split())


def un_numbers_for(cas: str | None = None, formula: str | None = None) -> tuple[UNEntry, ...]:
    """The UN numbers the table lists for a substance, found by CAS RN or, when
    the CAS RN is not given or not listed, by formula (matched as written:
    ``'CH3COOH'`` finds acetic acid, the Hill formula ``'C2H4O2'`` nothing).

    Empty when the table does not list the substance; an unreadable CAS RN
    finds nothing (its own check reports it).

    >>> [e.un for e in un_numbers_for(cas="7664-93-9")]
    ['UN1830', 'UN2796']
    >>> un_numbers_for(formula="C2H4O2")
    ()
    """
    rows = _un_rows()
    if not _blank(cas):
        try:
            number = read_cas(cas).number
        except CellchemError:
            number = None
        found = tuple(entry for entry, _ in rows if number is not None and entry.cas == number)
        if found:
            return found
    if not _blank(formula) and isinstance(formula, str):
        key = _formula_key(formula)
        return tuple(entry for entry, formulas in rows if key in formulas)
    return ()


def check_un(un_text: object, cas: str | None = None, formula: str | None = None) -> list[SdsFinding]:
    """Check a UN number cell: its format, and that it is one the table lists for
    the line's substance (CAS RN, else formula). A substance the table does not
    list gives no finding; a blank cell is "not given".
    """
    if not_given(un_text):
        return []
    try:
        un = read_un(un_text)
    except CellchemError as exc:
        return [SdsFinding(ERROR, "un", str(exc), "write 'UN' and the four digits of SDS section 14")]
    entries = un_numbers_for(cas, formula)
    if not entries or un in {entry.un for entry in entries}:
        return []
    try:
        by_cas = not _blank(cas) and read_cas(cas).number == entries[0].cas
    except CellchemError:
        by_cas = False
    substance = f"CAS RN {entries[0].cas}" if by_cas else f"formula {formula}"
    listed = ", ".join(entry.describe() for entry in entries)
    elsewhere = sorted(
        {f"CAS RN {e.cas} ({e.describe().partition(' (')[2]}" for e, _ in _un_rows() if e.un == un}
    )
    also = f"; {un} is listed for {'; '.join(elsewhere)}" if elsewhere else ""
    return [
        SdsFinding(
            WARNING,
            "un",
            f"UN number '{un_text}' is not one the table lists for {substance}: {listed}{also}",
            f"check SDS section 14: {', '.join(dict.fromkeys(e.un for e in entries))} (a mixture or"
            " another strength may ship under a number the table does not list)",
        )
    ]


# ---------------------------------------------------------------------------
# The statement table
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Statement:
    """One H, EUH or P code of ``data/ghs_statements.csv``.

    Attributes:
        code: ``'H314'``, ``'EUH066'``, ``'P280'``.
        kind: ``'H'``, ``'EUH'`` or ``'P'``.
        hazard_class, category: as the table gives them ('' for P codes).
        signal_words: the signal words the code's categories carry (``'Danger'``,
            ``'Warning'``; empty for none), or None where the table does not give them.
        pictograms: the pictogram sets of the code's categories (one set for most
            codes; ``(GHS02), ()`` for H221), or None where the table does not give them.
        note: the table's note ('GHS only', 'EU only', 'withdrawn ...').
    """

    code: str
    kind: str
    hazard_class: str
    category: str
    signal_words: frozenset[str] | None
    pictograms: tuple[frozenset[str], ...] | None
    note: str


_NOT_GIVEN = "not given"


def _pictogram_readings(cell: str) -> tuple[frozenset[str], ...] | None:
    if cell == _NOT_GIVEN:
        return None
    readings = []
    for alternative in cell.split(" or "):
        alternative = alternative.strip()
        readings.append(frozenset() if alternative in ("", "none") else frozenset(split_names(alternative)))
    return tuple(readings)


@cache
def _statements() -> dict[str, Statement]:
    table: dict[str, Statement] = {}
    for row in read_table("ghs_statements.csv"):
        signal = row["signal_word"]
        table[row["code"]] = Statement(
            code=row["code"],
            kind=row["kind"],
            hazard_class=row["hazard_class"],
            category=row["category"],
            signal_words=None if signal == _NOT_GIVEN else frozenset(split_names(signal)),
            pictograms=_pictogram_readings(row["pictograms"]),
            note=row["note"],
        )
    return table


@cache
def _by_folded_code() -> dict[str, tuple[str, ...]]:
    folded: dict[str, list[str]] = {}
    for code in _statements():
        folded.setdefault(code.upper(), []).append(code)
    return {key: tuple(codes) for key, codes in folded.items()}


def statement(code: str) -> Statement:
    """The table's row for one code (``'H314'``, ``'h314'``, ``'H360Fd'``).

    Raises:
        CellchemError: a code the table does not hold, or a lower-case EU suffix
            that could mean two codes (``'h360fd'``: H360FD or H360Fd).
    """
    return _statements()[_resolve(code, code, 1)]


def _resolve(code: str, cell: str, position: int) -> str:
    m = _CODE.match(code)
    if not m:
        raise CellchemError(
            f"'{code}' at position {position} of '{cell}' is not a statement code (expected H, P or"
            " EUH and three digits, such as 'H225')",
            text=cell,
            position=position,
        )
    prefix, digits, suffix = m.groups()
    exact = prefix.upper() + digits + suffix
    if exact in _statements():
        return exact
    candidates = _by_folded_code().get(exact.upper(), ())
    if len(candidates) == 1:
        return candidates[0]
    if candidates:
        raise CellchemError(
            f"'{code}' at position {position} of '{cell}' could be {' or '.join(candidates)} (upper-case"
            " F/D: may damage; lower case f/d: suspected of damaging): write the letters' case as the"
            " SDS does",
            text=cell,
            position=position,
            choices=candidates,
        )
    raise CellchemError(
        f"unknown statement code '{code}' at position {position} of '{cell}': not an H, P or EUH code"
        " of the GHS or CLP; it may be a typing slip",
        text=cell,
        position=position,
    )


# ---------------------------------------------------------------------------
# Reading a cell of statements
# ---------------------------------------------------------------------------

_CODE = re.compile(r"^(EUH|H|P)([0-9]{3})([A-Za-z]{0,2})$", re.IGNORECASE)
# What a code looks like, typos included (the letter O for zero, l or I for one).
_CODE_LIKE = re.compile(r"^(?:EUH|H|P)[0-9OoIl]{2,4}[A-Za-z]{0,2}$", re.IGNORECASE)
_TOKEN = re.compile(r"\+|[^\s,;/|+•·]+")
_CUT = ",;/|•·\n\r"  # characters that end a statement between two tokens
_INNER_DASH = re.compile(r"[-–—](?=(?:EUH|H|P)[0-9])", re.IGNORECASE)
_NONE_WORDS = frozenset(
    {
        "-",
        "–",
        "—",
        "none",
        "n/a",
        "na",
        "keine",
        "kein",
        "not classified",
        "not applicable",
        "nicht eingestuft",
    }
)


# A statements cell with no code that says the substance carries none: "Not a hazardous substance
# according to Regulation (EC) No 1272/2008", "not classified", "kein gefährlicher Stoff" (common practice)
_NO_HAZARD = re.compile(
    r"\b(?:not (?:a )?(?:hazardous|dangerous|classified)|no hazards?|non[- ]hazardous"
    r"|kein(?:e|er)? gef[äa]hrlich|nicht (?:als )?(?:gef[äa]hrlich|eingestuft))",
    re.IGNORECASE,
)


def _says_none(text: str) -> bool:
    return text.strip().lower().rstrip(".") in _NONE_WORDS or bool(_NO_HAZARD.search(text))


def _tokens(text: str) -> list[tuple[str, int, bool]]:
    """The cell's tokens: (token, 0-based start, whether a statement break precedes it)."""
    out: list[tuple[str, int, bool]] = []
    end = 0
    cut = True
    for m in _TOKEN.finditer(text):
        if any(ch in _CUT for ch in text[end : m.start()]):
            cut = True
        word = m.group()
        pieces = [word] if word == "+" else _INNER_DASH.split(word)
        at = m.start()
        for number, piece in enumerate(pieces):
            if number:
                at += 1  # the dash between two codes
                cut = True
            if piece:
                out.append((piece, at, cut))
                cut = False
            at += len(piece)
        end = m.end()
        if word.rstrip(")]").endswith((".", ":")):
            cut = True  # a sentence of statement text ended
    return out


def _strip(token: str) -> str:
    return token.lstrip("([\"'„“").rstrip(".:,;)]*\"'“”")


def _check_group(group: list[tuple[str, int]], cell: str) -> None:
    if len(group) < 2:
        return
    kinds = {_statements()[code].kind for code, _ in group}
    joined = "+".join(code for code, _ in group)
    position = group[0][1]
    if len(kinds) > 1:
        raise CellchemError(
            f"'{joined}' at position {position} of '{cell}' joins codes of different kinds"
            f" ({', '.join(sorted(kinds))}); only statements of one kind are combined",
            text=cell,
            position=position,
        )
    if kinds == {"P"}:
        hundreds = {code[1] for code, _ in group}
        # GHS and CLP combine within a section, and storage with P233/P235 (P403+P233, P403+P235)
        if len(hundreds) > 1 and hundreds != {"2", "4"}:
            raise CellchemError(
                f"'{joined}' at position {position} of '{cell}' joins precautionary statements of"
                " different sections (P1xx general, P2xx prevention, P3xx response, P4xx storage,"
                " P5xx disposal), which are not combined",
                text=cell,
                position=position,
            )


def _read_groups(text: str) -> tuple[tuple[tuple[str, int], ...], ...]:
    cell = text
    tokens = _tokens(text)
    groups: list[list[tuple[str, int]]] = []
    current: list[tuple[str, int]] | None = None
    after_plus: int | None = None  # position of a '+' waiting for its code
    previous = "break"  # 'break', 'code' or 'text'
    skip = False
    for index, (token, start, cut) in enumerate(tokens):
        if skip:
            skip = False
            continue
        position = start + 1
        at_break = cut or previous in ("break", "code")
        if token == "+":
            if previous != "code" or after_plus is not None:
                raise CellchemError(
                    f"'+' at position {position} of '{cell}' does not join two codes (write"
                    " combined statements as 'H301+H311')",
                    text=cell,
                    position=position,
                )
            after_plus = position
            continue
        core = _strip(token)
        # "H 225", "EUH 066": a prefix standing apart from its digits
        if core.upper() in ("H", "P", "EUH") and index + 1 < len(tokens):
            following, _, next_cut = tokens[index + 1]
            if not next_cut and re.fullmatch(r"[0-9]{3}[A-Za-z]{0,2}", _strip(following)):
                core = core + _strip(following)
                skip = True
        if _CODE.match(core):
            code = _resolve(core, cell, position)
            if after_plus is not None and current is not None:
                current.append((code, position))
                after_plus = None
            else:
                if current:
                    groups.append(current)
                current = [(code, position)]
            previous = "code"
            continue
        looks_like_code = bool(_CODE_LIKE.match(core)) and any(ch.isdigit() for ch in core)
        if after_plus is not None:
            raise CellchemError(
                f"'+' at position {after_plus} of '{cell}' is followed by '{token}', not a code (write"
                " combined statements as 'H301+H311')",
                text=cell,
                position=after_plus,
            )
        if looks_like_code and at_break:
            letters = sorted(set(re.findall(r"[OoIl]", core[1:])))
            hint = (
                " ("
                + " and ".join(f"the letter {c} for {'a zero' if c in 'Oo' else 'a one'}" for c in letters)
                + "?)"
                if letters
                else ""
            )
            raise CellchemError(
                f"malformed statement code '{core}' at position {position} of '{cell}'{hint}: expected H,"
                " P or EUH and three digits, such as 'H301'",
                text=cell,
                position=position,
            )
        previous = "text"  # statement text after a code, or a heading before the codes
    if after_plus is not None:
        raise CellchemError(
            f"'+' at position {after_plus} of '{cell}' ends the cell without a code after it",
            text=cell,
            position=after_plus,
        )
    if current:
        groups.append(current)
    if not groups and text.strip() and not _says_none(text):
        raise CellchemError(
            f"no statement code found in '{cell}' (expected codes such as 'H225, H319' or"
            " 'P210'; write '-' or 'none' where the SDS gives none)",
            text=cell,
        )
    for group in groups:
        _check_group(group, cell)
    return tuple(tuple(group) for group in groups)


def read_statements(text: object) -> tuple[tuple[str, ...], ...]:
    """Read a cell of H, EUH or P statements as suppliers write them.

    Codes may be separated by commas, semicolons, spaces, slashes, dashes or new
    lines; combined statements are joined with '+' (spaces around it allowed);
    lower case is read; the statement text after a code is set aside. A blank
    cell, '-' or 'none' reads as no statements.

    Returns:
        One tuple of codes per statement (usually one code; several for a
        combined statement), in the cell's order, codes as the table writes them.

    Raises:
        CellchemError: an unknown code, a malformed one, a dangling '+', a
            combination of different kinds or of P codes of different sections
            (P2xx+P3xx), or a cell with text but no code; the message names the
            token and its position.

    >>> read_statements("H301 + H311, h331; EUH066")
    (('H301', 'H311'), ('H331',), ('EUH066',))
    >>> read_statements("H225 Highly flammable liquid and vapour. H319 Causes serious eye irritation.")
    (('H225',), ('H319',))
    """
    if text is None:
        return ()
    cell = _text(text, "statements")
    return tuple(tuple(code for code, _ in group) for group in _read_groups(cell))


# ---------------------------------------------------------------------------
# Signal word
# ---------------------------------------------------------------------------

_SIGNAL_WORDS = {
    "danger": DANGER,
    "gefahr": DANGER,
    "warning": WARNING_WORD,
    "achtung": WARNING_WORD,
}
_NO_SIGNAL = frozenset(
    {"", "-", "–", "—", "none", "n/a", "na", "keine", "kein", "no signal word", "kein signalwort"}
)


def read_signal_word(text: object) -> str:
    """``'Danger'``, ``'Warning'`` or ``''`` (no signal word) from a cell.

    Reads any case, the German words (Gefahr = Danger, Achtung = Warning) and
    '-', 'none', 'n/a', 'keine' (no signal word).

    >>> read_signal_word("DANGER"), read_signal_word("Achtung"), read_signal_word("n/a")
    ('Danger', 'Warning', '')
    """
    shown = _text(text, "signal word").strip()
    folded = " ".join(shown.lower().rstrip(".!:").split())
    if folded in _SIGNAL_WORDS:
        return _SIGNAL_WORDS[folded]
    if folded in _NO_SIGNAL:
        return ""
    raise CellchemError(
        f"'{shown}' is not a signal word (expected 'Danger' or 'Warning', German 'Gefahr' or"
        " 'Achtung', or '-' for none)",
        text=shown,
    )


def _hazard_statements(h_codes: Iterable[str]) -> list[Statement]:
    out = []
    for code in h_codes:
        entry = statement(code)
        if entry.kind == "P":
            raise CellchemError(
                f"'{code}' is a precautionary statement; the signal word and pictograms follow from"
                " the hazard statements (H, EUH)",
                text=code,
            )
        out.append(entry)
    return out


def _signal_judgement(entries: list[Statement]) -> tuple[frozenset[str], str, Statement | None]:
    """(acceptable words, reason, the code that carries either word where it
    decided the case). Raises where a code's signal word is not in the table."""
    danger_only = [e for e in entries if e.signal_words == frozenset({DANGER})]
    if danger_only:
        return frozenset({DANGER}), f"{danger_only[0].code} carries Danger", None
    unknown = [e for e in entries if e.signal_words is None]
    if unknown:
        raise CellchemError(
            f"the table does not give the signal word of {unknown[0].code}, so the signal word is not"
            " worked out",
            text=unknown[0].code,
        )
    either = [e for e in entries if e.signal_words == frozenset({DANGER, WARNING_WORD})]
    if either:
        e = either[0]
        return (
            frozenset({DANGER, WARNING_WORD}),
            f"{e.code} carries Danger or Warning by category ({e.category}) and the statements do"
            " not say which",
            e,
        )
    warning = [e for e in entries if e.signal_words and WARNING_WORD in e.signal_words]
    if warning:
        return frozenset({WARNING_WORD}), f"{warning[0].code} carries Warning", None
    return frozenset({""}), "no statement given carries a signal word", None


def expected_signal_word(h_codes: Iterable[str]) -> tuple[frozenset[str], str]:
    """The acceptable signal words for a set of H (and EUH) codes, and a one-line reason.

    Any code that only carries Danger gives {"Danger"}; otherwise a code that
    carries Danger or Warning by category gives both; otherwise any Warning
    gives {"Warning"}; with none, {""} (no signal word). EUH codes carry none,
    except those of the 2023 CLP hazard classes (EUH380-EUH451).

    Raises:
        CellchemError: an unknown code, a P code, or a code whose signal word the
            table does not give (H209-H211).

    >>> expected_signal_word(["H225", "H319"])
    (frozenset({'Danger'}), 'H225 carries Danger')
    """
    allowed, reason, _ = _signal_judgement(_hazard_statements(h_codes))
    return allowed, reason


# ---------------------------------------------------------------------------
# Pictograms
# ---------------------------------------------------------------------------

PICTOGRAMS = ("GHS01", "GHS02", "GHS03", "GHS04", "GHS05", "GHS06", "GHS07", "GHS08", "GHS09")

# The CLP names (Annex V), US names, and the German CLP names (from memory).
_PICTOGRAM_NAMES = {
    "exploding bomb": "GHS01",
    "flame": "GHS02",
    "flame over circle": "GHS03",
    "gas cylinder": "GHS04",
    "corrosion": "GHS05",
    "skull and crossbones": "GHS06",
    "skull & crossbones": "GHS06",
    "exclamation mark": "GHS07",
    "exclamation point": "GHS07",
    "health hazard": "GHS08",
    "environment": "GHS09",
    "explodierende bombe": "GHS01",
    "flamme": "GHS02",
    "flamme über einem kreis": "GHS03",
    "gasflasche": "GHS04",
    "ätzwirkung": "GHS05",
    "totenkopf mit gekreuzten knochen": "GHS06",
    "ausrufezeichen": "GHS07",
    "gesundheitsgefahr": "GHS08",
    "umwelt": "GHS09",
}
# The danger symbols of the former EU directives, refused with a word of explanation.
_OLD_SYMBOLS = frozenset({"e", "o", "f", "f+", "t", "t+", "c", "xn", "xi", "n"})
_GHS_CODE = re.compile(r"^GHS\s*-?\s*0?([0-9])$", re.IGNORECASE)
_GHS_CODE_AT = re.compile(r"GHS\s*-?\s*[0-9]{1,2}(?![0-9])", re.IGNORECASE)
_PICTOGRAM_NAME_AT = re.compile(
    "|".join(re.escape(name) for name in sorted(_PICTOGRAM_NAMES, key=len, reverse=True)) + r"(?!\w)",
    re.IGNORECASE,
)
_PICTOGRAM_PART = re.compile(r"[^,;/|+\n()]+")
_PICTOGRAM_GAP = re.compile(r"(?:\s|-(?=\s|$)|–|—)+")
_WORD = re.compile(r"\S+")


def _pictogram(piece: str, cell: str, position: int) -> str:
    m = _GHS_CODE.match(piece)
    if m and m.group(1) != "0":
        return f"GHS0{m.group(1)}"
    folded = " ".join(piece.lower().split())
    if folded in _PICTOGRAM_NAMES:
        return _PICTOGRAM_NAMES[folded]
    if folded.isdigit():
        meant = f": write 'GHS0{int(folded)}' if that is meant" if 1 <= int(folded) <= 9 else ""
        raise CellchemError(
            f"'{piece}' at position {position} of '{cell}' is a bare number, which could be a transport"
            f" class as well as a pictogram{meant}",
            text=cell,
            position=position,
        )
    if folded in _OLD_SYMBOLS:
        raise CellchemError(
            f"'{piece}' at position {position} of '{cell}' is a danger symbol of the former EU"
            " directives, not a GHS pictogram: the SDS's section 2 gives the GHS pictograms (GHS01-GHS09)",
            text=cell,
            position=position,
        )
    raise CellchemError(
        f"unknown pictogram '{piece}' at position {position} of '{cell}' (expected GHS01 to GHS09 or a"
        " CLP name such as 'flame' or 'exclamation mark')",
        text=cell,
        position=position,
    )


def read_pictograms(text: object) -> frozenset[str]:
    """The GHS pictograms of a cell: codes ("GHS02, GHS07", "GHS02/GHS07", "GHS 02",
    "GHS2") or CLP names ("flame", "exclamation mark", ..., German names too);
    '-' or 'none' for none.

    Bare numbers ("02, 07") are refused: they may be transport hazard classes.

    >>> sorted(read_pictograms("GHS02/ghs07")), sorted(read_pictograms("corrosion; skull and crossbones"))
    (['GHS02', 'GHS07'], ['GHS05', 'GHS06'])
    """
    cell = _text(text, "pictograms")
    found: set[str] = set()
    for part in _PICTOGRAM_PART.finditer(cell):
        stripped = part.group().strip().rstrip(".")
        if not stripped or stripped.lower() in _NONE_WORDS:
            continue
        at = 0
        body = part.group()
        while at < len(body):
            gap = _PICTOGRAM_GAP.match(body, at)
            at = gap.end() if gap else at
            if at >= len(body):
                break
            m = _GHS_CODE_AT.match(body, at) or _PICTOGRAM_NAME_AT.match(body, at)
            word = m.group() if m else _WORD.match(body, at).group()
            found.add(_pictogram(word.rstrip("."), cell, part.start() + at + 1))
            at += len(word)
    return frozenset(found)


_ACUTE_TOXICITY_GHS07 = frozenset({"H302", "H312", "H332"})
_IRRITATION_GHS07 = frozenset({"H315", "H319"})
_SKIN_SENSITISATION_GHS07 = frozenset({"H317"})
_RESPIRATORY_SENSITISATION = frozenset({"H334"})


def _apply_precedence(reading: dict[str, frozenset[str]]) -> tuple[set[str], set[str]]:
    """(required, optional) pictograms of one reading (code -> its pictograms)."""
    shown = set().union(*reading.values()) if reading else set()
    optional: set[str] = set()
    if "GHS07" in shown:
        reasons = {code for code, pictograms in reading.items() if "GHS07" in pictograms}
        if "GHS05" in shown:  # CLP 26(1)(c)
            reasons -= _IRRITATION_GHS07
        if any(code in _RESPIRATORY_SENSITISATION for code in reading):  # CLP 26(1)(d)
            reasons -= _IRRITATION_GHS07 | _SKIN_SENSITISATION_GHS07
        if "GHS06" in shown or not reasons:  # CLP 26(1)(b)
            optional.add("GHS07")
    if "GHS01" in shown:  # CLP 26(1)(a), except where a category itself carries both (H241)
        together = set().union(*(p for p in reading.values() if "GHS01" in p))
        optional |= (shown & {"GHS02", "GHS03"}) - together
    if shown & {"GHS02", "GHS06"}:  # CLP 26(1)(e)
        optional |= shown & {"GHS04"}
    return shown - optional, optional


def expected_pictograms(h_codes: Iterable[str]) -> tuple[frozenset[str], frozenset[str]]:
    """(required, allowed) GHS pictograms for a set of H (and EUH) codes.

    ``required``: the pictograms every reading of the codes carries after the
    precedence rules (CLP Article 26(1)); ``allowed``: those plus the ones a rule
    makes optional or one reading of a code carries (H221: GHS02 in category 1B,
    none in category 2).

    Raises:
        CellchemError: an unknown code, a P code, or a code whose pictograms the
            table does not give (H209-H211, H282-H284).

    >>> [sorted(s) for s in expected_pictograms(["H301", "H302", "H315"])]
    [['GHS06'], ['GHS06', 'GHS07']]
    """
    entries = _hazard_statements(h_codes)
    unknown = [e for e in entries if e.pictograms is None]
    if unknown:
        raise CellchemError(
            f"the table does not give the pictograms of {unknown[0].code}, so the pictograms are not"
            " worked out",
            text=unknown[0].code,
        )
    codes = list(dict.fromkeys(e.code for e in entries))
    readings = [_statements()[code].pictograms or (frozenset(),) for code in codes]
    required: set[str] | None = None
    allowed: set[str] = set()
    for combination in itertools.product(*readings):
        need, optional = _apply_precedence(dict(zip(codes, combination)))
        required = set(need) if required is None else required & need
        allowed |= need | optional
    return frozenset(required or ()), frozenset(allowed)


# ---------------------------------------------------------------------------
# Checking a line's hazard cells
# ---------------------------------------------------------------------------


def _quote(value: object) -> str:
    return f"'{value}'"


def check_hazards(
    h_text: object = None,
    p_text: object = None,
    signal_word: object = None,
    pictograms: object = None,
    statements_column: bool = False,
) -> list[SdsFinding]:
    """Check an SDS summary's hazard cells: the H/EUH and P statements are read
    (unknown or malformed codes are errors naming the token), the signal word is
    checked against the hazard statements, and the pictograms (when given)
    against the pictograms the statements call for (a pictogram the statements
    require is an error when missing; one none of them carries, a warning).

    Blank cells (None or only spaces) are "not given" and give no finding; a
    signal word cell of '-' or 'none' says the SDS shows no signal word. With
    ``statements_column`` (the table has a column for the hazard statements), a
    signal word beside an empty statements cell is a warning: one of the two is
    wrong or missing.
    """
    findings: list[SdsFinding] = []
    word_given = not not_given(signal_word) and not (
        isinstance(signal_word, str) and signal_word.strip().lower().rstrip(".") in _NONE_WORDS
    )
    if statements_column and _blank(h_text) and word_given:
        findings.append(
            SdsFinding(
                WARNING,
                "signal word",
                f"signal word {_quote(signal_word)} with no hazard statements on the line: the statements are"
                " missing, or the signal word belongs to another line",
                "copy the hazard statements from SDS section 2",
            )
        )
    hazard_codes: list[str] | None = None
    if not _blank(h_text):
        try:
            groups = read_statements(h_text)
        except CellchemError as exc:
            findings.append(SdsFinding(ERROR, "hazard statements", str(exc), _fix_hint(exc)))
        else:
            hazard_codes = []
            for group in groups:
                if _statements()[group[0]].kind == "P":
                    findings.append(
                        SdsFinding(
                            WARNING,
                            "hazard statements",
                            f"'{'+'.join(group)}' in the hazard statements {_quote(h_text)} is a"
                            " precautionary statement",
                            "move the P codes to the precautionary statements",
                        )
                    )
                else:
                    hazard_codes.extend(group)
    if not _blank(p_text):
        try:
            p_groups = read_statements(p_text)
        except CellchemError as exc:
            findings.append(SdsFinding(ERROR, "precautionary statements", str(exc), _fix_hint(exc)))
        else:
            for group in p_groups:
                if _statements()[group[0]].kind != "P":
                    findings.append(
                        SdsFinding(
                            WARNING,
                            "precautionary statements",
                            f"'{'+'.join(group)}' in the precautionary statements {_quote(p_text)} is a"
                            " hazard statement",
                            "move the H and EUH codes to the hazard statements",
                        )
                    )
    if hazard_codes is not None and not _blank(signal_word):
        findings.extend(_check_signal_word(hazard_codes, h_text, signal_word))
    if hazard_codes is not None and not _blank(pictograms):
        findings.extend(_check_pictograms(hazard_codes, h_text, pictograms))
    return findings


def _fix_hint(exc: CellchemError) -> str | None:
    if exc.choices:
        return "one of " + ", ".join(exc.choices)
    return "copy the codes from SDS section 2"


def _check_signal_word(codes: list[str], h_text: object, signal_word: object) -> list[SdsFinding]:
    try:
        word = read_signal_word(signal_word)
    except CellchemError as exc:
        return [SdsFinding(ERROR, "signal word", str(exc), "Danger, Warning or '-'")]
    entries = [_statements()[code] for code in codes]
    try:
        allowed, reason, deciding = _signal_judgement(entries)
    except CellchemError as exc:
        return [SdsFinding(NOTE, "signal word", f"signal word {_quote(signal_word)} not checked: {exc}")]
    statements = _quote(h_text)
    if word in allowed:
        if deciding is not None:
            return [
                SdsFinding(
                    NOTE,
                    "signal word",
                    f"signal word {_quote(signal_word)} accepted for {statements}: {reason}",
                )
            ]
        return []
    if word == "":
        wanted = " or ".join(sorted(allowed))
        return [
            SdsFinding(
                ERROR,
                "signal word",
                f"no signal word ({_quote(signal_word)}) for the hazard statements {statements}, which need"
                f" {wanted}: {reason}",
                wanted,
            )
        ]
    if allowed == frozenset({""}):
        return [
            SdsFinding(
                ERROR,
                "signal word",
                f"signal word {_quote(signal_word)} with the hazard statements {statements}, none of which"
                " carries a signal word",
                "'-' (no signal word), or check the hazard statements against the SDS",
            )
        ]
    (wanted,) = allowed
    return [
        SdsFinding(
            ERROR,
            "signal word",
            f"signal word {_quote(signal_word)} does not fit the hazard statements {statements}, which"
            f" need {wanted}: {reason}",
            wanted,
        )
    ]


def _check_pictograms(codes: list[str], h_text: object, pictograms: object) -> list[SdsFinding]:
    try:
        shown = read_pictograms(pictograms)
    except CellchemError as exc:
        return [SdsFinding(ERROR, "pictograms", str(exc), "GHS01 to GHS09, as in SDS section 2")]
    try:
        required, allowed = expected_pictograms(codes)
    except CellchemError as exc:
        return [SdsFinding(NOTE, "pictograms", f"pictograms {_quote(pictograms)} not checked: {exc}")]
    findings = []
    missing = sorted(required - shown)
    if missing:
        sources = {
            pictogram: [
                c
                for c in dict.fromkeys(codes)
                if any(pictogram in r for r in _statements()[c].pictograms or ())
            ]
            for pictogram in missing
        }
        why = "; ".join(f"{p} for {', '.join(sources[p])}" for p in missing)
        findings.append(
            SdsFinding(
                ERROR,
                "pictograms",
                f"pictograms {_quote(pictograms)} lack {', '.join(missing)} that the hazard statements"
                f" {_quote(h_text)} call for ({why})",
                "add " + ", ".join(missing) + " if SDS section 2 shows it",
            )
        )
    extra = sorted(shown - allowed)
    if extra:
        findings.append(
            SdsFinding(
                WARNING,
                "pictograms",
                f"pictograms {_quote(pictograms)} include {', '.join(extra)}, which none of the hazard"
                f" statements {_quote(h_text)} carries",
                "check the pictograms and the hazard statements against SDS section 2",
            )
        )
    return findings
