"""The report's numbers: rebound curves, the one-rail bank's aim, the
standard rebound test, marks for extrapolated figures, and the cautions.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from ..equipment import TableSpec
from ..errors import InputError
from ..physics.params import Physics
from .fit import ReboundData, rebound_test_check
from .measurements import KIND_WORDS, SPINS
from .models import (
    FIRM_SPEED_NOTE,
    FIRM_STROKE_MPS,
    STANDARD_MAX_LENGTHS,
    STANDARD_MIN_LENGTHS,
    Progress,
    ReboundTest,
    law_params,
    rebound_predictions,
    report_fraction,
    rolled_velocity,
    rollout_distance,
    speed_for_lengths,
    standard_rebound_test,
    table_geometry,
)
from .profile import Profile
from .results import ModelFit, RowResult

if TYPE_CHECKING:
    from ..layout import Layout
    from ..search import Shot

__all__ = [
    "BANK_SPEED_MPS",
    "SLATE_9FT_KG",
    "SLATE_9FT_LB",
    "CAUTIONS",
    "EXTRAPOLATED",
    "REPORT_SPEEDS_MPS",
    "REPORT_ANGLES_DEG",
    "REPORT_TEST_SPEEDS_MPS",
    "ReboundCurve",
    "BankComparison",
    "ReboundTestComparison",
    "ProfileReport",
    "bank_layout",
    "bank_comparison",
    "profile_report",
    "measured_up_to",
]

BANK_SPEED_MPS = 2.5
"""Launch speed of the one-rail bank compared in reports, m/s (a firm
bank: common practice, no source). The same speed on both tables, so the
aims differ by the cushion alone."""

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

    layout: Layout
    """The bank layout on the profile's table (:class:`shotplan.layout.Layout`)."""
    ball: str
    """Object ball."""
    pocket: str
    """Pocket."""
    rail: str
    """Rail banked off."""
    speed_mps: float
    """Launch speed used on both tables."""
    profile_shot: Shot | None
    """The :class:`shotplan.search.Shot` on the profile's table, or None."""
    preset_shot: Shot | None
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
        return {"firm_speed_mps": self.firm_speed_mps, "firm_speed_note": FIRM_SPEED_NOTE,
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
            out.append(f"  {KIND_WORDS[c.kind]} rows against this profile: {len(c.rows)}, "
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


def bank_layout(spec: TableSpec) -> Layout:
    """A cross-side one-rail bank of our own on ``spec``.

    The object ball close to the right rail, banked off it into the
    side-left pocket; both balls placed in proportion to the table.

    Parameters
    ----------
    spec
        The table.

    Returns
    -------
    shotplan.layout.Layout
        The cue ball and one object ball.
    """
    from ..layout import Layout

    L, W = spec.length_m, spec.width_m
    obj = next(b for b in spec.ball.ids if b != "cue")
    return Layout(spec, (("cue", (0.285 * L, 0.64 * W)), (obj, (0.40 * L, 0.19 * W))),
                  title="One-rail bank", note="cross-side bank off the right rail")


def bank_comparison(profile: Profile, speed: float) -> BankComparison | None:
    """The one-rail bank of :func:`bank_layout` on the profile and on its preset.

    Parameters
    ----------
    profile
        The profile.
    speed
        Launch speed of the bank on both tables, m/s.

    Returns
    -------
    BankComparison or None
        The aims the search finds on each table and where the object ball
        meets the rail; None on a table without pockets.
    """
    from ..physics import simulate
    from ..search import find_shots

    spec = profile.spec
    if not spec.has_pockets:
        return None
    layout = bank_layout(spec)
    obj = layout.ball_ids[1]
    found: dict[str, Shot | None] = {}
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


def _checks(profile: Profile) -> tuple[ModelFit, ...]:
    """The profile's values against the rows it records (no refit); rows the
    fit flagged keep their flag."""
    m = profile.measurements()
    spec = profile.spec
    phys = Physics.for_table(spec)
    flagged = _outlier_lines(profile)
    out = []
    if m.rebounds:
        data = ReboundData(m.rebounds, spec)
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
        roll = np.array([r.spin == "follow" for r in m.rollouts])
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
        out.append(rebound_test_check(m.rebound_tests, spec, phys).all_rows)
    return tuple(out)


def profile_report(profile: Profile, *, firm_speed_mps: float = FIRM_STROKE_MPS,
                   bank_speed_mps: float = BANK_SPEED_MPS,
                   progress: Progress | None = None) -> ProfileReport:
    """Compute what the report shows for a profile.

    Parameters
    ----------
    profile
        The profile.
    firm_speed_mps
        Speed of the standard's firm stroke, above 0 and at most 15 m/s.
    bank_speed_mps
        Speed of the compared one-rail bank, m/s.
    progress
        Called as ``progress(done, total)`` (thousandths of the work).

    Returns
    -------
    ProfileReport
        The curves, the checks, the rebound test, the bank, the cautions.

    Raises
    ------
    InputError
        For a firm speed out of range.
    """
    if not 0.0 < firm_speed_mps <= 15.0:
        raise InputError(f"firm speed {firm_speed_mps!r} m/s is out of range, must be above 0 "
                         "and at most 15")

    def step(frac: float) -> None:
        report_fraction(progress, frac)

    spec = profile.spec
    base = profile.preset
    phys = Physics.for_table(spec)
    phys0 = Physics.for_table(base)
    step(0.0)  # rebound curves
    curves = []
    angles = np.array(REPORT_ANGLES_DEG)
    prm = law_params(spec)
    prm0 = law_params(base)
    R = spec.ball.radius_m
    for spin in SPINS:
        for v in REPORT_SPEEDS_MPS:
            speeds = np.full_like(angles, v)
            roll = spin == "follow"
            vel, om = rebound_predictions(spec, speeds, angles, roll, phys.cushion_restitution,
                                          phys.cushion_restitution_slope, phys.cushion_friction,
                                          prm)
            vel0, om0 = rebound_predictions(base, speeds, angles, roll,
                                            phys0.cushion_restitution,
                                            phys0.cushion_restitution_slope,
                                            phys0.cushion_friction, prm0)
            r1 = rolled_velocity(vel, om, R)
            r0 = rolled_velocity(vel0, om0, base.ball.radius_m)
            curves.append(ReboundCurve(
                spin, v, angles,
                np.degrees(np.arctan2(vel[:, 1], vel[:, 0])),
                np.degrees(np.arctan2(vel0[:, 1], vel0[:, 0])),
                np.degrees(np.arctan2(r1[:, 1], r1[:, 0])),
                np.degrees(np.arctan2(r0[:, 1], r0[:, 0]))))
    step(0.1)  # measured rows
    checks = _checks(profile)
    step(0.2)  # standard rebound test
    top = measured_up_to(profile)
    table = table_geometry(spec)
    table0 = table_geometry(base)
    speeds = np.array(REPORT_TEST_SPEEDS_MPS)
    prof_l = np.array([standard_rebound_test(spec, phys, float(v), table).table_lengths
                       for v in speeds])
    step(0.35)  # standard rebound test
    pre_l = np.array([standard_rebound_test(base, phys0, float(v), table0).table_lengths
                      for v in speeds])
    step(0.5)  # standard rebound test
    comparison = ReboundTestComparison(
        firm_speed_mps,
        standard_rebound_test(spec, phys, firm_speed_mps, table),
        standard_rebound_test(base, phys0, firm_speed_mps, table0),
        speeds, prof_l, pre_l,
        speed_for_lengths(spec, phys, table=table),
        speed_for_lengths(base, phys0, table=table0),
        top)
    step(0.7)  # one-rail bank
    bank = bank_comparison(profile, bank_speed_mps)
    if bank is not None:
        bank = dataclasses.replace(bank, extrapolated=comparison.beyond(bank.speed_mps))
    curves = [dataclasses.replace(c, extrapolated=comparison.beyond(c.speed_mps))
              for c in curves]
    step(1.0)  # done
    return ProfileReport(profile, tuple(curves), bank, comparison, checks)


def measured_up_to(profile: Profile) -> float | None:
    """The fastest cushion speed a profile's rows measured, m/s: the incoming
    speed of its rebound rows and the launch speed of its rebound-test rows
    (which meets the cushion slower still, so a launch above it is beyond
    what was measured). None when it records neither.

    Parameters
    ----------
    profile
        The profile (its recorded rows).

    Returns
    -------
    float or None
        The speed, m/s.
    """
    m = profile.measurements()
    speeds = [r.speed_in_mps for r in m.rebounds] + [r.launch_speed_mps
                                                     for r in m.rebound_tests]
    return max(speeds) if speeds else None
