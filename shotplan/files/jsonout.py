"""The one JSON printer of every ``--json``: strict JSON, never NaN or infinity.

JSON has no NaN and no infinity, and a reader that gets ``NaN`` from a
``--json`` cannot parse it. Every command's document goes through
:func:`dumps`, which refuses a non-finite number with a message that names
where it is (``[0].throw_deg``): inside shotplan a NaN is a bug, and a value
that does not apply is ``None`` (printed ``null``) from the start.

Sweeps that tabulate a quantity which may not exist at some grid points (a
cut too thin for any window, a fit value that could not be estimated) say so
explicitly with :func:`missing_as_null`, which maps NaN to ``None`` once, at
the edge, in the one place that knows what the gap means.
"""

from __future__ import annotations

import json
import math
import sys
from collections.abc import Mapping
from typing import TextIO

from .read import JSONValue

__all__ = ["NonFiniteError", "strict", "dumps", "emit", "missing_as_null"]


class NonFiniteError(ValueError):
    """A NaN or an infinity reached the JSON printer: a bug, named by its path."""


def _key(path: str, key: object) -> str:
    return f"{path}.{key}" if path else str(key)


def strict(value: object, path: str = "") -> JSONValue:
    """``value`` as plain JSON types, refusing NaN and infinity.

    Numpy scalars and arrays, tuples and sets become numbers and lists
    (sets sorted by ``repr``); mapping keys become strings.

    Parameters
    ----------
    value : object
        What to print.
    path : str, optional
        Where ``value`` sits in the document (starts the paths in messages).

    Returns
    -------
    JSONValue
        The same value in ``dict``, ``list``, ``str``, ``int``, ``float``,
        ``bool`` and ``None``.

    Raises
    ------
    NonFiniteError
        At the first NaN or infinity, naming its path (``[0].throw_deg``).
    TypeError
        For a value JSON cannot hold, naming its path.
    """
    if value is None or isinstance(value, bool | str):
        return value
    if isinstance(value, int):
        return int(value)
    if isinstance(value, float):
        if not math.isfinite(value):
            raise NonFiniteError(f"{value!r} at {path or 'the top level'}")
        return float(value)
    if isinstance(value, Mapping):
        return {str(k): strict(v, _key(path, k)) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [strict(v, f"{path}[{i}]") for i, v in enumerate(value)]
    if isinstance(value, set | frozenset):
        return [strict(v, f"{path}[{i}]") for i, v in enumerate(sorted(value, key=repr))]
    tolist = getattr(value, "tolist", None)  # numpy scalars and arrays
    if callable(tolist):
        return strict(tolist(), path)
    raise TypeError(f"{type(value).__name__} at {path or 'the top level'} is not JSON")


def dumps(value: object, indent: int | None = 2) -> str:
    """Strict JSON text of ``value`` (see :func:`strict`).

    Parameters
    ----------
    value : object
        What to print.
    indent : int or None, optional
        Indentation (2 by default; ``None``: one line).

    Returns
    -------
    str
        The JSON text (UTF-8 characters kept, no escapes).
    """
    return json.dumps(strict(value), indent=indent, ensure_ascii=False, allow_nan=False)


def emit(value: object, stream: TextIO | None = None) -> None:
    """Print ``value`` as strict JSON on ``stream`` (stdout by default).

    The whole text is built before anything is printed, so a refused value
    leaves no half document on stdout.

    Parameters
    ----------
    value : object
        What to print (see :func:`strict`).
    stream : TextIO, optional
        Where to print; ``sys.stdout`` by default.
    """
    text = dumps(value)
    print(text, file=stream if stream is not None else sys.stdout)


def missing_as_null(value: object) -> JSONValue:
    """``value`` with every NaN or infinity replaced by ``None``.

    Only for tabulated results where a gap has a stated meaning (a window
    that does not exist at that cut, a standard error that cannot be
    estimated); the caller's docs say what ``null`` means there.

    Parameters
    ----------
    value : object
        A float, a mapping, a list or tuple, or a numpy value, nested.

    Returns
    -------
    JSONValue
        The same structure, gaps as ``None`` (mappings stay mappings, tuples
        become lists, numpy values plain numbers and lists).
    """
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, Mapping):
        return {k: missing_as_null(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [missing_as_null(v) for v in value]
    tolist = getattr(value, "tolist", None)
    if callable(tolist) and not isinstance(value, str):
        return missing_as_null(tolist())
    return value
