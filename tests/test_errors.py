"""The one error family (cellchem/errors.py): every refusal of the core is a
CellchemError, the name reader's refusals are NameReadErrors that say why, and
the warning of a value outside its model's range is one of the family and a
UserWarning at once."""

import importlib
import pickle
import warnings

import pytest

import cellchem.activity
import cellchem.names
import cellchem.solutions
from cellchem import CellchemError, activity_coefficient, read_name
from cellchem.errors import NameReadError, RangeWarning


def test_name_read_error_is_a_cellchem_error_that_says_why():
    assert issubclass(NameReadError, CellchemError) and issubclass(NameReadError, ValueError)
    assert cellchem.names.NameReadError is NameReadError
    with pytest.raises(NameReadError) as info:
        read_name("iron chloride")  # the charge of iron is open: FeCl2 or FeCl3 (common practice)
    err = info.value
    assert err.reason == "open-charge" and set(err.choices) == {"FeCl2", "FeCl3"}
    assert err.exit_code == 2


def test_name_read_error_keeps_its_fields_through_pickling():
    err = NameReadError("'x' names ions", text="x", choices=("A",), reason="ratio", ions=(("Na", 1),))
    back = pickle.loads(pickle.dumps(err))
    assert type(back) is NameReadError
    assert (back.message, back.text, back.choices, back.reason, back.ions) == (
        "'x' names ions",
        "x",
        ("A",),
        "ratio",
        (("Na", 1),),
    )


def test_range_warning_is_one_of_the_family_and_a_user_warning():
    assert issubclass(RangeWarning, CellchemError) and issubclass(RangeWarning, UserWarning)
    # the modules that issue it give the same class under the names they always had
    assert cellchem.solutions.RangeWarning is RangeWarning
    assert cellchem.activity.RangeWarning is RangeWarning
    assert importlib.import_module("cellchem.conductivity").RangeWarning is RangeWarning


def test_range_warning_works_with_warnings_and_pytest_warns():
    # 0.5 mol/L NaCl is past the Davies equation's 1:1 limit of 0.1 (activity.py's table)
    with pytest.warns(RangeWarning, match="the limit to which the Davies equation is trusted"):
        value = activity_coefficient("Na+", 0.5, model="davies", outside_range="warn")
    assert any("the limit to which the Davies equation is trusted" in note for note in value.notes)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", UserWarning)
        warnings.simplefilter("ignore", RangeWarning)  # the later filter is looked at first
        activity_coefficient("Na+", 0.5, model="davies", outside_range="warn")
    assert not caught  # a filter on RangeWarning silences it
    with warnings.catch_warnings():
        warnings.simplefilter("error", UserWarning)  # a filter on UserWarning catches it
        with pytest.raises(RangeWarning):
            activity_coefficient("Na+", 0.5, model="davies", outside_range="warn")


def test_range_warning_message_stays_on_one_line():
    warning = RangeWarning("past the limit\nof the model")
    assert str(warning) == "past the limit\\nof the model"
