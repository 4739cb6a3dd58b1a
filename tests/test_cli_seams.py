"""The command line's shared seams: the text-table formatter, the list
options and their old spellings, the progress bar, and the one roll word.

Expected values are worked by hand in the comments (no outside source is
needed for a layout of text); the old spellings are those of the version
before this one (its README and --help).
"""

from __future__ import annotations

import argparse
import io
import json

import pytest

from shotplan.cli import main
from shotplan.cli.options import add_list_option, int_in, number, parse_list
from shotplan.cli.progress import ProgressBar, progress_bar
from shotplan.cli.text import Column, format_table, left, right
from shotplan.errors import InputError

WARNING = "shotplan: warning: "


# ------------------------------------------------------------------- text
def test_format_table_by_hand():
    # Widths: "name" 4 vs "pool-9ft" 8 -> 8; "mm" 2 vs "57.15" 5 -> 5, right-aligned;
    # two spaces between columns; no blanks at the end of a line.
    lines = format_table([Column("name"), Column("mm", ">")],
                         [["pool-9ft", "57.15"], ["carom", "61.5"]])
    assert lines == ["name         mm",
                     "pool-9ft  57.15",
                     "carom      61.5"]


def test_format_table_least_widths_gaps_and_no_trailing_blanks():
    # "#" right in 3, then a one-space gap, "kind" left in 6, then "x" left:
    # the last column's blanks are cut.
    cols = [Column("#", ">", 3), Column("kind", "<", 6, " "), Column("x", "<", 0, " ")]
    assert format_table(cols, [["1", "bank", ""]]) == ["  # kind   x", "  1 bank"]
    assert format_table(left("a", "b"), [["xx", "y"]], header=False) == ["xx  y"]
    assert format_table(right("a", "b"), [["xx", "y"]]) == [" a  b", "xx  y"]
    with pytest.raises(ValueError, match="a row of 1 cells in a table of 2 columns"):
        format_table(left("a", "b"), [["only"]])


# ---------------------------------------------------------------- options
def test_parse_list_and_number():
    assert parse_list(" 0.3, 0.9,", number(), "--distances") == [0.3, 0.9]
    with pytest.raises(InputError, match=r"^--speeds: 'x' is not a number$"):
        parse_list("1,x", number(), "--speeds")
    with pytest.raises(InputError, match="holds no values"):
        parse_list(",", number(), "--speeds")
    with pytest.raises(InputError, match="above 0"):
        parse_list("0", number("a distance in m", above=0.0), "--distances")
    with pytest.raises(InputError, match="finite"):
        parse_list("nan", number(), "--sides")
    assert int_in(1, 3)("2") == 2
    with pytest.raises(argparse.ArgumentTypeError, match="between 1 and 3"):
        int_in(1, 3)("4")


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="t", exit_on_error=False)
    add_list_option(p, "--speeds", number(), old_names=("--speed",), most=3)
    add_list_option(p, "--spins", str.lower, renames={"rolling": "follow"})
    return p


def test_new_spelling_is_silent_and_old_ones_say_the_new_one_once(capsys):
    p = _parser()
    assert p.parse_args(["--speeds", "1,2.5"]).speeds == [1.0, 2.5]
    assert capsys.readouterr().err == ""
    for old in (["--speed", "1,2.5"], ["--speeds", "1", "2.5"], ["--speed", "1", "2.5"]):
        assert p.parse_args(old).speeds == [1.0, 2.5]
        err = capsys.readouterr().err
        assert err.count("\n") == 1 and err.startswith(WARNING), err
        assert "write '--speeds 1,2.5'" in err
    assert p.parse_args(["--spins", "stun,Rolling"]).spins == ["stun", "follow"]
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "write '--spins stun,follow'" in err


def test_old_names_are_not_shown_in_help():
    text = _parser().format_help()
    assert "--speeds" in text and "--speed " not in text and "--speed," not in text


def test_a_list_too_long_is_refused_before_any_warning(capsys):
    with pytest.raises(argparse.ArgumentError, match="4 values, at most 3"):
        _parser().parse_args(["--speed", "1", "2", "3", "4"])
    assert capsys.readouterr().err == ""


# --------------------------------------------------------------- progress
class _Stream(io.StringIO):
    def __init__(self, tty: bool):
        super().__init__()
        self._tty = tty

    def isatty(self) -> bool:
        return self._tty


def test_progress_bar_updates_in_place_on_a_terminal_and_clears_its_line():
    s = _Stream(True)
    with progress_bar("study window", stream=s) as bar:
        bar.min_interval_s = 0.0
        for k in range(1, 5):
            bar(k, 4)
    text = s.getvalue()
    assert "\n" not in text and "study window" in text and "4/4" in text
    assert text.endswith("\r")  # the line is blanked when the work ends


def test_progress_bar_is_silent_in_a_pipe():
    s = _Stream(False)
    bar = ProgressBar("drill", stream=s)
    bar(1, 2)
    bar.close()
    bar(2, 2)  # after close: nothing
    assert s.getvalue() == ""


# --------------------------------------------------------- the roll word
def _run(capsys, *argv: str) -> tuple[int, str, str]:
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_study_old_and_new_spellings_give_the_same_study(capsys):
    base = ("study", "window", "--distances", "0.5", "--step", "45", "--max", "45", "--json")
    code, new, err = _run(capsys, *base, "--tips", "stun,follow", "--cue-distances", "0.4")
    assert code == 0 and err == "", err
    code, old, err = _run(capsys, *base, "--tip", "stun", "rolling", "--cue-distance", "0.4")
    assert code == 0
    lines = err.splitlines()
    assert len(lines) == 2 and all(line.startswith(WARNING) for line in lines), err
    assert "write '--tips stun,follow'" in err and "write '--cue-distances 0.4'" in err
    drop = ("seconds", "simulations")
    a = {k: v for k, v in json.loads(new).items() if k not in drop}
    b = {k: v for k, v in json.loads(old).items() if k not in drop}
    assert a == b
    assert {p["tip"] for p in a["points"]} == {"stun", "follow"}


def test_throw_takes_one_distance_under_its_singular_name(capsys):
    code, out, err = _run(capsys, "study", "throw", "--distances", "0.3,0.6")
    assert code == 2 and out == ""
    assert err.count("\n") == 1 and "takes one value, got 2 (0.3,0.6)" in err


def test_cushion_files_with_the_old_roll_word_fit_the_same(tmp_path, capsys, monkeypatch):
    rows = ["launch_speed_mps,distance_m,spin", "0.30,0.55,{r}", "0.45,1.30,{r}",
            "0.60,2.31,{r}", "0.50,1.02,stun", "0.70,2.10,stun"]
    docs, errs = [], []
    for word in ("follow", "rolling"):  # the same file name in two folders
        (tmp_path / word).mkdir()
        (tmp_path / word / "m.csv").write_text("\n".join(rows).format(r=word) + "\n")
        monkeypatch.chdir(tmp_path / word)
        code, out, err = _run(capsys, "cushion", "fit", "m.csv", "--json")
        assert code == 0, err
        docs.append(json.loads(out))
        errs.append(err)
    assert errs[0] == ""
    assert errs[1].count("\n") == 1 and errs[1].startswith(WARNING)
    assert "'m.csv: spin rolling'" in errs[1] and "write 'spin follow'" in errs[1]
    assert docs[0] == docs[1]
    assert docs[0]["cloth_rolling_resistance"] is not None


def test_study_help_shows_the_new_spellings_only(capsys):
    assert main(["study", "throw", "--help"]) == 0
    text = capsys.readouterr().out
    assert "--spins SPIN,..." in text and "--speeds MPS,..." in text and "--distance M" in text
    assert "..." + " ...]" not in text  # no space-separated form advertised
    assert "--spin " not in text and "--distances" not in text and "rolling" not in text


def test_a_profile_written_with_the_old_roll_word_still_reports(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "m.csv").write_text("launch_speed_mps,distance_m,spin\n0.30,0.55,follow\n"
                                    "0.45,1.30,follow\n0.60,2.31,follow\n0.50,1.02,stun\n")
    assert main(["cushion", "fit", "m.csv", "-o", "new.json"]) == 0
    text = (tmp_path / "new.json").read_text()
    assert '"follow"' in text and '"rolling"' not in text
    (tmp_path / "old.json").write_text(text.replace('"follow"', '"rolling"'))
    capsys.readouterr()
    reports = []
    for name in ("new.json", "old.json"):
        assert main(["cushion", "report", name, "--json"]) == 0
        doc = json.loads(capsys.readouterr().out)
        doc.pop("profile", None)
        reports.append(json.dumps(doc, sort_keys=True).replace(name, "P"))
    assert reports[0] == reports[1]
