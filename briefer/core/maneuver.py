"""The circling-manoeuvre API under its former name: a re-export of :mod:`briefer.core.manoeuvre`.

``from briefer.core import maneuver`` keeps working; the modules themselves live in the package
``briefer/core/manoeuvre/`` (legs, solver, plans, ranking, missed, judgement, envelope).
"""

from __future__ import annotations

from briefer.core.manoeuvre import *  # noqa: F401,F403
from briefer.core.manoeuvre import __all__  # noqa: F401
