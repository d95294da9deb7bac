"""ASTM G102's conversion of a current density into a penetration rate, written
once for the published checks of own corrosion currents:

    CR (mm/y) = K · i (µA/cm²) · EW / ρ,  K = 3.27e-3 mm·g/(µA·cm·yr)

(ASTM G102, Table 1), with the alloy row's equivalent weight and density. It
is kept apart from the core's own Faraday code (checked against the same K in
test_faraday_published.py), so these checks do not lean on what they test.
"""

from __future__ import annotations

from noblegap.materials import data

K_MM_G_PER_UA_CM_YR = 3.27e-3


def rate_mm_per_yr(i_A_m2: float, alloy_id: str) -> float:
    """The penetration rate of a current density (A/m²) on the alloy row ``alloy_id``."""
    alloy = data.index("alloys")[alloy_id]
    i_uA_cm2 = i_A_m2 * 100.0          # 1 A/m² = 100 µA/cm²
    return K_MM_G_PER_UA_CM_YR * i_uA_cm2 * alloy["equivalent_weight_g_mol"] / alloy["density_g_cm3"]
