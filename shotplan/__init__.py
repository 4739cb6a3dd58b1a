"""shotplan: plan shots on billiard tables.

The public names are handed on from their modules; see each module's
docstring for details.
"""

from importlib import metadata as _metadata

from .equipment import PRESETS, TableSpec
from .errors import InputError, LayoutError, PhysicsError, ShotplanError, StrokeError
from .layout import Layout, Problem, load_layout, save_layout
from .physics import Physics
from .stroke import Stroke
from .table import Table

try:  # the version is written once, in pyproject.toml
    __version__ = _metadata.version("shotplan")
except _metadata.PackageNotFoundError:  # run from a source tree never installed
    __version__ = "0+unknown"


def __getattr__(name: str) -> object:
    # The engine (numba) loads on first use, so that importing shotplan and
    # the commands that do not simulate stay fast.
    if name in ("simulate", "Outcome"):
        from . import physics

        return getattr(physics, name)
    raise AttributeError(f"module 'shotplan' has no attribute {name!r}")

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
