"""Named unit conversion constants (plain Python: no numpy; degree trigonometry is in
`briefer.core.angles`).

Every conversion factor of the project lives here (a test checks that no bare conversion literal
appears elsewhere). The definitions are exact where the unit is defined exactly.

References
----------
.. [1] NIST Special Publication 811, "Guide for the Use of the International System of Units",
   2008, Appendix B (foot = 0.3048 m, nautical mile = 1852 m, statute mile = 1609.344 m,
   inch of mercury (conventional) = 3386.389 Pa, standard gravity 9.80665 m/s^2).
.. [2] ICAO Doc 7488/3, Manual of the ICAO Standard Atmosphere, 1993 (g0, sea-level values).
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

if TYPE_CHECKING:   # plain Python at run time: the file formats and the help load without numpy
    from briefer.core._types import Numeric

# --- length ---------------------------------------------------------------------------
FT_TO_M = 0.3048                      # [1] exact
M_TO_FT = 1.0 / FT_TO_M
NM_TO_M = 1852.0                      # [1] exact (international nautical mile)
M_TO_NM = 1.0 / NM_TO_M
SM_TO_M = 1609.344                    # [1] exact (statute mile)
M_TO_SM = 1.0 / SM_TO_M
NM_TO_FT = NM_TO_M / FT_TO_M          # 6076.115... ft
SM_TO_NM = SM_TO_M / NM_TO_M
KM_TO_M = 1000.0

# --- mass -----------------------------------------------------------------------------
LB_TO_KG = 0.45359237                 # [1] exact (avoirdupois pound)
KG_TO_LB = 1.0 / LB_TO_KG

# --- speed ----------------------------------------------------------------------------
KT_TO_MPS = NM_TO_M / 3600.0          # [1] exact: 1 kt = 1852 m / 3600 s
MPS_TO_KT = 1.0 / KT_TO_MPS
KMH_TO_MPS = KM_TO_M / 3600.0
FPM_TO_MPS = FT_TO_M / 60.0
S_PER_MIN = 60.0
S_PER_H = 3600.0

# --- pressure -------------------------------------------------------------------------
HPA_TO_PA = 100.0
INHG_TO_PA = 3386.389                 # [1] conventional inch of mercury
INHG_TO_HPA = INHG_TO_PA / HPA_TO_PA
HPA_TO_INHG = 1.0 / INHG_TO_HPA

# --- temperature ----------------------------------------------------------------------
ZERO_C_IN_K = 273.15                  # [1] exact


def kelvin_from_celsius(temperature_c: Numeric) -> Numeric:
    """Kelvin from degrees Celsius."""
    return temperature_c + ZERO_C_IN_K


def celsius_from_kelvin(temperature_k: Numeric) -> Numeric:
    """Degrees Celsius from kelvin."""
    return temperature_k - ZERO_C_IN_K


# --- gravity --------------------------------------------------------------------------
G0_MPS2 = 9.80665                     # [2] standard acceleration of gravity


DEG_PER_RAD = 180.0 / math.pi
