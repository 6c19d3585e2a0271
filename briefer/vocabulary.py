"""The tool's vocabulary, once: names of criteria sets, approach categories and plan shapes.

Plain Python (no numpy), so the file formats, the command line and its help can use them
without loading the computation. The core, the model and the commands all import these.
"""

from __future__ import annotations

CRITERIA_SETS: tuple[str, ...] = ("terps-legacy", "terps-expanded", "icao")
"""The design criteria sets: FAA TERPS with the legacy radii (AIM 5-4-20), FAA TERPS with the
expanded radii (TPP page B2), ICAO PANS-OPS (Doc 8168)."""

TERPS_CRITERIA: tuple[str, ...] = ("terps-legacy", "terps-expanded")
"""The FAA sets (same categories, clearances and straight-in rules; different radii)."""

CATEGORIES: tuple[str, ...] = ("A", "B", "C", "D", "E")
"""Aircraft approach categories, slowest first (14 CFR 97.3; Doc 8168 Vol I)."""

PLAN_SHAPES: tuple[str, ...] = ("downwind-join", "break-and-return", "teardrop", "direct-turn", "overfly-circuit")
"""The standard circling plan shapes the solver knows."""

DOWNWIND_SHAPES: tuple[str, ...] = ("downwind-join", "break-and-return", "overfly-circuit")
"""The shapes that fly a downwind leg."""

EMPHASES: tuple[str, ...] = ("tailwind-on-base", "low-visibility", "reciprocal", "hot-high", "cold",
                             "familiar-picture", "gusty-category")
"""What an instructor's practice scenario is meant to exercise."""

SEED_MAX: int = 2**63 - 1
SEED_WORDS: str = "a whole number from 0 to 2^63-1"
"""An instructor's scenario seed and how every message says its range (CLI, file, app)."""

DECK_SIZE_MAX: int = 50
DECK_SIZE_WORDS: str = f"1 to {DECK_SIZE_MAX} scenarios"
"""The most scenarios in one deck and how every message says the range."""
