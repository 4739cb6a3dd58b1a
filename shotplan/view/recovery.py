"""Recovery files: unsaved work, written after every edit, offered back at a later start.

Each running table view is a *session* with a recovery file of its own in
the recovery folder, ``$XDG_STATE_HOME/shotplan/`` (by default
``~/.local/state/shotplan/``: the XDG base directory specification's place
for state that should survive a restart)::

    session-20250131-201502-4242-9f3c.json   the work of one session
    session-20250131-201502-4242-9f3c.lock   held (fcntl.flock) while it runs

A moment after each edit the session writes its layout (with its stroke), the
stroke settings and the aim to its own file (atomically, through
:mod:`shotplan.files.write`, so a crash mid-write leaves the previous copy whole),
and removes the file once the work is saved. It never writes, offers or
removes another session's file while that session runs: a file is *left
over* only when no process holds its lock (the view ended without saving,
by a crash or otherwise). A later start claims a left-over file by taking its
lock, so two views starting at once never offer the same work; Restore makes
the work the new session's own, Discard removes it, and a question closed
unanswered moves it to ``kept-<time>.json``, which is never offered again.
A left-over file that cannot be read is renamed ``<name>.bad`` (or
``<name>.bad.2``, ``.3``... if that is taken), never overwritten.

A recovery file::

    {"format": "shotplan-recovery", "version": 1, "written": "2025-01-31T20:15:02Z",
     "source": "drills/cut.json", "layout": {...a layout file object...},
     "settings": {"speed_mps": 2.0, "side": 0.0, "height": -0.2, "elevation_deg": 0.0},
     "aim": {"pocket": {"ball": "2", "pocket": "foot-left", "kind": "direct",
                        "rails": [], "balls": ["2"]}}}

``aim`` may also be ``{"free": {"direction_deg": 12.5}}`` or ``null``. The
``source`` is checked like any path the user types before it becomes the
Save target (:func:`checked_source`).
"""

from __future__ import annotations

import contextlib
import datetime
import json
import os
import secrets
import stat
import time
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import IO, Any

from ..errors import LayoutError, ShotplanError
from ..files.read import read_json_file
from ..files.write import atomic_write_text, check_output_path
from ..layout import Layout
from ..search import KINDS
from .state import FreeAim, PocketAim, Snapshot, StrokeSettings, ViewState

__all__ = ["FORMAT", "VERSION", "Recovered", "Session", "Claim", "default_recovery_dir",
           "default_recovery_path", "left_over", "claim", "write_recovery", "read_recovery",
           "discard_recovery", "set_aside", "checked_source"]

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


def default_recovery_dir() -> Path:
    """``$XDG_STATE_HOME/shotplan``, or ``~/.local/state/shotplan`` if unset (or not absolute).

    Returns
    -------
    Path
    """
    base = os.environ.get("XDG_STATE_HOME", "")
    root = Path(base) if base and Path(base).is_absolute() else Path.home() / ".local" / "state"
    return root / "shotplan"


def default_recovery_path() -> Path:
    """The single recovery file of earlier versions (``recovery.json`` in the
    recovery folder): still offered back if one is left, never written.

    Returns
    -------
    Path
    """
    return default_recovery_dir() / LEGACY_NAME


LEGACY_NAME = "recovery.json"
_SESSION_GLOB = "session-*.json"

try:  # POSIX: an advisory lock, dropped by the system when its holder dies
    import fcntl as _fcntl
except ImportError:  # pragma: no cover - Windows: the pid written in the lock file decides
    _fcntl = None  # type: ignore[assignment]


def _lock_path(recovery_file: Path) -> Path:
    return recovery_file.with_suffix(".lock")


def _pid_alive(pid: int) -> bool:  # pragma: no cover - used only without fcntl
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except OSError:
        return True
    return True


def _try_lock(lock_path: Path) -> IO[str] | None:
    """Open ``lock_path`` (made if missing) and take its lock without waiting;
    the open file (holding the lock) or ``None`` if a running view holds it."""
    fh = open(lock_path, "a+", encoding="utf-8")  # noqa: SIM115 - held for the session's life
    try:
        if _fcntl is not None:
            try:
                _fcntl.flock(fh.fileno(), _fcntl.LOCK_EX | _fcntl.LOCK_NB)
            except OSError:
                fh.close()
                return None
            # The file may have been removed and made again between the open
            # and the lock: the lock counts only on the file now at that name.
            try:
                same = os.fstat(fh.fileno()).st_ino == os.stat(lock_path).st_ino
            except OSError:
                same = False
            if not same:
                fh.close()
                return None
        else:  # pragma: no cover
            fh.seek(0)
            text = fh.read().strip()
            if text.isdigit() and int(text) != os.getpid() and _pid_alive(int(text)):
                fh.close()
                return None
        fh.seek(0)
        fh.truncate()
        fh.write(f"{os.getpid()}\n")
        fh.flush()
        return fh
    except BaseException:
        fh.close()
        raise


class Session:
    """This view's own recovery file, locked while the view runs.

    Nothing is made on disk until the first :meth:`write`; :meth:`close`
    drops the lock (the file, if unsaved work is in it, is then left over
    for a later start).

    Parameters
    ----------
    folder
        The recovery folder.
    """

    def __init__(self, folder: str | os.PathLike[str]):
        self.folder = Path(folder)
        stamp = time.strftime("%Y%m%d-%H%M%S")
        self.name = f"session-{stamp}-{os.getpid()}-{secrets.token_hex(2)}"
        self.path = self.folder / f"{self.name}.json"
        """This session's recovery file."""
        self._lock: IO[str] | None = None

    @property
    def lock_path(self) -> Path:
        """The file whose lock says this session runs."""
        return _lock_path(self.path)

    def _hold(self) -> None:
        if self._lock is None:
            self.folder.mkdir(parents=True, exist_ok=True)
            self._lock = _try_lock(self.lock_path)
            if self._lock is None:  # pragma: no cover - a random name taken by a running view
                raise LayoutError(f"{self.lock_path}: held by another view")

    def write(self, state: ViewState) -> None:
        """Write the state's unsaved work to this session's file.

        Parameters
        ----------
        state : ViewState
            The view's model.
        """
        self._hold()
        write_recovery(self.path, state)

    def discard(self) -> None:
        """Remove this session's file (all is saved)."""
        discard_recovery(self.path)

    def close(self) -> None:
        """Drop the lock; a file with unsaved work stays for a later start."""
        if self._lock is None:
            return
        if not self.path.exists():
            with contextlib.suppress(OSError):
                self.lock_path.unlink()
        self._lock.close()
        self._lock = None

    def __repr__(self) -> str:
        return f"Session({str(self.folder)!r})  # {self.name}"


@dataclass
class Claim:
    """A left-over recovery file this session has claimed (holds its lock)."""

    path: Path
    """The left-over file."""
    lock: IO[str]
    """Its lock file, open and locked."""

    def release(self, remove: bool = False) -> None:
        """Let the file go; with ``remove``, delete it (and its lock file) first.

        Parameters
        ----------
        remove : bool
            Delete the file first.
        """
        if remove:
            discard_recovery(self.path)
            with contextlib.suppress(OSError):
                _lock_path(self.path).unlink()
        self.lock.close()


def left_over(folder: str | os.PathLike[str], own: Path | None = None) -> list[Path]:
    """Recovery files in ``folder`` that might be left over (regular files,
    oldest first, not ``own``); whether their view still runs is for
    :func:`claim` to find out.

    Parameters
    ----------
    folder : str or path-like
        The recovery folder.
    own : Path, optional
        This view's own file, left out.

    Returns
    -------
    list of Path
        Oldest first.
    """
    root = Path(folder)
    if not root.is_dir():
        return []
    found = []
    for p in [root / LEGACY_NAME, *root.glob(_SESSION_GLOB)]:
        if own is not None and p == own:
            continue
        try:
            st = p.lstat()
        except OSError:
            continue
        if stat.S_ISREG(st.st_mode):  # a FIFO or a link there is never opened
            found.append((st.st_mtime, p.name, p))
    return [p for _, _, p in sorted(found)]


def claim(path: Path) -> Claim | None:
    """Take the lock of a left-over recovery file: ``None`` if its view still
    runs (or another start claimed it first, or it has gone meanwhile).

    Parameters
    ----------
    path : Path
        A left-over recovery file.

    Returns
    -------
    Claim or None
    """
    try:
        lock = _try_lock(_lock_path(path))
    except OSError:
        return None
    if lock is None:
        return None
    if not path.exists():  # saved and removed meanwhile by its own view
        lock.close()
        return None
    return Claim(path, lock)


def checked_source(source: str | None) -> tuple[str | None, str]:
    """The ``source`` of a recovery file as a Save target, checked like a path
    the user types: (the path, ``""``) if usable, else (``None``, why not).

    Parameters
    ----------
    source : str, optional
        The file the work came from.

    Returns
    -------
    (str or None, str)
    """
    if source is None:
        return None, ""
    if "\x00" in source or not source.strip():
        return None, f"{source!r} is not a usable file name"
    try:
        check_output_path(source, (".json",))
    except (ShotplanError, OSError, ValueError) as e:
        return None, str(e)
    return source, ""


def _aim_to_json(aim: Any) -> Any:
    if isinstance(aim, FreeAim):
        return {"free": {"direction_deg": aim.direction_deg}}
    if isinstance(aim, PocketAim):
        return {"pocket": {"ball": aim.ball, "pocket": aim.pocket, "kind": aim.kind,
                           "rails": list(aim.rails), "balls": list(aim.sequence)}}
    return None


def write_recovery(path: str | os.PathLike[str], state: ViewState) -> None:
    """Write the state's unsaved work to ``path`` atomically (its folder is made if missing).

    Parameters
    ----------
    path : str or path-like
        The recovery file.
    state : ViewState
        The view's model.
    """
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
    cannot be read.

    Parameters
    ----------
    path : str or path-like
        The recovery file.

    Returns
    -------
    Recovered or None

    Raises
    ------
    LayoutError
        A file that is not a recovery file of this version, or a bad field.
    """
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
    """Remove the recovery file (nothing happens if there is none).

    Parameters
    ----------
    path : str or path-like
        The recovery file.
    """
    with contextlib.suppress(FileNotFoundError):
        Path(path).unlink()


def set_aside(path: str | os.PathLike[str], tag: str = "bad") -> Path | None:
    """Rename a recovery file to ``<name>.<tag>``, or ``<name>.<tag>.2``,
    ``.3``... if that is taken: kept, never deleted and never over another
    (so nothing is lost); returns the new name, or ``None`` if that failed.

    Parameters
    ----------
    path : str or path-like
        The recovery file.
    tag : str
        The suffix of the new name.

    Returns
    -------
    Path or None
    """
    p = Path(path)
    for k in range(1, 10000):
        new = p.with_name(f"{p.name}.{tag}" + (f".{k}" if k > 1 else ""))
        try:
            os.link(p, new)  # fails if the name is taken: never replaces a file
        except FileExistsError:
            continue
        except OSError:
            if new.exists() or os.path.lexists(new):
                continue
            try:  # no hard links here: a rename to a name just seen free
                os.rename(p, new)
            except OSError:
                return None
            return new
        with contextlib.suppress(OSError):
            p.unlink()
        return new
    return None

