"""Which cell of a line is wrong: the line's four witnesses weighed against each other.

A stock-list line holds up to four independent witnesses of what it is: the name (read
by cellchem, or matched exactly to one substance of the substance table), the formula
cell, the molar-mass cell, and the CAS RN (through the substance table). Each says a
composition (element counts, water included) or, for the molar mass, a number that a
composition may match. The composition most witnesses agree on is the line's; a cell is
said to be wrong only when at least two other witnesses agree against it, and only that
cell gets a suggested value. When the witnesses split evenly, the disagreement is
reported with both sides and no value is suggested.

Witnesses that may not ground an error against another cell: a name matched only by a
synonym of a substance record, and a record the table marks uncertain (it is left out).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace

from .errors import CellchemError
from .formula import Formula
from .mass import molar_mass
from .names import as_ions, hydrate_word, name_from_formula, same_substance
from .reading import parse_formula
from .substances import Substance, by_composition, composition_key

NAME, FORMULA, MASS, CAS = "name", "formula", "molar_mass", "cas"
_LABEL = {NAME: "the name", FORMULA: "the formula", MASS: "the molar mass", CAS: "the CAS RN"}


@dataclass(frozen=True)
class Witness:
    """One witness of a line: what one cell says the line holds."""

    role: str
    formula: Formula
    said: str  # how the witness is quoted in a message
    grounds: bool = True  # may it, with another, ground an error against a third cell
    record: Substance | None = None


@dataclass(frozen=True)
class Dispute:
    """A cell the other witnesses agree against (``role``), or, with ``role`` '',
    a disagreement no majority settles ('?': one whose side rests only on a witness
    that may not ground an error, reported as a warning)."""

    role: str
    message: str
    suggestion: str = ""
    firm: bool = True  # False: the cell outvoted rests on a witness that grounds no error (a synonym)


# Ammonia solution is sold as NH3 and registered as "ammonium hydroxide" (CAS 1336-21-6, NH4OH):
# the two formulas name one product (common practice)
_AMMONIA_SOLUTION = frozenset({"H3N1", "H5N1O1"})


def _agree(a: Formula, b: Formula) -> bool:
    if composition_key(a) == composition_key(b):
        return True
    if {composition_key(a), composition_key(b)} <= _AMMONIA_SOLUTION:
        return True
    try:
        return same_substance(a, b)
    except CellchemError:
        return False


def _text(f: Formula) -> str:
    return f.text()


def weigh(
    witnesses: list[Witness],
    stated: float | None,
    mass_matches: Callable[[Formula], bool],
) -> list[Dispute]:
    """The disputes among a line's witnesses.

    Args:
        witnesses: the compositions the name, formula and CAS RN say (those present).
        stated: the stated molar mass, g/mol, or None.
        mass_matches: whether the stated molar mass agrees with a formula (the
            caller's tolerance and atomic-weight preset).

    Returns:
        The disputes, empty when every witness agrees.
    """
    if not witnesses:
        return []
    clusters: list[list[Witness]] = []
    for w in witnesses:
        for cluster in clusters:
            if _agree(cluster[0].formula, w.formula):
                cluster.append(w)
                break
        else:
            clusters.append([w])

    def support(cluster: list[Witness]) -> tuple[int, int]:
        grounding = sum(1 for w in cluster if w.grounds)
        mass = 1 if stated is not None and _matches(cluster[0].formula, mass_matches) else 0
        return grounding + mass, len(cluster) + mass

    if len(clusters) == 1:
        cluster = clusters[0]
        if stated is None or _matches(cluster[0].formula, mass_matches):
            return []
        # every composition witness agrees; the molar mass does not
        if sum(1 for w in cluster if w.grounds) >= 2:
            return [_mass_dispute(cluster, stated)]
        return []  # one witness against the mass: the caller reports it as either cell
    ranked = sorted(clusters, key=support, reverse=True)
    best, second = ranked[0], ranked[1]
    if support(best)[0] >= 2 and support(best) > support(second):
        out = []
        for cluster in ranked[1:]:
            for w in cluster:
                d = _against(w, best, stated, mass_matches)
                out.append(d if w.grounds else replace(d, firm=False))
        if stated is not None and not _matches(best[0].formula, mass_matches):
            out.append(_mass_dispute(best, stated))
        return out
    return [_split(ranked, stated, mass_matches)]


def _matches(f: Formula, mass_matches: Callable[[Formula], bool]) -> bool:
    try:
        return not f.has_unknown_count and mass_matches(f)
    except CellchemError:
        return False


def _agreeing(cluster: list[Witness], stated: float | None, mass_matches) -> str:
    parts = [w.said for w in cluster]
    if stated is not None and _matches(cluster[0].formula, mass_matches):
        parts.append(f"the molar mass {stated:g}")
    if len(parts) == 1:
        return parts[0]
    return ", ".join(parts[:-1]) + " and " + parts[-1]


def _best_formula(cluster: list[Witness]) -> Formula:
    """The formula to suggest: the name's or the formula cell's reading before a record's
    Hill formula (CuSO4·5H2O rather than CuH10O9S)."""
    for role in (NAME, FORMULA, CAS):
        for w in cluster:
            if w.role == role and w.formula.parts and (w.role != CAS or len(cluster) == 1):
                return w.formula
    return cluster[0].formula


def _against(w: Witness, best: list[Witness], stated: float | None, mass_matches) -> Dispute:
    truth = _best_formula(best)
    if w.role == FORMULA:
        truth = _as_written(w.formula, truth)
    agreeing = _agreeing(best, stated, mass_matches)
    said = f"{agreeing} agree on {_text(truth)}; {w.said} says {_text(w.formula)}"
    if w.role == FORMULA:
        return Dispute(FORMULA, said + ", so the formula is the cell to check", _text(truth))
    if w.role == NAME:
        try:
            suggestion = name_from_formula(truth)
        except CellchemError:
            suggestion = next((x.record.name for x in best if x.record is not None), "")
        return Dispute(NAME, said + ", so the name is the cell to check", suggestion)
    # the CAS RN belongs to another substance: which, and the right number where the table has it
    record = w.record
    assert record is not None
    named = [x.record.cas for x in best if x.record is not None and x.role == NAME]
    right = named or [s.cas for s in by_composition(truth) if s.certain]
    relation, shown = _relation(w.formula, truth)
    message = (
        f"CAS RN {record.cas} belongs to {record.name} ({shown or _record_text(w.formula)}){relation};"
        f" {agreeing}"
        f" agree on {_text(truth)}"
    )
    if len(right) == 1:
        message += f", whose CAS RN is {right[0]}"
    return Dispute(CAS, message, right[0] if len(right) == 1 else "")


def _record_text(f: Formula) -> str:
    """A record's Hill formula as the rules write it where it reads as one salt (CHNaO3 is
    NaHCO3); as the record writes it otherwise."""
    try:
        return as_ions(f).text()
    except CellchemError:
        return f.text()


def _as_written(cell: Formula, truth: Formula) -> Formula:
    """The truth in the formula cell's own writing when the two differ only in water
    (C6H8O7 with one water is C6H8O7·H2O, not the acid name's H3C6H5O7·H2O)."""
    try:
        water = truth.water
        if water is None or composition_key(cell.anhydrous()) != composition_key(truth.anhydrous()):
            return truth
        return cell.with_water(water)
    except CellchemError:
        return truth


def _relation(cas_formula: Formula, truth: Formula) -> tuple[str, str]:
    """(', the anhydrous salt' or ', the hexahydrate', the record's formula written as the
    line's with that water) when the two differ only in water; ('', '') otherwise."""
    try:
        dry = truth.anhydrous()
        for n in range(0, 25):
            form = dry.with_water(n) if n else dry
            if composition_key(form) == composition_key(cas_formula):
                return (", the anhydrous salt" if n == 0 else f", the {hydrate_word(n)}"), _text(form)
    except CellchemError:
        return "", ""
    return "", ""


def _mass_dispute(cluster: list[Witness], stated: float) -> Dispute:
    truth = _best_formula(cluster)
    mass = float(molar_mass(truth))
    return Dispute(
        MASS,
        f"{_agreeing(cluster, None, None)} agree on {_text(truth)}, {mass:.2f} g/mol; the stated molar"
        f" mass is {stated:g}",
        f"{mass:.2f}",
    )


def _split(ranked: list[list[Witness]], stated: float | None, mass_matches) -> Dispute:
    sides = []
    for cluster in ranked:
        mass = 1 if stated is not None and _matches(cluster[0].formula, mass_matches) else 0
        verb = "say" if len(cluster) + mass > 1 else "says"
        sides.append(f"{_agreeing(cluster, stated, mass_matches)} {verb} {_text(cluster[0].formula)}")
    # an error only when every side has a witness that may ground one (not a synonym alone)
    grounded = all(any(w.grounds for w in cluster) for cluster in ranked)
    return Dispute(
        "" if grounded else "?", "the cells disagree and no majority settles it: " + "; ".join(sides), ""
    )


def formula_of_record(record: Substance) -> Formula | None:
    try:
        return parse_formula(record.formula)
    except CellchemError:
        return None


__all__ = ["CAS", "FORMULA", "MASS", "NAME", "Dispute", "Witness", "formula_of_record", "weigh"]
