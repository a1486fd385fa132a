"""Compounds the tables know: formulas printed for one substance (P2O5 and
P4O10), the hydrates that exist and the one 'crystals' means, readings from
the established-compounds table, and compounds by the set of ions they hold.
"""

from __future__ import annotations

from functools import cache

from ..charge import charge_balance
from ..errors import NameReadError
from ..formula import Formula, Number
from ..ions import counts_key
from ..reading import as_formula, parse_formula
from ..tables import read_table
from .complexes import _split_entity
from .results import NameReading, Qualifier, _kind_of, _rewet, _whole_reading
from .salts import _canonical
from .tables import IS, MAY_BE, _established, _established_rows, _hydrate_suffix, _hydrates


def same_substance(a: str | Formula, b: str | Formula) -> bool:
    """True when two formulas are printed for one substance by a cited table
    (P2O5 and P4O10, As2O3 and As4O6: data/established_compounds.csv), or
    have the same element counts and water.

    >>> same_substance("P2O5", "P4O10")
    True
    """
    fa, fb = as_formula(a), as_formula(b)
    if counts_key(fa.counts) == counts_key(fb.counts) and fa.water == fb.water:
        return True
    if fa.water != fb.water:
        return False
    by_key = _established()[1]
    da, db = fa.anhydrous(), fb.anhydrous()
    for x, y in ((da, db), (db, da)):
        for other in by_key.get(counts_key(x.counts), ()):
            if counts_key(parse_formula(other).counts) == counts_key(y.counts):
                return True
    return False


def known_hydrates(formula: str | Formula) -> frozenset[Number]:
    """The numbers of water molecules of the hydrates of a compound that a cited
    table knows (data/hydrates.csv), not counting 0; empty when it knows none.

    >>> sorted(known_hydrates("CuSO4"))
    [1, 5]
    """
    key = counts_key(as_formula(formula).anhydrous().counts)
    return _hydrates().get(key, (frozenset(), None))[0]


def _crystals(reading: NameReading) -> NameReading:
    """'crystals' on a label means the hydrate the compound is sold as when it
    has one (copper sulfate crystals are CuSO4·5H2O, washing soda crystals
    Na2CO3·10H2O); nothing when the table knows none."""
    f = parse_formula(reading.formula)
    if f.water:
        return reading
    crystals = _hydrates().get(counts_key(f.counts), (frozenset(), None))[1]
    if crystals is None:
        return reading
    return _rewet(reading, crystals, f"'crystals' for the {_hydrate_suffix(crystals).strip()}")


def _established_reading(
    text: str,
    plain: str,
    rows: list[tuple[str, str]],
    water: Number | str | None,
    qualifiers: list[Qualifier],
    forms: list[str],
) -> NameReading:
    """A name found in the established-compounds table: its 'is' formula, or
    the one 'may be' formula that the stated hydrate selects, or a refusal
    that lists the candidates."""
    main = [f for status, f in rows if status == IS]
    if main:
        f = _canonical(parse_formula(main[0]))
        return _whole_reading(
            text, plain, _kind_of(f), f, water, qualifiers, [*forms, f"established compound '{plain}'"]
        )
    candidates = [parse_formula(f) for status, f in rows if status == MAY_BE]
    if water not in ("", 0, None):
        fitting = [c for c in candidates if water in known_hydrates(c)]
        if len(fitting) == 1:
            return _whole_reading(
                text,
                plain,
                _kind_of(fitting[0]),
                fitting[0],
                water,
                qualifiers,
                [
                    *forms,
                    f"established compound '{plain}' (the {_hydrate_suffix(water).strip()} that exists)",
                ],
            )
    wet = [c.with_water(water) if water not in ("", 0) else c for c in candidates]  # type: ignore[arg-type]
    listing = " or ".join(c.text() for c in wet)
    raise NameReadError(
        f"'{text}' names more than one compound in the trade: it may be {listing}; write the formula,"
        " or a name that fixes it",
        text=text,
        choices=tuple(c.text() for c in wet),
        reason="may-be",
    )


def ion_sets(f: Formula) -> list[frozenset[tuple[str, int]]]:
    """The set of ions of an ionic formula, and (when it holds a coordination
    entity whose ligands are all catalog anions) the set with the entity split
    into its metal ion and ligand anions."""
    balance = charge_balance(f)
    if balance.kind != "ionic" or any(s.ion is None for s in balance.charges):
        return []
    direct = frozenset((s.ion.text, s.ion.charge) for s in balance.charges if s.ion is not None)
    split: set[tuple[str, int]] = set()
    for share in balance.charges:
        ion = share.ion
        assert ion is not None
        inner = _split_entity(ion)
        if inner is None:
            split.add((ion.text, ion.charge))
        else:
            split |= inner
    return [direct] if frozenset(split) == direct else [direct, frozenset(split)]


@cache
def _by_ion_set() -> dict[frozenset[tuple[str, int]], tuple[str, ...]]:
    """Established compounds (established_compounds.csv 'is' and 'may be' rows,
    named_compounds.csv, trivial_names.csv) by the set of ions they hold, with
    a coordination entity also counted as its metal ion and ligand anions, so
    that a name which does not state the ratio of its ions ('ammonium iron(II)
    sulfate', 'potassium ferric oxalate') finds the compounds the trade means."""
    formulas: list[str] = [f for status, f in _established_rows() if status in (IS, MAY_BE)]
    formulas += [row["formula"] for row in read_table("named_compounds.csv")]
    formulas += [row["formula"] for row in read_table("trivial_names.csv")]
    table: dict[frozenset[tuple[str, int]], list[str]] = {}
    for text in formulas:
        f = parse_formula(text).anhydrous()
        if len(f.parts) > 1:
            continue
        for key in ion_sets(f):
            entries = table.setdefault(key, [])
            canonical = _canonical(f).text()
            if canonical not in entries:
                entries.append(canonical)
    return {k: tuple(v) for k, v in table.items()}
