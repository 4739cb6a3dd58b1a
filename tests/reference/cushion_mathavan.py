"""Reference ball-cushion impact: the rigid-cushion model with two frictional
contacts described by Mathavan, Jackson & Parkin (2010), "A theoretical
analysis of billiard ball dynamics under cushion impacts", Proc. IMechE
Part C 224(9) 1863-1873, doi:10.1243/09544062JMES1964.

Derived independently, following the model described by Mathavan et al.
2010. The searchable record held the paper's abstract (fitted e = 0.98 and
cushion friction 0.14; rigid cushion valid up to a normal speed of about
2.5 m/s) but not its numbered equations, so the equations below are worked
out here from rigid-body impulse dynamics for exactly that set-up; they are
not copied, and no equation numbers are claimed. This module is a test
reference: it imports nothing from ``shotplan`` and is meant to be slow and
plain rather than fast.

Set-up and frame (the paper's: x along the cushion, y toward it, z up;
origin at the ball's centre):

* the cushion touches the ball at I, ``r_I = R (0, cos t, sin t)`` with
  ``sin t = (h - R) / R`` (h: nose height above the cloth); the cloth at C,
  ``r_C = (0, 0, -R)``;
* the cushion's normal impulse P (the independent variable) pushes along
  ``n_I = -(0, cos t, sin t)``; the cloth's normal impulse P_C along +z;
* slip of the ball's surface at a contact k is ``u_k = v + w x r_k`` minus
  its normal part; in the tangent bases ``e_x`` and ``(0, -sin t, cos t)``
  at I and ``e_x, e_y`` at C this gives

      x_I = v_x + w_y R sin t - w_z R cos t,   y'_I = -v_y sin t + w_x R,
      x_C = v_x - w_y R,                        y_C  = v_y + w_x R;

* Coulomb friction at both contacts (mu_w at I, mu_s at C): while a contact
  slips, its friction impulse is ``mu`` times its normal impulse, against the
  slip; when the slip comes to rest the contact sticks if the friction needed
  to hold it lies inside the cone, and otherwise slides again in the one
  direction in which slip can grow (where the slip rate under that friction
  is parallel to the friction's reverse);
* the ball stays on the cloth (``v_z`` stays 0), which ties the cloth's
  normal impulse to the cushion's: ``dP_C/dP = sin t + (friction at I)_z``,
  i.e. ``sin t - mu_w cos t * (unit slip at I along y')`` while I slips. If
  that would turn negative (only when mu_w > tan t, e.g. with the nose at the
  centre), the ball leaves the cloth for the rest of the push and C carries
  nothing until v_z comes back to 0;
* with ``dp_I = n_I + T_I^T f_I`` and ``dp_C = lam e_z + T_C^T f_C`` per unit
  P (f: friction per unit P, lam = dP_C/dP):

      dv/dP = (dp_I + dp_C) / m,   dw/dP = (r_I x dp_I + r_C x dp_C) / (2/5 m R^2);

* the normal velocity at I is ``cos t v_y + sin t v_z`` (the spin drops out:
  r_I is along n_I); compression ends when it is 0; the work of the cushion's
  normal force is ``dW/dP = -(cos t v_y + sin t v_z)``;
* restitution by Stronge's energetic coefficient (Stronge 1991, J. Appl.
  Mech. 58, 1049-1055): the impact ends when the work done in restitution is
  e^2 times the work taken in compression, ``W = (1 - e^2) W_c``.

A known fault, found by the brute-force reference beside it
(``cushion_euler.py``): for a stun ball sent straight in, the cloth's slip
passes through rest and must slide on reversed (sticking would need far
more friction than the cone allows), and this module's spin afterwards is
about 65 % off (its speed 1.2 %); everywhere else on the comparison grid the
two agree to 0.04 % of the spin. ``tests/test_cushion_law.py`` checks the
engine against the brute force in that case.

Where this may differ from the paper: its text was not at hand to see how
it treats a slip that comes to rest, so Coulomb's law is followed through
here (stick while the cone allows, else slide again in the direction the
slip grows). On the comparison grid with the paper's values and the WPA
nose height: the cushion contact sticks for a while for stun balls at 75
and 90 degrees; a rolling ball's cloth slip starts from rest (it then slides
in the one consistent direction); head on, the cushion slip of a rolling
ball and the cloth slip of stun and draw balls pass through rest and slide
again; everywhere else both contacts slide throughout. A slip below 1e-10
of the incoming speed counts as at rest.

The impulse-domain ODEs are integrated with scipy's ``solve_ivp`` (DOP853,
rtol 1e-11), piece by piece: each change of contact mode (a slip coming to
rest, a stuck contact breaking loose, the ball leaving or regaining the
cloth) and the end of compression and of restitution are located by
``solve_ivp`` events, and integration restarts in the new mode. A slip
that has just grown from rest is stiff (its direction turns fast while it is
small), so those pieces use the implicit Radau method.
"""

from __future__ import annotations

import math
from collections.abc import Iterator
from dataclasses import dataclass, field

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

__all__ = [
    "PAPER_SNOOKER",
    "WPA_POOL",
    "BallCushion",
    "GridCase",
    "Impact",
    "comparison_grid",
    "impact",
    "incoming_velocity",
    "kinetic_energy",
    "rebound",
    "rebound_angle_deg",
    "reference_rebounds",
    "spin",
]


@dataclass(frozen=True, slots=True)
class BallCushion:
    """Ball and cushion values for one set of comparisons."""

    e: float
    """Stronge's energetic restitution at the cushion contact."""
    mu_w: float
    """Ball-cushion sliding friction."""
    mu_s: float
    """Ball-cloth sliding friction."""
    radius_m: float
    """Ball radius, m."""
    mass_kg: float
    """Ball mass, kg."""
    nose_height_m: float
    """Height of the cushion's contact line above the cloth, m."""


PAPER_SNOOKER = BallCushion(
    e=0.98,  # Mathavan et al. 2010, abstract
    mu_w=0.14,  # Mathavan et al. 2010, abstract
    mu_s=0.212,  # Mathavan et al.'s table value (from memory: their earlier measurement)
    radius_m=0.02625,  # WSF: 52.5 mm ball
    mass_kg=0.141,  # from memory: snooker balls near 141 g
    nose_height_m=0.7 * 0.0525,  # from memory: the paper's h = 7R/5 (sin t = 2/5)
)
"""The paper's friction and restitution on a snooker ball and cushion."""

WPA_POOL = BallCushion(
    e=0.98,  # Mathavan et al. 2010, abstract
    mu_w=0.14,  # Mathavan et al. 2010, abstract
    mu_s=0.212,  # Mathavan et al.'s table value (from memory)
    radius_m=0.5 * 2.25 * 0.0254,  # WPA: 2.25 in ball
    mass_kg=0.163,  # WPA band 156-170 g, middle
    nose_height_m=0.635 * 2.25 * 0.0254,  # WPA: nose at 63.5 % of the ball diameter
)
"""The paper's friction and restitution with a pool ball at the WPA nose
height: the set issue 14 compares the engine with."""


@dataclass(frozen=True, slots=True)
class Impact:
    """Outcome of one impact, with what the integration went through."""

    v_out: np.ndarray
    """Centre velocity after, m/s (x along the cushion, y toward it, z up)."""
    w_out: np.ndarray
    """Spin after, rad/s, same axes."""
    p_compression: float
    """Cushion normal impulse at the end of compression, N s."""
    p_total: float
    """Cushion normal impulse over the whole impact, N s."""
    work_compression: float
    """Work of the cushion's normal force during compression, J (<= 0)."""
    work_total: float
    """Work of the cushion's normal force over the impact, J."""
    lifted: bool
    """Whether the ball left the cloth during the push."""
    log: tuple[str, ...] = field(default=())
    """Mode changes in order (``'I stick'``, ``'C slide'``, ``'end of
    compression'``...)."""


def spin(kind: str, v_in: np.ndarray, radius_m: float, side: float = 0.0) -> np.ndarray:
    """Spin of a ball arriving with velocity ``v_in`` (3-vector).

    ``kind``: ``'stun'`` (no spin about a horizontal axis), ``'rolling'``
    (no slip at the cloth), ``'draw'`` (backspin at the rolling rate).
    ``side``: spin about the vertical in units of ``|v_in| / R``; positive is
    running side (the cushion contact slides slower along the cushion than
    the ball travels along it, for a ball moving +x)."""
    vx, vy = float(v_in[0]), float(v_in[1])
    roll = np.array([-vy / radius_m, vx / radius_m, 0.0])
    factors = {"stun": 0.0, "rolling": 1.0, "draw": -1.0}
    if kind not in factors:
        raise ValueError(f"spin kind {kind!r} is not one of {sorted(factors)}")
    w = factors[kind] * roll
    w[2] = side * math.hypot(vx, vy) / radius_m
    return w


def incoming_velocity(speed_mps: float, angle_deg: float) -> np.ndarray:
    """Velocity of a ball meeting the cushion at ``angle_deg`` from the
    cushion line (90 = head on), moving +x along it and +y into it."""
    a = math.radians(angle_deg)
    return np.array([speed_mps * math.cos(a), speed_mps * math.sin(a), 0.0])


def rebound_angle_deg(v_out: np.ndarray) -> float:
    """Angle of the rebound from the cushion line, degrees (90 = straight
    back); the ball moves -y after the impact."""
    return math.degrees(math.atan2(-float(v_out[1]), float(v_out[0])))


def kinetic_energy(v: np.ndarray, w: np.ndarray, mass_kg: float, radius_m: float) -> float:
    """Translational plus rotational energy of a solid ball, J."""
    inertia = 0.4 * mass_kg * radius_m**2
    return 0.5 * mass_kg * float(v @ v) + 0.5 * inertia * float(w @ w)


def _cross_matrix(r: np.ndarray) -> np.ndarray:
    return np.array([[0.0, -r[2], r[1]], [r[2], 0.0, -r[0]], [-r[1], r[0], 0.0]])


class _Model:
    """The fixed geometry of one impact and the per-mode linear system."""

    def __init__(self, e: float, mu_w: float, mu_s: float, radius: float, mass: float, h: float):
        st = (h - radius) / radius
        if not -1.0 < st < 1.0:
            raise ValueError(f"nose height {h!r} m must lie strictly between 0 and 2 R = {2 * radius!r} m")
        ct = math.sqrt(1.0 - st * st)
        self.e, self.mu = e, {"I": mu_w, "C": mu_s}
        self.st, self.ct, self.R, self.m = st, ct, radius, mass
        inertia = 0.4 * mass * radius**2
        self.r = {"I": radius * np.array([0.0, ct, st]), "C": np.array([0.0, 0.0, -radius])}
        self.n_i = -np.array([0.0, ct, st])
        # tangent bases (rows): at I e_x and (0, -sin t, cos t); at C e_x, e_y
        self.t = {
            "I": np.array([[1.0, 0.0, 0.0], [0.0, -st, ct]]),
            "C": np.array([[1.0, 0.0, 0.0], [0.0, 1.0, 0.0]]),
        }
        # (dv, dw) per unit impulse applied at contact k: 6 x 3
        self.resp = {k: np.vstack([np.eye(3) / mass, _cross_matrix(self.r[k]) / inertia]) for k in ("I", "C")}
        # unknowns x = [f_I (2), f_C (2), lam]; (dv, dw) = G x + g0
        g = np.zeros((6, 5))
        g[:, 0:2] = self.resp["I"] @ self.t["I"].T
        g[:, 2:4] = self.resp["C"] @ self.t["C"].T
        g[:, 4] = self.resp["C"] @ np.array([0.0, 0.0, 1.0])
        self.G, self.g0 = g, self.resp["I"] @ self.n_i
        # slip of contact k (2-vector) from (v, w): T_k (v + w x r_k) = T_k (v - [r_k]x w)
        self.S = {k: self.t[k] @ np.hstack([np.eye(3), -_cross_matrix(self.r[k])]) for k in ("I", "C")}

    def slip(self, k: str, y: np.ndarray) -> np.ndarray:
        return self.S[k] @ y[:6]

    def solve(self, modes: dict[str, tuple[str, np.ndarray | None]], airborne: bool) -> np.ndarray:
        """Friction and cloth impulse rates x for the given contact modes.

        ``modes[k]`` is ``('slide', unit slip direction)`` or ``('stick',
        None)``."""
        kind_i, s_i = modes["I"]
        kind_c, s_c = modes["C"]
        if kind_i == "slide" and (airborne or kind_c == "slide"):
            # Both known in closed form: the same equations, solved by hand.
            assert s_i is not None and s_c is not None
            x = np.zeros(5)
            x[0:2] = -self.mu["I"] * s_i
            if not airborne:
                x[4] = -(self.g0[2] + self.G[2, 0:2] @ x[0:2]) / self.G[2, 4]
                x[2:4] = -self.mu["C"] * x[4] * s_c
            return x
        a = np.zeros((5, 5))
        b = np.zeros(5)
        row = 0
        if airborne:  # the cloth carries nothing
            a[0:3, 2:5] = np.eye(3)
            row = 3
        else:  # v_z stays 0
            a[0] = self.G[2]
            b[0] = -self.g0[2]
            row = 1
        for k, cols in (("I", slice(0, 2)), ("C", slice(2, 4))):
            if k == "C" and airborne:
                continue
            kind, s = modes[k]
            if kind == "slide":
                assert s is not None
                a[row : row + 2, cols] = np.eye(2)
                if k == "I":
                    b[row : row + 2] = -self.mu["I"] * s
                else:
                    a[row : row + 2, 4] = self.mu["C"] * s
            else:
                a[row : row + 2] = self.S[k] @ self.G
                b[row : row + 2] = -self.S[k] @ self.g0
            row += 2
        return np.linalg.solve(a, b)

    def rates(self, x: np.ndarray, y: np.ndarray) -> np.ndarray:
        dvw = self.G @ x + self.g0
        dwork = -(self.ct * y[1] + self.st * y[2])
        return np.concatenate([dvw, [dwork]])


_FREE = "free"  # no friction at this contact
_SLIDE_FIXED = "fixed"  # sliding in a direction chosen at a slip's rest
_SLIDE_FOLLOW = "follow"  # sliding against the current slip
_STICK = "stick"


def _mode_args(
    model: _Model, modes: dict[str, str], dirs: dict[str, np.ndarray], y: np.ndarray
) -> dict[str, tuple[str, np.ndarray | None]]:
    out: dict[str, tuple[str, np.ndarray | None]] = {}
    for k, mode in modes.items():
        if mode == _FREE:
            out[k] = ("slide", np.zeros(2))
        elif mode == _STICK:
            out[k] = ("stick", None)
        elif mode == _SLIDE_FIXED:
            out[k] = ("slide", dirs[k])
        else:
            u = model.slip(k, y)
            size = float(np.linalg.norm(u))
            out[k] = ("slide", u / size if size > 0.0 else np.zeros(2))
    return out


_ROOM = 1e-13  # margin on zero-crossing tests of quantities that can sit at exactly 0


def _cone_room(model: _Model, k: str, x: np.ndarray) -> float:
    """How far a stuck contact's friction is inside its cone (>= 0 inside)."""
    f = x[0:2] if k == "I" else x[2:4]
    normal = 1.0 if k == "I" else x[4]
    return model.mu[k] * normal - float(np.linalg.norm(f))


def _slide_direction(
    model: _Model, k: str, modes: dict[str, str], dirs: dict[str, np.ndarray], y: np.ndarray, airborne: bool
) -> np.ndarray:
    """The direction in which contact k's slip grows from rest while it
    slides: the slip rate under friction against ``s`` is parallel to ``s``."""

    def rate(beta: float) -> tuple[float, float]:
        s = np.array([math.cos(beta), math.sin(beta)])
        trial = dict(modes)
        trial[k] = _SLIDE_FIXED
        args = _mode_args(model, trial, {**dirs, k: s}, y)
        x = model.solve(args, airborne)
        a = model.S[k] @ (model.G @ x + model.g0)
        return float(a[0] * s[1] - a[1] * s[0]), float(a @ s)

    betas = np.linspace(-math.pi, math.pi, 721)
    vals = [rate(b) for b in betas]
    best: tuple[float, float] | None = None
    for i in range(len(betas) - 1):
        (c0, d0), (c1, d1) = vals[i], vals[i + 1]
        if c0 == 0.0 and d0 > 0.0:
            root = float(betas[i])
        elif c0 * c1 < 0.0 and (d0 > 0.0 or d1 > 0.0):
            root = brentq(lambda b: rate(b)[0], betas[i], betas[i + 1], xtol=1e-15, rtol=1e-15)
        else:
            continue
        growth = rate(root)[1]
        if growth > 0.0 and (best is None or growth > best[1]):
            best = (root, growth)
    if best is None:
        raise RuntimeError(f"no direction in which the slip at {k} can grow")
    return np.array([math.cos(best[0]), math.sin(best[0])])


def _decide(
    model: _Model, k: str, modes: dict[str, str], dirs: dict[str, np.ndarray], y: np.ndarray, airborne: bool
) -> None:
    """Contact k's slip is at rest: stick if the cone allows, else slide."""
    trial = dict(modes)
    trial[k] = _STICK
    x = model.solve(_mode_args(model, trial, dirs, y), airborne)
    ok = all(_cone_room(model, j, x) >= 0.0 for j, mode in trial.items() if mode == _STICK)
    if ok and (airborne or x[4] >= 0.0):
        modes[k] = _STICK
        return
    dirs[k] = _slide_direction(model, k, modes, dirs, y, airborne)
    modes[k] = _SLIDE_FIXED


def impact(
    v_in: np.ndarray,
    w_in: np.ndarray,
    e: float,
    mu_w: float,
    mu_s: float,
    radius_m: float,
    mass_kg: float,
    nose_height_m: float,
) -> Impact:
    """Integrate one cushion impact over the cushion's normal impulse.

    ``v_in`` (m/s) and ``w_in`` (rad/s) are 3-vectors in the cushion frame
    (x along the cushion, y toward it, z up); the ball must be moving into
    the cushion (``v_y > 0``) and resting on the cloth (``v_z = 0``)."""
    v0 = np.asarray(v_in, dtype=float).reshape(3)
    w0 = np.asarray(w_in, dtype=float).reshape(3)
    if not (v0[1] > 0.0 and v0[2] == 0.0):
        raise ValueError(
            f"v_in {v0.tolist()!r} must move into the cushion (v_y > 0) along the cloth (v_z = 0)"
        )
    if not (0.0 <= e <= 1.0 and mu_w >= 0.0 and mu_s >= 0.0):
        raise ValueError(f"need 0 <= e <= 1 and friction >= 0, got e={e!r}, mu_w={mu_w!r}, mu_s={mu_s!r}")
    model = _Model(e, mu_w, mu_s, radius_m, mass_kg, nose_height_m)
    scale = max(float(np.linalg.norm(v0)), radius_m * float(np.linalg.norm(w0)))
    tol = 1e-10 * scale  # a slip this small counts as at rest
    p_scale = mass_kg * scale
    y = np.concatenate([v0, w0, [0.0]])
    modes: dict[str, str] = {}
    dirs: dict[str, np.ndarray] = {}
    airborne = False
    log: list[str] = []
    for k in ("I", "C"):
        modes[k] = _FREE if model.mu[k] == 0.0 else _SLIDE_FOLLOW
    for k in ("I", "C"):
        if modes[k] != _FREE and np.linalg.norm(model.slip(k, y)) <= tol:
            _decide(model, k, modes, dirs, y, airborne)
            log.append(f"{k} {modes[k]} at start")
    young: set[str] = set()  # contacts whose slip grew from rest: stiff while it is small
    compressing = True
    work_c = 0.0
    p = 0.0
    p_c = 0.0
    for _segment in range(200):
        if not airborne and model.solve(_mode_args(model, modes, dirs, y), False)[4] < -_ROOM:
            airborne = True  # the cloth would have to pull: the ball lifts from here on
            log.append("leaves the cloth")
        frozen_air = airborne
        active = {k: m for k, m in modes.items() if not (k == "C" and frozen_air)}
        if frozen_air:
            active["C"] = _FREE  # unused: the cloth carries nothing
        frozen_dirs = dict(dirs)

        memo: dict[bytes, np.ndarray] = {}

        def xs(y_: np.ndarray, _m=active, _d=frozen_dirs, _a=frozen_air, _memo=memo) -> np.ndarray:
            key = y_.tobytes()
            if key not in _memo:  # the events look again at the points the steps end on
                if len(_memo) > 64:
                    _memo.clear()
                _memo[key] = model.solve(_mode_args(model, _m, _d, y_), _a)
            return _memo[key]

        def rhs(_p: float, y_: np.ndarray) -> np.ndarray:
            return model.rates(xs(y_), y_)

        events = []
        names = []
        if compressing:

            def ev_comp(_p: float, y_: np.ndarray) -> float:
                return model.ct * y_[1] + model.st * y_[2]

            ev_comp.direction = -1  # type: ignore[attr-defined]
            events.append(ev_comp)
            names.append("end of compression")
        else:
            target = (1.0 - e * e) * work_c

            def ev_rest(_p: float, y_: np.ndarray, _t=target) -> float:
                return (y_[6] - _t) / (p_scale * scale)

            ev_rest.direction = 1  # type: ignore[attr-defined]
            events.append(ev_rest)
            names.append("end of restitution")
        for k, mode in active.items():
            if mode == _FREE:
                continue
            if mode == _SLIDE_FOLLOW:

                def ev_rest_slip(_p: float, y_: np.ndarray, _k=k) -> float:
                    return float(np.linalg.norm(model.slip(_k, y_))) - tol

                ev_rest_slip.direction = -1  # type: ignore[attr-defined]
                events.append(ev_rest_slip)
                names.append(f"{k} slip at rest")
            elif mode == _SLIDE_FIXED:

                def ev_grown(_p: float, y_: np.ndarray, _k=k) -> float:
                    return float(np.linalg.norm(model.slip(_k, y_))) - 10.0 * tol

                ev_grown.direction = 1  # type: ignore[attr-defined]
                events.append(ev_grown)
                names.append(f"{k} slip grown")
            else:

                def ev_cone(_p: float, y_: np.ndarray, _k=k) -> float:
                    return _cone_room(model, _k, xs(y_)) + _ROOM

                ev_cone.direction = -1  # type: ignore[attr-defined]
                events.append(ev_cone)
                names.append(f"{k} breaks loose")
        if frozen_air:

            def ev_land(_p: float, y_: np.ndarray) -> float:
                return y_[2] / scale

            ev_land.direction = -1  # type: ignore[attr-defined]
            events.append(ev_land)
            names.append("back on the cloth")
        else:

            def ev_lift(_p: float, y_: np.ndarray) -> float:
                return float(xs(y_)[4]) + _ROOM

            ev_lift.direction = -1  # type: ignore[attr-defined]
            events.append(ev_lift)
            names.append("leaves the cloth")
        for ev in events:
            ev.terminal = True  # type: ignore[attr-defined]
        span = 50.0 * p_scale  # far more than any impact needs (about 2 m v)
        # Slip that grew from rest stays small for a while, and the friction
        # direction u/|u| then turns quickly: stiff, so an implicit method.
        stiff = any(active.get(k) == _SLIDE_FOLLOW for k in young)
        sol = solve_ivp(
            rhs,
            (p, p + span),
            y,
            method="Radau" if stiff else "DOP853",
            rtol=1e-11,
            atol=1e-14 * scale,
            events=events,
        )
        if sol.status != 1:
            raise RuntimeError(f"impact integration did not end on an event: {sol.message}")
        hit = [i for i, t in enumerate(sol.t_events) if len(t)]
        i = hit[0]
        p = float(sol.t_events[i][0])
        y = sol.y_events[i][0].copy()
        name = names[i]
        log.append(name)
        if name == "end of compression":
            compressing = False
            work_c = float(y[6])
            p_c = p
            if e == 0.0:
                break
        elif name == "end of restitution":
            break
        elif name.endswith("slip at rest"):
            young.discard(name[0])
            _decide(model, name[0], modes, dirs, y, airborne)
            log.append(f"{name[0]} {modes[name[0]]}")
        elif name.endswith("slip grown"):
            modes[name[0]] = _SLIDE_FOLLOW
            young.add(name[0])
        elif name.endswith("breaks loose"):
            k = name[0]
            dirs[k] = _slide_direction(model, k, modes, dirs, y, airborne)
            modes[k] = _SLIDE_FIXED
        elif name == "leaves the cloth":
            airborne = True
        elif name == "back on the cloth":
            airborne = False
            y[2] = 0.0
            if modes["C"] == _FREE:
                pass
            elif np.linalg.norm(model.slip("C", y)) <= tol:
                _decide(model, "C", modes, dirs, y, airborne)
            else:
                modes["C"] = _SLIDE_FOLLOW
    else:
        raise RuntimeError("impact needed more than 200 mode changes")
    return Impact(
        v_out=y[0:3].copy(),
        w_out=y[3:6].copy(),
        p_compression=p_c,
        p_total=p,
        work_compression=work_c,
        work_total=float(y[6]),
        lifted=any(s == "leaves the cloth" for s in log),
        log=tuple(log),
    )


def rebound(
    v_in: np.ndarray,
    w_in: np.ndarray,
    e: float,
    mu_w: float,
    mu_s: float,
    radius_m: float,
    mass_kg: float,
    nose_height_m: float,
) -> tuple[np.ndarray, np.ndarray]:
    """Velocity (m/s) and spin (rad/s) after the impact; see :func:`impact`."""
    out = impact(v_in, w_in, e, mu_w, mu_s, radius_m, mass_kg, nose_height_m)
    return out.v_out, out.w_out


@dataclass(frozen=True, slots=True)
class GridCase:
    """One incoming state of the comparison grid."""

    speed_mps: float
    """Speed at the cushion, m/s."""
    angle_deg: float
    """Angle of incidence from the cushion line, degrees (90 = head on)."""
    spin_name: str
    """``stun``, ``rolling``, ``draw``, ``running side`` or ``reverse side``."""
    v_in: np.ndarray
    """Velocity, m/s, in the cushion frame."""
    w_in: np.ndarray
    """Spin, rad/s, in the cushion frame."""


GRID_SPEEDS = (0.5, 1.0, 2.0, 3.0, 4.0)
"""Speeds of issue 14's comparison, m/s."""
GRID_ANGLES = (15.0, 30.0, 45.0, 60.0, 75.0, 90.0)
"""Angles from the cushion of issue 14's comparison, degrees."""
GRID_SPINS = ("stun", "rolling", "draw", "running side", "reverse side")
"""Spins of issue 14's comparison; the side cases roll and carry side spin
of ``0.5 |v| / R`` (a tip about 0.2 R off centre, by ``w = 5 v b / 2 R^2``)."""


def comparison_grid(
    radius_m: float = WPA_POOL.radius_m,
    speeds: tuple[float, ...] = GRID_SPEEDS,
    angles: tuple[float, ...] = GRID_ANGLES,
    spins: tuple[str, ...] = GRID_SPINS,
) -> Iterator[GridCase]:
    """The incoming states over which an engine law is compared with this
    reference (issue 14: speeds 0.5-4 m/s, 15-90 degrees from the cushion,
    stun, rolling, draw and side)."""
    for speed in speeds:
        for angle in angles:
            v = incoming_velocity(speed, angle)
            for name in spins:
                if name.endswith("side"):
                    side = 0.5 if name.startswith("running") else -0.5
                    w = spin("rolling", v, radius_m, side=side)
                else:
                    w = spin(name, v, radius_m)
                yield GridCase(speed, angle, name, v, w)


def reference_rebounds(
    s: BallCushion = WPA_POOL, cases: list[GridCase] | None = None
) -> list[tuple[GridCase, Impact]]:
    """The reference's outcome for each case (default: the whole
    :func:`comparison_grid` for ``s``'s ball, about half a minute); compare
    an engine law with ``rebound_angle_deg(impact.v_out)`` and
    ``|impact.v_out|``."""
    todo = list(comparison_grid(s.radius_m)) if cases is None else cases
    return [
        (c, impact(c.v_in, c.w_in, s.e, s.mu_w, s.mu_s, s.radius_m, s.mass_kg, s.nose_height_m)) for c in todo
    ]
