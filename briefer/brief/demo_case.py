"""The built-in invented case as a request."""

from __future__ import annotations

from briefer.model import BriefRequest


def demo_request(**weather_overrides) -> BriefRequest:
    """The built-in invented case (briefer.demo): the business-jet-like demo profile circling from
    the RNAV approach to runway 09 to land on runway 27 at the valley airfield, in a westerly wind."""
    from briefer import demo
    from briefer.io import catalog
    from briefer.model import Weather

    wx = dict(demo.WEATHER)
    wx.update(weather_overrides)
    sit = demo.SITUATION
    return BriefRequest(profile=catalog.find_profile(sit["profile"]), airfield=catalog.find_airfield(sit["airfield"]),
                        approach=sit["approach"], landing_runway=sit["runway"], weather=Weather(**wx))
