"""What every command module of :mod:`shotplan.cli` shares.

The exit codes, the one error line, the strict JSON printer, the file types a
figure is written as, and the loading of tables, physics and layouts that
several commands do the same way. Command modules import these public names
and nothing private from each other.
"""

from __future__ import annotations

import sys
from collections.abc import Mapping, Sequence
from typing import TYPE_CHECKING

from ..errors import InputError, show_path
from ..files.jsonout import emit as emit_json
from ..render import FIGURE_SUFFIXES

if TYPE_CHECKING:
    from ..equipment import TableSpec
    from ..layout import Layout
    from ..physics import Physics

__all__ = [
    "EXIT_OK",
    "EXIT_ERROR",
    "FIGURE_SUFFIXES",
    "emit_json",
    "error_line",
    "plural",
    "load_table",
    "load_physics",
    "require_playable",
]

EXIT_OK = 0
"""Exit code of a command that did its work."""

EXIT_ERROR = 2
"""Exit code for every fault the user can cause (bad input, usage)."""


def error_line(message: str) -> None:
    """Print ``shotplan: error: <message>`` as exactly one line on stderr.

    Parameters
    ----------
    message : str
        What went wrong; line breaks inside it become spaces.
    """
    flat = " ".join(message.splitlines()) if message else "unknown error"
    print(f"shotplan: error: {flat}", file=sys.stderr, flush=True)


def plural(n: int, word: str) -> str:
    """``n`` and ``word``, with an ``s`` unless ``n`` is 1.

    Parameters
    ----------
    n : int
        How many.
    word : str
        The singular noun.

    Returns
    -------
    str
        For example ``"1 shot"`` or ``"3 shots"``.
    """
    return f"{n} {word}{'' if n == 1 else 's'}"


def load_table(value: str) -> TableSpec:
    """The table of a ``--table`` option.

    Parameters
    ----------
    value : str
        A preset name, a table profile file, a bare table object
        ``{"preset": ..., measured values...}`` or a layout (its table); see
        :func:`shotplan.layout.load_table`.

    Returns
    -------
    TableSpec
        The table.
    """
    from ..layout import load_table as load

    return load(value)


def load_physics(spec: TableSpec, path: str | None, settings: Sequence[str] = ()) -> Physics:
    """The physics of a sweep: the table's, then a file's values, then ``--set``.

    Parameters
    ----------
    spec : TableSpec
        The table whose physics is the start.
    path : str or None
        A JSON file: an object of physics fields, or a layout whose
        ``physics`` object is used.
    settings : sequence of str
        ``KEY=VALUE`` texts of ``--set``, applied last (``ball_friction``
        also takes ``none``).

    Returns
    -------
    Physics
        The physics to simulate with.
    """
    from ..files.read import read_json_file
    from ..layout import FORMAT
    from ..physics import Physics

    phys = Physics.for_table(spec)
    if path is not None:
        data = read_json_file(path)
        where = path
        if isinstance(data, Mapping) and ("balls" in data or data.get("format") == FORMAT):
            if not isinstance(data.get("physics"), Mapping):
                raise InputError(f"{path}: physics: the layout has no physics object to use")
            data = data["physics"]
            where = f"{path}: physics"
        phys = Physics.from_dict(data, where=where, base=phys)
    changes = _settings(settings)
    if changes:
        phys = Physics.from_dict(changes, where="--set", base=phys)
    return phys


def _settings(settings: Sequence[str]) -> dict[str, float | None]:
    """The ``--set KEY=VALUE`` texts as physics fields."""
    changes: dict[str, float | None] = {}
    for item in settings:
        key, sep, text = item.partition("=")
        key = key.strip()
        if not sep or not key:
            raise InputError(f"--set: {item!r} is not KEY=VALUE (for example "
                             "ball_restitution=1.0)")
        text = text.strip()
        if text.lower() in ("none", "null") and key == "ball_friction":
            changes[key] = None
            continue
        try:
            changes[key] = float(text)
        except ValueError:
            raise InputError(f"--set {key}: {text!r} is not a number") from None
    return changes


def require_playable(layout: Layout, name: str) -> None:
    """Refuse a layout with problems before simulating it.

    Parameters
    ----------
    layout : Layout
        A layout read with ``strict=True`` (its structure is sound).
    name : str
        The file it came from, for the message.

    Raises
    ------
    InputError
        The first problem, how many more there are, and the command that
        lists them all.
    """
    probs = layout.problems()
    if probs:
        extra = f" (and {len(probs) - 1} more)" if len(probs) > 1 else ""
        raise InputError(f"{show_path(name)}: {probs[0]}{extra}; 'shotplan check "
                         f"{show_path(name)}' lists them")
