"""The worksheet functions: the core behind ``CC_*`` names, over cell values.

Each function takes cell values as a spreadsheet layer hands them over
(scalars, 2-D lists for ranges, ``None`` for empty cells, floats for
numbers), converts them with ``cells``, calls the core and converts the
answer back. No chemistry lives here. ``FUNCTIONS`` describes every function
(arguments with a one-line description and unit, the result, an example) for
the Excel layer (``excel``, generated from it), for README's table and for the function
wizard of other spreadsheet programs.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from fractions import Fraction

from ... import (
    activity_coefficient,
    cas_is_valid,
    charge_balance,
    conductivity,
    convert_concentration,
    formula_from_name,
    ion_balance,
    ionic_strength,
    ions_of,
    mass_for_solution,
    mass_fraction,
    molar_mass,
    name_from_formula,
    net_charge,
    oxidation_state,
    salt_formula,
)
from ...audit import ERROR, NOTE, WARNING, check_line
from ...errors import CellchemError
from ...substances import edition, substance
from .cells import (
    ZERO_IS_AMBIGUOUS,
    ZERO_IS_EMPTY,
    ZERO_IS_ZERO,
    aggregate,
    blank,
    cellwise,
    flat,
    full_message,
    number,
    quantity,
    refusal,
    text,
)


@dataclass(frozen=True)
class Argument:
    name: str
    description: str
    optional: bool = False
    zero: str = ZERO_IS_EMPTY  # what a lone 0 from LibreOffice Calc means (cells.from_calc)


@dataclass(frozen=True)
class SheetFunction:
    name: str
    summary: str
    arguments: tuple[Argument, ...]
    result: str
    example: str
    implementation: Callable[..., object]
    ranges: bool = True  # a range of compounds gives a range of results


FUNCTIONS: dict[str, SheetFunction] = {}


def _register(name: str, summary: str, arguments, result: str, example: str, ranges: bool = True):
    def wrap(fn):
        FUNCTIONS[name] = SheetFunction(name, summary, tuple(arguments), result, example, fn, ranges)
        fn.__doc__ = summary
        return fn

    return wrap


A = Argument


def _opt_text(v: object, default: str, what: str) -> str:
    return default if blank(v) else text(v, what)


@_register(
    "CC_FORMULA",
    "The formula of a compound named as suppliers name it.",
    [A("name", "the name, e.g. copper(II) sulfate pentahydrate, ferric chloride")],
    "text",
    '=CC_FORMULA("ferric chloride") gives FeCl3',
)
def cc_formula(name=None):
    return cellwise(lambda n: formula_from_name(text(n, "name")), [name])


@_register(
    "CC_NAME",
    "The systematic (IUPAC) name of a formula.",
    [
        A("formula", "the formula, e.g. CuSO4.5H2O"),
        A("style", "iupac (default), british, american or legacy (ferric, cupric)", True),
    ],
    "text",
    '=CC_NAME("FeCl3") gives iron(III) chloride',
)
def cc_name(formula=None, style=None):
    def one(f, s):
        chosen = _opt_text(s, "iupac", "style").casefold()
        if chosen == "legacy":
            return name_from_formula(text(f, "formula"), legacy=True)
        if chosen not in ("iupac", "british", "american"):
            raise CellchemError(f"style: expected iupac, british, american or legacy, read {s!r}")
        return name_from_formula(text(f, "formula"), spelling=chosen)

    return cellwise(one, [formula, style])


@_register(
    "CC_SALT",
    "The neutral compound of a cation and an anion, by charge balance.",
    [A("cation", "the cation, e.g. Fe3+ or iron(III)"), A("anion", "the anion, e.g. SO4 2- or sulfate")],
    "text",
    '=CC_SALT("Al3+","sulfate") gives Al2(SO4)3',
)
def cc_salt(cation=None, anion=None):
    return cellwise(lambda c, a: salt_formula(text(c, "cation"), text(a, "anion")), [cation, anion])


@_register(
    "CC_MOLARMASS",
    "Molar mass of a formula from the standard atomic weights, in g/mol.",
    [A("formula", "the formula, e.g. CuSO4.5H2O")],
    "number, g/mol",
    '=CC_MOLARMASS("CuSO4.5H2O") gives 249.68',
)
def cc_molarmass(formula=None):
    return cellwise(lambda f: float(molar_mass(text(f, "formula"))), [formula])


@_register(
    "CC_MASSFRACTION",
    "Mass fraction of an element or ion in a formula (0 to 1).",
    [A("formula", "the formula, e.g. CuSO4.5H2O"), A("part", "the element or ion, e.g. Cu or SO4")],
    "number, fraction (format as % to show percent)",
    '=CC_MASSFRACTION("CuSO4.5H2O","Cu") gives 0.2545',
)
def cc_massfraction(formula=None, part=None):
    return cellwise(lambda f, p: mass_fraction(text(f, "formula"), text(p, "part")), [formula, part])


@_register(
    "CC_NETCHARGE",
    "The net charge of an ion or compound.",
    [A("formula", "the formula, e.g. SO4 2- or NaCl")],
    "number",
    '=CC_NETCHARGE("SO4 2-") gives -2',
)
def cc_netcharge(formula=None):
    return cellwise(lambda f: float(net_charge(text(f, "formula"))), [formula])


@_register(
    "CC_OXSTATE",
    "The oxidation state of an element in a formula.",
    [A("formula", "the formula, e.g. KMnO4"), A("element", "the element symbol, e.g. Mn")],
    "number",
    '=CC_OXSTATE("KMnO4","Mn") gives 7',
)
def cc_oxstate(formula=None, element=None):
    def one(f, e):
        state = oxidation_state(text(f, "formula"), text(e, "element"), mean=True)
        return float(state) if isinstance(state, Fraction | int) else state

    return cellwise(one, [formula, element])


@_register(
    "CC_BALANCED",
    "TRUE when the formula's charges balance (catalog ions, or oxidation states for a molecule).",
    [A("formula", "the formula, e.g. NaCl2")],
    "TRUE or FALSE; a refusal for an organic formula no catalog anion accounts for (charge balance not"
    " applicable) or one with an odd number of electrons",
    '=CC_BALANCED("NaCl2") gives FALSE',
)
def cc_balanced(formula=None):
    return cellwise(_balanced_one, [formula])


def _balanced_one(formula):
    result = charge_balance(text(formula, "formula"))
    if result.kind in ("organic", "radical"):
        # neither TRUE nor FALSE: charge balance does not apply, or the formula is in doubt
        raise CellchemError(result.explanation)
    return bool(result.balanced)


def _checkline_one(name, formula, mass, cas):
    result = check_line(formula, mass, name, cas)
    if not result.findings:
        return ""
    order = {ERROR: 0, WARNING: 1, NOTE: 2}
    first = sorted(result.findings, key=lambda f: order[f.severity])[0]
    return f"{first.severity}: {first.message}"


@_register(
    "CC_CHECKLINE",
    "The audit's verdict on one line: empty when name, formula, molar mass and CAS RN agree.",
    [
        A("name", "the name on the line"),
        A("formula", "the formula on the line"),
        A("molar_mass", "the stated molar mass in g/mol", True),
        A("cas", "the CAS RN", True),
    ],
    "text (empty when all agree)",
    '=CC_CHECKLINE("Sodium sulfite","Na2SO4") gives error: the name ... reads as Na2SO3 ...',
)
def cc_checkline(name=None, formula=None, molar_mass=None, cas=None):
    return cellwise(
        _checkline_one,
        [name, formula, molar_mass, cas],
        blank_when=lambda v: blank(v[0]) and blank(v[1]),
    )


@_register(
    "CC_CASVALID",
    "TRUE when a CAS RN has the standard form and a correct check digit.",
    [A("cas", "the CAS RN, e.g. 7732-18-5")],
    "TRUE or FALSE",
    '=CC_CASVALID("7732-18-5") gives TRUE',
)
def cc_casvalid(cas=None):
    return cellwise(lambda c: cas_is_valid(text(c, "cas")), [cas])


@_register(
    "CC_SUBSTANCE",
    "What the substance table holds for a CAS RN: its formula, name or molar mass (open data, PubChem).",
    [
        A("cas", "the CAS RN, e.g. 7758-99-8"),
        A("what", "formula (the default), name or molar mass"),
    ],
    "text, or a number in g/mol for molar mass; a refusal for a CAS RN the table does not hold",
    '=CC_SUBSTANCE("7758-99-8","formula") gives CuH10O9S',
)
def cc_substance(cas=None, what=None):
    def one(c, w):
        record = substance(text(c, "cas"))
        if record is None:
            raise CellchemError(f"CAS RN {text(c, 'cas')} is not in the substance table ({edition()})")
        kind = (text(w, "what") if not blank(w) else "formula").strip().casefold().replace("_", " ")
        note = "" if record.certain else f" (uncertain record: {record.doubt})"
        if note and kind in ("formula", "molar mass", "mass"):
            raise CellchemError(f"the substance table's record for {record.cas} is uncertain: {record.doubt}")
        if kind == "formula":
            return record.formula
        if kind == "name":
            return record.name + note
        if kind in ("molar mass", "mass", "mw"):
            return float(record.molar_mass)
        raise CellchemError(f"what: expected formula, name or molar mass, read {text(w, 'what')!r}")

    return cellwise(one, [cas, what])


@_register(
    "CC_IONS",
    "The ions a solute gives in water, spilled as rows of ion, count and charge.",
    [A("formula", "one formula, e.g. Al2(SO4)3")],
    "a range of rows: ion, count, charge",
    '=CC_IONS("Al2(SO4)3") spills Al3+ 2 3 / SO4 2- 3 -2',
    ranges=False,
)
def cc_ions(formula=None):
    cells = flat(formula)
    if len(cells) != 1:
        return refusal(CellchemError("CC_IONS takes one formula, not a range"))

    value = cells[0]
    if blank(value):
        return None

    def run(f):
        d = ions_of(text(f, "formula"))
        if not d.ions:
            return [[f"{d.formula}: no ions ({d.behaviour})", None, None]]
        return [[c.ion.label, float(c.count), float(c.charge)] for c in d.ions]

    return aggregate(run, value)


def _pairs(solutes, concentrations):
    names = flat(solutes)
    concs = flat(concentrations)
    if len(names) != len(concs):
        raise CellchemError(
            f"{len(names)} solutes but {len(concs)} concentrations: give one concentration for each solute"
        )
    pairs = []
    for n, c in zip(names, concs):
        if blank(n) and blank(c):
            continue
        if blank(n) or blank(c):
            raise CellchemError(f"a solute without a concentration, or the reverse: {n!r}, {c!r}")
        pairs.append((text(n, "solute"), quantity(c, "concentration")))
    if not pairs:
        raise CellchemError("no solutes given")
    return pairs


@_register(
    "CC_IONICSTRENGTH",
    "Ionic strength of a solution of strong electrolytes, in mol/L.",
    [
        A("solutes", "a range of formulas, e.g. NaCl, K2SO4"),
        A(
            "concentrations",
            "their concentrations: numbers in mol/L or text with a unit, e.g. 10 mmol/L",
            zero=ZERO_IS_ZERO,
        ),
    ],
    "number, mol/L",
    '=CC_IONICSTRENGTH("MgCl2",0.1) gives 0.3',
    ranges=False,
)
def cc_ionicstrength(solutes=None, concentrations=None):
    return aggregate(lambda s, c: float(ionic_strength(_pairs(s, c))), solutes, concentrations)


@_register(
    "CC_ACTIVITY",
    "Activity coefficient of an ion (Davies, extended Debye-Huckel or limiting law).",
    [
        A("ion", "the ion, e.g. Ca2+"),
        A("ionic_strength", "the ionic strength in mol/L", zero=ZERO_IS_AMBIGUOUS),
        A("model", "davies (default), extended or limiting", True),
        A("temperature_c", "temperature in degrees C, 0 to 100 (default 25)", True, ZERO_IS_AMBIGUOUS),
    ],
    "number, 0 to 1",
    '=CC_ACTIVITY("Ca2+",0.01,"extended") gives 0.675',
)
def cc_activity(ion=None, ionic_strength=None, model=None, temperature_c=None):
    def one(i, strength, m, t):
        return float(
            activity_coefficient(
                text(i, "ion"),
                number(strength, "ionic_strength"),
                _opt_text(m, "davies", "model"),
                25.0 if blank(t) else number(t, "temperature_c"),
            )
        )

    return cellwise(one, [ion, ionic_strength, model, temperature_c])


@_register(
    "CC_CONDUCTIVITY",
    "Estimated conductivity of a dilute solution, in uS/cm.",
    [
        A("solutes", "a range of formulas, e.g. KCl"),
        A("concentrations", "their concentrations: numbers in mol/L or text with a unit", zero=ZERO_IS_ZERO),
        A("temperature_c", "15 to 35 degrees C (default 25, the meter's reference)", True, ZERO_IS_AMBIGUOUS),
    ],
    "number, uS/cm",
    '=CC_CONDUCTIVITY("KCl",0.01) gives 1411',
    ranges=False,
)
def cc_conductivity(solutes=None, concentrations=None, temperature_c=None):
    def run(s, c, t):
        temp = flat(t)[0] if t is not None else None
        return float(conductivity(_pairs(s, c), 25.0 if blank(temp) else number(temp, "temperature_c")))

    return aggregate(run, solutes, concentrations, temperature_c)


@_register(
    "CC_GRAMS",
    "Grams to weigh for a solution, with the purity and the hydrate on the shelf.",
    [
        A("formula", "the solute the recipe is written for, e.g. CuSO4"),
        A("concentration", "the target: a number in mol/L or text with a unit, e.g. 0.1 M, 25 g/L"),
        A("volume", "the final volume: a number in L or text with a unit, e.g. 250 mL"),
        A("purity", "the assay, a fraction (0.995) or text (99.5%); default 1", True),
        A("shelf_form", "what is on the shelf when it differs in water, e.g. CuSO4.5H2O", True),
    ],
    "number, g",
    '=CC_GRAMS("CuSO4",0.1,"250 mL",,"CuSO4.5H2O") gives 6.242',
)
def cc_grams(formula=None, concentration=None, volume=None, purity=None, shelf_form=None):
    def one(f, c, v, p, shelf):
        return mass_for_solution(
            text(f, "formula"),
            quantity(c, "concentration"),
            quantity(v, "volume"),
            1.0 if blank(p) else (p if isinstance(p, str) else number(p, "purity")),
            shelf_form=None if blank(shelf) else text(shelf, "shelf_form"),
        ).mass

    return cellwise(one, [formula, concentration, volume, purity, shelf_form])


@_register(
    "CC_CONVERT",
    "Convert a concentration between units (mol/L, mmol/L, g/L, mg/L, % w/v, ppm, meq/L, % w/w ...).",
    [
        A("value", "the concentration", zero=ZERO_IS_ZERO),
        A("from_unit", "its unit, e.g. % w/w"),
        A("to_unit", "the unit wanted, e.g. mol/L"),
        A("formula", "the solute, e.g. HCl"),
        A("density", "the solution's density in g/mL, for % w/w and mol/kg", True),
    ],
    "number, in to_unit",
    '=CC_CONVERT(37,"% w/w","mol/L","HCl",1.18) gives 11.98',
)
def cc_convert(value=None, from_unit=None, to_unit=None, formula=None, density=None):
    def one(v, fu, tu, f, d):
        return float(
            convert_concentration(
                quantity(v, "value"),
                text(fu, "from_unit") if not blank(fu) else "",
                text(tu, "to_unit"),
                None if blank(f) else text(f, "formula"),
                None if blank(d) else number(d, "density"),
            )
        )

    return cellwise(one, [value, from_unit, to_unit, formula, density])


@_register(
    "CC_IONBALANCE",
    "Cation-anion balance of a water analysis, spilled as cations, anions (meq/L), error %, acceptable.",
    [
        A("ions", "a range of ions, e.g. Ca2+, HCO3-"),
        A("concentrations", "their concentrations", zero=ZERO_IS_ZERO),
        A("unit", "mg/L, mmol/L or meq/L (default meq/L)", True),
    ],
    "a row: cations meq/L, anions meq/L, error %, TRUE/FALSE (Standard Methods 1030 E)",
    '=CC_IONBALANCE(A2:A7,B2:B7,"mg/L")',
    ranges=False,
)
def cc_ionbalance(ions=None, concentrations=None, unit=None):
    def run(i, c, u):
        names = flat(i)
        values = flat(c)
        if len(names) != len(values):
            raise CellchemError(f"{len(names)} ions but {len(values)} concentrations")
        mapping = {}
        for n, v in zip(names, values):
            if blank(n) and blank(v):
                continue
            mapping[text(n, "ion")] = quantity(v, "concentration")
        unit_cell = flat(u)[0] if u is not None else None
        b = ion_balance(mapping, "meq/L" if blank(unit_cell) else text(unit_cell, "unit"))
        return [[b.cations, b.anions, b.error_percent, b.acceptable]]

    return aggregate(run, ions, concentrations, unit)


@_register(
    "CC_FULLMESSAGE",
    "The whole message behind a short #cellchem: text in a cell.",
    [A("text", "a cell showing #cellchem: ...")],
    "text",
    "=CC_FULLMESSAGE(B2)",
)
def cc_fullmessage(text=None):
    return cellwise(lambda t: full_message(t), [text])
