"""ICAO Standard Atmosphere, pressure and density altitude, and airspeed conversions.

The model covers the troposphere (linear lapse) and the isothermal lower stratosphere of the ICAO
Standard Atmosphere, i.e. geopotential pressure altitudes up to 20 km (65,617 ft). Pressure
altitude is geopotential by definition, so no geometric/geopotential conversion is needed here.

Indicated airspeed is taken as calibrated airspeed (no position or instrument error): the crew
reads IAS, the flight manual's IAS-CAS correction is small at circling speeds and is not modelled.

Validity ranges (a `DomainError` is raised outside them, never a silent NaN):

* pressure altitude: -5,000 ft to 60,000 ft (the lower stratosphere ends at 65,617 ft);
* altitude (indicated, or above mean sea level): -2,000 ft to 60,000 ft;
* altimeter setting: 850 hPa to 1,100 hPa;
* outside air temperature: -100 degC to +60 degC;
* calibrated airspeed: above 0 and up to 600 kt, with a subsonic true Mach number (< 1).

References
----------
.. [1] ICAO, "Manual of the ICAO Standard Atmosphere (extended to 80 kilometres)," Doc 7488/3,
   3rd ed., 1993, Section 2 (defining constants), Table A (primary constants), Section 3
   (equations for temperature, pressure and density in layers with and without a lapse rate).
.. [2] ICAO, "Procedures for Air Navigation Services - Aircraft Operations," Doc 8168, Vol I,
   Part III, Section 1, Chapter 4 (the altimeter is calibrated to the standard atmosphere; the
   sub-scale setting shifts the datum).
.. [3] NASA, "Measurement of Aircraft Speed and Altitude," NASA Reference Publication 1046,
   1980, the subsonic airspeed equations (calibrated airspeed from impact pressure at sea-level
   standard conditions; Mach number from impact and static pressure). The chapter and equation
   numbers were not checked (from memory); the relations are the isentropic flow relations for
   gamma = 1.4.
"""

from __future__ import annotations

import math

from briefer._dataclass import dataclass

import numpy as np

from briefer import units
from briefer.core import angles
from briefer.core._types import Numeric
from briefer.core.ranges import SCALAR_TYPES as _S
from briefer.core.ranges import checked as _checked  # the one range check of the core
from briefer.core.ranges import checked_float as _checked_f
from briefer.errors import DomainError

__all__ = [
    "AirData",
    "ALTITUDE_RANGE_FT",
    "PRESSURE_ALTITUDE_RANGE_FT",
    "ALTIMETER_RANGE_HPA",
    "OAT_RANGE_C",
    "CAS_MAX_KT",
    "isa_temperature_c",
    "isa_temperature_k",
    "isa_pressure_hpa",
    "isa_pressure_altitude_ft",
    "isa_speed_of_sound_kt",
    "speed_of_sound_kt",
    "pressure_altitude_ft",
    "pressure_altitude_rule_of_thumb_ft",
    "oat_at_altitude_c",
    "density_ratio",
    "density_altitude_ft",
    "tas_from_cas_kt",
    "cas_from_tas_kt",
    "eas_from_cas_kt",
    "air_data",
]

# --- defining constants of the ICAO Standard Atmosphere [1] Section 2, Table A --------------
T0_K = 288.15                     # [1] sea-level temperature
P0_PA = 101325.0                  # [1] sea-level pressure
RHO0_KG_PER_M3 = 1.225            # [1] sea-level density
R_J_PER_KG_K = 287.05287          # [1] specific gas constant of dry air, R* / M0
GAMMA = 1.4                       # [1] ratio of specific heats of air
LAPSE_K_PER_M = -0.0065           # [1] troposphere temperature gradient, 0 to 11 km
TROPOPAUSE_M = 11000.0            # [1] geopotential height of the tropopause
STRATOSPHERE_TOP_M = 20000.0      # [1] top of the isothermal layer
T11_K = T0_K + LAPSE_K_PER_M * TROPOPAUSE_M          # 216.65 K [1]
_N_TROPO = -units.G0_MPS2 / (LAPSE_K_PER_M * R_J_PER_KG_K)   # g0/(|L| R) = 5.25588
P11_PA = P0_PA * (T11_K / T0_K) ** _N_TROPO          # 22632.06 Pa [1] Table 5 at 11 km
SIGMA11 = (P11_PA / P0_PA) * (T0_K / T11_K)          # density ratio at the tropopause
A0_MPS = float(np.sqrt(GAMMA * R_J_PER_KG_K * T0_K))  # 340.294 m/s [1]

# Lapse rate per foot (the same -6.5 K/km expressed per ft; pilots round to 2 degC/1000 ft).
LAPSE_C_PER_FT = LAPSE_K_PER_M * units.FT_TO_M

# --- documented validity ranges --------------------------------------------------------------
PRESSURE_ALTITUDE_RANGE_FT = (-5000.0, 60000.0)
ALTITUDE_RANGE_FT = (-2000.0, 60000.0)
ALTIMETER_RANGE_HPA = (850.0, 1100.0)
OAT_RANGE_C = (-100.0, 60.0)
CAS_MAX_KT = 600.0
STANDARD_ALTIMETER_HPA = P0_PA / units.HPA_TO_PA       # 1013.25 hPa
_RULE_OF_THUMB_STANDARD_INHG = 29.92                   # rule-of-thumb datum (2 decimals)
_RULE_OF_THUMB_FT_PER_INHG = 1000.0                    # "1 inch = 1000 ft"


def _pressure_altitude_m(pressure_altitude_ft: Numeric) -> np.ndarray:
    h_ft = _checked("pressure_altitude_ft", pressure_altitude_ft, *PRESSURE_ALTITUDE_RANGE_FT, "ft")
    return h_ft * units.FT_TO_M


def _oat_k(oat_c: Numeric) -> np.ndarray:
    return units.kelvin_from_celsius(_checked("oat_c", oat_c, *OAT_RANGE_C, "degC"))


def _sound_speed_kt(t_k: np.ndarray) -> np.ndarray:
    """Speed of sound [kt] at a temperature [K] (already checked): a = sqrt(gamma R T) [1]."""
    return np.sqrt(GAMMA * R_J_PER_KG_K * t_k) * units.MPS_TO_KT


def _static_air(pressure_altitude_ft: Numeric, oat_c: Numeric) -> tuple[np.ndarray, np.ndarray]:
    """Static pressure [Pa] at a pressure altitude and the air's temperature [K], both checked."""
    _, p = _isa_t_p(_pressure_altitude_m(pressure_altitude_ft))
    return p, _oat_k(oat_c)


def _isa_t_p(h_m: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """ISA temperature [K] and pressure [Pa] at geopotential height h (already checked)."""
    tropo = h_m <= TROPOPAUSE_M
    h_tropo = np.minimum(h_m, TROPOPAUSE_M)
    t_tropo = T0_K + LAPSE_K_PER_M * h_tropo                       # [1] eq. T = T_b + L (H - H_b)
    p_tropo = P0_PA * (t_tropo / T0_K) ** _N_TROPO                 # [1] eq. p = p_b (T/T_b)^(-g0/(L R))
    h_strat = np.maximum(h_m - TROPOPAUSE_M, 0.0)
    p_strat = P11_PA * np.exp(-units.G0_MPS2 * h_strat / (R_J_PER_KG_K * T11_K))  # [1] eq. isothermal layer
    t = np.where(tropo, t_tropo, T11_K)
    p = np.where(tropo, p_tropo, p_strat)
    return t, p


# The scalar paths: one number in, a Python float out, the array path's operations in its order
# with `math` (only the branch the array path selects is computed), so a brief's single figures
# skip numpy's per-call cost. tests/test_scalar_paths.py holds them to the array path bit for bit.
def _isa_t_p_f(h_m: float) -> tuple[float, float]:
    """`_isa_t_p` of one checked height [m]: ISA temperature [K] and pressure [Pa]."""
    if h_m <= TROPOPAUSE_M:
        t_tropo = T0_K + LAPSE_K_PER_M * h_m
        return t_tropo, P0_PA * (t_tropo / T0_K) ** _N_TROPO
    return T11_K, P11_PA * math.exp(-units.G0_MPS2 * (h_m - TROPOPAUSE_M) / (R_J_PER_KG_K * T11_K))


def _pressure_altitude_m_f(pressure_altitude_ft: float) -> float:
    return _checked_f("pressure_altitude_ft", pressure_altitude_ft, *PRESSURE_ALTITUDE_RANGE_FT, "ft") * units.FT_TO_M


def _static_air_f(pressure_altitude_ft: float, oat_c: float) -> tuple[float, float]:
    """`_static_air` of one number each: static pressure [Pa], temperature [K]."""
    _, p = _isa_t_p_f(_pressure_altitude_m_f(pressure_altitude_ft))
    return p, units.kelvin_from_celsius(_checked_f("oat_c", oat_c, *OAT_RANGE_C, "degC"))


def isa_temperature_k(pressure_altitude_ft: Numeric) -> Numeric:
    """Temperature of the ICAO Standard Atmosphere at a pressure altitude.

    Parameters
    ----------
    pressure_altitude_ft : numeric
        Pressure (geopotential) altitude, -5,000 to 60,000. [ft]

    Returns
    -------
    numeric
        Standard temperature. [K]

    Raises
    ------
    DomainError
        If any altitude is outside -5,000 to 60,000 ft.

    Notes
    -----
    T = T0 + L H below 11 km (T0 = 288.15 K, L = -0.0065 K/m), T = 216.65 K from 11 to 20 km [1]_.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 2, Table A.
    """
    if type(pressure_altitude_ft) in _S:
        return _isa_t_p_f(_pressure_altitude_m_f(pressure_altitude_ft))[0]
    t, _ = _isa_t_p(_pressure_altitude_m(pressure_altitude_ft))
    return angles.as_float(t)


def isa_temperature_c(pressure_altitude_ft: Numeric) -> Numeric:
    """Temperature of the ICAO Standard Atmosphere at a pressure altitude.

    Parameters
    ----------
    pressure_altitude_ft : numeric
        Pressure (geopotential) altitude, -5,000 to 60,000. [ft]

    Returns
    -------
    numeric
        Standard temperature. [degC]

    Raises
    ------
    DomainError
        If any altitude is outside -5,000 to 60,000 ft.

    Notes
    -----
    15 degC at sea level, -6.5 K/km (-1.98 degC per 1000 ft) up to 11 km, -56.5 degC above [1]_.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 2, Table A.
    """
    t_k = isa_temperature_k(pressure_altitude_ft)
    if type(t_k) is float:
        return units.celsius_from_kelvin(t_k)
    return angles.as_float(units.celsius_from_kelvin(np.asarray(t_k)))


def isa_pressure_hpa(pressure_altitude_ft: Numeric) -> Numeric:
    """Static pressure of the ICAO Standard Atmosphere at a pressure altitude.

    Parameters
    ----------
    pressure_altitude_ft : numeric
        Pressure (geopotential) altitude, -5,000 to 60,000. [ft]

    Returns
    -------
    numeric
        Standard pressure. [hPa]

    Raises
    ------
    DomainError
        If any altitude is outside -5,000 to 60,000 ft.

    Notes
    -----
    p = p0 (T/T0)^(g0/(|L| R)) in the troposphere and p = p11 exp(-g0 (H - H11)/(R T11)) in the
    isothermal layer, p0 = 1013.25 hPa [1]_.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 3.
    """
    _, p = _isa_t_p(_pressure_altitude_m(pressure_altitude_ft))
    return angles.as_float(p / units.HPA_TO_PA)


_PRESSURE_RANGE_HPA: list[tuple[float, float]] = []


def _pressure_range_hpa() -> tuple[float, float]:
    """The standard pressures at the top and the bottom of the altitude range [hPa] (computed once)."""
    if not _PRESSURE_RANGE_HPA:
        lo_ft, hi_ft = PRESSURE_ALTITUDE_RANGE_FT
        _PRESSURE_RANGE_HPA.append((float(isa_pressure_hpa(hi_ft)), float(isa_pressure_hpa(lo_ft))))
    return _PRESSURE_RANGE_HPA[0]


def isa_pressure_altitude_ft(pressure_hpa: Numeric) -> Numeric:
    """Pressure altitude of a static pressure in the ICAO Standard Atmosphere (inverse of
    :func:`isa_pressure_hpa`).

    Parameters
    ----------
    pressure_hpa : numeric
        Static pressure, between the standard pressures at 60,000 ft (about 71.7 hPa) and at
        -5,000 ft (about 1,210 hPa). [hPa]

    Returns
    -------
    numeric
        Pressure altitude. [ft]

    Raises
    ------
    DomainError
        If the pressure lies outside that range.

    Notes
    -----
    H = (T0/L) ((p/p0)^(1/n) - 1) with n = g0/(|L| R) in the troposphere; above 11 km
    H = 11 km - (R T11/g0) ln(p/p11) [1]_.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 3.
    """
    p_min, p_max = _pressure_range_hpa()
    # a few 1e-9 of slack so the round trip at the range ends does not fail on rounding
    if type(pressure_hpa) in _S:
        p_f = _checked_f("pressure_hpa", pressure_hpa, p_min * (1 - 1e-9), p_max * (1 + 1e-9), "hPa") * units.HPA_TO_PA
        if p_f >= P11_PA:
            return (T0_K / LAPSE_K_PER_M) * ((p_f / P0_PA) ** (1.0 / _N_TROPO) - 1.0) * units.M_TO_FT
        return (TROPOPAUSE_M - (R_J_PER_KG_K * T11_K / units.G0_MPS2) * math.log(p_f / P11_PA)) * units.M_TO_FT
    p_pa = _checked("pressure_hpa", pressure_hpa, p_min * (1 - 1e-9), p_max * (1 + 1e-9), "hPa") * units.HPA_TO_PA
    h_tropo = (T0_K / LAPSE_K_PER_M) * ((p_pa / P0_PA) ** (1.0 / _N_TROPO) - 1.0)   # [1] eq. inverted
    with np.errstate(divide="ignore"):
        h_strat = TROPOPAUSE_M - (R_J_PER_KG_K * T11_K / units.G0_MPS2) * np.log(p_pa / P11_PA)  # [1] eq. inverted
    h_m = np.where(p_pa >= P11_PA, h_tropo, h_strat)
    return angles.as_float(h_m * units.M_TO_FT)


def speed_of_sound_kt(oat_c: Numeric) -> Numeric:
    """Speed of sound in dry air at a temperature.

    Parameters
    ----------
    oat_c : numeric
        Air temperature, -100 to +60. [degC]

    Returns
    -------
    numeric
        a = sqrt(gamma R T). [kt]

    Raises
    ------
    DomainError
        If the temperature is outside -100 to +60 degC.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 2
       (speed of sound, gamma = 1.4).
    """
    return angles.as_float(_sound_speed_kt(_oat_k(oat_c)))               # [1] eq. a


def isa_speed_of_sound_kt(pressure_altitude_ft: Numeric) -> Numeric:
    """Speed of sound of the ICAO Standard Atmosphere at a pressure altitude. [kt]

    Raises `DomainError` outside -5,000 to 60,000 ft. See :func:`speed_of_sound_kt`.
    """
    t_k = np.asarray(isa_temperature_k(pressure_altitude_ft))
    return angles.as_float(_sound_speed_kt(t_k))


def pressure_altitude_ft(altitude_ft: Numeric, *, altimeter_hpa: Numeric) -> Numeric:
    """Pressure altitude from an altitude read with an altimeter setting (exact ISA relation).

    Parameters
    ----------
    altitude_ft : numeric
        Altitude indicated with `altimeter_hpa` set (on the ground: the aerodrome elevation when
        the setting is QNH), -2,000 to 60,000. [ft]
    altimeter_hpa : numeric
        Altimeter setting, 850 to 1,100. [hPa]

    Returns
    -------
    numeric
        Pressure altitude (indicated altitude with 1013.25 hPa set). [ft]

    Raises
    ------
    DomainError
        If the altitude or the setting is outside its range.

    Notes
    -----
    The altimeter is a barometer calibrated to the standard atmosphere; setting the sub-scale to
    p_set moves the zero of the scale to the standard-atmosphere level of p_set [2]_. Hence
    PA = altitude + H_ISA(p_set), where H_ISA is :func:`isa_pressure_altitude_ft`. This is the
    exact form of the "1,000 ft per inch of mercury" (about 27-30 ft per hPa) rule of thumb; see
    :func:`pressure_altitude_rule_of_thumb_ft`.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 3.
    .. [2] ICAO Doc 8168, Vol I, Part III, Section 1, Chapter 4.
    """
    if type(altitude_ft) in _S and type(altimeter_hpa) in _S:
        alt_f = _checked_f("altitude_ft", altitude_ft, *ALTITUDE_RANGE_FT, "ft")
        return alt_f + isa_pressure_altitude_ft(_checked_f("altimeter_hpa", altimeter_hpa, *ALTIMETER_RANGE_HPA, "hPa"))
    alt = _checked("altitude_ft", altitude_ft, *ALTITUDE_RANGE_FT, "ft")
    setting = _checked("altimeter_hpa", altimeter_hpa, *ALTIMETER_RANGE_HPA, "hPa")
    return angles.as_float(alt + np.asarray(isa_pressure_altitude_ft(setting)))   # [2] datum shift


def pressure_altitude_rule_of_thumb_ft(altitude_ft: Numeric, *, altimeter_hpa: Numeric) -> Numeric:
    """Pressure altitude by the pilots' rule of thumb: 1,000 ft per inch of mercury below 29.92.

    Parameters
    ----------
    altitude_ft : numeric
        Indicated altitude with the setting applied, -2,000 to 60,000. [ft]
    altimeter_hpa : numeric
        Altimeter setting, 850 to 1,100 (converted to inHg for the rule). [hPa]

    Returns
    -------
    numeric
        PA = altitude + (29.92 - setting_inHg) x 1000. [ft]

    Raises
    ------
    DomainError
        If the altitude or the setting is outside its range.

    Notes
    -----
    A linearisation of :func:`pressure_altitude_ft` about sea level; it overstates the shift by
    about 8 % near sea level (the exact ISA value is about 27.3 ft per hPa, the rule 29.5).
    For look-ups and comparison only; the tool computes with the exact relation.

    References
    ----------
    .. [1] US Navy, training manual P-203, "True Airspeed" (PA = indicated altitude +
       (29.92 - altimeter setting) x 1000; 10,000 ft with 31.12 set gives 8,800 ft).
    """
    alt = _checked("altitude_ft", altitude_ft, *ALTITUDE_RANGE_FT, "ft")
    setting_inhg = _checked("altimeter_hpa", altimeter_hpa, *ALTIMETER_RANGE_HPA, "hPa") * units.HPA_TO_INHG
    return angles.as_float(alt + (_RULE_OF_THUMB_STANDARD_INHG - setting_inhg) * _RULE_OF_THUMB_FT_PER_INHG)  # [1]


def oat_at_altitude_c(surface_oat_c: Numeric, *, surface_elevation_ft: Numeric,
                      altitude_ft: Numeric) -> Numeric:
    """Outside air temperature at an altitude, from a surface report and the standard lapse rate.

    Parameters
    ----------
    surface_oat_c : numeric
        Reported surface temperature, -100 to +60. [degC]
    surface_elevation_ft : numeric
        Elevation of the reporting station, -2,000 to 60,000. [ft]
    altitude_ft : numeric
        Altitude of interest, -2,000 to 60,000. [ft]

    Returns
    -------
    numeric
        T = T_surface + L (altitude - elevation), L = -6.5 K/km (-1.98 degC per 1000 ft). [degC]

    Raises
    ------
    DomainError
        If an input is outside its range, or the result falls outside -100 to +60 degC.

    Notes
    -----
    Uses the troposphere lapse rate at all heights: intended for the few thousand feet between a
    surface report and a circling altitude. Real lapse rates (inversions) differ.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 2 (lapse rate
       -6.5 K/km).
    """
    if type(surface_oat_c) in _S and type(surface_elevation_ft) in _S and type(altitude_ft) in _S:
        t_f = _checked_f("surface_oat_c", surface_oat_c, *OAT_RANGE_C, "degC")
        elev_f = _checked_f("surface_elevation_ft", surface_elevation_ft, *ALTITUDE_RANGE_FT, "ft")
        alt_f = _checked_f("altitude_ft", altitude_ft, *ALTITUDE_RANGE_FT, "ft")
        return _checked_f("oat_c (lapse-rate result)", t_f + LAPSE_C_PER_FT * (alt_f - elev_f), *OAT_RANGE_C, "degC")
    t_sfc = _checked("surface_oat_c", surface_oat_c, *OAT_RANGE_C, "degC")
    elev = _checked("surface_elevation_ft", surface_elevation_ft, *ALTITUDE_RANGE_FT, "ft")
    alt = _checked("altitude_ft", altitude_ft, *ALTITUDE_RANGE_FT, "ft")
    t = t_sfc + LAPSE_C_PER_FT * (alt - elev)                       # [1] eq. T = T_b + L (H - H_b)
    _checked("oat_c (lapse-rate result)", t, *OAT_RANGE_C, "degC")
    return angles.as_float(t)


def density_ratio(pressure_altitude_ft: Numeric, *, oat_c: Numeric) -> Numeric:
    """Density ratio sigma = rho/rho0 from pressure altitude and outside air temperature.

    Parameters
    ----------
    pressure_altitude_ft : numeric
        Pressure altitude, -5,000 to 60,000. [ft]
    oat_c : numeric
        Outside air temperature, -100 to +60. [degC]

    Returns
    -------
    numeric
        sigma = (p/p0) (T0/T), ideal gas. [-]

    Raises
    ------
    DomainError
        If an input is outside its range.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 2 (equation
       of state rho = p/(R T)).
    """
    if type(pressure_altitude_ft) in _S and type(oat_c) in _S:
        p_f, t_f = _static_air_f(pressure_altitude_ft, oat_c)
        return (p_f / P0_PA) * (T0_K / t_f)
    p, t = _static_air(pressure_altitude_ft, oat_c)
    return angles.as_float((p / P0_PA) * (T0_K / t))                 # [1] eq. rho = p/(R T)


def _altitude_ft_from_density_ratio(sigma: np.ndarray) -> np.ndarray:
    """ISA altitude whose density ratio is sigma (troposphere and isothermal layer)."""
    theta = sigma ** (1.0 / (_N_TROPO - 1.0))                       # [1] sigma = theta^(n-1)
    h_tropo = T0_K * (theta - 1.0) / LAPSE_K_PER_M
    h_strat = TROPOPAUSE_M - (R_J_PER_KG_K * T11_K / units.G0_MPS2) * np.log(sigma / SIGMA11)  # [1] isothermal
    h_m = np.where(sigma >= SIGMA11, h_tropo, h_strat)
    if (h_m > STRATOSPHERE_TOP_M).any():
        raise DomainError("density altitude above 65,617 ft (20 km) is outside the modelled "
                          "atmosphere (troposphere and isothermal lower stratosphere)")
    return h_m * units.M_TO_FT


def density_altitude_ft(pressure_altitude_ft: Numeric, *, oat_c: Numeric) -> Numeric:
    """Density altitude: the ISA altitude with the same air density (exact inversion).

    Parameters
    ----------
    pressure_altitude_ft : numeric
        Pressure altitude, -5,000 to 60,000. [ft]
    oat_c : numeric
        Outside air temperature, -100 to +60. [degC]

    Returns
    -------
    numeric
        Density altitude. [ft]

    Raises
    ------
    DomainError
        If an input is outside its range, or the density altitude is above 20 km.

    Notes
    -----
    In the troposphere sigma = theta^(n-1) with theta = 1 + L H/T0 and n = g0/(|L| R) = 5.256,
    so H = (T0/L)(sigma^(1/(n-1)) - 1); in the isothermal layer sigma = sigma11 exp(-g0 (H - 11
    km)/(R T11)) [1]_. The pilots' rule DA = PA + 120 ft per degC of ISA deviation is within
    a few per cent of this at low altitude.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993, Section 3.
    """
    sigma = density_ratio(pressure_altitude_ft, oat_c=oat_c)
    if type(sigma) is float:
        if sigma >= SIGMA11:
            h_m = T0_K * (sigma ** (1.0 / (_N_TROPO - 1.0)) - 1.0) / LAPSE_K_PER_M
        else:
            h_m = TROPOPAUSE_M - (R_J_PER_KG_K * T11_K / units.G0_MPS2) * math.log(sigma / SIGMA11)
        if h_m > STRATOSPHERE_TOP_M:
            _altitude_ft_from_density_ratio(np.asarray(sigma))       # raises the array path's error
        return h_m * units.M_TO_FT
    return angles.as_float(_altitude_ft_from_density_ratio(np.asarray(sigma)))


def _cas_checked(cas_kt: Numeric) -> np.ndarray:
    return _checked("cas_kt", cas_kt, 0.0, CAS_MAX_KT, "kt", lo_open=True)


def _tas_from_cas(cas_kt: np.ndarray, p_pa: np.ndarray, t_k: np.ndarray) -> np.ndarray:
    a0_kt = A0_MPS * units.MPS_TO_KT
    qc = P0_PA * ((1.0 + 0.2 * (cas_kt / a0_kt) ** 2) ** 3.5 - 1.0)    # [3] eq. qc(CAS), sea-level standard
    mach = np.sqrt(5.0 * ((qc / p_pa + 1.0) ** (2.0 / 7.0) - 1.0))     # [3] eq. qc/p = (1 + 0.2 M^2)^3.5 - 1, inverted
    if (mach >= 1.0).any():
        raise DomainError("the calibrated airspeed gives a true Mach number of 1 or more at this "
                          "altitude; only subsonic flight is modelled")
    a_kt = _sound_speed_kt(t_k)
    return mach * a_kt                                                # [3] eq. TAS = M a


def tas_from_cas_kt(cas_kt: Numeric, *, pressure_altitude_ft: Numeric, oat_c: Numeric) -> Numeric:
    """True airspeed from calibrated airspeed, with compressibility.

    Parameters
    ----------
    cas_kt : numeric
        Calibrated airspeed (IAS taken as CAS), 0 < CAS <= 600. [kt]
    pressure_altitude_ft : numeric
        Pressure altitude, -5,000 to 60,000. [ft]
    oat_c : numeric
        Outside air temperature, -100 to +60. [degC]

    Returns
    -------
    numeric
        True airspeed. [kt]

    Raises
    ------
    DomainError
        If an input is outside its range or the flight would be supersonic.

    Notes
    -----
    CAS gives the impact pressure by the sea-level standard relation
    qc = p0 ((1 + 0.2 (CAS/a0)^2)^3.5 - 1); the Mach number follows from
    M^2 = 5 ((qc/p + 1)^(2/7) - 1) and TAS = M a(T) [3]_. At circling speeds and heights this
    differs from the incompressible TAS = EAS/sqrt(sigma) by well under 1 %.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993.
    .. [3] NASA RP-1046, 1980, subsonic airspeed equations.
    """
    if type(cas_kt) in _S and type(pressure_altitude_ft) in _S and type(oat_c) in _S:
        cas_f = _checked_f("cas_kt", cas_kt, 0.0, CAS_MAX_KT, "kt", lo_open=True)
        p_f, t_f = _static_air_f(pressure_altitude_ft, oat_c)
        qc = P0_PA * ((1.0 + 0.2 * (cas_f / (A0_MPS * units.MPS_TO_KT)) ** 2) ** 3.5 - 1.0)   # as _tas_from_cas
        mach = math.sqrt(5.0 * ((qc / p_f + 1.0) ** (2.0 / 7.0) - 1.0))
        if mach >= 1.0:
            _tas_from_cas(np.asarray(cas_f), np.asarray(p_f), np.asarray(t_f))   # raises the array path's error
        return mach * (math.sqrt(GAMMA * R_J_PER_KG_K * t_f) * units.MPS_TO_KT)
    cas = _cas_checked(cas_kt)
    p, t = _static_air(pressure_altitude_ft, oat_c)
    return angles.as_float(_tas_from_cas(cas, p, t))


def cas_from_tas_kt(tas_kt: Numeric, *, pressure_altitude_ft: Numeric, oat_c: Numeric) -> Numeric:
    """Calibrated airspeed from true airspeed (inverse of :func:`tas_from_cas_kt`).

    Parameters
    ----------
    tas_kt : numeric
        True airspeed, above 0 and subsonic at the given temperature. [kt]
    pressure_altitude_ft : numeric
        Pressure altitude, -5,000 to 60,000. [ft]
    oat_c : numeric
        Outside air temperature, -100 to +60. [degC]

    Returns
    -------
    numeric
        Calibrated airspeed. [kt]

    Raises
    ------
    DomainError
        If an input is outside its range, the TAS is supersonic or the CAS would exceed 600 kt.

    Notes
    -----
    M = TAS/a(T); qc = p ((1 + 0.2 M^2)^3.5 - 1); CAS = a0 sqrt(5 ((qc/p0 + 1)^(2/7) - 1)) [3]_.

    References
    ----------
    .. [3] NASA RP-1046, 1980, subsonic airspeed equations.
    """
    p, t = _static_air(pressure_altitude_ft, oat_c)
    a_kt = _sound_speed_kt(t)
    tas = _checked("tas_kt", tas_kt, 0.0, float(np.min(a_kt)), "kt", lo_open=True, hi_open=True)
    mach = tas / a_kt
    qc = p * ((1.0 + 0.2 * mach ** 2) ** 3.5 - 1.0)                   # [3] eq. qc/p = (1 + 0.2 M^2)^3.5 - 1
    a0_kt = A0_MPS * units.MPS_TO_KT
    cas = a0_kt * np.sqrt(5.0 * ((qc / P0_PA + 1.0) ** (2.0 / 7.0) - 1.0))   # [3] eq. qc(CAS) inverted
    _checked("cas_kt (result)", cas, 0.0, CAS_MAX_KT, "kt", lo_open=True)
    return angles.as_float(cas)


def eas_from_cas_kt(cas_kt: Numeric, *, pressure_altitude_ft: Numeric, oat_c: Numeric) -> Numeric:
    """Equivalent airspeed from calibrated airspeed: EAS = TAS sqrt(sigma).

    Parameters
    ----------
    cas_kt : numeric
        Calibrated airspeed (IAS taken as CAS), 0 < CAS <= 600. [kt]
    pressure_altitude_ft : numeric
        Pressure altitude, -5,000 to 60,000. [ft]
    oat_c : numeric
        Outside air temperature, -100 to +60. [degC]

    Returns
    -------
    numeric
        Equivalent airspeed (equal to CAS at sea-level standard pressure; slightly below it
        higher up). [kt]

    Raises
    ------
    DomainError
        If an input is outside its range or the flight would be supersonic.

    References
    ----------
    .. [3] NASA RP-1046, 1980, subsonic airspeed equations.
    """
    tas = np.asarray(tas_from_cas_kt(cas_kt, pressure_altitude_ft=pressure_altitude_ft, oat_c=oat_c))
    sigma = np.asarray(density_ratio(pressure_altitude_ft, oat_c=oat_c))
    return angles.as_float(tas * np.sqrt(sigma))                        # [3] eq. EAS = TAS sqrt(sigma)


@dataclass(frozen=True, slots=True, kw_only=True)
class AirData:
    """Air data at one altitude (see :func:`air_data`).

    Attributes
    ----------
    altitude_ft : float
        Altitude given (indicated with `altimeter_hpa`, or pressure altitude if no setting). [ft]
    altimeter_hpa : float
        Altimeter setting used (1013.25 when none was given). [hPa]
    pressure_altitude_ft : float
        Pressure altitude. [ft]
    oat_c : float
        Outside air temperature used (ISA when none was given). [degC]
    isa_temperature_c : float
        ISA temperature at the pressure altitude. [degC]
    isa_deviation_c : float
        oat_c - isa_temperature_c. [degC]
    density_ratio : float
        rho/rho0. [-]
    density_altitude_ft : float
        Density altitude. [ft]
    cas_kt : float or None
        Calibrated (indicated) airspeed given, or None. [kt]
    tas_kt : float or None
        True airspeed, or None when no speed was given. [kt]
    """

    altitude_ft: float
    altimeter_hpa: float
    pressure_altitude_ft: float
    oat_c: float
    isa_temperature_c: float
    isa_deviation_c: float
    density_ratio: float
    density_altitude_ft: float
    cas_kt: float | None = None
    tas_kt: float | None = None

    def __post_init__(self) -> None:
        if not self.density_ratio > 0.0:
            raise DomainError(f"density_ratio = {self.density_ratio} must be positive")
        if abs(self.isa_deviation_c - (self.oat_c - self.isa_temperature_c)) > 1e-9:
            raise DomainError("isa_deviation_c must equal oat_c - isa_temperature_c")
        if (self.cas_kt is None) != (self.tas_kt is None):
            raise DomainError("cas_kt and tas_kt must be given together")


def air_data(altitude_ft: float, *, oat_c: float | None = None, altimeter_hpa: float | None = None,
             cas_kt: float | None = None) -> AirData:
    """Pressure altitude, density, density altitude and TAS at one altitude.

    Parameters
    ----------
    altitude_ft : float
        Altitude, -2,000 to 60,000; indicated with `altimeter_hpa` set, or pressure altitude when
        `altimeter_hpa` is None. [ft]
    oat_c : float, optional
        Outside air temperature at that altitude; None means ISA at the pressure altitude. [degC]
    altimeter_hpa : float, optional
        Altimeter setting (QNH); None means standard (1013.25 hPa). [hPa]
    cas_kt : float, optional
        Calibrated (indicated) airspeed; None gives no TAS. [kt]

    Returns
    -------
    AirData

    Raises
    ------
    DomainError
        If an input is outside its documented range.

    References
    ----------
    .. [1] ICAO, "Manual of the ICAO Standard Atmosphere," Doc 7488/3, 1993.
    .. [2] ICAO Doc 8168, Vol I, Part III, Section 1, Chapter 4.
    """
    alt = float(_checked("altitude_ft", altitude_ft, *ALTITUDE_RANGE_FT, "ft"))
    if altimeter_hpa is None:
        setting = STANDARD_ALTIMETER_HPA
        pa = alt
    else:
        setting = float(altimeter_hpa)
        pa = float(pressure_altitude_ft(alt, altimeter_hpa=setting))
    isa_t = float(isa_temperature_c(pa))
    oat = isa_t if oat_c is None else float(_checked("oat_c", oat_c, *OAT_RANGE_C, "degC"))
    tas = None
    if cas_kt is not None:
        tas = float(tas_from_cas_kt(cas_kt, pressure_altitude_ft=pa, oat_c=oat))
    return AirData(
        altitude_ft=alt,
        altimeter_hpa=setting,
        pressure_altitude_ft=pa,
        oat_c=oat,
        isa_temperature_c=isa_t,
        isa_deviation_c=oat - isa_t,
        density_ratio=float(density_ratio(pa, oat_c=oat)),
        density_altitude_ft=float(density_altitude_ft(pa, oat_c=oat)),
        cas_kt=None if cas_kt is None else float(cas_kt),
        tas_kt=tas,
    )
