"""Why a candidate was not proposed, in the player's terms."""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from typing import TYPE_CHECKING

import numpy as np

from ..physics.state import EV_COLLISION, EV_CUSHION, EV_JAW, EV_POCKET

if TYPE_CHECKING:  # pragma: no cover
    from ..physics.run import Run, StrokePlayer
    from ..table import Table
    from .candidates import Candidate

__all__ = ["miss_reason", "ball_word", "cut_reason", "reason_groups"]


def ball_word(ids: Sequence[str], k: int) -> str:
    """``the cue ball`` or ``ball 7`` for the ball at index ``k``."""
    return "the cue ball" if ids[k] == "cue" else f"ball {ids[k]}"


def cut_reason(cut: float, limit: float) -> str:
    """Why a cut of ``cut`` degrees is not proposed against ``limit``."""
    if cut >= 90.0:
        return f"cannot be cut that way (the line needs a {cut:.0f} deg cut)"
    return f"cut too thin ({cut:.0f} deg, limit {limit:.0f})"


def miss_reason(player: StrokePlayer, table: Table, cand: Candidate, run: Run) -> str:
    """Why a simulated attempt did not pocket the planned ball, in the
    player's terms: what the cue ball touched first, whether the ball was
    knocked off line by another ball, rattled in the jaws, fell elsewhere or
    stopped short, and how far from the pocket it ended."""
    ids = player.ids
    cue, first, last = player.cue, cand.first, cand.last
    start, other = run.first_collision(cue)
    if other < 0:
        return _no_contact(player, cand, run)
    if other != first:
        return f"the cue ball hits ball {ids[other]} before ball {ids[first]}"
    if cand.kind == "combination":
        later = [int(h) for h in run.collisions_of(first) if int(h) > start]
        if not later:
            return f"ball {ids[first]} misses ball {ids[last]}"
        start = later[0]
        hit = run.other_ball(start, first)
        if hit != last:
            return f"ball {ids[first]} hits {ball_word(ids, hit)} before ball {ids[last]}"
    return _after_contact(player, table, cand, run, start)


def _no_contact(player: StrokePlayer, cand: Candidate, run: Run) -> str:
    ids, cue, first = player.ids, player.cue, cand.first
    gap = math.dist(run.final[cue, :2], player.pos[first]) - 2.0 * player.radius
    if len(run.cushion_events(cue)) == 0 and run.pocket_of(cue) < 0:
        return f"the cue ball stops {gap * 100.0:.0f} cm short of ball {ids[first]}"
    return f"the cue ball misses ball {ids[first]}"


def _after_contact(player: StrokePlayer, table: Table, cand: Candidate, run: Run,
                   start: int) -> str:
    """What the planned ball did after it was hit (event ``start``)."""
    ids, last = player.ids, cand.last
    pocket = table.pockets[cand.pocket].name
    mine = np.flatnonzero(((run.ball_a == last) | (run.ball_b == last))
                          & (np.arange(run.n_events) > start))
    for k in mine:
        kind = int(run.event_kind[k])
        if kind == EV_COLLISION:
            hit = run.other_ball(int(k), last)
            if hit != player.cue:
                return f"ball {ids[last]} is knocked off line by {ball_word(ids, hit)}"
        if kind == EV_POCKET:
            into = table.pockets[int(run.element[k])].name
            return f"ball {ids[last]} falls in {into} instead of {pocket}"
    if any(int(run.event_kind[k]) == EV_JAW for k in mine):
        return f"ball {ids[last]} rattles in the {pocket} jaws and stays out"
    away = math.dist(run.finish(last), table.pockets[cand.pocket].drop_centre) * 100.0
    if cand.kind == "bank":
        n_hit = len(run.cushion_events(last))
        if n_hit < len(cand.rails):
            return (f"ball {ids[last]} stops before it reaches the {cand.rails[n_hit]}, "
                    f"{away:.0f} cm from {pocket}")
    elif any(int(run.event_kind[k]) == EV_CUSHION for k in mine):
        return f"ball {ids[last]} misses {pocket} and hits the cushion, ending {away:.0f} cm away"
    return f"ball {ids[last]} stops short of {pocket}, {away:.0f} cm from it"


_RULE_CITED = re.compile(r"\(((?:WPA|WPBSA|UMB) [^()]*)\)$")


def _group(reason: str) -> str:
    """The group of a rejection reason, in a player's words."""
    cited = _RULE_CITED.search(reason)
    if cited:
        return f"against the {cited.group(1)} rules"
    if "blocked by" in reason:
        return "a ball in the way"
    if "cut" in reason or "pocket closed" in reason:
        return "an angle that cannot be played"
    if reason.startswith("scratches"):
        return "the cue ball scratches"
    if reason.startswith("window too narrow"):
        return "a window too narrow to play"
    return "missing in simulation"


def reason_groups(reasons: Sequence[str]) -> list[tuple[str, int]]:
    """The rejection reasons gathered into a few groups, most frequent first.

    Parameters
    ----------
    reasons : sequence of str
        The reasons (:attr:`shotplan.search.shots.Rejected.reason`).

    Returns
    -------
    list of (str, int)
        Each group's words (``a ball in the way``, ``against the WPA 9-ball
        rules``...) and how many reasons fall in it.
    """
    counts: dict[str, int] = {}
    for r in reasons:
        g = _group(r)
        counts[g] = counts.get(g, 0) + 1
    return sorted(counts.items(), key=lambda kv: (-kv[1], kv[0]))
