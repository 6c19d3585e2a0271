"""A plan view of an airfield draft as it is typed: every runway, fix, obstacle and
not-authorised sector that already reads, placed by the core's layout (`briefer.core.layout`,
the same placement the brief uses), as a renderer-neutral `Scene`.

A part that does not read yet is left out and named in the notes, so a wrong bearing or
heading shows on the drawing at once while the rest of the form is unfinished.

No Textual import here.
"""

from __future__ import annotations

from briefer._dataclass import dataclass, field
from typing import Any

from briefer import units
from briefer.errors import BriefingError
from briefer.model import Approach, LatLon, Obstacle, Runway, check_number, VARIATION_DEG



@dataclass
class _Draft:
    """What `layout_airfield` reads of an airfield (duck-typed), from the parts that read."""

    magnetic_variation_deg: float
    reference_point: Any = None
    runways: list = field(default_factory=list)
    obstacles: list = field(default_factory=list)
    approaches: list = field(default_factory=list)

    def runway(self, designator: str) -> Runway:
        for rw in self.runways:
            if rw.matches(designator):
                return rw
        raise BriefingError(f"no runway '{designator}'")


def _read(cls: Any, mapping: Any, path: str) -> Any:
    try:
        return cls.from_mapping(mapping, path=path)
    except BriefingError:
        return None


def _model_variation(ref: LatLon) -> float | None:
    """The World Magnetic Model's variation at the reference point today (as `Airfield` uses
    when a file gives none), or None."""
    from briefer.core import magvar

    try:
        return float(magvar.model_variation(ref.lat_deg, ref.lon_deg, magvar.today_utc()).variation_deg)
    except BriefingError:
        return None


def _layout(d: _Draft) -> Any:
    from briefer.core.layout import layout_airfield

    try:
        return layout_airfield(d)
    except BriefingError:
        return None


def _placed(d: _Draft, items: list[Any], item: Any) -> Any:
    """Add `item` to the draft's list `items` if the layout still places everything: the new
    layout, or None (and `item` left out)."""
    items.append(item)
    trial = _layout(d)
    if trial is None:
        items.pop()
    return trial


def _parts(draft: dict[str, Any], notes: list[str]) -> tuple[_Draft, Any]:
    try:
        var = check_number("magnetic_variation_deg", draft.get("magnetic_variation_deg"), VARIATION_DEG)
    except BriefingError:
        var = None
    ref = draft.get("reference_point")
    ref_point = _read(LatLon, ref, "reference_point") if isinstance(ref, dict) else None
    if var is None and ref_point is not None:      # as the loader does: the World Magnetic Model's
        var = _model_variation(ref_point)
        if var is not None:
            notes.append(f"variation {abs(var):.1f}°{'W' if var < 0 else 'E'} (World Magnetic Model)")
    if var is None:
        notes.append("variation not entered: drawn as 0")
    d = _Draft(magnetic_variation_deg=var or 0.0)
    d.reference_point = ref_point
    layout = None
    for i, m in enumerate(draft.get("runways") or []):
        rw = _read(Runway, m, f"runways[{i}]")
        if rw is None:
            notes.append(f"runway {i + 1} not drawn yet")
            break
        trial = _placed(d, d.runways, rw)
        if trial is None:
            notes.append(f"runway {i + 1} cannot be placed")
            break
        layout = trial
    if layout is None:
        return d, None
    for i, m in enumerate(draft.get("obstacles") or []):
        ob = _read(Obstacle, m, f"obstacles[{i}]")
        trial = None if ob is None else _placed(d, d.obstacles, ob)
        if trial is not None:
            layout = trial
    for i, m in enumerate(draft.get("approaches") or []):
        ap = _read(Approach, m, f"approaches[{i}]")
        name = (m or {}).get("name") or f"approach {i + 1}"
        if ap is None:
            notes.append(f"{name}: not drawn yet")
            continue
        trial = _placed(d, d.approaches, ap)
        if trial is None:
            notes.append(f"{name}: fixes cannot be placed")
        else:
            layout = trial
    return d, layout


def plan_scene(draft: dict[str, Any]) -> tuple[Any, list[str]]:
    """(Scene or None, notes) for an airfield draft."""
    from briefer.core.geometry import charted_sector
    from briefer.render.scene import Bounds, Label, Marker, Polygon, Polyline, Role, Scene

    notes: list[str] = []
    d, layout = _parts(draft, notes)
    if layout is None:
        if not any(n.startswith("runway") for n in notes):
            notes.append("Enter a runway: designators, heading and length.")
        return None, notes
    items: list[Any] = []
    pts: list[tuple[float, float]] = []
    for rw in d.runways:
        a, b = layout.thresholds_m[rw.threshold_a.designator], layout.thresholds_m[rw.threshold_b.designator]
        items += [Polyline(points=(a, b), role=Role.RUNWAY), Label(point=a, text=rw.threshold_a.designator),
                  Label(point=b, text=rw.threshold_b.designator)]
        pts += [a, b]
    for ob, p in zip(d.obstacles, layout.obstacles_m):
        items.append(Marker(point=p, role=Role.OBSTACLE))
        pts.append(p)
    for ap in d.approaches:
        faf, map_m = layout.fixes_m[ap.name]
        items.append(Polyline(points=(faf, map_m), role=Role.FINAL_APPROACH))
        items.append(Label(point=map_m, text="M"))
        items.append(Label(point=faf, text="F"))
        pts += [faf, map_m]
    xs, ys = [p[0] for p in pts], [p[1] for p in pts]
    half = max(max(xs) - min(xs), max(ys) - min(ys), units.NM_TO_M) / 2 * 1.15
    cx, cy = (max(xs) + min(xs)) / 2, (max(ys) + min(ys)) / 2
    for ap in d.approaches:
        for sector in ap.not_authorised_sectors:
            try:
                poly = charted_sector(sector, d, layout.thresholds_m).polygon(half * 3)
            except (BriefingError, KeyError, ValueError):
                notes.append(f"{ap.name}: a sector cannot be drawn")
                continue
            items.insert(0, Polygon(points=[tuple(p) for p in poly], role=Role.EXCLUDED_SECTOR, filled=True))
    bounds = Bounds(cx - half, cy - half, cx + half, cy + half)
    notes.append("F FAF  M MAP  : final")
    return Scene(items=tuple(items), bounds=bounds, north_up=True), notes
