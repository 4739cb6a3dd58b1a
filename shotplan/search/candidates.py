"""Candidate shots from geometry alone: one generator per kind of shot.

Each generator takes the :class:`Board` (the balls, the table, the limits),
an object ball and a pocket, and yields :class:`Candidate` shots for the
simulator to decide, or :class:`~shotplan.search.shots.Rejected` ones with
the reason. Corridors are checked against the other balls (a ball whose
centre is within two radii of a path blocks it), cut angles against a limit.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable, Iterator, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..aim import aim_at, mirror_point
from ..table import Table
from .explain import ball_word, cut_reason
from .shots import MAX_APPROACH_DEG, Rejected

__all__ = ["Board", "Candidate", "Rail", "rails_of", "pocket_target", "GENERATORS",
           "direct", "bank", "kick", "combination", "angle_diff_rad"]

_RAIL_NAMES = {(0, 1): "right rail", (0, -1): "left rail", (1, 0): "head rail",
               (-1, 0): "foot rail"}

COMBINATION_MAX_CUT_DEG = 45.0
"""Widest cut of the first ball onto the second that is still proposed as a
combination (common practice, no source: a player does not see thicker)."""

COMBINATION_FIRST_CUT_DEG = 60.0
"""Thinnest cut on the first ball of a combination."""


@dataclass(frozen=True, slots=True)
class Rail:
    """One straight rail's cushion line."""

    index: int
    """Index of the line in ``Table.cushion_lines``."""
    name: str
    """``head rail``, ``foot rail``, ``left rail`` or ``right rail``."""
    line: np.ndarray
    """The cushion line ``(x0, y0, x1, y1, nx, ny, ...)`` of the table."""

    @property
    def start(self) -> np.ndarray:
        """The line's first end, (x, y)."""
        return self.line[:2]

    @property
    def normal(self) -> np.ndarray:
        """Unit normal into the table, (nx, ny)."""
        return self.line[4:6]

    def faces_like(self, other: Rail) -> bool:
        """Both rails have the same normal (the two halves of one long rail)."""
        return bool(self.line[4] == other.line[4] and self.line[5] == other.line[5])


def rails_of(table: Table) -> list[Rail]:
    """The straight rails of a table, in cushion-line order."""
    out = []
    for k, line in enumerate(table.cushion_lines):
        if line[6] != 0:
            continue
        out.append(Rail(k, _RAIL_NAMES[(int(round(line[4])), int(round(line[5])))], line))
    return out


@dataclass
class Candidate:
    """A shot the geometry allows; the simulator decides."""

    kind: str
    balls: tuple[str, ...]
    pocket: int
    rails: tuple[str, ...]
    first: int
    """Index of the first object ball."""
    last: int
    """Index of the ball to pocket."""
    aim_target: tuple[float, float]
    """Where the first object ball is sent (ghost-ball target)."""
    cue_target: tuple[float, float]
    """Where the cue is aimed at first (ghost ball or its image)."""
    ghost: tuple[float, float]
    cut: float
    cue_distance: float
    object_path: float
    bounce_lines: tuple[int, ...] = ()
    """Cushion line indices (bank) in order."""


@dataclass(frozen=True, slots=True)
class Board:
    """What candidate generation reads: the balls, the table, the limits."""

    table: Table
    ids: Sequence[str]
    pos: np.ndarray
    cue: int
    radius: float
    rails: list[Rail]
    max_cut_deg: float

    @property
    def cue_xy(self) -> np.ndarray:
        """The cue ball's centre."""
        return self.pos[self.cue]

    def blocker(self, a: Any, b: Any, skip: Iterable[int]) -> str | None:
        """Id of the nearest ball (to a) whose centre lies within 2R of segment a-b."""
        ax, ay = a
        dx, dy = b[0] - ax, b[1] - ay
        L2 = dx * dx + dy * dy
        if L2 == 0:
            return None
        pos = self.pos
        t = np.clip(((pos[:, 0] - ax) * dx + (pos[:, 1] - ay) * dy) / L2, 0.0, 1.0)
        dist = np.hypot(pos[:, 0] - (ax + t * dx), pos[:, 1] - (ay + t * dy))
        mask = dist < 2.0 * self.radius - 1e-9
        for k in skip:
            mask[k] = False
        if not mask.any():
            return None
        cand = np.flatnonzero(mask)
        return self.ids[int(cand[np.argmin(t[cand])])]

    def word(self, ball_id: str) -> str:
        """``the cue ball`` or ``ball 7``."""
        return ball_word(self.ids, self.ids.index(ball_id))

    def approach_ok(self, k: int, start: Any, target: Any) -> bool:
        """Whether a ball from ``start`` to ``target`` can still fall in pocket ``k``."""
        p = self.table.pockets[k]
        d = math.atan2(target[1] - start[1], target[0] - start[0])
        ax = math.atan2(p.axis[1], p.axis[0])
        off = abs(math.degrees(angle_diff_rad(d, ax)))
        return off <= MAX_APPROACH_DEG[p.kind]

    def rejected(self, kind: str, balls: tuple[str, ...], pk: int, rails: tuple[str, ...],
                 why: str) -> Rejected:
        """A rejected candidate with its reason."""
        return Rejected(kind, balls, self.table.pockets[pk].name, rails, why)


def pocket_target(table: Table, k: int) -> tuple[float, float]:
    """Where an object ball is sent: the middle of the pocket's drop line."""
    return table.pockets[k].drop_centre


def angle_diff_rad(a: float, b: float) -> float:
    """``a - b`` wrapped to [-pi, pi)."""
    return (a - b + math.pi) % (2.0 * math.pi) - math.pi


def bounce_point(rail: Rail, a: Any, b_img: Any, offset: float) -> tuple[float, float] | None:
    """Where the path from a to the mirror image b_img meets the rail's
    contact line (nose moved in by offset), if within the rail."""
    x0, y0, x1, y1, nx, ny = rail.line[:6]
    da = (a[0] - x0) * nx + (a[1] - y0) * ny - offset
    db = (b_img[0] - x0) * nx + (b_img[1] - y0) * ny - offset
    if da <= 0 or db >= 0:
        return None
    s = da / (da - db)
    px, py = a[0] + s * (b_img[0] - a[0]), a[1] + s * (b_img[1] - a[1])
    dx, dy = x1 - x0, y1 - y0
    u = ((px - x0) * dx + (py - y0) * dy) / (dx * dx + dy * dy)
    length = math.hypot(dx, dy)
    margin = 0.03 / length  # keep bounce points clear of the jaws
    if not margin <= u <= 1.0 - margin:
        return None
    return (px, py)


Item = Candidate | Rejected
"""What a generator yields."""


# ------------------------------------------------------------------ direct
def direct(bd: Board, b: int, pk: int, target: tuple[float, float]) -> Iterator[Item]:
    """The ghost-ball cut of ball ``b`` into pocket ``pk``."""
    name = (bd.ids[b],)
    bxy = bd.pos[b]
    a = aim_at(bd.cue_xy, bxy, target, bd.radius)
    block_ob = bd.blocker(bxy, target, (b, bd.cue))
    block_cue = bd.blocker(bd.cue_xy, a.ghost, (b, bd.cue))
    if block_cue:
        yield bd.rejected("direct", name, pk, (), f"the cue ball's path to ball {bd.ids[b]} is "
                          f"blocked by {bd.word(block_cue)}")
    elif block_ob:
        yield bd.rejected("direct", name, pk, (), f"ball {bd.ids[b]}'s path to the pocket is "
                          f"blocked by {bd.word(block_ob)}")
    elif a.cut_deg > bd.max_cut_deg:
        yield bd.rejected("direct", name, pk, (), cut_reason(a.cut_deg, bd.max_cut_deg))
    elif not bd.approach_ok(pk, bxy, target):
        yield bd.rejected("direct", name, pk, (), "pocket closed at this angle")
    else:
        yield Candidate("direct", name, pk, (), b, b, target, a.ghost, a.ghost, a.cut_deg,
                        a.cue_distance, a.object_distance)


# -------------------------------------------------------------------- bank
def _bank_path(bd: Board, combo: tuple[Rail, ...], start: Any,
               target: tuple[float, float]) -> list[Any] | None:
    """The object ball's path start -> bounce points -> target off these
    rails in order (mirror images of the target, last rail first), or None
    when there is no bank point on them."""
    reff = bd.table.contact_offset
    images = [target]
    for r in reversed(combo):
        images.append(mirror_point(images[-1], r.start, r.normal, reff))
    pts: list[Any] = [tuple(start)]
    for n_r, r in enumerate(combo):
        bp = bounce_point(r, pts[-1], images[len(combo) - n_r], reff)
        if bp is None:
            return None
        pts.append(bp)
    pts.append(target)
    return pts


def bank(bd: Board, b: int, pk: int, target: tuple[float, float]) -> Iterator[Item]:
    """Ball ``b`` off one or two rails into pocket ``pk``."""
    name = (bd.ids[b],)
    bxy = bd.pos[b]
    combos: list[tuple[Rail, ...]] = [(r,) for r in bd.rails]
    combos += [(r1, r2) for r1 in bd.rails for r2 in bd.rails
               if r1.index != r2.index and not r1.faces_like(r2)]
    for combo in combos:
        rl = tuple(r.name for r in combo)
        pts = _bank_path(bd, combo, bxy, target)
        if pts is None or not bd.approach_ok(pk, pts[-2], target):
            continue  # no bank point on these rails: not a candidate at all
        a = aim_at(bd.cue_xy, bxy, pts[1], bd.radius)
        blk = bd.blocker(bd.cue_xy, a.ghost, (b, bd.cue))
        if blk:
            yield bd.rejected("bank", name, pk, rl, f"the cue ball's path to ball {bd.ids[b]} "
                              f"is blocked by {bd.word(blk)}")
            continue
        for s0, s1 in zip(pts[:-1], pts[1:], strict=True):
            blk = blk or bd.blocker(s0, s1, (b,))
        if blk:
            yield bd.rejected("bank", name, pk, rl, f"ball {bd.ids[b]}'s path off the rail is "
                              f"blocked by {bd.word(blk)}")
            continue
        if a.cut_deg > bd.max_cut_deg:
            yield bd.rejected("bank", name, pk, rl, cut_reason(a.cut_deg, bd.max_cut_deg))
            continue
        path_len = sum(math.dist(p, q) for p, q in zip(pts[:-1], pts[1:], strict=True))
        yield Candidate("bank", name, pk, rl, b, b, pts[1], a.ghost, a.ghost, a.cut_deg,
                        a.cue_distance, path_len, tuple(r.index for r in combo))


# -------------------------------------------------------------------- kick
def kick(bd: Board, b: int, pk: int, target: tuple[float, float]) -> Iterator[Item]:
    """The cue ball off one rail onto ball ``b``, which goes into pocket ``pk``."""
    name = (bd.ids[b],)
    bxy, cue_xy, cue = bd.pos[b], bd.cue_xy, bd.cue
    g = aim_at(cue_xy, bxy, target, bd.radius).ghost
    if bd.blocker(bxy, target, (b, cue)) is not None or not bd.approach_ok(pk, bxy, target):
        return
    reff = bd.table.contact_offset
    for r in bd.rails:
        rl = (r.name,)
        img = mirror_point(g, r.start, r.normal, reff)
        bp = bounce_point(r, cue_xy, img, reff)
        if bp is None:
            continue
        blk = bd.blocker(cue_xy, bp, (cue,))
        if blk:
            yield bd.rejected("kick", name, pk, rl, f"the cue ball's path to the {r.name} is "
                              f"blocked by {bd.word(blk)}")
            continue
        blk = bd.blocker(bp, g, (cue, b))
        if blk:
            yield bd.rejected("kick", name, pk, rl, f"the cue ball's path off the {r.name} is "
                              f"blocked by {bd.word(blk)}")
            continue
        a2 = aim_at(bp, bxy, target, bd.radius)  # cut as seen from the bounce point
        if a2.cut_deg > bd.max_cut_deg:
            yield bd.rejected("kick", name, pk, rl, cut_reason(a2.cut_deg, bd.max_cut_deg))
            continue
        yield Candidate("kick", name, pk, rl, b, b, target, img, g, a2.cut_deg,
                        math.dist(cue_xy, bp) + math.dist(bp, g), math.dist(bxy, target),
                        (r.index,))


# ------------------------------------------------------------- combination
def combination(bd: Board, b: int, pk: int, target: tuple[float, float]) -> Iterator[Item]:
    """Ball ``b`` into another ball, which goes into pocket ``pk``."""
    bxy, cue_xy, cue = bd.pos[b], bd.cue_xy, bd.cue
    for c in range(len(bd.ids)):
        if c in (b, cue):
            continue
        cxy = bd.pos[c]
        name = (bd.ids[b], bd.ids[c])
        a_c = aim_at(bxy, cxy, target, bd.radius)  # b must arrive at c's ghost ball
        if a_c.cut_deg > COMBINATION_MAX_CUT_DEG:
            continue  # not a combination a player would see
        if math.dist(bxy, cxy) > 0.9 * bd.table.length:
            continue
        a_b = aim_at(cue_xy, bxy, a_c.ghost, bd.radius)
        blk = (bd.blocker(cue_xy, a_b.ghost, (cue, b))
               or bd.blocker(bxy, a_c.ghost, (b, c))
               or bd.blocker(cxy, target, (c,)))
        if blk:
            yield bd.rejected("combination", name, pk, (),
                              f"the path is blocked by {bd.word(blk)}")
            continue
        if a_b.cut_deg > COMBINATION_FIRST_CUT_DEG:
            yield bd.rejected("combination", name, pk, (),
                              cut_reason(a_b.cut_deg, COMBINATION_FIRST_CUT_DEG))
            continue
        if not bd.approach_ok(pk, cxy, target):
            continue
        yield Candidate("combination", name, pk, (), b, c, a_c.ghost, a_b.ghost, a_b.ghost,
                        a_b.cut_deg, a_b.cue_distance,
                        a_c.object_distance + math.dist(bxy, cxy))


GENERATORS: dict[str, Callable[[Board, int, int, tuple[float, float]], Iterator[Item]]] = {
    "direct": direct, "bank": bank, "kick": kick, "combination": combination,
}
"""The generator of each kind of shot, in the order the search tries them."""
