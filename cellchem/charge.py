"""Charge balance, oxidation states and net charge.

A formula is read as the ions that make it up: the top-level items of each
part (atoms and bracketed groups, as written) are split into consecutive runs,
and each run must be a whole number of one catalog ion (so ``NH4NO3`` is
NH4+ and NO3-, ``CH3COONa`` is acetate and Na+, ``Fe3O4`` is Fe2+, 2 Fe3+ and
4 O2-). Among the readings whose charges sum to the formula's charge, the one
chosen uses (in this order of preference) the fewest homonuclear anions (O2 2-,
S2 2-, N3-: SnS2 is Sn4+ with sulfide, not Sn2+ with disulfide), no mixed
valence, and the fewest ions (NaHCO3 is Na+ and HCO3-, not Na+, H+ and CO3 2-;
Hg2WO4 is Hg2 2+ and WO4 2-). Peroxide, superoxide and ozonide are read only
beside s-block cations (MnO2 is Mn4+ with oxide).

Formulas with no metal and no catalog ion reading (CO2, PCl5, C6H12O6) are
molecular: their oxidation states follow the usual rules (F -1; metals of one
common charge; H +1 with non-metals, -1 with metals; O -2; the most
electronegative remaining element takes its lowest common state; the last
element takes what balances the charge).

The splitting into runs and the rules for oxidation states are the charge
solver's (``cellchem.solver``); this module weighs its readings, explains them
and answers with them.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import cache, lru_cache
from itertools import product

from .elements import element
from .errors import ChemistryError
from .formula import Atom, Formula, Group, Item, Number, Part, render_items
from .ions import Ion, catalog, counts_key, ions_in
from .reading import as_formula, canonical, parse_formula
from .solver import (
    _CARBIDE_LIKE as _CARBIDES,
)
from .solver import (
    Option,
    Share,
    barred_anions,
    bars_carbide,
    best_reading,
    covered,
    item_counts,
    readings_by_charge,
    rule_states,
)
from .tables import read_table

ELEMENT = "element"
IONIC = "ionic"
MOLECULAR = "molecular"
ORGANIC = "organic"
RADICAL = "radical"
ESTABLISHED = "established"
UNBALANCED = "unbalanced"

_NUMBER_WORDS = "zero one two three four five six seven eight nine ten eleven twelve".split()


def _word(n: Number) -> str:
    if isinstance(n, int) and 0 <= n < len(_NUMBER_WORDS):
        return _NUMBER_WORDS[n]
    return str(n)


@dataclass(frozen=True)
class ChargeBalance:
    """The result of ``charge_balance``.

    Attributes:
        balanced: True when some assignment of catalog charges (or, for a
            molecular compound, of oxidation states) sums to the formula's charge.
        kind: ``'ionic'``, ``'molecular'``, ``'element'``, ``'unbalanced'``,
            ``'organic'``: a carbon compound that reads neither as catalog ions nor
            by the oxidation-state rules, for which charge balance is not
            applicable (``balanced`` is False, and it is no error of the formula),
            ``'radical'``: an organic formula with an odd number of electrons,
            a radical or a typing slip (``balanced`` is False), or
            ``'established'``: a compound of the name tables that reads as no
            simple ions (CaSi2, Pr6O11); ``balanced`` is True, its charges
            are not checked.
        charges: the assignment, as Shares in formula order (empty if none).
        explanation: one line saying what was found, or why not.
    """

    balanced: bool
    kind: str
    charges: tuple[Share, ...]
    explanation: str

    def __bool__(self) -> bool:
        return self.balanced


# Anions that do not stand with H+ alone: NH3 is not N3- with 3 H+, H2O2 not
# peroxide with 2 H+, CH3OH not methanolate with H+ (common practice).
_NOT_ACID_ANIONS = frozenset("O N C P Si B Ge As Sb H".split())


def _acceptable_without_metal(path: tuple[Option, ...]) -> bool:
    """For a formula with no element that forms a catalog cation: the ionic
    reading stands unless its only cations are H+ and its anion is one that
    does not make an acid with H+."""
    shares = [share for opt in path for share in opt.shares if share.ion is not None]
    cations = [s.ion for s in shares if s.charge > 0]
    if any(ion is not None and ion.text != "H" for ion in cations):
        return True
    for share in shares:
        ion = share.ion
        if ion is None or ion.charge > 0:
            continue
        symbols = tuple(ion.formula.counts)
        if len(symbols) == 1 and ((ion.is_monatomic and symbols[0] in _NOT_ACID_ANIONS) or symbols[0] == "O"):
            return False
        if ion.name.endswith("olate"):
            return False
    return True


@lru_cache(maxsize=1024)
def _forms_cation(symbol: str) -> bool:
    """True for an element with a monatomic cation in the catalog (other than H)."""
    if symbol == "H":
        return False
    return element(symbol).is_metal or any(ion.charge > 0 for ion, _ in ions_in({symbol: 1}))


def _hydride_plausible(path: tuple[Option, ...]) -> bool:
    """Hydride H- stands beside metal cations only: AsH3 and GeH4 are
    molecular (arsane, germane), not As3+ or Ge4+ with hydride ions (common practice)."""
    shares = [share for opt in path for share in opt.shares if share.ion is not None]
    if not any(s.ion is not None and s.ion.text == "H" and s.charge < 0 for s in shares):
        return True
    for s in shares:
        ion = s.ion
        if ion is not None and ion.charge > 0 and ion.is_monatomic and not element(ion.text).is_metal:
            return False
    return True


def _has_metal(counts: dict[str, Number]) -> bool:
    return any(_forms_cation(s) for s in counts)


# Molecular readings with an odd number of electrons are radicals; only these
# are substances a store holds (common practice).
_STABLE_RADICALS = frozenset({(("N", 1), ("O", 1)), (("N", 1), ("O", 2)), (("Cl", 1), ("O", 2))})


def _electrons(counts: dict[str, Number], charge: int) -> Number:
    return sum(element(s).z * n for s, n in counts.items()) - charge


# ---------------------------------------------------------------------------
# The analysis
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class _PartReading:
    kind: str
    shares: tuple[Share, ...]
    path: tuple[Option, ...] = ()
    states: dict[str, Fraction] | None = None
    why: str = ""


def _scale(shares: tuple[Share, ...], factor: Number) -> tuple[Share, ...]:
    if factor == 1:
        return shares
    return tuple(Share(s.label, s.charge, _norm(s.count * factor), s.ion) for s in shares)


def _norm(x: Number) -> Number:
    if isinstance(x, Fraction) and x.denominator == 1:
        return int(x)
    return x


def _flatten(path: tuple[Option, ...]) -> tuple[Share, ...]:
    merged: dict[tuple[str, int], Share] = {}
    for opt in path:
        for share in opt.shares:
            key = (share.label, share.charge)
            if key in merged:
                old = merged[key]
                merged[key] = Share(old.label, old.charge, old.count + share.count, old.ion)
            else:
                merged[key] = share
    return tuple(merged.values())


@lru_cache(maxsize=16384)
def _read_part(part: Part, target: int, adduct: bool) -> _PartReading:
    if part.is_water and adduct:
        return _PartReading(IONIC, (Share("H2O", 0, 1, None),))
    counts = item_counts(part.items)
    solution = best_reading(part.items, target)
    metal = _has_metal(counts)
    if target and solution is None:
        same = [ion for ion, k in ions_in(counts) if k == 1 and ion.charge != target]
        if same:
            named = " or ".join(f"{ion.name} {ion.label}" for ion in same)
            return _PartReading(
                UNBALANCED, (), (), None, f"{render_items(part.items)} is {named}, not of charge {target:+d}"
            )
    whole_ion = target != 0 and solution is not None and len(_flatten(solution[1])) == 1
    plausible = solution is not None and _hydride_plausible(solution[1])
    if plausible and solution is not None and (metal or whole_ion or _acceptable_without_metal(solution[1])):
        return _PartReading(IONIC, _flatten(solution[1]), solution[1])
    organic = "C" in counts and "H" in counts
    if metal and not adduct:
        by_counts = _salt_by_counts(counts_key(counts), target)
        if by_counts is not None:
            return _PartReading(IONIC, by_counts, (Option(0, len(part.items), target, (0, 0, 0), by_counts),))
    if adduct and len(counts) == 1 and counts_key(counts) not in _ELEMENT_MOLECULES:
        ((symbol, n),) = counts.items()
        hint = " (the digit 0 typed for the letter O?)" if symbol == "H" and "0" in str(n) else ""
        return _PartReading(
            UNBALANCED,
            (),
            (),
            None,
            f"{render_items(part.items)} is not a molecule of {element(symbol).name}{hint}",
        )
    if "C" in counts and target == 0 and _bonds_short(counts):
        return _PartReading(
            UNBALANCED,
            (),
            (),
            None,
            f"{render_items(part.items)} has more hydrogen and halogen atoms than its carbon skeleton can"
            " bind (no molecule has this formula; check the counts)",
        )
    true_metal = any(element(s).is_metal for s in counts)
    if not metal or adduct or not true_metal:
        states = rule_states(counts, target)
        odd = _electrons(counts, target) % 2 == 1 and counts_key(counts) not in _STABLE_RADICALS
        if states is not None and not odd:
            return _PartReading(MOLECULAR, (), (), states)
    if organic and _odd_closed_shell(counts, target):
        return _PartReading(RADICAL, (), (), None, _why_radical(part))
    if organic:
        return _PartReading(ORGANIC, (), (), None, _why_organic(part, counts, metal))
    return _PartReading(UNBALANCED, (), (), None, _why_not(part, target))


# Elements as molecules in an adduct part (KI·I2, S8, P4): anything else of one element after
# a dot is a typing slip (MgSO4·7H20): common practice.
_ELEMENT_MOLECULES = frozenset(
    counts_key({s: n})
    for s, n in (
        ("H", 2),
        ("N", 2),
        ("O", 2),
        ("O", 3),
        ("F", 2),
        ("Cl", 2),
        ("Br", 2),
        ("I", 2),
        ("S", 8),
        ("P", 4),
    )
)

# Bonds each atom makes at most in a neutral organic molecule (C, Si 4; B 3; O, S 2 (6 for
# S in sulfones, counted at its largest); H and halogens 1): when even these leave fewer than
# zero rings and double bonds, no molecule has the formula (rings-plus-double-bonds count,
# any organic chemistry text). N and P are left out (quaternary salts bind one more).
_MOST_BONDS = {"C": 4, "Si": 4, "B": 3, "O": 2, "S": 6, "Se": 2, "H": 1, "F": 1, "Cl": 1, "Br": 1, "I": 1}


def _bonds_short(counts: dict[str, Number]) -> bool:
    if not set(counts) <= set(_MOST_BONDS) or any(not isinstance(n, int) for n in counts.values()):
        return False
    return 2 + sum(n * (_MOST_BONDS[s] - 2) for s, n in counts.items()) < 0


# Cations with no unpaired electrons in their salts (s-block, Al, Ga, In, Zn, Cd, Ag, Sc, Y,
# La): beside them, an organic formula with an odd number of electrons is a radical or a
# typing slip (common practice). Salts of iron, copper and the like have unpaired electrons
# and are not judged so.
_CLOSED_SHELL = frozenset("Li Na K Rb Cs Be Mg Ca Sr Ba Al Ga In Zn Cd Ag Sc Y La".split())
_NON_METAL_PARTS = frozenset("H B C N O F Si P S Cl Se Br I".split())


def _odd_closed_shell(counts: dict[str, Number], target: int) -> bool:
    if any(not isinstance(n, int) for n in counts.values()):
        return False
    if not set(counts) <= (_CLOSED_SHELL | _NON_METAL_PARTS):
        return False
    return _electrons(counts, target) % 2 == 1


def _why_radical(part: Part) -> str:
    text = render_items(part.items)
    return (
        f"{text} has an odd number of electrons: a radical (a few, such as TEMPO and DPPH, are sold)"
        " or a typing slip in a count (check the hydrogen count)"
    )


@cache
def _anions_by_elements() -> dict[frozenset[str], list[Ion]]:
    """Catalog anions (single parts) by their set of elements, for the counts
    reading: never a homonuclear anion (peroxide, superoxide, acetylide,
    disulfide, azide, triiodide), carbide, nitride or hydride, which the
    reading of runs weighs with its own rules."""
    table: dict[frozenset[str], list[Ion]] = {}
    for ion in catalog():
        counts = ion.formula.counts
        homonuclear = len(counts) == 1 and next(iter(counts.values())) != 1
        if homonuclear or (len(counts) == 1 and ion.text in ("C", "N", "H")):
            continue
        if ion.charge < 0 and len(ion.formula.parts) == 1:
            table.setdefault(frozenset(ion.formula.counts), []).append(ion)
    return table


@lru_cache(maxsize=4096)
def _salt_by_counts(key: tuple[tuple[str, Number], ...], target: int) -> tuple[Share, ...] | None:
    """A salt read from element counts alone, as safety data sheets print
    formulas in Hill order (C2H3NaO2 is sodium acetate, C8H5KO4 potassium
    hydrogen phthalate, C2Na2O4 sodium oxalate) and sometimes with the water
    of crystallisation counted in (H25Na2O16P is Na2HPO4·12H2O): metal
    cations, ammonium if needed, one kind of catalog anion that takes up the
    other atoms, and whole water molecules. None when no such reading, or more
    than one, exists."""
    counts = dict(key)
    metals = {s: n for s, n in counts.items() if s != "H" and _forms_cation(s) and element(s).is_metal}
    if not metals or any(not isinstance(n, int) for n in counts.values()):
        return None
    barred = barred_anions(counts)  # the partner rules of the solver hold here too
    rest = {s: n for s, n in counts.items() if s not in metals}
    most_water = min(rest.get("H", 0) // 2, rest.get("O", 0), 30)
    for water in range(most_water + 1):
        # the reading with the least water counted in is taken (C6H7KO2 is potassium
        # sorbate, not potassium phenolate and a water)
        found: dict[tuple, tuple[Share, ...]] = {}
        for ammonium in range(0, min(rest.get("N", 0), (rest.get("H", 0) - 2 * water) // 4) + 1):
            left = dict(rest)
            if water:
                left["H"] -= 2 * water
                left["O"] -= water
            if ammonium:
                left["N"] -= ammonium
                left["H"] -= 4 * ammonium
            left = {s: n for s, n in left.items() if n}
            if not left:
                continue
            first = next(iter(left))
            for anion in _anions_by_elements().get(frozenset(left), []):
                if anion.text in barred:
                    continue
                a_counts = anion.formula.counts
                m, r = divmod(left[first], a_counts[first])
                if r or m == 0 or any(left[s] != m * a_counts[s] for s in a_counts):
                    continue
                need = target - m * anion.charge - ammonium
                for charges in _metal_charges(tuple(metals.items()), need):
                    shares = [Share(ion.label, ion.charge, n, ion) for ion, n in charges]
                    if ammonium:
                        nh4 = next(i for i, k in ions_in({"N": 1, "H": 4}) if k == 1 and i.charge == 1)
                        shares.append(Share(nh4.label, 1, ammonium, nh4))
                    shares.append(Share(anion.label, anion.charge, m, anion))
                    if water:
                        shares.append(Share(_MERGED_WATER, 0, water, None))
                    found[tuple((x.label, x.count) for x in shares)] = tuple(shares)
        if found:
            return next(iter(found.values())) if len(found) == 1 else None
    return None


# the water of crystallisation counted into a formula (H25Na2O16P for Na2HPO4·12H2O)
_MERGED_WATER = "H2O (counted into the formula)"


def water_counted_in(formula: str | Formula) -> Number | None:
    """The water of crystallisation a salt's formula holds when it is written with the
    water counted in (CaCl2H4O2 is CaCl2·2H2O: 2), read from its element counts: 0 when
    it reads as a salt without water, None when it reads as no salt.

    >>> water_counted_in("CuH10O9S"), water_counted_in("NaCl"), water_counted_in("C2H6O")
    (5, 0, None)
    """
    f = as_formula(formula)
    if len(f.parts) != 1 or f.has_unknown_count:
        return None
    shares = _salt_by_counts(counts_key(f.counts), f.charge)
    if shares is None:
        return None
    return sum(x.count for x in shares if x.label == _MERGED_WATER)


def _metal_charges(metals: tuple[tuple[str, Number], ...], total: int) -> list[list[tuple[Ion, Number]]]:
    """Each way of giving every metal atom one catalog charge (all atoms of an
    element alike) so that the charges sum to ``total``."""
    choices = [[(ion, n) for ion in _cation_species(s) if ion.is_monatomic] for s, n in metals]
    out = []
    for combo in product(*choices):
        if sum(ion.charge * n for ion, n in combo) == total:
            out.append(list(combo))
    return out


def _why_organic(part: Part, counts: dict[str, Number], metal: bool) -> str:
    text = render_items(part.items)
    if metal:
        return (
            f"{text} is an organic compound: no anion of the catalog, with the metal cations, accounts for"
            " its atoms, so charge balance is not applicable (check it by its molar mass and name)"
        )
    return f"{text} is an organic compound; charge balance is not applicable (check it by its molar mass)"


def _fmt_state(value: Fraction) -> str:
    if value.denominator == 1:
        return f"{int(value):+d}" if value else "0"
    return f"{'+' if value > 0 else '-'}{abs(value.numerator)}/{value.denominator}"


def _why_not(part: Part, target: int) -> str:
    items = part.items
    text = render_items(items)
    counts = item_counts(items)
    reach = covered(items, _CARBIDES if bars_carbide(counts) else frozenset())
    if reach < len(items):
        rest = render_items(items[reach:])
        before = render_items(items[:reach])
        after = f" after '{before}'" if before else ""
        return f"no ion in the catalog matches '{rest}'{after}, so {text} cannot be split into ions"
    # closest reading: smallest |charge - target|
    sols = {**readings_by_charge(items, False, False, True, barred_anions(counts))}
    charge = min(sols, key=lambda c: (abs(c - target), sols[c][0]))
    shares = _flatten(sols[charge][1])
    phrases = []
    for share in shares:
        ion = share.ion
        if ion is None:
            continue
        if share.charge > 0 and ion.is_monatomic:
            symbol = next(iter(ion.formula.counts))
            choices = [i for i, _ in ions_in({symbol: 1}) if i.charge > 0]
            el = element(symbol)
            if len(choices) == 1:
                phrases.append(f"{el.name} forms only {choices[0].label}")
            else:
                phrases.append(f"{el.name} forms " + " or ".join(i.label for i in choices))
        else:
            total = share.charge * share.count
            sign = "+" if total > 0 else "-"
            noun = ion.name + (" ion" if share.count == 1 else " ions")
            verb = "carries" if share.count == 1 else "carry"
            phrases.append(f"{_word(share.count)} {noun} {verb} {abs(total)}{sign}")
    want = "neutral" if target == 0 else f"of charge {target:+d}"
    if not phrases:
        return f"no assignment of catalog charges makes {text} {want}"
    return "; ".join(phrases)


def _share_phrase(share: Share) -> str:
    return share.label if share.count == 1 else f"{share.count} {share.label}"


def _cation_species(symbol: str) -> list[Ion]:
    """Catalog cations made of this element alone (Hg2+ and Hg2 2+ for mercury)."""
    return [ion for ion in catalog() if ion.charge > 0 and tuple(ion.formula.counts) == (symbol,)]


def _explain_ionic(text: str, shares: tuple[Share, ...]) -> str:
    ordered = [s for s in shares if s.charge > 0] + [s for s in shares if s.charge <= 0]
    body = " + ".join(_share_phrase(s) for s in ordered if s.charge or s.ion or s.label == _MERGED_WATER)
    notes = []
    by_element: dict[str, set[int]] = {}
    for s in shares:
        ion = s.ion
        if ion is None:
            continue
        if ion.is_homonuclear:
            notes.append(f"it holds the {ion.name} ion {ion.label}")
        if ion.is_monatomic and ion.charge > 0:
            symbol = next(iter(ion.formula.counts))
            if len(_cation_species(symbol)) > 1:
                by_element.setdefault(symbol, set()).add(ion.charge)
    for symbol, charges in by_element.items():
        name = element(symbol).name
        if len(charges) == 1:
            notes.append(f"{name} is {_fmt_state(Fraction(next(iter(charges))))}")
        else:
            notes.append(
                f"mixed valence: {name} is " + " and ".join(_fmt_state(Fraction(c)) for c in sorted(charges))
            )
    return f"{text}: {body}" + (f" ({'; '.join(notes)})" if notes else "")


def _merge(shares: list[Share]) -> tuple[Share, ...]:
    merged: dict[tuple[str, int], Share] = {}
    for share in shares:
        key = (share.label, share.charge)
        old = merged.get(key)
        if old is None:
            merged[key] = share
        elif isinstance(old.count, str) or isinstance(share.count, str):
            merged[key] = Share(old.label, old.charge, "x", old.ion)  # type: ignore[arg-type]
        else:
            merged[key] = Share(old.label, old.charge, _norm(old.count + share.count), old.ion)
    return tuple(merged.values())


@lru_cache(maxsize=16384)
def _analyse(formula: Formula) -> ChargeBalance:
    text = formula.text()
    if any(s in _ISOTOPES for s in formula.counts):
        # D and T stand where H would (D2O, CDCl3, NaOD): balance the protium formula
        protium = _protium(formula)
        plain = _analyse(protium)
        explanation = plain.explanation.replace(protium.text(), text, 1)
        return ChargeBalance(plain.balanced, plain.kind, plain.charges, explanation)
    counts = formula.counts
    if len(counts) == 1 and len(formula.parts) == 1 and not formula.charge:
        return ChargeBalance(
            True, ELEMENT, (Share(text, 0, 1, None),), f"{text} is an element (oxidation state 0)"
        )
    shares: list[Share] = []
    molecular: list[str] = []
    for i, part in enumerate(formula.parts):
        target = formula.charge if i == 0 else 0
        reading = _read_part(part, target, i > 0)
        if reading.kind == UNBALANCED:
            where = f"the part '{render_items(part.items)}' of {text}" if len(formula.parts) > 1 else text
            return ChargeBalance(False, UNBALANCED, (), f"{where} is not balanced: {reading.why}")
        if reading.kind in (ORGANIC, RADICAL):
            where = f" (in {text})" if len(formula.parts) > 1 else ""
            return ChargeBalance(False, reading.kind, (), reading.why + where)
        if part.multiplier is None:
            factor: Number = 1
        else:
            factor = part.multiplier
        if reading.kind == MOLECULAR:
            assert reading.states is not None
            states = ", ".join(f"{s} {_fmt_state(v)}" for s, v in reading.states.items())
            molecular.append(states if len(formula.parts) == 1 else f"{render_items(part.items)} ({states})")
            shares.append(
                Share(
                    render_items(part.items),
                    0 if i else formula.charge,
                    factor if part.multiplier is not None else "x",
                    None,
                )
            )  # type: ignore[arg-type]
        else:
            scaled = (
                _scale(reading.shares, factor)
                if part.multiplier is not None
                else tuple(
                    Share(s.label, s.charge, "x", s.ion)
                    for s in reading.shares  # type: ignore[arg-type]
                )
            )
            shares.extend(scaled)
    merged = _merge(shares)
    ionic_shares = tuple(s for s in merged if s.ion is not None)
    if molecular and not ionic_shares:
        return ChargeBalance(
            True,
            MOLECULAR,
            merged,
            f"{text} is molecular (no ions of the catalog): oxidation states"
            f" {'; '.join(molecular)} sum to {formula.charge}",
        )
    explanation = _explain_ionic(text, tuple(s for s in merged if s.count != "x"))
    if molecular:
        explanation += "; with the molecular part " + "; ".join(molecular)
    return ChargeBalance(True, IONIC, merged, explanation)


_ISOTOPES = frozenset({"D", "T"})


def _protium_item(item: Item) -> Item:
    if isinstance(item, Atom):
        return Atom("H", item.count) if item.symbol in _ISOTOPES else item
    return Group(tuple(_protium_item(i) for i in item.items), item.count, item.bracket)


def _protium(formula: Formula) -> Formula:
    """The formula with D and T written as H."""
    parts = tuple(Part(tuple(_protium_item(i) for i in p.items), p.multiplier) for p in formula.parts)
    return canonical(Formula(parts, formula.charge))


@cache
def _established_formulas() -> frozenset[tuple]:
    """Anhydrous counts of the compounds the name tables list (established_compounds.csv,
    named_compounds.csv, trivial_names.csv): real compounds, some of which read as no simple
    ions (CaSi2, MoSi2, Pr6O11, Fremy's salt)."""
    keys = set()
    for table in ("established_compounds.csv", "named_compounds.csv", "trivial_names.csv"):
        for row in read_table(table):
            keys.add(counts_key(parse_formula(row["formula"]).anhydrous().counts))
    return frozenset(keys)


def _known_compound(formula: Formula, found: ChargeBalance) -> ChargeBalance:
    """An unbalanced or organic verdict on a compound the name tables list is replaced by
    'established': the compound is real; its charges are not checked."""
    if found.kind not in (UNBALANCED, ORGANIC, RADICAL) or formula.charge:
        return found
    if counts_key(formula.anhydrous().counts) not in _established_formulas():
        return found
    text = formula.text()
    return ChargeBalance(
        True,
        ESTABLISHED,
        (),
        f"{text} is a compound of cellchem's established-compounds tables that does not read as simple"
        " catalog ions (an intermetallic, a mixed-valence oxide or a radical salt): its charges are not"
        " checked",
    )


def charge_balance(formula: str | Formula) -> ChargeBalance:
    """Is the formula neutral (or of its written charge) for some assignment
    of catalog charges?

    Args:
        formula: text or a parsed Formula.

    Returns:
        A ChargeBalance with ``balanced``, ``kind``, ``charges`` and ``explanation``.

    Raises:
        CellchemError: the formula cannot be read.

    >>> charge_balance("FeCl3").explanation
    'FeCl3: Fe3+ + 3 Cl- (iron is +3)'
    >>> charge_balance("NaCl2").explanation
    'NaCl2 is not balanced: sodium forms only Na+; two chloride ions carry 2-'
    """
    f = as_formula(formula)
    return _known_compound(f, _analyse(f))


def net_charge(formula: str | Formula) -> int:
    """The net charge of an ion or compound.

    The charge written in the formula when there is one (and it must be one
    the formula can carry). With no charge written: 0 for an element, or for
    a formula that balances as neutral and is no catalog ion; the charge of
    the one catalog ion the formula is when it is not neutral (SO4 is
    sulfate). A formula that is both (SO3: sulfur trioxide or sulfite) or
    several ions (MnO4) is refused with the readings listed.

    Raises:
        CellchemError: no charge is written and the formula is ambiguous, or
            neither neutral nor a catalog ion.

    >>> net_charge("SO4 2-")
    -2
    >>> net_charge("NH4")
    1
    """
    f = as_formula(formula)
    text = f.source or f.text()
    if f.charge:
        result = charge_balance(f)
        if not result.balanced:
            raise ChemistryError(
                f"'{text}' is written with charge {f.charge:+d}, which it cannot carry: "
                + result.explanation,
                text=text,
            )
        return f.charge
    if len(f.counts) == 1 and len(f.parts) == 1:
        return 0  # an element, even when it shares its formula with an ion (O2, Hg2)
    whole: list[Ion] = []
    if len(f.parts) == 1 and not f.has_unknown_count:
        whole = [ion for ion, k in ions_in(f.counts) if k == 1]
    neutral = charge_balance(f)
    if neutral.balanced and not whole:
        return 0
    if not neutral.balanced and len(whole) == 1:
        return whole[0].charge
    if whole:
        readings = ([f"neutral {text}"] if neutral.balanced else []) + [
            f"{ion.label} ({ion.name})" for ion in whole
        ]
        raise ChemistryError(
            f"'{text}' has no charge written and reads as more than one species: "
            + ", ".join(readings[:-1])
            + " or "
            + readings[-1]
            + "; write the charge",
            text=text,
            choices=(("0",) if neutral.balanced else ()) + tuple(ion.label for ion in whole),
        )
    raise ChemistryError(
        f"'{text}' has no charge written and is not neutral: {neutral.explanation}", text=text
    )


def _species_states(share: Share, path: tuple[Option, ...]) -> list[tuple[str, Fraction, Number]]:
    """(symbol, state, atoms) for one share of an ionic reading."""
    ion = share.ion
    out: list[tuple[str, Fraction, Number]] = []
    if ion is None:
        return out
    counts = ion.formula.counts
    if ion.is_monatomic or ion.is_homonuclear:
        symbol = next(iter(counts))
        return [(symbol, Fraction(ion.charge, counts[symbol]), counts[symbol] * share.count)]
    if ion.is_complex:
        group = ion.formula.parts[0].items[0]
        assert isinstance(group, Group)
        sol = readings_by_charge(group.items, True, False, False).get(ion.charge) or readings_by_charge(
            group.items, True, True, False
        ).get(ion.charge)
        if sol is not None:
            for sub in sol[1]:
                out.extend(_option_states(sub, share.count))
            return out
    states = rule_states(counts, ion.charge)
    if states is None:
        raise ChemistryError(f"the oxidation states in {ion.label} ({ion.name}) cannot be assigned by rule")
    return [(s, v, counts[s] * share.count) for s, v in states.items()]


def _option_states(opt: Option, factor: Number) -> list[tuple[str, Fraction, Number]]:
    out: list[tuple[str, Fraction, Number]] = []
    if opt.inner:
        for share in opt.shares:
            for sub in opt.inner:
                out.extend(_option_states(sub, factor * share.count))
        return out
    for share in opt.shares:
        if share.ion is None:
            # a neutral ligand read by rule
            continue
        out.extend(_species_states(Share(share.label, share.charge, share.count * factor, share.ion), ()))
    for share in opt.shares:
        if share.ion is None and share.charge == 0:
            run_counts = {}
            # neutral ligand: states by rule
            lig = parse_formula(share.label)
            states = rule_states(lig.counts, 0) or {}
            for s, v in states.items():
                run_counts[s] = v
                out.append((s, v, lig.counts[s] * share.count * factor))
    return out


def _atoms(n: Number) -> str:
    n = _norm(Fraction(n))
    return f"{_word(n)} atom" + ("" if n == 1 else "s")


def oxidation_state(formula: str | Formula, symbol: str, mean: bool = False) -> int | Fraction:
    """The oxidation state of an element in a formula.

    Args:
        formula: text or a parsed Formula (``'KMnO4'``, ``'[Fe(CN)6]4-'``).
        symbol: the element symbol, e.g. ``'Mn'``.
        mean: when the element's atoms differ (Fe3O4) or the rules give a
            fraction (S4O6 2-), return the mean as a Fraction instead of
            refusing.

    Returns:
        An int, or with ``mean=True`` possibly a Fraction.

    Raises:
        CellchemError: the element is not in the formula, the formula does
            not balance, or the atoms differ and ``mean`` is False.

    >>> oxidation_state("KMnO4", "Mn")
    7
    >>> oxidation_state("Fe3O4", "Fe", mean=True)
    Fraction(8, 3)
    """
    f = as_formula(formula)
    el = element(symbol)
    text = f.source or f.text()
    if el.symbol not in f.counts:
        raise ChemistryError(f"{el.symbol} is not in '{text}'", text=text)
    result = charge_balance(f)
    if not result.balanced:
        raise ChemistryError(
            f"no oxidation state of {el.symbol} in '{text}': {result.explanation}", text=text
        )
    pieces: list[tuple[Fraction, Number]] = []
    if result.kind == ELEMENT:
        return 0
    for i, part in enumerate(f.parts):
        reading = _read_part(part, f.charge if i == 0 else 0, i > 0)
        factor = part.multiplier if part.multiplier is not None else 1
        if reading.kind == MOLECULAR:
            assert reading.states is not None
            if el.symbol in reading.states:
                n = item_counts(part.items)[el.symbol] * factor
                pieces.append((reading.states[el.symbol], n))
            continue
        for opt in reading.path:
            for s, v, n in _option_states(opt, factor):
                if s == el.symbol:
                    pieces.append((v, n))
        if part.is_water and i > 0:
            if el.symbol == "H":
                pieces.append((Fraction(1), 2 * factor))
            elif el.symbol == "O":
                pieces.append((Fraction(-2), factor))
    distinct = sorted({v for v, _ in pieces})
    total_atoms = sum(n for _, n in pieces)
    average = sum(v * n for v, n in pieces) / total_atoms
    if len(distinct) == 1 and distinct[0].denominator == 1:
        return int(distinct[0])
    if mean:
        return _norm(Fraction(average))
    if len(distinct) > 1:
        listing = " and ".join(
            f"{_fmt_state(v)} ({_atoms(sum(n for w, n in pieces if w == v))})" for v in distinct
        )
        raise ChemistryError(
            f"{el.name} has more than one oxidation state in '{text}': {listing};"
            f" pass mean=True for the mean, {_fmt_state(Fraction(average))}",
            text=text,
        )
    raise ChemistryError(
        f"the oxidation state of {el.symbol} in '{text}' is not a whole number"
        f" (mean {_fmt_state(distinct[0])}); pass mean=True to accept the mean",
        text=text,
    )


__all__ = [
    "ORGANIC",
    "Atom",
    "ChargeBalance",
    "Share",
    "charge_balance",
    "net_charge",
    "oxidation_state",
    "rule_states",
    "water_counted_in",
]
