"""Input fields that several calculators share."""

from __future__ import annotations

from ..materials.references import reference_ids
from ..schema import CHOICE, QUANTITY, Field

TEMPERATURE_HELP = ("Liquid water at 1 atm: 0 to 100 °C. Reference potentials are "
                    "tabulated at 25 °C.")


def temperature_field(key="temperature", label="Temperature", default="25 °C", help=""):
    """The temperature input every calculator shares (0–100 °C, liquid water)."""
    return Field(key, label, QUANTITY, default=default, quantity="temperature", unit="degC",
                 min=273.15, max=373.15, help=help or TEMPERATURE_HELP,
                 range_note="The tabulated data applies to liquid water at 1 atm.")


def reference_field(key, label, default, help=""):
    """A choice of reference electrode."""
    return Field(key, label, CHOICE, default=default, choices=reference_ids,
                 help=help or "Reference electrode the potential is measured against.",
                 source="data/reference_electrodes.csv")
