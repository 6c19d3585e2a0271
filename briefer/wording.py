"""Words for the brief's figures, one formatter for every output (screen, card, JSON, app, deck).

A signed component is never printed next to a side word: "4 kt from the left", not
"-4 kt from the right". Rounded to the whole knot as printed; a component that rounds to 0 kt
says so without a side or a sign ("no crosswind", never "-0").

Pure Python: no Rich, Textual or fpdf import.
"""

from __future__ import annotations


def _whole_kt(value_kt: float) -> int:
    """The knots as printed (half away from zero, so 0.5 kt shows as 1 kt on either side)."""
    mag = int(abs(value_kt) + 0.5)
    return mag


def crosswind_side(crosswind_from_right_kt: float | None) -> str | None:
    """'right', 'left', or None when the component rounds to 0 kt (or is not known)."""
    if crosswind_from_right_kt is None or _whole_kt(crosswind_from_right_kt) == 0:
        return None
    return "right" if crosswind_from_right_kt > 0 else "left"


def crosswind_words(crosswind_from_right_kt: float | None) -> str:
    """'4 kt from the left', '7 kt from the right', 'no crosswind'.

    Args:
        crosswind_from_right_kt: positive = from the right of the course, negative = from the left.
    """
    side = crosswind_side(crosswind_from_right_kt)
    if side is None:
        return "no crosswind"
    return f"{_whole_kt(crosswind_from_right_kt)} kt from the {side}"


def headwind_words(headwind_kt: float | None) -> str:
    """'headwind 9 kt', 'TAILWIND 3 kt' (capitals: a tailwind is a hazard), 'no headwind'."""
    if headwind_kt is None or _whole_kt(headwind_kt) == 0:
        return "no headwind"
    word = "headwind" if headwind_kt > 0 else "TAILWIND"
    return f"{word} {_whole_kt(headwind_kt)} kt"


def components_words(headwind_kt: float, crosswind_from_right_kt: float) -> str:
    """'headwind 9 kt, crosswind 4 kt from the left'; 'no crosswind' when it rounds to 0."""
    xw = crosswind_words(crosswind_from_right_kt)
    return f"{headwind_words(headwind_kt)}, " + (xw if xw == "no crosswind" else f"crosswind {xw}")


def wind_components_text(wind) -> str:
    """A brief's wind on the landing runway, gusts included, in words (`wind` is a WindInfo):
    'headwind 9 kt, crosswind 4 kt from the left; in gusts headwind 15 kt, crosswind 6 kt from the left'."""
    text = components_words(wind.headwind_kt, wind.crosswind_from_right_kt)
    if wind.gust_headwind_kt is not None and wind.gust_crosswind_from_right_kt is not None:
        text += "; in gusts " + components_words(wind.gust_headwind_kt, wind.gust_crosswind_from_right_kt)
    return text


def wind_limits_words(wind) -> str:
    """The configuration's wind limits as the brief used them (`wind` is a WindInfo):
    'limits: crosswind 24 kt, tailwind 10 kt (profile)', 'limits not given', or one of each."""
    xw, tw = wind.crosswind_limit_kt, wind.tailwind_limit_kt
    if xw is None and tw is None:
        return "limits not given"
    if xw is not None and tw is not None:
        return f"limits: crosswind {xw:.0f} kt, tailwind {tw:.0f} kt (profile)"
    parts = [f"crosswind {xw:.0f} kt (profile)" if xw is not None else "crosswind not given",
             f"tailwind {tw:.0f} kt (profile)" if tw is not None else "tailwind not given"]
    return "limits: " + ", ".join(parts)


__all__ = ["components_words", "crosswind_side", "crosswind_words", "headwind_words", "wind_components_text",
           "wind_limits_words"]
