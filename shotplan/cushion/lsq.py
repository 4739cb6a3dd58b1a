"""Nonlinear least squares for the cushion fits, on ``scipy.optimize.least_squares``.

scipy's trust-region reflective method (``trf``, the one of its methods that
takes bounds) does the minimising; this module adds what the fits need
around it: a central-difference Jacobian whose steps follow each
parameter's typical size, a clear error for residuals the model cannot
compute, a progress callback, the standard errors from the Jacobian at the
solution, and the test for parameters the data do not determine.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from scipy.optimize import least_squares

from ..errors import InputError

__all__ = [
    "FTOL",
    "XTOL",
    "GTOL",
    "REL_STEP",
    "LeastSquaresResult",
    "numerical_jacobian",
    "least_squares_fit",
    "standard_errors",
    "undetermined",
]

FTOL = 1e-12
"""Relative change of the cost below which the fit stops (scipy's ``ftol``)."""

XTOL = 1e-12
"""Relative step below which the fit stops (scipy's ``xtol``)."""

GTOL = 1e-14
"""Scaled gradient below which the fit stops (scipy's ``gtol``)."""

REL_STEP = 6e-6
"""Difference step of parameter j, relative to ``max(|x_j|, scale_j)``: about
the cube root of the double-precision epsilon, the usual choice for central
differences (common practice, no source)."""

Residuals = Callable[[np.ndarray], np.ndarray]
"""Residuals as a 1-D array for a parameter array."""


@dataclass(frozen=True, eq=False)
class LeastSquaresResult:
    """The outcome of :func:`least_squares_fit`."""

    x: np.ndarray
    """The parameters at the minimum."""
    residuals: np.ndarray
    """Residuals at ``x``."""
    jacobian: np.ndarray
    """Jacobian of the residuals at ``x`` (central differences)."""
    cost: float
    """Half the sum of squared residuals (as ``scipy.optimize.least_squares``)."""
    iterations: int
    """Accepted steps (Jacobian evaluations after the first)."""
    evaluations: int
    """Residual evaluations, the Jacobian's included."""
    converged: bool
    """Whether a convergence test was met (not the evaluation limit)."""
    message: str
    """Which test stopped it (scipy's words)."""


def numerical_jacobian(fun: Residuals, x: np.ndarray, scale: np.ndarray, lower: np.ndarray,
                       upper: np.ndarray, rel_step: float = REL_STEP) -> np.ndarray:
    """Central-difference Jacobian of ``fun`` at ``x`` (one-sided at a bound).

    Kept by hand because scipy's own difference steps (public options) are
    relative to ``|x_j|`` or ``max(1, |x_j|)``, and the fits need steps that
    follow each parameter's typical size: a restitution slope near 0 and a
    rolling resistance of 0.01 both need a step of their own scale.

    Parameters
    ----------
    fun
        Residuals as a 1-D array for a parameter array.
    x
        Where to differentiate.
    scale
        Typical size of each parameter: the step of parameter j is
        ``rel_step * max(|x_j|, scale_j)``.
    lower, upper
        Bounds; a step that would cross one is taken one-sided.
    rel_step
        Relative step (default :data:`REL_STEP`).

    Returns
    -------
    (m, p) array
        The Jacobian, one column a parameter.
    """
    x = np.asarray(x, dtype=float)
    cols = []
    for j in range(len(x)):
        h = rel_step * max(abs(x[j]), scale[j])
        up = x.copy()
        dn = x.copy()
        if x[j] + h > upper[j]:
            dn[j] = x[j] - h
            d = h
        elif x[j] - h < lower[j]:
            up[j] = x[j] + h
            d = h
        else:
            up[j] = x[j] + h
            dn[j] = x[j] - h
            d = 2 * h
        cols.append((np.asarray(fun(up), dtype=float) - np.asarray(fun(dn), dtype=float)) / d)
    return np.column_stack(cols)


def least_squares_fit(
    fun: Residuals,
    x0: Sequence[float],
    *,
    lower: Sequence[float] | None = None,
    upper: Sequence[float] | None = None,
    scale: Sequence[float] | None = None,
    max_evaluations: int | None = None,
    progress: Callable[[int, int], None] | None = None,
) -> LeastSquaresResult:
    """Minimise ``0.5 * |fun(x)|^2`` within bounds.

    Parameters
    ----------
    fun
        Residuals as a 1-D array for a parameter array.
    x0
        Starting point (moved inside the bounds if outside).
    lower, upper
        Bounds (default unbounded): they keep the model defined while
        fitting, they are not a constrained fit.
    scale
        Typical size of each parameter, for the difference steps and scipy's
        ``x_scale`` (default: steps from ``max(|x0|, 1e-3)``, ``x_scale``
        from the Jacobian).
    max_evaluations
        Largest number of residual evaluations outside the Jacobian's
        (scipy's ``max_nfev``; default scipy's own, 100 per parameter).
    progress
        Called as ``progress(done, total)``: evaluations used of
        ``max_evaluations`` (a rough guide; the fit usually stops sooner).

    Returns
    -------
    LeastSquaresResult
        The minimum, with the residuals and Jacobian there.

    Raises
    ------
    InputError
        When the model gives a non-finite residual.
    """
    x = np.array(x0, dtype=float)
    n = len(x)
    lo = np.full(n, -np.inf) if lower is None else np.asarray(lower, dtype=float)
    hi = np.full(n, np.inf) if upper is None else np.asarray(upper, dtype=float)
    sc = np.maximum(np.abs(x), 1e-3) if scale is None else np.asarray(scale, dtype=float)
    x = np.clip(x, lo, hi)
    evals = 0
    limit = max_evaluations if max_evaluations is not None else 100 * n

    def f(p: np.ndarray) -> np.ndarray:
        nonlocal evals
        evals += 1
        r = np.asarray(fun(p), dtype=float).ravel()
        if not np.all(np.isfinite(r)):
            raise InputError("the model gave a non-finite residual; the data are out of the "
                             "model's reach")
        return r

    def jac(p: np.ndarray) -> np.ndarray:
        if progress is not None:
            progress(min(evals, limit), max(limit, 1))
        return numerical_jacobian(f, p, sc, lo, hi)

    x_scale = "jac" if scale is None else sc
    out = least_squares(f, x, jac=jac, bounds=(lo, hi), method="trf", x_scale=x_scale,
                        ftol=FTOL, xtol=XTOL, gtol=GTOL, max_nfev=max_evaluations)
    if progress is not None:
        progress(max(limit, 1), max(limit, 1))
    return LeastSquaresResult(np.asarray(out.x, dtype=float), np.asarray(out.fun, dtype=float),
                              np.asarray(out.jac, dtype=float), float(out.cost),
                              max(int(out.njev or 1) - 1, 0), evals, bool(out.status > 0),
                              str(out.message))


def standard_errors(result: LeastSquaresResult) -> tuple[np.ndarray, float, np.ndarray]:
    """Standard errors, residual sigma and covariance of a fit.

    ``cov = sigma^2 (J^T J)^-1`` with ``sigma^2 = RSS / (m - p)`` (the usual
    linearised least-squares covariance), J the Jacobian at the solution.

    Parameters
    ----------
    result
        A fit from :func:`least_squares_fit`.

    Returns
    -------
    se : (p,) array
        Standard error of each parameter.
    sigma : float
        Residual standard deviation.
    cov : (p, p) array
        Covariance of the parameters.

    Raises
    ------
    InputError
        When there are no more residuals than parameters.
    """
    J = result.jacobian
    m, p = J.shape
    if m <= p:
        raise InputError(f"{m} residuals for {p} parameters: more measurements are needed "
                         "for standard errors")
    sigma2 = 2.0 * result.cost / (m - p)
    cov = sigma2 * np.linalg.pinv(J.T @ J)
    return np.sqrt(np.maximum(np.diag(cov), 0.0)), math.sqrt(sigma2), cov


def undetermined(J: np.ndarray) -> list[int]:
    """Parameters the data do not determine.

    Columns of J that are zero, or else those in a combination the data
    cannot see (a near-null direction of the column-scaled J, singular value
    below 1e-7 of the largest).

    Parameters
    ----------
    J
        Jacobian of the residuals, one column a parameter.

    Returns
    -------
    list of int
        Indices of the undetermined parameters (empty when all are determined).
    """
    norms = np.linalg.norm(J, axis=0)
    top = float(np.max(norms)) if len(norms) else 0.0
    zero = [j for j, v in enumerate(norms) if v <= 1e-9 * max(top, 1e-300)]
    if zero or J.shape[1] < 2:
        return zero
    _u, sv, vt = np.linalg.svd(J / norms, full_matrices=False)
    if sv[-1] > 1e-7 * sv[0]:
        return []
    return [j for j, c in enumerate(vt[-1]) if abs(c) > 0.1]
