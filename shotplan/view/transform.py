"""The one place that converts table metres to screen pixels and back.

Table coordinates (see :mod:`shotplan.table`) have x along the length toward
the foot and y across toward the left as seen from the head end. On screen
the head end is on the left and the foot on the right, so a player standing at
the head end sees the table as drawn: x grows to the right, y grows upward
(screen rows grow downward, hence the sign). Pixels are square: one scale for
both axes, so a circle on the cloth is a circle on the screen.

No pygame here: a :class:`Transform` is plain arithmetic, so it is tested
without a display.

Examples
--------
>>> t = Transform.fit((-0.2, -0.2, 2.74, 1.47), (0, 0, 1000, 600), margin_px=10)
>>> x, y = t.to_table(*t.to_screen(1.27, 0.635))
>>> round(x, 9), round(y, 9)
(1.27, 0.635)
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

from ..units import to_diamonds  # re-exported: the view's status line uses it

__all__ = ["Transform", "to_diamonds"]


@dataclass(frozen=True, slots=True)
class Transform:
    """A uniform scale and a shift from table metres to window pixels.

    Build one with :meth:`fit`; the fields are what it worked out.
    """

    scale: float
    """Pixels per metre (the same along both axes)."""
    origin_x: float
    """Screen x of the table's origin (x = 0), px."""
    origin_y: float
    """Screen y of the table's origin (y = 0), px; table y grows upward from here."""
    bounds: tuple[float, float, float, float] = (0.0, 0.0, 1.0, 1.0)
    """(xmin, ymin, xmax, ymax) of what was fitted, m."""
    viewport: tuple[int, int, int, int] = (0, 0, 1, 1)
    """(left, top, width, height) of the screen area it was fitted into, px."""

    @classmethod
    def fit(
        cls,
        bounds: tuple[float, float, float, float],
        viewport: tuple[int, int, int, int],
        margin_px: float = 12.0,
    ) -> Transform:
        """The largest transform that shows ``bounds`` whole inside ``viewport``,
        ``margin_px`` clear of each edge, centred.

        Parameters
        ----------
        bounds
            (xmin, ymin, xmax, ymax) in m, with xmax > xmin and ymax > ymin.
        viewport
            (left, top, width, height) in px.
        margin_px
            Clear space kept on every side, px (reduced if the viewport is tiny).

        Returns
        -------
        Transform

        Raises
        ------
        ValueError
            Bounds that are not finite or have no width or height.
        """
        xmin, ymin, xmax, ymax = (float(v) for v in bounds)
        if not (xmax > xmin and ymax > ymin) or not all(map(math.isfinite, (xmin, ymin, xmax, ymax))):
            raise ValueError(f"bounds {bounds!r} must be finite with xmax > xmin and ymax > ymin")
        left, top, width, height = (int(v) for v in viewport)
        width, height = max(width, 1), max(height, 1)
        margin = max(0.0, min(float(margin_px), 0.25 * width, 0.25 * height))
        avail_w = max(width - 2.0 * margin, 1.0)
        avail_h = max(height - 2.0 * margin, 1.0)
        scale = min(avail_w / (xmax - xmin), avail_h / (ymax - ymin))
        # Centre the fitted rectangle in the viewport.
        draw_w, draw_h = scale * (xmax - xmin), scale * (ymax - ymin)
        x0 = left + 0.5 * (width - draw_w)
        y0 = top + 0.5 * (height - draw_h)
        origin_x = x0 - scale * xmin
        origin_y = y0 + scale * ymax  # screen y of table y = 0 (y grows up)
        return cls(scale, origin_x, origin_y, (xmin, ymin, xmax, ymax), (left, top, width, height))

    # ---------------------------------------------------------- points
    def to_screen(self, x: float, y: float) -> tuple[float, float]:
        """Screen position (px, float) of the table point (x, y) in m.

        Parameters
        ----------
        x, y : float
            The table point, m.

        Returns
        -------
        (float, float)
            px.
        """
        return (self.origin_x + self.scale * x, self.origin_y - self.scale * y)

    def to_table(self, px: float, py: float) -> tuple[float, float]:
        """Table point (m) under the screen position (px, py).

        Parameters
        ----------
        px, py : float
            The screen position, px.

        Returns
        -------
        (float, float)
            m.
        """
        return ((px - self.origin_x) / self.scale, (self.origin_y - py) / self.scale)

    def to_screen_array(self, points: ArrayLike) -> np.ndarray:
        """(N, 2) screen positions of (N, 2) table points.

        Parameters
        ----------
        points : array-like, shape (N, 2)
            Table points, m.

        Returns
        -------
        ndarray, shape (N, 2)
            px.
        """
        pts = np.asarray(points, dtype=float).reshape(-1, 2)
        out = np.empty_like(pts)
        out[:, 0] = self.origin_x + self.scale * pts[:, 0]
        out[:, 1] = self.origin_y - self.scale * pts[:, 1]
        return out

    def to_table_array(self, points: ArrayLike) -> np.ndarray:
        """(N, 2) table points of (N, 2) screen positions.

        Parameters
        ----------
        points : array-like, shape (N, 2)
            Screen positions, px.

        Returns
        -------
        ndarray, shape (N, 2)
            m.
        """
        pts = np.asarray(points, dtype=float).reshape(-1, 2)
        out = np.empty_like(pts)
        out[:, 0] = (pts[:, 0] - self.origin_x) / self.scale
        out[:, 1] = (self.origin_y - pts[:, 1]) / self.scale
        return out

    def shifted(self, left: float, top: float, width: int, height: int) -> Transform:
        """The same transform onto a surface whose corner is at (``left``,
        ``top``) of this one's screen, ``width`` by ``height`` px.

        Parameters
        ----------
        left, top : float
            Where the surface's corner is, px.
        width, height : int
            The surface's size, px.

        Returns
        -------
        Transform
        """
        return Transform(self.scale, self.origin_x - left, self.origin_y - top, self.bounds,
                         (0, 0, width, height))

    # --------------------------------------------------------- lengths
    def px(self, length_m: float) -> float:
        """A table length in pixels.

        Parameters
        ----------
        length_m : float
            A length, m.

        Returns
        -------
        float
            px.
        """
        return length_m * self.scale

    def metres(self, length_px: float) -> float:
        """A screen length in metres of table.

        Parameters
        ----------
        length_px : float
            A length, px.

        Returns
        -------
        float
            m.
        """
        return length_px / self.scale

    def screen_rect(self) -> tuple[int, int, int, int]:
        """(left, top, width, height) in whole pixels of the fitted ``bounds``.

        Returns
        -------
        (int, int, int, int)
        """
        xmin, ymin, xmax, ymax = self.bounds
        x0, y0 = self.to_screen(xmin, ymax)
        x1, y1 = self.to_screen(xmax, ymin)
        left, top = math.floor(x0), math.floor(y0)
        return (left, top, math.ceil(x1) - left, math.ceil(y1) - top)

    def contains(self, px: float, py: float) -> bool:
        """Whether the screen position lies over the fitted bounds.

        Parameters
        ----------
        px, py : float
            The screen position, px.

        Returns
        -------
        bool
        """
        x, y = self.to_table(px, py)
        xmin, ymin, xmax, ymax = self.bounds
        return xmin <= x <= xmax and ymin <= y <= ymax

