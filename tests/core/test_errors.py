"""errors.py: structured errors that inherit the matching built-in."""

import json

from noblegap.errors import (ChoiceError, DataError, InputError, InputErrors,
                             MissingDataError, NoblegapError, RangeError, UnitError)


def test_subclasses_inherit_matching_builtins():
    assert issubclass(InputError, ValueError) and issubclass(InputError, NoblegapError)
    assert issubclass(UnitError, ValueError) and issubclass(RangeError, ValueError)
    assert issubclass(ChoiceError, KeyError)
    assert issubclass(MissingDataError, LookupError)
    assert issubclass(DataError, ValueError)


def test_to_dict_crosses_json_intact():
    err = ChoiceError("Unknown metal 'Zx'.", field="metal_a", value="Zx",
                      allowed="Zn, Cu", suggestions=["Zn"])
    d = json.loads(json.dumps(err.to_dict()))
    assert d == {"type": "ChoiceError", "kind": "input",
                 "message": "Unknown metal 'Zx'. Allowed: Zn, Cu. Did you mean: Zn?",
                 "field": "metal_a", "value": "Zx", "allowed": "Zn, Cu",
                 "label": None, "suggestions": ["Zn"]}


def test_input_errors_keep_every_field():
    errs = InputErrors([InputError("a bad", field="a", value="1"),
                        UnitError("b bad", field="b", value="2 kg")])
    d = errs.to_dict()
    assert [e["field"] for e in d["errors"]] == ["a", "b"]
    assert "2 inputs need attention" in d["message"]


def test_data_error_names_file_row_column():
    err = DataError("'x' is not a number", file="alloys.csv", row=7, column="density_g_cm3")
    assert str(err) == "file alloys.csv, row 7, column density_g_cm3: 'x' is not a number"
