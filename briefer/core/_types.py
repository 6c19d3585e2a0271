"""Shared type aliases for the core."""

from __future__ import annotations

from typing import Union

import numpy as np

TYPE_CHECKING = False        # typing.TYPE_CHECKING: numpy.typing is for the type checker only
if TYPE_CHECKING:            # (importing it costs a brief's start-up as much as argparse does)
    import numpy.typing as npt

    Numeric = Union[float, npt.NDArray[np.float64]]
else:
    Numeric = Union[float, np.ndarray]
