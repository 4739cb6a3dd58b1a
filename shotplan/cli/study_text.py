"""The studies' text tables, as ``shotplan study`` prints them.

Each table is laid out by :func:`shotplan.cli.text.format_table`, every
column right-aligned; the words around it say what the cells are.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..render.charts import curve_labels, table_name
from .text import format_table, right

if TYPE_CHECKING:
    from ..study import AimTable, DeflectionStudy, ThrowStudy, WindowStudy

__all__ = ["format_study"]


def _grid(header: list[str], rows: list[list[str]]) -> list[str]:
    return format_table(right(*header), rows)


def _num(value: float | None, fmt: str, none: str = "-") -> str:
    # Adding 0.0 turns -0.0 into 0.0, which reads better than "-0.00".
    return none if value is None else format(round(value, 6) + 0.0, fmt)



def format_study(result: WindowStudy | ThrowStudy | DeflectionStudy | AimTable) -> str:
    """The study as a table for the terminal.

    Parameters
    ----------
    result : WindowStudy, ThrowStudy, DeflectionStudy or AimTable
        A study's result.

    Returns
    -------
    str
        The lines, joined.
    """
    from .. import study

    if isinstance(result, study.WindowStudy):
        return _format_window(result)
    if isinstance(result, study.ThrowStudy):
        return _format_throw(result)
    if isinstance(result, study.DeflectionStudy):
        return _format_deflection(result)
    if isinstance(result, study.AimTable):
        return _format_aim(result)
    raise TypeError(f"not a study result: {type(result).__name__}")



def _format_window(r: WindowStudy) -> str:
    curves = r.curves()
    keys = [k for k, _ in curves]
    labels = curve_labels(keys)
    x_name = "cut" if r.against == "cut" else "approach"
    xs = sorted({r.x_of(p) for p in r.points})
    pockets = sorted({k[0] for k in keys})
    fixed = (f"approach {r.points[0].approach_deg:g} deg" if r.against == "cut"
             else f"cut {r.points[0].cut_deg:g} deg")
    speed = f"{r.speed_mps:g} m/s" if r.speed_mps is not None else "a sensible pace per shot"
    dists = sorted({k[2] for k in keys})
    cues = sorted({k[3] for k in keys})
    lines = [f"window against {x_name} angle: {table_name(r.table)}, pocket {', '.join(pockets)}, "
             f"{fixed}, speed {speed}",
             f"d: object ball to the pocket's mouth ({', '.join(f'{v:g}' for v in dists)} m); "
             f"D: cue ball to the ghost ball ({', '.join(f'{v:g}' for v in cues)} m)",
             "each cell: window in degrees at the cue ball / mm at the object ball; "
             "'miss': nothing pockets; '-': the balls do not fit", ""]
    by = [{r.x_of(p): p for p in pts} for _, pts in curves]
    rows = []
    for x in xs:
        row = [f"{x:g}\u00b0"]
        for table in by:
            p = table.get(x)
            if p is None or p.window_deg is None:
                row.append("-")
            elif not p.made:
                row.append("miss")
            else:
                row.append(f"{p.window_deg:.2f}\u00b0 {p.window_mm:.1f}")
        rows.append(row)
    lines += _grid([x_name, *labels], rows)
    largest = [f"{lab}: {c[f'largest_{r.against}_deg']:g}\u00b0" if c[f"largest_{r.against}_deg"]
               is not None else f"{lab}: none" for lab, c in zip(labels, r.largest(), strict=True)]
    lines += ["", f"largest {x_name} that pockets: " + "; ".join(largest)]
    spins = []
    for tip in dict.fromkeys(k[1] for k in keys):
        got = [p.spin_ratio for p in r.points if p.tip == tip and p.spin_ratio is not None]
        if got:
            spins.append(f"{tip} {_num(min(got), '+.2f')} to {_num(max(got), '+.2f')}")
    if spins:
        lines.append("spin at contact (R w / v: +1 follow, 0 stun, below 0 draw): "
                     + "; ".join(spins))
    lines.append(f"({r.simulations} simulations, {r.seconds:.1f} s)")
    return "\n".join(lines)


def _format_throw(r: ThrowStudy) -> str:
    from ..stroke import speed_word

    speeds = sorted({p.speed_mps for p in r.points})
    spins = list(dict.fromkeys(p.spin for p in r.points))
    lines = [f"throw against cut angle: {table_name(r.table)}, pocket {r.pocket}, cue ball "
             f"{r.cue_distance_m:g} m from the ghost ball, side spin {r.side_offset:g} R",
             "throw: object ball off the line of centres, deg (+ fuller: toward the cue ball's "
             "path); aim: correction off the ghost ball, deg (+ thinner), squirt included"]
    for spin in spins:
        pts = {(p.speed_mps, p.cut_deg): p for p in r.points if p.spin == spin}
        header = ["cut"]
        for v in speeds:
            header += [f"{speed_word(v)} {v:.1f} m/s throw", "aim"]
        rows = []
        for cut in sorted({p.cut_deg for p in r.points}):
            row = [f"{cut:g}\u00b0"]
            for v in speeds:
                p = pts.get((v, cut))
                row += [_num(p.throw_deg if p else None, "+.2f"),
                        _num(p.aim_correction_deg if p else None, "+.2f")]
            rows.append(row)
        lines += ["", f"{spin}:"] + _grid(header, rows)
    notes = sorted({p.note for p in r.points if p.note})
    if notes:
        lines += ["", "missing values: " + "; ".join(notes)]
    peaks = [f"{c['spin']} {c['speed_mps']:g} m/s at {c['peak_cut_deg']:g}\u00b0"
             for c in r.peaks() if c["peak_cut_deg"] is not None]
    lines += ["", "largest throw: " + "; ".join(peaks), f"({r.seconds:.1f} s)"]
    return "\n".join(lines)


def _format_deflection(r: DeflectionStudy) -> str:
    spins = list(dict.fromkeys(p.spin for p in r.points))
    pts = {(p.spin, p.cut_deg): p for p in r.points}
    cuts = sorted({p.cut_deg for p in r.points})
    lines = [f"cue-ball deflection against cut angle: {table_name(r.table)}, launch {r.speed_mps:g} m/s, "
             f"cue ball {r.cue_distance_m:g} m from the ghost ball",
             "degrees from the cue ball's original line, away from the object ball; 'after': "
             "right after contact, 'final': once the spin has taken hold", ""]
    header = ["cut"]
    for s in spins:
        header += [f"{s} after", f"{s} final"]
    header += ["90-deg rule", "30-deg rule"]
    rows = []
    for cut in cuts:
        row = [f"{cut:g}\u00b0"]
        ref = None
        for s in spins:
            p = pts.get((s, cut))
            ref = ref or p
            row += [_num(p.initial_deg if p else None, ".1f"), _num(p.final_deg if p else None, ".1f")]
        row += [_num(ref.ninety_rule_deg if ref else None, ".1f"),
                _num(ref.thirty_rule_deg if ref else None, ".1f")]
        rows.append(row)
    lines += _grid(header, rows)
    stun = [p.separation_deg for p in r.points if p.spin == "stun"
            and p.separation_deg is not None and p.cut_deg > 0]
    if stun:
        lo, hi = min(stun), max(stun)
        lines += ["", f"stun: cue ball and object ball separate at {lo:.1f} to {hi:.1f} deg "
                  f"(90 with e = 1 and no friction; e = {r.physics.ball_restitution:g} here)"]
    notes = sorted({p.note for p in r.points if p.note})
    if notes:
        lines += ["missing values: " + "; ".join(notes)]
    lines.append(f"({r.seconds:.1f} s)")
    return "\n".join(lines)


def _format_aim(r: AimTable) -> str:
    d = r.table.ball.diameter_m * 1000.0
    lines = [f"aim references: {d:.2f} mm balls ({table_name(r.table)}); fraction = how much "
             "of the object ball the cue ball covers", ""]
    header = ["cut", "fraction", "overlap", "ghost offset mm", "contact offset mm",
              f"aim angle at {r.cue_distance_m:g} m"]
    rows = [[f"{x.cut_deg:.4g}\u00b0", f"{x.fraction:.3f}", x.overlap, f"{x.ghost_offset_mm:.1f}",
             f"{x.contact_offset_mm:.1f}", f"{x.aim_angle_deg:.2f}\u00b0"] for x in r.entries]
    lines += _grid(header, rows)
    lines += ["", "named hits: " + ", ".join(f"{w} {c:.1f}\u00b0" for w, c in r.named)]
    return "\n".join(lines)
