"""What the view says in words: the title, the status line, the aim box.

Plain functions of the view's state (:class:`~shotplan.view.state.ViewState`)
and prediction (:class:`~shotplan.view.predict.Predictor`), so a test reads
them without a window. The aim box is written in pygame_gui's HTML subset:
text from the layout goes through :func:`escape_markup` first.
"""

from __future__ import annotations

from pathlib import Path

from ..aim import overlap_word
from ..games import CAROM_GAMES, carom_scores
from ..physics.state import EventKind
from ..table import Table
from .predict import Predictor
from .state import FreeAim, PocketAim, ViewState
from .transform import to_diamonds

__all__ = ["escape_markup", "title_text", "pointer_words", "aim_html", "WARN"]

WARN = "#e5533d"
"""Colour of a warning in the aim box and the problem notes."""


def escape_markup(text: str) -> str:
    """Text for pygame_gui's HTML subset.

    Parameters
    ----------
    text : str
        Plain text (a file name, a message).

    Returns
    -------
    str
        The same text with ``&``, ``<`` and ``>`` escaped.
    """
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


def title_text(state: ViewState) -> str:
    """The layout's title (or file name), and whether it is unsaved.

    Parameters
    ----------
    state : ViewState
        The view's model.

    Returns
    -------
    str
        For example ``Cut to the corner (unsaved)``.
    """
    name = state.layout.title or (Path(state.path).name if state.path else "new layout")
    return name + (" (unsaved)" if state.dirty else "")


def pointer_words(x: float, y: float, table: Table) -> str:
    """Where the pointer is, in mm and in diamonds.

    Parameters
    ----------
    x, y : float
        The point on the table, m.
    table : Table
        The table (its playing length and width).

    Returns
    -------
    str
        One line for the status bar; empty off the table (past the rail's
        outer edge, as it is drawn).
    """
    outer = table.spec.cushion.rubber_width_m + table.spec.cushion.rail_width_m
    if not (-outer <= x <= table.length + outer and -outer <= y <= table.width + outer):
        return ""
    da, dc = to_diamonds(x, y, table.length, table.width)
    return (f"x {x * 1000:6.0f} mm   y {y * 1000:5.0f} mm   "
            f"\u00b7   {da:4.2f} diamonds along, {dc:4.2f} across")


def _aim_line(state: ViewState) -> str | None:
    aim = state.aim
    d = state.direction_deg
    if isinstance(aim, PocketAim):
        via = f" off the {' then '.join(aim.rails)}" if aim.rails else ""
        cue = f", cue at {d:.2f}\u00b0" if d is not None else ""
        return (f"<b>{'-'.join(aim.sequence)}</b> into <b>{aim.pocket}</b> "
                f"({aim.kind}{via}){cue}")
    if isinstance(aim, FreeAim):
        return f"Free aim, cue at {aim.direction_deg:.2f}\u00b0"
    return None


def _window_line(state: ViewState, pred: Predictor) -> str | None:
    w = pred.window
    if w is not None:
        inside = pred.in_window(state)
        where = "" if isinstance(state.aim, PocketAim) else (
            " \u00b7 aim inside" if inside else f" \u00b7 <font color='{WARN}'>aim outside</font>")
        return f"Window {w.window_deg:.2f}\u00b0 ({w.window_mm:.0f} mm){where}"
    if pred.window_note and isinstance(state.aim, PocketAim):
        return f"<font color='{WARN}'>No window: {escape_markup(pred.window_note)}</font>"
    return None


def _carom_line(pred: Predictor, game: str) -> str:
    """Whether the stroke scores a carom, and what the cue ball met (UMB's
    rule, as the carom search judges it)."""
    assert pred.outcome is not None
    met: list[str] = []
    cushions = 0
    for e in pred.outcome.events:
        if e.kind == EventKind.COLLISION and "cue" in e.balls:
            met.append(next(b for b in e.balls if b != "cue"))
            if len(set(met)) == 2:
                break
        elif e.kind == EventKind.CUSHION and e.balls[:1] == ("cue",):
            cushions += 1
    verdict = carom_scores(game, met, cushions)
    order = list(dict.fromkeys(met))
    if verdict.scores:
        return (f"Scores: {order[0]}, then {order[1]} after {cushions} "
                f"cushion{'s' if cushions != 1 else ''}")
    return f"<font color='{WARN}'>No point: {escape_markup(verdict.reason)}</font>"


def _outcome_lines(pred: Predictor, game: str = "any") -> list[str]:
    out = pred.outcome
    if out is None:
        return [f"<font color='{WARN}'>{escape_markup(pred.message)}</font>"] if pred.message \
            else []
    if game in CAROM_GAMES:
        return [_carom_line(pred, game)]
    lines = []
    potted = out.pocketed()
    if "cue" in potted:
        lines.append(f"<font color='{WARN}'>Scratch: the cue ball falls</font>")
    balls = [b for b in potted if b != "cue"]
    if balls:
        lines.append("Pockets " + ", ".join(f"{b} ({potted[b]})" for b in balls))
    elif "cue" not in potted:
        lines.append("No ball pocketed")
    return lines


def aim_html(state: ViewState, pred: Predictor) -> str:
    """What the aim box says: the aim, the cut, the window, the outcome.

    Parameters
    ----------
    state : ViewState
        The view's model (the aim, the problems of the layout).
    pred : Predictor
        The prediction (the aim's geometry, the window, the outcome).

    Returns
    -------
    str
        pygame_gui HTML, lines joined by ``<br>``.
    """
    if state.problems():
        n = len(state.problems())
        return (f"<font color='{WARN}'>The layout has {n} problem{'s' if n > 1 else ''} "
                "(balls outlined in red).</font> Drag a ball to a free place to fix it.")
    if state.aim is None:
        return ("Not aimed. Click an object ball, then a pocket; or drag on the cloth; "
                "or take a shot from the list below.")
    lines = [line for line in (_aim_line(state),) if line is not None]
    g = pred.geometry
    if g is not None:
        lines.append(f"Cut {g.cut_deg:.1f}\u00b0, ball-hit {g.fraction:.2f} "
                     f"({overlap_word(g.fraction)})")
    window = _window_line(state, pred)
    if window is not None:
        lines.append(window)
    lines += _outcome_lines(pred, state.layout.game)
    return "<br>".join(lines)
