"""Equipment specs: balls, cloth, cushions, pockets and tables as frozen values.

Sources are named as in :mod:`shotplan.equipment` (WPA, WSF, UMB, memory).
A table that is not a preset is a preset plus measured overrides, see
:meth:`TableSpec.with_overrides`.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from ..errors import LayoutError, quoted

if TYPE_CHECKING:  # pragma: no cover
    from ..files.read import JSONValue

__all__ = [
    "Range",
    "BallSpec",
    "ClothSpec",
    "CushionSpec",
    "PocketSpec",
    "Spot",
    "TableSpec",
    "OVERRIDE_KEYS",
    "POOL_BALL_IDS",
    "SNOOKER_BALL_IDS",
    "CAROM_BALL_IDS",
    "drop_width_m",
    "effective_tip_radius_m",
    "jaw_face_length_m",
    "tip_tangent_m",
    "pool_spots",
    "snooker_spots",
]


@dataclass(frozen=True, slots=True)
class Range:
    """A closed tolerance band ``[low, high]`` from a standard, in SI units."""

    low: float
    """Lowest allowed value."""
    high: float
    """Highest allowed value."""

    def __contains__(self, value: object) -> bool:
        return isinstance(value, int | float) and self.low <= value <= self.high

    @classmethod
    def around(cls, nominal: float, tol: float) -> Range:
        """The band ``nominal +- tol``.

        Parameters
        ----------
        nominal : float
            The middle of the band.
        tol : float
            Half its width.

        Returns
        -------
        Range
            ``Range(nominal - tol, nominal + tol)``.
        """
        return cls(nominal - tol, nominal + tol)

    @property
    def mid(self) -> float:
        """The middle of the band."""
        return 0.5 * (self.low + self.high)


POOL_BALL_IDS: tuple[str, ...] = ("cue",) + tuple(str(i) for i in range(1, 16))
"""Pool: the cue ball and object balls 1 to 15."""

SNOOKER_BALL_IDS: tuple[str, ...] = (
    ("cue",)
    + tuple(f"red{i}" for i in range(1, 16))
    + ("yellow", "green", "brown", "blue", "pink", "black")
)
"""Snooker: the cue ball, fifteen reds and the six colours."""

CAROM_BALL_IDS: tuple[str, ...] = ("cue", "yellow", "red")
"""Carom: the struck ball (white), the other player's ball (yellow), the red."""


@dataclass(frozen=True, slots=True)
class BallSpec:
    """One ball of a set (all balls of a set are alike)."""

    diameter_m: float
    """Nominal diameter, m."""
    mass_kg: float
    """Nominal mass, kg."""
    diameter_range_m: Range
    """The standard's band for the diameter, m."""
    mass_range_kg: Range
    """The standard's band for the mass, kg."""
    ids: tuple[str, ...]
    """The ball ids of this set; ``cue`` is always the ball the cue strikes."""

    @property
    def radius_m(self) -> float:
        """Radius, m."""
        return 0.5 * self.diameter_m


@dataclass(frozen=True, slots=True)
class ClothSpec:
    """Measured cloth values; ``None`` means "use the physics default"."""

    sliding_friction: float | None = None
    """Ball-cloth sliding friction coefficient mu_s (dimensionless)."""
    rolling_resistance: float | None = None
    """Rolling resistance coefficient mu_r (deceleration / g)."""
    spin_friction: float | None = None
    """Spin friction coefficient (deceleration of spin about the vertical,
    as in :class:`shotplan.physics.Physics`)."""


@dataclass(frozen=True, slots=True)
class CushionSpec:
    """The cushion rubber: its nose height and measured values."""

    nose_height_m: float
    """Height of the cushion nose (the contact line) above the bed, m."""
    nose_height_range_m: Range
    """The standard's band for the nose height, m."""
    rubber_width_m: float
    """Depth of the rubber from the nose to the rail, m (drawing only)."""
    rail_width_m: float
    """Width of the wooden rail outside the rubber, m (drawing only)."""
    restitution: float | None = None
    """Measured cushion restitution; ``None`` uses the physics default."""
    restitution_slope: float | None = None
    """Measured fall of restitution with normal speed, 1/(m/s); ``None`` uses
    the physics default."""
    friction: float | None = None
    """Measured ball-cushion friction; ``None`` uses the physics default."""


@dataclass(frozen=True, slots=True)
class PocketSpec:
    """The shape of one kind of pocket (corner or side)."""

    mouth_m: float
    """Mouth width between the jaw points (where the jaw faces meet the
    extensions of the cushion noses), m."""
    mouth_range_m: Range
    """The standard's band for the mouth, m."""
    jaw_angle_deg: float
    """Angle between the cushion nose and the jaw face, measured through the
    rubber, degrees (135 for a corner or 90 for a side pocket means faces
    parallel to the pocket's axis; more means a throat narrower than the mouth)."""
    jaw_angle_range_deg: Range
    """The standard's band for the jaw angle, degrees."""
    shelf_m: float
    """Shelf depth: from the mouth line to the drop line, along the pocket axis, m."""
    shelf_range_m: Range
    """The standard's band for the shelf, m."""
    jaw_tip_radius_m: float
    """Radius of the rounded jaw tip in plan view, m."""
    back_draft_deg: float
    """Back draft of the pocket liner, degrees (recorded; not modelled)."""


@dataclass(frozen=True, slots=True)
class Spot:
    """A named spot on the table, in table coordinates (m)."""

    name: str
    """Trade name of the spot (``foot spot``, ``black``...)."""
    x: float
    """Along the length from the head cushion nose, m."""
    y: float
    """Across from the right cushion nose, m."""


@dataclass(frozen=True, slots=True)
class TableSpec:
    """A whole table: playing surface, ball set, cushions, cloth, pockets, markings.

    Build one with :meth:`preset` and change it with :meth:`with_overrides`.
    """

    name: str
    """Preset name this spec comes from (``pool-9ft``...)."""
    game: str
    """``pool``, ``snooker`` or ``carom``."""
    length_m: float
    """Playing surface length between cushion noses, m."""
    width_m: float
    """Playing surface width between cushion noses, m."""
    size_tolerance_m: float
    """The standard's tolerance on length and width (each), m."""
    ball: BallSpec
    """The ball set."""
    cushion: CushionSpec
    """The cushions."""
    cloth: ClothSpec
    """Measured cloth values (all ``None`` on the presets)."""
    corner: PocketSpec | None
    """Corner pockets, or ``None`` on a table without pockets."""
    side: PocketSpec | None
    """Side (middle) pockets, or ``None``."""
    sight_setback_m: float | None
    """Distance from the cushion nose back to the centre of the sights, m;
    ``None`` where the table has no sights."""
    spots: tuple[Spot, ...]
    """Named spots."""
    head_string_x_m: float | None
    """x of the head string (pool, carom), m, or ``None``."""
    baulk_line_x_m: float | None = None
    """x of the baulk line (snooker), m."""
    d_radius_m: float | None = None
    """Radius of the D (snooker), m."""
    source: str = ""
    """Where the numbers come from, in words."""
    overrides: tuple[tuple[str, float], ...] = field(default=())
    """The measured overrides applied to the preset, as (key, value) pairs."""

    # ----------------------------------------------------------------- build
    @classmethod
    def preset(cls, name: str) -> TableSpec:
        """The standard table called ``name`` (see :data:`PRESETS`).

        Parameters
        ----------
        name : str
            A preset name (``pool-9ft``...).

        Returns
        -------
        TableSpec
            The preset.

        Raises
        ------
        LayoutError
            If there is no such preset (the message lists them).
        """
        from .presets import PRESETS  # the presets are built from this module's specs

        try:
            return PRESETS[name]
        except KeyError:
            raise LayoutError(
                f"{quoted(name)} is not a table preset, must be one of {', '.join(PRESETS)}"
            ) from None

    def with_overrides(self, values: Mapping[str, JSONValue], where: str = "table") -> TableSpec:
        """A copy with measured values replacing the preset's.

        Markings that depend on the size (spots, strings) follow a new length and
        width.

        Parameters
        ----------
        values : Mapping
            Keys of :data:`OVERRIDE_KEYS` to numbers.
        where : str, optional
            The place in a file, for messages.

        Returns
        -------
        TableSpec
            The changed copy (its ``overrides`` record the values).

        Raises
        ------
        LayoutError
            For an unknown key, a value that is not a number or out of its range, a
            pocket the table lacks, or values that contradict each other (see
            :meth:`problems`).
        """
        spec = self
        for key, value in values.items():
            if key not in OVERRIDE_KEYS:
                raise LayoutError(
                    f"{where}: unknown table field {quoted(key)}, must be one of "
                    f"preset, {', '.join(OVERRIDE_KEYS)}"
                )
            lo, hi, _doc = OVERRIDE_KEYS[key]
            if isinstance(value, bool) or not isinstance(value, int | float):
                raise LayoutError(f"{where}.{key}: {quoted(value)} is not a number")
            try:
                value = float(value)
            except OverflowError:
                value = math.inf
            if not math.isfinite(value) or not lo <= value <= hi:
                raise LayoutError(
                    f"{where}.{key}: {value!r} is out of range, must be between {lo} and {hi}"
                )
            spec = spec._set(key, value, where)
        spec = dataclasses.replace(
            spec, overrides=self.overrides + tuple((k, float(v)) for k, v in values.items())
        )
        faults = spec.problems()
        if faults:
            more = f" (and {len(faults) - 1} more)" if len(faults) > 1 else ""
            raise LayoutError(f"{where}.{faults[0]}{more}")
        return spec

    def problems(self) -> list[str]:
        """What makes the table's values contradict each other, one line each.

        Each line starts with the field to change (``corner_mouth_m: ...``).
        Checked on every override (:meth:`with_overrides`); the presets pass.

        * the cushion nose stands between the ball's centre and its top
          (the nose meets the ball above its equator; WPA puts it at
          62.5-64.5 % of the ball's diameter);
        * a pocket's mouth is wider than a ball, and its jaw faces, closing
          at the jaw angle, are still a ball wide at the drop line;
        * every cushion keeps at least a ball's width of nose between its
          pockets' rounded jaws (the mouths are narrower than the table);
        * a jaw tip radius that was measured (overridden) fits on its jaw
          face: ``radius / tan(jaw angle / 2)`` no longer than the face down
          to the drop line. The presets' tip radii are typical values from
          memory; on a shallow shelf they shrink to fit (see
          :mod:`shotplan.table`);
        * every named spot and line lies on the playing surface.

        Returns
        -------
        list of str
            Empty for a table that can be built and played.
        """
        out: list[str] = []
        given = {k for k, _ in self.overrides}
        D = self.ball.diameter_m
        R = 0.5 * D
        h = self.cushion.nose_height_m
        if not R <= h < D:
            key = "cushion_nose_height_m" if ("ball_diameter_m" not in given
                                              or "cushion_nose_height_m" in given) \
                else "ball_diameter_m"
            out.append(f"{key}: a cushion nose {_mm(h)} mm high is not between the centre "
                       f"({_mm(R)} mm) and the top ({_mm(D)} mm) of a {_mm(D)} mm ball; "
                       f"the nose meets the ball above its equator, usually at 62.5-64.5 % "
                       f"of its diameter (WPA)")
        pockets = [(kind, p) for kind, p in (("corner", self.corner), ("side", self.side))
                   if p is not None]
        for kind, p in pockets:
            if p.mouth_m <= D:
                out.append(f"{kind}_mouth_m: a mouth of {_mm(p.mouth_m)} mm is not wider than "
                           f"the {_mm(D)} mm ball")
                continue
            drop = drop_width_m(kind, p)
            if drop < D:
                out.append(f"{kind}_mouth_m: the {kind} jaws close from {_mm(p.mouth_m)} mm at "
                           f"the mouth to {_mm(drop)} mm at the drop line "
                           f"({_mm(p.shelf_m)} mm deep at {p.jaw_angle_deg:g} deg), narrower "
                           f"than the {_mm(D)} mm ball: widen the mouth or lessen the shelf "
                           "or the jaw angle")
            face = jaw_face_length_m(kind, p)
            need = tip_tangent_m(p)
            if f"{kind}_jaw_tip_radius_m" in given and need > face + 1e-12:
                fit = face * math.tan(math.radians(p.jaw_angle_deg) / 2)
                if p.shelf_m == 0.0:
                    out.append(f"{kind}_jaw_tip_radius_m: with a {kind} shelf of 0 the drop "
                               "line is the mouth line and the jaw is sharp; leave out the "
                               "jaw tip radius or give a shelf")
                    continue
                out.append(f"{kind}_jaw_tip_radius_m: a {_mm(p.jaw_tip_radius_m)} mm jaw tip "
                           f"does not fit on the {_mm(face)} mm jaw face down to the "
                           f"{_mm(p.shelf_m)} mm shelf; at most {_mm(fit)} mm with this shelf")
        if pockets:
            out += self._rail_room_problems(D)
        for spot in self.spots:
            if not (0.0 < spot.x < self.length_m and 0.0 < spot.y < self.width_m):
                key = "width_m" if not 0.0 < spot.y < self.width_m else "length_m"
                out.append(f"{key}: the {spot.name} spot falls off a {self.length_m:g} x "
                           f"{self.width_m:g} m table")
                break
        if self.baulk_line_x_m is not None and not self.baulk_line_x_m < self.length_m / 2:
            out.append(f"length_m: the baulk line ({self.baulk_line_x_m:g} m from the bottom "
                       f"cushion) does not fit on a {self.length_m:g} m table")
        return out

    def _rail_room_problems(self, D: float) -> list[str]:
        c, s = self.corner, self.side
        assert c is not None
        corner_end = c.mouth_m / math.sqrt(2.0) + tip_tangent_m(
            c, effective_tip_radius_m("corner", c))
        out = []
        short = self.width_m - 2.0 * corner_end
        if short < D:
            out.append(f"corner_mouth_m: {_mm(c.mouth_m)} mm corner mouths leave "
                       f"{_left(short)} of cushion on the {self.width_m:g} m end rails, less than a ball's "
                       f"width ({_mm(D)} mm): the mouths must be narrower than the table")
        if s is None:
            long_ = self.length_m - 2.0 * corner_end
            where = "long rails"
        else:
            long_ = (self.length_m / 2 - s.mouth_m / 2
                     - tip_tangent_m(s, effective_tip_radius_m("side", s)) - corner_end)
            where = "long rails between the corner and side pockets"
        if long_ < D:
            key = "side_mouth_m" if s is not None and short >= D else "corner_mouth_m"
            out.append(f"{key}: the pocket mouths leave {_left(long_)} of cushion on the "
                       f"{where} of a {self.length_m:g} m table, less than a ball's width "
                       f"({_mm(D)} mm): the mouths must be narrower than the table")
        return out

    def _set(self, key: str, value: float, where: str) -> TableSpec:
        r = dataclasses.replace
        if key in ("length_m", "width_m"):
            length = value if key == "length_m" else self.length_m
            width = value if key == "width_m" else self.width_m
            return _rescale_markings(r(self, length_m=length, width_m=width), self)
        if key == "ball_diameter_m":
            return r(self, ball=r(self.ball, diameter_m=value))
        if key == "ball_mass_kg":
            return r(self, ball=r(self.ball, mass_kg=value))
        if key == "cushion_nose_height_m":
            return r(self, cushion=r(self.cushion, nose_height_m=value))
        if key == "cushion_restitution":
            return r(self, cushion=r(self.cushion, restitution=value))
        if key == "cushion_restitution_slope":
            return r(self, cushion=r(self.cushion, restitution_slope=value))
        if key == "cushion_friction":
            return r(self, cushion=r(self.cushion, friction=value))
        if key.startswith("cloth_"):
            attr = key[len("cloth_"):]
            return r(self, cloth=r(self.cloth, **{attr: value}))
        kind, attr = key.split("_", 1)
        pocket = getattr(self, kind)
        if pocket is None:
            raise LayoutError(f"{where}.{key}: the {self.name!r} table has no {kind} pockets")
        attr = {"mouth_m": "mouth_m", "jaw_angle_deg": "jaw_angle_deg", "shelf_m": "shelf_m",
                "jaw_tip_radius_m": "jaw_tip_radius_m"}[attr]
        return r(self, **{kind: r(pocket, **{attr: value})})

    # ------------------------------------------------------------ properties
    @property
    def has_pockets(self) -> bool:
        """Whether the table has pockets."""
        return self.corner is not None

    @property
    def contact_offset_m(self) -> float:
        """Horizontal distance from a ball's centre to the cushion nose at contact, m.

        The nose stands above the ball's centre, so the ball touches it above
        its equator: ``sqrt(R^2 - (h - R)^2)`` (Han 2005 geometry).
        """
        R = self.ball.radius_m
        dh = self.cushion.nose_height_m - R
        return math.sqrt(max(R * R - dh * dh, 0.0))

    def to_dict(self) -> dict[str, JSONValue]:
        """The summary ``shotplan tables --json`` prints for this table.

        Returns
        -------
        dict
            Name, game, sizes, ball, pocket and cushion values (``None`` for
            pockets the table lacks), sight spacing, ball ids and source.
        """
        return {
            "name": self.name,
            "game": self.game,
            "length_m": self.length_m,
            "width_m": self.width_m,
            "size_tolerance_m": self.size_tolerance_m,
            "ball_diameter_m": self.ball.diameter_m,
            "ball_mass_kg": self.ball.mass_kg,
            "corner_mouth_m": self.corner.mouth_m if self.corner else None,
            "side_mouth_m": self.side.mouth_m if self.side else None,
            "corner_jaw_angle_deg": self.corner.jaw_angle_deg if self.corner else None,
            "side_jaw_angle_deg": self.side.jaw_angle_deg if self.side else None,
            "corner_shelf_m": self.corner.shelf_m if self.corner else None,
            "side_shelf_m": self.side.shelf_m if self.side else None,
            "cushion_nose_height_m": self.cushion.nose_height_m,
            "sight_spacing_m": self.length_m / 8 if self.sight_setback_m is not None else None,
            "ball_ids": list(self.ball.ids),
            "source": self.source,
        }

    def __repr__(self) -> str:
        if not self.overrides:
            return f"TableSpec.preset({self.name!r})"
        return f"TableSpec.preset({self.name!r}).with_overrides({dict(self.overrides)!r})"


OVERRIDE_KEYS: dict[str, tuple[float, float, str]] = {
    # key: (lowest, highest, what it is). The bounds only catch nonsense; they
    # are wide enough for any real table.
    "length_m": (0.5, 6.0, "playing surface length between cushion noses, m"),
    "width_m": (0.25, 3.0, "playing surface width between cushion noses, m"),
    "ball_diameter_m": (0.03, 0.1, "ball diameter, m"),
    "ball_mass_kg": (0.05, 0.5, "ball mass, kg"),
    "cushion_nose_height_m": (0.01, 0.08, "cushion nose height above the bed, m"),
    "corner_mouth_m": (0.05, 0.3, "corner pocket mouth between jaw points, m"),
    "side_mouth_m": (0.05, 0.3, "side pocket mouth between jaw points, m"),
    "corner_jaw_angle_deg": (120.0, 160.0, "corner jaw angle through the rubber, deg"),
    "side_jaw_angle_deg": (80.0, 125.0, "side jaw angle through the rubber, deg"),
    "corner_shelf_m": (0.0, 0.12, "corner shelf depth, m"),
    "side_shelf_m": (0.0, 0.08, "side shelf depth, m"),
    "corner_jaw_tip_radius_m": (0.0005, 0.05, "corner jaw tip radius, m"),
    "side_jaw_tip_radius_m": (0.0005, 0.05, "side jaw tip radius, m"),
    "cushion_restitution": (0.05, 1.0, "measured cushion restitution"),
    "cushion_restitution_slope": (0.0, 1.0, "fall of cushion restitution per m/s of normal speed"),
    "cushion_friction": (0.0, 1.0, "measured ball-cushion friction"),
    "cloth_sliding_friction": (0.01, 1.0, "measured ball-cloth sliding friction"),
    "cloth_rolling_resistance": (0.0005, 0.1, "measured rolling resistance"),
    "cloth_spin_friction": (0.0001, 0.5, "measured spin friction"),
}
"""Keys a layout's ``table`` object may override, with sanity bounds and meaning."""


def _mm(value_m: float) -> str:
    return f"{value_m * 1000.0:.1f}"


def _left(value_m: float) -> str:
    return f"{_mm(value_m)} mm" if value_m > 0 else "none"


def _face_k(kind: str, jaw_angle_deg: float) -> tuple[float, float]:
    """(along the axis, sideways away from the pocket's middle) of a unit step
    down a jaw face, for a jaw angle through the rubber (see
    :mod:`shotplan.table`: the face leaves the jaw point as ``cos a e - sin a n``;
    a corner's axis runs at 45 deg to both rails, a side pocket's across its rail)."""
    a = math.radians(jaw_angle_deg)
    if kind == "corner":
        return ((math.sin(a) - math.cos(a)) / math.sqrt(2.0),
                (math.sin(a) + math.cos(a)) / math.sqrt(2.0))
    return (math.sin(a), math.cos(a))


def jaw_face_length_m(kind: str, pocket: PocketSpec) -> float:
    """Length of a jaw face from the jaw point down to the drop line.

    Parameters
    ----------
    kind : str
        ``corner`` or ``side``.
    pocket : PocketSpec
        The pocket's measurements.

    Returns
    -------
    float
        Length, m.
    """
    along, _side = _face_k(kind, pocket.jaw_angle_deg)
    return pocket.shelf_m / along


def drop_width_m(kind: str, pocket: PocketSpec) -> float:
    """Width of the throat at the drop line, between the two jaw faces.

    Parameters
    ----------
    kind : str
        ``corner`` or ``side``.
    pocket : PocketSpec
        The pocket's measurements.

    Returns
    -------
    float
        Width, m.
    """
    along, side = _face_k(kind, pocket.jaw_angle_deg)
    return pocket.mouth_m + 2.0 * pocket.shelf_m * side / along


def tip_tangent_m(pocket: PocketSpec, radius_m: float | None = None) -> float:
    """Distance from the jaw point to where a rounded tip meets the nose and the face.

    ``radius / tan(jaw angle / 2)``.

    Parameters
    ----------
    pocket : PocketSpec
        The pocket's measurements.
    radius_m : float, optional
        The tip radius; the spec's by default.

    Returns
    -------
    float
        Distance, m.
    """
    r = pocket.jaw_tip_radius_m if radius_m is None else radius_m
    return r / math.tan(math.radians(pocket.jaw_angle_deg) / 2)


def effective_tip_radius_m(kind: str, pocket: PocketSpec) -> float:
    """The jaw tip radius the geometry uses.

    The spec's, or, where the face is too short for it (a shallow shelf), the
    radius whose arc ends just before the drop line (98 % of the face), so
    that nose, arc and face stay one smooth boundary. 0 for a shelf of 0: the
    jaw is sharp at the mouth, where the ball drops.

    Parameters
    ----------
    kind : str
        ``corner`` or ``side``.
    pocket : PocketSpec
        The pocket's measurements.

    Returns
    -------
    float
        Radius, m.
    """
    face = jaw_face_length_m(kind, pocket)
    if tip_tangent_m(pocket) > face:
        return 0.98 * face * math.tan(math.radians(pocket.jaw_angle_deg) / 2)
    return pocket.jaw_tip_radius_m


def pool_spots(length: float, width: float) -> tuple[Spot, ...]:
    """The spots of a pool table of a size (WPA).

    Parameters
    ----------
    length, width : float
        The playing area between the cushion noses, m.

    Returns
    -------
    tuple of Spot
        Head spot, centre spot, foot spot.
    """
    # WPA: head string through the second sights (L/4 from the head cushion);
    # foot spot on the long string L/4 from the foot cushion; centre spot.
    return (
        Spot("head spot", length / 4, width / 2),
        Spot("centre spot", length / 2, width / 2),
        Spot("foot spot", 3 * length / 4, width / 2),
    )


def snooker_spots(length: float, width: float) -> tuple[Spot, ...]:
    """The colour spots of a snooker table of a size (WSF).

    Parameters
    ----------
    length, width : float
        The playing area between the cushion noses, m.

    Returns
    -------
    tuple of Spot
        Yellow, brown, green, blue, pink, black.
    """
    # WSF: brown on the middle of the baulk line, yellow at its right-hand
    # and green at its left-hand intersection with the D (seen from the
    # baulk end); blue on the centre spot; pink midway between the centre
    # spot and the top cushion face; black 324 mm from the top cushion.
    return (
        Spot("yellow", 0.737, width / 2 - 0.292),
        Spot("brown", 0.737, width / 2),
        Spot("green", 0.737, width / 2 + 0.292),
        Spot("blue", length / 2, width / 2),
        Spot("pink", 0.75 * length, width / 2),
        Spot("black", length - 0.324, width / 2),
    )


def _rescale_markings(new: TableSpec, old: TableSpec) -> TableSpec:
    """Markings for a new length and width, by each game's rule."""
    L, W = new.length_m, new.width_m
    if new.game == "snooker":
        # The rules measure the baulk line and the black spot from the
        # cushions and the D and colour spots from the baulk line: they keep
        # their distances; blue and pink keep their places by proportion.
        return dataclasses.replace(new, spots=snooker_spots(L, W))
    return dataclasses.replace(new, spots=pool_spots(L, W), head_string_x_m=L / 4)
