"""PSS-78 in noblegap.methods.electrolyte against the TEOS-10 GSW package (``gsw``
from PyPI, the same algorithm in independent C code; test time only)."""

import gsw
import numpy as np
import pytest

from noblegap.methods import electrolyte


@pytest.mark.parametrize("S", [2.0, 5.0, 10.0, 18.0, 30.0, 35.0, 40.0, 42.0])
@pytest.mark.parametrize("t", [-2.0, 0.0, 10.0, 15.0, 20.0, 25.0, 30.0, 35.0])
def test_conductivity_matches_gsw(S, t):
    ours_mS_cm = electrolyte.seawater_conductivity(S, t) * 10.0
    ref = float(gsw.C_from_SP(S, t, 0.0))
    assert ours_mS_cm == pytest.approx(ref, rel=1e-7, abs=1e-6)


def test_salinity_round_trip_matches_gsw_over_a_grid():
    C = np.linspace(5.0, 60.0, 12)
    for t in (0.0, 12.5, 25.0):
        for c in C:
            ref = float(gsw.SP_from_C(c, t, 0.0))
            if not 2.0 <= ref <= 42.0:
                continue
            ours = electrolyte.salinity_from_ratio(c / 42.914, electrolyte.t68_from_t90(t), 0.0)
            assert ours == pytest.approx(ref, abs=1e-6)


def test_outside_the_scale_is_refused():
    from noblegap.errors import RangeError
    with pytest.raises(RangeError, match="outside the range of PSS-78"):
        electrolyte.seawater_conductivity(1.0, 15.0)
    with pytest.raises(RangeError, match="outside the range of PSS-78"):
        electrolyte.seawater_conductivity(35.0, 40.0)
