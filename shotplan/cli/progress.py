"""Progress on a terminal, through tqdm.

The model reports progress with one callback shape, ``progress(done,
total)`` (:data:`shotplan.study.Progress`): the work done so far and the
whole. :func:`progress_bar` turns that into a tqdm bar on stderr, which fits
itself to the terminal's width and is silent when stderr is not a terminal
(``disable=None``), so a pipe or a log file gets nothing; the bar's line is
cleared when the work ends.
"""

from __future__ import annotations

import sys
from collections.abc import Iterator
from contextlib import contextmanager
from typing import TextIO

from tqdm import tqdm

__all__ = ["ProgressBar", "progress_bar"]


class ProgressBar:
    """A ``progress(done, total)`` callback that draws a tqdm bar.

    Parameters
    ----------
    label : str
        Words before the bar (``"study window"``).
    stream : text stream, optional
        Where the bar goes (default stderr); nothing is drawn unless it is a
        terminal.
    min_interval_s : float
        Least time between two redraws, seconds (tqdm's ``mininterval``).
    """

    def __init__(self, label: str, stream: TextIO | None = None,
                 min_interval_s: float = 0.1) -> None:
        self.label = label
        self.stream = stream if stream is not None else sys.stderr
        self.min_interval_s = min_interval_s
        self._bar: tqdm | None = None  # made at the first call, when the total is known
        self._closed = False

    def __call__(self, done: int, total: int) -> None:
        """Show ``done`` of ``total``.

        Parameters
        ----------
        done : int
            Work done so far.
        total : int
            The whole work (may change between calls).
        """
        if self._closed:
            return
        if self._bar is None:
            self._bar = tqdm(total=total, desc=self.label, file=self.stream, disable=None,
                             leave=False, dynamic_ncols=True, mininterval=self.min_interval_s,
                             bar_format="{desc} {percentage:3.0f}%|{bar}| {n_fmt}/{total_fmt} "
                                        "[{elapsed}<{remaining}]")
        bar = self._bar
        if bar.disable:
            return
        if bar.total != total:
            bar.total = total
            bar.refresh()
        bar.update(done - bar.n)

    def close(self) -> None:
        """Clear the bar's line; later calls draw nothing."""
        self._closed = True
        if self._bar is not None:
            self._bar.close()


@contextmanager
def progress_bar(label: str, stream: TextIO | None = None) -> Iterator[ProgressBar]:
    """A :class:`ProgressBar` for the work inside the ``with`` block, closed after it.

    Parameters
    ----------
    label : str
        Words before the bar.
    stream : text stream, optional
        Where the bar goes (default stderr).

    Yields
    ------
    ProgressBar
        The callback to hand to the model.
    """
    bar = ProgressBar(label, stream)
    try:
        yield bar
    finally:
        bar.close()
