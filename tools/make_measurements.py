"""Make the invented demo measurement files in assets/measurements/ that the
cushion law reads: rebounds and the standard's rebound test (run:
``python tools/make_measurements.py``).

The files describe an invented club table whose cushions are a little dead.
They are made with the simulator's own cushion law plus noise, so that
``shotplan cushion fit`` has something realistic to find; they are not
measured on any table. The roll-out file does not depend on the cushion law
and is kept as it is.
"""

from __future__ import annotations

import math
import pathlib

import numpy as np

from shotplan.cushion.models import rebound_predictions, standard_rebound_test
from shotplan.equipment import TableSpec
from shotplan.files.write import atomic_write_text
from shotplan.physics import Physics

ROOT = pathlib.Path(__file__).resolve().parent.parent
OUT = ROOT / "assets" / "measurements"

TRUTH = {"cushion_restitution": 0.92, "cushion_restitution_slope": 0.045,
         "cushion_friction": 0.16}
"""The invented table's cushion (the values the fit should come near)."""

CLOTH = {"cloth_sliding_friction": 0.2, "cloth_rolling_resistance": 0.008}
"""The invented table's cloth, near what the demo roll-outs give."""

OUTLIER_ROW = 9
"""The row (0-based) written as a bad reading: the demo's flagged outlier."""


def rebounds(rng: np.random.Generator, n: int = 24) -> str:
    spec = TableSpec.preset("pool-9ft")
    speed = np.round(rng.uniform(0.8, 3.3, n), 2)
    angle = np.round(rng.uniform(15.0, 82.0, n)).astype(int)
    follow = rng.random(n) < 0.65
    vel, _ = rebound_predictions(spec, speed, angle, follow, TRUTH["cushion_restitution"],
                                 TRUTH["cushion_restitution_slope"], TRUTH["cushion_friction"])
    lines = ["# Invented demo data for shotplan's examples: not measured on any real table.",
             "# Rebounds off the right rail of a 9-ft table; angles from the cushion line.",
             "speed_in_mps,angle_in_deg,speed_out_mps,angle_out_deg,spin"]
    for k in range(n):
        v_out = math.hypot(vel[k, 0], vel[k, 1]) * (1.0 + rng.normal(0.0, 0.02))
        a_out = math.degrees(math.atan2(vel[k, 1], vel[k, 0])) + rng.normal(0.0, 0.5)
        if k == OUTLIER_ROW:
            v_out = 0.97 * speed[k]  # a misread timing gate: far too fast
        lines.append(f"{speed[k]:.2f},{angle[k]},{v_out:.2f},{min(a_out, 89.9):.1f},"
                     f"{'follow' if follow[k] else 'stun'}")
    return "\n".join(lines) + "\n"


def rebound_test(rng: np.random.Generator) -> str:
    spec = TableSpec.preset("pool-9ft").with_overrides({**TRUTH, **CLOTH})
    phys = Physics.for_table(spec)
    lines = ["# Invented demo data for shotplan's examples: not measured on any real table.",
             "# The standard's rebound test: centre ball from the head spot through the foot spot.",
             "launch_speed_mps,table_lengths"]
    for v in (4.0, 4.8, 5.6, 6.4):
        lengths = standard_rebound_test(spec, phys, speed_mps=v).table_lengths
        lines.append(f"{v:.1f},{lengths * (1.0 + rng.normal(0.0, 0.015)):.2f}")
    return "\n".join(lines) + "\n"


if __name__ == "__main__":
    rng = np.random.default_rng(20261204)
    atomic_write_text(OUT / "demo-rebounds.csv", rebounds(rng))
    atomic_write_text(OUT / "demo-rebound-test.csv", rebound_test(rng))
    print(f"wrote {OUT / 'demo-rebounds.csv'} and {OUT / 'demo-rebound-test.csv'}")
