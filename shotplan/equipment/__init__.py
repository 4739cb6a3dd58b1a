"""Equipment standards: balls, cloth, cushions, pockets and tables as frozen values.

Every number here is data with its source beside it. Where a standard gives a
range, the range is kept (``*_range`` fields) and the nominal value the model
uses is stated. Sources, by the short names used below:

WPA
    World Pool-Billiard Association, *Tournament Table & Equipment
    Specifications* (the world pool governing body's equipment standard).
WSF
    The snooker governing body's *Official Rules of the Games of Snooker and
    English Billiards* (table and ball section).
UMB
    Union Mondiale de Billard (the carom governing body), *Statutes and
    sporting code*, equipment section.
memory
    A value recalled from general trade knowledge, not read from a document
    during this work. Measure your table and override it in the layout.

A table that is not a preset is a preset plus measured overrides, see
:meth:`TableSpec.with_overrides`. The package imports nothing of shotplan
but :mod:`shotplan.errors` and :mod:`shotplan.units`: :mod:`.specs` holds
the spec values and their checks, :mod:`.presets` the standard tables.
"""

from __future__ import annotations

from .presets import PRESETS, preset_names
from .specs import (
    CAROM_BALL_IDS,
    OVERRIDE_KEYS,
    POOL_BALL_IDS,
    SNOOKER_BALL_IDS,
    BallSpec,
    ClothSpec,
    CushionSpec,
    PocketSpec,
    Range,
    Spot,
    TableSpec,
    drop_width_m,
    effective_tip_radius_m,
    jaw_face_length_m,
    pool_spots,
    snooker_spots,
    tip_tangent_m,
)

__all__ = [
    "Range",
    "BallSpec",
    "ClothSpec",
    "CushionSpec",
    "PocketSpec",
    "Spot",
    "TableSpec",
    "PRESETS",
    "preset_names",
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
