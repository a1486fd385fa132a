"""cellchem: ionic chemistry for chemical stores.

The public core: read formulas, molar masses and compositions from standard
atomic weights, the ion catalog and salts by charge balance, oxidation states,
and inorganic names both ways.
Pure functions over plain values; no spreadsheet library is imported here.
"""

from .charge import ChargeBalance, charge_balance, net_charge, oxidation_state
from .elements import Element, element
from .errors import CellchemError
from .formula import Formula, parse_formula
from .ions import Ion, find_ion, salt_formula
from .mass import composition, mass_fraction, molar_mass
from .names import NameReading, formula_from_name, name_from_formula, read_name

__version__ = "0.1.0"

__all__ = [
    "CellchemError",
    "ChargeBalance",
    "Element",
    "Formula",
    "Ion",
    "NameReading",
    "charge_balance",
    "composition",
    "element",
    "find_ion",
    "formula_from_name",
    "mass_fraction",
    "molar_mass",
    "name_from_formula",
    "net_charge",
    "oxidation_state",
    "parse_formula",
    "read_name",
    "salt_formula",
]
