"""The view's actions: one small function per action, found by name.

A button, a widget, a key of :data:`shotplan.view.keys.KEY_MAP` or a test
calls :meth:`shotplan.view.app.App.do` with an action's name and value;
:data:`ACTIONS` maps the name to its function, which is given the view and
the value.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING, Any

from ..errors import LayoutError
from ..games import games_for
from .playback import Playback

if TYPE_CHECKING:
    from .app import App

__all__ = ["ACTIONS"]


def _open(app: App, value: Any) -> None:
    if app.state.dirty:
        app.confirm_drop()
    else:
        app.file_dialog("open")


def _dialog(purpose: str) -> Callable[[App, Any], None]:
    def act(app: App, value: Any) -> None:
        app.file_dialog(purpose)
    return act


def _save(app: App, value: Any) -> None:
    app.save_file()


def _undo(app: App, value: Any) -> None:
    app.say("undone" if app.state.undo() else "nothing to undo")


def _redo(app: App, value: Any) -> None:
    app.say("redone" if app.state.redo() else "nothing to redo")


def _rack(game: str) -> Callable[[App, Any], None]:
    def act(app: App, value: Any) -> None:
        try:
            app.state.set_rack(game)
        except LayoutError as e:  # a set-up for another kind of table
            app.say(str(e).removeprefix("rack: "))
    return act


def _game(app: App, value: Any) -> None:
    try:
        changed = app.state.set_game(str(value))
    except LayoutError as e:
        app.say(str(e))
        return
    if changed:
        game = app.state.layout.game
        app.say("no rules: any ball into any pocket" if game == "any"
                else f"playing {game}: only legal shots are proposed")


def _next_game(app: App, value: Any) -> None:
    games = games_for(app.state.layout.table.game)
    now = app.state.layout.game
    _game(app, games[(games.index(now) + 1) % len(games)] if now in games else games[0])


def _atlas(app: App, value: Any) -> None:
    app.atlas.toggle()
    app.say("atlas shown" if app.atlas.on else "atlas hidden")


def _clear(app: App, value: Any) -> None:
    app.state.clear()


def _add(app: App, value: Any) -> None:
    b = app.state.add_ball()
    app.say(f"added ball {b}: drag it into place")


def _remove(app: App, value: Any) -> None:
    b = app.state.selection
    if b is None:
        app.say("select a ball first (click it), then remove it")
        return
    app.state.remove_ball(b)
    app.say(f"removed ball {b}")


def _help(app: App, value: Any) -> None:
    app.help_visible = not app.help_visible


def _play(app: App, value: Any) -> None:
    if app.predictor.outcome is None:
        app.say("nothing to play: aim the cue first")
    else:
        app.playback.toggle(app.predictor.duration)


def _reset(app: App, value: Any) -> None:
    app.playback.reset()


def _scrub(app: App, value: Any) -> None:
    app.playback.scrub(float(value), app.predictor.duration)


def _rate(app: App, value: Any) -> None:
    app.playback.rate = float(value)


def _next_rate(app: App, value: Any) -> None:
    rates = [r for _, r in Playback.RATES]
    k = rates.index(app.playback.rate) if app.playback.rate in rates else -1
    app.playback.rate = rates[(k + 1) % len(rates)]
    app.say(f"playback: {dict((r, n) for n, r in Playback.RATES)[app.playback.rate]}")


def _speed(app: App, value: Any) -> None:
    app.state.set_speed(float(value), coalesce="speed")


def _speed_step(app: App, value: Any) -> None:
    st = app.state
    st.set_speed(st.settings.speed_mps + float(value), coalesce="speed-key")


def _turn(app: App, value: Any) -> None:
    if not app.state.nudge_aim(float(value)):
        app.say("aim first: the arrows turn the cue")


def _elevation(app: App, value: Any) -> None:
    app.state.set_elevation(float(value), coalesce="elevation")


def _tip(app: App, value: Any) -> None:
    app.state.set_tip(float(value[0]), float(value[1]), coalesce="tip")


def _tip_preset(app: App, value: Any) -> None:
    app.tip_preset(str(value))


def _proposal(app: App, value: Any) -> None:
    app.state.choose_proposal(int(value))
    app.say(app.state.proposals[int(value)].describe())


def _next_proposal(app: App, value: Any) -> None:
    st = app.state
    if not st.proposals:
        app.say("no proposed shot (yet)")
        return
    k = 0 if st.chosen is None else (st.chosen + int(value)) % len(st.proposals)
    app.do("proposal", k)


def _next_ball(app: App, value: Any) -> None:
    app.cycle_ball(int(value))


def _next_pocket(app: App, value: Any) -> None:
    app.cycle_pocket(int(value))


def _escape(app: App, value: Any) -> None:
    if app.playback.active:
        app.playback.reset()
    else:
        app.state.select(None)


def _recovery(app: App, value: Any) -> None:
    app.answer_recovery(value == "restore")


def _quit(app: App, value: Any) -> None:
    app.running = False


ACTIONS: dict[str, Callable[[App, Any], None]] = {
    "open": _open, "save-as": _dialog("save-as"), "export": _dialog("export"), "save": _save,
    "undo": _undo, "redo": _redo, "rack-8": _rack("8-ball"), "rack-9": _rack("9-ball"),
    "rack-snooker": _rack("snooker"), "rack-carom": _rack("carom"), "atlas": _atlas,
    "game": _game, "next-game": _next_game,
    "clear": _clear, "add": _add, "remove": _remove, "help": _help, "play": _play,
    "reset": _reset, "scrub": _scrub, "rate": _rate, "next-rate": _next_rate, "speed": _speed,
    "speed-step": _speed_step, "turn": _turn, "elevation": _elevation, "tip": _tip,
    "tip-preset": _tip_preset, "proposal": _proposal, "next-proposal": _next_proposal,
    "next-ball": _next_ball, "next-pocket": _next_pocket, "escape": _escape,
    "recovery": _recovery, "quit": _quit,
}
"""Every action of the view by name: a function of the view and the action's value."""
