"""shotplan: plan shots on billiard tables.

The public names are handed on from their modules; see each module's
docstring for details. They load on first use, so that ``import shotplan``
(and the command line, which starts with it) does not pay for numpy, the
engine or a drawing library it does not need.
"""

from __future__ import annotations

from importlib import import_module as _import_module
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from .equipment import PRESETS, TableSpec
    from .errors import InputError, LayoutError, PhysicsError, ShotplanError, StrokeError
    from .layout import Layout, Problem, load_layout, save_layout
    from .physics import Outcome, Physics, simulate
    from .stroke import Stroke
    from .table import Table

__all__ = [
    "__version__",
    "PRESETS",
    "TableSpec",
    "Table",
    "Layout",
    "Problem",
    "load_layout",
    "save_layout",
    "Stroke",
    "Physics",
    "Outcome",
    "simulate",
    "ShotplanError",
    "LayoutError",
    "StrokeError",
    "PhysicsError",
    "InputError",
]

_HOMES: dict[str, str] = {
    "PRESETS": ".equipment", "TableSpec": ".equipment",
    "ShotplanError": ".errors", "LayoutError": ".errors", "StrokeError": ".errors",
    "PhysicsError": ".errors", "InputError": ".errors",
    "Layout": ".layout", "Problem": ".layout", "load_layout": ".layout",
    "save_layout": ".layout",
    "Physics": ".physics", "Outcome": ".physics", "simulate": ".physics",
    "Stroke": ".stroke", "Table": ".table",
}
"""Each public name and the module it comes from."""


def _version() -> str:
    from importlib import metadata

    try:  # the version is written once, in pyproject.toml
        return metadata.version("shotplan")
    except metadata.PackageNotFoundError:  # run from a source tree never installed
        return "0+unknown"


def __getattr__(name: str) -> object:
    if name == "__version__":
        value: object = _version()
    elif name in _HOMES:
        value = getattr(_import_module(_HOMES[name], __name__), name)
    else:
        raise AttributeError(f"module 'shotplan' has no attribute {name!r}")
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return sorted(set(globals()) | set(__all__))
