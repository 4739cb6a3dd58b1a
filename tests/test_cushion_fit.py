"""shotplan.cushion and the ``shotplan cushion`` commands.

Checks against outside references (the simulator, scipy, published
standards) live in tests/reference/test_cushion_fit_reference.py; here are
the file rules, the fitting decisions, the profile and the commands.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest

from shotplan import cushion as cf
from shotplan.cli import main
from shotplan.equipment import TableSpec
from shotplan.errors import InputError
from shotplan.layout import Layout, load_layout

POOL = TableSpec.preset("pool-9ft")
DEMO = Path(__file__).resolve().parents[1] / "assets" / "measurements"
REBOUND_HEADER = "speed_in_mps,angle_in_deg,speed_out_mps,angle_out_deg,spin"


def rebound_rows(n: int, seed: int = 0, e0: float = 0.9, slope: float = 0.04, mu: float = 0.2,
                 noise: float = 0.01) -> list[tuple[float, float, float, float, str]]:
    """Rebounds through the cushion law with relative speed noise and angle
    noise of the same size in radians."""
    rng = np.random.default_rng(seed)
    v = rng.uniform(0.5, 4.0, n)
    a = rng.uniform(15.0, 85.0, n)
    roll = np.arange(n) % 2 == 0
    vel, _om = cf.rebound_predictions(POOL, v, a, roll, e0, slope, mu)
    speed = np.hypot(vel[:, 0], vel[:, 1]) * (1 + noise * rng.standard_normal(n))
    angle = np.degrees(np.arctan2(vel[:, 1], vel[:, 0])) + math.degrees(noise) * \
        rng.standard_normal(n)
    return [(float(v[i]), float(a[i]), float(speed[i]), float(angle[i]),
             "follow" if roll[i] else "stun") for i in range(n)]


def write_rebounds(path: Path, rows) -> Path:
    lines = ["# test data", REBOUND_HEADER]
    lines += [f"{v:.6f},{a:.6f},{s:.6f},{o:.6f},{spin}" for v, a, s, o, spin in rows]
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def measurements(rows) -> cf.Measurements:
    return cf.Measurements(rebounds=tuple(cf.ReboundRow(*r, file="t.csv", line=i + 2)
                                          for i, r in enumerate(rows)),
                           files=(("t.csv", "rebound"),))


# ------------------------------------------------------------ file reading
def test_kind_comes_from_the_columns(tmp_path):
    reb = write_rebounds(tmp_path / "r.csv", rebound_rows(4))
    ro = tmp_path / "o.csv"
    ro.write_text("launch_speed_mps,distance_m,note\n0.4,1.0,first\n0.5,1.6,second\n")
    st = tmp_path / "s.csv"
    st.write_text("launch_speed_mps,table_lengths\n4.8,3.1\n5.5,3.5\n")
    m = cf.read_measurements([reb, ro, st])
    assert [k for _f, k in m.files] == ["rebound", "rollout", "rebound_test"]
    assert len(m.rebounds) == 4 and len(m.rollouts) == 2 and len(m.rebound_tests) == 2
    assert m.rollouts[0].spin == cf.DEFAULT_SPIN == "follow"  # no spin column
    assert m.old_spin_files == ()
    assert m.rebounds[0].line == 3  # the comment line counts
    assert m.rebound_tests[1] == cf.ReboundTestRow(5.5, 3.5, str(st), 3)


def test_spin_and_column_names_ignore_case_and_spaces(tmp_path):
    p = tmp_path / "r.csv"
    p.write_text(" Speed_In_MPS , angle_in_deg,speed_out_mps,angle_out_deg,SPIN\n"
                 "1.0, 30 ,0.8,33,Stun\n\n1.0,40,0.8,43,Follow\n")
    rows = cf.read_measurement_file(p).rebounds
    assert [r.spin for r in rows] == ["stun", "follow"]
    assert rows[1].line == 4


def test_the_old_roll_word_is_read_as_follow_and_named(tmp_path):
    # Files written before the one roll word say "rolling": still read for
    # one version, as "follow", and the file is named for the deprecation line.
    old, new = tmp_path / "old.csv", tmp_path / "new.csv"
    old.write_text("speed_in_mps,angle_in_deg,speed_out_mps,angle_out_deg,spin\n"
                   "1.0,40,0.8,43,rolling\n1.0,30,0.8,33,stun\n")
    new.write_text(old.read_text().replace("rolling", "follow"))
    m_old, m_new = cf.read_measurement_file(old), cf.read_measurement_file(new)
    assert [r.spin for r in m_old.rebounds] == [r.spin for r in m_new.rebounds] == ["follow", "stun"]
    assert m_old.old_spin_files == (str(old),) and m_new.old_spin_files == ()
    assert cf.read_measurements([new, old]).old_spin_files == (str(old),)


BAD_FILES = [
    # (file text, words the one line must contain)
    ("speed_in_mps,angle_in_deg,speed_out_mps\n1,30,0.8\n",
     ["line 1", "missing column 'angle_out_deg'", "speed_in_mps,angle_in_deg"]),
    ("speed_in,angle_in_deg,speed_out_mps,angle_out_deg\n1,30,0.8,33\n",
     ["'speed_in'", "units missing", "speed_in_mps"]),
    ("launch_speed_mps,distance_cm\n1,20\n",
     ["'distance_cm'", "unit 'cm' is not accepted", "distance_m"]),
    (REBOUND_HEADER + "\n1,30,0.8,33,stun\n1,thirty,0.8,33,stun\n",
     ["line 3 (row 2)", "column 'angle_in_deg'", "'thirty' is not a number", "at most 90"]),
    (REBOUND_HEADER + "\n1,30,0.8,33,stun\n1,30,nan,33,stun\n",
     ["line 3 (row 2)", "column 'speed_out_mps'", "not a finite number"]),
    (REBOUND_HEADER + "\n-1.5,30,0.8,33,stun\n1,30,0.8,33,stun\n",
     ["line 2 (row 1)", "column 'speed_in_mps'", "negative", "above 0"]),
    (REBOUND_HEADER + "\n1,95,0.8,33,stun\n1,30,0.8,33,stun\n",
     ["line 2 (row 1)", "column 'angle_in_deg'", "out of range", "at most 90"]),
    (REBOUND_HEADER + "\n1,0,0.8,33,stun\n",
     ["column 'angle_in_deg'", "out of range", "above 0"]),
    (REBOUND_HEADER + "\n1,30,0.8,33,backspin\n",
     ["column 'spin'", "'backspin'", "stun, follow"]),
    (REBOUND_HEADER + "\n1,30,0.8\n",
     ["line 2 (row 1)", "3 values", "5 columns"]),
    (REBOUND_HEADER + "\n1,30,0.8,33,stun\n",
     ["1 rebound row", "at least 3"]),
    ("launch_speed_mps,distance_m\n0.5,1.5\n", ["1 roll-out row", "at least 2"]),
    ("launch_speed_mps,table_lengths\n4.8,3.2\n", ["1 rebound-test row", "at least 2"]),
    ("", ["the file is empty", "speed_in_mps"]),
    ("# only a comment\n\n", ["the file is empty"]),
    (REBOUND_HEADER + "\n", ["no data rows"]),
    ("speed_in_mps;angle_in_deg;speed_out_mps;angle_out_deg\n1;30;0.8;33\n",
     ["separated by commas"]),
    ("launch_speed_mps,distance_m,table_lengths\n1,2,3\n",
     ["'distance_m' does not belong", "one kind of measurement per file"]),
    ("wobble_factor\n1\n", ["unknown column 'wobble_factor'", "valid columns"]),
    ("launch_speed_mps\n1\n", ["missing column 'distance_m'"]),
    ("speed_in_mps,speed_in_mps,angle_in_deg,speed_out_mps,angle_out_deg\n",
     ["'speed_in_mps' appears twice"]),
]


@pytest.mark.parametrize("text,words", BAD_FILES, ids=[w[0] for _t, w in BAD_FILES])
def test_bad_file_one_line_exit_2_nothing_written(tmp_path, capsys, text, words):
    data = tmp_path / "meas.csv"
    data.write_text(text, encoding="utf-8")
    out = tmp_path / "profile.json"
    plot = tmp_path / "fit.png"
    rc = main(["cushion", "fit", str(data), "-o", str(out), "--plot", str(plot)])
    err = capsys.readouterr().err
    assert rc == 2
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith("shotplan: error: ")
    assert str(data) in lines[0]
    for w in words:
        assert w in lines[0], (w, lines[0])
    assert "Traceback" not in err
    assert not out.exists() and not plot.exists()
    assert list(tmp_path.iterdir()) == [data]  # no temporary files left either


@pytest.mark.parametrize("make", ["folder", "missing", "binary", "latin1"])
def test_unreadable_files(tmp_path, capsys, make):
    p = tmp_path / "m.csv"
    if make == "folder":
        p.mkdir()
        want = "is a folder"
    elif make == "missing":
        want = "no such file"
    elif make == "binary":
        p.write_bytes(b"speed_in_mps\x00\x01")
        want = "not a text file"
    else:
        p.write_bytes("speed_in_mps,angle_in_deg\n1,2\xb0\n".encode("latin-1"))
        want = "not UTF-8"
    assert main(["cushion", "fit", str(p)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and want in err[0] and str(p) in err[0]


def test_bad_output_paths_refused_before_any_work(tmp_path, capsys):
    data = write_rebounds(tmp_path / "r.csv", rebound_rows(6))
    assert main(["cushion", "fit", str(data), "-o", str(tmp_path / "p.txt")]) == 2
    assert "must end in one of .json" in capsys.readouterr().err
    assert main(["cushion", "fit", str(data), "--plot", str(tmp_path / "p.gif")]) == 2
    assert main(["cushion", "fit", str(data), "-o", str(tmp_path / "nofolder" / "p.json")]) == 2
    assert main(["cushion", "fit", str(data), "-o", str(tmp_path / "r.csv")]) == 2
    assert main(["cushion"]) == 2
    assert "an action is needed" in capsys.readouterr().err
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.csv"]


# ------------------------------------------------------------ fitting rules
def test_outliers_flagged_reported_and_kept_unless_asked(tmp_path):
    rows = rebound_rows(20, seed=3)
    v, a, s, o, spin = rows[7]
    rows[7] = (v, a, s * 1.3, o, spin)  # a mis-timed rebound
    m = measurements(rows)
    kept = cf.fit_measurements(m)
    assert [r.line for r in kept.outliers] == [9]
    assert kept.rebound.used == "all rows"
    assert kept.rows_used == 20
    assert kept.rebound.without_outliers is not None
    assert len(kept.rebound.without_outliers.rows) == 19
    doc = kept.to_dict()
    assert doc["rows_used"] == 20 and doc["outliers"][0]["line"] == 9
    assert any("--drop-outliers" in n for n in kept.notes)
    dropped = cf.fit_measurements(m, drop_outliers=True)
    assert dropped.rebound.used == "without outliers"
    assert dropped.rows_used == 19
    assert len(dropped.outliers) == 1  # still reported
    # The wild row pulls the all-rows fit; without it the estimates are closer
    # to the values the rows were made with.
    e_all = kept.estimate("cushion_restitution").value
    e_clean = dropped.estimate("cushion_restitution").value
    assert abs(e_clean - 0.9) < abs(e_all - 0.9)


def test_modified_z_hand_worked():
    # Iglewicz and Hoaglin (1993): z = 0.6745 (x - median) / MAD.
    # By hand for [1, 2, 3, 4, 100]: median 3, |x - 3| = [2, 1, 0, 1, 97],
    # MAD = 1, so z = 0.6745 * [-2, -1, 0, 1, 97]; only 100 exceeds 3.5.
    z = cf.modified_z(np.array([1.0, 2.0, 3.0, 4.0, 100.0]), 1.0)
    np.testing.assert_allclose(z, 0.6745 * np.array([-2, -1, 0, 1, 97]))
    assert list(np.abs(z) > cf.OUTLIER_Z) == [False, False, False, False, True]


def test_no_outlier_check_with_few_rows():
    fit = cf.fit_measurements(measurements(rebound_rows(4, seed=1)))
    assert fit.outliers == ()
    assert any("outliers: not checked" in n for n in fit.notes)


def test_auto_model_choice():
    flat = cf.fit_measurements(measurements(rebound_rows(30, seed=5, slope=0.0)))
    assert flat.rebound.chosen.estimate("cushion_restitution_slope") is None
    assert flat.overrides()["cushion_restitution_slope"] == 0.0
    assert flat.to_dict()["restitution_model"] == "constant"
    steep = cf.fit_measurements(measurements(rebound_rows(30, seed=5, slope=0.06)))
    assert steep.rebound.chosen.estimate("cushion_restitution_slope") is not None
    assert steep.to_dict()["restitution_model"] == "linear"
    assert len(steep.rebound.alternatives) == 1  # the constant fit, reported too
    forced = cf.fit_measurements(measurements(rebound_rows(30, seed=5, slope=0.06)),
                                 restitution="constant")
    assert forced.rebound.chosen.estimate("cushion_restitution_slope") is None


def test_inconsistent_rows_are_refused():
    rows = rebound_rows(8, seed=2)
    swapped = [(s, a, v, o, spin) for v, a, s, o, spin in rows]  # speed in and out swapped
    with pytest.raises(InputError, match="restitution of 1.*above 1.*swapped"):
        cf.fit_measurements(measurements(swapped))
    narrow = [(2.0, 60.0 + i, 1.6, 63.0 + i, "stun") for i in range(6)]
    with pytest.raises(InputError, match="span only a factor"):
        cf.fit_measurements(measurements(narrow), restitution="linear")
    with pytest.raises(InputError, match="not a restitution model"):
        cf.fit_measurements(measurements(rows), restitution="cubic")


def test_friction_not_determined_by_square_rebounds():
    # Straight-in rebounds all at 90 degrees: friction (up the tilted nose)
    # and restitution both only scale the speed out, so the rows cannot tell
    # them apart. Friction keeps its default and is not written; the
    # restitution fitted with it reproduces the rows.
    rows = [(v, 90.0, 0.8 * v, 90.0, "stun") for v in (0.8, 1.2, 1.6, 2.0, 2.4)]
    fit = cf.fit_measurements(measurements(rows), restitution="constant")
    assert "cushion_friction" not in fit.overrides()
    assert any("cushion_friction is not determined" in n for n in fit.notes)
    e0 = fit.estimate("cushion_restitution").value
    vel, _om = cf.rebound_predictions(POOL, [1.0], [90.0], False, e0, 0.0, 0.14)
    assert math.hypot(*vel[0]) == pytest.approx(0.8, abs=1e-6)


def test_rollout_sliding_friction_kept_when_undetermined():
    # Noisy stun roll-outs: the slide is a few per cent of the distance.
    rng = np.random.default_rng(4)
    v = np.array([0.3, 0.4, 0.5, 0.6, 0.35, 0.45, 0.55, 0.65])
    roll = np.arange(8) < 4
    d = cf.rollout_distance(v, roll, 0.2, 0.009) * (1 + 0.03 * rng.standard_normal(8))
    rows = tuple(cf.RolloutRow(v[i], d[i], "follow" if roll[i] else "stun", "o.csv", i + 2)
                 for i in range(8))
    fit = cf.fit_measurements(cf.Measurements(rollouts=rows, files=(("o.csv", "rollout"),)))
    assert "cloth_sliding_friction" not in fit.overrides()
    assert "cloth_rolling_resistance" in fit.overrides()
    assert any("cloth_sliding_friction keeps its default" in n for n in fit.notes)


def test_rebound_test_rows_alone_fit_a_constant_restitution():
    spec = POOL.with_overrides({"cushion_restitution": 0.93})
    rows = tuple(cf.ReboundTestRow(v, cf.standard_rebound_test(spec, speed_mps=v).table_lengths,
                                   "s.csv", i + 2) for i, v in enumerate((3.5, 4.5, 5.5)))
    fit = cf.fit_measurements(cf.Measurements(rebound_tests=rows,
                                              files=(("s.csv", "rebound_test"),)))
    assert fit.overrides() == {"cushion_restitution": pytest.approx(0.93, abs=1e-4)}
    assert fit.to_dict()["restitution_model"] == "constant"


# ------------------------------------------------------------ profile
def test_profile_is_a_layout_table_and_simulates(tmp_path, capsys):
    data = write_rebounds(tmp_path / "r.csv", rebound_rows(12, seed=7))
    prof = tmp_path / "table.json"
    assert main(["cushion", "fit", str(data), "-o", str(prof)]) == 0
    assert "wrote" in capsys.readouterr().out
    doc = json.loads(prof.read_text())
    assert doc["format"] == cf.PROFILE_FORMAT and doc["version"] == 1
    table = doc["table"]
    assert table["preset"] == "pool-9ft"
    assert set(table) == {"preset", "cushion_restitution", "cushion_restitution_slope",
                          "cushion_friction"}
    # Paste the table object into a layout: it loads, checks and simulates.
    lay_file = tmp_path / "bank.json"
    lay_file.write_text(json.dumps({
        "format": "shotplan-layout", "version": 1, "table": table,
        "balls": {"cue": [0.7, 0.8], "1": [1.0, 0.25]},
        "stroke": {"direction_deg": -60.0, "speed_mps": 2.5}}))
    layout = load_layout(lay_file)
    assert layout.table.cushion.restitution == pytest.approx(table["cushion_restitution"])
    assert main(["simulate", str(lay_file), "--json"]) == 0
    events = json.loads(capsys.readouterr().out)["events"]
    assert any(e["kind"] == "cushion" for e in events)
    # The profile reads back with its record.
    p = cf.load_profile(prof)
    assert p.spec == layout.table
    assert len(p.measurements().rebounds) == 12
    assert p.fit["cushion_restitution_se"] > 0


def test_profile_errors(tmp_path):
    bad = tmp_path / "p.json"
    bad.write_text(json.dumps({"format": cf.PROFILE_FORMAT, "version": 1,
                               "table": {"preset": "pool-9ft", "cushion_restitution": 3.0}}))
    with pytest.raises(InputError, match=r"table.cushion_restitution: 3.0 is out of range"):
        cf.load_profile(bad)
    bad.write_text(json.dumps({"format": "something", "table": {}}))
    with pytest.raises(InputError, match="is not a table profile"):
        cf.load_profile(bad)
    bare = tmp_path / "bare.json"
    bare.write_text(json.dumps({"preset": "pool-8ft", "cloth_rolling_resistance": 0.008}))
    assert cf.load_profile(bare).spec.cloth.rolling_resistance == 0.008


# ------------------------------------------------------------ commands
def test_fit_json_fields(tmp_path, capsys):
    data = write_rebounds(tmp_path / "r.csv", rebound_rows(10, seed=9))
    assert main(["cushion", "fit", str(data), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    for key in ("cushion_restitution", "cushion_restitution_se", "cushion_friction",
                "cushion_friction_se", "rows_used", "outliers", "table", "fits",
                "standard_rebound_test"):
        assert key in doc
    assert doc["rows_used"] == 10
    assert isinstance(doc["outliers"], list)
    assert doc["standard_rebound_test"]["standard_minimum"] == 4.0
    assert not list(tmp_path.glob("*.json"))  # --json alone writes nothing


def test_demo_files_fit_and_report(tmp_path, capsys):
    files = sorted(str(p) for p in DEMO.glob("*.csv"))
    assert len(files) == 3
    for f in files:
        assert "Invented demo data" in Path(f).read_text().splitlines()[0]
    prof = tmp_path / "demo.json"
    plot = tmp_path / "fit.svg"
    assert main(["cushion", "fit", *files, "-o", str(prof), "--plot", str(plot)]) == 0
    out = capsys.readouterr().out
    assert "outlier:" in out and "demo-rebounds.csv line 13" in out
    assert plot.read_text().lstrip().startswith("<?xml")
    pdf = tmp_path / "report.pdf"
    assert main(["cushion", "report", str(prof), "-o", str(pdf)]) == 0
    text = capsys.readouterr().out
    assert pdf.read_bytes()[:5] == b"%PDF-"
    for words in ("standard rebound test", "one-rail bank", "cautions for table work",
                  "slate", "ventilate", "maker's instructions", "licensed"):
        assert words in text
    png = tmp_path / "report.png"
    assert main(["cushion", "report", str(prof), "-o", str(png), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    bank = doc["bank"]
    assert bank["profile_aim_deg"] is not None and bank["preset_aim_deg"] is not None
    assert bank["difference_deg"] == pytest.approx(
        bank["profile_aim_deg"] - bank["preset_aim_deg"])
    assert doc["standard_rebound_test"]["profile"]["meets_minimum"] in (True, False)
    assert doc["cautions"] == list(cf.CAUTIONS)


def test_report_of_a_plain_preset_on_a_table_without_pockets(tmp_path, capsys):
    bare = tmp_path / "carom.json"
    bare.write_text(json.dumps({"preset": "carom"}))
    assert main(["cushion", "report", str(bare), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["bank"] is None
    assert doc["checks"] == []
    t = doc["standard_rebound_test"]
    assert t["profile"]["table_lengths"] == pytest.approx(t["preset"]["table_lengths"])


def test_bank_layout_is_playable_on_every_preset():
    for name in ("pool-9ft", "pool-8ft", "pool-7ft", "snooker", "carom"):
        lay = cf.bank_layout(TableSpec.preset(name))
        assert isinstance(lay, Layout)
        assert lay.problems() == []


def test_fit_and_report_count_progress_up_to_the_total():
    # The one progress shape of shotplan (our own rule): progress(done, total),
    # never going back, ending at done == total.
    for run in ("fit", "report"):
        calls: list[tuple[int, int]] = []

        def progress(done: int, total: int, calls=calls) -> None:
            calls.append((done, total))

        fit = cf.fit_measurements(measurements(rebound_rows(6)),
                                  progress=progress if run == "fit" else None)
        if run == "report":
            cf.profile_report(cf.profile_from_dict(fit.profile_dict()), progress=progress)
        assert calls, run
        done = [d for d, _t in calls]
        assert all(0 <= d <= t for d, t in calls), run
        assert done == sorted(done), run
        assert calls[-1][0] == calls[-1][1], run


# ------------------------------------------------------------ degenerate fits
def _strict(text: str) -> dict:
    def bad(c: str) -> None:
        raise ValueError(c)
    return json.loads(text, parse_constant=bad)


def test_identical_rows_fit_but_say_their_errors_cannot_be_estimated(tmp_path, capsys):
    # Five copies of one rebound: two residuals (speed and angle out) for two
    # values (e0 and the friction) -- the fit passes through the one
    # measurement exactly, and sigma^2 = RSS / (m - p) has no distinct
    # degrees of freedom (linear least squares; common practice, no source).
    # It used to print "+- 9.1e-17" without a word.
    data = write_rebounds(tmp_path / "same.csv", [(1.5, 45.0, 1.2, 50.0, "stun")] * 5)
    assert main(["cushion", "fit", str(data)]) == 0
    cap = capsys.readouterr()
    warn = [ln for ln in cap.err.splitlines() if ln.startswith("warning: ")]
    assert len(warn) == 1 and "1 distinct measurement" in warn[0], cap.err
    assert "+-" not in cap.out and "standard error not estimable" in cap.out
    assert main(["cushion", "fit", str(data), "--json"]) == 0
    doc = _strict(capsys.readouterr().out)
    assert doc["degenerate"] is True and len(doc["warnings"]) == 1
    assert doc["cushion_restitution_se"] is None and doc["cushion_friction_se"] is None
    fit = doc["fits"]["rebound"]["all_rows"]
    assert fit["degenerate"] is True and "distinct" in fit["degenerate_reason"]
    assert all(e["se"] is None for e in fit["estimates"].values())
    assert 0.0 < doc["cushion_restitution"] < 1.0  # the value itself is still given


def test_rows_reproduced_to_rounding_are_flagged():
    # Rows made by the cushion law itself, with no noise, at distinct
    # settings: the residuals vanish to rounding, which no real measurement
    # does, and the standard errors would be rounding too.
    rows = rebound_rows(8, seed=4, noise=0.0, slope=0.0)
    result = cf.fit_measurements(measurements(rows), restitution="constant")
    assert result.rebound.chosen.degenerate
    assert "rounding" in result.warnings[0]
    assert result.to_dict()["cushion_restitution_se"] is None


def test_real_scatter_is_not_degenerate(tmp_path, capsys):
    data = write_rebounds(tmp_path / "r.csv", rebound_rows(10, seed=9))
    assert main(["cushion", "fit", str(data), "--json"]) == 0
    cap = capsys.readouterr()
    doc = _strict(cap.out)
    assert doc["degenerate"] is False and doc["warnings"] == []
    assert doc["cushion_restitution_se"] > 0
    assert "warning" not in cap.err


def test_too_few_distinct_rows_for_the_values_is_refused():
    # One distinct rebound (two residuals) cannot determine three values.
    row = cf.RowResult("rebound", "t.csv", 2, (("speed_in_mps", 1.5),), (("speed_out_mps", 1.2),
                                                                         ("angle_out_deg", 50.)),
                       (0.0, 0.0))
    fit = cf.ModelFit("rebound", "linear", tuple(cf.Estimate(n, 0.5, 0.1) for n in (
        "cushion_restitution", "cushion_restitution_slope", "cushion_friction")), (),
        (row,) * 5, 0.0, 0.0, 7, "m/s")
    with pytest.raises(InputError, match="only 1 distinct measurement, too few to determine"):
        cf.degeneracy(fit, "t.csv")


def test_nothing_to_estimate_exits_2(tmp_path, capsys):
    # Copies of one rebound asked for a restitution that changes with speed:
    # one normal speed cannot show a slope. One line, exit 2, nothing written.
    data = write_rebounds(tmp_path / "same.csv", [(1.5, 45.0, 1.2, 50.0, "stun")] * 6)
    out = tmp_path / "p.json"
    rc = main(["cushion", "fit", str(data), "--restitution", "linear", "-o", str(out)])
    err = capsys.readouterr().err
    assert rc == 2 and len(err.strip().splitlines()) == 1 and "Traceback" not in err
    assert not out.exists()


def test_row_limit_refused_before_any_fitting(tmp_path, capsys, monkeypatch):
    # MAX_ROWS + 1 rows: refused in one line naming the file and the row,
    # before a fit starts (300,000 rows used to take minutes).
    def no_fit(*_a, **_k):
        raise AssertionError("fitted")
    monkeypatch.setattr(cf, "fit_measurements", no_fit)
    data = tmp_path / "big.csv"
    data.write_text(REBOUND_HEADER + "\n" + "1.5,45,1.2,50,stun\n" * (cf.MAX_ROWS + 1))
    rc = main(["cushion", "fit", str(data)])
    err = capsys.readouterr().err.strip().splitlines()
    assert rc == 2 and len(err) == 1
    assert str(data) in err[0] and f"row {cf.MAX_ROWS + 1}" in err[0]
    assert f"{cf.MAX_ROWS:,}" in err[0]
    # Exactly the limit is read; two files over it together are refused too.
    ok = tmp_path / "ok.csv"
    ok.write_text(REBOUND_HEADER + "\n" + "1.5,45,1.2,50,stun\n" * (cf.MAX_ROWS // 2 + 1))
    assert cf.read_measurements([ok]).n_rows == cf.MAX_ROWS // 2 + 1
    with pytest.raises(InputError, match="over all its files"):
        cf.read_measurements([ok, ok])


def test_readme_states_the_row_limit():
    readme = (Path(__file__).resolve().parents[1] / "README.md").read_text(encoding="utf-8")
    assert f"at most {cf.MAX_ROWS:,} rows" in " ".join(readme.split())


# ------------------------------------------------------------ extrapolation
def _profile_with_rebounds(tmp_path: Path, top_speed: float, capsys) -> Path:
    rows = rebound_rows(12, seed=6)
    rows = [(v * top_speed / max(r[0] for r in rows), a, s * top_speed / max(r[0] for r in rows),
             o, spin) for (v, a, s, o, spin) in rows]
    data = write_rebounds(tmp_path / f"r{top_speed:g}.csv", rows)
    prof = tmp_path / f"p{top_speed:g}.json"
    assert main(["cushion", "fit", str(data), "-o", str(prof)]) == 0
    capsys.readouterr()
    return prof


def test_report_marks_figures_beyond_the_measured_speeds(tmp_path, capsys):
    # Rebounds measured up to 3.3 m/s: the firm stroke (5.5 m/s), the speed
    # that reaches 4 table lengths and the 4 m/s rebound curves lie beyond
    # them and are marked, in the text and in the JSON (issue: "more than
    # 15 m/s" came from rebounds measured only up to 3.3 m/s).
    prof = _profile_with_rebounds(tmp_path, 3.3, capsys)
    assert main(["cushion", "report", str(prof)]) == 0
    text = capsys.readouterr().out
    assert "measured cushion speeds up to 3.30 m/s" in text
    test_line = next(ln for ln in text.splitlines() if ln.startswith("standard rebound test"))
    assert cf.EXTRAPOLATED in test_line
    assert main(["cushion", "report", str(prof), "--json"]) == 0
    doc = _strict(capsys.readouterr().out)
    assert doc["extrapolated"] is True and doc["measured_up_to_mps"] == pytest.approx(3.3)
    t = doc["standard_rebound_test"]
    assert t["profile_extrapolated"] is True
    assert t["profile_lengths_extrapolated"] == [v > 3.3 for v in t["speeds_mps"]]
    assert {c["speed_mps"]: c["extrapolated"] for c in doc["rebound_curves"]} == {
        1.0: False, 2.0: False, 3.0: False, 4.0: True}
    assert doc["bank"]["extrapolated"] is False  # 3 m/s is inside
    # The existing keys are all still there.
    for key in ("profile_speed_for_minimum_mps", "preset_speed_for_minimum_mps", "profile"):
        assert key in t


def test_report_inside_the_measured_speeds_marks_nothing(tmp_path, capsys):
    prof = _profile_with_rebounds(tmp_path, 7.5, capsys)
    assert main(["cushion", "report", str(prof), "--json", "--firm-speed", "5.5"]) == 0
    doc = _strict(capsys.readouterr().out)
    assert doc["standard_rebound_test"]["profile_extrapolated"] is False
    assert not any(c["extrapolated"] for c in doc["rebound_curves"])
    # A bare preset measured nothing, so nothing is extrapolated from it.
    bare = tmp_path / "bare.json"
    bare.write_text(json.dumps({"preset": "pool-9ft"}))
    assert main(["cushion", "report", str(bare), "--json"]) == 0
    doc = _strict(capsys.readouterr().out)
    assert doc["extrapolated"] is False and doc["measured_up_to_mps"] is None


# ------------------------------------------------------------ the slate figure
def test_slate_figure_is_one_and_the_readme_quotes_it():
    # Hand-worked: 111 x 61 x 1 in^3 of slate at 2750 kg/m^3 (both from
    # memory) is 305 kg; 1 lb = 0.45359237 kg exactly (the international
    # pound). The constants are these, rounded.
    kg = 111 * 61 * 1 * 0.0254**3 * 2750.0
    assert abs(kg - cf.SLATE_9FT_KG) <= 10
    assert abs(kg / 0.45359237 - cf.SLATE_9FT_LB) <= 10
    readme = (Path(__file__).resolve().parents[1] / "README.md").read_text(encoding="utf-8")
    text = " ".join(readme.split())
    assert f"about {cf.SLATE_9FT_LB} lb, {cf.SLATE_9FT_KG} kg" in text
    caution = next(c for c in cf.CAUTIONS if "Slate" in c)
    assert f"{cf.SLATE_9FT_LB} lb ({cf.SLATE_9FT_KG} kg)" in caution
    # No other weight in pounds anywhere in the cautions or the README.
    import re
    assert set(re.findall(r"(\d[\d,-]*) ?lb", text)) == {str(cf.SLATE_9FT_LB)}
    assert set(re.findall(r"(\d[\d,-]*) ?lb", " ".join(cf.CAUTIONS))) == {str(cf.SLATE_9FT_LB)}


def test_cushion_package_layers_and_sizes():
    # The house issue's rules for the package (our own rules, no outside
    # source): no module above 800 lines, no private name imported from
    # another module, and each module imports only the ones listed before it
    # in the package docstring's order.
    import ast

    import shotplan.cushion as pkg

    order = ["measurements", "models", "lsq", "results", "profile", "fit", "report"]
    root = Path(pkg.__file__).parent
    assert sorted(p.stem for p in root.glob("*.py")) == sorted(order + ["__init__"])
    for i, name in enumerate(order):
        text = (root / f"{name}.py").read_text(encoding="utf-8")
        assert len(text.splitlines()) <= 800, name
        for node in ast.walk(ast.parse(text)):
            if isinstance(node, ast.ImportFrom) and node.level > 0:
                assert all(not a.name.startswith("_") for a in node.names), (name, node.module)
                if node.level == 1:
                    assert node.module in order[:i], (name, node.module)
