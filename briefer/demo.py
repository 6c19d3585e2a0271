"""The built-in invented demo case as plain names and values.

No imports, so the app can open on it without loading the computation; `briefer.brief.demo_request`
builds the full request from it.
"""

SITUATION = {"profile": "demo-bizjet", "airfield": "V2RL", "approach": "RNAV (GPS) RWY 09", "runway": "27"}
"""The business-jet-like demo profile circling from the RNAV approach to runway 09 to land on 27."""

WEATHER = {"wind_from_deg": 240.0, "wind_speed_kt": 10.0, "wind_gust_kt": 16.0, "wind_reference": "true",
           "oat_c": 9.0, "altimeter_hpa": 1009.0, "visibility_sm": 3.0, "ceiling_ft": 1100.0}
"""A westerly wind, a little gusty; 3 SM and a ceiling above the circling height."""
