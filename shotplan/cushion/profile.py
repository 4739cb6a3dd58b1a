"""The table profile: the fit's result and table values, the profile JSON
written and read back.
"""

from __future__ import annotations

import os
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np

from ..equipment import PRESETS, TableSpec
from ..errors import InputError, LayoutError
from ..files.jsonout import missing_as_null
from .measurements import (
    OLD_SPINS,
    SPINS,
    Measurements,
    ReboundRow,
    ReboundTestRow,
    RolloutRow,
    Row,
)
from .models import FIRM_SPEED_NOTE, FIRM_STROKE_MPS, STANDARD_MIN_LENGTHS, ReboundTest
from .results import MIN_ROWS_FOR_OUTLIERS, OUTLIER_Z, Estimate, KindFit, RowResult

__all__ = [
    "PROFILE_FORMAT",
    "PROFILE_VERSION",
    "FitResult",
    "Profile",
    "profile_from_dict",
    "load_profile",
    "write_profile",
    "finite_json",
]

PROFILE_FORMAT = "shotplan-table-profile"
"""The value of a table profile's ``format`` field."""

PROFILE_VERSION = 1
"""The profile version this module reads and writes."""


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
            {**self.simulated_test.to_dict(), "firm_speed_note": FIRM_SPEED_NOTE}
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
                # A profile written before the one roll word says "rolling".
                out[key] = tuple(cls(**{k: OLD_SPINS.get(v, v) if k == "spin" else v
                                        for k, v in item.items()})
                                 for item in rows.get(key, []))
        except (TypeError, ValueError, AttributeError):
            raise InputError(f"{where}: not the rows a fit writes; refit the profile") from None
        for r in out["rebound"] + out["rollout"]:
            if r.spin not in SPINS:
                raise InputError(f"{where}: spin {r.spin!r} must be one of {', '.join(SPINS)}")
        return Measurements(out["rebound"], out["rollout"], out["rebound_test"])


def profile_from_dict(data: object, where: str = "profile") -> Profile:
    """A :class:`Profile` from a parsed profile (or a bare ``table`` object).

    Parameters
    ----------
    data
        The parsed JSON.
    where
        The file name, for messages (and the profile's name).

    Returns
    -------
    Profile
        The table it describes and the fit's record.

    Raises
    ------
    InputError
        One line naming the field, the problem and what is valid.
    """
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
    """Read a table profile file (or a file holding a bare ``table`` object).

    Parameters
    ----------
    path
        The JSON file.

    Returns
    -------
    Profile
        As :func:`profile_from_dict`.
    """
    from ..files.read import read_json_file

    return profile_from_dict(read_json_file(path), str(path))


def write_profile(result: FitResult, path: str | os.PathLike[str]) -> Path:
    """Write the fit's table profile atomically.

    Parameters
    ----------
    result
        The fit.
    path
        A ``.json`` file (replaced whole, never half-written).

    Returns
    -------
    Path
        The path written.
    """
    import json

    from ..files.write import atomic_write_text, check_output_path

    p = check_output_path(path, (".json",))
    text = json.dumps(finite_json(result.profile_dict()), indent=2, ensure_ascii=False,
                      allow_nan=False)
    atomic_write_text(p, text + "\n")
    return p


finite_json = missing_as_null
"""``value`` with every non-finite float replaced by None (JSON has no NaN):
:func:`shotplan.files.jsonout.missing_as_null`, under the name the cushion
commands have used."""
