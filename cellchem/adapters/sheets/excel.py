"""The cellchem worksheet functions for Excel, through xlwings.

Point xlwings at this module (``UDF Modules: cellchem.adapters.sheets.excel``
in the xlwings add-in's settings, or ``UDF_MODULES`` in ``xlwings.conf``) and
import the functions; each ``CC_*`` function then works in a cell like a
built-in one. Every argument arrives as a 2-D list (``ndim=2``), error cells
as their text (``err_to_str``); the results of a range of compounds spill.
The functions themselves are in ``sheet_functions``; this module only
declares them to xlwings. Without xlwings (or on a machine without Excel)
the decorators do nothing and the functions can still be called.
"""

from __future__ import annotations

from . import functions as sf

try:  # the 'excel' extra
    import xlwings as xw
except ImportError:  # pragma: no cover - inert without xlwings
    xw = None


def _func(fn):
    return xw.func(category="cellchem")(fn) if xw is not None else fn


def _arg(name: str, doc: str):
    if xw is None:
        return lambda fn: fn
    return xw.arg(name, ndim=2, err_to_str=True, doc=doc)


@_func
@_arg("name", "the name, e.g. copper(II) sulfate pentahydrate, ferric chloride")
def CC_FORMULA(name=None):
    """The formula of a compound named as suppliers name it."""
    return sf.cc_formula(name)


@_func
@_arg("formula", "the formula, e.g. CuSO4.5H2O")
@_arg("style", "iupac (default), british, american or legacy (ferric, cupric)")
def CC_NAME(formula=None, style=None):
    """The systematic (IUPAC) name of a formula."""
    return sf.cc_name(formula, style)


@_func
@_arg("cation", "the cation, e.g. Fe3+ or iron(III)")
@_arg("anion", "the anion, e.g. SO4 2- or sulfate")
def CC_SALT(cation=None, anion=None):
    """The neutral compound of a cation and an anion, by charge balance."""
    return sf.cc_salt(cation, anion)


@_func
@_arg("formula", "the formula, e.g. CuSO4.5H2O")
def CC_MOLARMASS(formula=None):
    """Molar mass of a formula from the standard atomic weights, in g/mol."""
    return sf.cc_molarmass(formula)


@_func
@_arg("formula", "the formula, e.g. CuSO4.5H2O")
@_arg("part", "the element or ion, e.g. Cu or SO4")
def CC_MASSFRACTION(formula=None, part=None):
    """Mass fraction of an element or ion in a formula (0 to 1)."""
    return sf.cc_massfraction(formula, part)


@_func
@_arg("formula", "the formula, e.g. SO4 2- or NaCl")
def CC_NETCHARGE(formula=None):
    """The net charge of an ion or compound."""
    return sf.cc_netcharge(formula)


@_func
@_arg("formula", "the formula, e.g. KMnO4")
@_arg("element", "the element symbol, e.g. Mn")
def CC_OXSTATE(formula=None, element=None):
    """The oxidation state of an element in a formula."""
    return sf.cc_oxstate(formula, element)


@_func
@_arg("formula", "the formula, e.g. NaCl2")
def CC_BALANCED(formula=None):
    """TRUE when the formula's charges balance (catalog ions, or oxidation states for a molecule)."""
    return sf.cc_balanced(formula)


@_func
@_arg("name", "the name on the line")
@_arg("formula", "the formula on the line")
@_arg("molar_mass", "the stated molar mass in g/mol")
@_arg("cas", "the CAS RN")
def CC_CHECKLINE(name=None, formula=None, molar_mass=None, cas=None):
    """The audit's verdict on one line: empty when name, formula, molar mass and CAS RN agree."""
    return sf.cc_checkline(name, formula, molar_mass, cas)


@_func
@_arg("cas", "the CAS RN, e.g. 7732-18-5")
def CC_CASVALID(cas=None):
    """TRUE when a CAS RN has the standard form and a correct check digit."""
    return sf.cc_casvalid(cas)


@_func
@_arg("cas", "the CAS RN, e.g. 7758-99-8")
@_arg("what", "formula (the default), name or molar mass")
def CC_SUBSTANCE(cas=None, what=None):
    """What the substance table holds for a CAS RN: its formula, name or molar mass (open data, PubChem)."""
    return sf.cc_substance(cas, what)


@_func
@_arg("formula", "one formula, e.g. Al2(SO4)3")
def CC_IONS(formula=None):
    """The ions a solute gives in water, spilled as rows of ion, count and charge."""
    return sf.cc_ions(formula)


@_func
@_arg("solutes", "a range of formulas, e.g. NaCl, K2SO4")
@_arg("concentrations", "their concentrations: numbers in mol/L or text with a unit, e.g. 10 mmol/L")
def CC_IONICSTRENGTH(solutes=None, concentrations=None):
    """Ionic strength of a solution of strong electrolytes, in mol/L."""
    return sf.cc_ionicstrength(solutes, concentrations)


@_func
@_arg("ion", "the ion, e.g. Ca2+")
@_arg("ionic_strength", "the ionic strength in mol/L")
@_arg("model", "davies (default), extended or limiting")
@_arg("temperature_c", "temperature in degrees C, 0 to 100 (default 25)")
def CC_ACTIVITY(ion=None, ionic_strength=None, model=None, temperature_c=None):
    """Activity coefficient of an ion (Davies, extended Debye-Huckel or limiting law)."""
    return sf.cc_activity(ion, ionic_strength, model, temperature_c)


@_func
@_arg("solutes", "a range of formulas, e.g. KCl")
@_arg("concentrations", "their concentrations: numbers in mol/L or text with a unit")
@_arg("temperature_c", "15 to 35 degrees C (default 25, the meter's reference)")
def CC_CONDUCTIVITY(solutes=None, concentrations=None, temperature_c=None):
    """Estimated conductivity of a dilute solution, in uS/cm."""
    return sf.cc_conductivity(solutes, concentrations, temperature_c)


@_func
@_arg("formula", "the solute the recipe is written for, e.g. CuSO4")
@_arg("concentration", "the target: a number in mol/L or text with a unit, e.g. 0.1 M, 25 g/L")
@_arg("volume", "the final volume: a number in L or text with a unit, e.g. 250 mL")
@_arg("purity", "the assay, a fraction (0.995) or text (99.5%); default 1")
@_arg("shelf_form", "what is on the shelf when it differs in water, e.g. CuSO4.5H2O")
def CC_GRAMS(formula=None, concentration=None, volume=None, purity=None, shelf_form=None):
    """Grams to weigh for a solution, with the purity and the hydrate on the shelf."""
    return sf.cc_grams(formula, concentration, volume, purity, shelf_form)


@_func
@_arg("value", "the concentration")
@_arg("from_unit", "its unit, e.g. % w/w")
@_arg("to_unit", "the unit wanted, e.g. mol/L")
@_arg("formula", "the solute, e.g. HCl")
@_arg("density", "the solution's density in g/mL, for % w/w and mol/kg")
def CC_CONVERT(value=None, from_unit=None, to_unit=None, formula=None, density=None):
    """Convert a concentration between units (mol/L, mmol/L, g/L, mg/L, % w/v, ppm, meq/L, % w/w ...)."""
    return sf.cc_convert(value, from_unit, to_unit, formula, density)


@_func
@_arg("ions", "a range of ions, e.g. Ca2+, HCO3-")
@_arg("concentrations", "their concentrations")
@_arg("unit", "mg/L, mmol/L or meq/L (default meq/L)")
def CC_IONBALANCE(ions=None, concentrations=None, unit=None):
    """Cation-anion balance of a water analysis, spilled as cations, anions (meq/L), error %, acceptable."""
    return sf.cc_ionbalance(ions, concentrations, unit)


@_func
@_arg("text", "a cell showing #cellchem: ...")
def CC_FULLMESSAGE(text=None):
    """The whole message behind a short #cellchem: text in a cell."""
    return sf.cc_fullmessage(text)
