"""Measurement files: the CSV columns, reading and validating rows, the row limit.

The file format is described in :mod:`shotplan.cushion`.
"""

from __future__ import annotations

import csv
import math
import os
from collections.abc import Sequence
from dataclasses import dataclass

from ..errors import InputError
from ..files.read import read_limited
from ..stroke import OLD_ROLL_WORDS

__all__ = [
    "SPINS",
    "OLD_SPINS",
    "DEFAULT_SPIN",
    "MAX_FILE_BYTES",
    "MAX_ROWS",
    "COLUMNS",
    "KINDS",
    "KIND_WORDS",
    "ReboundRow",
    "RolloutRow",
    "ReboundTestRow",
    "Row",
    "Measurements",
    "read_measurement_file",
    "read_measurements",
]

SPINS = ("stun", "follow")
"""Spin words of the ``spin`` column (``follow``: natural roll, the word of
``plan --tip`` and ``study``)."""

OLD_SPINS: dict[str, str] = OLD_ROLL_WORDS
"""Spin words of the version before, still read for one version (the files
that use them are listed in :attr:`Measurements.old_spin_files`)."""

DEFAULT_SPIN = "follow"
"""Spin of rows in files without a ``spin`` column (a ramp launch rolls)."""

MAX_FILE_BYTES = 10 * 1024 * 1024
"""Largest measurement file read (10 MB is far more than any test series)."""

MAX_ROWS = 10_000
"""Most data rows read, over all the files of one fit. Our choice: a day at
the table gives a few hundred rows; every rebound row costs the fit a pass
through the cushion law per step, so 10,000 rows fit in about 15 s (measured
on a 2-core machine), where 300,000 took minutes. More rows are refused in one line before any fitting."""

COLUMNS: dict[str, str] = {
    "speed_in_mps": "speed just before the cushion, m/s",
    "angle_in_deg": "incoming angle from the cushion line, degrees",
    "speed_out_mps": "speed just after the cushion, m/s",
    "angle_out_deg": "outgoing angle from the cushion line, degrees",
    "launch_speed_mps": "launch speed, m/s",
    "distance_m": "distance from the launch to rest, m",
    "table_lengths": "distance travelled to rest, in table lengths",
    "spin": "stun or follow",
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

KIND_WORDS: dict[str, str] = {"rebound": "rebound", "rollout": "roll-out", "rebound_test": "rebound-test"}

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
"""The kinds of measurement as the user reads them."""


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
    """``stun`` or ``follow``: the ball's spin as it meets the cushion."""
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
    """``follow`` (rolls from the start) or ``stun`` (slides first)."""
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
    old_spin_files: tuple[str, ...] = ()
    """Files whose ``spin`` column uses a word of :data:`OLD_SPINS`."""

    def __add__(self, other: Measurements) -> Measurements:
        return Measurements(self.rebounds + other.rebounds, self.rollouts + other.rollouts,
                            self.rebound_tests + other.rebound_tests, self.files + other.files,
                            self.old_spin_files + other.old_spin_files)

    @property
    def n_rows(self) -> int:
        """Rows of every kind."""
        return len(self.rebounds) + len(self.rollouts) + len(self.rebound_tests)


def _valid_columns_text() -> str:
    return "; ".join(f"{KIND_WORDS[k]} files: {','.join(req)}"
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
                         f"{', '.join(repr(m) for m in missing)} for a {KIND_WORDS[kind]} file, "
                         f"which needs {','.join(required)}"
                         + (f" (optional {', '.join(optional)})" if optional else ""))
    extra = [c for c in columns if c not in required and c not in optional]
    if extra:
        raise InputError(f"{where}: column {extra[0]!r} does not belong in a "
                         f"{KIND_WORDS[kind]} file (one kind of measurement per file), which "
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


def _read_header(line: str, where: str) -> tuple[list[str], str]:
    """The column names of a header line and the kind of file they make."""
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
    return header, _kind_of(header, where)


def _read_row(line: str, header: list[str], kind: str, where: str, name: str,
              lineno: int, old_words: set[str]) -> Row:
    """One data line as a row of its file's kind; an old spin word read is
    added to ``old_words``."""
    cells = _split(line)
    if len(cells) != len(header):
        raise InputError(f"{where}: {len(cells)} value{'s' if len(cells) != 1 else ''}, "
                         f"the header has {len(header)} columns ({','.join(header)})")
    values = dict(zip(header, cells, strict=True))
    spin = DEFAULT_SPIN
    if "spin" in values:
        spin = values["spin"].lower()
        if spin in OLD_SPINS:
            old_words.add(spin)
            spin = OLD_SPINS[spin]
        if spin not in SPINS:
            raise InputError(f"{where}, column 'spin': {values['spin']!r} is not a spin, "
                             f"must be one of {', '.join(SPINS)}")
    nums = {c: _number(values[c], c, where) for c in header if c in _RANGES}
    if kind == "rebound":
        return ReboundRow(nums["speed_in_mps"], nums["angle_in_deg"], nums["speed_out_mps"],
                          nums["angle_out_deg"], spin, name, lineno)
    if kind == "rollout":
        return RolloutRow(nums["launch_speed_mps"], nums["distance_m"], spin, name, lineno)
    return ReboundTestRow(nums["launch_speed_mps"], nums["table_lengths"], name, lineno)


def read_measurement_file(path: str | os.PathLike[str]) -> Measurements:
    """Read one measurement file (kind from its columns, see :mod:`shotplan.cushion`).

    Parameters
    ----------
    path
        A CSV file of one kind of measurement.

    Returns
    -------
    Measurements
        Its rows, each with its file and line.

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
    old_words: set[str] = set()
    for lineno, raw in enumerate(text.splitlines(), start=1):
        line = raw.strip()
        if not line or line.startswith("#"):
            continue
        if header is None:
            header, kind = _read_header(line, f"{name}: line {lineno} (header)")
            header_line = lineno
            continue
        n_row = len(rows) + 1
        where = f"{name}: line {lineno} (row {n_row})"
        if n_row > MAX_ROWS:
            raise InputError(f"{where}: more than {MAX_ROWS:,} data rows; a fit takes at most "
                             f"{MAX_ROWS:,} (split the file, or keep a sample of the rows)")
        rows.append(_read_row(line, header, kind, where, name, lineno, old_words))
    if header is None:
        raise InputError(f"{name}: the file is empty, expected a header line of column names "
                         f"({_valid_columns_text()}) and a line per measurement")
    if not rows:
        raise InputError(f"{name}: no data rows after the header (line {header_line}); add a "
                         "line per measurement")
    old = (name,) if old_words else ()
    if kind == "rebound":
        return Measurements(rebounds=tuple(rows), files=((name, kind),),  # type: ignore[arg-type]
                            old_spin_files=old)
    if kind == "rollout":
        return Measurements(rollouts=tuple(rows), files=((name, kind),),  # type: ignore[arg-type]
                            old_spin_files=old)
    return Measurements(rebound_tests=tuple(rows), files=((name, kind),),  # type: ignore[arg-type]
                        old_spin_files=old)


def read_measurements(paths: Sequence[str | os.PathLike[str]]) -> Measurements:
    """Read several measurement files (each of one kind) into one set of rows.

    Parameters
    ----------
    paths
        The files, at least one.

    Returns
    -------
    Measurements
        Every row of every file, in order.

    Raises
    ------
    InputError
        A file :func:`read_measurement_file` refuses, no file, or more than
        :data:`MAX_ROWS` rows over all the files (said before any fitting).
    """
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
