"""Odd values for the options of the commands that search and simulate: every
one ends as exit code 0 or 2 with at most one error line, never a traceback."""

from __future__ import annotations

import pathlib

import pytest
from hypothesis import HealthCheck, example, given, settings
from hypothesis import strategies as st

from shotplan.cli import main

DEMO = str(pathlib.Path(__file__).resolve().parent.parent / "assets" / "layouts"
           / "club-night-4-position-drill.json")

WORDS = st.sampled_from(["", "nowhere", "cue", "4", "5", "foot-right", "side-left", "massé",
                         "direct", "bank,kick", "stun", "follow", "1e309", "-0", "nan", "inf",
                         "0", "-1", "99", "0.3", "red1", "head-left"])
NUMBERS = st.one_of(st.sampled_from(["nan", "inf", "-inf", "1e309", "-0.0", "", "abc"]),
                    st.floats(allow_nan=False, allow_infinity=False, width=32).map(str))


def run(argv, capsys):
    code = main(argv)
    err = capsys.readouterr().err
    assert code in (0, 2), (argv, code, err)
    assert "Traceback" not in err
    assert len([line for line in err.splitlines() if line.strip()]) <= 1, err
    return code


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(option=st.sampled_from(["--ball", "--pocket", "--kinds", "--tip", "--speed", "--side",
                               "--top"]),
       value=st.one_of(WORDS, NUMBERS))
@example(option="--speed", value="1.092790244588137e-35")  # found by this test: no events at all
def test_plan_options(capsys, option, value):
    run(["plan", DEMO, "--ball", "4", "--kinds", "direct", option, value], capsys)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(option=st.sampled_from(["--direction", "--speed", "--side", "--height", "--elevation",
                               "--max-events"]),
       value=NUMBERS)
@example(option="--speed", value="1e-35")
def test_simulate_options(capsys, option, value):
    run(["simulate", DEMO, option, value], capsys)


@pytest.mark.parametrize("argv", [
    ["draw", DEMO, "--shot", "0", "-o", "x.png"],
    ["draw", DEMO, "--shot", "1", "--ball", "9", "-o", "x.png"],
    ["draw", DEMO, "--paths", "-o", "x.gif"],
    ["position", DEMO, "--ball", "4", "--pocket", "nowhere"],
    ["study", "window", "--pocket", "nowhere"],
    ["study", "throw", "--speed", "warp"],
    ["cushion", "report", "nowhere.json"],
    ["drill", "nowhere.json"],
])
def test_bad_values_elsewhere(capsys, tmp_path, monkeypatch, argv):
    monkeypatch.chdir(tmp_path)
    assert run(argv, capsys) == 2
    assert not list(tmp_path.iterdir())


@pytest.mark.parametrize("argv, start", [
    # An option's error names the option as typed (found in a new-user trial:
    # `--tip folow` said nothing of --tip, `simulate --speed -2` named a file
    # field "stroke (options and layout).speed_mps").
    (["plan", DEMO, "--tip", "folow"], "--tip: 'folow' is not a tip choice, must be one of"),
    (["plan", DEMO, "--kinds", "masse"], "--kinds: 'masse' is not a kind of shot"),
    (["plan", DEMO, "--speed", "-2"], "--speed: -2.0 m/s is out of range"),
    (["plan", DEMO, "--side", "3"], "--side: 3.0 is beyond the miscue limit"),
    (["simulate", DEMO, "--speed", "-2"], "--speed: -2.0 is out of range"),
    (["simulate", DEMO, "--side", "2"], "--side: 2.0 is out of range"),
    (["simulate", DEMO, "--elevation", "70"], "--elevation: 70.0 is out of range"),
    (["simulate", DEMO, "--max-events", "5"], "--max-events: 5 is out of range, must be "
                                              "between 10 and 1000000"),
    (["simulate", DEMO, "--height", "0.9"], f"{DEMO}: stroke: tip side 0, height 0.9 at 0 deg"),
    # Found in a later new-user trial: these named no option.
    (["plan", DEMO, "--ball", "99"], "--ball: '99' is not an object ball on this layout"),
    (["plan", DEMO, "--pocket", "nowhere"], "--pocket: 'nowhere' is not a pocket of this table"),
    (["plan", DEMO, "--elevation", "-10"], "--elevation: -10.0 deg is out of range"),
    (["position", DEMO, "--ball", "4", "--pocket", "foot-right", "--heights", "-5,0.2"],
     "--heights: tip height -5.0 is out of range"),
    (["position", DEMO, "--ball", "4", "--pocket", "foot-right", "--speeds", "-1,2"],
     "--speeds: speed -1.0 m/s is out of range"),
    (["study", "window", "--step", "-15"], "--step: -15 deg is out of range"),
    (["study", "window", "--step", "nan"], "--step: nan is not a number of degrees"),
    # A comma list that starts with a negative number is a value, not an
    # unknown option (argparse said "expected at least one argument").
    (["study", "window", "--distances", "-0.3,0.9"], "argument --distances: '-0.3' is not a "
                                                     "distance in m above 0"),
    (["study", "throw", "--speeds", "-1,2"], "argument --speeds: '-1' m/s is out of range"),
    (["atlas", DEMO, "--ball", "4", "--contours", "-1,0.5"], "--contours: '-1,0.5' has a value "
                                                             "out of range"),
])
def test_an_option_error_names_the_option(capsys, argv, start):
    assert main(argv) == 2
    assert capsys.readouterr().err.startswith(f"shotplan: error: {start}")


def test_max_events_stops_the_run(capsys):
    # The 9-ball rack's break has far more than 10 events (its run is
    # complete without the option).
    rack = DEMO.replace("club-night-4-position-drill", "club-night-5-9ball-rack")
    assert main(["simulate", rack, "--json"]) == 0
    assert '"complete": true' in capsys.readouterr().out
    assert main(["simulate", rack, "--max-events", "10", "--json"]) == 0
    out = capsys.readouterr().out
    assert '"complete": false' in out and "event limit (10 events" in out


def test_plan_reads_the_old_tip_word_with_a_warning(capsys):
    # README: the spellings of the version before, `rolling` among them,
    # still work with one warning line.
    assert main(["plan", DEMO, "--tip", "follow", "--top", "3"]) == 0
    new = capsys.readouterr().out.splitlines()[1:]  # (the first line has timings)
    assert main(["plan", DEMO, "--tip", "rolling", "--top", "3"]) == 0
    got = capsys.readouterr()
    assert got.out.splitlines()[1:] == new and len(new) == 4
    assert got.err.count("\n") == 1 and "'--tip follow'" in got.err


def test_plan_top_lists_the_best_and_counts_them_all(capsys):
    # Caroms as pool shots: the first line counts what was found, --top
    # lists the best of them (a new-user trial saw "2 caroms found").
    carom = DEMO.replace("club-night-4-position-drill", "club-night-9-three-cushion")
    assert main(["plan", carom, "--json"]) == 0
    import json

    every = json.loads(capsys.readouterr().out)
    assert main(["plan", carom, "--top", "2"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert lines[0].split(": ", 1)[1].startswith(f"{len(every)} caroms found")
    assert len(every) > 2 and len(lines) == 1 + 1 + 2  # the count, the heading, two rows
    assert main(["plan", carom, "--top", "2", "--json"]) == 0
    assert json.loads(capsys.readouterr().out) == every[:2]
