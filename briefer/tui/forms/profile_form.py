"""The aircraft form: the profile's fields in the order a crew reads the flight manual.

No Textual import here.
"""

from __future__ import annotations

from typing import Any

from briefer.model import (
    FORMAT_VERSION,
    KIND_PROFILE,
    STALL_WARNINGS,
    AircraftProfile,
    Configuration,
    FamiliarPattern,
    WindAdditive,
)
from briefer.tui.forms.spec import Field, FormSpec, Group, Repeat

def _new_configuration(rows) -> dict[str, Any]:
    return {"name": "landing" if not rows else "", "vref_kt": "", "circling_speed_kt": "", "vs1g_kt": "",
            "aoa_ref": "", "aoa_stall": "", "aoa_buffet": "", "bank_target_deg": "", "bank_limit_deg": "",
            "max_demonstrated_crosswind_kt": "", "tailwind_limit_kt": ""}


CONFIGURATION_FIELDS: tuple[Field, ...] = (
    Field("name", "Name", width=14, hint="landing"),
    Field("vref_kt", "VREF", "number", "kt", width=7),
    Field("circling_speed_kt", "Circling speed", "number", "kt", width=7),
    Field("vs1g_kt", "Vs1g", "number", "kt", width=7),
    Field("aoa_ref", "AoA at VREF", "number", width=7),
    Field("aoa_stall", "AoA at stall", "number", width=7),
    Field("aoa_buffet", "AoA buffet", "number", width=7, hint="optional"),
    Field("bank_target_deg", "Bank target", "number", "°", width=7),
    Field("bank_limit_deg", "Bank limit", "number", "°", width=7),
    Field("max_demonstrated_crosswind_kt", "Max crosswind", "number", "kt", width=7, hint="optional"),
    Field("tailwind_limit_kt", "Tailwind limit", "number", "kt", width=7, hint="optional"),
)


def _read_profile(mapping: Any) -> AircraftProfile:
    return AircraftProfile.from_mapping(mapping)


PROFILE_FORM = FormSpec(
    kind=KIND_PROFILE,
    title="Aircraft profile",
    name_key="name",
    header={"kind": KIND_PROFILE, "format_version": FORMAT_VERSION},
    read_model=_read_profile,
    items=(
        Group(None, "Aircraft", (
            Field("name", "Name", width=18, hint="my-twin"),
            Field("description", "Description", width=30, hint="optional"),
        )),
        Group(None, "Weights", (
            Field("reference_weight_lb", "Reference weight", "number", "lb"),
            Field("max_landing_weight_lb", "Max landing wt", "number", "lb"),
        )),
        Group(None, "Approach category (if the manual gives it)", (
            Field("category_speed_kt", "Category speed", "number", "kt", hint="optional"),
            Field("vso_kt", "VSO at MLW", "number", "kt", hint="optional"),
        )),
        Repeat("configurations", "Configurations (speeds at the reference weight)", "Configuration",
               CONFIGURATION_FIELDS, check=lambda m, p: Configuration.from_mapping(m, path=p),
               new_item=_new_configuration),
        Group(None, "", (
            Field("default_configuration", "Default config", width=14, hint="landing"),
        )),
        Group(None, "Handling", (
            Field("aoa_unit", "AoA unit", width=8, hint="deg"),
            Field("aoa_indexer", "AoA indexer", "flag", width=5, hint="no"),
            Field("roll_rate_deg_per_s", "Roll rate", "number", "°/s", width=6),
            Field("stall_warning", "Stall warning", "choice", width=8, hint="/".join(STALL_WARNINGS[:3])),
        )),
        Group("wind_additive", "Wind additive (optional; default ½ wind + gust, 0-20 kt)", (
            Field("headwind_fraction", "Headwind part", "number", width=6, hint="0.5"),
            Field("gust_fraction", "Gust part", "number", width=6, hint="1.0"),
            Field("min_kt", "At least", "number", "kt", width=6, hint="0"),
            Field("max_kt", "At most", "number", "kt", width=6, hint="20"),
        ), optional=True, check=lambda m, p: WindAdditive.from_mapping(m, path=p)),
        Group("familiar_pattern", "Familiar pattern (offset, or speed and bank)", (
            Field("height_ft", "Height", "number", "ft", width=7, hint="1000"),
            Field("offset_nm", "Downwind offset", "number", "NM", width=7),
            Field("speed_kt", "or speed", "number", "kt", width=7),
            Field("bank_deg", "and bank", "number", "°", width=7),
        ), check=lambda m, p: FamiliarPattern.from_mapping(m, path=p)),
    ),
)
