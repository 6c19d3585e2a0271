"""The plan view, described once and drawn two ways (braille/ASCII canvas, PDF primitives);
the side view of the sight picture (`side_scene`) is a Scene too.

A `Scene` holds renderer-neutral items in local metres (x east, y north of the airfield reference
point), each with a `Role`. Every role has one `RoleStyle` that says how each renderer draws it,
and never by colour alone: a line pattern in braille, a glyph in ASCII, a dash array, stroke width
and grey level on paper, and a text attribute on screen (so NO_COLOR and greyscale printing still
tell the roles apart).

This module is pure: no Rich, Textual or fpdf import.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from briefer._dataclass import dataclass, field
from enum import Enum
from types import MappingProxyType
from typing import Union

from briefer.units import M_TO_NM, NM_TO_M

Point = tuple[float, float]
"""A point in local metres (x east, y north), or in view units once transformed."""


class Role(str, Enum):
    """What an item means on the plan view (or the side view); decides how every renderer
    draws it."""

    PROTECTED_AREA = "protected_area"
    EXCLUDED_SECTOR = "excluded_sector"
    FINAL_APPROACH = "final_approach"
    OBSTACLE = "obstacle"
    FAMILIAR_TRACK = "familiar_track"
    MISSED_APPROACH = "missed_approach"
    PLANNED_TRACK = "planned_track"
    ROLL_IN = "roll_in"
    DESCENT_POINT = "descent_point"
    RUNWAY = "runway"
    THRESHOLD = "threshold"
    ANNOTATION = "annotation"
    GROUND = "ground"                     # the side view's ground line
    CIRCLING_HEIGHT = "circling_height"   # the side view's line at circling height (the MDA's)

    def __str__(self) -> str:
        return self.value


@dataclass(frozen=True, slots=True, kw_only=True)
class PaperStyle:
    """How a role is drawn on paper (SVG and PDF), legible in black and white.

    Attributes:
        stroke_width_mm: Line width.
        dash_mm: (dash, gap) or None for a solid line. One pair only, because fpdf2's
            `set_dash_pattern(dash, gap)` takes one pair.
        stroke_grey: 0 = black, 1 = white.
        fill_grey: Fill grey level, or None for no fill.
        hatch_spacing_mm: Spacing of 45° hatch lines inside a filled polygon, or None.
        colour_hex: The stroke colour when a colour rendering is asked for.
        round_cap: Round line caps (turns short dashes into dots).
    """

    stroke_width_mm: float
    dash_mm: tuple[float, float] | None = None
    stroke_grey: float = 0.0
    fill_grey: float | None = None
    hatch_spacing_mm: float | None = None
    colour_hex: str = "#000000"
    round_cap: bool = False


@dataclass(frozen=True, slots=True, kw_only=True)
class RoleStyle:
    """How every renderer draws one role.

    Attributes:
        role: The role.
        description: Legend text.
        layer: Drawing order, lowest first (area first, runway last, annotations on top).
        priority: Which role owns a terminal cell that several roles touch (higher wins).
        ascii_glyph: The character of a line or marker in the ASCII canvas.
        ascii_fill: The character of the hatch inside a filled polygon in ASCII, or None.
        braille_dash: (on, off) in dots along a braille line, or None for solid.
        braille_width_dots: Line width in braille dots (the runway is 3 dots wide).
        marker_symbol: Default symbol of a `Marker` of this role.
        term_colour: Hex colour on a colour terminal (hex, because Textual remaps named colours).
        term_bold: Bold on screen (kept under NO_COLOR).
        term_dim: Dim on screen (kept under NO_COLOR).
        paper: The SVG/PDF style.
    """

    role: Role
    description: str
    layer: int
    priority: int
    ascii_glyph: str
    paper: PaperStyle
    ascii_fill: str | None = None
    braille_dash: tuple[int, int] | None = None
    braille_width_dots: int = 1
    marker_symbol: str | None = None
    term_colour: str | None = None
    term_bold: bool = False
    term_dim: bool = False


SYMBOLS: Mapping[str, str] = MappingProxyType({
    "triangle": "^",   # obstacle
    "ring": "@",       # roll-in point
    "cross": "+",      # descent point
    "square": "=",     # threshold (the threshold bars)
})
"""Marker symbols and the character that stands for each on a terminal canvas."""

_R = Role
ROLE_STYLES: Mapping[Role, RoleStyle] = MappingProxyType({s.role: s for s in (
    RoleStyle(role=_R.PROTECTED_AREA, description="protected circling area", layer=0, priority=20,
              ascii_glyph=".", braille_dash=(1, 1), term_colour="#d7a13a", term_dim=True,
              paper=PaperStyle(stroke_width_mm=0.35, dash_mm=(0.1, 0.9), round_cap=True,
                               colour_hex="#a86a00")),
    RoleStyle(role=_R.EXCLUDED_SECTOR, description="circling not authorised", layer=1, priority=30,
              ascii_glyph="/", ascii_fill="/", braille_dash=(3, 2), term_colour="#e06060",
              paper=PaperStyle(stroke_width_mm=0.4, dash_mm=(2.0, 1.0), fill_grey=0.88,
                               hatch_spacing_mm=1.6, colour_hex="#b00020")),
    RoleStyle(role=_R.FINAL_APPROACH, description="instrument final approach", layer=2, priority=45,
              ascii_glyph=":", braille_dash=(6, 2), term_colour="#90a4ae",
              paper=PaperStyle(stroke_width_mm=0.3, dash_mm=(5.0, 1.0), stroke_grey=0.35,
                               colour_hex="#455a64")),
    RoleStyle(role=_R.OBSTACLE, description="obstacle", layer=3, priority=80, ascii_glyph="^",
              marker_symbol="triangle", term_colour="#ff6b6b", term_bold=True,
              paper=PaperStyle(stroke_width_mm=0.3, fill_grey=0.0, colour_hex="#c62828")),
    RoleStyle(role=_R.FAMILIAR_TRACK, description="track the familiar picture gives", layer=4,
              priority=50, ascii_glyph="o", braille_dash=(2, 2), term_colour="#a0a0a0",
              paper=PaperStyle(stroke_width_mm=0.45, dash_mm=(1.2, 1.2), stroke_grey=0.45,
                               colour_hex="#6d6d6d")),
    RoleStyle(role=_R.MISSED_APPROACH, description="missed approach", layer=5, priority=55,
              ascii_glyph="~", braille_dash=(4, 2), term_colour="#c58af9",
              paper=PaperStyle(stroke_width_mm=0.45, dash_mm=(3.5, 1.5), colour_hex="#6a1b9a")),
    RoleStyle(role=_R.PLANNED_TRACK, description="planned track", layer=6, priority=60,
              ascii_glyph="*", term_colour="#4fc3f7", term_bold=True,
              paper=PaperStyle(stroke_width_mm=0.6, colour_hex="#0057b8")),
    RoleStyle(role=_R.ROLL_IN, description="roll-in point", layer=7, priority=74, ascii_glyph="@",
              marker_symbol="ring", term_colour="#81c784", term_bold=True,
              paper=PaperStyle(stroke_width_mm=0.4, colour_hex="#1b7a2f")),
    RoleStyle(role=_R.DESCENT_POINT, description="leave the MDA", layer=8, priority=75,
              ascii_glyph="+", marker_symbol="cross", term_colour="#ffd54f", term_bold=True,
              paper=PaperStyle(stroke_width_mm=0.5, colour_hex="#8d6e00")),
    RoleStyle(role=_R.RUNWAY, description="runway", layer=9, priority=90, ascii_glyph="#",
              braille_width_dots=3, term_bold=True,
              paper=PaperStyle(stroke_width_mm=1.3, fill_grey=0.0, colour_hex="#000000")),
    RoleStyle(role=_R.THRESHOLD, description="threshold", layer=10, priority=95, ascii_glyph="=",
              marker_symbol="square", term_bold=True,
              paper=PaperStyle(stroke_width_mm=0.3, fill_grey=1.0, colour_hex="#000000")),
    RoleStyle(role=_R.ANNOTATION, description="label", layer=11, priority=100, ascii_glyph="*",
              paper=PaperStyle(stroke_width_mm=0.3, fill_grey=0.0, colour_hex="#000000")),
    RoleStyle(role=_R.GROUND, description="ground", layer=1, priority=40, ascii_glyph="_",
              braille_dash=(12, 1), term_colour="#a1887f",
              paper=PaperStyle(stroke_width_mm=0.35, colour_hex="#5d4037")),
    RoleStyle(role=_R.CIRCLING_HEIGHT, description="circling height", layer=0, priority=15,
              ascii_glyph="-", braille_dash=(1, 3), term_colour="#b0bec5", term_dim=True,
              paper=PaperStyle(stroke_width_mm=0.2, dash_mm=(0.1, 0.8), stroke_grey=0.4, round_cap=True,
                               colour_hex="#607d8b")),
)})
"""The one drawing style of each role."""

GENERIC_DASH_DOTS: tuple[int, int] = (3, 3)
"""Braille pattern of an item drawn `dashed` whose role is solid."""
GENERIC_DASH_MM: tuple[float, float] = (2.0, 1.5)
"""Paper pattern of an item drawn `dashed` whose role is solid."""


def style_of(role: Role | str) -> RoleStyle:
    """The style of a role (or of its name)."""
    return ROLE_STYLES[Role(role)]


def _points(values: Iterable[Sequence[float]]) -> tuple[Point, ...]:
    return tuple((float(p[0]), float(p[1])) for p in values)


def _point(value: Sequence[float]) -> Point:
    return (float(value[0]), float(value[1]))


# --- items ----------------------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class Polyline:
    """An open or closed line (a track, a boundary, the runway centreline).

    `dashed` draws this item dashed even if its role is solid (e.g. a projected part of a track);
    a role that is already dashed keeps its own pattern.
    """

    points: tuple[Point, ...]
    role: Role
    closed: bool = False
    dashed: bool = False

    def __post_init__(self) -> None:
        object.__setattr__(self, "points", _points(self.points))
        object.__setattr__(self, "role", Role(self.role))
        if len(self.points) < 2:
            raise ValueError(f"a polyline needs at least 2 points, got {len(self.points)}")


@dataclass(frozen=True, slots=True)
class Circle:
    """A circle of a radius in metres (e.g. a radius of the protected area about a threshold)."""

    centre: Point
    radius_m: float
    role: Role

    def __post_init__(self) -> None:
        object.__setattr__(self, "centre", _point(self.centre))
        object.__setattr__(self, "radius_m", float(self.radius_m))
        object.__setattr__(self, "role", Role(self.role))
        if not self.radius_m > 0:
            raise ValueError(f"a circle needs a radius > 0 m, got {self.radius_m}")


@dataclass(frozen=True, slots=True)
class Polygon:
    """A closed area; `filled` draws it hatched (a not-authorised sector)."""

    points: tuple[Point, ...]
    role: Role
    filled: bool = True

    def __post_init__(self) -> None:
        object.__setattr__(self, "points", _points(self.points))
        object.__setattr__(self, "role", Role(self.role))
        if len(self.points) < 3:
            raise ValueError(f"a polygon needs at least 3 points, got {len(self.points)}")


@dataclass(frozen=True, slots=True)
class Marker:
    """A point of interest drawn with a symbol and an optional label.

    `symbol` is one of `SYMBOLS`; None takes the role's default.
    """

    point: Point
    role: Role
    symbol: str | None = None
    label: str = ""
    priority: int = 0
    """How much the label matters when space runs out (0: by role; see `briefer.render.labels`)."""

    def __post_init__(self) -> None:
        object.__setattr__(self, "point", _point(self.point))
        object.__setattr__(self, "role", Role(self.role))
        if self.symbol is None:
            object.__setattr__(self, "symbol", ROLE_STYLES[self.role].marker_symbol or "cross")
        if self.symbol not in SYMBOLS:
            raise ValueError(f"unknown marker symbol {self.symbol!r}; expected one of {sorted(SYMBOLS)}")


@dataclass(frozen=True, slots=True)
class Label:
    """Text centred on a point."""

    point: Point
    text: str
    role: Role = Role.ANNOTATION
    priority: int = 0
    """How much the label matters when space runs out (0: a runway designator's default)."""

    def __post_init__(self) -> None:
        object.__setattr__(self, "point", _point(self.point))
        object.__setattr__(self, "role", Role(self.role))


Item = Union[Polyline, Circle, Polygon, Marker, Label]


# --- bounds, viewport -----------------------------------------------------------------------


@dataclass(frozen=True, slots=True)
class Bounds:
    """An axis-aligned box in metres."""

    x_min_m: float
    y_min_m: float
    x_max_m: float
    y_max_m: float

    def __post_init__(self) -> None:
        if self.x_max_m < self.x_min_m or self.y_max_m < self.y_min_m:
            raise ValueError(f"empty bounds {self}")

    @classmethod
    def around(cls, points: Iterable[Point]) -> Bounds:
        """The smallest box holding the points."""
        xs, ys = zip(*points)
        return cls(min(xs), min(ys), max(xs), max(ys))

    @property
    def width_m(self) -> float:
        return self.x_max_m - self.x_min_m

    @property
    def height_m(self) -> float:
        return self.y_max_m - self.y_min_m

    @property
    def centre(self) -> Point:
        return ((self.x_min_m + self.x_max_m) / 2, (self.y_min_m + self.y_max_m) / 2)

    def corners(self) -> tuple[Point, Point, Point, Point]:
        return ((self.x_min_m, self.y_min_m), (self.x_max_m, self.y_min_m),
                (self.x_max_m, self.y_max_m), (self.x_min_m, self.y_max_m))


@dataclass(frozen=True, slots=True, kw_only=True)
class Viewport:
    """Maps local metres to view units (x right, y down) at one scale, the chosen direction up.

    `aspect` is the width of one view unit over its height: 1 for braille dots, SVG and PDF
    millimetres; 0.5 for an ASCII canvas with one dot per character cell (cells are about twice as
    tall as wide). A metre is `units_per_m` units across and `units_per_m * aspect` units down, so
    a circle stays round on screen.

    Attributes:
        centre_x_m, centre_y_m: The world point shown at the middle of the view.
        units_per_m: View units per metre, across.
        width, height: The view's size in its units; the middle is (width / 2, height / 2).
        aspect: Width over height of one view unit.
        up_deg_true: The true direction shown up (0 = north up).
    """

    centre_x_m: float
    centre_y_m: float
    units_per_m: float
    width: float
    height: float
    aspect: float = 1.0
    up_deg_true: float = 0.0
    _cos: float = field(init=False, repr=False, compare=False)
    _sin: float = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        if not (self.units_per_m > 0 and self.aspect > 0):
            raise ValueError(f"a viewport needs units_per_m > 0 and aspect > 0: {self}")
        a = math.radians(self.up_deg_true)
        object.__setattr__(self, "_cos", math.cos(a))
        object.__setattr__(self, "_sin", math.sin(a))

    @property
    def metres_per_unit(self) -> float:
        """Metres per view unit, across."""
        return 1.0 / self.units_per_m

    @property
    def width_m(self) -> float:
        """The world width the view spans, in metres."""
        return self.width / self.units_per_m

    def to_view(self, x_m: float, y_m: float) -> Point:
        """View coordinates (x right, y down) of a world point."""
        dx, dy = x_m - self.centre_x_m, y_m - self.centre_y_m
        c, s = self._cos, self._sin
        k = self.units_per_m
        return (self.width / 2 + (dx * c - dy * s) * k,
                self.height / 2 - (dx * s + dy * c) * k * self.aspect)

    def points_to_view(self, points: Iterable[Point]) -> list[Point]:
        """View coordinates of many world points."""
        cx, cy, c, s, k = self.centre_x_m, self.centre_y_m, self._cos, self._sin, self.units_per_m
        ka, w2, h2 = k * self.aspect, self.width / 2, self.height / 2
        return [(w2 + ((x - cx) * c - (y - cy) * s) * k, h2 - ((x - cx) * s + (y - cy) * c) * ka)
                for x, y in points]

    def to_world(self, u: float, v: float) -> Point:
        """The world point at view coordinates (the inverse of `to_view`)."""
        xr = (u - self.width / 2) / self.units_per_m
        yr = (self.height / 2 - v) / (self.units_per_m * self.aspect)
        c, s = self._cos, self._sin
        return (self.centre_x_m + xr * c + yr * s, self.centre_y_m - xr * s + yr * c)


# --- the scene ------------------------------------------------------------------------------

DEFAULT_SPAN_M = NM_TO_M
"""The span shown when a scene has no extent (empty, or a single point)."""


@dataclass(frozen=True, slots=True)
class Scene:
    """Everything on the plan view, in local metres.

    Attributes:
        items: The items, in any order (renderers draw them by role layer).
        bounds: The world box to show; None fits the items.
        north_up: North at the top. If False, `up_track_deg_true` is shown up (e.g. the final
            approach course).
        scale_hint_nm: The scale-bar length to use; None chooses one (`scale_bar_nm`).
        up_track_deg_true: The true direction at the top when `north_up` is False.
        north_arrow: Draw the north arrow in the key (not on a side view).
        key_note: A few words for the key, where the north arrow goes (e.g. "heights x3").
    """

    items: tuple[Item, ...]
    bounds: Bounds | None = None
    north_up: bool = True
    scale_hint_nm: float | None = None
    up_track_deg_true: float = 0.0
    north_arrow: bool = True
    key_note: str = ""

    def __post_init__(self) -> None:
        object.__setattr__(self, "items", tuple(self.items))
        for item in self.items:
            if not isinstance(item, (Polyline, Circle, Polygon, Marker, Label)):
                raise TypeError(f"not a scene item: {item!r}")
        if self.scale_hint_nm is not None and not self.scale_hint_nm > 0:
            raise ValueError(f"scale_hint_nm must be > 0, got {self.scale_hint_nm}")

    @property
    def up_deg_true(self) -> float:
        """The true direction drawn at the top of the view."""
        return 0.0 if self.north_up else float(self.up_track_deg_true)

    def roles(self) -> tuple[Role, ...]:
        """The roles present, in drawing order."""
        return tuple(sorted({i.role for i in self.items}, key=lambda r: ROLE_STYLES[r].layer))

    def by_layer(self) -> list[tuple[int, Item]]:
        """(index, item) pairs in drawing order: by role layer, then as given."""
        return sorted(enumerate(self.items), key=lambda p: ROLE_STYLES[p[1].role].layer)

    def content_bounds(self) -> Bounds | None:
        """The box around the items (circles by their full radius); None for an empty scene."""
        xs: list[float] = []
        ys: list[float] = []
        for item in self.items:
            if isinstance(item, (Polyline, Polygon)):
                xs.extend(p[0] for p in item.points)
                ys.extend(p[1] for p in item.points)
            elif isinstance(item, Circle):
                (x, y), r = item.centre, item.radius_m
                xs += [x - r, x + r]
                ys += [y - r, y + r]
            else:
                xs.append(item.point[0])
                ys.append(item.point[1])
        return Bounds(min(xs), min(ys), max(xs), max(ys)) if xs else None

    def _rotated_extent(self, up_deg: float) -> tuple[float, float, float, float]:
        """(u_min, v_min, u_max, v_max) of the shown box in the frame whose +v is `up_deg`."""
        c, s = math.cos(math.radians(up_deg)), math.sin(math.radians(up_deg))
        if self.bounds is not None:
            pts: list[Point] = list(self.bounds.corners())
            circles: list[tuple[Point, float]] = []
        else:
            pts, circles = [], []
            for item in self.items:
                if isinstance(item, (Polyline, Polygon)):
                    pts.extend(item.points)
                elif isinstance(item, Circle):
                    circles.append((item.centre, item.radius_m))
                else:
                    pts.append(item.point)
        us = [x * c - y * s for x, y in pts]
        vs = [x * s + y * c for x, y in pts]
        lo_u = [x * c - y * s - r for (x, y), r in circles]
        hi_u = [x * c - y * s + r for (x, y), r in circles]
        lo_v = [x * s + y * c - r for (x, y), r in circles]
        hi_v = [x * s + y * c + r for (x, y), r in circles]
        if not (us or lo_u):
            half = DEFAULT_SPAN_M / 2
            return (-half, -half, half, half)
        return (min(us + lo_u), min(vs + lo_v), max(us + hi_u), max(vs + hi_v))

    def fit(self, width: float, height: float, aspect: float = 1.0, *, margin: float = 0.0) -> Viewport:
        """The viewport that shows the scene as large as fits in a view, at equal scale.

        Args:
            width, height: The view's size in its own units (dots, millimetres, pixels).
            aspect: Width over height of one view unit (0.5 for one ASCII dot per cell).
            margin: Space kept free on every side, in view units.
        """
        up = self.up_deg_true
        u0, v0, u1, v1 = self._rotated_extent(up)
        span_u, span_v = u1 - u0, v1 - v0
        if span_u <= 0 and span_v <= 0:
            span_u = span_v = DEFAULT_SPAN_M
        avail_w = max(width - 2 * margin, 1e-9)
        avail_h = max(height - 2 * margin, 1e-9)
        scales = [avail_w / span_u if span_u > 0 else math.inf,
                  avail_h / (span_v * aspect) if span_v > 0 else math.inf]
        k = min(scales)
        cu, cv = (u0 + u1) / 2, (v0 + v1) / 2
        c, s = math.cos(math.radians(up)), math.sin(math.radians(up))
        # invert u = x c - y s, v = x s + y c (a rotation)
        return Viewport(centre_x_m=cu * c + cv * s, centre_y_m=-cu * s + cv * c, units_per_m=k,
                        width=width, height=height, aspect=aspect, up_deg_true=up)


# --- helpers shared by the renderers --------------------------------------------------------

SCALE_BAR_CHOICES_NM: tuple[float, ...] = (0.1, 0.25, 0.5, 1.0, 2.0, 5.0, 10.0)


def scale_bar_nm(view_width_m: float, *, max_fraction: float = 0.4,
                 choices_nm: Sequence[float] = SCALE_BAR_CHOICES_NM) -> float:
    """A round scale-bar length no longer than `max_fraction` of the view's width.

    Args:
        view_width_m: The world width the view spans.
        max_fraction: The longest bar as a fraction of that width.
        choices_nm: The round lengths to choose from, ascending.

    Returns:
        The longest choice that fits, or the shortest choice if none fits. [NM]
    """
    if not view_width_m > 0:
        raise ValueError(f"view_width_m must be > 0, got {view_width_m}")
    limit_nm = view_width_m * max_fraction * M_TO_NM
    fitting = [c for c in choices_nm if c <= limit_nm + 1e-12]
    return max(fitting) if fitting else min(choices_nm)


def format_nm(length_nm: float) -> str:
    """'0.5 NM', '1 NM', '0.25 NM'."""
    return f"{length_nm:g} NM"


_ARROWS = "↑↗→↘↓↙←↖"
_ASCII_ARROWS = "^/>\\v/<\\"


@dataclass(frozen=True, slots=True, kw_only=True)
class NorthArrow:
    """Where north points on the view.

    Attributes:
        screen_deg: Direction of north on the view, clockwise from the view's up.
        glyph: The nearest of eight arrow characters.
        ascii_glyph: The same in ASCII (diagonals are '/' and '\\').
    """

    screen_deg: float
    glyph: str
    ascii_glyph: str

    def text(self, *, ascii: bool = False) -> str:
        """'N' and the arrow, for a terminal canvas."""
        return "N" + (self.ascii_glyph if ascii else self.glyph)


def north_arrow(up_deg_true: float = 0.0) -> NorthArrow:
    """The north arrow of a view whose top is `up_deg_true`."""
    screen_deg = (-up_deg_true) % 360.0
    k = int((screen_deg + 22.5) // 45) % 8
    return NorthArrow(screen_deg=screen_deg, glyph=_ARROWS[k], ascii_glyph=_ASCII_ARROWS[k])


def hatch_segments(points: Sequence[Point], spacing: float, *, angle_deg: float = 45.0,
                   ) -> list[tuple[Point, Point]]:
    """Parallel hatch lines clipped to a polygon (even-odd rule), in the polygon's own units.

    Args:
        points: The polygon's corners (closed implicitly).
        spacing: Distance between hatch lines.
        angle_deg: Direction of the lines, counter-clockwise from the +x axis of the given
            coordinates (in y-down view coordinates that looks clockwise).
    """
    if not spacing > 0:
        raise ValueError(f"spacing must be > 0, got {spacing}")
    a = math.radians(angle_deg)
    c, s = math.cos(a), math.sin(a)
    # rotate by -angle so that the hatch lines are horizontal
    rot = [(x * c + y * s, -x * s + y * c) for x, y in points]
    vs = [p[1] for p in rot]
    v_lo, v_hi = min(vs), max(vs)
    out: list[tuple[Point, Point]] = []
    n = len(rot)
    v = v_lo + (((v_hi - v_lo) % spacing) or spacing) / 2
    while v < v_hi:
        xs = []
        for i in range(n):
            (u0, w0), (u1, w1) = rot[i], rot[(i + 1) % n]
            if (w0 <= v < w1) or (w1 <= v < w0):
                xs.append(u0 + (v - w0) * (u1 - u0) / (w1 - w0))
        xs.sort()
        for ua, ub in zip(xs[0::2], xs[1::2]):
            out.append(((ua * c - v * s, ua * s + v * c), (ub * c - v * s, ub * s + v * c)))
        v += spacing
    return out
