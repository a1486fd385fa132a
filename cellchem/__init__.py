"""cellchem: ionic chemistry for chemical stores.

The public core: read formulas, molar masses and compositions from standard
atomic weights, the ion catalog and salts by charge balance, oxidation states,
inorganic names both ways, and solutions of ions (dissociation, ionic
strength, activity, conductivity, recipes, dilution, ion balance), and the
audit's checks over plain rows (``audit_rows``, ``cas_is_valid``).
Pure functions over plain values; no spreadsheet library is imported here.
"""

from .activity import activity_coefficient, mean_activity_coefficient
from .audit import audit_rows
from .cas import cas_is_valid
from .charge import ChargeBalance, charge_balance, net_charge, oxidation_state
from .conductivity import conductivity
from .elements import Element, element
from .errors import CellchemError
from .formula import Formula
from .ionbalance import IonBalance, ion_balance
from .ions import Ion
from .mass import composition, mass_fraction, molar_mass
from .names import NameReading, formula_from_name, name_from_formula, read_name
from .packs import Pack, read_pack
from .reading import find_ion, parse_formula, salt_formula
from .recipes import (
    Dilution,
    Recipe,
    concentration_from_mass,
    convert_concentration,
    dilution,
    mass_for_solution,
)
from .sds import check_hazards, check_un, ec_is_valid, read_ec, read_statements, read_un
from .solutions import Dissociation, Value, ionic_strength, ions_of, solubility
from .store import StoreLine, concern, duplicates, segregation, totals
from .substances import Substance, find_substances, substance

__version__ = "0.1.0"

__all__ = [
    "CellchemError",
    "ChargeBalance",
    "Dilution",
    "Dissociation",
    "Element",
    "Formula",
    "Ion",
    "IonBalance",
    "NameReading",
    "Pack",
    "Recipe",
    "StoreLine",
    "Substance",
    "Value",
    "activity_coefficient",
    "audit_rows",
    "cas_is_valid",
    "charge_balance",
    "check_hazards",
    "check_un",
    "composition",
    "concentration_from_mass",
    "concern",
    "conductivity",
    "convert_concentration",
    "dilution",
    "duplicates",
    "ec_is_valid",
    "element",
    "find_ion",
    "find_substances",
    "formula_from_name",
    "ion_balance",
    "ionic_strength",
    "ions_of",
    "mass_for_solution",
    "mass_fraction",
    "mean_activity_coefficient",
    "molar_mass",
    "name_from_formula",
    "net_charge",
    "oxidation_state",
    "parse_formula",
    "read_ec",
    "read_name",
    "read_pack",
    "read_statements",
    "read_un",
    "salt_formula",
    "segregation",
    "solubility",
    "substance",
    "totals",
]
