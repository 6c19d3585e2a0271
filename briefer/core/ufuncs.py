"""numpy's ufuncs called as themselves, without the Python wrappers of their public functions
(numpy's cost on a few numbers is per call): the same operation, the same numbers."""

from __future__ import annotations

import numpy as np

try:                                    # the ufunc np.clip calls
    from numpy._core.umath import clip
except ImportError:                     # pragma: no cover - older numpy
    clip = np.clip

__all__ = ["clip"]
