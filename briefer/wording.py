"""Words for the brief's figures, one formatter for every output (screen, card, JSON, app, deck).

A signed component is never printed next to a side word: "4 kt from the left", not
"-4 kt from the right". Rounded to the whole knot as printed; a component that rounds to 0 kt
says so without a side or a sign ("no crosswind", never "-0").

Pure Python: no Rich, Textual or fpdf import.
"""

from __future__ import annotations

import math

from briefer.units import SM_TO_M


def signed(value: float, decimals: int = 0) -> str:
    """'+4', '-3', '+0' (never '-0': a value that rounds to zero has no sign to show)."""
    v = round(float(value), decimals) + 0.0
    return f"{v:+.{decimals}f}"


def stall_margin_words(margin_pct: float | None) -> str:
    """'stall margin 25 %', or 'THE WING STALLS' when the stall speed is above the speed flown
    (a negative margin is never printed as such)."""
    if margin_pct is None:
        return "stall margin not known"
    if round(margin_pct) < 0:
        return "THE WING STALLS (stall speed above the speed flown)"
    return f"stall margin {round(margin_pct) + 0:.0f} %"


def visibility_words(value_sm: float | None, *, metres: bool) -> str:
    """A visibility as the minimums give it: metres in 100 m steps ('4000 m') for metre minimums,
    statute miles in chart fractions ('2 1/2 SM', '3/4 SM') otherwise; rounded DOWN to the step
    (never more than was reported). 'not reported' for None."""
    if value_sm is None or value_sm != value_sm:
        return "not reported"
    if metres:
        m = int(value_sm * SM_TO_M / 100.0 + 1e-6) * 100
        return f"{m} m"
    step = 16 if value_sm < 1.0 else 8
    n = int(value_sm * step + 1e-6)
    whole, rest = divmod(n, step)
    if rest == 0:
        return f"{whole} SM"
    g = math.gcd(rest, step)
    frac = f"{rest // g}/{step // g}"
    return f"{whole} {frac} SM" if whole else f"{frac} SM"


def area_edge_words(margin_nm: float, inside: bool = True) -> str:
    """'inside, 1.13 NM from the area edge' or 'OUTSIDE, 0.46 NM beyond the area edge' (`inside`
    False with a positive edge margin: the track enters a not-authorised sector)."""
    if round(margin_nm, 2) >= 0:
        return f"{'inside' if inside else 'OUTSIDE (in a not-authorised sector)'}, {abs(margin_nm):.2f} NM from the area edge"
    return f"OUTSIDE, {-margin_nm:.2f} NM beyond the area edge"


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


def category_speed_parts(category) -> tuple[int, int, int]:
    """(circling IAS, before the additive, wind additive) in whole knots that add up as printed
    (the part before the additive is the printed total minus the printed additive)."""
    total = int(round(category.circling_speed_kt))
    additive = int(round(category.wind_additive_kt))
    return total, total - additive, additive


def vref_words(category) -> str:
    """'VREF 133 kt in this configuration at landing weight; category speed 122 kt at maximum
    landing weight sets category C' (`category` is a CategoryInfo). 14 CFR 97.3: the category is
    fixed by VREF in the landing configuration at the maximum certificated landing weight (or the
    flight manual's category speed); today's configuration and weight give the speeds flown."""
    return (f"VREF {category.vref_kt:.0f} kt in this configuration at landing weight; category speed "
            f"{category.category_vref_kt:.0f} kt at maximum landing weight sets category {category.certified_category}")


def circling_speed_words(category) -> str:
    """'circling 163 kt IAS = 152 kt + 11 kt wind additive' (the sum adds up as printed)."""
    total, base, additive = category_speed_parts(category)
    if additive == 0:
        return f"circling {total} kt IAS (no wind additive)"
    return f"circling {total} kt IAS = {base} kt + {additive} kt wind additive"


def category_words(category) -> str:
    """The whole category line: 'D (certified C, raised by the circling speed): circling ...; VREF ...'."""
    head = category.category + (f" (certified {category.certified_category}, raised by the circling speed)"
                                if category.raised else "")
    return f"{head}: {circling_speed_words(category)}; {vref_words(category)}"


def break_off_words(plan) -> str:
    """'45° LEFT off the inbound course, heading 047° M, for 35 s' (`plan` is a PlanInfo)."""
    angle = "" if plan.break_off_angle_deg is None else f"{plan.break_off_angle_deg:.0f}° "
    side = (f"{plan.break_off_direction.upper()} off the inbound course" if plan.break_off_direction
            else "off the inbound course")
    hdg = ("" if plan.break_off_heading_deg_mag is None
           else f", heading {plan.break_off_heading_deg_mag % 360.0:03.0f}° M")
    secs = "" if plan.break_off_s is None else f", for {plan.break_off_s:.0f} s"
    return f"{angle}{side}{hdg}{secs}"


def missed_approach_words(turn_direction: str, instruction: str) -> str:
    """'climbing turn RIGHT toward the runway, then: <the charted instruction>' (AIM 5-4-21(c):
    on losing visual reference, the initial climbing turn toward the landing runway, then the
    published missed approach); without a side, 'climbing turn toward the runway'; without a
    charted instruction, '..., then the published missed approach' (never a dangling 'then')."""
    side = f"{turn_direction.upper()} " if turn_direction in ("left", "right") else ""
    head = f"climbing turn {side}toward the runway"
    text = instruction.strip()
    return f"{head}, then: {text}" if text else f"{head}, then the published missed approach"


def timing_words(plan, runway: str) -> str:
    """'29 s from abeam the runway 27 threshold to roll-in, 1.44 NM past abeam' (never a
    negative time or distance: a roll-in before abeam says 'before abeam')."""
    t, d = plan.abeam_to_roll_in_s, plan.roll_in_distance_nm
    where = f"abeam the runway {runway} threshold"
    if t is None or t != t:
        return f"roll-in {abs(d):.2f} NM {'past' if d >= 0 else 'before'} {where}"
    if t >= 0:
        return f"{t:.0f} s from {where} to roll-in, {abs(d):.2f} NM {'past' if d >= 0 else 'before'} abeam"
    return f"roll-in {-t:.0f} s before {where} ({abs(d):.2f} NM before abeam)"


def wind_words(wind, *, compact: bool = False) -> str:
    """The wind used, true (`wind` is a WindInfo): '240° true 10 kt, gusts 16 kt', 'VRB 5 kt',
    'calm or not given'; `compact` (the screen's grids): '240/10G16 kt true', 'VRB/5 kt true',
    'calm / not given'."""
    if not wind.reported:
        return "calm / not given" if compact else "calm or not given"
    direction = "VRB" if wind.from_deg_true is None else f"{wind.from_deg_true:03.0f}"
    speed = f"{wind.speed_kt:.0f}"
    gust = f"{wind.gust_kt:.0f}" if wind.gust_kt else ""
    if compact:
        return f"{direction}/{speed}{'G' + gust if gust else ''} kt true"
    if wind.from_deg_true is not None:
        direction += "° true"
    return f"{direction} {speed} kt{', gusts ' + gust + ' kt' if gust else ''}"


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


__all__ = ["area_edge_words", "visibility_words", "stall_margin_words", "signed", "break_off_words", "timing_words", "category_speed_parts", "category_words", "circling_speed_words", "vref_words", "components_words", "crosswind_side", "crosswind_words", "headwind_words", "wind_components_text",
           "wind_limits_words", "wind_words"]
