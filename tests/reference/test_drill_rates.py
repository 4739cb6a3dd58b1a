"""Monte Carlo success rates against outside references: the normal
distribution over a shot's window (scipy.stats.norm), the Wilson interval
(scipy.stats.binomtest), the miscue share (scipy.stats.rice), and the trade's
ordering of easy and hard shots (common practice)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import stats

from shotplan.aim import ghost_ball
from shotplan.drills import (
    LEVELS,
    PlayerErrors,
    Station,
    plan_station,
    simulate_station,
    wilson_interval,
)
from shotplan.equipment import TableSpec
from shotplan.layout import Layout
from shotplan.stroke import Stroke

SPEC = TableSpec.preset("pool-9ft")
L, W, R = SPEC.length_m, SPEC.width_m, SPEC.ball.radius_m
AX = (1 / math.sqrt(2), -1 / math.sqrt(2))  # foot-right pocket axis, out of the table


def cut_layout(cut_deg: float, d_cue: float, s_ob: float) -> Layout:
    """Object ball s_ob from the foot-right corner on its axis; the cue ball
    d_cue from the ghost ball at a cut angle."""
    ob = (L - s_ob * AX[0], -s_ob * AX[1])
    g = ghost_ball(ob, (L, 0.0), R)
    a = math.atan2(AX[1], AX[0]) + math.radians(cut_deg)
    cue = (g[0] - d_cue * math.cos(a), g[1] - d_cue * math.sin(a))
    return Layout(SPEC, {"cue": cue, "1": ob})


def station(lay: Layout, **kw) -> Station:
    return Station("test", lay, "1", "foot-right", **kw)


# ------------------------------------------------- window and normal aim error
@pytest.mark.parametrize("cut, d_cue, s_ob", [(0.0, 0.5, 0.5), (30.0, 0.8, 0.8)])
def test_aim_error_alone_matches_the_window(cut, d_cue, s_ob):
    # Reference: with aim error alone (normal, sd degrees) a trial pockets
    # when the cue direction falls inside the shot's window, so the rate is
    # Phi(high/sd) - Phi(low/sd) with the edges measured from the aim
    # (scipy.stats.norm). The search's edges are the last direction known to
    # pocket, the true edge lies within its 0.01 deg bisection step beyond
    # that: the middle of the step is used.
    lay = cut_layout(cut, d_cue, s_ob)
    plan = plan_station(station(lay))
    shot = plan.shot
    assert shot is not None and plan.source == "shot search"
    aim = plan.stroke.direction_deg
    assert aim == shot.direction_deg
    sd = 0.6 * shot.window_deg  # about 60 % pocketed: a rate the test can tell apart
    high = shot.window_high_deg + 0.005 - aim
    low = shot.window_low_deg - 0.005 - aim
    expected = stats.norm.cdf(high / sd) - stats.norm.cdf(low / sd)
    assert 0.2 < expected < 0.95  # a test that can tell
    res = simulate_station(plan, PlayerErrors(sd, 0.0, 0.0), trials=4000, seed=11)
    # The Monte Carlo rate against the formula: a binomial z-score, with
    # 3.29 (two-sided 99.9 %) as the bound, so that one seed's 1-in-20 draw
    # outside the 95 % interval does not count as a disagreement.
    n = res.pocket.trials if hasattr(res.pocket, "trials") else 4000
    z = (res.pocket.rate - expected) / math.sqrt(expected * (1 - expected) / n)
    assert abs(z) < 3.29, (res.pocket.rate, expected, z, res.pocket.ci95)
    assert res.miscues == 0


# --------------------------------------------------- easy beats hard, always
@pytest.fixture(scope="module")
def easy_and_hard():
    easy = plan_station(station(cut_layout(0.0, 0.35, 0.35)))
    hard = plan_station(station(cut_layout(60.0, 1.4, 1.1)))
    return easy, hard


@pytest.mark.parametrize("level", list(LEVELS))
def test_short_straight_in_scores_higher_than_long_thin_cut(easy_and_hard, level):
    # Common practice, no source: a short straight-in is the easiest pot on
    # the table, a long thin cut among the hardest, for every player.
    easy, hard = easy_and_hard
    e = simulate_station(easy, LEVELS[level], trials=1500, seed=3)
    h = simulate_station(hard, LEVELS[level], trials=1500, seed=3)
    assert e.pocket.ci95[0] > h.pocket.ci95[1], (level, e.pocket.rate, h.pocket.rate)


@pytest.fixture(scope="module")
def medium():
    return plan_station(station(cut_layout(30.0, 0.8, 0.8)))


def test_rates_rise_as_errors_shrink(medium):
    # Common practice, no source: a steadier player pots more. The draws do
    # not depend on the level (one seed, common random numbers), so the
    # levels are compared on the same luck.
    hard = medium
    order = ["starter", "club", "strong", "elite"]
    rates = [simulate_station(hard, LEVELS[n], trials=1500, seed=5).pocket.rate for n in order]
    assert all(b >= a - 0.005 for a, b in zip(rates, rates[1:], strict=False)), rates
    assert rates[-1] > rates[0] + 0.15, rates
    # and scaling one level's errors down, step by step
    base = LEVELS["club"]
    scaled = [simulate_station(hard, PlayerErrors(base.aim_sd_deg * f, base.speed_sd_pct * f,
                                                  base.tip_sd * f), trials=1500, seed=5)
              .pocket.rate for f in (2.0, 1.0, 0.5, 0.25)]
    assert all(b >= a - 0.005 for a, b in zip(scaled, scaled[1:], strict=False)), scaled
    assert scaled[-1] > scaled[0] + 0.2, scaled


# ----------------------------------------------------------- seeds
def test_same_seed_same_numbers_other_seeds_agree(medium):
    hard = medium
    club = LEVELS["club"]
    a = simulate_station(hard, club, trials=2000, seed=21)
    b = simulate_station(hard, club, trials=2000, seed=21)
    assert (a.pocket.successes, a.position.successes, a.both.successes, a.miscues) == \
        (b.pocket.successes, b.position.successes, b.both.successes, b.miscues)
    np.testing.assert_array_equal(a.finishes, b.finishes)
    others = [simulate_station(hard, club, trials=2000, seed=s) for s in (22, 23)]
    assert any(o.pocket.successes != a.pocket.successes for o in others)
    # Independent estimates of one rate: their 95 % intervals overlap (the
    # chance that they do not is about 0.6 %, from the normal approximation).
    for o in others:
        assert o.pocket.ci95[0] <= a.pocket.ci95[1] and a.pocket.ci95[0] <= o.pocket.ci95[1]


# ------------------------------------------------------ Wilson and miscues
@pytest.mark.parametrize("k, n", [(0, 10), (5, 10), (8, 10), (10, 10), (37, 250), (9990, 10000)])
def test_wilson_interval_matches_scipy(k, n):
    # Reference: scipy.stats.binomtest(...).proportion_ci(method="wilson").
    ci = stats.binomtest(k, n).proportion_ci(confidence_level=0.95, method="wilson")
    lo, hi = wilson_interval(k, n)
    assert lo == pytest.approx(ci.low, abs=1e-12)
    assert hi == pytest.approx(ci.high, abs=1e-12)


def test_miscue_share_follows_the_rice_distribution():
    # Reference: with the tip aimed at (0, b) and normal errors of sd s in side
    # and height, the offset |(side, height)| follows a Rice distribution
    # (scipy.stats.rice, b/s, scale s); a trial miscues when it exceeds the
    # miscue limit (0.5 R by default).
    lay = cut_layout(0.0, 0.5, 0.5)
    aim = plan_station(station(lay)).stroke.direction_deg
    b, s = -0.44, 0.06
    plan = plan_station(station(lay, stroke=Stroke(aim, 2.0, 0.0, b)))
    res = simulate_station(plan, PlayerErrors(0.0, 0.0, s), trials=4000, seed=2)
    expected = stats.rice.sf(0.5, abs(b) / s, scale=s)
    assert 0.1 < expected < 0.3
    lo, hi = wilson_interval(res.miscues, res.trials)
    assert lo <= expected <= hi, (res.miscues / res.trials, expected)
    # every miscue is a failed trial on all three counts
    assert res.pocket.successes <= res.trials - res.miscues
    assert res.position.successes <= res.trials - res.miscues
