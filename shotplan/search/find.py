"""``find_shots``: every shot on a layout that pockets a ball, best first."""

from __future__ import annotations

import contextlib
import time
from collections.abc import Iterator, Mapping, Sequence
from typing import Any

import numpy as np

from ..aim import aim_at
from ..errors import InputError, StrokeError, UnknownName
from ..games import Rules
from ..physics import Physics, simulator_for
from ..physics.run import StrokePlayer
from ..physics.strike import check_tip
from ..players import DEFAULT_LEVEL, PlayerErrors, level_tip_room
from ..stroke import TIPS
from .candidates import GENERATORS, Board, Candidate, pocket_target, rails_of
from .refine import Settings, error_fn, evaluate, refine
from .shots import KINDS, MAX_CUT_DEG, Rejected, SearchResult, Shot

__all__ = ["find_shots", "aim_direct"]


@contextlib.contextmanager
def _named_as(labels: Mapping[str, str] | None, key: str) -> Iterator[None]:
    """A bad name raised inside starts with the option it came from, when
    ``labels`` names it (``{"ball": "--ball"}``)."""
    try:
        yield
    except (InputError, UnknownName) as exc:
        if not labels or key not in labels:
            raise
        raise type(exc)(f"{labels[key]}: {exc}") from None


def _check_settings(kinds: Sequence[str], tip: str, speed: float | None, side: float,
                    height: float | None, phys: Physics,
                    player: PlayerErrors | None, elevation_deg: float = 0.0,
                    labels: Mapping[str, str] | None = None) -> float:
    """Raise InputError on a bad setting; returns the player's tip room.

    ``labels`` names a setting as the user gave it (``{"tip": "--tip"}``);
    a message about that setting starts with its label."""
    def named(key: str, text: str) -> str:
        if labels and key in labels:
            return f"{labels[key]}: {text.removeprefix(key + ' ')}"
        return text

    for k in kinds:
        if k not in KINDS:
            raise InputError(named("kinds", f"{k!r} is not a kind of shot, must be one of "
                                            f"{', '.join(KINDS)}"))
    if tip not in TIPS:
        raise InputError(named("tip", f"{tip!r} is not a tip choice, must be one of "
                                      f"{', '.join(TIPS)}"))
    if speed is not None and not 0.0 < speed <= 15.0:
        raise InputError(named("speed", f"speed {speed!r} m/s is out of range, must be above "
                                        "0 and at most 15"))
    if not 0.0 <= elevation_deg <= 60.0:
        raise InputError(named("elevation", f"elevation {elevation_deg!r} deg is out of range, "
                                            "must be between 0 and 60 degrees"))
    limit = phys.miscue_limit
    if not abs(side) <= limit:
        raise InputError(named("side", f"side {side!r} is beyond the miscue limit, must be "
                                       f"within +-{limit:g} ball radii"))
    try:  # the one rule, elevation and all (physics.strike.check_tip)
        check_tip(side, 0.0 if height is None else height, elevation_deg, limit)
    except StrokeError as exc:
        raise InputError(str(exc).removeprefix("stroke: ")) from None
    # The heights the search chooses itself (stun, draw) keep the tip inside
    # the player's tip room: 2.5 sd of the tip error inside the miscue limit
    # (shotplan.players). A height given outright is the caller's choice.
    room = level_tip_room(limit, player)
    level = player.describe() if player is not None else f"a {DEFAULT_LEVEL} player"
    if height is None and room < 0.0:
        raise InputError(f"no tip setting keeps {level} clear of the miscue limit "
                         f"{limit:g} R; give a smaller tip error or --height")
    if height is None and abs(side) > room:
        raise InputError(f"side {side!r} leaves {level} no room: the tip must stay within "
                         f"{room:.3f} R of centre (the miscue limit {limit:g} R less 2.5 "
                         "standard deviations of the tip error); give a smaller side")
    return room


def _object_balls(ids: list[str], balls: Sequence[str] | None) -> list[int]:
    obj = [i for i, b in enumerate(ids) if b != "cue"]
    if not balls:
        return obj
    for wanted in balls:
        if wanted not in ids or wanted == "cue":
            raise InputError(f"{wanted!r} is not an object ball on this layout, must be one "
                             f"of {', '.join(ids[i] for i in obj) or '(none)'}")
    return [ids.index(wanted) for wanted in balls]


def _by_the_rules(board: Board, cands: list[Candidate], rules: Rules
                  ) -> tuple[list[Candidate], list[Rejected]]:
    """The candidates whose first ball is a ball on and whose ball may fall,
    and the others rejected, naming the rule."""
    first_ok = set(rules.first_allowed())
    pot_ok = set(rules.pot_allowed())
    keep: list[Candidate] = []
    out: list[Rejected] = []
    rule = rules.source
    for c in cands:
        first, last = board.ids[c.first], board.ids[c.last]
        if first not in first_ok:
            out.append(board.rejected(c.kind, c.balls, c.pocket, c.rails,
                                      f"first contact on {first}, the rules need "
                                      f"{rules.describe_on()} ({rule})"))
        elif last not in pot_ok:
            out.append(board.rejected(c.kind, c.balls, c.pocket, c.rails,
                                      f"{last} may not be pocketed now ({rule})"))
        else:
            keep.append(c)
    return keep, out


def _candidates(board: Board, obj: list[int], pocket_ids: list[int], kinds: Sequence[str]
                ) -> tuple[list[Candidate], list[Rejected]]:
    """Every candidate of the wanted kinds for these balls and pockets, and
    the ones the geometry rejects (ball by ball, pocket by pocket, in the
    order of :data:`KINDS`)."""
    cands: list[Candidate] = []
    rejected: list[Rejected] = []
    gens = [GENERATORS[k] for k in KINDS if k in kinds]
    for b in obj:
        for pk in pocket_ids:
            target = pocket_target(board.table, pk)
            for gen in gens:
                for item in gen(board, b, pk, target):
                    if isinstance(item, Candidate):
                        cands.append(item)
                    else:
                        rejected.append(item)
    return cands, rejected


def find_shots(
    layout: Any,
    *,
    balls: Sequence[str] | None = None,
    pockets: Sequence[str] | None = None,
    kinds: Sequence[str] = KINDS,
    speed: float | None = None,
    tip: str = "stun",
    side: float = 0.0,
    height: float | None = None,
    elevation_deg: float = 0.0,
    top: int | None = None,
    allow_scratch: bool = False,
    max_cut_deg: float = MAX_CUT_DEG,
    physics: Physics | None = None,
    player: PlayerErrors | None = None,
    rules: Rules | None = None,
    labels: Mapping[str, str] | None = None,
    pocketed_too: bool = False,
) -> SearchResult:
    """Every shot on the layout that pockets a ball, best first.

    Parameters
    ----------
    layout
        A :class:`shotplan.layout.Layout` with a cue ball.
    balls, pockets
        Restrict to these object balls / pockets (default: all). A ball is
        the first object ball the cue ball meets, unless ``pocketed_too``.
    kinds
        Kinds of shot to try (see :data:`KINDS`).
    speed
        Launch speed for every shot; default: a sensible pace per shot.
    tip, side
        Tip choice (:data:`TIPS`) and side offset (ball radii) for every shot.
    height
        Tip height (ball radii) for every shot, instead of the tip choice.
    elevation_deg
        Cue elevation for every shot, degrees.
    allow_scratch
        Keep shots that pocket the cue ball too (flagged ``scratch``).
    player
        The player's errors: the heights the search chooses keep the tip
        inside this player's tip room (:func:`shotplan.players.tip_room`);
        default the club level.
    rules
        A game's rules (:class:`shotplan.games.Rules`): candidates whose
        first ball is not a ball on or whose ball may not fall are rejected
        by the rule, and every simulated stroke must be legal and score (a
        scratch is a foul whatever ``allow_scratch``). None (or the game
        ``any``): no rules.
    pocketed_too
        With ``balls``: also the combinations that pocket one of them off
        another ball first (``--ball 9`` finds the 1-9 combination).
    labels
        The settings as the user named them, for messages (``{"tip":
        "--tip"}``; keys ``kinds``, ``tip``, ``speed``, ``side``).
    """
    t_start = time.perf_counter()
    phys = physics if physics is not None else layout.physics()
    room = _check_settings(kinds, tip, speed, side, height, phys, player, elevation_deg,
                           labels)
    sim = simulator_for(layout.table, phys)
    table = sim.table
    positions = layout.positions()
    ids = list(positions)
    if "cue" not in ids:
        raise InputError("the layout has no cue ball: nothing to strike")
    pos = np.array([positions[i] for i in ids], dtype=float)
    sp = StrokePlayer(sim, ids, pos, elevation_deg)
    if not table.pockets:
        return SearchResult((), (), 0, time.perf_counter() - t_start,
                            {"note": "this table has no pockets"})
    pocket_ids = list(range(len(table.pockets)))
    with _named_as(labels, "pocket"):
        if pockets:
            pocket_ids = [table.pocket_index(p) for p in pockets]
    with _named_as(labels, "ball"):
        obj = _object_balls(ids, balls)
    board = Board(table, ids, pos, sp.cue, sim.radius, rails_of(table), max_cut_deg)
    cands, rejected = _candidates(board, obj, pocket_ids, kinds)
    if pocketed_too and balls and "combination" in kinds:
        # Combinations that pocket a wanted ball off another ball first.
        others = [b for b in _object_balls(ids, None) if b not in obj]
        more, more_out = _candidates(board, others, pocket_ids, ("combination",))
        cands += [c for c in more if c.last in obj]
        rejected += [r for r in more_out if r.balls[-1] in balls]
    if rules is not None and rules.game == "any":
        rules = None
    if rules is not None:
        cands, by_rule = _by_the_rules(board, cands, rules)
        rejected += by_rule
    settings = Settings(speed, tip, side, allow_scratch, height, room, rules)
    shots: list[Shot] = []
    for cand in cands:
        shot, why = evaluate(sp, table, cand, settings)
        if shot is None:
            rejected.append(board.rejected(cand.kind, cand.balls, cand.pocket, cand.rails, why))
        else:
            shots.append(shot)
    shots.sort(key=lambda s: (-round(s.window_deg, 2), s.difficulty))
    if top is not None:
        shots = shots[:top]
    return SearchResult(tuple(shots), tuple(rejected), sp.runs, time.perf_counter() - t_start,
                        {"tip": tip, "side": side, "speed": speed, "kinds": list(kinds),
                         "tip_room": room})


def aim_direct(layout: Any, ball: str, pocket: str, speed: float, side: float, height: float,
               physics: Physics | None = None) -> float | None:
    """The cue direction (degrees) that sends ``ball`` at the middle of
    ``pocket`` as a direct cut with these settings, corrected in simulation
    for throw and squirt; None if the cut cannot be made (no window search:
    this is the cheap call for sweeps over settings)."""
    sp = StrokePlayer.for_layout(layout, physics)
    table = sp.sim.table
    b = sp.ids.index(ball)
    pk = table.pocket_index(pocket)
    target = pocket_target(table, pk)
    a = aim_at(sp.pos[sp.cue], sp.pos[b], target, sp.radius)
    cand = Candidate("direct", (ball,), pk, (), b, b, target, a.ghost, a.ghost, a.cut_deg,
                     a.cue_distance, a.object_distance)
    phi, _throw = refine(sp, error_fn(sp, cand, target), a.direction_deg, speed, side, height)
    return phi
