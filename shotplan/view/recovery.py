"""The recovery file: unsaved work, written after every edit, offered back at the next start.

The table view writes the layout (with its stroke), the stroke settings and
the aim to one JSON file a moment after each edit (atomically, through
:mod:`shotplan.fileio`, so a crash mid-write leaves the previous copy whole),
and removes it once the work is saved. If the view ends without saving, by a
crash or otherwise, the file is still there at the next start and the view
asks whether to restore it.

The file lives in ``$XDG_STATE_HOME/shotplan/recovery.json`` (by default
``~/.local/state/shotplan/recovery.json``: the XDG base directory
specification's place for state that should survive a restart)::

    {"format": "shotplan-recovery", "version": 1, "written": "2025-01-31T20:15:02Z",
     "source": "drills/cut.json", "layout": {...a layout file object...},
     "settings": {"speed_mps": 2.0, "side": 0.0, "height": -0.2, "elevation_deg": 0.0},
     "aim": {"pocket": {"ball": "2", "pocket": "foot-left", "kind": "direct",
                        "rails": [], "balls": ["2"]}}}

``aim`` may also be ``{"free": {"direction_deg": 12.5}}`` or ``null``.
"""

from __future__ import annotations

import contextlib
import datetime
import json
import os
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..errors import LayoutError
from ..fileio import atomic_write_text
from ..layout import Layout, read_json_file
from ..search import KINDS
from .state import FreeAim, PocketAim, Snapshot, StrokeSettings, ViewState

__all__ = ["FORMAT", "VERSION", "Recovered", "default_recovery_path", "write_recovery",
           "read_recovery", "discard_recovery", "set_aside"]

FORMAT = "shotplan-recovery"
"""The value of a recovery file's ``format`` field."""

VERSION = 1
"""The recovery file version written and read."""


@dataclass(frozen=True, slots=True)
class Recovered:
    """What a recovery file holds."""

    snapshot: Snapshot
    """The layout, settings and aim."""
    source: str | None
    """The file the work came from, or ``None`` for a new layout."""
    written: str
    """When it was written (UTC, ISO 8601)."""


def default_recovery_path() -> Path:
    """``$XDG_STATE_HOME/shotplan/recovery.json``, or under ``~/.local/state`` if unset."""
    base = os.environ.get("XDG_STATE_HOME", "")
    root = Path(base) if base and Path(base).is_absolute() else Path.home() / ".local" / "state"
    return root / "shotplan" / "recovery.json"


def _aim_to_json(aim: Any) -> Any:
    if isinstance(aim, FreeAim):
        return {"free": {"direction_deg": aim.direction_deg}}
    if isinstance(aim, PocketAim):
        return {"pocket": {"ball": aim.ball, "pocket": aim.pocket, "kind": aim.kind,
                           "rails": list(aim.rails), "balls": list(aim.sequence)}}
    return None


def write_recovery(path: str | os.PathLike[str], state: ViewState) -> None:
    """Write the state's unsaved work to ``path`` atomically (its folder is made if missing)."""
    p = Path(path)
    p.parent.mkdir(parents=True, exist_ok=True)
    doc = {
        "format": FORMAT,
        "version": VERSION,
        "written": datetime.datetime.now(datetime.UTC).strftime("%Y-%m-%dT%H:%M:%SZ"),
        "source": state.path,
        "layout": state.layout_to_save().to_dict(),
        "settings": {"speed_mps": state.settings.speed_mps, "side": state.settings.side,
                     "height": state.settings.height,
                     "elevation_deg": state.settings.elevation_deg},
        "aim": _aim_to_json(state.aim),
    }
    atomic_write_text(p, json.dumps(doc, indent=2, ensure_ascii=False, allow_nan=False) + "\n")


def read_recovery(path: str | os.PathLike[str]) -> Recovered | None:
    """The recovery file's content, ``None`` if there is none; raises
    :class:`~shotplan.errors.LayoutError` (one line, naming the field) if it
    cannot be read."""
    p = Path(path)
    if not p.exists():
        return None
    name = str(p)
    data = read_json_file(p)
    if not isinstance(data, Mapping):
        raise LayoutError(f"{name}: the top level must be a JSON object")
    if data.get("format") != FORMAT:
        raise LayoutError(f"{name}: format: {data.get('format')!r} is not {FORMAT!r}")
    if data.get("version") != VERSION:
        raise LayoutError(f"{name}: version: {data.get('version')!r} is not supported, "
                          f"must be {VERSION}")
    layout = Layout.from_dict(data.get("layout"), f"{name}: layout")
    settings = _settings(data.get("settings"), f"{name}: settings")
    aim = _aim(data.get("aim"), f"{name}: aim")
    source = data.get("source")
    if source is not None and not isinstance(source, str):
        raise LayoutError(f"{name}: source: {source!r} is not a file name or null")
    written = data.get("written", "")
    return Recovered(Snapshot(layout, settings, aim), source, str(written))


def _number(d: Mapping[str, Any], key: str, where: str, lo: float, hi: float) -> float:
    v = d.get(key)
    if isinstance(v, bool) or not isinstance(v, int | float) or not lo <= v <= hi:
        raise LayoutError(f"{where}.{key}: {v!r} is not a number between {lo} and {hi}")
    return float(v)


def _settings(d: Any, where: str) -> StrokeSettings:
    if not isinstance(d, Mapping):
        raise LayoutError(f"{where}: must be an object with speed_mps, side, height, elevation_deg")
    return StrokeSettings(_number(d, "speed_mps", where, 0.01, 15.0),
                          _number(d, "side", where, -1.0, 1.0),
                          _number(d, "height", where, -1.0, 1.0),
                          _number(d, "elevation_deg", where, 0.0, 60.0))


def _aim(d: Any, where: str) -> FreeAim | PocketAim | None:
    if d is None:
        return None
    if isinstance(d, Mapping) and set(d) == {"free"} and isinstance(d["free"], Mapping):
        return FreeAim(_number(d["free"], "direction_deg", f"{where}.free", -1e6, 1e6))
    if isinstance(d, Mapping) and set(d) == {"pocket"} and isinstance(d["pocket"], Mapping):
        a = d["pocket"]
        for key in ("ball", "pocket", "kind"):
            if not isinstance(a.get(key), str):
                raise LayoutError(f"{where}.pocket.{key}: {a.get(key)!r} is not text")
        if a["kind"] not in KINDS:
            raise LayoutError(f"{where}.pocket.kind: {a['kind']!r} must be one of {', '.join(KINDS)}")
        rails, balls = a.get("rails", []), a.get("balls", [a["ball"]])
        for key, seq in (("rails", rails), ("balls", balls)):
            if not isinstance(seq, list) or not all(isinstance(x, str) for x in seq):
                raise LayoutError(f"{where}.pocket.{key}: {seq!r} is not a list of names")
        return PocketAim(a["ball"], a["pocket"], a["kind"], tuple(rails), tuple(balls))
    raise LayoutError(f"{where}: {d!r} is not an aim, must be null, {{\"free\": ...}} or "
                      "{\"pocket\": ...}")


def discard_recovery(path: str | os.PathLike[str]) -> None:
    """Remove the recovery file (nothing happens if there is none)."""
    with contextlib.suppress(FileNotFoundError):
        Path(path).unlink()


def set_aside(path: str | os.PathLike[str]) -> Path | None:
    """Rename an unreadable recovery file to ``*.bad`` (kept, never deleted,
    so nothing is lost); returns the new name, or ``None`` if that failed."""
    p = Path(path)
    bad = p.with_suffix(p.suffix + ".bad")
    try:
        os.replace(p, bad)
    except OSError:
        return None
    return bad

