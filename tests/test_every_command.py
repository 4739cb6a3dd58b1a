"""Every command on every demo file, and on random layouts: what a new user meets first.

Each command that has ``--json`` runs with it on every demo layout, drill
and measurement file, and its output must parse as strict JSON (RFC 8259
has no NaN and no Infinity: ``parse_constant`` raises on them). Each also
runs without ``--json``. Then random layouts (hypothesis), including the
hard cases: touching balls, balls frozen to a cushion, balls in a pocket's
mouth, tables other than the 9-ft one.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import pytest
from hypothesis import HealthCheck, event, given, settings
from hypothesis import strategies as st

from shotplan.cli import main
from shotplan.equipment import TableSpec

ROOT = Path(__file__).resolve().parents[1]
LAYOUTS = sorted((ROOT / "assets" / "layouts").glob("*.json"))
DRILLS = sorted((ROOT / "assets" / "drills").glob("*.json"))
MEASUREMENTS = sorted((ROOT / "assets" / "measurements").glob("*.csv"))


def _no_constants(name: str) -> None:
    raise ValueError(f"not strict JSON: {name}")


def strict(text: str) -> object:
    """Parse as RFC 8259 JSON: NaN, Infinity and -Infinity are refused."""
    return json.loads(text, parse_constant=_no_constants)


def run(capsys: pytest.CaptureFixture[str], *argv: str) -> tuple[int, str, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def run_json(capsys: pytest.CaptureFixture[str], *argv: str) -> object:
    code, out, err = run(capsys, *argv, "--json")
    assert code == 0, err
    assert "Traceback" not in err
    return strict(out)


def test_demo_files_exist():
    assert len(LAYOUTS) >= 6 and DRILLS and len(MEASUREMENTS) >= 3


def test_tables(capsys):
    doc = run_json(capsys, "tables")
    assert isinstance(doc, list) and doc
    code, out, _ = run(capsys, "tables")
    assert code == 0 and "pool-9ft" in out


@pytest.mark.parametrize("layout", LAYOUTS, ids=lambda p: p.stem)
def test_layout_commands(layout: Path, capsys, tmp_path):
    name = str(layout)
    assert run_json(capsys, "check", name)["ok"] is True
    code, out, err = run(capsys, "check", name)
    assert code == 0 and out.startswith("ok:") and err == ""

    sim = run_json(capsys, "simulate", name)
    assert sim["complete"] is True
    code, out, _ = run(capsys, "simulate", name)
    assert code == 0 and "where the balls end" in out and "diamonds" in out

    shots = run_json(capsys, "plan", name, "--top", "6")
    assert isinstance(shots, list)
    explained = run_json(capsys, "plan", name, "--explain")
    assert set(explained) == {"shots", "rejected"}
    for r in explained["rejected"]:
        assert r["reason"] and r["reason"] != "misses in simulation"
    code, out, _ = run(capsys, "plan", name, "--top", "3", "--explain")
    assert code == 0

    out_png = tmp_path / "d.png"
    assert run(capsys, "draw", name, "-o", str(out_png))[0] == 0
    assert out_png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    if shots:
        assert run(capsys, "draw", name, "--shot", "1", "-o", str(tmp_path / "s.svg"))[0] == 0
        direct = [s for s in shots if s["kind"] == "direct"]
        if direct:
            s = direct[0]
            doc = run_json(capsys, "position", name, "--ball", s["balls"][0], "--pocket",
                           s["pocket"], "--speeds=1.5,2.5", "--heights=0,0.2", "--sides=0")
            assert isinstance(doc, dict)
            code, out, _ = run(capsys, "position", name, "--ball", s["balls"][0], "--pocket",
                               s["pocket"], "--speeds=2", "--heights=0", "--sides=0")
            assert code == 0
    # The atlas on a coarse grid, in this process (a cluster is tested in test_atlas.py).
    balls = [b for b in json.loads(layout.read_text())["balls"] if b != "cue"]
    if balls:
        coarse = ("--grid", "0.35", "--kinds", "direct", "--workers", "0")
        doc = run_json(capsys, "atlas", name, "--ball", balls[0], *coarse)
        assert doc["summary"]["open_cells"] > 0
        code, out, _ = run(capsys, "atlas", name, "--ball", balls[0], *coarse,
                           "-o", str(tmp_path / "a.png"), "--csv", str(tmp_path / "a.csv"))
        assert code == 0 and (tmp_path / "a.png").exists() and (tmp_path / "a.csv").exists()


@pytest.mark.parametrize("drill", DRILLS, ids=lambda p: p.stem)
def test_drill(drill: Path, capsys):
    doc = run_json(capsys, "drill", str(drill), "--trials", "30", "--seed", "1")
    assert doc
    code, out, _ = run(capsys, "drill", str(drill), "--trials", "30", "--seed", "1")
    assert code == 0


@pytest.mark.parametrize("kind", ["window", "throw", "deflection", "aim"])
def test_study(kind: str, capsys):
    extra = ["--step", "30"]
    doc = run_json(capsys, "study", kind, *extra)
    assert isinstance(doc, dict)
    assert run(capsys, "study", kind, *extra)[0] == 0


def test_cushion_fit_and_report(capsys, tmp_path):
    profile = tmp_path / "club.json"
    files = [str(p) for p in MEASUREMENTS]
    doc = run_json(capsys, "cushion", "fit", *files, "-o", str(profile))
    assert isinstance(doc, dict) and profile.exists()
    assert run(capsys, "cushion", "fit", *files)[0] == 0
    report = run_json(capsys, "cushion", "report", str(profile))
    assert isinstance(report, dict)
    assert run(capsys, "cushion", "report", str(profile))[0] == 0


# ------------------------------------------------------------ random layouts
TABLES = ["pool-9ft", "pool-8ft", "pool-7ft", "snooker"]


@st.composite
def layouts(draw: st.DrawFn) -> dict:
    """A layout file's object: a few balls on the cloth, some of them in
    the hard places (touching another ball, frozen to a cushion, in a
    corner), and a stroke."""
    name = draw(st.sampled_from(TABLES))
    spec = TableSpec.preset(name)
    R = spec.ball.radius_m
    L, W = spec.length_m, spec.width_m
    ids = (["cue", "red1", "red2", "red3", "black", "pink"] if name == "snooker"
           else ["cue", "1", "2", "3", "8", "9"])
    n = draw(st.integers(2, 6))
    balls: dict[str, list[float]] = {}
    for bid in ids[:n]:
        how = draw(st.sampled_from(["free", "touching", "cushion", "corner"]))
        if how == "touching" and balls:
            other = draw(st.sampled_from(sorted(balls)))
            ang = draw(st.floats(0, 2 * math.pi))
            ox, oy = balls[other]
            x, y = ox + 2 * R * math.cos(ang), oy + 2 * R * math.sin(ang)
        elif how == "cushion":
            x = draw(st.floats(0.2, L - 0.2))
            y = draw(st.sampled_from([R, W - R]))
        elif how == "corner":
            x = draw(st.sampled_from([0.09, L - 0.09]))
            y = draw(st.sampled_from([R, W - R]))
        else:
            x = draw(st.floats(R, L - R))
            y = draw(st.floats(R, W - R))
        balls[bid] = [round(x, 6), round(y, 6)]
    stroke = {"direction_deg": draw(st.floats(-180, 180)), "speed_mps": draw(st.floats(0.1, 9.0)),
              "side": draw(st.floats(-0.3, 0.3)), "height": draw(st.floats(-0.35, 0.35))}
    return {"format": "shotplan-layout", "version": 1, "table": name, "balls": balls,
            "stroke": stroke}


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(doc=layouts())
def test_random_layouts_every_command(doc: dict, capsys, tmp_path_factory):
    path = tmp_path_factory.mktemp("lay") / "r.json"
    path.write_text(json.dumps(doc))
    code, out, err = run(capsys, "check", str(path), "--json")
    assert code in (0, 2) and "Traceback" not in err
    checked = strict(out)
    event("playable" if checked["ok"] else "refused")
    if not checked["ok"]:
        # a layout with problems is refused by every command that plays it,
        # in one line, exit 2
        code, out, err = run(capsys, "simulate", str(path), "--json")
        assert code == 2 and out == "" and len(err.splitlines()) == 1
        return
    code, out, err = run(capsys, "simulate", str(path), "--json")
    assert code == 0, err
    sim = strict(out)
    for ball in sim["balls"].values():
        if ball["state"] != "pocketed":
            assert math.isfinite(ball["x"]) and math.isfinite(ball["y"])
    code, out, err = run(capsys, "plan", str(path), "--json", "--kinds", "direct,bank",
                         "--top", "2", "--explain")
    assert code == 0, err
    strict(out)
    balls = [b for b in doc["balls"] if b != "cue"]
    if balls:
        code, out, err = run(capsys, "atlas", str(path), "--ball", balls[-1], "--grid", "0.45",
                             "--kinds", "direct", "--workers", "0", "--json")
        assert code == 0, err
        strict(out)
