"""The charge solver: every reading of a formula part's items as runs of
catalog ions, and oxidation states by rule.

The top-level items of a part (atoms and bracketed groups, as written) are
split into consecutive runs, and each run must be a whole number of one
catalog ion. ``readings_by_charge`` gives, for every total charge the items
can carry, the best reading by the preferences ``cellchem.charge`` documents
(fewest homonuclear anions, no mixed valence, fewest ions); ``best_reading``
the one of a given charge. ``rule_states`` gives the oxidation states of a
species by the usual rules. ``cellchem.charge`` builds charge balance,
oxidation states and net charge on these; ``cellchem.reading`` the
cations-first order of a formula's canonical text.
"""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache

from .elements import element
from .formula import Group, Item, Number, render_items
from .ions import Ion, ions_in


@dataclass(frozen=True)
class Share:
    """One species of a charge assignment.

    Attributes:
        label: how it is written (``'Fe3+'``, ``'SO4 2-'``, ``'H2O'``).
        charge: charge of one of them.
        count: how many per formula unit.
        ion: the catalog ion, or None for water and neutral parts.
    """

    label: str
    charge: int
    count: Number
    ion: Ion | None = None


# ---------------------------------------------------------------------------
# Reading a part as ions
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Option:
    """One run of items read as ions: items ``start:end`` carry ``charge`` as ``shares``."""

    start: int
    end: int
    charge: int
    score: tuple[int, int, int]  # homonuclear ions, mixed valence, number of ions
    shares: tuple[Share, ...]
    inner: tuple[Option, ...] = ()  # for a bracketed group read from its contents


def item_counts(items: tuple[Item, ...]) -> dict[str, Number]:
    """Element counts of a run of items."""
    total: dict[str, Number] = {}
    for item in items:
        for s, n in item.counts().items():
            total[s] = total.get(s, 0) + n
    return total


def _add(a: tuple[int, int, int], b: tuple[int, int, int]) -> tuple[int, int, int]:
    return (a[0] + b[0], a[1] + b[1], a[2] + b[2])


def _compositions(n: int, k: int):
    """All ways to write n as k non-negative parts."""
    if k == 1:
        yield (n,)
        return
    for first in range(n + 1):
        for rest in _compositions(n - first, k - 1):
            yield (first,) + rest


def _run_options(
    items: tuple[Item, ...],
    start: int,
    end: int,
    inside: bool,
    mixed: bool,
    barred: frozenset[str] = frozenset(),
) -> list[Option]:
    run = items[start:end]
    counts = item_counts(run)
    options: list[Option] = []
    for ion, k in ions_in(counts):
        if ion.charge < 0 and ion.text in barred:
            continue
        options.append(
            Option(
                start,
                end,
                ion.charge * k,
                (1 if ion.is_homonuclear and ion.charge < 0 else 0, 0, k),
                (Share(ion.label, ion.charge, k, ion),),
            )
        )
    if mixed and len(counts) == 1:
        ((symbol, n),) = counts.items()
        mono = [ion for ion, k in ions_in({symbol: 1})]
        if isinstance(n, int) and n >= 2 and len(mono) >= 2 and n <= 24:
            for combo in _compositions(n, len(mono)):
                if sum(1 for c in combo if c) < 2:
                    continue
                shares = tuple(Share(ion.label, ion.charge, c, ion) for ion, c in zip(mono, combo) if c)
                total = sum(ion.charge * c for ion, c in zip(mono, combo))
                options.append(Option(start, end, total, (0, 1, n), shares))
    if len(run) == 1 and isinstance(run[0], Group) and not options:
        group = run[0]
        for charge, best in readings_by_charge(group.items, True, mixed, True, _group_barred(barred)).items():
            score, path = best
            label = render_items((Group(group.items, 1, group.bracket),))
            shares = (Share(_label(label, charge), charge, group.count, None),)
            scaled = (score[0] * group.count, score[1] * group.count, group.count)
            options.append(Option(start, end, charge * group.count, scaled, shares, path))
        if inside and not options:
            states = rule_states(counts, 0)
            if states is not None:
                label = render_items(group.items)
                options.append(Option(start, end, 0, (0, 0, 0), (Share(label, 0, group.count, None),)))
    return options


def _label(text: str, charge: int) -> str:
    if not charge:
        return text
    magnitude = "" if abs(charge) == 1 else str(abs(charge))
    return text + magnitude + ("+" if charge > 0 else "-")


Solution = tuple[tuple[int, int, int], tuple[Option, ...]]


@lru_cache(maxsize=16384)
def readings_by_charge(
    items: tuple[Item, ...],
    inside: bool,
    mixed: bool,
    whole: bool = True,
    barred: frozenset[str] = frozenset(),
) -> dict[int, Solution]:
    """For every reachable total charge, the best reading of ``items``.

    ``whole=False`` leaves out the readings of all the items as one ion, to
    look inside a catalog complex ion at its metal and ligands. ``barred``: the
    anions not read here (``barred_anions``)."""
    n = len(items)
    dp: list[dict[int, Solution]] = [{} for _ in range(n + 1)]
    dp[0][0] = ((0, 0, 0), ())
    for i in range(n):
        if not dp[i]:
            continue
        for j in range(i + 1, n + 1):
            if not whole and i == 0 and j == n:
                continue
            options = _run_options(items, i, j, inside, mixed, barred)
            for charge, (score, path) in dp[i].items():
                for opt in options:
                    c = charge + opt.charge
                    s = _add(score, opt.score)
                    current = dp[j].get(c)
                    if current is None or s < current[0]:
                        dp[j][c] = (s, path + (opt,))
    return dp[n]


def covered(items: tuple[Item, ...], barred: frozenset[str] = frozenset()) -> int:
    """How many leading items some reading covers (for messages)."""
    n = len(items)
    reach = [False] * (n + 1)
    reach[0] = True
    best = 0
    for i in range(n):
        if not reach[i]:
            continue
        for j in range(i + 1, n + 1):
            if _run_options(items, i, j, False, False, barred):
                reach[j] = True
                best = max(best, j)
    return best


def best_reading(items: tuple[Item, ...], target: int) -> Solution | None:
    """The best reading of ``items`` as ions of total charge ``target`` (mixed
    valence only where nothing else gives it), or None."""
    barred = barred_anions(item_counts(items))
    found = readings_by_charge(items, False, False, True, barred).get(target)
    if found is None:
        found = readings_by_charge(items, False, True, True, barred).get(target)
    return found


# Carbide C4-, acetylide C2 2- and nitride N3- stand only in binary compounds
# (CaC2, Al4C3, Li3N, Mg3N2): a carbon compound of three or more elements is never split
# into them (C2H3NaO2 is sodium acetate, not an acetylide), nor a hydrocarbon (C2H2 and C6H6
# are molecules, not H+ and acetylide): common practice.
_CARBIDE_LIKE = frozenset({"C", "C2", "N"})


def bars_carbide(counts: dict[str, Number]) -> bool:
    """True where carbide, acetylide and nitride are not read (a carbon compound
    of three or more elements, or a hydrocarbon)."""
    return "C" in counts and (len(counts) > 2 or set(counts) == {"C", "H"})


# Peroxide, superoxide and ozonide stand with the s-block cations (Na2O2, BaO2,
# KO2, KO3) and zinc, cadmium and uranyl (ZnO2, CdO2, UO2O2 are sold), not with
# the other transition metals (MnO4 is not Mn2+ and two superoxide ions):
# common practice.
_OXO_PARTNERS = frozenset("H Li Na K Rb Cs Fr Be Mg Ca Sr Ba Ra Zn Cd U O".split())


def allows_oxo_ions(counts: dict[str, Number]) -> bool:
    """True where peroxide, superoxide and ozonide may be read (every element a partner of theirs)."""
    return all(s in _OXO_PARTNERS for s in counts)


def barred_anions(counts: dict[str, Number]) -> frozenset[str]:
    """The anions not read from a formula's items written out, by the partner rules above."""
    barred: set[str] = set()
    if not allows_oxo_ions(counts):
        barred |= {"O2", "O3"}
    if bars_carbide(counts):
        barred |= _CARBIDE_LIKE
    return frozenset(barred)


def _group_barred(barred: frozenset[str]) -> frozenset[str]:
    """Inside brackets the writer has grouped the ions: only the carbide rule still applies."""
    return barred & _CARBIDE_LIKE


# ---------------------------------------------------------------------------
# Oxidation states by rule
# ---------------------------------------------------------------------------


def _single_charge(symbol: str) -> int | None:
    charges = {ion.charge for ion, k in ions_in({symbol: 1}) if ion.charge > 0}
    return charges.pop() if len(charges) == 1 else None


def _state_range(symbol: str) -> tuple[int, int]:
    el = element(symbol)
    if symbol == "H":
        return (-1, 1)
    if symbol == "O":
        return (-2, 2)
    if symbol == "F":
        return (-1, 0)
    if symbol in ("He", "Ne", "Ar"):
        return (0, 0)
    if el.is_metal:
        return (0, 8)
    g = el.group or 0
    if g >= 13:
        return (g - 18, g - 10)
    return (-4, 8)


# H is -1 beside elements less electronegative than about 2.1 on the Pauling
# scale (B2H6, SiH4, BH4-, AlH4-), +1 otherwise (CH4, NH3, PH3, H2S): common practice.
_H_NEGATIVE_BELOW = 2.1


def rule_states(counts: dict[str, Number], charge: int) -> dict[str, Fraction] | None:
    """Oxidation states of a species by the usual rules, or None when the rules
    give a value outside an element's range (see module doc). A state may be
    a fraction: the mean over the atoms of that element. Where oxygen at -2
    leaves the last element out of range, one O-O (peroxido) pair at -1 each is
    tried for an ion (peroxydisulfate S2O8 2-: S +6), never for a neutral
    molecule."""
    found = _rule_states(counts, charge, 0)
    if found is None and charge and counts.get("O", 0) >= 2:
        found = _rule_states(counts, charge, 1)
    return found


def _rule_states(counts: dict[str, Number], charge: int, peroxide_pairs: int) -> dict[str, Fraction] | None:
    unknown = [s for s in counts]
    states: dict[str, Fraction] = {}
    if len(unknown) == 1:
        (s,) = unknown
        value = Fraction(charge) / counts[s]
        lo, hi = _state_range(s)
        return {s: value} if lo <= value <= hi else None

    def fix(symbol: str, value: Fraction | int) -> None:
        if symbol in unknown and len(unknown) > 1:
            states[symbol] = Fraction(value)
            unknown.remove(symbol)

    fix("F", -1)
    for s in list(unknown):
        if element(s).is_metal:
            single = _single_charge(s)
            if single is not None:
                fix(s, single)
    others = [element(s).electronegativity or 0.0 for s in counts if s != "H"]
    fix("H", 1 if any(en >= _H_NEGATIVE_BELOW for en in others) else -1)
    if "O" in unknown and len(unknown) > 1:
        n_o = counts["O"]
        fix("O", Fraction(-2 * n_o + 2 * peroxide_pairs, n_o) if peroxide_pairs else -2)
    while len(unknown) > 1:
        candidates = [s for s in unknown if not element(s).is_metal]
        if not candidates:
            return None
        s = max(candidates, key=lambda x: element(x).electronegativity or 0.0)
        lo, _ = _state_range(s)
        fix(s, lo)
    last = unknown[0]
    value = (Fraction(charge) - sum(states[s] * counts[s] for s in states)) / counts[last]
    lo, hi = _state_range(last)
    if not lo <= value <= hi:
        return None
    states[last] = value
    return {s: states[s] for s in counts}
