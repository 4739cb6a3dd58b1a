"""Where the animation of the predicted shot is: its time, whether it runs, how fast."""

from __future__ import annotations

__all__ = ["Playback"]


class Playback:
    """Where the animation of the predicted shot is: its time, whether it runs, how fast.

    ``rate`` 1 is real time; 0.25 plays four times slower.
    """

    RATES: tuple[tuple[str, float], ...] = (
        ("real time", 1.0), ("1/2 speed", 0.5), ("1/4 speed", 0.25), ("1/10 speed", 0.1))
    """The speed choices offered, with their rates."""

    def __init__(self) -> None:
        self.t = 0.0
        self.playing = False
        self.rate = 1.0

    @property
    def active(self) -> bool:
        """Whether the balls are shown moved (playing, or stopped part-way)."""
        return self.playing or self.t > 0.0

    def toggle(self, duration: float) -> None:
        """Play or pause; playing from the end starts again.

        Parameters
        ----------
        duration : float
            The shot's length, s.
        """
        if self.playing:
            self.playing = False
            return
        if self.t >= duration:
            self.t = 0.0
        self.playing = duration > 0.0

    def reset(self) -> None:
        """Back to the start, stopped (the balls at their places)."""
        self.t = 0.0
        self.playing = False

    def advance(self, dt: float, duration: float) -> None:
        """Move on by ``dt`` seconds of wall time (``rate`` times as much shot time).

        Parameters
        ----------
        dt : float
            Wall time, s.
        duration : float
            The shot's length, s.
        """
        if not self.playing:
            return
        self.t = min(self.t + dt * self.rate, duration)
        if self.t >= duration:
            self.playing = False

    def scrub(self, fraction: float, duration: float) -> None:
        """Jump to ``fraction`` (0 to 1) of the shot, stopped.

        Parameters
        ----------
        fraction : float
            0 (the start) to 1 (the end).
        duration : float
            The shot's length, s.
        """
        self.playing = False
        self.t = min(max(float(fraction), 0.0), 1.0) * max(duration, 0.0)


# ------------------------------------------------------------ placement
