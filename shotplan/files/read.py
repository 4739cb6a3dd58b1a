"""Reading input files: bounded, and JSON strictly, one clear line per fault.

Every input file is read by :func:`read_limited`: only regular files (a
FIFO or a device is refused without being opened, so it cannot block), up to
a size limit and, if asked, a line limit. Every JSON file shotplan reads
(layouts, drills, table profiles, study plans, recovery copies) goes through
:func:`read_json_file` or :func:`parse_json`: the text must be UTF-8, and
the parser refuses what no field can mean (NaN, Infinity, numbers beyond
:data:`MAX_NUMBER` in size, a key given twice), naming the field.
:func:`check_format` and :func:`check_version` check a file's header;
:func:`value_kind` and :func:`show_value` word the values messages quote.

Every fault raises :class:`~shotplan.errors.LayoutError` (the error of the
files a user writes by hand) with a message that starts with the file name.
"""

from __future__ import annotations

import json
import math
import os
import re
import stat
from collections.abc import Mapping
from pathlib import Path
from typing import Any, TypeAlias

from ..errors import SHOWN_CHARS, LayoutError, quoted, shorten, show_path

__all__ = [
    "JSONValue",
    "LAYOUT_FORMAT",
    "MAX_JSON_BYTES",
    "MAX_NUMBER",
    "file_kind",
    "read_limited",
    "read_json_file",
    "parse_json",
    "check_numbers",
    "check_format",
    "check_version",
    "field_path",
    "value_kind",
    "show_value",
]

JSONValue: TypeAlias = Any
"""A value parsed from JSON: ``dict``, ``list``, ``str``, ``int``, ``float``,
``bool`` or ``None``, nested. Kept as ``Any`` for the type checker: a parsed
file is checked field by field at run time (that is what this module is
for), and a recursive union would force a cast at every field read."""

LAYOUT_FORMAT = "shotplan-layout"
"""The ``format`` of a layout file; an empty file is told it should hold one
unless the caller names another format (most hand-written files are layouts)."""

MAX_JSON_BYTES = 10 * 1024 * 1024
"""Largest JSON file read by default (10 MB): shotplan's files are a few
kilobytes, so anything near this is not one of them."""

MAX_NUMBER = 1e9
"""Largest magnitude of any number in a JSON file. No field means anything
near it, and it keeps ``float(int)`` from overflowing further in."""

_MAX_DIGITS = 12
"""Integers with more digits than this are refused before ``int()`` sees
them (Python refuses more than 4,300 digits, and 1e9 has 10)."""


class _BadNumber:
    """Stands for a number the file should not hold (NaN, Infinity, 1e999);
    kept as its text so the message can quote it with its field."""

    __slots__ = ("text",)

    def __init__(self, text: str) -> None:
        self.text = text

    def __repr__(self) -> str:
        return self.text


class _Object(dict[str, Any]):
    """A parsed JSON object that had a key twice (``duplicate`` is the key)."""

    duplicate: str = ""


def _parse_float(text: str) -> float | _BadNumber:
    value = float(text)
    return value if math.isfinite(value) and abs(value) <= MAX_NUMBER else _BadNumber(text)


def _parse_int(text: str) -> int | _BadNumber:
    if len(text.lstrip("-")) > _MAX_DIGITS:
        return _BadNumber(text if len(text) <= 20 else text[:12] + "...")
    value = int(text)
    return value if abs(value) <= MAX_NUMBER else _BadNumber(text)


def _object(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for key, value in pairs:
        if key in out:
            dup = _Object(out)
            dup.duplicate = key
            out = dup
        out[key] = value
    return out


def file_kind(mode: int) -> str:
    """What a file that is not a regular file is, as messages name it.

    Parameters
    ----------
    mode : int
        ``st_mode`` from :func:`os.stat`.

    Returns
    -------
    str
        ``a folder``, ``a FIFO (named pipe)``, ``a device``, ``a socket``, or
        ``not a regular file``.
    """
    if stat.S_ISDIR(mode):
        return "a folder"
    if stat.S_ISFIFO(mode):
        return "a FIFO (named pipe)"
    if stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        return "a device"
    if stat.S_ISSOCK(mode):
        return "a socket"
    return "not a regular file"


def read_limited(path: str | os.PathLike[str], max_bytes: int, error: type[Exception],
                 noun: str = "file", plural: str = "files", *,
                 max_lines: int | None = None) -> bytes:
    """The bytes of an input file: the one reader of every input file.

    Every way it can fail becomes one ``error`` line starting with the file
    name: missing, unreadable, a folder (``is a folder, not a <noun>``), not
    a regular file (a FIFO or a device: refused without being opened, so
    nothing blocks), larger than ``max_bytes``, or (if given) more than
    ``max_lines`` lines.

    Parameters
    ----------
    path : str or os.PathLike
        The file.
    max_bytes : int
        Largest size accepted.
    error : type of Exception
        The exception raised (called with the message).
    noun, plural : str, optional
        What the file is, in messages (``measurement file (.csv)``).
    max_lines : int, optional
        Most lines accepted (no limit if ``None``).

    Returns
    -------
    bytes
        The file's content.

    Raises
    ------
    Exception
        ``error(message)``, as above.
    """
    shown = show_path(path)
    p = Path(path)
    size_mb = f"{max_bytes / (1024 * 1024):g} MB"
    try:
        st = p.stat()
    except (FileNotFoundError, NotADirectoryError):
        raise error(f"{shown}: no such file") from None
    except OSError as e:
        raise error(f"{shown}: cannot read: {e.strerror or e}") from None
    except ValueError as e:  # a NUL byte in the name
        raise error(f"{shown}: not a usable file name ({e})") from None
    if stat.S_ISDIR(st.st_mode):
        raise error(f"{shown}: is a folder, not a {noun}")
    if not stat.S_ISREG(st.st_mode):
        raise error(f"{shown}: is {file_kind(st.st_mode)}, not a {noun}; only regular files "
                    "are read")
    if st.st_size > max_bytes:
        raise error(f"{shown}: the file is too large ({st.st_size / 1e6:.1f} MB), "
                    f"{plural} are at most {size_mb}")
    try:
        # O_NONBLOCK: if the name was swapped for a FIFO since the stat, the
        # open returns at once instead of waiting for a writer.
        fd = os.open(p, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_BINARY", 0))
    except OSError as e:
        raise error(f"{shown}: cannot read: {e.strerror or e}") from None
    with open(fd, "rb") as fh:
        if not stat.S_ISREG(os.fstat(fd).st_mode):
            raise error(f"{shown}: is {file_kind(os.fstat(fd).st_mode)}, not a {noun}; only "
                        "regular files are read")
        try:
            data = fh.read(max_bytes + 1)
        except OSError as e:
            raise error(f"{shown}: cannot read: {e.strerror or e}") from None
    if len(data) > max_bytes:
        raise error(f"{shown}: the file is too large, {plural} are at most {size_mb}")
    if max_lines is not None:
        lines = data.count(b"\n") + (1 if data and not data.endswith(b"\n") else 0)
        if lines > max_lines:
            raise error(f"{shown}: {lines} lines is too many, {plural} hold at most "
                        f"{max_lines} lines")
    return data


def read_json_file(path: str | os.PathLike[str], max_bytes: int = MAX_JSON_BYTES, *,
                   fmt: str = LAYOUT_FORMAT) -> JSONValue:
    """Read and parse a JSON file strictly.

    Parameters
    ----------
    path : str or os.PathLike
        The file; messages name it as :func:`shotplan.errors.show_path` shows it.
    max_bytes : int, optional
        Largest file accepted (default :data:`MAX_JSON_BYTES`).
    fmt : str, optional
        The ``format`` an empty file is told to hold (default: a layout's).

    Returns
    -------
    JSONValue
        The parsed value (see :func:`parse_json`).

    Raises
    ------
    LayoutError
        One line starting with the file name: missing, unreadable, not a
        regular file, too large, not UTF-8, not valid JSON, or holding a
        value no field can mean.
    """
    name = show_path(path)
    data = read_limited(path, max_bytes, LayoutError)
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        raise LayoutError(f"{name}: not UTF-8 text (byte 0x{data[e.start]:02x} at offset "
                          f"{e.start}); save the file as UTF-8") from None
    return parse_json(text, name, fmt=fmt)


def parse_json(text: str, where: str, *, fmt: str = LAYOUT_FORMAT) -> JSONValue:
    """Parse JSON text strictly.

    Parameters
    ----------
    text : str
        The JSON text.
    where : str
        Starts every message (a file name, an option).
    fmt : str, optional
        The ``format`` an empty text is told to hold (default: a layout's).

    Returns
    -------
    JSONValue
        The parsed value; objects are ``dict`` in file order.

    Raises
    ------
    LayoutError
        If the text is empty, not valid JSON, nested too deeply, or holds NaN,
        Infinity, a number beyond :data:`MAX_NUMBER` in size or a repeated
        key (the message names the field).
    """
    if not text.strip():
        raise LayoutError(f"{where}: the file is empty, expected a JSON object "
                          f"{{\"format\": {fmt!r}, ...}}")
    try:
        data = json.loads(
            text,
            parse_constant=_BadNumber,
            parse_float=_parse_float,
            parse_int=_parse_int,
            object_pairs_hook=_object,
        )
    except json.JSONDecodeError as e:
        raise LayoutError(f"{where}: line {e.lineno}, column {e.colno}: "
                          f"not valid JSON ({e.msg})") from None
    except RecursionError:
        raise LayoutError(f"{where}: nested too deeply to be a layout") from None
    check_numbers(data, where)
    return data


def _number_fault(value: object) -> str | None:
    """What is wrong with ``value`` as a number in a file, or ``None``."""
    if isinstance(value, _BadNumber):
        what = ("is not a number" if value.text.lstrip("-") in ("NaN", "Infinity")
                else "is too large")
        return f"{value.text} {what}, numbers must be finite and at most 1e9 in size"
    if isinstance(value, float) and (not math.isfinite(value) or abs(value) > MAX_NUMBER):
        return f"{value!r} is not a usable number, numbers must be finite and at most 1e9 in size"
    if isinstance(value, int) and not isinstance(value, bool) and abs(value) > MAX_NUMBER:
        # str() of a huge int is slow, and refused past 4300 digits
        text = (str(value) if abs(value) < 10**20
                else f"an integer near 1e{int(abs(value).bit_length() * math.log10(2))}")
        return f"{text} is too large, numbers must be at most 1e9 in size"
    return None


def check_numbers(data: JSONValue, where: str) -> None:
    """Refuse repeated keys and numbers no field can mean, naming the field.

    Iterative, so any depth the JSON parser accepted can be walked.

    Parameters
    ----------
    data : JSONValue
        A value from :func:`parse_json`, or built in code (mappings, lists
        and tuples are walked).
    where : str
        Starts every message.

    Raises
    ------
    LayoutError
        On the first repeated key, NaN, Infinity or number beyond
        :data:`MAX_NUMBER` in size, with its field (``balls.3[0]``).
    """
    stack: list[tuple[Any, str]] = [(data, "")]
    while stack:
        value, path = stack.pop()
        label = f"{where}: {path}" if path else where
        if isinstance(value, _Object) and value.duplicate:
            raise LayoutError(f"{label}: the field {quoted(value.duplicate)} appears twice")
        fault = _number_fault(value)
        if fault is not None:
            raise LayoutError(f"{label}: {fault}")
        if isinstance(value, Mapping):
            for k, v in value.items():
                stack.append((v, field_path(path, k)))
        elif isinstance(value, list | tuple):
            for i, v in enumerate(value):
                stack.append((v, f"{path}[{i}]"))


def check_format(data: Mapping[str, JSONValue], where: str, fmt: str = LAYOUT_FORMAT,
                 kind: str = "layout") -> None:
    """Check a file's ``format`` field.

    Parameters
    ----------
    data : Mapping
        The file's top-level object.
    where : str
        Starts every message (the file name).
    fmt : str, optional
        The value the field must have (default: a layout's).
    kind : str, optional
        The kind of file, as messages name it (layout, drill, table profile).

    Raises
    ------
    LayoutError
        If the field is missing or has another value.
    """
    if "format" not in data:
        raise LayoutError(f"{where}: format: missing, a {kind} file has "
                          f"\"format\": \"{fmt}\"")
    if data["format"] != fmt:
        raise LayoutError(f"{where}: format: {show_value(data['format'])} is not a {kind} file "
                          f"format, must be \"{fmt}\"")


def check_version(data: Mapping[str, JSONValue], where: str, version: int = 1,
                  kind: str = "layout") -> None:
    """Check a file's ``version`` field.

    Parameters
    ----------
    data : Mapping
        The file's top-level object.
    where : str
        Starts every message (the file name).
    version : int, optional
        The one version this shotplan reads (default 1).
    kind : str, optional
        The kind of file, as messages name it.

    Raises
    ------
    LayoutError
        If the field is missing, not an integer, or another version.
    """
    if "version" not in data:
        raise LayoutError(f"{where}: version: missing, must be {version}")
    v = data["version"]
    if isinstance(v, bool) or not isinstance(v, int):
        raise LayoutError(f"{where}: version: {show_value(v)} is not a version number, "
                          f"must be {version}")
    if v != version:
        raise LayoutError(f"{where}: version: {v} is not supported, this shotplan reads "
                          f"{kind} version {version}")


_PLAIN_KEY = re.compile(r"[A-Za-z0-9_+-]+")


def field_path(path: str, key: object) -> str:
    """The name of field ``key`` inside ``path``, as messages write it.

    Parameters
    ----------
    path : str
        The enclosing field (``""`` at the top level).
    key : object
        The key (shown as ``str(key)``).

    Returns
    -------
    str
        ``path.key``, or ``path["odd key"]`` when the key would not read
        plainly (a space, a dot, a newline...), so a message stays one
        unambiguous line.
    """
    text = str(key)
    if _PLAIN_KEY.fullmatch(text) and len(text) <= SHOWN_CHARS:
        return f"{path}.{text}" if path else text
    return f"{path}[{shorten(json.dumps(text))}]"


def value_kind(value: object) -> str:
    """The JSON kind of ``value`` as messages name it.

    Parameters
    ----------
    value : object
        A parsed value.

    Returns
    -------
    str
        ``true/false``, ``null``, ``an object``, ``a list``, ``a string``,
        ``a number``, or the Python type's name for anything else.
    """
    if isinstance(value, bool):
        return "true/false"
    if value is None:
        return "null"
    if isinstance(value, Mapping):
        return "an object"
    if isinstance(value, list | tuple):
        return "a list"
    if isinstance(value, str):
        return "a string"
    if isinstance(value, int | float):
        return "a number"
    return type(value).__name__


def show_value(value: object, limit: int | None = None) -> str:
    """A value as it looks in the file, cut short for a message.

    Parameters
    ----------
    value : object
        A parsed value (lists and objects beyond 100 items are cut first).
    limit : int, optional
        Most characters shown (default: :func:`shotplan.errors.shorten`'s).

    Returns
    -------
    str
        JSON text of the value (its ``repr`` if it is not JSON), shortened.
    """
    if isinstance(value, Mapping) and len(value) > 100:
        value = dict(list(value.items())[:100])
    elif isinstance(value, list | tuple) and len(value) > 100:
        value = type(value)(list(value)[:100])
    try:
        text = json.dumps(value, ensure_ascii=False, allow_nan=True, default=repr)
    except (TypeError, ValueError):
        text = repr(value)
    return shorten(text) if limit is None else shorten(text, limit)
