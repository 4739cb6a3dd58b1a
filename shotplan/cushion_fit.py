"""Cushion and cloth measurements: fitted restitution and friction, a table profile.

For table builders and mechanics who re-rubber cushions and re-cover cloth.
Measurements come in CSV files; a fit turns them into the numbers the
simulator uses, and a *table profile* carries those numbers to every other
command (a layout whose ``table`` is the profile's ``table`` object simulates
that table).

Measurement files
-----------------
CSV, UTF-8, comma-separated, one header line of column names, then one line
per measurement. Lines that start with ``#`` are comments and blank lines are
skipped. Every column name carries its unit; numbers use a decimal point.
A file holds one kind of measurement, and **its columns say which kind**:

``rebound`` (a row per rebound off one cushion)
    ``speed_in_mps, angle_in_deg, speed_out_mps, angle_out_deg`` and the
    optional ``spin``. Speeds just before and just after the impact (time
    the ball between marks close to the cushion: once it leaves, the cloth
    bends its path while it slides); angles from the cushion line, above 0
    and at most 90 (90 is straight in); ``spin`` is ``stun`` (no spin at the
    cushion) or ``rolling`` (natural roll), ``rolling`` where the column is
    missing.
``rollout`` (a row per roll-out on the cloth)
    ``launch_speed_mps, distance_m`` and the optional ``spin``: the speed
    the ball starts with and the distance it covers to rest. ``rolling``
    (the default: a ramp launch) rolls from the start; ``stun`` (a
    centre-ball hit) slides first.
``rebound_test`` (the standard's cushion rebound test)
    ``launch_speed_mps, table_lengths``: a centre-ball stroke from the head
    spot through the foot spot, and how many table lengths the ball travels
    to rest.

Any kind may add a free-text ``note`` column. The files a fit reads may mix
kinds (one kind per file).

Models
------
Rebounds are fitted *through the simulator's own cushion law*
(:func:`shotplan.physics.collide.ball_cushion`): each row's incoming state
(speed, angle, stun or rolling spin) is put through the law and the
outgoing velocity compared with the measured one, by least squares on the
two outgoing components (along the cushion and away from it, m/s). The
restitution is ``constant`` (``e = e0``) or ``linear`` in the normal speed
(``e = e0 - slope * v_n``, the law's own form, floored at 0.05); ``auto``
takes the linear model when its slope is more than two standard errors above
zero, else the constant one. Cushion friction is fitted with it; when no row
slides at the cushion through the impact, friction cannot be told from the
rows and keeps its default (said in the notes, not written to the profile).

Roll-outs use the simulator's motion law in closed form: rolling from the
start ``d = v^2 / (2 mu_r g)``; from a stun launch the ball slides
``12 v^2 / (49 mu_s g)`` and leaves the slide at ``5/7 v`` (solid sphere), so
``d = 12 v^2 / (49 mu_s g) + (5/7 v)^2 / (2 mu_r g)``. Rolling rows give
``mu_r``; stun and rolling rows together give ``mu_s`` too; stun rows alone
give ``mu_r`` with ``mu_s`` at its default.

Rebound-test rows are simulated (:func:`standard_rebound_test`). Without
rebound rows they fit a constant restitution (cushion friction and slope at
their defaults); with rebound rows they are a check of the fitted profile.

Least squares is :func:`levenberg_marquardt` (numpy only), with standard
errors from the Jacobian, ``sigma^2 (J^T J)^-1`` with ``sigma^2 = RSS / (m - p)``.

Outliers
--------
A row is flagged when one of its residuals has a modified z-score
``0.6745 |r - median(r)| / MAD`` above 3.5 (Iglewicz and Hoaglin's rule,
*How to Detect and Handle Outliers*, 1993; robust, so a wild row cannot
hide itself by inflating the spread), with at least 6 rows of that kind.
Flagged rows are never dropped silently: each kind is fitted with all rows
and again without the flagged ones, both are reported, and the fit with all
rows is the one used unless ``drop_outliers`` is asked for.

Table profile
-------------
A JSON file::

    {"format": "shotplan-table-profile", "version": 1,
     "table": {"preset": "pool-9ft", "cushion_restitution": 0.9, ...},
     "fit": {...standard errors, residuals, files, the measured rows...}}

Its ``table`` object holds only keys of
:data:`shotplan.equipment.OVERRIDE_KEYS`, so it can be pasted as a layout's
``table``; ``fit`` is for people and for :func:`profile_report`.
"""

from __future__ import annotations

import csv
import dataclasses
import math
import os
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np

from .equipment import OVERRIDE_KEYS, PRESETS, TableSpec
from .errors import InputError, LayoutError, ShotplanError
from .fileio import read_limited
from .physics.params import Physics

__all__ = [
    "PROFILE_FORMAT",
    "PROFILE_VERSION",
    "KINDS",
    "COLUMNS",
    "SPINS",
    "DEFAULT_SPIN",
    "RESTITUTION_MODELS",
    "OUTLIER_Z",
    "MIN_ROWS_FOR_OUTLIERS",
    "STANDARD_MIN_LENGTHS",
    "STANDARD_MAX_LENGTHS",
    "FIRM_STROKE_MPS",
    "BANK_SPEED_MPS",
    "CAUTIONS",
    "SLATE_9FT_KG",
    "SLATE_9FT_LB",
    "EXTRAPOLATED",
    "measured_up_to",
    "MAX_ROWS",
    "ZERO_SPREAD_RELATIVE",
    "ReboundRow",
    "RolloutRow",
    "ReboundTestRow",
    "Measurements",
    "read_measurement_file",
    "read_measurements",
    "LeastSquaresResult",
    "levenberg_marquardt",
    "numerical_jacobian",
    "standard_errors",
    "rebound_predictions",
    "rollout_distance",
    "ReboundTest",
    "standard_rebound_test",
    "speed_for_lengths",
    "Estimate",
    "RowResult",
    "ModelFit",
    "KindFit",
    "FitResult",
    "fit_measurements",
    "Profile",
    "load_profile",
    "profile_from_dict",
    "write_profile",
    "finite_json",
    "ReboundCurve",
    "BankComparison",
    "ReboundTestComparison",
    "ProfileReport",
    "bank_layout",
    "profile_report",
]

Progress = Callable[[float, str], None]
"""A progress callback: fraction done (0 to 1) and what is being done."""

PROFILE_FORMAT = "shotplan-table-profile"
"""The value of a table profile's ``format`` field."""

PROFILE_VERSION = 1
"""The profile version this module reads and writes."""

SPINS = ("stun", "rolling")
"""Spin words of the ``spin`` column."""

DEFAULT_SPIN = "rolling"
"""Spin of rows in files without a ``spin`` column (a ramp launch rolls)."""

RESTITUTION_MODELS = ("auto", "constant", "linear")
"""Restitution model choices of :func:`fit_measurements`."""

OUTLIER_Z = 3.5
"""Modified z-score above which a residual flags its row (Iglewicz and
Hoaglin 1993)."""

MIN_ROWS_FOR_OUTLIERS = 6
"""Fewest rows of a kind for outlier flags: the median absolute deviation of
fewer residuals says too little about their spread (common practice, no source)."""

STANDARD_MIN_LENGTHS = 4.0
"""The standard's rebound test: a firm centre-ball stroke from the head spot
through the foot spot travels at least 4 to 4.5 table lengths (WPA,
tournament table specifications). The lower figure is the pass mark here."""

STANDARD_MAX_LENGTHS = 4.5
"""The upper figure of the standard's "4 to 4.5 table lengths" (WPA)."""

FIRM_STROKE_MPS = 5.5
"""Launch speed taken for the standard's "firm" stroke, m/s. The standard
gives no speed; this is in the upper ``power`` band of
:func:`shotplan.stroke.speed_word` (3.6-6 m/s), about half a hard break:
our reading, not a figure from the standard. Reports also give the speed a
table needs to pass."""

BANK_SPEED_MPS = 3.0
"""Launch speed of the one-rail bank compared in reports, m/s (a ``fast``
bank: common practice, no source). The same speed on both tables, so the
aims differ by the cushion alone."""

REBOUND_MIN_ROWS = {"constant": 3, "linear": 4}
"""Fewest rebound rows for each restitution model (two residuals a row: at
least two more residuals than parameters, our choice)."""

ROLLOUT_MIN_ROWS = 2
"""Fewest roll-out rows (for a standard error, more rows than parameters)."""

REBOUND_TEST_MIN_ROWS = 2
"""Fewest rebound-test rows."""

MAX_FILE_BYTES = 10 * 1024 * 1024
"""Largest measurement file read (10 MB is far more than any test series)."""

MAX_ROWS = 10_000
"""Most data rows read, over all the files of one fit. Our choice: a day at
the table gives a few hundred rows; every rebound row costs the fit a pass
through the cushion law per step, so 10,000 rows fit in about 15 s (measured
on a 2-core machine), where 300,000 took minutes. More rows are refused in one line before any fitting."""

SLATE_DENSITY_KG_M3 = 2750.0
"""Density of slate, kg/m^3 (from memory: 2.7 to 2.8 t/m^3)."""

SLATE_9FT_IN = (111.0, 61.0, 1.0)
"""Size of a 9-ft table's slate, inches: the 100 x 50 in bed and the slate
under the rails, 1 inch thick (from memory)."""

SLATE_9FT_KG = 300
"""Weight of the three-piece 1-inch slate of a 9-ft table, kg, rounded: the
size above at the density above is 111 x 61 x 1 in^3 = 0.111 m^3, 305 kg
(from memory, as its inputs). The one figure the report's cautions and the
README quote (a test holds the README to it)."""

SLATE_9FT_LB = 670
"""The same weight in pounds, rounded (305 kg / 0.4536 kg/lb = 672 lb)."""

CAUTIONS: tuple[str, ...] = (
    "This tool only computes; it gives no instructions for table work. Follow the "
    "cushion, cloth and table maker's instructions, and leave slate and rail work to "
    "trained, licensed installers where local practice or law asks for them.",
    f"Slate is heavy: the three-piece 1-inch slate of a 9-ft table weighs about "
    f"{SLATE_9FT_LB} lb ({SLATE_9FT_KG} kg) in all (from memory). "
    "Lift with enough people and proper "
    "equipment, and never work under a raised slate or rail without support.",
    "Contact cements used for cushion rubber and cloth are often solvent-based and "
    "flammable: ventilate the room, keep flames and sparks away, wear the gloves and "
    "respiratory protection the cement's safety data sheet names, and follow its "
    "drying times.",
    "Sharp tools (trimming knives, staple guns) and tensioned cloth need care; keep "
    "children and bystanders away while the table is apart.",
)
"""Cautions printed with every report and in the README."""

# ------------------------------------------------------------------ columns
COLUMNS: dict[str, str] = {
    "speed_in_mps": "speed just before the cushion, m/s",
    "angle_in_deg": "incoming angle from the cushion line, degrees",
    "speed_out_mps": "speed just after the cushion, m/s",
    "angle_out_deg": "outgoing angle from the cushion line, degrees",
    "launch_speed_mps": "launch speed, m/s",
    "distance_m": "distance from the launch to rest, m",
    "table_lengths": "distance travelled to rest, in table lengths",
    "spin": "stun or rolling",
    "note": "free text",
}
"""Every column a measurement file may have, with its meaning and unit."""

KINDS: dict[str, tuple[tuple[str, ...], tuple[str, ...]]] = {
    "rebound": (("speed_in_mps", "angle_in_deg", "speed_out_mps", "angle_out_deg"),
                ("spin", "note")),
    "rollout": (("launch_speed_mps", "distance_m"), ("spin", "note")),
    "rebound_test": (("launch_speed_mps", "table_lengths"), ("note",)),
}
"""Kinds of measurement file: (required columns, optional columns)."""

_KIND_WORDS = {"rebound": "rebound", "rollout": "roll-out", "rebound_test": "rebound-test"}

# base name -> (unit suffix, unit in words) for the columns that carry units
_UNITS = {
    "speed_in": ("mps", "m/s"),
    "speed_out": ("mps", "m/s"),
    "launch_speed": ("mps", "m/s"),
    "angle_in": ("deg", "degrees"),
    "angle_out": ("deg", "degrees"),
    "distance": ("m", "metres"),
}

# column -> (lowest, highest, lowest allowed itself?, what is valid)
_RANGES = {
    "speed_in_mps": (0.0, 15.0, False, "a speed above 0 and at most 15 m/s"),
    "speed_out_mps": (0.0, 15.0, False, "a speed above 0 and at most 15 m/s"),
    "launch_speed_mps": (0.0, 15.0, False, "a speed above 0 and at most 15 m/s"),
    "angle_in_deg": (0.0, 90.0, False,
                     "an angle from the cushion line above 0 and at most 90 degrees"),
    "angle_out_deg": (0.0, 90.0, False,
                      "an angle from the cushion line above 0 and at most 90 degrees"),
    "distance_m": (0.0, 100.0, False, "a distance above 0 and at most 100 m"),
    "table_lengths": (0.0, 50.0, False, "a number of table lengths above 0 and at most 50"),
}


# ------------------------------------------------------------ measurement rows
@dataclass(frozen=True, slots=True)
class ReboundRow:
    """One measured rebound off a cushion."""

    speed_in_mps: float
    """Speed just before the impact, m/s."""
    angle_in_deg: float
    """Incoming angle from the cushion line, degrees (90 is straight in)."""
    speed_out_mps: float
    """Speed just after the impact, m/s."""
    angle_out_deg: float
    """Outgoing angle from the cushion line, degrees."""
    spin: str = DEFAULT_SPIN
    """``stun`` or ``rolling``: the ball's spin as it meets the cushion."""
    file: str = ""
    """File the row came from."""
    line: int = 0
    """Line of the file (1 is the first line)."""


@dataclass(frozen=True, slots=True)
class RolloutRow:
    """One roll-out: launch speed and distance to rest."""

    launch_speed_mps: float
    """Launch speed, m/s."""
    distance_m: float
    """Distance from the launch point to rest, m."""
    spin: str = DEFAULT_SPIN
    """``rolling`` (rolls from the start) or ``stun`` (slides first)."""
    file: str = ""
    """File the row came from."""
    line: int = 0
    """Line of the file."""


@dataclass(frozen=True, slots=True)
class ReboundTestRow:
    """One run of the standard's rebound test."""

    launch_speed_mps: float
    """Launch speed of the centre-ball stroke from the head spot, m/s."""
    table_lengths: float
    """Distance travelled to rest, in table lengths."""
    file: str = ""
    """File the row came from."""
    line: int = 0
    """Line of the file."""


Row = ReboundRow | RolloutRow | ReboundTestRow


@dataclass(frozen=True, slots=True)
class Measurements:
    """Every row read, by kind, and the files they came from."""

    rebounds: tuple[ReboundRow, ...] = ()
    """Rebound rows."""
    rollouts: tuple[RolloutRow, ...] = ()
    """Roll-out rows."""
    rebound_tests: tuple[ReboundTestRow, ...] = ()
    """Rebound-test rows."""
    files: tuple[tuple[str, str], ...] = ()
    """(file, kind) of every file read, in order."""

    def __add__(self, other: Measurements) -> Measurements:
        return Measurements(self.rebounds + other.rebounds, self.rollouts + other.rollouts,
                            self.rebound_tests + other.rebound_tests, self.files + other.files)

    @property
    def n_rows(self) -> int:
        """Rows of every kind."""
        return len(self.rebounds) + len(self.rollouts) + len(self.rebound_tests)


def _valid_columns_text() -> str:
    return "; ".join(f"{_KIND_WORDS[k]} files: {','.join(req)}"
                     + (f" (optional {', '.join(opt)})" if opt else "")
                     for k, (req, opt) in KINDS.items())


def _read_text(path: str | os.PathLike[str]) -> str:
    name = str(path)
    data = read_limited(path, MAX_FILE_BYTES, InputError, "measurement file (.csv)",
                        "measurement files")
    if b"\x00" in data:
        raise InputError(f"{name}: not a text file (it holds NUL bytes); measurement files "
                         "are CSV text")
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as e:
        raise InputError(f"{name}: not UTF-8 text (byte 0x{data[e.start]:02x} at offset "
                         f"{e.start}); save the file as UTF-8 CSV") from None


def _split(line: str) -> list[str]:
    return [cell.strip() for cell in next(csv.reader([line]))]


def _check_column(raw: str, where: str) -> str:
    name = raw.strip().lower()
    if name in COLUMNS:
        return name
    if not name:
        raise InputError(f"{where}: an empty column name; valid columns are {_valid_columns_text()}")
    for base, (unit, words) in _UNITS.items():
        if name == base:
            raise InputError(f"{where}: column {raw!r}: units missing from the column name, "
                             f"write it as '{base}_{unit}' ({words})")
        if name.startswith(base + "_"):
            given = name[len(base) + 1:]
            raise InputError(f"{where}: column {raw!r}: unit {given!r} is not accepted, "
                             f"give {words} as '{base}_{unit}'")
    if name in ("table_length", "lengths", "table_lengths_count"):
        raise InputError(f"{where}: column {raw!r}: write it as 'table_lengths'")
    raise InputError(f"{where}: unknown column {raw!r}; valid columns are {_valid_columns_text()}")


def _kind_of(columns: list[str], where: str) -> str:
    present = set(columns)
    if present & {"speed_in_mps", "angle_in_deg", "speed_out_mps", "angle_out_deg"}:
        kind = "rebound"
    elif "table_lengths" in present:
        kind = "rebound_test"
    elif present & {"launch_speed_mps", "distance_m"}:
        kind = "rollout"
    else:
        raise InputError(f"{where}: the columns {','.join(columns)} say no kind of measurement; "
                         f"valid columns are {_valid_columns_text()}")
    required, optional = KINDS[kind]
    missing = [c for c in required if c not in present]
    if missing:
        raise InputError(f"{where}: missing column{'s' if len(missing) > 1 else ''} "
                         f"{', '.join(repr(m) for m in missing)} for a {_KIND_WORDS[kind]} file, "
                         f"which needs {','.join(required)}"
                         + (f" (optional {', '.join(optional)})" if optional else ""))
    extra = [c for c in columns if c not in required and c not in optional]
    if extra:
        raise InputError(f"{where}: column {extra[0]!r} does not belong in a "
                         f"{_KIND_WORDS[kind]} file (one kind of measurement per file), which "
                         f"has {','.join(required)}"
                         + (f" (optional {', '.join(optional)})" if optional else ""))
    return kind


def _number(text: str, column: str, where: str) -> float:
    lo, hi, lo_ok, valid = _RANGES[column]
    if text == "":
        raise InputError(f"{where}, column '{column}': empty, must be {valid}")
    try:
        value = float(text)
    except ValueError:
        raise InputError(f"{where}, column '{column}': {text!r} is not a number, "
                         f"must be {valid}") from None
    if not math.isfinite(value):
        raise InputError(f"{where}, column '{column}': {text!r} is not a finite number, "
                         f"must be {valid}")
    if value < 0 and lo >= 0:
        raise InputError(f"{where}, column '{column}': {text} is negative, must be {valid}")
    if value < lo or (value == lo and not lo_ok) or value > hi:
        raise InputError(f"{where}, column '{column}': {text} is out of range, must be {valid}")
    return value


def read_measurement_file(path: str | os.PathLike[str]) -> Measurements:
    """Read one measurement file (kind from its columns, see the module docstring).

    Raises
    ------
    InputError
        One line naming the file, the line and row, the column, the problem
        and what is valid: a missing file, a folder, an empty file, a column
        without its unit, a missing column, a non-number, a negative speed,
        an angle out of range, a file without data rows...
    """
    name = str(path)
    text = _read_text(path)
    header: list[str] | None = None
    kind = ""
    header_line = 0
    rows: list[Row] = []
    for lineno, raw in enumerate(text.splitlines(), start=1):
        line = raw.strip()
        if not line or line.startswith("#"):
            continue
        if header is None:
            where = f"{name}: line {lineno} (header)"
            cells = _split(line)
            if len(cells) == 1 and (";" in cells[0] or "\t" in cells[0]):
                raise InputError(f"{where}: columns must be separated by commas, not "
                                 f"{'semicolons' if ';' in cells[0] else 'tabs'}")
            header = [_check_column(c, where) for c in cells]
            seen: set[str] = set()
            for c in header:
                if c in seen:
                    raise InputError(f"{where}: column {c!r} appears twice")
                seen.add(c)
            kind = _kind_of(header, where)
            header_line = lineno
            continue
        n_row = len(rows) + 1
        where = f"{name}: line {lineno} (row {n_row})"
        if n_row > MAX_ROWS:
            raise InputError(f"{where}: more than {MAX_ROWS:,} data rows; a fit takes at most "
                             f"{MAX_ROWS:,} (split the file, or keep a sample of the rows)")
        cells = _split(line)
        if len(cells) != len(header):
            raise InputError(f"{where}: {len(cells)} value{'s' if len(cells) != 1 else ''}, "
                             f"the header has {len(header)} columns ({','.join(header)})")
        values = dict(zip(header, cells, strict=True))
        spin = DEFAULT_SPIN
        if "spin" in values:
            spin = values["spin"].lower()
            if spin not in SPINS:
                raise InputError(f"{where}, column 'spin': {values['spin']!r} is not a spin, "
                                 f"must be one of {', '.join(SPINS)}")
        nums = {c: _number(values[c], c, where) for c in header if c in _RANGES}
        if kind == "rebound":
            rows.append(ReboundRow(nums["speed_in_mps"], nums["angle_in_deg"],
                                   nums["speed_out_mps"], nums["angle_out_deg"], spin,
                                   name, lineno))
        elif kind == "rollout":
            rows.append(RolloutRow(nums["launch_speed_mps"], nums["distance_m"], spin,
                                   name, lineno))
        else:
            rows.append(ReboundTestRow(nums["launch_speed_mps"], nums["table_lengths"],
                                       name, lineno))
    if header is None:
        raise InputError(f"{name}: the file is empty, expected a header line of column names "
                         f"({_valid_columns_text()}) and a line per measurement")
    if not rows:
        raise InputError(f"{name}: no data rows after the header (line {header_line}); add a "
                         "line per measurement")
    if kind == "rebound":
        return Measurements(rebounds=tuple(rows), files=((name, kind),))  # type: ignore[arg-type]
    if kind == "rollout":
        return Measurements(rollouts=tuple(rows), files=((name, kind),))  # type: ignore[arg-type]
    return Measurements(rebound_tests=tuple(rows), files=((name, kind),))  # type: ignore[arg-type]


def read_measurements(paths: Sequence[str | os.PathLike[str]]) -> Measurements:
    """Read several measurement files (each of one kind) into one set of rows."""
    if not paths:
        raise InputError("no measurement file given: give at least one .csv file")
    out = Measurements()
    for p in paths:
        out = out + read_measurement_file(p)
        if out.n_rows > MAX_ROWS:
            raise InputError(f"{p}: the files hold {out.n_rows:,} data rows so far; a fit takes "
                             f"at most {MAX_ROWS:,} over all its files (keep a sample of the "
                             "rows)")
    return out


# --------------------------------------------------------------- least squares
@dataclass(frozen=True, eq=False)
class LeastSquaresResult:
    """The outcome of :func:`levenberg_marquardt`."""

    x: np.ndarray
    """The parameters at the minimum."""
    residuals: np.ndarray
    """Residuals at ``x``."""
    jacobian: np.ndarray
    """Jacobian of the residuals at ``x`` (numerical)."""
    cost: float
    """Half the sum of squared residuals (as ``scipy.optimize.least_squares``)."""
    iterations: int
    """Accepted steps."""
    evaluations: int
    """Residual evaluations, the Jacobian's included."""
    converged: bool
    """Whether a convergence test was met (not the iteration limit)."""
    message: str
    """Which test stopped it."""


def numerical_jacobian(fun: Callable[[np.ndarray], np.ndarray], x: np.ndarray,
                       scale: np.ndarray, lower: np.ndarray, upper: np.ndarray,
                       rel_step: float = 6e-6) -> np.ndarray:
    """Central-difference Jacobian of ``fun`` at ``x`` (one-sided at a bound).

    The step of parameter j is ``rel_step * max(|x_j|, scale_j)``; 6e-6 is
    about the cube root of the double-precision epsilon, the usual choice
    for central differences (common practice, no source).
    """
    x = np.asarray(x, dtype=float)
    cols = []
    for j in range(len(x)):
        h = rel_step * max(abs(x[j]), scale[j])
        up = x.copy()
        dn = x.copy()
        if x[j] + h > upper[j]:
            up[j] = x[j]
            dn[j] = x[j] - h
            d = h
        elif x[j] - h < lower[j]:
            up[j] = x[j] + h
            dn[j] = x[j]
            d = h
        else:
            up[j] = x[j] + h
            dn[j] = x[j] - h
            d = 2 * h
        cols.append((np.asarray(fun(up), dtype=float) - np.asarray(fun(dn), dtype=float)) / d)
    return np.column_stack(cols)


def levenberg_marquardt(
    fun: Callable[[np.ndarray], np.ndarray],
    x0: Sequence[float],
    *,
    lower: Sequence[float] | None = None,
    upper: Sequence[float] | None = None,
    scale: Sequence[float] | None = None,
    max_iterations: int = 200,
    ftol: float = 1e-12,
    xtol: float = 1e-12,
    gtol: float = 1e-14,
    progress: Progress | None = None,
) -> LeastSquaresResult:
    """Minimise ``0.5 * |fun(x)|^2`` by Levenberg-Marquardt with a numerical Jacobian.

    Marquardt's scaling (the damping multiplies the diagonal of ``J^T J``)
    and Nielsen's update of the damping (H. B. Nielsen, *Damping parameter in
    Marquardt's method*, IMM DTU report, 1999). Parameters are kept inside
    ``[lower, upper]`` by projection; the bounds are for keeping the model
    defined, not for constrained fitting.

    Parameters
    ----------
    fun
        Residuals as a 1-D array for a parameter array.
    x0
        Starting point.
    lower, upper
        Bounds (default unbounded).
    scale
        Typical size of each parameter, for the difference steps (default
        ``max(|x0|, 1e-3)``).
    max_iterations
        Largest number of steps tried.
    ftol, xtol, gtol
        Stop when the cost falls by less than ``ftol`` (relative), the step is
        below ``xtol`` (relative to ``x``), or the gradient below ``gtol``.
    progress
        Called with the fraction of ``max_iterations`` used (a rough guide).
    """
    x = np.array(x0, dtype=float)
    n = len(x)
    lo = np.full(n, -np.inf) if lower is None else np.asarray(lower, dtype=float)
    hi = np.full(n, np.inf) if upper is None else np.asarray(upper, dtype=float)
    sc = np.maximum(np.abs(x), 1e-3) if scale is None else np.asarray(scale, dtype=float)
    x = np.clip(x, lo, hi)
    evals = 0

    def f(p: np.ndarray) -> np.ndarray:
        nonlocal evals
        evals += 1
        r = np.asarray(fun(p), dtype=float).ravel()
        if not np.all(np.isfinite(r)):
            raise InputError("the model gave a non-finite residual; the data are out of the "
                             "model's reach")
        return r

    def jac(p: np.ndarray) -> np.ndarray:
        nonlocal evals
        evals += 2 * n
        return numerical_jacobian(fun, p, sc, lo, hi)

    r = f(x)
    cost = 0.5 * float(r @ r)
    J = jac(x)
    A = J.T @ J
    g = J.T @ r
    mu = 1e-3 * float(max(np.max(np.diag(A)), 1e-300))
    nu = 2.0
    converged = False
    message = "iteration limit reached"
    it = 0
    for k in range(max_iterations):
        if progress is not None:
            progress(k / max_iterations, "fitting")
        if float(np.max(np.abs(g))) <= gtol * max(1.0, cost):
            converged, message = True, "gradient below tolerance"
            break
        d = np.maximum(np.diag(A), 1e-12 * max(float(np.max(np.diag(A))), 1e-300))
        try:
            h = np.linalg.solve(A + mu * np.diag(d), -g)
        except np.linalg.LinAlgError:
            mu *= nu
            nu *= 2.0
            continue
        x_new = np.clip(x + h, lo, hi)
        step = x_new - x
        if float(np.linalg.norm(step)) <= xtol * (float(np.linalg.norm(x)) + xtol):
            converged, message = True, "step below tolerance"
            break
        r_new = f(x_new)
        cost_new = 0.5 * float(r_new @ r_new)
        predicted = -(float(g @ step) + 0.5 * float(step @ A @ step))
        rho = (cost - cost_new) / predicted if predicted > 0 else -1.0
        if rho > 0:
            it += 1
            drop = cost - cost_new
            x, r, cost = x_new, r_new, cost_new
            J = jac(x)
            A = J.T @ J
            g = J.T @ r
            mu *= max(1.0 / 3.0, 1.0 - (2.0 * rho - 1.0) ** 3)
            nu = 2.0
            if drop <= ftol * max(cost, 1e-300):
                converged, message = True, "cost change below tolerance"
                break
        else:
            mu *= nu
            nu *= 2.0
            if mu > 1e30:
                converged, message = True, "no further decrease possible"
                break
    if progress is not None:
        progress(1.0, "fitting")
    return LeastSquaresResult(x, r, J, cost, it, evals, converged, message)


def standard_errors(result: LeastSquaresResult) -> tuple[np.ndarray, float, np.ndarray]:
    """Standard errors, residual sigma and covariance of a fit.

    ``cov = sigma^2 (J^T J)^-1`` with ``sigma^2 = RSS / (m - p)`` (the usual
    linearised least-squares covariance). Raises :class:`InputError` when
    there are no more residuals than parameters.
    """
    J = result.jacobian
    m, p = J.shape
    if m <= p:
        raise InputError(f"{m} residuals for {p} parameters: more measurements are needed "
                         "for standard errors")
    sigma2 = 2.0 * result.cost / (m - p)
    cov = sigma2 * np.linalg.pinv(J.T @ J)
    return np.sqrt(np.maximum(np.diag(cov), 0.0)), math.sqrt(sigma2), cov


def _undetermined(J: np.ndarray) -> list[int]:
    """Parameters the data do not determine: columns of J that are zero, or
    else those in a combination the data cannot see (a near-null direction
    of the column-scaled J, singular value below 1e-7 of the largest)."""
    norms = np.linalg.norm(J, axis=0)
    top = float(np.max(norms)) if len(norms) else 0.0
    zero = [j for j, v in enumerate(norms) if v <= 1e-9 * max(top, 1e-300)]
    if zero or J.shape[1] < 2:
        return zero
    _u, sv, vt = np.linalg.svd(J / norms, full_matrices=False)
    if sv[-1] > 1e-7 * sv[0]:
        return []
    return [j for j, c in enumerate(vt[-1]) if abs(c) > 0.1]


# ------------------------------------------------------------------ models
def _geometry(spec: TableSpec) -> Any:
    from .table import Table

    return Table(spec)


def _law_params(spec: TableSpec) -> np.ndarray:
    from .physics.simulator import _params_vector

    return _params_vector(_geometry(spec), Physics.for_table(spec))


def rebound_predictions(spec: TableSpec, speed_in: Any, angle_in_deg: Any, rolling: Any,
                        restitution: float, slope: float, friction: float,
                        prm: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
    """Velocity and spin right after a cushion impact, by the simulator's law.

    Each ball meets the right rail (the cushion along y = 0) moving toward
    +x at ``angle_in_deg`` from the cushion line, with no spin (stun) or
    natural roll (``rolling`` true); each goes through
    :func:`shotplan.physics.collide.ball_cushion` with the given cushion
    values and the table's ball and nose height.

    Returns
    -------
    velocity : (N, 2) array
        (along the cushion, away from it), m/s.
    spin : (N, 3) array
        Angular velocity, rad/s.
    """
    from .physics.collide import ball_cushion

    if prm is None:
        prm = _law_params(spec)
    v = np.atleast_1d(np.asarray(speed_in, dtype=float))
    a = np.radians(np.atleast_1d(np.asarray(angle_in_deg, dtype=float)))
    roll = np.broadcast_to(np.atleast_1d(np.asarray(rolling, dtype=bool)), v.shape)
    R = spec.ball.radius_m
    vel = np.column_stack([v * np.cos(a), -v * np.sin(a)])
    om = np.zeros((len(v), 3))
    # Natural roll: no slip at the cloth, u = v + R (z x w) = 0.
    om[roll, 0] = -vel[roll, 1] / R
    om[roll, 1] = vel[roll, 0] / R
    pos = np.zeros((len(v), 2))
    e0, k, mu = float(restitution), float(slope), float(friction)
    for i in range(len(v)):
        ball_cushion(i, 0.0, 1.0, pos, vel, om, prm, e0, k, mu)
    return vel, om


def _rolled(vel: np.ndarray, om: np.ndarray, R: float) -> np.ndarray:
    """Velocity once sliding on the cloth has ended: ``v - 2/7 u`` with the
    cloth slip ``u = v + R (z x w)`` (solid sphere, friction along u)."""
    ux = vel[:, 0] - R * om[:, 1]
    uy = vel[:, 1] + R * om[:, 0]
    return np.column_stack([vel[:, 0] - 2.0 / 7.0 * ux, vel[:, 1] - 2.0 / 7.0 * uy])


def rollout_distance(speed: Any, rolling: Any, sliding_friction: float,
                     rolling_resistance: float, gravity: float | None = None) -> np.ndarray:
    """Distance to rest of a ball launched at ``speed`` (m/s), m.

    Rolling from the start: ``v^2 / (2 mu_r g)``; from a stun launch:
    ``12 v^2 / (49 mu_s g) + (5/7 v)^2 / (2 mu_r g)`` (sliding, then rolling
    from 5/7 of the launch speed; solid sphere).
    """
    v = np.asarray(speed, dtype=float)
    roll = np.asarray(rolling, dtype=bool)
    g = Physics().gravity if gravity is None else float(gravity)
    rolling_d = v * v / (2.0 * rolling_resistance * g)
    stun_d = (12.0 * v * v / (49.0 * sliding_friction * g)
              + (5.0 / 7.0 * v) ** 2 / (2.0 * rolling_resistance * g))
    return np.where(roll, rolling_d, stun_d)


@dataclass(frozen=True, slots=True)
class ReboundTest:
    """The standard's rebound test, simulated on one table."""

    speed_mps: float
    """Launch speed of the centre-ball stroke, m/s."""
    table_lengths: float
    """Distance travelled from the head spot to rest, in table lengths."""
    distance_m: float
    """The same distance, m."""
    cushion_hits: int
    """Cushion impacts on the way."""

    @property
    def meets_minimum(self) -> bool:
        """Whether the ball travels at least :data:`STANDARD_MIN_LENGTHS`."""
        return self.table_lengths >= STANDARD_MIN_LENGTHS

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of the test."""
        return {"speed_mps": self.speed_mps, "table_lengths": self.table_lengths,
                "distance_m": self.distance_m, "cushion_hits": self.cushion_hits,
                "standard_minimum": STANDARD_MIN_LENGTHS,
                "meets_minimum": self.meets_minimum}


def _simulator(spec: TableSpec, physics: Physics, table: Any = None) -> Any:
    from .physics.simulator import Simulator

    return Simulator(table if table is not None else _geometry(spec), physics)


def standard_rebound_test(spec: TableSpec, physics: Physics | None = None,
                          speed_mps: float = FIRM_STROKE_MPS, table: Any = None) -> ReboundTest:
    """Simulate the standard's rebound test: a centre-ball stroke from the head
    spot (L/4 on the long string) toward the foot spot, bouncing between the
    short rails until it stops; the distance it covers, in table lengths.

    ``physics`` defaults to the table's own (defaults, then the table's
    measured values); ``table`` may pass a prebuilt :class:`shotplan.table.Table`.
    """
    from .stroke import Stroke

    if not 0.0 < speed_mps <= 15.0:
        raise InputError(f"rebound test speed {speed_mps!r} m/s is out of range, must be above "
                         "0 and at most 15")
    phys = physics if physics is not None else Physics.for_table(spec)
    sim = _simulator(spec, phys, table)
    L, W = spec.length_m, spec.width_m
    out = sim.run(["cue"], [[L / 4.0, W / 2.0]], Stroke(0.0, float(speed_mps)))
    path = out.path("cue")
    d = float(np.sum(np.hypot(*np.diff(path, axis=0).T))) if len(path) > 1 else 0.0
    hits = sum(1 for e in out.events if e.kind.word == "cushion")
    return ReboundTest(float(speed_mps), d / L, d, hits)


def speed_for_lengths(spec: TableSpec, physics: Physics | None = None,
                      lengths: float = STANDARD_MIN_LENGTHS, table: Any = None,
                      tolerance_mps: float = 0.005) -> float | None:
    """Lowest launch speed (m/s) at which the rebound test reaches ``lengths``,
    by bisection between 0.2 and 15 m/s; ``None`` if even 15 m/s falls short."""
    phys = physics if physics is not None else Physics.for_table(spec)
    tab = table if table is not None else _geometry(spec)

    def reach(v: float) -> float:
        return standard_rebound_test(spec, phys, v, tab).table_lengths

    lo, hi = 0.2, 15.0
    if reach(hi) < lengths:
        return None
    if reach(lo) >= lengths:
        return lo
    while hi - lo > tolerance_mps:
        mid = 0.5 * (lo + hi)
        if reach(mid) >= lengths:
            hi = mid
        else:
            lo = mid
    return hi


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


def _modified_z(res: np.ndarray, scale: float) -> np.ndarray:
    """Modified z-scores (Iglewicz and Hoaglin 1993): 0.6745 (r - median) / MAD."""
    med = float(np.median(res))
    mad = float(np.median(np.abs(res - med)))
    # A floor, so that data that fit exactly do not flag rounding noise.
    mad = max(mad, 1e-6 * scale, 1e-12)
    return 0.6745 * (res - med) / mad


def _where(rows: Sequence[Row]) -> str:
    files = sorted({r.file for r in rows})
    return ", ".join(files) if files else "measurements"


# -- rebound
class _Rebounds:
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
        self.prm = _law_params(spec)
        self.v_in = np.array([r.speed_in_mps for r in rows])
        self.a_in = np.array([r.angle_in_deg for r in rows])
        self.rolling = np.array([r.spin == "rolling" for r in rows])
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


def _rebound_fit(data: _Rebounds, model: str, defaults: Physics) -> tuple[ModelFit, list[str]]:
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
        return levenberg_marquardt(
            lambda p: data.residuals(*full(p, free)), x0,
            lower=[_REBOUND_BOUNDS[n][0] for n in free],
            upper=[_REBOUND_BOUNDS[n][1] for n in free],
            scale=[1.0 if n == "cushion_restitution" else 0.1 for n in free],
        )

    data.weights = np.ones(2)
    res = solve(names, [start[n] for n in names])
    while True:
        bad = [names[j] for j in _undetermined(res.jacobian)]
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
    z = np.column_stack([_modified_z(weighted[:, k], 1.0) for k in range(2)])
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


def _degeneracy(fit: ModelFit, where: str) -> ModelFit:
    """The fit with ``degenerate`` set when its standard errors mean nothing,
    or an :class:`InputError` when its values are not determined at all.

    Identical rows repeat one measurement: ``k`` distinct rows with ``r``
    residuals each determine at most ``k r`` values, and estimate their
    spread only when ``k r`` exceeds the number of values ``p`` (linear
    least squares: ``sigma^2 = RSS / (m - p)``). Residuals zero to rounding
    say the same from the other side: the errors come out as rounding
    (the ``+- 9.1e-17`` of five copied rows)."""
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


def _choose_restitution(data: _Rebounds, model: str, defaults: Physics
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
    first = _degeneracy(first, _where(rows))
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
                without = _degeneracy(without, _where(keep))
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
    rolling = np.array([r.spin == "rolling" for r in rows])
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
        res = levenberg_marquardt(lambda p: np.log(dist(p) / d), start,
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
    if _undetermined(res.jacobian):
        raise InputError(f"{where}: the roll-out rows do not determine "
                         f"{' and '.join(names)}; vary the launch speed")
    se, sigma, cov = standard_errors(res)
    dd = np.sqrt(np.maximum(np.diag(cov), 1e-300))
    mu_s_used = float(res.x[0]) if len(names) == 2 else mu_s0
    pred = rollout_distance(v, rolling, mu_s_used, float(res.x[-1]), g)
    resid = pred - d
    z = _modified_z(np.log(pred / d), 1.0)
    out_rows = tuple(
        RowResult("rollout", r.file, r.line,
                  (("launch_speed_mps", r.launch_speed_mps), ("distance_m", r.distance_m),
                   ("spin", r.spin)),
                  (("distance_m", float(pred[i])),), (float(resid[i]),), (float(z[i]),))
        for i, r in enumerate(rows))
    model = ("d = 12 v^2/(49 mu_s g) + (5/7 v)^2/(2 mu_r g) (stun), v^2/(2 mu_r g) (rolling)")
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
    z = _modified_z(resid, float(np.median(lengths)))
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
    table = _geometry(spec)

    def lengths(e0: float) -> np.ndarray:
        ph = dataclasses.replace(physics, cushion_restitution=float(e0))
        return np.array([standard_rebound_test(spec, ph, float(v), table).table_lengths
                         for v in speeds])

    top = lengths(1.0)
    if np.all(top < measured):
        raise InputError(f"{where}: even a perfectly elastic cushion gives only "
                         f"{np.max(top):.2f} table lengths at these speeds on this cloth, less "
                         "than measured; check the launch speeds and the cloth values")
    res = levenberg_marquardt(lambda p: lengths(float(p[0])) - measured, [physics.cushion_restitution],
                              lower=[0.05], upper=[1.0], scale=[1.0], max_iterations=60,
                              progress=progress)
    if _undetermined(res.jacobian):
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


def _rebound_test_check(rows: Sequence[ReboundTestRow], spec: TableSpec,
                        physics: Physics) -> KindFit:
    speeds = np.array([r.launch_speed_mps for r in rows])
    table = _geometry(spec)
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


# ----------------------------------------------------------------- the result
@dataclass(frozen=True)
class FitResult:
    """Everything a fit found, and the table profile it makes."""

    preset: str
    """The table preset the fit is for (ball, nose height, table size)."""
    files: tuple[tuple[str, str], ...]
    """(file, kind) of every file read."""
    rebound: KindFit | None
    """Fits of the rebound rows."""
    rollout: KindFit | None
    """Fits of the roll-out rows."""
    rebound_test: KindFit | None
    """Fit (no rebound rows) or check (with them) of the rebound-test rows."""
    measurements: Measurements
    """The rows read."""
    firm_speed_mps: float = FIRM_STROKE_MPS
    """Speed of the simulated standard rebound test."""
    simulated_test: ReboundTest | None = None
    """The standard's rebound test simulated on the fitted table."""
    notes: tuple[str, ...] = ()
    """General notes."""

    def overrides(self) -> dict[str, float]:
        """The fitted table values (keys of :data:`shotplan.equipment.OVERRIDE_KEYS`)."""
        out: dict[str, float] = {}
        if self.rebound is not None:
            fit = self.rebound.chosen
            for e in fit.estimates:
                out[e.name] = e.value
            if "cushion_restitution_slope" not in out:
                out["cushion_restitution_slope"] = 0.0  # the constant model, said outright
            order = ("cushion_restitution", "cushion_restitution_slope", "cushion_friction")
            out = {k: out[k] for k in order if k in out}
        elif self.rebound_test is not None and self.rebound_test.chosen.estimates:
            out["cushion_restitution"] = self.rebound_test.chosen.estimates[0].value
        if self.rollout is not None:
            for e in self.rollout.chosen.estimates:
                out[e.name] = e.value
        return out

    def table_object(self) -> dict[str, Any]:
        """The profile's ``table`` object: ``{"preset": ..., fitted values...}``."""
        return {"preset": self.preset, **self.overrides()}

    def spec(self) -> TableSpec:
        """The fitted table."""
        return TableSpec.preset(self.preset).with_overrides(self.overrides(), where="fit")

    def estimate(self, name: str) -> Estimate | None:
        """The used estimate of a table key, if fitted."""
        for kf in (self.rebound, self.rollout, self.rebound_test):
            if kf is not None and kf.chosen.estimates:
                e = kf.chosen.estimate(name)
                if e is not None and (kf.kind != "rebound_test" or self.rebound is None):
                    return e
        return None

    def _fits(self) -> tuple[KindFit, ...]:
        return tuple(kf for kf in (self.rebound, self.rollout, self.rebound_test)
                     if kf is not None and kf.chosen.estimates)

    def degenerate(self, name: str) -> bool:
        """Whether the standard error of the used estimate of ``name`` cannot
        be estimated (see :attr:`ModelFit.degenerate`)."""
        for kf in self._fits():
            if kf.chosen.estimate(name) is not None and kf.chosen.degenerate:
                return True
        return False

    @property
    def warnings(self) -> tuple[str, ...]:
        """One line per fit the profile takes whose standard errors cannot be
        estimated."""
        return tuple(f"{kf.kind.replace('_', '-')} fit: {kf.chosen.degenerate}"
                     for kf in self._fits() if kf.chosen.degenerate)

    @property
    def outliers(self) -> tuple[RowResult, ...]:
        """Every flagged row, of every kind."""
        out: tuple[RowResult, ...] = ()
        for kf in (self.rebound, self.rollout, self.rebound_test):
            if kf is not None:
                out += kf.outliers
        return out

    @property
    def rows_used(self) -> int:
        """Rows in the fits the profile takes (checks not counted)."""
        n = 0
        for kf in (self.rebound, self.rollout, self.rebound_test):
            if kf is not None and kf.chosen.estimates:
                n += len(kf.chosen.rows)
        return n

    def measured_test_meets_minimum(self) -> bool | None:
        """Whether the measured rebound-test rows reach the standard's minimum on
        average (None without such rows)."""
        rows = self.measurements.rebound_tests
        if not rows:
            return None
        return float(np.mean([r.table_lengths for r in rows])) >= STANDARD_MIN_LENGTHS

    def to_dict(self) -> dict[str, Any]:
        """The ``cushion fit --json`` document."""
        doc: dict[str, Any] = {"files": [{"file": f, "kind": k} for f, k in self.files],
                               "table": self.table_object()}
        for key in ("cushion_restitution", "cushion_restitution_slope", "cushion_friction",
                    "cloth_rolling_resistance", "cloth_sliding_friction"):
            e = self.estimate(key)
            doc[key] = e.value if e is not None else self.overrides().get(key)
            doc[f"{key}_se"] = e.se if e is not None and not self.degenerate(key) else None
        doc["restitution_model"] = (
            ("linear" if self.rebound.chosen.estimate("cushion_restitution_slope") else "constant")
            if self.rebound is not None else
            "constant" if doc["cushion_restitution"] is not None else None)
        doc["rows"] = self.measurements.n_rows
        doc["rows_used"] = self.rows_used
        doc["outliers"] = [r.to_dict() for r in self.outliers]
        doc["outlier_rule"] = (f"modified z-score 0.6745 |r - median| / MAD above {OUTLIER_Z:g} "
                               f"(Iglewicz and Hoaglin 1993), with at least "
                               f"{MIN_ROWS_FOR_OUTLIERS} rows of a kind")
        doc["fits"] = {kf.kind: kf.to_dict()
                       for kf in (self.rebound, self.rollout, self.rebound_test) if kf is not None}
        doc["standard_rebound_test"] = (
            {**self.simulated_test.to_dict(), "firm_speed_note": _FIRM_NOTE}
            if self.simulated_test is not None else None)
        doc["measured_rebound_test_meets_minimum"] = self.measured_test_meets_minimum()
        doc["notes"] = list(self.notes)
        doc["degenerate"] = bool(self.warnings)
        doc["warnings"] = list(self.warnings)
        return doc

    def profile_dict(self) -> dict[str, Any]:
        """The table profile file's content."""
        m = self.measurements
        fit = {k: v for k, v in self.to_dict().items() if k not in ("table",)}
        fit["measured_rows"] = {
            "rebound": [_row_dict(r) for r in m.rebounds],
            "rollout": [_row_dict(r) for r in m.rollouts],
            "rebound_test": [_row_dict(r) for r in m.rebound_tests],
        }
        return {"format": PROFILE_FORMAT, "version": PROFILE_VERSION,
                "table": self.table_object(), "fit": fit}


def _row_dict(row: Row) -> dict[str, Any]:
    return {f: getattr(row, f) for f in row.__slots__}  # type: ignore[union-attr]


_FIRM_NOTE = ("the standard names no speed for its firm stroke; this is our reading (the middle "
              "of the 'power' speed band, 3.6-6 m/s)")


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
        Progress callback (fraction, words).

    Raises
    ------
    InputError
        Too few rows of a kind, rows that do not determine a value, or values
        the rows imply that no cushion or cloth can have.
    """
    if restitution not in RESTITUTION_MODELS:
        raise InputError(f"{restitution!r} is not a restitution model, must be one of "
                         f"{', '.join(RESTITUTION_MODELS)}")
    if preset not in PRESETS:
        raise InputError(f"{preset!r} is not a table preset, must be one of {', '.join(PRESETS)}")
    if not 0.0 < firm_speed_mps <= 15.0:
        raise InputError(f"firm speed {firm_speed_mps!r} m/s is out of range, must be above 0 "
                         "and at most 15")
    base = TableSpec.preset(preset)
    defaults = Physics.for_table(base)
    m = measurements
    if m.n_rows == 0:
        raise InputError("no measurement rows to fit")

    def step(frac: float, what: str) -> None:
        if progress is not None:
            progress(frac, what)

    rollout = None
    spec = base
    if m.rollouts:
        step(0.0, "roll-outs")
        rollout = _fit_kind("rollout", m.rollouts,
                            lambda rows: _rollout_fit(rows, defaults),  # type: ignore[arg-type]
                            drop_outliers,
                            ROLLOUT_MIN_ROWS)
        spec = spec.with_overrides({e.name: e.value for e in rollout.chosen.estimates},
                                   where="roll-out fit")
    rebound = None
    if m.rebounds:
        step(0.2, "rebounds")

        def fit_rebounds(rows: Sequence[Row]) -> Any:
            data = _Rebounds(rows, base)  # type: ignore[arg-type]
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
            def sub(frac: float, what: str) -> None:
                step(0.4 + 0.5 * frac, "table lengths")

            test = _fit_kind("rebound_test", m.rebound_tests,
                             lambda rows: _rebound_test_fit(rows, spec, phys,  # type: ignore[arg-type]
                                                            sub),
                             drop_outliers, REBOUND_TEST_MIN_ROWS)
            e0 = test.chosen.estimates[0].value
            spec = spec.with_overrides({"cushion_restitution": e0}, where="rebound-test fit")
        else:
            step(0.6, "rebound-test check")
            test = _rebound_test_check(m.rebound_tests, spec, phys)
    result = FitResult(preset, m.files, rebound, rollout, test, m)
    try:
        final = result.spec()
    except LayoutError as e:  # a value outside the table's valid ranges
        raise InputError(f"{_where_all(m)}: the fitted values are not a valid table ({e})") from None
    step(0.9, "standard rebound test")
    simulated = standard_rebound_test(final, Physics.for_table(final), firm_speed_mps)
    notes: list[str] = []
    for kf in (rollout, rebound, test):
        if kf is not None:
            notes.extend(kf.notes)
    step(1.0, "done")
    return FitResult(preset, m.files, rebound, rollout, test, m, firm_speed_mps, simulated,
                     tuple(notes))


def _where_all(m: Measurements) -> str:
    return ", ".join(f for f, _k in m.files) or "measurements"


# ------------------------------------------------------------------ profiles
@dataclass(frozen=True)
class Profile:
    """A table profile read back: the table, and what the fit recorded."""

    name: str
    """File it came from (or a label)."""
    table: dict[str, Any]
    """The ``table`` object, as a layout would hold it."""
    spec: TableSpec
    """The table it describes."""
    fit: dict[str, Any] = field(default_factory=dict)
    """The fit's record (empty for a bare table object)."""

    @property
    def preset(self) -> TableSpec:
        """The plain preset the profile starts from."""
        return TableSpec.preset(self.spec.name)

    def measurements(self) -> Measurements:
        """The measured rows the profile was fitted to (may be empty)."""
        rows = self.fit.get("measured_rows") or {}
        where = f"{self.name}: fit.measured_rows"
        kinds = (("rebound", ReboundRow), ("rollout", RolloutRow), ("rebound_test", ReboundTestRow))
        out: dict[str, tuple[Any, ...]] = {}
        try:
            for key, cls in kinds:
                out[key] = tuple(cls(**item) for item in rows.get(key, []))
        except (TypeError, ValueError, AttributeError):
            raise InputError(f"{where}: not the rows a fit writes; refit the profile") from None
        for r in out["rebound"] + out["rollout"]:
            if r.spin not in SPINS:
                raise InputError(f"{where}: spin {r.spin!r} must be one of {', '.join(SPINS)}")
        return Measurements(out["rebound"], out["rollout"], out["rebound_test"])


def profile_from_dict(data: Any, where: str = "profile") -> Profile:
    """A :class:`Profile` from a parsed profile (or a bare ``table`` object)."""
    if not isinstance(data, Mapping):
        raise InputError(f"{where}: the top level must be a JSON object "
                         f"{{\"format\": {PROFILE_FORMAT!r}, \"table\": {{...}}}}")
    if "format" not in data and "preset" in data:
        table = dict(data)  # a bare table object, as pasted into a layout
        fit: dict[str, Any] = {}
    else:
        if data.get("format") != PROFILE_FORMAT:
            raise InputError(f"{where}: format: {data.get('format')!r} is not a table profile, "
                             f"must be {PROFILE_FORMAT!r} (or give a bare table object "
                             "{\"preset\": ..., ...})")
        if data.get("version") != PROFILE_VERSION:
            raise InputError(f"{where}: version: {data.get('version')!r} is not supported, must "
                             f"be {PROFILE_VERSION}")
        for key in data:
            if key not in ("format", "version", "table", "fit"):
                raise InputError(f"{where}: unknown field {key!r}, must be one of format, "
                                 "version, table, fit")
        if not isinstance(data.get("table"), Mapping):
            raise InputError(f"{where}: table: missing or not an object, must be "
                             "{\"preset\": ..., measured values...}")
        table = dict(data["table"])
        fit = data.get("fit") or {}
        if not isinstance(fit, Mapping):
            raise InputError(f"{where}: fit: must be an object")
        fit = dict(fit)
    name = table.get("preset")
    if not isinstance(name, str) or name not in PRESETS:
        raise InputError(f"{where}: table.preset: {name!r} is not a preset, must be one of "
                         f"{', '.join(PRESETS)}")
    try:
        spec = TableSpec.preset(name).with_overrides(
            {k: v for k, v in table.items() if k != "preset"}, where=f"{where}: table")
    except LayoutError as e:
        raise InputError(str(e)) from None
    return Profile(where, table, spec, fit)


def load_profile(path: str | os.PathLike[str]) -> Profile:
    """Read a table profile file (or a file holding a bare ``table`` object)."""
    from .layout import read_json_file

    return profile_from_dict(read_json_file(path), str(path))


def write_profile(result: FitResult, path: str | os.PathLike[str]) -> Path:
    """Write the fit's table profile atomically; returns the path."""
    import json

    from .fileio import atomic_write_text, check_output_path

    p = check_output_path(path, (".json",))
    text = json.dumps(finite_json(result.profile_dict()), indent=2, ensure_ascii=False,
                      allow_nan=False)
    atomic_write_text(p, text + "\n")
    return p


# ------------------------------------------------------------------ the report
EXTRAPOLATED = "extrapolated beyond the measured speeds"
"""The words marking a figure computed at a speed above every measured one."""

REPORT_SPEEDS_MPS = (1.0, 2.0, 3.0, 4.0)
"""Incoming speeds of the report's rebound-angle curves, m/s."""

REPORT_ANGLES_DEG = tuple(float(a) for a in np.arange(5.0, 90.0, 2.5))
"""Incoming angles (from the cushion line) of the curves, degrees."""

REPORT_TEST_SPEEDS_MPS = tuple(float(v) for v in np.arange(1.0, 8.01, 0.5))
"""Launch speeds of the report's rebound-test curve, m/s."""


@dataclass(frozen=True, eq=False)
class ReboundCurve:
    """Rebound angle against incoming angle, at one speed and spin, on both tables."""

    spin: str
    """``stun`` or ``rolling``."""
    speed_mps: float
    """Incoming speed, m/s."""
    angle_in_deg: np.ndarray
    """Incoming angles from the cushion line, degrees."""
    profile_out_deg: np.ndarray
    """Angle right after the impact on the profile's table, degrees."""
    preset_out_deg: np.ndarray
    """The same on the plain preset."""
    profile_rolled_deg: np.ndarray
    """Angle once the ball rolls again (the cloth has taken the slip), profile."""
    preset_rolled_deg: np.ndarray
    """The same on the plain preset."""
    extrapolated: bool = False
    """Whether the speed is above every cushion speed the profile measured."""

    def to_dict(self) -> dict[str, Any]:
        """The curve's JSON object."""
        return {"spin": self.spin, "speed_mps": self.speed_mps,
                "extrapolated": self.extrapolated,
                "angle_in_deg": self.angle_in_deg.tolist(),
                "profile_out_deg": self.profile_out_deg.tolist(),
                "preset_out_deg": self.preset_out_deg.tolist(),
                "profile_rolled_deg": self.profile_rolled_deg.tolist(),
                "preset_rolled_deg": self.preset_rolled_deg.tolist()}


@dataclass(frozen=True, eq=False)
class BankComparison:
    """One standard one-rail bank, aimed on the profile's table and on the preset."""

    layout: Any
    """The bank layout on the profile's table (:class:`shotplan.layout.Layout`)."""
    ball: str
    """Object ball."""
    pocket: str
    """Pocket."""
    rail: str
    """Rail banked off."""
    speed_mps: float
    """Launch speed used on both tables."""
    profile_shot: Any
    """The :class:`shotplan.search.Shot` on the profile's table, or None."""
    preset_shot: Any
    """The shot on the plain preset, or None."""
    profile_rail_x_m: float | None
    """Where along the rail the object ball meets it on the profile's table, m."""
    preset_rail_x_m: float | None
    """The same on the preset."""
    sight_spacing_m: float | None
    """Distance between sights (diamonds), m, or None."""
    extrapolated: bool = False
    """Whether the bank's speed is above every cushion speed the profile measured."""

    @property
    def difference_deg(self) -> float | None:
        """Profile's aim minus the preset's, degrees (None if either is missing)."""
        if self.profile_shot is None or self.preset_shot is None:
            return None
        return float(self.profile_shot.direction_deg - self.preset_shot.direction_deg)

    @property
    def rail_shift_mm(self) -> float | None:
        """How far the object ball's rail contact moves (profile minus preset), mm."""
        if self.profile_rail_x_m is None or self.preset_rail_x_m is None:
            return None
        return 1000.0 * (self.profile_rail_x_m - self.preset_rail_x_m)

    def to_dict(self) -> dict[str, Any]:
        """The comparison's JSON object."""
        return {
            "ball": self.ball, "pocket": self.pocket, "rail": self.rail,
            "speed_mps": self.speed_mps,
            "extrapolated": self.extrapolated,
            "balls": {b: list(xy) for b, xy in self.layout.positions().items()},
            "profile_aim_deg": self.profile_shot.direction_deg if self.profile_shot else None,
            "preset_aim_deg": self.preset_shot.direction_deg if self.preset_shot else None,
            "difference_deg": self.difference_deg,
            "profile_window_deg": self.profile_shot.window_deg if self.profile_shot else None,
            "preset_window_deg": self.preset_shot.window_deg if self.preset_shot else None,
            "mirror_aim_deg": (self.preset_shot.ghost_direction_deg
                               if self.preset_shot else None),
            "profile_rail_x_m": self.profile_rail_x_m,
            "preset_rail_x_m": self.preset_rail_x_m,
            "rail_shift_mm": self.rail_shift_mm,
            "rail_shift_diamonds": (self.rail_shift_mm / 1000.0 / self.sight_spacing_m
                                    if self.rail_shift_mm is not None and self.sight_spacing_m
                                    else None),
        }


@dataclass(frozen=True, eq=False)
class ReboundTestComparison:
    """The standard's rebound test on the profile's table and on the preset."""

    firm_speed_mps: float
    """The speed taken for the standard's firm stroke."""
    profile: ReboundTest
    """At the firm speed, on the profile's table."""
    preset: ReboundTest
    """At the firm speed, on the preset."""
    speeds_mps: np.ndarray
    """Launch speeds of the curves."""
    profile_lengths: np.ndarray
    """Table lengths at each speed, profile."""
    preset_lengths: np.ndarray
    """Table lengths at each speed, preset."""
    profile_speed_for_minimum: float | None
    """Lowest speed reaching the standard's minimum, profile (None: not below 15 m/s)."""
    preset_speed_for_minimum: float | None
    """The same, preset."""
    measured_up_to_mps: float | None = None
    """The fastest cushion speed the profile measured (None: it measured none)."""

    def beyond(self, speed_mps: float | None) -> bool:
        """Whether a profile figure at this launch speed is an extrapolation:
        faster than anything measured (``None``, "not below 15 m/s", counts
        as faster). A preset's figures are never extrapolations."""
        if self.measured_up_to_mps is None:
            return False
        return speed_mps is None or speed_mps > self.measured_up_to_mps

    def to_dict(self) -> dict[str, Any]:
        """The comparison's JSON object."""
        return {"firm_speed_mps": self.firm_speed_mps, "firm_speed_note": _FIRM_NOTE,
                "measured_up_to_mps": self.measured_up_to_mps,
                "profile_extrapolated": self.beyond(self.firm_speed_mps),
                "profile_speed_for_minimum_extrapolated": self.beyond(
                    self.profile_speed_for_minimum),
                "profile_lengths_extrapolated": [self.beyond(float(v))
                                                 for v in self.speeds_mps],
                "standard_minimum": STANDARD_MIN_LENGTHS,
                "standard_upper": STANDARD_MAX_LENGTHS,
                "profile": self.profile.to_dict(), "preset": self.preset.to_dict(),
                "speeds_mps": self.speeds_mps.tolist(),
                "profile_lengths": self.profile_lengths.tolist(),
                "preset_lengths": self.preset_lengths.tolist(),
                "profile_speed_for_minimum_mps": self.profile_speed_for_minimum,
                "preset_speed_for_minimum_mps": self.preset_speed_for_minimum}


@dataclass(frozen=True, eq=False)
class ProfileReport:
    """What ``shotplan cushion report`` shows, as data."""

    profile: Profile
    """The profile."""
    curves: tuple[ReboundCurve, ...]
    """Rebound angle curves (each spin, each speed)."""
    bank: BankComparison | None
    """The bank comparison (None on a table without pockets)."""
    rebound_test: ReboundTestComparison
    """The standard's rebound test."""
    checks: tuple[ModelFit, ...] = ()
    """Per kind: the profile's values against the rows it records (its
    predictions and residuals, no refit); empty if it records none."""
    cautions: tuple[str, ...] = CAUTIONS
    """Cautions for table work."""

    def to_dict(self) -> dict[str, Any]:
        """The ``cushion report --json`` document."""
        return {
            "profile": self.profile.name,
            "table": self.profile.table,
            "fit": {k: v for k, v in self.profile.fit.items()
                    if k not in ("measured_rows", "fits")},
            "checks": [c.to_dict() for c in self.checks],
            "rebound_curves": [c.to_dict() for c in self.curves],
            "bank": self.bank.to_dict() if self.bank is not None else None,
            "standard_rebound_test": self.rebound_test.to_dict(),
            "measured_up_to_mps": self.rebound_test.measured_up_to_mps,
            "extrapolated": self.extrapolated,
            "cautions": list(self.cautions),
        }

    @property
    def extrapolated(self) -> bool:
        """Whether any profile figure of the report lies beyond the measured speeds."""
        t = self.rebound_test
        return (t.beyond(t.firm_speed_mps) or t.beyond(t.profile_speed_for_minimum)
                or any(c.extrapolated for c in self.curves)
                or (self.bank is not None and self.bank.extrapolated))

    def lines(self) -> list[str]:
        """The report as text lines."""
        p = self.profile
        out = [f"table profile {p.name}: {p.spec.name} with "
               + (", ".join(f"{k} {v:.4g}" for k, v in p.table.items() if k != "preset")
                  or "no measured values")]
        fit = p.fit
        for key in ("cushion_restitution", "cushion_restitution_slope", "cushion_friction",
                    "cloth_rolling_resistance", "cloth_sliding_friction"):
            if key in p.table:
                se = fit.get(f"{key}_se")
                out.append(f"  {key:<27} {p.table[key]:.4g}"
                           + (f" +- {se:.2g}" if isinstance(se, int | float) else ""))
        units = {"rebound": (" m/s (speed out)", " deg (angle out)"), "rollout": (" m",),
                 "rebound_test": (" table lengths",)}
        for c in self.checks:
            res = np.array([r.residuals for r in c.rows], dtype=float)
            rms = np.sqrt(np.mean(res**2, axis=0))
            flagged = sum(1 for r in c.rows if r.outlier)
            out.append(f"  {_KIND_WORDS[c.kind]} rows against this profile: {len(c.rows)}, "
                       "rms residual "
                       + ", ".join(f"{v:.3g}{u}" for v, u in zip(rms, units[c.kind],
                                                                 strict=True))
                       + (f"; {flagged} flagged as outliers by the fit" if flagged else ""))
        t = self.rebound_test
        if t.measured_up_to_mps is not None:
            out.append(f"measured cushion speeds up to {t.measured_up_to_mps:.2f} m/s: profile "
                       f"figures at higher speeds are {EXTRAPOLATED}")
        firm_mark = f" ({EXTRAPOLATED})" if t.beyond(t.firm_speed_mps) else ""
        out.append(f"standard rebound test (centre-ball stroke from the head spot at "
                   f"{t.firm_speed_mps:g} m/s, our reading of 'firm'): profile "
                   f"{t.profile.table_lengths:.2f} table lengths{firm_mark}, preset "
                   f"{t.preset.table_lengths:.2f}; the standard asks at least "
                   f"{STANDARD_MIN_LENGTHS:g} to {STANDARD_MAX_LENGTHS:g}: the profile "
                   + ("meets" if t.profile.meets_minimum else "does not meet") + " it"
                   + firm_mark)
        for who, v in (("profile", t.profile_speed_for_minimum),
                       ("preset", t.preset_speed_for_minimum)):
            mark = f" ({EXTRAPOLATED})" if who == "profile" and t.beyond(v) else ""
            out.append(f"  {who}: {STANDARD_MIN_LENGTHS:g} table lengths need a launch of "
                       + (f"{v:.2f} m/s" if v is not None else "more than 15 m/s") + mark)
        b = self.bank
        if b is None:
            out.append("one-rail bank: not compared (the table has no pockets)")
        else:
            d = b.to_dict()
            head = (f"one-rail bank ({b.ball} off the {b.rail} into {b.pocket}, "
                    f"{b.speed_mps:g} m/s, stun): ")
            if b.profile_shot is None or b.preset_shot is None:
                missing = [w for w, s in (("profile", b.profile_shot), ("preset", b.preset_shot))
                           if s is None]
                out.append(head + f"no pocketing aim found on the {' and '.join(missing)}")
            else:
                out.append(head + f"aim {d['profile_aim_deg']:.2f} deg on the profile, "
                           f"{d['preset_aim_deg']:.2f} deg on the preset: "
                           f"{d['difference_deg']:+.2f} deg (mirror line "
                           f"{d['mirror_aim_deg']:.2f} deg)")
            if b.rail_shift_mm is not None:
                dia = d["rail_shift_diamonds"]
                out.append(f"  the object ball meets the rail {b.rail_shift_mm:+.0f} mm "
                           + (f"({dia:+.2f} diamonds) " if dia is not None else "")
                           + "from where it meets it on the preset (+ is toward the foot)")
        out.append("cautions for table work:")
        out.extend(f"  - {c}" for c in self.cautions)
        return out


def bank_layout(spec: TableSpec) -> Any:
    """A cross-side one-rail bank of our own on ``spec``: the object ball
    close to the right rail, banked off it into the side-left pocket; both
    balls placed in proportion to the table."""
    from .layout import Layout

    L, W = spec.length_m, spec.width_m
    obj = next(b for b in spec.ball.ids if b != "cue")
    return Layout(spec, (("cue", (0.285 * L, 0.64 * W)), (obj, (0.40 * L, 0.19 * W))),
                  title="One-rail bank", note="cross-side bank off the right rail")


def _bank(profile: Profile, speed: float) -> BankComparison | None:
    from .physics import simulate
    from .search import find_shots

    spec = profile.spec
    if not spec.has_pockets:
        return None
    layout = bank_layout(spec)
    obj = layout.ball_ids[1]
    found: dict[str, Any] = {}
    rail_x: dict[str, float | None] = {}
    for who, s in (("profile", spec), ("preset", profile.preset)):
        lay = layout.with_table(s)
        res = find_shots(lay, balls=[obj], pockets=["side-left"], kinds=["bank"], speed=speed)
        shots = [sh for sh in res.shots if sh.rails == ("right rail",)]
        found[who] = shots[0] if shots else None
        rail_x[who] = None
        if shots:
            out = simulate(lay, shots[0].stroke())
            hit = next((e for e in out.events if e.kind.word == "cushion" and obj in e.balls),
                       None)
            if hit is not None:
                rail_x[who] = float(hit.states[0].x)
    spacing = spec.length_m / 8.0 if spec.sight_setback_m is not None else None
    return BankComparison(layout, obj, "side-left", "right rail", speed, found["profile"],
                          found["preset"], rail_x["profile"], rail_x["preset"], spacing)


def _outlier_lines(profile: Profile) -> set[tuple[str, int]]:
    out = set()
    items = profile.fit.get("outliers")
    for o in items if isinstance(items, list) else []:
        if isinstance(o, Mapping) and isinstance(o.get("line"), int):
            out.add((str(o.get("file")), int(o["line"])))
    return out


def finite_json(value: Any) -> Any:
    """``value`` with every non-finite float replaced by None (JSON has no NaN)."""
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, Mapping):
        return {k: finite_json(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [finite_json(v) for v in value]
    return value


def _checks(profile: Profile) -> tuple[ModelFit, ...]:
    """The profile's values against the rows it records (no refit); rows the
    fit flagged keep their flag."""
    m = profile.measurements()
    spec = profile.spec
    phys = Physics.for_table(spec)
    flagged = _outlier_lines(profile)
    out = []
    if m.rebounds:
        data = _Rebounds(m.rebounds, spec)
        vel = data.velocity(phys.cushion_restitution, phys.cushion_restitution_slope,
                            phys.cushion_friction)
        speed = np.hypot(vel[:, 0], vel[:, 1])
        angle = np.degrees(np.arctan2(vel[:, 1], vel[:, 0]))
        rows = tuple(
            RowResult("rebound", r.file, r.line,
                      (("speed_in_mps", r.speed_in_mps), ("angle_in_deg", r.angle_in_deg),
                       ("speed_out_mps", r.speed_out_mps), ("angle_out_deg", r.angle_out_deg),
                       ("spin", r.spin)),
                      (("speed_out_mps", float(speed[i])), ("angle_out_deg", float(angle[i]))),
                      (float(speed[i] - r.speed_out_mps), float(angle[i] - r.angle_out_deg)),
                      (), (r.file, r.line) in flagged)
            for i, r in enumerate(m.rebounds))
        res = np.array([x.residuals for x in rows])
        rss = float(np.sum(res**2))
        out.append(ModelFit("rebound", "the profile's cushion law", (), (), rows, rss,
                            math.sqrt(rss / res.size), res.size,
                            "m/s and degrees (speed out, angle out)"))
    if m.rollouts:
        v = np.array([r.launch_speed_mps for r in m.rollouts])
        d = np.array([r.distance_m for r in m.rollouts])
        roll = np.array([r.spin == "rolling" for r in m.rollouts])
        pred = rollout_distance(v, roll, phys.cloth_sliding_friction,
                                phys.cloth_rolling_resistance, phys.gravity)
        resid = pred - d
        rows = tuple(RowResult("rollout", r.file, r.line,
                               (("launch_speed_mps", r.launch_speed_mps),
                                ("distance_m", r.distance_m), ("spin", r.spin)),
                               (("distance_m", float(pred[i])),), (float(resid[i]),), (),
                               (r.file, r.line) in flagged)
                     for i, r in enumerate(m.rollouts))
        rss = float(resid @ resid)
        out.append(ModelFit("rollout", "the profile's cloth", (), (), rows, rss,
                            math.sqrt(rss / len(rows)), len(rows), "m"))
    if m.rebound_tests:
        out.append(_rebound_test_check(m.rebound_tests, spec, phys).all_rows)
    return tuple(out)


def profile_report(profile: Profile, *, firm_speed_mps: float = FIRM_STROKE_MPS,
                   bank_speed_mps: float = BANK_SPEED_MPS,
                   progress: Progress | None = None) -> ProfileReport:
    """Compute what the report shows for a profile (see :class:`ProfileReport`)."""
    if not 0.0 < firm_speed_mps <= 15.0:
        raise InputError(f"firm speed {firm_speed_mps!r} m/s is out of range, must be above 0 "
                         "and at most 15")

    def step(frac: float, what: str) -> None:
        if progress is not None:
            progress(frac, what)

    spec = profile.spec
    base = profile.preset
    phys = Physics.for_table(spec)
    phys0 = Physics.for_table(base)
    step(0.0, "rebound curves")
    curves = []
    angles = np.array(REPORT_ANGLES_DEG)
    prm = _law_params(spec)
    prm0 = _law_params(base)
    R = spec.ball.radius_m
    for spin in SPINS:
        for v in REPORT_SPEEDS_MPS:
            speeds = np.full_like(angles, v)
            roll = spin == "rolling"
            vel, om = rebound_predictions(spec, speeds, angles, roll, phys.cushion_restitution,
                                          phys.cushion_restitution_slope, phys.cushion_friction,
                                          prm)
            vel0, om0 = rebound_predictions(base, speeds, angles, roll,
                                            phys0.cushion_restitution,
                                            phys0.cushion_restitution_slope,
                                            phys0.cushion_friction, prm0)
            r1 = _rolled(vel, om, R)
            r0 = _rolled(vel0, om0, base.ball.radius_m)
            curves.append(ReboundCurve(
                spin, v, angles,
                np.degrees(np.arctan2(vel[:, 1], vel[:, 0])),
                np.degrees(np.arctan2(vel0[:, 1], vel0[:, 0])),
                np.degrees(np.arctan2(r1[:, 1], r1[:, 0])),
                np.degrees(np.arctan2(r0[:, 1], r0[:, 0]))))
    step(0.1, "measured rows")
    checks = _checks(profile)
    step(0.2, "standard rebound test")
    top = measured_up_to(profile)
    table = _geometry(spec)
    table0 = _geometry(base)
    speeds = np.array(REPORT_TEST_SPEEDS_MPS)
    prof_l = np.array([standard_rebound_test(spec, phys, float(v), table).table_lengths
                       for v in speeds])
    step(0.35, "standard rebound test")
    pre_l = np.array([standard_rebound_test(base, phys0, float(v), table0).table_lengths
                      for v in speeds])
    step(0.5, "standard rebound test")
    comparison = ReboundTestComparison(
        firm_speed_mps,
        standard_rebound_test(spec, phys, firm_speed_mps, table),
        standard_rebound_test(base, phys0, firm_speed_mps, table0),
        speeds, prof_l, pre_l,
        speed_for_lengths(spec, phys, table=table),
        speed_for_lengths(base, phys0, table=table0),
        top)
    step(0.7, "one-rail bank")
    bank = _bank(profile, bank_speed_mps)
    if bank is not None:
        bank = dataclasses.replace(bank, extrapolated=comparison.beyond(bank.speed_mps))
    curves = [dataclasses.replace(c, extrapolated=comparison.beyond(c.speed_mps))
              for c in curves]
    step(1.0, "done")
    return ProfileReport(profile, tuple(curves), bank, comparison, checks)


def measured_up_to(profile: Profile) -> float | None:
    """The fastest cushion speed a profile's rows measured, m/s: the incoming
    speed of its rebound rows and the launch speed of its rebound-test rows
    (which meets the cushion slower still, so a launch above it is beyond
    what was measured). None when it records neither."""
    m = profile.measurements()
    speeds = [r.speed_in_mps for r in m.rebounds] + [r.launch_speed_mps
                                                     for r in m.rebound_tests]
    return max(speeds) if speeds else None
