"""One rule for the weather a brief uses: a base weather (the demo's, when briefing the demo),
replaced wholesale by a report when one is given, then the values the crew typed over it, part
by part. Used by the command line, the app and the instructor's scenarios alike.

The wind is one part: a typed wind (direction, speed, gust, reference) replaces the whole wind
below it, so a typed 090/30 does not keep a gust from the report. Every other value (temperature,
altimeter, visibility, ceiling) overrides alone. A report replaces the base wholesale because a
group missing from a report means "not reported", not "as before".
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

WIND_KEYS = ("wind_from_deg", "wind_speed_kt", "wind_gust_kt", "wind_reference")
VALUE_KEYS = ("oat_c", "altimeter_hpa", "visibility_sm", "ceiling_ft")
WEATHER_KEYS = WIND_KEYS + VALUE_KEYS


def weather_fields(*, report: Any = None, typed: Mapping[str, Any] | None = None,
                   base: Mapping[str, Any] | None = None) -> dict[str, Any]:
    """The `briefer.model.Weather` fields of a base, a decoded report and typed values.

    Args:
        report: a decoded `briefer.io.metar.MetarReport`, or None.
        typed: values the crew typed (Weather keys; None = not typed). The wind counts as typed
            when ``wind_speed_kt`` is given (a typed calm is speed 0 with no direction).
        base: the weather under the report (Weather keys), e.g. the demo's; ignored with a report.

    Returns:
        Keyword arguments for `briefer.model.Weather` (keys not reported are left out).
    """
    if report is not None:
        from briefer.io.metar import weather_from_metar

        fields = {k: v for k, v in weather_from_metar(report).items() if v is not None}
    else:
        fields = {k: v for k, v in (base or {}).items() if k in WEATHER_KEYS and v is not None}
    typed = typed or {}
    if typed.get("wind_speed_kt") is not None:
        fields = {k: v for k, v in fields.items() if k not in WIND_KEYS}
        fields.update({k: typed[k] for k in WIND_KEYS if typed.get(k) is not None})
    fields.update({k: typed[k] for k in VALUE_KEYS if typed.get(k) is not None})
    return fields
