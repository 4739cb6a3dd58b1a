"""The least-squares fits of each kind of rows, the outlier rule, degenerate
fits, and :func:`fit_measurements`, which runs them all.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Sequence
from typing import Any

import numpy as np

from ..equipment import OVERRIDE_KEYS, PRESETS, TableSpec
from ..errors import InputError, LayoutError, ShotplanError
from ..physics.params import Physics
from .lsq import LeastSquaresResult, least_squares_fit, standard_errors, undetermined
from .measurements import Measurements, ReboundRow, ReboundTestRow, RolloutRow, Row
from .models import (
    FIRM_STROKE_MPS,
    Progress,
    law_params,
    rebound_predictions,
    report_fraction,
    rollout_distance,
    standard_rebound_test,
    table_geometry,
)
from .profile import FitResult
from .results import MIN_ROWS_FOR_OUTLIERS, OUTLIER_Z, Estimate, KindFit, ModelFit, RowResult

__all__ = [
    "RESTITUTION_MODELS",
    "REBOUND_MIN_ROWS",
    "ROLLOUT_MIN_ROWS",
    "REBOUND_TEST_MIN_ROWS",
    "ZERO_SPREAD_RELATIVE",
    "SLIDING_FRICTION_MAX_RELATIVE_SE",
    "modified_z",
    "ReboundData",
    "degeneracy",
    "rebound_test_check",
    "fit_measurements",
]

RESTITUTION_MODELS = ("auto", "constant", "linear")
"""Restitution model choices of :func:`fit_measurements`."""

REBOUND_MIN_ROWS = {"constant": 3, "linear": 4}
"""Fewest rebound rows for each restitution model (two residuals a row: at
least two more residuals than parameters, our choice)."""

ROLLOUT_MIN_ROWS = 2
"""Fewest roll-out rows (for a standard error, more rows than parameters)."""

REBOUND_TEST_MIN_ROWS = 2
"""Fewest rebound-test rows."""


def modified_z(res: np.ndarray, scale: float) -> np.ndarray:
    """Modified z-scores (Iglewicz and Hoaglin 1993): 0.6745 (r - median) / MAD.

    Parameters
    ----------
    res
        Residuals.
    scale
        Their typical size: the MAD is floored at ``1e-6 * scale`` (and
        1e-12), so data that fit exactly do not flag rounding noise.

    Returns
    -------
    ndarray
        One score a residual; above :data:`OUTLIER_Z` flags its row.
    """
    med = float(np.median(res))
    mad = float(np.median(np.abs(res - med)))
    # A floor, so that data that fit exactly do not flag rounding noise.
    mad = max(mad, 1e-6 * scale, 1e-12)
    return 0.6745 * (res - med) / mad


def _where(rows: Sequence[Row]) -> str:
    files = sorted({r.file for r in rows})
    return ", ".join(files) if files else "measurements"


# -- rebound
class ReboundData:
    """Rebound rows as arrays, with the law's parameter vector.

    Residuals are the outgoing speed as a relative difference
    (``ln(predicted / measured)``) and the outgoing angle in radians: marks
    timed and placed on a video err by a length, which over the distance
    between the marks is a relative error in speed and an angle alike.
    Each of the two is weighted by its own spread (see :func:`_rebound_fit`).
    """

    def __init__(self, rows: Sequence[ReboundRow], spec: TableSpec):
        self.rows = tuple(rows)
        self.spec = spec
        self.prm = law_params(spec)
        self.v_in = np.array([r.speed_in_mps for r in rows])
        self.a_in = np.array([r.angle_in_deg for r in rows])
        self.rolling = np.array([r.spin == "follow" for r in rows])
        self.s_out = np.array([r.speed_out_mps for r in rows])
        self.a_out = np.radians([r.angle_out_deg for r in rows])
        self.v_n = self.v_in * np.sin(np.radians(self.a_in))
        self.v_n_out = self.s_out * np.sin(self.a_out)
        self.weights = np.ones(2)

    def velocity(self, e0: float, slope: float, mu: float) -> np.ndarray:
        vel, _om = rebound_predictions(self.spec, self.v_in, self.a_in, self.rolling,
                                       e0, slope, mu, self.prm)
        return vel

    def raw(self, vel: np.ndarray) -> np.ndarray:
        """(N, 2) unweighted residuals: ln speed ratio, angle difference (rad)."""
        speed = np.hypot(vel[:, 0], vel[:, 1])
        angle = np.arctan2(vel[:, 1], vel[:, 0])
        return np.column_stack([np.log(np.maximum(speed, 1e-12) / self.s_out),
                                angle - self.a_out])

    def residuals(self, e0: float, slope: float, mu: float) -> np.ndarray:
        return (self.raw(self.velocity(e0, slope, mu)) * self.weights).ravel()


_REBOUND_BOUNDS = {  # keep the law defined while fitting; checked against OVERRIDE_KEYS after
    "cushion_restitution": (0.05, 1.5),
    "cushion_restitution_slope": (-1.0, 1.0),
    "cushion_friction": (0.0, 1.0),
}


def _rebound_fit(data: ReboundData, model: str, defaults: Physics) -> tuple[ModelFit, list[str]]:
    """One restitution model fitted to rebound rows (with outlier z-scores).

    Two passes: equal weights first; then each residual component (speed,
    angle) is divided by its own spread from the first pass and the fit is
    repeated, so that neither dominates by its units (weighted least squares
    with estimated variance components).
    """
    notes: list[str] = []
    names = ["cushion_restitution"]
    if model == "linear":
        names.append("cushion_restitution_slope")
    names.append("cushion_friction")
    fixed = {"cushion_restitution_slope": 0.0, "cushion_friction": defaults.cushion_friction}
    ratio = data.v_n_out / np.maximum(data.v_n, 1e-9)
    start = {"cushion_restitution": float(np.clip(np.median(ratio), 0.1, 1.0)),
             "cushion_restitution_slope": 0.0,
             "cushion_friction": defaults.cushion_friction}

    def full(p: np.ndarray, free: list[str]) -> tuple[float, float, float]:
        vals = dict(fixed)
        vals.update(zip(free, (float(v) for v in p), strict=True))
        return (vals["cushion_restitution"], vals["cushion_restitution_slope"],
                vals["cushion_friction"])

    def solve(free: list[str], x0: Sequence[float]) -> LeastSquaresResult:
        return least_squares_fit(
            lambda p: data.residuals(*full(p, free)), x0,
            lower=[_REBOUND_BOUNDS[n][0] for n in free],
            upper=[_REBOUND_BOUNDS[n][1] for n in free],
            scale=[1.0 if n == "cushion_restitution" else 0.1 for n in free],
        )

    data.weights = np.ones(2)
    res = solve(names, [start[n] for n in names])
    while True:
        bad = [names[j] for j in undetermined(res.jacobian)]
        if not bad:
            break
        # Give up friction first, then the slope; restitution must stay.
        drop = next((n for n in ("cushion_friction", "cushion_restitution_slope") if n in bad),
                    None)
        if drop is None:
            raise InputError(f"{_where(data.rows)}: the rebound rows do not determine the "
                             "cushion restitution; check that the angles are from the cushion "
                             "line and the speeds are in m/s")
        names.remove(drop)
        if drop == "cushion_friction":
            notes.append("cushion_friction is not determined by these rows (its effect cannot be "
                         "told from the restitution's: rebounds all at one angle, or all "
                         "square): kept at its default "
                         f"{defaults.cushion_friction:g} and not written to the profile; add "
                         "rebounds at shallower angles (below about 45 degrees from the "
                         "cushion line)")
            fixed["cushion_friction"] = defaults.cushion_friction
        else:
            notes.append("cushion_restitution_slope is not determined by these rows (one normal "
                         "speed, or its effect cannot be told from the others'): kept at 0")
            fixed[drop] = 0.0
        res = solve(names, [start[n] for n in names])
    # Second pass: weight each component by its spread (dof shared between
    # the two); a robust spread (1.4826 MAD) where there are rows enough, so
    # that one wild row does not set the weights.
    raw = data.raw(data.velocity(*full(res.x, names)))
    n_rows = len(data.rows)
    share = max(n_rows - len(names) / 2.0, 0.5)
    spread = np.sqrt(np.sum(raw**2, axis=0) / share)
    if n_rows >= MIN_ROWS_FOR_OUTLIERS:
        robust = 1.4826 * np.median(np.abs(raw - np.median(raw, axis=0)), axis=0)
        spread = np.where(robust > 0, robust, spread)
    spread = np.maximum(spread, 1e-9)
    data.weights = 1.0 / spread
    res = solve(names, list(res.x))
    se, sigma, cov = standard_errors(res)
    d = np.sqrt(np.maximum(np.diag(cov), 1e-300))
    corr = cov / np.outer(d, d)
    e0, slope, mu = full(res.x, names)
    vel = data.velocity(e0, slope, mu)
    final_raw = data.raw(vel)
    rms = np.sqrt(np.sum(final_raw**2, axis=0) / share)
    weighted = final_raw * data.weights
    # Each component against its own spread.
    z = np.column_stack([modified_z(weighted[:, k], 1.0) for k in range(2)])
    rows = []
    for i, r in enumerate(data.rows):
        speed = float(math.hypot(*vel[i]))
        angle = float(math.degrees(math.atan2(vel[i, 1], vel[i, 0])))
        rows.append(RowResult(
            "rebound", r.file, r.line,
            (("speed_in_mps", r.speed_in_mps), ("angle_in_deg", r.angle_in_deg),
             ("speed_out_mps", r.speed_out_mps), ("angle_out_deg", r.angle_out_deg),
             ("spin", r.spin)),
            (("speed_out_mps", speed), ("angle_out_deg", angle)),
            (speed - r.speed_out_mps, angle - r.angle_out_deg),
            (float(z[i, 0]), float(z[i, 1])),
        ))
    form = ("e = e0 - slope * v_n (linear in the normal speed)" if model == "linear"
            else "e = e0 (constant)")
    fit = ModelFit(
        "rebound", form,
        tuple(Estimate(n, float(v), float(s)) for n, v, s in zip(names, res.x, se, strict=True)),
        tuple((k, float(v)) for k, v in fixed.items() if k not in names
              and not (k == "cushion_restitution_slope" and model == "constant")),
        tuple(rows), float(2.0 * res.cost), sigma, weighted.size - len(names),
        "m/s and degrees (speed out, angle out)", res.iterations,
        tuple(tuple(float(c) for c in row) for row in corr),
        (("speed_out_relative", float(rms[0])), ("angle_out_deg", float(math.degrees(rms[1])))),
    )
    return fit, notes


def _check_rebound_values(fit: ModelFit, rows: Sequence[ReboundRow]) -> None:
    where = _where(rows)
    e0 = fit.estimate("cushion_restitution")
    if e0 is not None and e0.value > 1.0:
        raise InputError(
            f"{where}: the rebound rows give a cushion restitution of {e0.value:.3f}, above 1 "
            "(the ball would leave faster than it came in, square to the cushion); check that "
            "speed_in and speed_out are not swapped and that the angles are from the cushion "
            "line, not from its perpendicular")
    s = fit.estimate("cushion_restitution_slope")
    if s is not None and s.value < 0.0:
        raise InputError(
            f"{where}: with --restitution linear the rebound rows give a slope of "
            f"{s.value:.4f} +- {s.se:.4f} per m/s: restitution rising with speed, which the "
            "cushion law does not take (its slope must be 0 or more); use --restitution "
            "constant or auto")
    if s is not None and s.value > OVERRIDE_KEYS["cushion_restitution_slope"][1]:
        raise InputError(f"{where}: the rebound rows give a restitution slope of {s.value:.3f} "
                         "per m/s, beyond the valid 0 to 1; the rows are inconsistent")


def _flag(fit: ModelFit) -> ModelFit:
    flagged = tuple(
        RowResult(r.kind, r.file, r.line, r.measured, r.predicted, r.residuals, r.z,
                  bool(r.z) and max(abs(v) for v in r.z) > OUTLIER_Z)
        for r in fit.rows)
    return dataclasses.replace(fit, rows=flagged)


ZERO_SPREAD_RELATIVE = 1e-9
"""Residuals below this fraction of the values they belong to are zero to
rounding: no measuring device comes near (a speed gate or a video frame is
good to a per cent or so; common practice, no source), so rows that fit this
well are copies, not measurements."""


def degeneracy(fit: ModelFit, where: str) -> ModelFit:
    """The fit with ``degenerate`` set when its standard errors mean nothing,
    or an :class:`InputError` when its values are not determined at all.

    Identical rows repeat one measurement: ``k`` distinct rows with ``r``
    residuals each determine at most ``k r`` values, and estimate their
    spread only when ``k r`` exceeds the number of values ``p`` (linear
    least squares: ``sigma^2 = RSS / (m - p)``). Residuals zero to rounding
    say the same from the other side: the errors come out as rounding
    (the ``+- 9.1e-17`` of five copied rows).

    Parameters
    ----------
    fit
        A fit of one kind of rows.
    where
        The files, for the message.

    Returns
    -------
    ModelFit
        ``fit``, with ``degenerate`` saying why when its standard errors
        cannot be estimated.

    Raises
    ------
    InputError
        When the distinct rows are too few to determine the values at all.
    """
    if not fit.estimates or not fit.rows:
        return fit
    p = len(fit.estimates)
    per_row = max(len(fit.rows[0].residuals), 1)
    distinct = len({r.measured for r in fit.rows})
    n = len(fit.rows)
    names = " and ".join(e.name for e in fit.estimates)
    if distinct * per_row < p:
        raise InputError(f"{where}: the {n} row{'s' if n != 1 else ''} hold only {distinct} "
                         f"distinct measurement{'s' if distinct != 1 else ''}, too few to "
                         f"determine {names}; measure at other speeds and angles")
    why = ""
    if distinct * per_row == p:
        why = (f"the {n} rows hold only {distinct} distinct measurement"
               f"{'s' if distinct != 1 else ''}: the fit passes through "
               f"{'it' if distinct == 1 else 'them'} exactly and its standard errors cannot "
               "be estimated; measure more shots, at other speeds and angles")
    else:
        scale = [max(abs(v) for _k, v in r.predicted) for r in fit.rows]
        if all(abs(res) <= ZERO_SPREAD_RELATIVE * max(sc, 1e-300)
               for r, sc in zip(fit.rows, scale, strict=True) for res in r.residuals):
            why = ("the fit reproduces every row to rounding (residual spread zero), as only "
                   "copied or made-up rows do: its standard errors cannot be estimated; "
                   "measure the shots one by one")
    return dataclasses.replace(fit, degenerate=why) if why else fit


def _choose_restitution(data: ReboundData, model: str, defaults: Physics
                        ) -> tuple[ModelFit, tuple[ModelFit, ...], list[str]]:
    """Fit the requested restitution model (or pick one for ``auto``)."""
    n = len(data.rows)
    where = _where(data.rows)
    need = REBOUND_MIN_ROWS["linear" if model == "linear" else "constant"]
    if n < need:
        raise InputError(f"{where}: {n} rebound row{'s' if n != 1 else ''}; a "
                         f"{'linear' if model == 'linear' else 'constant'}-restitution fit "
                         f"needs at least {need} (more rows give smaller standard errors)")
    spread = float(np.max(data.v_n) / max(float(np.min(data.v_n)), 1e-12))
    if model == "linear" and spread < 1.5:
        raise InputError(f"{where}: the normal speeds of the rebound rows span only a factor "
                         f"{spread:.2f} ({np.min(data.v_n):.2f} to {np.max(data.v_n):.2f} m/s); "
                         "a restitution that changes with speed needs at least a factor 1.5: "
                         "add slower and faster rebounds or use --restitution constant")
    if model == "constant":
        fit, notes = _rebound_fit(data, "constant", defaults)
        return fit, (), notes + ["restitution model: constant (asked for)"]
    if model == "linear":
        fit, notes = _rebound_fit(data, "linear", defaults)
        return fit, (), notes + ["restitution model: linear (asked for)"]
    const, notes_c = _rebound_fit(data, "constant", defaults)
    if n < REBOUND_MIN_ROWS["linear"] or spread < 1.5:
        return const, (), notes_c + [
            "restitution model: constant (auto: too few rows or too narrow a range of normal "
            "speeds to fit a slope)"]
    lin, notes_l = _rebound_fit(data, "linear", defaults)
    s = lin.estimate("cushion_restitution_slope")
    if s is not None and s.value > 2.0 * s.se:
        return lin, (const,), notes_l + [
            f"restitution model: linear (auto: the slope {s.value:.4f} +- {s.se:.4f} per m/s is "
            "more than 2 standard errors above zero)"]
    why = (f"the slope {s.value:.4f} +- {s.se:.4f} per m/s is not more than 2 standard errors "
           "above zero" if s is not None else "the slope is not determined")
    return const, (lin,), notes_c + [f"restitution model: constant (auto: {why})"]


def _fit_kind(kind: str, rows: Sequence[Row], fit_rows: Callable[[Sequence[Row]], Any],
              drop_outliers: bool, min_rows: int) -> KindFit:
    """All rows, the outlier flags, and the fit without the flagged rows."""
    first, alternatives, notes = fit_rows(rows)
    first = degeneracy(first, _where(rows))
    flagged = _flag(first) if len(rows) >= MIN_ROWS_FOR_OUTLIERS else first
    notes = list(notes)
    if len(rows) < MIN_ROWS_FOR_OUTLIERS:
        notes.append(f"outliers: not checked ({len(rows)} rows; the rule needs at least "
                     f"{MIN_ROWS_FOR_OUTLIERS})")
    outliers = [r for r in flagged.rows if r.outlier]
    without = None
    used = "all rows"
    if outliers:
        keep = [row for row, res in zip(rows, flagged.rows, strict=True) if not res.outlier]
        if len(keep) >= min_rows:
            try:
                without, _alt, more = fit_rows(keep)
                without = degeneracy(without, _where(keep))
                notes.extend(f"without outliers: {m}" for m in more)
            except ShotplanError as e:
                notes.append(f"without the outliers the fit fails: {e}")
        else:
            notes.append(f"without the {len(outliers)} outlier rows too few rows remain "
                         f"({len(keep)}, at least {min_rows} needed)")
        if drop_outliers and without is not None:
            used = "without outliers"
        notes.append(
            f"{len(outliers)} outlier row{'s' if len(outliers) > 1 else ''} flagged "
            f"(modified z-score above {OUTLIER_Z:g}); the profile uses "
            + ("the fit without them (--drop-outliers)" if used == "without outliers"
               else "the fit with all rows (--drop-outliers uses the fit without them)"))
    return KindFit(kind, flagged, without, used, tuple(notes), tuple(alternatives))


# -- roll-out
SLIDING_FRICTION_MAX_RELATIVE_SE = 0.25
"""Roll-outs fit the sliding friction only when the standard error of
``1/mu_s`` (which the distance is linear in) is below this fraction of the
default's ``1/mu_s``; else it keeps its default. Our choice: a stun roll-out
slides for a few per cent of its distance, so the sliding friction is often
lost in the spread of the distances. The test uses the default, not the
estimate, so that it does not favour estimates that happen to come out low
(whose standard errors are smaller)."""


def _rollout_fit(rows: Sequence[RolloutRow], defaults: Physics
                 ) -> tuple[ModelFit, tuple[ModelFit, ...], list[str]]:
    where = _where(rows)
    v = np.array([r.launch_speed_mps for r in rows])
    d = np.array([r.distance_m for r in rows])
    rolling = np.array([r.spin == "follow" for r in rows])
    g = defaults.gravity
    mu_s0 = defaults.cloth_sliding_friction
    both = bool(np.any(rolling)) and bool(np.any(~rolling))
    notes = []
    if not np.any(rolling):
        notes.append("roll-out rows are all stun: the sliding and rolling parts cannot be told "
                     f"apart, so cloth_sliding_friction keeps its default {mu_s0:g} and only "
                     "the rolling resistance is fitted; add rolling (ramp) launches to fit both")
    elif not both:
        notes.append("roll-out rows are all rolling: only the rolling resistance is fitted")
    n = len(rows)
    need = max(3 if both else 2, ROLLOUT_MIN_ROWS)
    if n < max(2, ROLLOUT_MIN_ROWS):
        raise InputError(f"{where}: {n} roll-out row{'s' if n != 1 else ''}; the fit of the "
                         f"rolling resistance needs at least {max(2, ROLLOUT_MIN_ROWS)}")

    def solve(free_sliding: bool) -> tuple[LeastSquaresResult, list[str]]:
        names = (["cloth_sliding_friction"] if free_sliding else []) + [
            "cloth_rolling_resistance"]

        def dist(p: np.ndarray) -> np.ndarray:
            mu_s = float(p[0]) if free_sliding else mu_s0
            return rollout_distance(v, rolling, mu_s, float(p[-1]), g)

        # Start from each row's direct estimate of mu_r (sliding neglected).
        k = np.where(rolling, 0.5, 25.0 / 98.0) * v * v / (g * d)
        start = ([mu_s0] if free_sliding else []) + [float(np.median(k))]
        # Relative residuals: a launch speed off by a fraction puts the
        # distance off by twice that fraction, whatever the distance.
        res = least_squares_fit(lambda p: np.log(dist(p) / d), start,
                                lower=[0.005] * len(names), upper=[2.0] * len(names),
                                scale=[0.1, 0.01][-len(names):])
        return res, names

    res, names = solve(both and n >= need)
    if both and n < need:
        notes.append(f"cloth_sliding_friction keeps its default {mu_s0:g}: {n} roll-out rows, "
                     f"fitting it too needs at least {need}")
    if len(names) == 2:
        se2, _s, _c = standard_errors(res)
        mu_s, se_s = float(res.x[0]), float(se2[0])
        lo, hi, _doc = OVERRIDE_KEYS["cloth_sliding_friction"]
        se_inverse = se_s / max(mu_s, 1e-12) ** 2
        if not lo <= mu_s <= hi or se_inverse > SLIDING_FRICTION_MAX_RELATIVE_SE / mu_s0:
            notes.append(
                "cloth_sliding_friction keeps its default "
                f"{mu_s0:g}: the stun rows do not pin it down (fitted {mu_s:.3g} +- "
                f"{se_s:.2g}; the fit takes it only when 1/mu_s is known to "
                f"{100 * SLIDING_FRICTION_MAX_RELATIVE_SE:.0f} % of the default's). A stun "
                "roll-out slides for only a few per cent of its distance; faster stun launches "
                "and more of them say more")
            res, names = solve(False)
    if undetermined(res.jacobian):
        raise InputError(f"{where}: the roll-out rows do not determine "
                         f"{' and '.join(names)}; vary the launch speed")
    se, sigma, cov = standard_errors(res)
    dd = np.sqrt(np.maximum(np.diag(cov), 1e-300))
    mu_s_used = float(res.x[0]) if len(names) == 2 else mu_s0
    pred = rollout_distance(v, rolling, mu_s_used, float(res.x[-1]), g)
    resid = pred - d
    z = modified_z(np.log(pred / d), 1.0)
    out_rows = tuple(
        RowResult("rollout", r.file, r.line,
                  (("launch_speed_mps", r.launch_speed_mps), ("distance_m", r.distance_m),
                   ("spin", r.spin)),
                  (("distance_m", float(pred[i])),), (float(resid[i]),), (float(z[i]),))
        for i, r in enumerate(rows))
    model = ("d = 12 v^2/(49 mu_s g) + (5/7 v)^2/(2 mu_r g) (stun), v^2/(2 mu_r g) (follow)")
    fixed = ((("cloth_sliding_friction", mu_s0),) if len(names) == 1 and np.any(~rolling)
             else ())
    fit = ModelFit("rollout", model,
                   tuple(Estimate(nm, float(x), float(s))
                         for nm, x, s in zip(names, res.x, se, strict=True)),
                   fixed, out_rows, float(2 * res.cost), sigma, n - len(names),
                   "m (distance; fitted as a relative difference)",
                   res.iterations, tuple(tuple(float(c) for c in row)
                                         for row in cov / np.outer(dd, dd)),
                   (("distance_relative", sigma),))
    for e in fit.estimates:
        lo, hi, _doc = OVERRIDE_KEYS[e.name]
        if not lo <= e.value <= hi:
            raise InputError(f"{where}: the roll-out rows give {e.name} = {e.value:.4g}, outside "
                             f"the valid {lo:g} to {hi:g}; check the units (m/s and m) and "
                             "the spin column")
    return fit, (), notes


# -- rebound test
def _test_rows(fit_rows: Sequence[ReboundTestRow], lengths: np.ndarray,
               speeds: np.ndarray) -> tuple[RowResult, ...]:
    resid = lengths - np.array([r.table_lengths for r in fit_rows])
    z = modified_z(resid, float(np.median(lengths)))
    return tuple(
        RowResult("rebound_test", r.file, r.line,
                  (("launch_speed_mps", r.launch_speed_mps), ("table_lengths", r.table_lengths)),
                  (("table_lengths", float(lengths[i])),), (float(resid[i]),), (float(z[i]),))
        for i, r in enumerate(fit_rows))


def _rebound_test_fit(rows: Sequence[ReboundTestRow], spec: TableSpec, physics: Physics,
                      progress: Progress | None) -> tuple[ModelFit, tuple[ModelFit, ...],
                                                          list[str]]:
    where = _where(rows)
    n = len(rows)
    if n < REBOUND_TEST_MIN_ROWS:
        raise InputError(f"{where}: {n} rebound-test row{'s' if n != 1 else ''}; fitting the "
                         f"restitution from it needs at least {REBOUND_TEST_MIN_ROWS}")
    speeds = np.array([r.launch_speed_mps for r in rows])
    measured = np.array([r.table_lengths for r in rows])
    table = table_geometry(spec)

    def lengths(e0: float) -> np.ndarray:
        ph = dataclasses.replace(physics, cushion_restitution=float(e0))
        return np.array([standard_rebound_test(spec, ph, float(v), table).table_lengths
                         for v in speeds])

    top = lengths(1.0)
    if np.all(top < measured):
        raise InputError(f"{where}: even a perfectly elastic cushion gives only "
                         f"{np.max(top):.2f} table lengths at these speeds on this cloth, less "
                         "than measured; check the launch speeds and the cloth values")
    res = least_squares_fit(lambda p: lengths(float(p[0])) - measured,
                            [physics.cushion_restitution], lower=[0.05], upper=[1.0], scale=[1.0],
                            max_evaluations=60, progress=progress)
    if undetermined(res.jacobian):
        raise InputError(f"{where}: the rebound-test rows do not determine the restitution")
    se, sigma, _cov = standard_errors(res)
    e0 = float(res.x[0])
    pred = lengths(e0)
    notes = ["cushion_restitution fitted from the rebound-test rows alone (no rebound rows): a "
             f"constant restitution, with cushion_friction {physics.cushion_friction:g} and "
             f"slope {physics.cushion_restitution_slope:g} at their defaults"]
    if e0 >= 1.0 - 1e-9:
        notes.append("the fit reached restitution 1 (its upper bound): the cushions return the "
                     "ball as well as the model can; its standard error is not meaningful")
    fit = ModelFit("rebound_test", "table lengths simulated from the head spot (constant e)",
                   (Estimate("cushion_restitution", e0, float(se[0])),),
                   (("cushion_friction", physics.cushion_friction),
                    ("cushion_restitution_slope", physics.cushion_restitution_slope)),
                   _test_rows(rows, pred, speeds), float(2 * res.cost), sigma, n - 1,
                   "table lengths", res.iterations, ((1.0,),))
    return fit, (), notes


def rebound_test_check(rows: Sequence[ReboundTestRow], spec: TableSpec,
                        physics: Physics) -> KindFit:
    """Rebound-test rows against a fitted table (a check, no fit).

    Parameters
    ----------
    rows
        The rebound-test rows.
    spec, physics
        The fitted table and its physics.

    Returns
    -------
    KindFit
        The simulated table lengths and the residuals (simulated minus
        measured), no estimates.
    """
    speeds = np.array([r.launch_speed_mps for r in rows])
    table = table_geometry(spec)
    pred = np.array([standard_rebound_test(spec, physics, float(v), table).table_lengths
                     for v in speeds])
    out = _test_rows(rows, pred, speeds)
    resid = np.array([r.residuals[0] for r in out])
    rss = float(resid @ resid)
    fit = ModelFit("rebound_test", "check: table lengths simulated with the fitted profile", (),
                   (), out, rss, math.sqrt(rss / len(rows)), len(rows), "table lengths")
    return KindFit("rebound_test", fit, None, "all rows",
                   ("rebound-test rows are a check here (the rebound rows fit the cushion): "
                    "residuals are the profile's simulated table lengths minus the measured",))


def _check_fit_options(restitution: str, preset: str, firm_speed_mps: float) -> None:
    if restitution not in RESTITUTION_MODELS:
        raise InputError(f"{restitution!r} is not a restitution model, must be one of "
                         f"{', '.join(RESTITUTION_MODELS)}")
    if preset not in PRESETS:
        raise InputError(f"{preset!r} is not a table preset, must be one of {', '.join(PRESETS)}")
    if not 0.0 < firm_speed_mps <= 15.0:
        raise InputError(f"firm speed {firm_speed_mps!r} m/s is out of range, must be above 0 "
                         "and at most 15")


def fit_measurements(
    measurements: Measurements,
    preset: str = "pool-9ft",
    *,
    restitution: str = "auto",
    drop_outliers: bool = False,
    firm_speed_mps: float = FIRM_STROKE_MPS,
    progress: Progress | None = None,
) -> FitResult:
    """Fit cushion and cloth values to measurements.

    Parameters
    ----------
    measurements
        Rows from :func:`read_measurements`.
    preset
        Table preset the measurements were taken on (its ball and nose height
        enter the cushion law, its length the rebound test).
    restitution
        ``auto``, ``constant`` or ``linear`` (see the module docstring).
    drop_outliers
        Use the fits without the flagged rows (both are always reported).
    firm_speed_mps
        Speed of the simulated standard rebound test.
    progress
        Called as ``progress(done, total)`` (thousandths of the work).

    Returns
    -------
    FitResult
        Every fit and check, the notes, the standard rebound test simulated
        on the fitted table; :meth:`FitResult.profile_dict` is the profile.

    Raises
    ------
    InputError
        Too few rows of a kind, rows that do not determine a value, or values
        the rows imply that no cushion or cloth can have.
    """
    _check_fit_options(restitution, preset, firm_speed_mps)
    base = TableSpec.preset(preset)
    defaults = Physics.for_table(base)
    m = measurements
    if m.n_rows == 0:
        raise InputError("no measurement rows to fit")

    def step(frac: float) -> None:
        report_fraction(progress, frac)

    rollout = None
    spec = base
    if m.rollouts:
        step(0.0)
        rollout = _fit_kind("rollout", m.rollouts,
                            lambda rows: _rollout_fit(rows, defaults),  # type: ignore[arg-type]
                            drop_outliers,
                            ROLLOUT_MIN_ROWS)
        spec = spec.with_overrides({e.name: e.value for e in rollout.chosen.estimates},
                                   where="roll-out fit")
    rebound = None
    if m.rebounds:
        step(0.2)

        def fit_rebounds(rows: Sequence[Row]) -> Any:
            data = ReboundData(rows, base)  # type: ignore[arg-type]
            fit, alts, notes = _choose_restitution(data, restitution, defaults)
            _check_rebound_values(fit, rows)  # type: ignore[arg-type]
            return fit, alts, notes

        rebound = _fit_kind("rebound", m.rebounds, fit_rebounds, drop_outliers,
                            REBOUND_MIN_ROWS["constant"])
        est = {e.name: e.value for e in rebound.chosen.estimates}
        est.setdefault("cushion_restitution_slope", 0.0)
        spec = spec.with_overrides(est, where="rebound fit")
    test = None
    if m.rebound_tests:
        phys = Physics.for_table(spec)
        if rebound is None:
            def sub(done: int, total: int) -> None:
                step(0.4 + 0.5 * done / max(total, 1))

            test = _fit_kind("rebound_test", m.rebound_tests,
                             lambda rows: _rebound_test_fit(rows, spec, phys,  # type: ignore[arg-type]
                                                            sub),
                             drop_outliers, REBOUND_TEST_MIN_ROWS)
            e0 = test.chosen.estimates[0].value
            spec = spec.with_overrides({"cushion_restitution": e0}, where="rebound-test fit")
        else:
            step(0.6)
            test = rebound_test_check(m.rebound_tests, spec, phys)
    result = FitResult(preset, m.files, rebound, rollout, test, m)
    try:
        final = result.spec()
    except LayoutError as e:  # a value outside the table's valid ranges
        raise InputError(f"{_where_all(m)}: the fitted values are not a valid table ({e})") from None
    step(0.9)
    simulated = standard_rebound_test(final, Physics.for_table(final), firm_speed_mps)
    notes = [n for kf in (rollout, rebound, test) if kf is not None for n in kf.notes]
    step(1.0)
    return FitResult(preset, m.files, rebound, rollout, test, m, firm_speed_mps, simulated,
                     tuple(notes))


def _where_all(m: Measurements) -> str:
    return ", ".join(f for f, _k in m.files) or "measurements"
