"""Malformed layouts through ``shotplan check`` and ``shotplan draw``.

Every case must end the same way (DESIGN: bad input): exit code 2, exactly one
line on stderr that starts ``shotplan: error:`` and says what is wrong, no
traceback, and no output file or temporary file left behind. (``check`` lists
a layout's problems, one line each, then a line that counts them.) Each case runs
in-process through ``main()``; the cases marked ``SUB`` (at least 25) also run
as real processes (``python -m shotplan``), which is what a user meets.
"""

from __future__ import annotations

import copy
import json
import os
import subprocess
import sys
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

import pytest

from shotplan.cli import main

ROOT = Path(__file__).resolve().parent.parent
BASE = {
    "format": "shotplan-layout",
    "version": 1,
    "table": "pool-9ft",
    "balls": {"cue": [0.6, 0.6], "1": [1.9, 0.6]},
    "stroke": {"direction_deg": 0.0, "speed_mps": 1.5},
}


def lay(**changes):
    """BASE with top-level fields replaced (None: removed)."""
    data = copy.deepcopy(BASE)
    for key, value in changes.items():
        if value is None:
            data.pop(key, None)
        else:
            data[key] = value
    return json.dumps(data)


def balls(**extra):
    out = copy.deepcopy(BASE["balls"])
    out.update(extra)
    return out


def raw(balls_text: str) -> str:
    """BASE as text with the balls object written by hand (for NaN, 1e400...)."""
    return ('{"format": "shotplan-layout", "version": 1, "table": "pool-9ft", '
            f'"balls": {balls_text}}}')


# (id, file content: str / bytes / a special setup name, fragment of the message)
CASES = [
    ("bad-json", '{"format": "shotplan-layout",, }', "line 1, column 30: not valid JSON"),
    ("truncated-json", lay()[:40], "not valid JSON"),
    ("empty-file", b"", "the file is empty"),
    ("blank-file", b" \n\t\n", "the file is empty"),
    ("not-utf8", lay(title="caf\u00e9").replace("\\u00e9", "\u00e9").encode("latin-1"),
     "not UTF-8 text (byte 0xe9"),
    ("utf16", lay().encode("utf-16"), "not UTF-8 text"),
    ("top-level-list", "[1, 2]", "the top level must be a JSON object"),
    ("top-level-string", '"pool-9ft"', "not a string"),
    ("no-format", lay(format=None), "format: missing"),
    ("wrong-format", lay(format="shotplan-drill"), "is not a layout file format"),
    ("no-version", lay(version=None), "version: missing, must be 1"),
    ("version-2", lay(version=2), "version: 2 is not supported, this shotplan reads layout "
                                  "version 1"),
    ("version-string", lay(version="1"), "is not a version number"),
    ("version-true", lay(version=True), "true is not a version number"),
    ("unknown-top-key", lay(bals={}), "unknown field 'bals', must be one of format, version"),
    ("unknown-preset", lay(table="pool-10ft"), "'pool-10ft' is not a table preset, must be one "
                                               "of pool-9ft"),
    ("table-number", lay(table=9), "table: 9 is not a table"),
    ("table-no-preset", lay(table={"corner_mouth_m": 0.11}), "table.preset: missing"),
    ("override-out-of-range", lay(table={"preset": "pool-9ft", "corner_mouth_m": 5}),
     "table.corner_mouth_m: 5.0 is out of range, must be between"),
    ("override-unknown", lay(table={"preset": "pool-9ft", "pocket_size": 1}),
     "unknown table field 'pocket_size'"),
    ("override-boolean", lay(table={"preset": "pool-9ft", "corner_mouth_m": True}),
     "is not a number"),
    ("override-no-such-pocket", lay(table={"preset": "carom", "side_mouth_m": 0.12},
                                    balls={"cue": [1, 0.7]}), "has no side pockets"),
    ("no-balls", lay(balls=None), "balls: missing"),
    ("balls-list", lay(balls=[[0.6, 0.6]]), "balls: must be an object"),
    ("unknown-ball-id", lay(balls=balls(**{"16": [1.2, 0.3]})),
     "balls.16: '16' is not a ball of the pool-9ft table"),
    ("snooker-id-on-pool", lay(balls=balls(red1=[1.2, 0.3])), "'red1' is not a ball"),
    ("position-string", lay(balls=balls(**{"2": "near the spot"})), "is not a position"),
    ("position-three-numbers", lay(balls=balls(**{"2": [1, 0.5, 0]})), "is not a position"),
    ("position-boolean", lay(balls=balls(**{"2": [True, 0.5]})), "[true, 0.5] is not a position"),
    ("position-null", lay(balls=balls(**{"2": None})), "null is not a position"),
    ("nan", raw('{"cue": [NaN, 0.6]}'), "balls.cue[0]: NaN is not a number"),
    ("infinity", raw('{"cue": [0.6, Infinity]}'), "Infinity is not a number"),
    ("minus-infinity", raw('{"cue": [-Infinity, 0.6]}'), "-Infinity is not a number"),
    ("huge-float", raw('{"cue": [1e400, 0.6]}'), "1e400 is too large"),
    ("huge-int", raw('{"cue": [1000000000000000000000000000000, 0.6]}'), "is too large"),
    ("five-thousand-digits", raw('{"cue": [' + "9" * 5000 + ', 0.6]}'), "is too large"),
    ("big-but-finite", lay(balls=balls(**{"2": [1e8, 0.5]})), "is off the table"),
    ("off-the-table", lay(balls=balls(**{"3": [1.0, 9.0]})),
     "balls.3: [1.0, 9.0] is off the table (the table is 2.54 x 1.27 m)"),
    ("in-a-pocket", lay(balls=balls(**{"3": [2.536, 1.266]})), "is in the foot-left pocket"),
    ("in-a-cushion", lay(balls=balls(**{"3": [0.8, 0.01]})), "overlaps the right rail cushion"),
    ("overlapping-balls", lay(balls=balls(**{"3": [0.62, 0.6]})), "overlaps ball 'cue'"),
    ("no-cue-ball", lay(balls={"1": [1.9, 0.6]}), "no 'cue' ball"),
    ("stroke-speed-zero", lay(stroke={"direction_deg": 0, "speed_mps": 0}),
     "stroke.speed_mps: 0.0 is out of range"),
    ("stroke-no-direction", lay(stroke={"speed_mps": 2}), "missing field 'direction_deg'"),
    ("stroke-unknown-key", lay(stroke={"direction_deg": 0, "speed_mps": 2, "spin": 1}),
     "unknown field 'spin'"),
    ("stroke-string", lay(stroke="hard"), "stroke: must be an object"),
    ("stroke-side-too-far", lay(stroke={"direction_deg": 0, "speed_mps": 2, "side": 1.5}),
     "stroke.side: 1.5 is out of range"),
    ("physics-unknown-key", lay(physics={"bounce": 0.9}), "physics: unknown field 'bounce'"),
    ("physics-out-of-range", lay(physics={"gravity": -1}), "physics.gravity: -1.0 is out of "
                                                            "range"),
    ("physics-list", lay(physics=[1]), "physics: must be an object"),
    ("title-number", lay(title=5), "title: 5 is not text"),
    ("duplicate-ball", raw('{"cue": [0.6, 0.6], "cue": [0.9, 0.6]}'),
     "balls: the field 'cue' appears twice"),
    ("deep-nesting", "[" * 100_000, "nested too deeply"),
    ("folder", "<folder>", "is a folder, not a file"),
    ("missing-file", "<missing>", "no such file"),
    ("too-large", "<large>", "the file is too large"),
    ("unreadable", "<unreadable>", "cannot read"),
    # a FIFO once made every command wait for ever (only regular files are read)
    ("fifo", "<fifo>", "bad.json: is a FIFO (named pipe), not a file; only regular files"),
    # tables whose values contradict each other (WPA: nose at 62.5-64.5 % of the ball)
    ("nose-above-ball", lay(table={"preset": "pool-9ft", "ball_diameter_m": 0.03,
                                   "cushion_nose_height_m": 0.05}),
     "table.cushion_nose_height_m: a cushion nose 50.0 mm high is not between the centre"),
    ("mouths-wider-than-table", lay(table={"preset": "pool-9ft", "width_m": 0.3,
                                           "corner_mouth_m": 0.3}),
     "the mouths must be narrower than the table"),
    ("throat-closed", lay(table={"preset": "pool-9ft", "corner_shelf_m": 0.12,
                                 "corner_jaw_angle_deg": 160}), "at the drop line"),
    ("too-many-balls", lay(balls={f"b{k}": [1.0, 0.6] for k in range(30_000)}),
     "balls: 30000 balls is too many, a layout holds at most 64"),
    ("profile-missing", lay(table={"profile": "gone.json"}),
     "table.profile: gone.json: no such file"),
    ("long-value", lay(table="pool-" + "9" * 100_000), "is not a table preset"),
]

# The cases that also run as real processes (each twice: check and draw). Not
# all of them: a process costs about 0.35 s of start-up, most of it imports.
SUB = {
    "bad-json", "empty-file", "not-utf8", "top-level-list", "no-format", "version-2",
    "unknown-preset", "override-out-of-range", "balls-list", "unknown-ball-id",
    "position-string", "nan", "infinity", "five-thousand-digits", "off-the-table",
    "in-a-pocket", "overlapping-balls", "no-cue-ball",
    "stroke-speed-zero", "physics-unknown-key", "duplicate-ball", "deep-nesting", "folder",
    "missing-file", "too-large", "fifo", "nose-above-ball", "too-many-balls",
}
assert len(SUB) >= 25 and SUB <= {c[0] for c in CASES}

IS_ROOT = hasattr(os, "geteuid") and os.geteuid() == 0


def _make(folder: Path, content) -> str:
    """Set up one case in an empty folder; return the LAYOUT argument."""
    path = folder / "bad.json"
    if content == "<folder>":
        path.mkdir()
    elif content == "<missing>":
        pass
    elif content == "<large>":
        with open(path, "wb") as fh:
            fh.write(lay().encode())
            fh.truncate(11 * 1024 * 1024)
    elif content == "<fifo>":
        os.mkfifo(path)
    elif content == "<unreadable>":
        path.write_text(lay())
        path.chmod(0)
    elif isinstance(content, bytes):
        path.write_bytes(content)
    else:
        path.write_text(content, encoding="utf-8")
    return "bad.json"


def _snapshot(folder: Path) -> list[str]:
    return sorted(os.listdir(folder))


def _params(names=None):
    out = []
    for cid, content, fragment in CASES:
        if names is not None and cid not in names:
            continue
        marks = []
        if cid == "unreadable" and IS_ROOT:
            marks.append(pytest.mark.skip(reason="root can read a file with no permissions"))
        if cid == "fifo" and not hasattr(os, "mkfifo"):
            marks.append(pytest.mark.skip(reason="no FIFOs here"))
        out.append(pytest.param(cid, content, fragment, id=cid, marks=marks))
    return out


def _assert_one_error_line(stderr: str, fragment: str, where: str):
    lines = stderr.splitlines()
    assert len(lines) == 1, f"{where}: {lines!r}"
    assert len(lines[0]) < 600, f"{where}: a {len(lines[0])}-character line"
    assert lines[0].startswith("shotplan: error: "), lines[0]
    assert "Traceback" not in stderr
    return lines[0]


def _assert_check_lines(stderr: str, fragment: str) -> str:
    """``check``'s stderr: one line for a broken file; for a file with
    problems, one line per problem then ``N problem(s)``. Returns the line
    that says what is wrong (the first)."""
    lines = stderr.splitlines()
    assert "Traceback" not in stderr
    assert all(len(x) < 600 for x in lines)
    assert lines and all(x.startswith("shotplan: error: bad.json") for x in lines), lines
    if len(lines) > 1:
        n = len(lines) - 1
        assert lines[-1] == f"shotplan: error: bad.json: {n} problem{'s' if n > 1 else ''}"
    return lines[0]


# ------------------------------------------------------------------ in-process
@pytest.mark.parametrize("cid, content, fragment", _params())
def test_in_process(cid, content, fragment, tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    arg = _make(tmp_path, content)
    before = _snapshot(tmp_path)

    assert main(["check", arg]) == 2
    out, err = capsys.readouterr()
    line = _assert_check_lines(err, fragment)
    assert fragment in line or fragment in out, (line, out)
    assert line.startswith("shotplan: error: bad.json")  # names the file

    assert main(["draw", arg, "-o", "out.png"]) == 2
    out, err = capsys.readouterr()
    line = _assert_one_error_line(err, fragment, "draw")
    assert fragment in line, line
    assert out == ""
    assert _snapshot(tmp_path) == before  # no out.png, no temporary file


# --------------------------------------------------------------- as processes
def _run(args, cwd):
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    return subprocess.run([sys.executable, "-m", "shotplan", *args], cwd=cwd, env=env,
                          capture_output=True, text=True, timeout=60)


@pytest.fixture(scope="module")
def process_results(tmp_path_factory):
    """Run every SUB case's two commands, two processes at a time (the
    interpreter's start-up dominates; the cases are independent)."""
    jobs = {}
    for cid, content, _fragment in CASES:
        if cid not in SUB:
            continue
        folder = tmp_path_factory.mktemp(cid)
        arg = _make(folder, content)
        jobs[cid] = (folder, arg, _snapshot(folder))
    with ThreadPoolExecutor(max_workers=max(2, os.cpu_count() or 2)) as pool:
        futures = {
            (cid, cmd): pool.submit(_run, argv, folder)
            for cid, (folder, arg, _) in jobs.items()
            for cmd, argv in (("check", ["check", arg]), ("draw", ["draw", arg, "-o", "out.png"]))
        }
        results = {key: f.result() for key, f in futures.items()}
    return jobs, results


@pytest.mark.parametrize("cid, content, fragment", _params(SUB))
def test_as_a_process(cid, content, fragment, process_results):
    jobs, results = process_results
    folder, _arg, before = jobs[cid]
    for cmd in ("check", "draw"):
        proc = results[(cid, cmd)]
        assert proc.returncode == 2, (cmd, proc.stderr)
        line = (_assert_check_lines(proc.stderr, fragment) if cmd == "check"
                else _assert_one_error_line(proc.stderr, fragment, cmd))
        assert fragment in line or (cmd == "check" and fragment in proc.stdout), (cmd, line)
    assert results[(cid, "draw")].stdout == ""
    assert _snapshot(folder) == before  # no out.png, no temporary file


# ------------------------------------------------------------------ usage
@pytest.mark.parametrize("argv, fragment", [
    ([], "a command is needed"),
    (["frobnicate"], "invalid choice: 'frobnicate'"),
    (["check"], "the following arguments are required: LAYOUT"),
    (["draw", "x.json"], "the following arguments are required: -o/--output"),
    (["draw", "x.json", "-o", "out.gif"], "unsupported file type '.gif'"),
    (["draw", "x.json", "-o", "no-such-folder/out.png"], "does not exist"),
    (["draw", "x.json", "-o", "out.png", "--dpi", "5"], "argument --dpi: 5 is out of range"),
    (["draw", "x.json", "-o", "out.png", "--dpi", "many"], "'many' is not a whole number"),
    (["tables", "--bogus"], "unrecognized arguments: --bogus"),
])
def test_usage_errors_are_one_line(argv, fragment, tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    assert main(argv) == 2
    out, err = capsys.readouterr()
    line = _assert_one_error_line(err, fragment, "usage")
    assert fragment in line
    assert out == "" and os.listdir(tmp_path) == []


def test_output_path_is_checked_before_the_layout(tmp_path, monkeypatch, capsys):
    # a good layout, a bad output: the output is refused and nothing is drawn
    monkeypatch.chdir(tmp_path)
    (tmp_path / "ok.json").write_text(lay())
    (tmp_path / "out.png").mkdir()
    assert main(["draw", "ok.json", "-o", "out.png"]) == 2
    assert "out.png: is a folder, not a file" in capsys.readouterr().err
    assert sorted(os.listdir(tmp_path)) == ["ok.json", "out.png"]
    assert os.listdir(tmp_path / "out.png") == []


# ------------------------------------------------------------ import hygiene
def test_import_shotplan_does_not_import_pygame_or_matplotlib():
    code = ("import sys, shotplan, shotplan.cli; "
            "print(sorted(m for m in ('pygame', 'matplotlib') if m in sys.modules))")
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    out = subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True,
                         timeout=60, check=True).stdout
    assert out.strip() == "[]"


# ------------------------------------------------------------- output files
def _writing_parsers():
    import argparse

    from shotplan.cli import build_parser

    out = {}

    def walk(parser, name):
        for action in parser._actions:
            if isinstance(action, argparse._SubParsersAction):
                for sub, child in action.choices.items():
                    walk(child, f"{name} {sub}".strip())
        opts = {o for a in parser._actions for o in a.option_strings}
        if opts & {"-o", "--output", "--csv", "--plot", "--screenshot"}:
            out[name] = opts
    walk(build_parser(), "")
    return out


def test_every_command_that_writes_takes_force():
    parsers = _writing_parsers()
    # the commands that write files (README: Files)
    assert {"draw", "drill", "position", "study window", "cushion fit",
            "cushion report", "view"} <= set(parsers)
    assert all("--force" in opts for opts in parsers.values()), parsers


@pytest.mark.skipif(not hasattr(os, "symlink"), reason="symbolic links")
def test_draw_through_a_link_and_over_a_read_only_file(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "ok.json").write_text(lay())
    (tmp_path / "real.png").write_bytes(b"old")
    (tmp_path / "link.png").symlink_to("real.png")
    assert main(["draw", "ok.json", "-o", "link.png", "--dpi", "20"]) == 0
    assert (tmp_path / "link.png").is_symlink()
    assert (tmp_path / "real.png").read_bytes().startswith(b"\x89PNG")  # PNG signature
    capsys.readouterr()

    (tmp_path / "real.png").chmod(0o444)
    assert main(["draw", "ok.json", "-o", "link.png", "--dpi", "20"]) == 2
    err = capsys.readouterr().err
    assert err == ("shotplan: error: link.png: the file is read-only; give --force to "
                   "replace it\n")
    before = (tmp_path / "real.png").read_bytes()
    assert main(["draw", "ok.json", "-o", "link.png", "--dpi", "25", "--force"]) == 0
    assert (tmp_path / "real.png").read_bytes() != before
    assert sorted(os.listdir(tmp_path)) == ["link.png", "ok.json", "real.png"]


def test_a_newline_in_a_file_name_is_shown_escaped(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    assert main(["check", "two\nlines.json"]) == 2
    err = capsys.readouterr().err
    assert err == "shotplan: error: 'two\\nlines.json': no such file\n"
    (tmp_path / "two\nlines.json").write_text(lay(balls=balls(**{"3": [1.0, 9.0]})))
    assert main(["check", "two\nlines.json"]) == 2
    err = capsys.readouterr().err.splitlines()
    assert err == ["shotplan: error: 'two\\nlines.json': balls.3: [1.0, 9.0] is off the table "
                   "(the table is 2.54 x 1.27 m)", "shotplan: error: 'two\\nlines.json': 1 problem"]


def test_an_unwritable_output_names_the_path_typed(tmp_path, monkeypatch, capsys):
    import errno as errno_codes

    monkeypatch.chdir(tmp_path)
    (tmp_path / "ok.json").write_text(lay())

    def full(src, dst):
        raise OSError(errno_codes.ENOSPC, os.strerror(errno_codes.ENOSPC), str(src))

    monkeypatch.setattr(os, "replace", full)
    assert main(["draw", "ok.json", "-o", "out.png", "--dpi", "20"]) == 2
    err = capsys.readouterr().err
    assert err == f"shotplan: error: out.png: cannot write: {os.strerror(errno_codes.ENOSPC)}\n"
    assert sorted(os.listdir(tmp_path)) == ["ok.json"]


@pytest.mark.parametrize("argv, fragment", [
    (["study", "aim", "--step", "1e-9"], "--step: 1e-09 deg gives 9e+10 angles"),
    (["study", "window", "--distances", *[str(0.1 * k) for k in range(1, 14)]],
     "--distances: 13 values, at most 12"),
    (["drill", "twelve.json", "--trials", "1000000", "-o", "sheet.pdf"],
     "(and 2,000 for each of 2 other levels) make 12,048,000 simulations, at most "
     "10,000,000 are run"),
])
def test_sizes_a_user_types_are_limited(argv, fragment, tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    if "twelve.json" in argv:  # the demo drill's stations three times over: 12 stations
        drill = json.loads((ROOT / "assets" / "drills" / "club-night-drills.json").read_text())
        for st in drill["stations"]:
            if isinstance(st["layout"], str):
                st["layout"] = str(ROOT / "assets" / "drills" / st["layout"])
        drill["stations"] *= 3
        (tmp_path / "twelve.json").write_text(json.dumps(drill))
    assert main(argv) == 2
    out, err = capsys.readouterr()
    assert fragment in _assert_one_error_line(err, fragment, argv[0])
    assert os.listdir(tmp_path) == (["twelve.json"] if "twelve.json" in argv else [])
