"""The ``shotplan`` command on good input: tables, check, draw."""

from __future__ import annotations

import json
import os
import struct
import subprocess
import sys
from pathlib import Path

import pytest

from shotplan import __version__
from shotplan.cli import main
from shotplan.equipment import PRESETS

ROOT = Path(__file__).resolve().parent.parent
DEMOS = sorted((ROOT / "assets" / "layouts").glob("club-night-*.json"))
CONTRACT = {"name", "length_m", "width_m", "ball_diameter_m", "ball_mass_kg",
            "corner_mouth_m", "side_mouth_m", "cushion_nose_height_m"}


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_version(capsys):
    code, out, err = run(capsys, "--version")
    assert code == 0 and out.strip() == f"shotplan {__version__}"


def test_tables_json(capsys):
    code, out, err = run(capsys, "tables", "--json")
    assert code == 0 and err == ""
    rows = json.loads(out)
    assert [r["name"] for r in rows] == list(PRESETS)
    for r in rows:
        assert CONTRACT <= set(r), r["name"]
    by = {r["name"]: r for r in rows}
    # WPA: 9-ft playing surface 100 x 50 in, ball 2.25 in
    assert by["pool-9ft"]["length_m"] == pytest.approx(2.54)
    assert by["pool-9ft"]["width_m"] == pytest.approx(1.27)
    assert by["pool-9ft"]["ball_diameter_m"] == pytest.approx(0.05715)
    # carom tables have no pockets: null, not 0 (UMB)
    assert by["carom"]["corner_mouth_m"] is None and by["carom"]["side_mouth_m"] is None


def test_tables_readable(capsys):
    code, out, err = run(capsys, "tables")
    assert code == 0
    lines = out.splitlines()
    assert len(lines) == 1 + len(PRESETS)
    assert lines[0].split()[:3] == ["name", "playing", "surface"]
    nine = next(line for line in lines if line.startswith("pool-9ft"))
    assert "2.540 x 1.270 m (100 x 50 in)" in nine  # WPA 100 x 50 in
    assert "57.15 mm (2.25 in)" in nine  # WPA ball
    carom = next(line for line in lines if line.startswith("carom"))
    assert carom.count(" - ") >= 1  # no mouths


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_check_demo_layouts(path, capsys):
    code, out, err = run(capsys, "check", str(path))
    assert code == 0 and err == ""
    n = len(json.loads(path.read_text())["balls"])
    table = json.loads(path.read_text())["table"]
    table = table if isinstance(table, str) else table["preset"]
    assert out.strip() == f"ok: {path}: {n} balls on {table}"
    code, out, err = run(capsys, "check", str(path), "--json")
    assert code == 0
    assert json.loads(out) == {"file": str(path), "ok": True, "table": table, "balls": n,
                               "problems": []}


def test_check_lists_every_problem(tmp_path, capsys):
    path = tmp_path / "two.json"
    path.write_text(json.dumps({
        "format": "shotplan-layout", "version": 1, "table": "pool-9ft",
        "balls": {"cue": [0.6, 0.6], "1": [0.62, 0.6], "2": [1.0, 9.0]},
    }))
    code, out, err = run(capsys, "check", str(path))
    assert code == 2
    # Problems are diagnostics: nothing on stdout, one line each on stderr
    # (so `check bad.json > /dev/null` still shows them), then the count.
    assert out == ""
    assert err.splitlines() == [
        f"shotplan: error: {path}: balls.1: [0.62, 0.6] overlaps ball 'cue' by 37.1 mm "
        "(centres 20.0 mm apart, balls need at least 57.15 mm)",
        f"shotplan: error: {path}: balls.2: [1.0, 9.0] is off the table (the table is 2.54 x 1.27 m)",
        f"shotplan: error: {path}: 2 problems",
    ]
    code, out, err = run(capsys, "check", str(path), "--json")
    assert code == 2
    got = json.loads(out)
    assert got["ok"] is False and [p["ball"] for p in got["problems"]] == ["1", "2"]
    # With --json the problems are in the JSON; stderr has their count (README).
    assert err.splitlines() == [f"shotplan: error: {path}: 2 problems"]


def test_console_entry_point_runs():
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    proc = subprocess.run([sys.executable, "-m", "shotplan", "check", str(DEMOS[0])],
                          capture_output=True, text=True, env=env, timeout=60)
    assert proc.returncode == 0 and proc.stdout.startswith("ok: ") and proc.stderr == ""


# ------------------------------------------------------------------------ draw
MAGIC = {
    ".png": b"\x89PNG\r\n\x1a\n",  # PNG signature (ISO/IEC 15948)
    ".pdf": b"%PDF-",  # PDF header (ISO 32000)
}


@pytest.mark.parametrize("suffix", [".png", ".svg", ".pdf"])
def test_draw_writes_a_valid_file(suffix, tmp_path, capsys):
    pytest.importorskip("shotplan.render.export")
    pytest.importorskip("shotplan.render.scene")
    out = tmp_path / f"diagram{suffix}"
    code, stdout, err = run(capsys, "draw", str(DEMOS[1]), "-o", str(out), "--title",
                            "Thirty degrees", "--dpi", "60")
    assert code == 0, err
    assert stdout.strip() == f"wrote {out}"
    data = out.read_bytes()
    if suffix == ".svg":
        text = data.decode("utf-8")
        assert "<svg" in text[:2000] and text.rstrip().endswith("</svg>")  # SVG 1.1 root
    else:
        assert data.startswith(MAGIC[suffix])
    if suffix == ".png":
        # IHDR, the first chunk: width and height, big-endian (ISO/IEC 15948)
        assert data[12:16] == b"IHDR"
        width, height = struct.unpack(">II", data[16:24])
        assert width > height > 0  # a table is longer than it is wide
    if suffix == ".pdf":
        assert b"%%EOF" in data[-64:]
    assert os.listdir(tmp_path) == [out.name]  # no temporary file left


def test_draw_replaces_an_old_diagram(tmp_path, capsys):
    pytest.importorskip("shotplan.render.export")
    out = tmp_path / "d.png"
    out.write_bytes(b"old")
    code, _, err = run(capsys, "draw", str(DEMOS[0]), "-o", str(out), "--dpi", "40")
    assert code == 0, err
    assert out.read_bytes().startswith(MAGIC[".png"])
    assert os.listdir(tmp_path) == ["d.png"]
