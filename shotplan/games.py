"""The games' rules: which ball the cue ball may meet first, which balls may
fall, and whether a stroke scores.

Only what decides whether a single stroke is legal and scores is modelled
(fouls, the ball on); game flow (innings, scores, re-spotting, free balls)
is not. The rules followed:

* ``any``: no rule; any first contact, any ball into any pocket, the cue ball
  not pocketed (shotplan's behaviour before games).
* ``9-ball`` and ``10-ball`` (WPA *Rules of Play*, 9-ball and 10-ball): the
  cue ball's first contact must be the lowest-numbered ball on the table;
  pocketing the cue ball is a foul; any object ball pocketed on a legal
  stroke counts. (10-ball is a call-shot game: a planned shot names its
  ball and pocket, which is what the search proposes.)
* ``8-ball`` (WPA *Rules of Play*, 8-ball): with a group (``solids`` 1-7 or
  ``stripes`` 9-15) the first contact must be a ball of the group, or the 8
  once the group is off the table; a ball of the group (or then the 8) must
  fall and no ball of the other group nor the 8 before its time; on an open
  table (no group), the first contact may be any ball but the 8, and the 8
  must not fall. Pocketing the cue ball is a foul.
* ``snooker`` (WPBSA *Official Rules of the Games of Snooker and English
  Billiards*, sections 3 and 4): while reds remain the ball on is a red
  (any red; several may fall together), or, after a red, the colour named
  with ``on``; once the reds are gone the colours are on in order yellow,
  green, brown, blue, pink, black. The first contact must be a ball on, and
  only balls on may fall; pocketing the cue ball is a foul.
* ``three-cushion`` and ``straight-rail`` (UMB *Sport Regulations*, carom):
  a point is the cue ball meeting both other balls (in three-cushion, with at
  least three cushions before the second); there are no pockets to judge.
  The carom search uses :func:`carom_scores`.

Balls are named as in layouts: pool balls by their numbers (``"1"`` ...
``"15"``), snooker reds ``red``, ``red1`` ... and colours by their names,
carom balls as the layout names them; the cue ball is ``cue``.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from .errors import InputError, LayoutError

__all__ = ["check_game", "games_for", "GAMES", "POOL_GAMES", "CAROM_GAMES", "SNOOKER_COLOURS",
           "GROUPS", "Rules", "Verdict", "carom_scores"]

GAMES = ("any", "8-ball", "9-ball", "10-ball", "snooker", "three-cushion", "straight-rail")
"""Every game a layout, drill station or command may name."""
POOL_GAMES = ("8-ball", "9-ball", "10-ball")
"""Games on a pool table."""
CAROM_GAMES = ("three-cushion", "straight-rail")
"""Games on a carom table (no pockets)."""
SNOOKER_COLOURS = ("yellow", "green", "brown", "blue", "pink", "black")
"""The colours in the order they are on once the reds are gone (WPBSA)."""
GROUPS = ("solids", "stripes")
"""The 8-ball groups."""


def games_for(table_game: str) -> tuple[str, ...]:
    """The games played on a kind of table, ``any`` first.

    Parameters
    ----------
    table_game : str
        The table's kind (:attr:`shotplan.equipment.TableSpec.game`):
        ``pool``, ``snooker`` or ``carom``.

    Returns
    -------
    tuple of str
        Names from :data:`GAMES`.
    """
    own = {"pool": POOL_GAMES, "snooker": ("snooker",), "carom": CAROM_GAMES}
    return ("any",) + own.get(table_game, ())


def check_game(value: object, where: str = "game") -> str:
    """A game's name, checked (None means ``any``).

    Parameters
    ----------
    value : object
        What a file or option gave.
    where : str, optional
        Starts the message.

    Returns
    -------
    str
        One of :data:`GAMES`.

    Raises
    ------
    LayoutError
        If it is not a game's name (one line, with the valid names).
    """
    if value is None:
        return "any"
    if not isinstance(value, str) or value not in GAMES:
        shown = repr(value)[:60]
        raise LayoutError(f"{where}: {shown} is not a game, must be one of {', '.join(GAMES)}")
    return value


def _number(ball: str) -> int | None:
    return int(ball) if ball.isdigit() else None


def _is_red(ball: str) -> bool:
    return ball == "red" or (ball.startswith("red") and ball[3:].isdigit())


@dataclass(frozen=True, slots=True)
class Verdict:
    """What the rules say of one stroke."""

    legal: bool
    """No foul."""
    scores: bool
    """Legal, and it did what the game rewards (a ball on pocketed, a carom)."""
    reason: str
    """Why not, in words naming the rule; empty when it scores."""


@dataclass(frozen=True)
class Rules:
    """One game's rules for the balls of a layout.

    Parameters
    ----------
    game : str
        One of :data:`GAMES`.
    balls : sequence of str
        Every ball on the table (the cue ball included).
    group : str, optional
        8-ball: ``solids`` or ``stripes`` (None: an open table).
    on : str, optional
        Snooker: the colour named after a red.
    """

    game: str
    balls: tuple[str, ...]
    group: str | None = None
    on: str | None = None

    def __post_init__(self) -> None:
        if self.game not in GAMES:
            raise InputError(f"game {self.game!r} is not a game shotplan knows, must be one of "
                             f"{', '.join(GAMES)}")
        object.__setattr__(self, "balls", tuple(self.balls))
        if self.group is not None and (self.game != "8-ball" or self.group not in GROUPS):
            raise InputError(f"--group {self.group!r}: only for 8-ball, must be one of "
                             f"{', '.join(GROUPS)}")
        if self.on is not None:
            if self.game != "snooker" or self.on not in SNOOKER_COLOURS:
                raise InputError(f"--on {self.on!r}: only for snooker, must be one of "
                                 f"{', '.join(SNOOKER_COLOURS)}")
            if self.on not in self.balls:
                raise InputError(f"--on {self.on}: the {self.on} is not on the table")
        if self.game in POOL_GAMES:
            bad = [b for b in self.object_balls if _number(b) is None]
            if bad:
                raise InputError(f"{self.game}: ball {bad[0]!r} is not a numbered pool ball, "
                                 "the pool games need balls named by their numbers")
        if self.game == "snooker":
            bad = [b for b in self.object_balls if not _is_red(b) and b not in SNOOKER_COLOURS]
            if bad:
                raise InputError(f"snooker: ball {bad[0]!r} is neither a red (red, red1 ...) "
                                 f"nor a colour ({', '.join(SNOOKER_COLOURS)})")

    @property
    def object_balls(self) -> tuple[str, ...]:
        """Every ball but the cue ball."""
        return tuple(b for b in self.balls if b != "cue")

    @property
    def is_carom(self) -> bool:
        """A carom game: scored by contacts, not by pockets."""
        return self.game in CAROM_GAMES

    # ---------------------------------------------------------------- the ball on
    def first_allowed(self) -> tuple[str, ...]:
        """The balls the cue ball may meet first.

        Returns
        -------
        tuple of str
            Ball ids (every object ball for ``any`` and the carom games).
        """
        obj = self.object_balls
        if self.game in ("9-ball", "10-ball"):
            nums = [b for b in obj if _number(b) is not None]
            return (min(nums, key=lambda b: int(b)),) if nums else ()
        if self.game == "8-ball":
            return self._eight_ball_targets()
        if self.game == "snooker":
            return self._snooker_on()
        return obj

    def pot_allowed(self) -> tuple[str, ...]:
        """The balls that may fall on a legal stroke (and score).

        Returns
        -------
        tuple of str
            Ball ids.
        """
        obj = self.object_balls
        if self.game in ("9-ball", "10-ball", "any"):
            return obj
        if self.game == "8-ball":
            return self._eight_ball_targets()
        if self.game == "snooker":
            return self._snooker_on()
        return ()

    def _eight_ball_targets(self) -> tuple[str, ...]:
        obj = self.object_balls
        if self.group is None:
            return tuple(b for b in obj if b != "8")
        lo, hi = (1, 7) if self.group == "solids" else (9, 15)
        mine = tuple(b for b in obj if lo <= int(b) <= hi)
        if mine:
            return mine
        return ("8",) if "8" in obj else ()

    def _snooker_on(self) -> tuple[str, ...]:
        obj = self.object_balls
        if self.on is not None:
            return (self.on,)
        reds = tuple(b for b in obj if _is_red(b))
        if reds:
            return reds
        for colour in SNOOKER_COLOURS:
            if colour in obj:
                return (colour,)
        return ()

    def describe_on(self) -> str:
        """The ball on, in words.

        Returns
        -------
        str
            ``the 3 (the lowest-numbered ball)``, ``a red``, ``the blue`` ...
        """
        first = self.first_allowed()
        if self.game in ("9-ball", "10-ball") and first:
            return f"the {first[0]} (the lowest-numbered ball on the table)"
        if self.game == "snooker" and first:
            return "a red" if _is_red(first[0]) else f"the {first[0]}"
        if self.game == "8-ball":
            if self.group is None:
                return "any ball but the 8 (open table)"
            return "the 8" if first == ("8",) else f"a ball of the {self.group}"
        return "any ball"

    # ---------------------------------------------------------------- judging
    def judge(self, first_contact: str | None, pocketed: Sequence[str],
              target: str | None = None) -> Verdict:
        """Judge one pocket-game stroke from what happened in it.

        Parameters
        ----------
        first_contact : str or None
            The ball the cue ball met first (None: none).
        pocketed : sequence of str
            Every ball that fell (the cue ball included, as ``cue``).
        target : str, optional
            The ball the shot was planned to pocket: it must be among those
            that fell for the stroke to score.

        Returns
        -------
        Verdict
            Legal, scores, and the rule that failed.
        """
        rule = self.source
        if "cue" in pocketed:
            return Verdict(False, False, f"scratch: the cue ball is pocketed ({rule})")
        if first_contact is None:
            return Verdict(False, False, f"the cue ball meets no ball ({rule})")
        if first_contact not in self.first_allowed():
            return Verdict(False, False, f"first contact on {first_contact}, the rules need "
                                         f"{self.describe_on()} ({rule})")
        allowed = set(self.pot_allowed())
        wrong = [b for b in pocketed if b not in allowed]
        if self.game == "8-ball" and "8" in wrong:
            return Verdict(False, False, f"the 8 falls before its time: loss of game ({rule})")
        if wrong:
            return Verdict(False, False, f"{wrong[0]} falls, not a ball on ({rule})")
        if not pocketed:
            return Verdict(True, False, "no ball falls")
        if target is not None and target not in pocketed:
            return Verdict(True, False, f"{target} does not fall")
        return Verdict(True, True, "")

    @property
    def source(self) -> str:
        """The rules' name as messages cite it (``WPA 9-ball``...)."""
        return {"any": "no game rules", "8-ball": "WPA 8-ball", "9-ball": "WPA 9-ball",
                "10-ball": "WPA 10-ball", "snooker": "WPBSA snooker",
                "three-cushion": "UMB three-cushion",
                "straight-rail": "UMB straight rail"}[self.game]


def carom_scores(game: str, contacts: Sequence[str], cushions_before_second: int) -> Verdict:
    """Judge a carom stroke (UMB): the cue ball meets both other balls; in
    three-cushion it meets at least three cushions before the second ball.

    Parameters
    ----------
    game : str
        ``three-cushion`` or ``straight-rail``.
    contacts : sequence of str
        The other balls the cue ball met, in order (repeats allowed).
    cushions_before_second : int
        Cushions the cue ball met before it first met the second ball.

    Returns
    -------
    Verdict
        Whether the stroke scores, and why not.
    """
    if game not in CAROM_GAMES:
        raise InputError(f"{game!r} is not a carom game, must be one of {', '.join(CAROM_GAMES)}")
    met = list(dict.fromkeys(contacts))
    if len(met) < 2:
        return Verdict(True, False, "the cue ball does not meet both balls")
    if game == "three-cushion" and cushions_before_second < 3:
        return Verdict(True, False, f"{cushions_before_second} cushion(s) before the second "
                                    "ball, three-cushion needs three (UMB)")
    return Verdict(True, True, "")
