"""What a fit found, per kind of rows: estimates, row residuals, model fits.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

__all__ = [
    "OUTLIER_Z",
    "MIN_ROWS_FOR_OUTLIERS",
    "Estimate",
    "RowResult",
    "ModelFit",
    "KindFit",
]

OUTLIER_Z = 3.5
"""Modified z-score above which a residual flags its row (Iglewicz and
Hoaglin 1993)."""

MIN_ROWS_FOR_OUTLIERS = 6
"""Fewest rows of a kind for outlier flags: the median absolute deviation of
fewer residuals says too little about their spread (common practice, no source)."""

# ----------------------------------------------------------------- fit values
@dataclass(frozen=True, slots=True)
class Estimate:
    """One fitted parameter."""

    name: str
    """The table override key it fills (``cushion_restitution``...)."""
    value: float
    """Fitted value."""
    se: float
    """Standard error."""

    def to_dict(self) -> dict[str, Any]:
        """``{"value", "se"}``."""
        return {"value": self.value, "se": self.se}


@dataclass(frozen=True, slots=True)
class RowResult:
    """One row's fit: what was measured, what the model gives, the residuals."""

    kind: str
    """``rebound``, ``rollout`` or ``rebound_test``."""
    file: str
    """File of the row."""
    line: int
    """Line of the file."""
    measured: tuple[tuple[str, float | str], ...]
    """Measured values by column."""
    predicted: tuple[tuple[str, float], ...]
    """Model values by column."""
    residuals: tuple[float, ...]
    """Model minus measured, in the fit's residual unit."""
    z: tuple[float, ...] = ()
    """Modified z-score of each residual (empty where not computed)."""
    outlier: bool = False
    """Flagged by the outlier rule."""

    def to_dict(self) -> dict[str, Any]:
        """The row's JSON object."""
        return {"kind": self.kind, "file": self.file, "line": self.line,
                "measured": dict(self.measured), "predicted": dict(self.predicted),
                "residuals": list(self.residuals), "z": list(self.z), "outlier": self.outlier}


@dataclass(frozen=True)
class ModelFit:
    """One least-squares fit of one kind of rows (or a check with no parameters)."""

    kind: str
    """Kind of rows."""
    model: str
    """Model form in words (``e = e0 - slope * v_n``...)."""
    estimates: tuple[Estimate, ...]
    """Fitted parameters."""
    fixed: tuple[tuple[str, float], ...]
    """Values the model used but did not fit, with their keys."""
    rows: tuple[RowResult, ...]
    """Each row used, with its residuals."""
    rss: float
    """Sum of squared residuals."""
    sigma: float
    """Residual standard deviation, ``sqrt(RSS / (m - p))``."""
    dof: int
    """Degrees of freedom ``m - p``."""
    residual_unit: str
    """Unit of the residuals."""
    iterations: int = 0
    """Accepted steps of the fit."""
    correlation: tuple[tuple[float, ...], ...] = ()
    """Correlation matrix of the estimates."""
    spreads: tuple[tuple[str, float], ...] = ()
    """Root-mean-square residual of each kind of residual (rebounds: the
    outgoing speed's, relative, and the angle's, degrees; roll-outs: the
    distance's, relative), with the degrees of freedom shared out."""
    degenerate: str = ""
    """Why the standard errors cannot be estimated (too few distinct rows,
    residuals zero to rounding), or ``""`` when they can."""

    def estimate(self, name: str) -> Estimate | None:
        """The estimate of ``name``, or None."""
        for e in self.estimates:
            if e.name == name:
                return e
        return None

    def to_dict(self) -> dict[str, Any]:
        """The fit's JSON object."""
        return {
            "model": self.model,
            "estimates": {e.name: {"value": e.value, "se": None if self.degenerate else e.se}
                          for e in self.estimates},
            "degenerate": bool(self.degenerate),
            "degenerate_reason": self.degenerate or None,
            "fixed": dict(self.fixed),
            "rows_used": len(self.rows),
            "rss": self.rss,
            "sigma": self.sigma,
            "dof": self.dof,
            "residual_unit": self.residual_unit,
            "iterations": self.iterations,
            "correlation": [list(r) for r in self.correlation],
            "spreads": dict(self.spreads),
            "rows": [r.to_dict() for r in self.rows],
        }


@dataclass(frozen=True)
class KindFit:
    """Every fit of one kind of rows: with all rows, without the flagged ones."""

    kind: str
    """Kind of rows."""
    all_rows: ModelFit
    """The fit with every row (its rows carry the outlier flags)."""
    without_outliers: ModelFit | None
    """The fit without the flagged rows, if any were flagged and enough remain."""
    used: str
    """``all rows`` or ``without outliers``: which one the profile takes."""
    notes: tuple[str, ...] = ()
    """What was decided and why (model choice, fixed values, outlier rule)."""
    alternatives: tuple[ModelFit, ...] = ()
    """Other model forms tried (the constant and linear restitution fits)."""

    @property
    def chosen(self) -> ModelFit:
        """The fit the profile takes."""
        if self.used == "without outliers" and self.without_outliers is not None:
            return self.without_outliers
        return self.all_rows

    @property
    def outliers(self) -> tuple[RowResult, ...]:
        """The flagged rows."""
        return tuple(r for r in self.all_rows.rows if r.outlier)

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of this kind's fits."""
        return {
            "used": self.used,
            "all_rows": self.all_rows.to_dict(),
            "without_outliers": (self.without_outliers.to_dict()
                                 if self.without_outliers is not None else None),
            "alternatives": [a.to_dict() for a in self.alternatives],
            "notes": list(self.notes),
        }
