"""Degree-based trigonometry and angle wrapping on numpy arrays (scalars work too).

Kept out of `briefer.units` so that the unit constants load without numpy.
"""

from __future__ import annotations

import numpy as np

from briefer.core._types import Numeric

__all__ = ["sind", "cosd", "tand", "atand", "atand2", "wrap_360", "wrap_180", "as_float"]


def sind(angle_deg: Numeric) -> Numeric:
    """Sine of an angle in degrees."""
    return np.sin(np.radians(angle_deg))


def cosd(angle_deg: Numeric) -> Numeric:
    """Cosine of an angle in degrees."""
    return np.cos(np.radians(angle_deg))


def tand(angle_deg: Numeric) -> Numeric:
    """Tangent of an angle in degrees."""
    return np.tan(np.radians(angle_deg))


def atand(x: Numeric) -> Numeric:
    """Arc tangent in degrees."""
    return np.degrees(np.arctan(x))


def atand2(y: Numeric, x: Numeric) -> Numeric:
    """Two-argument arc tangent in degrees, (-180, 180]."""
    return np.degrees(np.arctan2(y, x))


def wrap_360(angle_deg: Numeric) -> Numeric:
    """Wrap an angle to [0, 360)."""
    return np.mod(angle_deg, 360.0)


def wrap_180(angle_deg: Numeric) -> Numeric:
    """Wrap an angle to [-180, 180)."""
    return np.mod(np.asarray(angle_deg) + 180.0, 360.0) - 180.0


def as_float(x: Numeric) -> Numeric:
    """Return a Python float for 0-d input, else the array unchanged."""
    arr = np.asarray(x, dtype=float)
    return float(arr) if arr.ndim == 0 else arr
