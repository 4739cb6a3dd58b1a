"""A light drawing panel on a figure: the few calls of matplotlib's ``Axes``
that the drill sheet's panels use, drawn as the figure's own artists.

A matplotlib ``Axes`` builds its two axes, ticks, spines and grid lines when
it is made, even when it is hidden; on a drill sheet the six small panels of
a page (aim, tip, speed, rates, tally, key) cost more to make than what they
draw (``benchmarks/bench_sheet.py``). A :class:`Panel` maps its data
coordinates onto a box of the page, in inches, by one affine transform that
follows its limits (as ``Axes`` does with ``set_xlim``, ``set_ylim`` and an
equal aspect, the box shrunk about its centre), and adds each line, patch
and text to the figure with that transform. Nothing is clipped to the box.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import TYPE_CHECKING, Any

from matplotlib.lines import Line2D
from matplotlib.text import Annotation, Text
from matplotlib.transforms import Affine2D, Transform

if TYPE_CHECKING:  # pragma: no cover
    from matplotlib.figure import Figure
    from matplotlib.patches import Patch

__all__ = ["Panel"]


class Panel:
    """A box of a figure with data limits, drawn into like an ``Axes``.

    Parameters
    ----------
    fig : Figure
        The page.
    box_in : (float, float, float, float)
        Left, bottom, width and height of the box on the page, inches.
    """

    def __init__(self, fig: Figure, box_in: tuple[float, float, float, float]) -> None:
        self.fig = fig
        self.box_in = box_in
        self._xlim = (0.0, box_in[2])
        self._ylim = (0.0, box_in[3])
        self._equal = False
        self._affine = Affine2D()
        self.transData: Transform = self._affine + fig.dpi_scale_trans
        """Data coordinates to display coordinates (follows the limits)."""
        self._update()

    # ---------------------------------------------------------------- limits
    def _update(self) -> None:
        x, y, w, h = self.box_in
        (x0, x1), (y0, y1) = self._xlim, self._ylim
        sx, sy = w / (x1 - x0), h / (y1 - y0)
        if self._equal:
            sx = sy = min(sx, sy)
        # The box shrunk about its centre to the data's aspect (Axes' anchor "C").
        left = x + (w - sx * (x1 - x0)) / 2.0
        bottom = y + (h - sy * (y1 - y0)) / 2.0
        self._affine.clear().translate(-x0, -y0).scale(sx, sy).translate(left, bottom)

    def set_xlim(self, left: float, right: float) -> None:
        """Data limits across."""
        self._xlim = (float(left), float(right))
        self._update()

    def set_ylim(self, bottom: float, top: float) -> None:
        """Data limits up."""
        self._ylim = (float(bottom), float(top))
        self._update()

    def get_xlim(self) -> tuple[float, float]:
        """Data limits across."""
        return self._xlim

    def get_ylim(self) -> tuple[float, float]:
        """Data limits up."""
        return self._ylim

    def set_aspect(self, aspect: str) -> None:
        """``"equal"``: one data unit is as long across as up."""
        if aspect != "equal":
            raise ValueError(f"a panel's aspect is 'equal' or its box's, not {aspect!r}")
        self._equal = True
        self._update()

    # ---------------------------------------------------------------- artists
    def text(self, x: float, y: float, s: str, **kwargs: Any) -> Text:
        """A text at a data point (``Axes.text``)."""
        t = Text(x, y, s, transform=self.transData, **kwargs)
        self.fig.add_artist(t)
        return t

    def plot(self, xs: Sequence[float], ys: Sequence[float], fmt: str | None = None,
             **kwargs: Any) -> Line2D:
        """A line or markers (``Axes.plot``; the format ``"o"`` only: markers, no line)."""
        if fmt is not None:
            if fmt != "o":
                raise ValueError(f"a panel's plot takes the format 'o' only, not {fmt!r}")
            kwargs.setdefault("marker", "o")
            kwargs.setdefault("linestyle", "none")
        line = Line2D(list(xs), list(ys), transform=self.transData, **kwargs)
        self.fig.add_artist(line)
        return line

    def add_patch(self, patch: Patch) -> Patch:
        """A patch in data coordinates (``Axes.add_patch``)."""
        patch.set_transform(self.transData)
        self.fig.add_artist(patch)
        return patch

    def annotate(self, text: str, xy: tuple[float, float], xytext: tuple[float, float],
                 **kwargs: Any) -> Annotation:
        """A text with an arrow to a data point (``Axes.annotate``)."""
        a = Annotation(text, xy, xytext=xytext, xycoords=self.transData,
                       textcoords=self.transData, **kwargs)
        self.fig.add_artist(a)
        return a
