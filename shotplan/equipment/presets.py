"""The preset tables: pool 9, 8 and 7 ft, snooker, carom, with their sources.

Sources are named as in :mod:`shotplan.equipment` (WPA, WSF, UMB, memory).
"""

from __future__ import annotations

from ..units import inches, mm
from .specs import (
    CAROM_BALL_IDS,
    POOL_BALL_IDS,
    SNOOKER_BALL_IDS,
    BallSpec,
    ClothSpec,
    CushionSpec,
    PocketSpec,
    Range,
    TableSpec,
    pool_spots,
    snooker_spots,
)

__all__ = ["PRESETS", "preset_names", "SNOOKER", "CAROM"]

# WPA: ball 2 1/4 in (57.15 mm) +- 0.005 in; 5.5 to 6 oz (156 to 170 g).
_POOL_BALL = BallSpec(
    diameter_m=inches(2.25),  # WPA: 2.25 in nominal
    mass_kg=0.163,  # WPA band 156-170 g; nominal = middle of the band (our choice)
    diameter_range_m=Range.around(inches(2.25), inches(0.005)),  # WPA +- 0.005 in
    mass_range_kg=Range(0.156, 0.170),  # WPA 5.5-6 oz
    ids=POOL_BALL_IDS,
)

_POOL_CUSHION = CushionSpec(
    # WPA: nose height 63.5 % of the ball diameter, +- 1 % (i.e. 62.5-64.5 %).
    nose_height_m=0.635 * inches(2.25),
    nose_height_range_m=Range(0.625 * inches(2.25), 0.645 * inches(2.25)),
    rubber_width_m=inches(2.0),  # memory: about 2 in of rubber and cloth, nose to rail
    rail_width_m=inches(5.0),  # memory: 4.5-5.5 in rails are usual (drawing only)
)

_POOL_CORNER = PocketSpec(
    mouth_m=inches(4.5625),  # WPA 4.5-4.625 in; nominal = middle
    mouth_range_m=Range(inches(4.5), inches(4.625)),  # WPA
    jaw_angle_deg=142.0,  # WPA 142 +- 1 deg
    jaw_angle_range_deg=Range(141.0, 143.0),  # WPA
    shelf_m=inches(1.625),  # WPA 1-2.25 in; nominal = middle
    shelf_range_m=Range(inches(1.0), inches(2.25)),  # WPA
    jaw_tip_radius_m=mm(6.0),  # memory: not in the WPA text; a typical rounded nose
    back_draft_deg=13.5,  # WPA 12-15 deg; middle
)

_POOL_SIDE = PocketSpec(
    mouth_m=inches(5.0625),  # WPA 5-5.125 in; nominal = middle
    mouth_range_m=Range(inches(5.0), inches(5.125)),  # WPA
    jaw_angle_deg=104.0,  # WPA 104 +- 1 deg
    jaw_angle_range_deg=Range(103.0, 105.0),  # WPA
    shelf_m=inches(0.1875),  # WPA 0-0.375 in; nominal = middle
    shelf_range_m=Range(0.0, inches(0.375)),  # WPA
    jaw_tip_radius_m=mm(6.0),  # memory, as for the corner
    back_draft_deg=13.5,  # WPA 12-15 deg
)


def _pool_table(name: str, length: float, width: float, tol: float, source: str) -> TableSpec:
    return TableSpec(
        name=name,
        game="pool",
        length_m=length,
        width_m=width,
        size_tolerance_m=tol,
        ball=_POOL_BALL,
        cushion=_POOL_CUSHION,
        cloth=ClothSpec(),
        corner=_POOL_CORNER,
        side=_POOL_SIDE,
        sight_setback_m=inches(3 + 11 / 16),  # WPA: 3 11/16 in from nose to sight centre
        spots=pool_spots(length, width),
        head_string_x_m=length / 4,  # WPA: through the second sights
        source=source,
    )


# Snooker: the rules give the playing area 11 ft 8.5 in x 5 ft 10 in
# (3569 x 1778 mm) +- 0.5 in (13 mm); balls 52.5 mm +- 0.05 mm, of equal mass
# within 3 g (a set near 141 g is usual: memory); baulk line 29 in (737 mm)
# from the baulk cushion face; the D a semicircle of 11.5 in (292 mm) radius;
# black spot 12.75 in (324 mm) from the top cushion face.
_SNOOKER_L, _SNOOKER_W = 3.569, 1.778
_SNOOKER_BALL = BallSpec(
    diameter_m=0.0525,  # WSF 52.5 mm
    mass_kg=0.141,  # memory: sets are near 141 g; the rules fix only the spread
    diameter_range_m=Range.around(0.0525, 0.00005),  # WSF +- 0.05 mm
    mass_range_kg=Range(0.138, 0.144),  # memory: within 3 g of the nominal
    ids=SNOOKER_BALL_IDS,
)

SNOOKER = TableSpec(
    name="snooker",
    game="snooker",
    length_m=_SNOOKER_L,  # WSF 3569 mm
    width_m=_SNOOKER_W,  # WSF 1778 mm
    size_tolerance_m=0.013,  # WSF +- 13 mm
    ball=_SNOOKER_BALL,
    cushion=CushionSpec(
        # memory: the rules do not give a number; the pool proportion (63.5 %
        # of the ball) is used, which matches snooker cushions to about 1 mm.
        nose_height_m=0.635 * 0.0525,
        nose_height_range_m=Range(0.62 * 0.0525, 0.65 * 0.0525),
        rubber_width_m=0.045,  # memory (drawing only)
        rail_width_m=0.12,  # memory (drawing only)
    ),
    cloth=ClothSpec(),
    # memory: snooker pockets are set by templates rather than numbers in the
    # rules; about 86 mm (corner) and 105 mm (middle) between the jaw points,
    # with strongly rounded jaws. Modelled with straight faces and big tips.
    corner=PocketSpec(
        mouth_m=0.086, mouth_range_m=Range(0.083, 0.089),
        jaw_angle_deg=138.0, jaw_angle_range_deg=Range(135.0, 141.0),
        shelf_m=0.012, shelf_range_m=Range(0.0, 0.025),
        jaw_tip_radius_m=0.020, back_draft_deg=0.0,
    ),
    side=PocketSpec(
        mouth_m=0.105, mouth_range_m=Range(0.100, 0.110),
        jaw_angle_deg=95.0, jaw_angle_range_deg=Range(90.0, 100.0),
        # a rounded nose that runs down to the fall: the tip's arc must fit
        # on the face (radius / tan(angle / 2) shorter than the face)
        shelf_m=0.015, shelf_range_m=Range(0.0, 0.025),
        jaw_tip_radius_m=0.012, back_draft_deg=0.0,
    ),
    sight_setback_m=None,  # snooker tables carry no sights
    spots=snooker_spots(_SNOOKER_L, _SNOOKER_W),
    head_string_x_m=None,
    baulk_line_x_m=0.737,  # WSF 29 in from the baulk cushion face
    d_radius_m=0.292,  # WSF 11.5 in
    source="snooker governing body's rules (WSF); pocket shapes from memory",
)

# Carom: UMB match table 2.84 x 1.42 m +- 5 mm between the cushion noses;
# cushion height 37 +- 1 mm; balls 61-61.5 mm, 205-220 g.
_CAROM_L, _CAROM_W = 2.84, 1.42
CAROM = TableSpec(
    name="carom",
    game="carom",
    length_m=_CAROM_L,  # UMB 2.84 m
    width_m=_CAROM_W,  # UMB 1.42 m
    size_tolerance_m=0.005,  # UMB +- 5 mm
    ball=BallSpec(
        diameter_m=0.06125,  # UMB 61-61.5 mm; nominal = middle
        mass_kg=0.2125,  # UMB 205-220 g; nominal = middle
        diameter_range_m=Range(0.061, 0.0615),  # UMB
        mass_range_kg=Range(0.205, 0.220),  # UMB
        ids=CAROM_BALL_IDS,
    ),
    cushion=CushionSpec(
        nose_height_m=0.037,  # UMB 37 +- 1 mm
        nose_height_range_m=Range(0.036, 0.038),  # UMB
        rubber_width_m=0.05,  # memory (drawing only)
        rail_width_m=0.13,  # memory (drawing only)
    ),
    cloth=ClothSpec(),
    corner=None,
    side=None,
    sight_setback_m=inches(3 + 11 / 16),  # memory: sights set back as on pool tables
    spots=pool_spots(_CAROM_L, _CAROM_W),  # head, centre and foot spot on the long string
    head_string_x_m=_CAROM_L / 4,
    source="carom governing body's equipment rules (UMB)",
)

PRESETS: dict[str, TableSpec] = {
    "pool-9ft": _pool_table(
        "pool-9ft", inches(100), inches(50), inches(1 / 8),  # WPA: 100 x 50 in +- 1/8 in
        "world pool governing body's tournament table specifications (WPA)",
    ),
    "pool-8ft": _pool_table(
        "pool-8ft", inches(92), inches(46), inches(1 / 8),  # WPA: 92 x 46 in +- 1/8 in
        "world pool governing body's tournament table specifications (WPA)",
    ),
    "pool-7ft": _pool_table(
        # Not a WPA size. 76 x 38 in is a common 7-ft playing surface (memory);
        # makers vary between about 74 x 37 and 78 x 39 in: measure and override.
        "pool-7ft", inches(76), inches(38), inches(0.5),
        "not a WPA size: a common 7-ft surface (76 x 38 in, makers vary) "
        "with WPA pockets, balls and cushions",
    ),
    "snooker": SNOOKER,
    "carom": CAROM,
}
"""The standard tables by name."""


def preset_names() -> list[str]:
    """Names of the table presets, in the order they are listed.

    Returns
    -------
    list of str
        The keys of :data:`PRESETS`.
    """
    return list(PRESETS)
