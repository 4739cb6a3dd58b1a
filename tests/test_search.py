"""Shot search: proposals pocket in simulation, windows behave as the trade
knows, throw corrections go the right way."""

import math

import pytest

from shotplan.aim import ghost_ball
from shotplan.equipment import TableSpec
from shotplan.errors import InputError
from shotplan.layout import Layout
from shotplan.physics import Physics, simulate
from shotplan.search import find_shots
from shotplan.stroke import tip_height
from shotplan.table import Table

SPEC = TableSpec.preset("pool-9ft")
L, W, R = SPEC.length_m, SPEC.width_m, SPEC.ball.radius_m
TABLE = Table(SPEC)
AX = (1 / math.sqrt(2), -1 / math.sqrt(2))  # foot-right pocket axis, out of the table


def straight_in(s_ob: float, d_cue: float) -> Layout:
    """Object ball on the foot-right pocket's axis, s_ob from the corner,
    cue ball d_cue behind the ghost ball on the same line."""
    ob = (L - s_ob * AX[0], -s_ob * AX[1])
    k = d_cue + 2 * R
    cue = (ob[0] - k * AX[0], ob[1] - k * AX[1])
    return Layout(SPEC, {"cue": cue, "1": ob})


def cut_layout(cut_deg: float, d_cue: float = 0.6, s_ob: float = 0.6, sign: float = 1.0) -> Layout:
    """Same object ball, cue ball at d_cue from the ghost ball at a cut angle."""
    ob = (L - s_ob * AX[0], -s_ob * AX[1])
    g = ghost_ball(ob, (L, 0.0), R)
    a = math.atan2(AX[1], AX[0]) + sign * math.radians(cut_deg)
    cue = (g[0] - d_cue * math.cos(a), g[1] - d_cue * math.sin(a))
    return Layout(SPEC, {"cue": cue, "1": ob})


def only(lay, **kw):
    res = find_shots(lay, kinds=["direct"], balls=["1"], pockets=["foot-right"], **kw)
    assert res.shots, res.rejected
    return res.shots[0]


def test_no_throw_aim_is_the_ghost_ball():
    # With no ball-ball friction there is no throw: the simulator's aim must
    # be the ghost-ball construction (trade geometry, common practice).
    lay = cut_layout(25.0)
    shot = only(lay, physics=Physics(ball_friction=0.0))
    assert shot.direction_deg == pytest.approx(shot.ghost_direction_deg, abs=0.005)
    assert shot.cut_angle_deg == pytest.approx(25.0, abs=1e-6)
    assert shot.contact_fraction == pytest.approx(1 - math.sin(math.radians(25.0)))


def test_straight_in_ranks_first_with_cut_zero():
    lay = straight_in(0.5, 0.5).with_ball("2", (0.8, 0.9))
    res = find_shots(lay)
    best = res.shots[0]
    assert best.kind == "direct" and best.balls == ("1",) and best.pocket == "foot-right"
    assert best.cut_angle_deg == pytest.approx(0.0, abs=1e-6)


def test_windows_shrink_as_the_cut_grows():
    # common practice, no source: thinner cuts forgive less
    widths = [only(cut_layout(c)).window_deg for c in (0, 15, 30, 45, 60)]
    assert all(a > b for a, b in zip(widths, widths[1:], strict=False)), widths


@pytest.mark.parametrize("vary", ["cue", "object"])
def test_windows_shrink_as_distances_grow(vary):
    # common practice, no source: longer shots forgive less
    if vary == "cue":
        widths = [only(straight_in(0.5, d)).window_deg for d in (0.3, 0.6, 1.0)]
    else:
        widths = [only(straight_in(s, 0.5)).window_deg for s in (0.3, 0.6, 1.0)]
    assert all(a > b for a, b in zip(widths, widths[1:], strict=False)), widths


def test_straight_in_window_within_the_pocket_geometry_bounds():
    # Derived by hand from the pocket geometry. A cue direction error a
    # (rad) moves the cue ball's line by D*a at the ghost ball (D = cue to
    # ghost), which cuts the object ball by D*a/(2R): it leaves that far off
    # the axis and arrives d_m*D*a/(2R) off centre at the mouth line (d_m =
    # object ball to mouth line). So a window of 4 R w / (D d_m) rad for an
    # allowed centre offset w. Lower bound: the ball passes the rounded jaw
    # tips without touching them, w = half the throat at the drop line minus
    # the contact offset. Upper bound: the centre must pass inside the jaw
    # points, w = half the mouth. A slow ball that touches a jaw may still
    # drop, so the simulated window lies between the two.
    lay = straight_in(0.6, 0.6)
    shot = only(lay)
    p = TABLE.pocket("foot-right")
    throat = math.dist(p.jaws[0].face_end, p.jaws[1].face_end)
    ob = lay.position("1")
    d_m = abs((ob[0] - p.mouth_centre[0]) * p.axis[0] + (ob[1] - p.mouth_centre[1]) * p.axis[1])
    D = 0.6
    low = math.degrees(4 * R * (throat / 2 - TABLE.contact_offset) / (D * d_m))
    high = math.degrees(4 * R * (p.mouth_width_m / 2) / (D * d_m))
    assert low <= shot.window_deg <= high, (low, shot.window_deg, high)


@pytest.mark.parametrize("name", ["straight", "cut"])
def test_every_proposal_pockets_and_its_window_edges_are_sharp(name):
    lay = straight_in(0.5, 0.7) if name == "straight" else cut_layout(35.0, 0.8, 0.7)
    res = find_shots(lay, kinds=["direct", "bank"], top=4)
    assert res.shots
    for shot in res.shots:
        stroke = shot.stroke()
        last = shot.balls[-1]
        assert simulate(lay, stroke).pocketed().get(last) == shot.pocket
        for edge, outward in ((shot.window_low_deg, -0.05), (shot.window_high_deg, 0.05)):
            assert simulate(lay, stroke.replace(direction_deg=edge)).pocketed().get(last) == \
                shot.pocket
            if shot.kind != "direct":
                # A long bank can drop again by another route just past a
                # miss; its window is the run of directions around the aim.
                continue
            out = simulate(lay, stroke.replace(direction_deg=edge + outward))
            assert out.pocketed().get(last) != shot.pocket or "cue" in out.pocketed()


def test_blocked_ball_is_not_proposed_direct():
    lay = straight_in(0.7, 0.5)
    ob = lay.position("1")
    # a blocker halfway between the object ball and the pocket, on the line
    blocker = (ob[0] + 0.3 * AX[0], ob[1] + 0.3 * AX[1])
    lay = lay.with_ball("2", blocker)
    res = find_shots(lay, kinds=["direct"], balls=["1"], pockets=["foot-right"])
    assert not res.shots
    assert any(r.reason == "ball 1's path to the pocket is blocked by ball 2" for r in res.rejected)


def test_bank_found_where_the_mirror_construction_says():
    # Object ball near the left rail; the side-left pocket is blocked by a
    # ball, but the mirror image of side-left in the right rail's contact
    # line (y = R_eff, worked by hand: image at (1.27, 2 R_eff - W + 0.0) -
    # see aim.mirror_point) gives a clean one-rail cross-side bank, bouncing
    # where the line to the image crosses y = R_eff.
    from shotplan.aim import aim_at, mirror_point

    ob = (1.05, 0.95)
    lay = Layout(SPEC, {"cue": (1.00, 1.20), "1": ob, "2": (1.15, 1.11)})
    reff = TABLE.contact_offset
    target = TABLE.pocket("side-left").drop_centre
    image = mirror_point(target, (0.0, 0.0), (0.0, 1.0), reff)
    s = (ob[1] - reff) / (ob[1] - image[1])
    bounce = (ob[0] + s * (image[0] - ob[0]), reff)
    assert 0.1 < bounce[0] < L / 2 - 0.1  # on the right rail, clear of the pockets
    res = find_shots(lay, kinds=["bank", "direct"], balls=["1"], pockets=["side-left"])
    assert not [s for s in res.shots if s.kind == "direct"]  # ball 2 is in the way
    banks = [s for s in res.shots if s.rails == ("right rail",)]
    assert banks, res.rejected
    # The simulated aim lies near the mirror aim: a real cushion is not a
    # mirror (restitution, friction, the nose above the centre), so allow
    # a few degrees.
    mirror_aim = aim_at(lay.position("cue"), ob, bounce, R).direction_deg
    assert abs(banks[0].direction_deg - mirror_aim) < 4.0


def test_throw_on_a_slow_half_ball_cut():
    # Published throw analysis (collision-induced throw, 2007; friction fit to
    # Marlow's 1995 data): for a stun shot the object ball leaves at
    # atan(min(mu(v_slip), 2 tan(phi) / (7 (1 + e)))) off the line of centres,
    # thrown toward the cue ball's side of the cut; at a slow half-ball hit
    # about 5 degrees (from memory of the published curves: 4-6 degrees).
    lay = cut_layout(30.0, d_cue=0.2, s_ob=0.35)
    shot = only(lay, speed=1.3, tip="stun")
    out = simulate(lay, shot.stroke().replace(direction_deg=shot.ghost_direction_deg))
    hit = next(e for e in out.events if e.kind.word == "collision")
    cue_before = out.state_of("cue", hit.t - 1e-9)
    v = math.hypot(cue_before.vx, cue_before.vy)
    # a stun: still sliding at contact, no spin about the horizontal
    assert cue_before.state.word == "sliding"
    assert math.hypot(cue_before.wx, cue_before.wy) * R < 0.01 * v
    phi = math.radians(30.0)
    v_slip = v * math.sin(phi)
    mu = 9.951e-3 + 0.108 * math.exp(-1.088 * v_slip)
    e = Physics().ball_restitution
    published = math.degrees(math.atan(min(mu, 2 * math.tan(phi) / (7 * (1 + e)))))
    assert 4.0 <= published <= 6.0
    assert abs(shot.throw_deg) == pytest.approx(published, abs=0.3)
    # Right direction: thrown toward the cue ball's side, so the shot must be
    # overcut: the corrected aim turns away from the ghost-ball aim on the
    # side opposite the object ball's line.
    ob_line = math.degrees(math.atan2(AX[1], AX[0]))
    ghost_off = (shot.ghost_direction_deg - ob_line + 180) % 360 - 180
    corrected_off = (shot.direction_deg - ob_line + 180) % 360 - 180
    assert abs(corrected_off) > abs(ghost_off)
    assert math.copysign(1, corrected_off) == math.copysign(1, ghost_off)


def test_follow_and_draw_throw_less_than_stun():
    # Published throw analysis: spin about the horizontal adds vertical slip
    # at the contact, which lowers the friction and so the throw (common
    # practice too: "follow and draw reduce throw").
    lay = cut_layout(30.0, d_cue=0.3, s_ob=0.35)
    stun = abs(only(lay, speed=1.5, tip="stun").throw_deg)
    follow = abs(only(lay, speed=1.5, tip="follow").throw_deg)
    draw = abs(only(lay, speed=1.5, tip="draw").throw_deg)
    assert follow < stun and draw < stun


def test_stun_height_leaves_no_spin_at_contact():
    # tip_height('stun') is derived from the sliding closed forms; check it in
    # the simulator: at contact the cue ball's spin about the horizontal is 0.
    lay = straight_in(0.5, 0.8)
    v = 3.0
    h = tip_height("stun", v, 0.8, Physics())
    shot = only(lay, speed=v, tip="stun")
    assert shot.height == pytest.approx(h)
    out = simulate(lay, shot.stroke())
    hit = next(e for e in out.events if e.kind.word == "collision")
    s = out.state_of("cue", hit.t - 1e-9)
    assert math.hypot(s.wx, s.wy) * R < 0.01 * math.hypot(s.vx, s.vy)
    # and the cue ball stops dead on the straight-in shot (common practice)
    fin = out.final["cue"]
    cue_hit = (s.x, s.y)
    assert math.dist((fin["x"], fin["y"]), cue_hit) < 0.03


def test_bad_options():
    lay = straight_in(0.5, 0.5)
    with pytest.raises(InputError, match="not a kind"):
        find_shots(lay, kinds=["massé"])
    with pytest.raises(InputError, match="not an object ball"):
        find_shots(lay, balls=["9"])
    with pytest.raises(InputError, match="tip choice"):
        find_shots(lay, tip="sideways")


def test_scratch_rejected_unless_allowed():
    # Straight in with follow, short: the cue ball follows the object ball in.
    lay = straight_in(0.25, 0.3)
    res = find_shots(lay, kinds=["direct"], balls=["1"], pockets=["foot-right"], tip="follow",
                     speed=2.0)
    assert not res.shots
    assert any(r.reason.startswith("scratches") for r in res.rejected)
    res = find_shots(lay, kinds=["direct"], balls=["1"], pockets=["foot-right"], tip="follow",
                     speed=2.0, allow_scratch=True)
    assert res.shots and res.shots[0].scratch and res.shots[0].cue_finish is None


@pytest.mark.parametrize("side", [-0.3, 0.2, 0.35])
def test_aim_corrects_for_squirt(side):
    # Squirt by the cue's end mass (published end-mass analysis of squirt):
    # tan(alpha) = (5/2) a sqrt(1 - a^2) / (1 + m/m_e + (5/2)(1 - a^2)), the
    # ball leaving to the left of the cue line for right english. With no
    # ball-ball friction (no throw) the search's aim must differ from the
    # centre-ball aim by exactly that, turned the other way.
    phys = Physics(ball_friction=0.0)
    lay = cut_layout(20.0, d_cue=0.6, s_ob=0.5)
    plain = only(lay, physics=phys, speed=2.5)
    english = only(lay, physics=phys, speed=2.5, side=side)
    m, m_e = SPEC.ball.mass_kg, phys.cue_end_mass_kg
    alpha = math.degrees(math.atan(2.5 * side * math.sqrt(1 - side**2)
                                   / (1 + m / m_e + 2.5 * (1 - side**2))))
    assert english.direction_deg - plain.direction_deg == pytest.approx(-alpha, abs=0.02)


def test_side_beyond_the_miscue_limit_is_refused():
    with pytest.raises(InputError, match="miscue limit"):
        find_shots(straight_in(0.5, 0.5), side=0.51)


@pytest.mark.parametrize("tip", ["stun", "draw"])
def test_chosen_heights_keep_the_club_tip_room(tip):
    # Hand-worked: the club level's tip error is 0.04 R (sd), so the tip
    # room is 0.5 - 2.5 * 0.04 = 0.40 R; no height the search chooses itself
    # may go beyond it, with or without side.
    from pathlib import Path

    from shotplan.layout import load_layout

    root = Path(__file__).resolve().parents[1] / "assets" / "layouts"
    for name in ("club-night-1-straight-in", "club-night-2-cut-to-corner"):
        lay = load_layout(root / f"{name}.json")
        for side in (0.0, 0.3):
            res = find_shots(lay, tip=tip, side=side, kinds=["direct"])
            assert res.shots
            for s in res.shots:
                assert math.hypot(s.side, s.height) <= 0.40 + 1e-9


def test_a_side_beyond_the_tip_room_is_refused():
    from pathlib import Path

    from shotplan.errors import InputError
    from shotplan.layout import load_layout
    from shotplan.players import PlayerErrors

    lay = load_layout(Path(__file__).resolve().parents[1] / "assets" / "layouts"
                      / "club-night-2-cut-to-corner.json")
    with pytest.raises(InputError, match="no room"):
        find_shots(lay, side=0.45)
    # an elite player's room (0.5 - 2.5 * 0.015 = 0.4625 R) has space for it
    assert find_shots(lay, side=0.45, kinds=["direct"], player=PlayerErrors.level("elite")).shots


# ------------------------------------------------ named run, stroke player
def test_run_record_of_a_straight_in_stun_shot():
    # One engine run read by name: on a straight-in shot the cue ball's first
    # contact is the object ball, the object ball falls in the pocket on its
    # line, and a stun shot stops the cue ball about where it met the object
    # ball (common practice, no source: "stop shot"; a few cm of follow-on
    # from the ball restitution below 1).
    from shotplan.physics.run import StrokePlayer
    from shotplan.physics.state import EV_COLLISION

    lay = straight_in(0.5, 0.6)
    shot = only(lay, speed=2.0, tip="stun")
    sp = StrokePlayer.for_layout(lay)
    run = sp.play(shot.direction_deg, shot.speed_mps, shot.side, shot.height)
    ob, cue = sp.ids.index("1"), sp.cue
    k, other = run.first_collision(cue)
    assert other == ob and run.event_kind[k] == EV_COLLISION
    assert run.pocket_of(ob) == TABLE.pocket_index("foot-right")
    assert run.pocket_of(cue) == -1
    assert sp.pots(run, ob, ob, TABLE.pocket_index("foot-right"))
    assert not sp.pots(run, ob, ob, TABLE.pocket_index("foot-left"))
    ghost = ghost_ball(lay.position("1"), TABLE.pocket("foot-right").drop_centre, R)
    assert math.dist(run.finish(cue), ghost) < 0.05
    assert run.n_events == len(run.event_t) and run.n_segments == len(run.seg_t)
    assert sp.runs == 1


def test_the_search_counts_every_engine_run():
    # SearchResult.simulations is the stroke player's count: running the same
    # search twice costs the same number of runs, and a search with fewer
    # kinds costs fewer (a subset of the same candidates).
    lay = cut_layout(20.0).with_ball("2", (0.8, 0.9))
    full = find_shots(lay)
    assert full.simulations == find_shots(lay).simulations > 0
    assert find_shots(lay, kinds=["direct"]).simulations < full.simulations


def test_rails_are_named_records_facing_into_the_table():
    # A six-pocket table has six straight cushions: the head and foot rails
    # and two halves of each long rail, split by the side pockets (trade
    # fact, common practice); each normal is a unit vector into the bed.
    from shotplan.search.candidates import rails_of

    rails = rails_of(TABLE)
    names = sorted(r.name for r in rails)
    assert names == ["foot rail", "head rail", "left rail", "left rail", "right rail",
                     "right rail"]
    for r in rails:
        assert math.hypot(*r.normal) == pytest.approx(1.0)
        inward = (L / 2 - r.start[0]) * r.normal[0] + (W / 2 - r.start[1]) * r.normal[1]
        assert inward > 0
    halves = [r for r in rails if r.name == "left rail"]
    assert halves[0].faces_like(halves[1])
    assert not any(r.faces_like(q) for r in rails for q in rails
                   if r.name != q.name)


def test_stroke_physics_loads_without_the_engine():
    # tip_height and default_speed are closed forms: importing them must not
    # start numba (the engine loads on first simulation only).
    import subprocess
    import sys

    code = ("import sys, shotplan.stroke as s; "
            "print(callable(s.tip_height), callable(s.default_speed), 'numba' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.split() == ["True", "True", "False"]
