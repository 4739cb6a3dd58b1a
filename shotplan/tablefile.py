"""How a table is written in files: a preset name, or a preset with measured values.

A layout's ``table`` field and a table profile (``shotplan cushion fit -o``)
hold a table as a preset name or as ``{"preset": NAME, ...measured
values...}`` with keys of :data:`shotplan.equipment.OVERRIDE_KEYS`.
:func:`table_from_object` reads the object, :func:`table_to_object` writes
it, :func:`table_from_profile` reads a table profile's object.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping

from .equipment import PRESETS, TableSpec
from .errors import LayoutError
from .files.read import JSONValue, check_format, check_version, show_value, value_kind

__all__ = ["PROFILE_FORMAT", "PROFILE_VERSION", "table_from_object", "table_to_object",
           "table_from_profile"]

PROFILE_FORMAT = "shotplan-table-profile"
"""The value of a table profile file's ``format`` field (``shotplan cushion fit -o``)."""

PROFILE_VERSION = 1
"""The table profile version this shotplan reads."""


def table_from_object(value: Mapping[str, JSONValue], where: str) -> TableSpec:
    """The table of ``{"preset": NAME, ...measured values...}``.

    Parameters
    ----------
    value : Mapping
        The object.
    where : str
        The field it is, starting every message (``club.json: table``).

    Returns
    -------
    TableSpec
        The preset with the measured values.

    Raises
    ------
    LayoutError
        If ``preset`` is missing or not a preset, the object names a
        ``profile``, or a measured value is refused by
        :meth:`TableSpec.with_overrides`.
    """
    presets = ", ".join(PRESETS)
    if "profile" in value:
        raise LayoutError(f"{where}: profile: a table profile cannot name another profile")
    if "preset" not in value:
        raise LayoutError(f"{where}.preset: missing, must be one of {presets}")
    name = value["preset"]
    if not isinstance(name, str):
        raise LayoutError(f"{where}.preset: {show_value(name)} is not a preset name, must be one "
                          f"of {presets}")
    try:
        spec = TableSpec.preset(name)
    except LayoutError as e:
        raise LayoutError(f"{where}.preset: {e}") from None
    return spec.with_overrides({k: v for k, v in value.items() if k != "preset"}, where=where)


def table_from_profile(data: Mapping[str, JSONValue], label: str) -> TableSpec:
    """The table of a table profile file's object.

    Parameters
    ----------
    data : Mapping
        The file's top-level object.
    label : str
        Starts every message (the file name).

    Returns
    -------
    TableSpec
        The table its ``table`` object describes.

    Raises
    ------
    LayoutError
        For a wrong ``format`` or ``version``, a missing ``table`` object, or
        a table :func:`table_from_object` refuses.
    """
    check_format(data, label, PROFILE_FORMAT, "table profile")
    check_version(data, label, PROFILE_VERSION, "table profile")
    table = data.get("table")
    if not isinstance(table, Mapping):
        raise LayoutError(f"{label}: table: {'missing' if 'table' not in data else value_kind(table)}"
                          ", a table profile holds {\"preset\": ..., measured values...}")
    return table_from_object(table, f"{label}: table")


def table_to_object(spec: TableSpec) -> str | dict[str, JSONValue]:
    """How ``spec`` is written in a file.

    Files hold a preset plus overrides; this checks that they rebuild the very
    spec, or the file would silently describe another table.

    Parameters
    ----------
    spec : TableSpec
        The table.

    Returns
    -------
    str or dict
        The preset's name, or ``{"preset": NAME, ...overrides...}``.

    Raises
    ------
    LayoutError
        If ``spec`` is not a preset with measured overrides.
    """
    overrides = dict(spec.overrides)
    base = PRESETS.get(spec.name)
    rebuilt = base.with_overrides(overrides) if base is not None else None
    if rebuilt is None or rebuilt != dataclasses.replace(spec, overrides=rebuilt.overrides):
        raise LayoutError(f"table {spec.name!r} cannot be written: it is not a preset with "
                          "measured overrides (build it with TableSpec.preset(...)."
                          "with_overrides(...))")
    if not overrides:
        return spec.name
    return {"preset": spec.name, **overrides}
