"""Hand-written code kept over a library call: the compiled real-root finder
against ``numpy.roots`` (with the real roots in the interval picked out), and
the miscue-chance quadrature against ``scipy.stats.ncx2.sf``. Both sides run
here, in one process, on the same inputs; printed as ratios, never asserted.
The comments beside the two functions quote figures measured this way."""

from __future__ import annotations

import time

import numpy as np

from shotplan.physics.roots import real_roots
from shotplan.players import miscue_probability


def _per_call(fn, n: int) -> float:
    fn()  # warm up (compilation, imports)
    t0 = time.perf_counter()
    for _ in range(n):
        fn()
    return (time.perf_counter() - t0) / n


def main() -> None:
    from scipy.stats import ncx2

    rng = np.random.default_rng(1)
    quartics = rng.standard_normal((2000, 5))
    out = np.empty(8)

    def ours_roots() -> None:
        for c in quartics:
            real_roots(c, 4, -2.0, 2.0, out)

    def numpy_roots() -> None:
        for c in quartics:
            r = np.roots(c[::-1])
            r = np.sort(r.real[(np.abs(r.imag) < 1e-9) & (r.real >= -2.0) & (r.real <= 2.0)])

    a = _per_call(ours_roots, 3) / len(quartics)
    b = _per_call(numpy_roots, 3) / len(quartics)
    print("kept code: hand-written against the library, same inputs")
    print(f"  real roots of a quartic on an interval   {a * 1e6:7.2f} us   numpy.roots "
          f"{b * 1e6:7.2f} us   ratio {b / a:5.1f}x")

    # Tips inside the miscue limit (every setting shotplan plays) and outside
    # it (a setting the user typed), limit 0.6 R, tip error 0.02-0.1 R.
    for where, offsets in (("inside the limit", (0.0, 0.2, 0.4, 0.55)),
                           ("outside the limit", (0.7, 0.9))):
        cases = [(off, 0.6, sd) for off in offsets for sd in (0.02, 0.05, 0.1)]

        def ours_miscue(cases=cases) -> None:
            for off, lim, sd in cases:
                miscue_probability(off, lim, sd)

        def scipy_miscue(cases=cases) -> None:
            for off, lim, sd in cases:
                ncx2.sf((lim / sd) ** 2, 2, (off / sd) ** 2)

        a = _per_call(ours_miscue, 10) / len(cases)
        b = _per_call(scipy_miscue, 10) / len(cases)
        worst = max(abs(miscue_probability(o, l_, s) - ncx2.sf((l_ / s) ** 2, 2, (o / s) ** 2))
                    for o, l_, s in cases)
        print(f"  miscue chance, {where:<18}        {a * 1e6:8.1f} us   ncx2.sf "
              f"{b * 1e6:8.1f} us   ratio {b / a:6.2f}x   largest difference {worst:.1e}")


if __name__ == "__main__":
    main()
