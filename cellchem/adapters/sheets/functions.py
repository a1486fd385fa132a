"""The worksheet functions: the core over cell values, one table for every spreadsheet.

Each function takes cell values as a spreadsheet layer hands them over
(scalars, 2-D lists for ranges, ``None`` for empty cells, floats for
numbers), converts them with ``cells``, calls the core and converts the
answer back; a cell it cannot answer is a ``cells.CellError``. No chemistry
lives here. ``FUNCTIONS`` describes every function (its name, arguments with
a one-line description and unit, the result, an example) for the xlwings
Lite module (``lite``), the classic xlwings layer (``excel``), the Calc
add-in (``calc``), all generated from it, and for README's tables.

A function's name in the table (``MOLAR_MASS``) is its name inside the
``cellchem`` namespace; each platform spells the whole name by its own rules
(``spelled``): ``CELLCHEM.MOLAR_MASS`` in Excel's custom functions and in
Calc, ``CELLCHEM_MOLAR_MASS`` in classic xlwings, whose VBA names allow no
period.
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
    sds,
)
from ...audit import ERROR, NOTE, WARNING, check_line
from ...errors import CellchemError
from ...substances import edition, substance
from .cells import (
    ZERO_AS_TARGET,
    ZERO_IS_AMBIGUOUS,
    ZERO_IS_EMPTY,
    ZERO_IS_ZERO,
    aggregate,
    blank,
    cellwise,
    flat,
    number,
    quantity,
    reason,
    refusal,
    settle_zero,
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
    name: str  # the name inside the namespace, e.g. MOLAR_MASS
    summary: str
    arguments: tuple[Argument, ...]
    result: str
    example: str
    implementation: Callable[..., object]
    ranges: bool = True  # a range of compounds gives a range of results

    @property
    def python_name(self) -> str:
        """The Python name of the function in the generated modules: molar_mass."""
        return self.name.lower()


NAMESPACE = "CELLCHEM"
# how each platform writes a namespaced name: Excel custom functions (xlwings Lite) and Calc add-in
# display names take a period; VBA names (classic xlwings) take letters, digits and underscores only
SEPARATOR = {"excel": ".", "calc": "_", "classic": "_"}


def spelled(name: str, platform: str = "excel") -> str:
    """The whole name a user types on a platform: spelled("MOLAR_MASS") -> 'CELLCHEM.MOLAR_MASS'."""
    return NAMESPACE + SEPARATOR[platform] + name


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
    "FORMULA",
    "The formula of a compound named as suppliers name it.",
    [A("name", "the name, e.g. copper(II) sulfate pentahydrate, ferric chloride")],
    "text",
    '=CELLCHEM.FORMULA("ferric chloride") gives FeCl3',
)
def _formula(name=None):
    return cellwise(lambda n: formula_from_name(text(n, "name")), [name])


@_register(
    "NAME",
    "The systematic (IUPAC) name of a formula.",
    [
        A("formula", "the formula, e.g. CuSO4.5H2O"),
        A("style", "iupac (default), british, american or legacy (ferric, cupric)", True),
    ],
    "text",
    '=CELLCHEM.NAME("FeCl3") gives iron(III) chloride',
)
def _name(formula=None, style=None):
    def one(f, s):
        chosen = _opt_text(s, "iupac", "style").casefold()
        if chosen == "legacy":
            return name_from_formula(text(f, "formula"), legacy=True)
        if chosen not in ("iupac", "british", "american"):
            raise CellchemError(f"style: expected iupac, british, american or legacy, read {s!r}")
        return name_from_formula(text(f, "formula"), spelling=chosen)

    return cellwise(one, [formula, style])


@_register(
    "SALT",
    "The neutral compound of a cation and an anion, by charge balance.",
    [A("cation", "the cation, e.g. Fe3+ or iron(III)"), A("anion", "the anion, e.g. SO4 2- or sulfate")],
    "text",
    '=CELLCHEM.SALT("Al3+","sulfate") gives Al2(SO4)3',
)
def _salt(cation=None, anion=None):
    return cellwise(lambda c, a: salt_formula(text(c, "cation"), text(a, "anion")), [cation, anion])


@_register(
    "MOLAR_MASS",
    "Molar mass of a formula from the standard atomic weights, in g/mol.",
    [A("formula", "the formula, e.g. CuSO4.5H2O")],
    "number, g/mol",
    '=CELLCHEM.MOLAR_MASS("CuSO4.5H2O") gives 249.68',
)
def _molar_mass(formula=None):
    return cellwise(lambda f: float(molar_mass(text(f, "formula"))), [formula])


@_register(
    "MASS_FRACTION",
    "Mass fraction of an element or ion in a formula (0 to 1).",
    [A("formula", "the formula, e.g. CuSO4.5H2O"), A("part", "the element or ion, e.g. Cu or SO4")],
    "number, fraction (format as % to show percent)",
    '=CELLCHEM.MASS_FRACTION("CuSO4.5H2O","Cu") gives 0.2545',
)
def _mass_fraction(formula=None, part=None):
    return cellwise(lambda f, p: mass_fraction(text(f, "formula"), text(p, "part")), [formula, part])


@_register(
    "NET_CHARGE",
    "The net charge of an ion or compound.",
    [A("formula", "the formula, e.g. SO4 2- or NaCl")],
    "number",
    '=CELLCHEM.NET_CHARGE("SO4 2-") gives -2',
)
def _net_charge(formula=None):
    return cellwise(lambda f: float(net_charge(text(f, "formula"))), [formula])


@_register(
    "OXIDATION_STATE",
    "The oxidation state of an element in a formula.",
    [A("formula", "the formula, e.g. KMnO4"), A("element", "the element symbol, e.g. Mn")],
    "number",
    '=CELLCHEM.OXIDATION_STATE("KMnO4","Mn") gives 7',
)
def _oxidation_state(formula=None, element=None):
    def one(f, e):
        state = oxidation_state(text(f, "formula"), text(e, "element"), mean=True)
        return float(state) if isinstance(state, Fraction | int) else state

    return cellwise(one, [formula, element])


@_register(
    "CHARGES_BALANCE",
    "TRUE when the formula's charges balance (catalog ions, or oxidation states for a molecule).",
    [A("formula", "the formula, e.g. NaCl2")],
    "TRUE or FALSE; a refusal for an organic formula no catalog anion accounts for (charge balance not"
    " applicable) or one with an odd number of electrons",
    '=CELLCHEM.CHARGES_BALANCE("NaCl2") gives FALSE',
)
def _charges_balance(formula=None):
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
    "CHECK_LINE",
    "The audit's verdict on one line: empty when name, formula, molar mass and CAS RN agree.",
    [
        A("name", "the name on the line"),
        A("formula", "the formula on the line"),
        A("molar_mass", "the stated molar mass in g/mol", True),
        A("cas", "the CAS RN", True),
    ],
    "text (empty when all agree)",
    '=CELLCHEM.CHECK_LINE("Sodium sulfite","Na2SO4") gives error: the name ... reads as Na2SO3 ...',
)
def _check_line(name=None, formula=None, molar_mass=None, cas=None):
    return cellwise(
        _checkline_one,
        [name, formula, molar_mass, cas],
        blank_when=lambda v: blank(v[0]) and blank(v[1]),
    )


@_register(
    "CAS_VALID",
    "TRUE when a CAS RN has the standard form and a correct check digit.",
    [A("cas", "the CAS RN, e.g. 7732-18-5")],
    "TRUE or FALSE",
    '=CELLCHEM.CAS_VALID("7732-18-5") gives TRUE',
)
def _cas_valid(cas=None):
    return cellwise(lambda c: cas_is_valid(text(c, "cas")), [cas])


@_register(
    "SUBSTANCE",
    "What the substance table holds for a CAS RN: its formula, name or molar mass (open data, PubChem).",
    [
        A("cas", "the CAS RN, e.g. 7758-99-8"),
        A("what", "formula (the default), name or molar mass", True),
    ],
    "text, or a number in g/mol for molar mass; a refusal for a CAS RN the table does not hold",
    '=CELLCHEM.SUBSTANCE("7758-99-8","formula") gives CuH10O9S',
)
def _substance(cas=None, what=None):
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
    "IONS",
    "The ions a solute gives in water, spilled as rows of ion, count and charge.",
    [A("formula", "one formula, e.g. Al2(SO4)3")],
    "a range of rows: ion, count, charge",
    '=CELLCHEM.IONS("Al2(SO4)3") spills Al3+ 2 3 / SO4 2- 3 -2',
    ranges=False,
)
def _ions(formula=None):
    cells = flat(formula)
    if len(cells) != 1:
        return refusal(CellchemError("IONS takes one formula, not a range"))

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
    "IONIC_STRENGTH",
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
    '=CELLCHEM.IONIC_STRENGTH("MgCl2",0.1) gives 0.3',
    ranges=False,
)
def _ionic_strength(solutes=None, concentrations=None):
    return aggregate(lambda s, c: float(ionic_strength(_pairs(s, c))), solutes, concentrations)


@_register(
    "ACTIVITY_COEFFICIENT",
    "Activity coefficient of an ion (Davies, extended Debye-Huckel or limiting law).",
    [
        A("ion", "the ion, e.g. Ca2+"),
        A("ionic_strength", "the ionic strength in mol/L", zero=ZERO_IS_AMBIGUOUS),
        A("model", "davies (default), extended or limiting", True),
        A("temperature_c", "temperature in degrees C, 0 to 100 (default 25)", True, ZERO_IS_AMBIGUOUS),
    ],
    "number, 0 to 1",
    '=CELLCHEM.ACTIVITY_COEFFICIENT("Ca2+",0.01,"extended") gives 0.675',
)
def _activity_coefficient(ion=None, ionic_strength=None, model=None, temperature_c=None):
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
    "CONDUCTIVITY",
    "Estimated conductivity of a dilute solution, in uS/cm.",
    [
        A("solutes", "a range of formulas, e.g. KCl"),
        A("concentrations", "their concentrations: numbers in mol/L or text with a unit", zero=ZERO_IS_ZERO),
        A("temperature_c", "15 to 35 degrees C (default 25, the meter's reference)", True, ZERO_IS_AMBIGUOUS),
    ],
    "number, uS/cm",
    '=CELLCHEM.CONDUCTIVITY("KCl",0.01) gives 1411',
    ranges=False,
)
def _conductivity(solutes=None, concentrations=None, temperature_c=None):
    def run(s, c, t):
        temp = flat(t)[0] if t is not None else None
        return float(conductivity(_pairs(s, c), 25.0 if blank(temp) else number(temp, "temperature_c")))

    return aggregate(run, solutes, concentrations, temperature_c)


@_register(
    "GRAMS_TO_WEIGH",
    "Grams to weigh for a solution, with the purity and the hydrate on the shelf.",
    [
        A("formula", "the solute the recipe is written for, e.g. CuSO4"),
        A("concentration", "the target: a number in mol/L or text with a unit, e.g. 0.1 M, 25 g/L"),
        A("volume", "the final volume: a number in L or text with a unit, e.g. 250 mL"),
        A("purity", "the assay, a fraction (0.995) or text (99.5%); default 1", True),
        A("shelf_form", "what is on the shelf when it differs in water, e.g. CuSO4.5H2O", True),
    ],
    "number, g",
    '=CELLCHEM.GRAMS_TO_WEIGH("CuSO4",0.1,"250 mL",,"CuSO4.5H2O") gives 6.242',
)
def _grams_to_weigh(formula=None, concentration=None, volume=None, purity=None, shelf_form=None):
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
    "CONVERT_CONCENTRATION",
    "Convert a concentration between units (mol/L, mmol/L, g/L, mg/L, % w/v, ppm, meq/L, % w/w ...).",
    [
        A("value", "the concentration", zero=ZERO_IS_ZERO),
        A("from_unit", "its unit, e.g. % w/w"),
        A("to_unit", "the unit wanted, e.g. mol/L"),
        A("formula", "the solute, e.g. HCl (not needed between mol/L and mmol/L)", True),
        A("density", "the solution's density in g/mL, for % w/w and mol/kg", True),
    ],
    "number, in to_unit",
    '=CELLCHEM.CONVERT_CONCENTRATION(37,"% w/w","mol/L","HCl",1.18) gives 11.98',
)
def _convert_concentration(value=None, from_unit=None, to_unit=None, formula=None, density=None):
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
    "ION_BALANCE",
    "Cation-anion balance of a water analysis, spilled as cations, anions (meq/L), error %, acceptable.",
    [
        A("ions", "a range of ions, e.g. Ca2+, HCO3-"),
        A("concentrations", "their concentrations", zero=ZERO_IS_ZERO),
        A("unit", "mg/L, mmol/L or meq/L (default meq/L)", True),
    ],
    "a row: cations meq/L, anions meq/L, error %, TRUE/FALSE (Standard Methods 1030 E)",
    '=CELLCHEM.ION_BALANCE(A2:A7,B2:B7,"mg/L")',
    ranges=False,
)
def _ion_balance(ions=None, concentrations=None, unit=None):
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
    "EC_VALID",
    "TRUE when an EC number (EINECS/ELINCS/NLP) has the standard form and a correct check digit.",
    [A("ec", "the EC number, e.g. 231-791-2")],
    "TRUE or FALSE",
    '=CELLCHEM.EC_VALID("231-791-2") gives TRUE',
)
def _ec_valid(ec=None):
    return cellwise(lambda e: sds.ec_is_valid(text(e, "ec")), [ec])


def _readings(words: frozenset[str]) -> str:
    return " or ".join(sorted(w for w in words if w)) or ""


@_register(
    "SIGNAL_WORD",
    "The signal word the hazard statements call for (GHS, CLP): Danger, Warning, or empty for none.",
    [A("hazard_statements", "the H (and EUH) statements, e.g. H290, H314, H335")],
    "text; 'Danger or Warning' where a statement's category decides and the statements do not say which",
    '=CELLCHEM.SIGNAL_WORD("H225, H319") gives Danger',
)
def _signal_word(hazard_statements=None):
    def one(h):
        codes = [c for group in sds.read_statements(text(h, "hazard_statements")) for c in group]
        words, _reason = sds.expected_signal_word(codes)
        return _readings(words)

    return cellwise(one, [hazard_statements])


@_register(
    "PICTOGRAMS",
    "The GHS pictograms the hazard statements call for, after the precedence rules (CLP Article 26).",
    [A("hazard_statements", "the H (and EUH) statements, e.g. H290, H314, H335")],
    "text, e.g. GHS05, GHS07; pictograms that may also be shown follow in brackets",
    '=CELLCHEM.PICTOGRAMS("H290, H314, H335") gives GHS05, GHS07',
)
def _pictograms(hazard_statements=None):
    def one(h):
        codes = [c for group in sds.read_statements(text(h, "hazard_statements")) for c in group]
        required, allowed = sds.expected_pictograms(codes)
        shown = ", ".join(sorted(required))
        extra = sorted(allowed - required)
        if extra:
            shown += (" " if shown else "") + "(may also show " + ", ".join(extra) + ")"
        return shown

    return cellwise(one, [hazard_statements])


def _first_finding(found) -> str:
    if not found:
        return ""
    order = {ERROR: 0, WARNING: 1, NOTE: 2}
    first = sorted(found, key=lambda f: order[f.severity])[0]
    return f"{first.severity}: {first.message}"


@_register(
    "CHECK_HAZARDS",
    "The verdict on an SDS line's hazard cells: empty when statements, signal word and pictograms agree.",
    [
        A("hazard_statements", "the H (and EUH) statements"),
        A("signal_word", "Danger, Warning, or empty", True),
        A("pictograms", "the pictogram codes, e.g. GHS02, GHS07", True),
        A("precautionary_statements", "the P statements", True),
    ],
    "text (empty when all agree)",
    '=CELLCHEM.CHECK_HAZARDS("H290, H314","Warning") gives error: signal word ... need Danger ...',
)
def _check_hazards(hazard_statements=None, signal_word=None, pictograms=None, precautionary_statements=None):
    def one(h, w, g, p):
        def given(v, what):
            return None if blank(v) else text(v, what)

        return _first_finding(
            sds.check_hazards(
                given(h, "hazard_statements"),
                given(p, "precautionary_statements"),
                given(w, "signal_word"),
                given(g, "pictograms"),
            )
        )

    return cellwise(
        one,
        [hazard_statements, signal_word, pictograms, precautionary_statements],
        blank_when=lambda v: all(blank(x) for x in v),
    )


@_register(
    "CHECK_UN",
    "The audit's verdict on a UN number: its form, and the substance where the UN table lists it.",
    [
        A("un", "the UN number, e.g. UN1789 or 1789"),
        A("cas", "the line's CAS RN", True),
        A("formula", "the line's formula", True),
    ],
    "text (empty when nothing is found)",
    '=CELLCHEM.CHECK_UN("UN1789","7697-37-2") gives warning: UN number ... is not one the table lists ...',
)
def _check_un(un=None, cas=None, formula=None):
    def one(u, c, f):
        return _first_finding(
            sds.check_un(
                text(u, "un"), None if blank(c) else text(c, "cas"), None if blank(f) else text(f, "formula")
            )
        )

    return cellwise(one, [un, cas, formula])


def _lookup(function: object) -> SheetFunction:
    """A function of the table by the name a user types, with or without the namespace."""
    typed = text(function, "function").upper()
    for head in {NAMESPACE + sep for sep in SEPARATOR.values()}:
        typed = typed.removeprefix(head)
    spec = FUNCTIONS.get(typed)
    if spec is None or typed == "WHY":
        raise CellchemError(
            f"function: {text(function, 'function')!r} is not a cellchem worksheet function; expected one of "
            + ", ".join(n for n in FUNCTIONS if n != "WHY")
        )
    return spec


@_register(
    "WHY",
    "Why a cellchem function refuses: its message for the same arguments, empty where it answers.",
    [
        A("function", "the function's name, e.g. MOLAR_MASS"),
        A("first", "its first argument", True, ZERO_AS_TARGET),
        A("second", "its second argument", True, ZERO_AS_TARGET),
        A("third", "its third argument", True, ZERO_AS_TARGET),
        A("fourth", "its fourth argument", True, ZERO_AS_TARGET),
        A("fifth", "its fifth argument", True, ZERO_AS_TARGET),
    ],
    "text (a range of texts for a range)",
    "=CELLCHEM.WHY(\"MOLAR_MASS\",\"NaCl2Xx\") gives unknown element symbol 'Xx' at position 6 in 'NaCl2Xx'",
    ranges=False,
)
def _why(function=None, first=None, second=None, third=None, fourth=None, fifth=None):
    try:
        spec = _lookup(function)
    except CellchemError as exc:
        return str(exc)
    given = [first, second, third, fourth, fifth]
    if any(v is not None for v in given[len(spec.arguments) :]):
        return f"{spec.name} takes {len(spec.arguments)} arguments; more were given"
    values = [settle_zero(v, a.zero) for v, a in zip(given, spec.arguments)]
    return reason(spec.implementation(*values))


def run(name: str, *args: object) -> object:
    """Call one function of the table by its name: run("MOLAR_MASS", "NaCl")."""
    return FUNCTIONS[name].implementation(*args)
