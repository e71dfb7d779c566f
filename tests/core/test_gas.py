"""Air properties against published values.

Published-value checks only; each case names its source beside it. Tolerances come from the
digits the source prints (half a unit in the last printed digit) unless a comment says
otherwise. Values marked "from memory" were recalled, not read from the printed page.
"""

from __future__ import annotations

import math

import pytest

from driftdose import gas


def half_unit(printed: str) -> float:
    """Relative half-unit of the last digit of a printed number, e.g. '1.81e-5' -> 0.28 %."""
    mantissa = printed.lower().split("e")[0]
    decimals = len(mantissa.split(".")[1]) if "." in mantissa else 0
    return 0.5 * 10.0**-decimals / abs(float(mantissa))


# ---------------------------------------------------------------------------------------------
# Viscosity (Sutherland's law, U.S. Standard Atmosphere 1976 constants)
# ---------------------------------------------------------------------------------------------

SUTHERLAND_ACCURACY = 0.02
"""Stated accuracy of Sutherland's law for air, about +-2 % from 170 K to 1900 K (White,
Viscous Fluid Flow, 3rd ed. 2006, Table 1-2; from memory). Used only where the reference is
measured data rather than the same law."""


@pytest.mark.parametrize(
    ("T", "printed", "extra"),
    [
        # Hinds (1999) Aerosol Technology, Appendix A1: air at 20 degC, 1.81e-5 Pa s
        # (also the usual handbook value).
        pytest.param(293.15, "1.81e-5", 0.0, id="hinds1999-A1-20C"),
        # U.S. Standard Atmosphere 1976, Table I: sea level (288.15 K) 1.7894e-5 N s/m^2
        # (from memory). Same law and constants, so only print precision applies.
        pytest.param(288.15, "1.7894e-5", 0.0, id="ussa1976-sea-level"),
        # Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table A.4, air at
        # 1 atm: mu x 1e7 = 159.6, 184.6, 208.2, 230.1 N s/m^2 at 250, 300, 350, 400 K
        # (from memory). Measured-data table: allow Sutherland's stated accuracy.
        pytest.param(250.0, "159.6e-7", SUTHERLAND_ACCURACY, id="incropera-A4-250K"),
        pytest.param(300.0, "184.6e-7", SUTHERLAND_ACCURACY, id="incropera-A4-300K"),
        pytest.param(350.0, "208.2e-7", SUTHERLAND_ACCURACY, id="incropera-A4-350K"),
        pytest.param(400.0, "230.1e-7", SUTHERLAND_ACCURACY, id="incropera-A4-400K"),
    ],
)
def test_air_viscosity_published(T: float, printed: str, extra: float) -> None:
    expected = float(printed)
    assert gas.air_viscosity(T) == pytest.approx(expected, rel=half_unit(printed) + extra)


def test_air_viscosity_default_is_20C() -> None:
    # the core's defaults (constants.T_DEFAULT, P_DEFAULT): 293.15 K and 101325 Pa
    assert gas.air_viscosity() == gas.air_viscosity(293.15)


# ---------------------------------------------------------------------------------------------
# Mean free path (Willeke 1976 scaling of a reference state)
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("T", "P", "reference", "printed"),
    [
        # Hinds (1999) section 2.5: 0.066 um at 20 degC and 1 atm, scaled from the default
        # (Kim et al. 2005) reference state.
        pytest.param(293.15, 101325.0, "kim2005", "0.066e-6", id="hinds1999-2.5-20C"),
        # Hinds's own reference state reproduces itself.
        pytest.param(293.15, 101325.0, "hinds1999", "0.066e-6", id="hinds1999-own-ref"),
        # Kim et al. (2005) J. Res. NIST 110:31, 67.3 nm at 296.15 K and 101.3 kPa.
        pytest.param(296.15, 101.3e3, "kim2005", "67.3e-9", id="kim2005-296K"),
        # Allen & Raabe (1985) Aerosol Sci. Technol. 4:269: 0.0673 um at 23 degC, 1 atm.
        pytest.param(296.15, 101325.0, "allen_raabe1985", "0.0673e-6", id="allen_raabe1985-23C"),
    ],
)
def test_mean_free_path_published(T: float, P: float, reference: str, printed: str) -> None:
    expected = float(printed)
    got = gas.mean_free_path(T, P, reference=reference)
    assert got == pytest.approx(expected, rel=half_unit(printed))


def test_mean_free_path_willeke_temperature_form() -> None:
    # Willeke (1976) eq. 2: lambda / lambda_r = (P_r/P)(T/T_r)(1 + S/T_r)/(1 + S/T);
    # from 296.15 K to 373.15 K at constant pressure, computed by hand from the equation.
    ratio = (373.15 / 296.15) * (1 + 110.4 / 296.15) / (1 + 110.4 / 373.15)
    assert gas.mean_free_path(373.15) / gas.mean_free_path(296.15) == pytest.approx(ratio)


def test_mean_free_path_inverse_pressure() -> None:
    # Kinetic theory (Hinds 1999 eq. 2.25): lambda is inversely proportional to pressure.
    assert gas.mean_free_path(293.15, 50e3) * 50e3 == pytest.approx(
        gas.mean_free_path(293.15, 150e3) * 150e3
    )


def test_mean_free_path_unknown_reference_lists_valid() -> None:
    with pytest.raises(ValueError, match="kim2005"):
        gas.mean_free_path(293.15, 101325.0, reference="nonsense")


# ---------------------------------------------------------------------------------------------
# Density (ideal gas)
# ---------------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("T", "printed"),
    [
        # Hinds (1999) Appendix A1: 1.20 kg/m^3 at 20 degC, 1 atm.
        pytest.param(293.15, "1.20", id="hinds1999-A1-20C"),
        # U.S. Standard Atmosphere 1976, sea level: 1.2250 kg/m^3 at 288.15 K (from memory).
        pytest.param(288.15, "1.2250", id="ussa1976-sea-level"),
    ],
)
def test_air_density_published(T: float, printed: str) -> None:
    assert gas.air_density(T, 101325.0) == pytest.approx(float(printed), rel=half_unit(printed))


def test_half_unit_helper() -> None:
    # The tolerance helper itself: '1.81e-5' printed to 0.01e-5 -> half unit 0.005/1.81.
    assert half_unit("1.81e-5") == pytest.approx(0.005 / 1.81)
    assert half_unit("22.2") == pytest.approx(0.05 / 22.2)
    assert math.isclose(half_unit("3.5e-5"), 0.05 / 3.5)
