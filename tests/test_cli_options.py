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
@given(option=st.sampled_from(["--direction", "--speed", "--side", "--height", "--elevation"]),
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
