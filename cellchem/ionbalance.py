"""Cation-anion balance of a water or solution analysis.

The sums of cations and anions are compared in milliequivalents per litre;
the balance error is 100 (sum cations - sum anions) / (sum cations + sum anions)
percent, and the acceptance criteria are those of *Standard Methods for the
Examination of Water and Wastewater*, method 1030 E (checking the correctness
of analyses; from memory):

====================  ============================
anion sum (meq/L)     acceptable difference
====================  ============================
0 to 3.0              +/- 0.2 meq/L (absolute)
3.0 to 10.0           +/- 2 %
10.0 to 800           +/- 5 %
====================  ============================

Ions are given by label (``'Ca2+'``, ``'HCO3-'``) or name (``'calcium'``,
``'bicarbonate'``). Results reported "as N", "as CaCO3" or as alkalinity must
be converted to the ion first: cellchem refuses them rather than guess the
basis.
"""

from __future__ import annotations

import math
import re
from collections.abc import Mapping
from dataclasses import dataclass

from .errors import CellchemError
from .ions import Ion
from .mass import molar_mass
from .reading import find_ion
from .units import AMOUNT_PER_VOLUME, EQUIVALENTS_PER_VOLUME, MASS_PER_VOLUME, read_quantity


@dataclass(frozen=True)
class IonBalance:
    """The result of ``ion_balance``.

    Attributes:
        cations: sum of cations, meq/L.
        anions: sum of anions, meq/L.
        difference: cations - anions, meq/L.
        error_percent: 100 (cations - anions) / (cations + anions).
        acceptable: whether the analysis meets the Standard Methods 1030 E criterion.
        criterion: the criterion applied, as text.
        ions: each ion's label, charge and meq/L.
    """

    cations: float
    anions: float
    difference: float
    error_percent: float
    acceptable: bool
    criterion: str
    ions: tuple[tuple[str, int, float], ...]

    @property
    def text(self) -> str:
        verdict = "meets" if self.acceptable else "does not meet"
        return (
            f"cations {self.cations:.3f} meq/L, anions {self.anions:.3f} meq/L, difference"
            f" {self.difference:+.3f} meq/L ({self.error_percent:+.2f} %): {verdict} the Standard Methods"
            f" 1030 E criterion ({self.criterion})"
        )

    def __str__(self) -> str:
        return self.text


_BASIS_WORDS = re.compile(r"\bas\b|-N\b|-P\b|alkalinity|hardness|\bTDS\b", re.IGNORECASE)


def _ion(key) -> Ion:
    if isinstance(key, Ion):
        return key
    if not isinstance(key, str):
        raise CellchemError(f"ion_balance: expected ion labels or names as keys, read {key!r}")
    if _BASIS_WORDS.search(key):
        raise CellchemError(
            f"ion {key!r} is reported on another basis (as N, as CaCO3, alkalinity, hardness); convert it"
            " to the"
            " ion itself first (for example nitrate-N x 4.427 = nitrate)"
        )
    return find_ion(key)


def criterion(anions_meq: float) -> tuple[str, float | None, float | None]:
    """(text, absolute limit in meq/L or None, percent limit or None) for an anion sum."""
    if anions_meq <= 3.0:
        return "anion sum 0-3.0 meq/L: difference within 0.2 meq/L", 0.2, None
    if anions_meq <= 10.0:
        return "anion sum 3.0-10.0 meq/L: within 2 %", None, 2.0
    if anions_meq <= 800.0:
        return "anion sum 10.0-800 meq/L: within 5 %", None, 5.0
    raise CellchemError(
        f"anion sum {anions_meq:g} meq/L is above 800, beyond the Standard Methods 1030 E criteria"
    )


def ion_balance(ions: Mapping, unit: str = "meq/L") -> IonBalance:
    """Check the cation-anion balance of an analysis.

    Args:
        ions: a mapping of ion (label or name) to concentration, each a number
            in ``unit`` or text with its own unit.
        unit: ``'meq/L'`` (default), ``'mg/L'``, ``'mmol/L'`` or any amount,
            mass or equivalent concentration unit.

    Returns:
        An IonBalance with the sums, the error, and the verdict.

    >>> b = ion_balance({"Ca2+": 40.1, "Mg2+": 12.2, "Na+": 23.0, "HCO3-": 183.0, "SO4 2-": 48.0,
    ...                  "Cl-": 35.5}, unit="mg/L")
    >>> round(b.cations, 2), round(b.anions, 2), b.acceptable
    (4.01, 5.0, False)
    """
    if not isinstance(ions, Mapping) or not ions:
        raise CellchemError(
            "ion_balance: expected a mapping of ion to concentration, such as {'Ca2+': 2.0, ...}"
        )
    rows: list[tuple[str, int, float]] = []
    seen: dict[Ion, str] = {}
    cations = anions = 0.0
    for key, value in ions.items():
        ion = _ion(key)
        if ion in seen:
            raise CellchemError(f"ion_balance: {key!r} and {seen[ion]!r} are the same ion ({ion.label})")
        seen[ion] = str(key)
        number, reading = read_quantity(value, unit, f"concentration of {ion.label}")
        if not math.isfinite(number) or number < 0:
            raise CellchemError(f"concentration of {ion.label}: {value!r} is not 0 or more")
        base = number * reading.factor
        z = abs(ion.charge)
        if reading.kind == EQUIVALENTS_PER_VOLUME:
            meq = base * 1000.0
        elif reading.kind == AMOUNT_PER_VOLUME:
            meq = base * z * 1000.0
        elif reading.kind == MASS_PER_VOLUME:
            meq = base / float(molar_mass(ion.formula)) * z * 1000.0
        else:
            raise CellchemError(
                f"concentration of {ion.label}: unit {reading.text!r} is {reading.kind}; expected mg/L,"
                " mmol/L or meq/L"
            )
        rows.append((ion.label, ion.charge, meq))
        if ion.charge > 0:
            cations += meq
        else:
            anions += meq
    if cations == 0 or anions == 0:
        raise CellchemError("ion_balance: both cations and anions are needed to check a balance")
    diff = cations - anions
    error = 100.0 * diff / (cations + anions)
    text, absolute, percent = criterion(anions)
    ok = abs(diff) <= absolute + 1e-12 if absolute is not None else abs(error) <= (percent or 0) + 1e-12
    return IonBalance(cations, anions, diff, error, ok, text, tuple(rows))
