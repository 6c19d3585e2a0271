"""Shared type aliases for the core."""

from __future__ import annotations

from typing import Union

import numpy as np
import numpy.typing as npt

Numeric = Union[float, npt.NDArray[np.float64]]
