"""Files in and out (shotplan.files.write): links, special files, read-only files,
temporary files, signals, messages.

The outside references: POSIX semantics of rename, symbolic links, FIFOs and
signals (the operating system behaves or the test fails); the PNG format as
Pillow decodes it (an independent decoder: a whole file decodes, a cut one
does not); Python's ``repr`` for how an escaped name reads.
"""

from __future__ import annotations

import errno
import os
import random
import signal
import stat
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from shotplan.errors import InputError, LayoutError, Terminated, WriteError, shorten, show_path
from shotplan.files.read import read_limited
from shotplan.files.write import (
    LEGACY_STALE_SECONDS,
    atomic_path,
    atomic_write_bytes,
    check_output_path,
    handle_termination,
    stale_temporaries,
)

ROOT = Path(__file__).resolve().parent.parent
LAYOUT = ROOT / "assets" / "layouts" / "club-night-1-straight-in.json"
POSIX = os.name == "posix"


def _temps(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name.endswith(".part"))


# ------------------------------------------------------------------ messages
def test_shorten_cuts_long_values_with_an_ellipsis():
    assert shorten("abc") == "abc"
    cut = shorten("x" * 100_000)
    assert len(cut) == 60 and cut.endswith("...")
    assert shorten("y" * 60) == "y" * 60  # exactly the limit: kept whole


def test_show_path_escapes_a_newline_as_repr_does():
    assert show_path("plain name.png") == "plain name.png"
    assert show_path("a\nb.png") == repr("a\nb.png") == "'a\\nb.png'"
    assert "\n" not in show_path("x\n" * 10)
    long = "d/" * 200 + "end.png"
    shown = show_path(long)
    assert len(shown) <= 160 and shown.endswith("end.png") and "..." in shown


# ----------------------------------------------------------------- targets
@pytest.mark.skipif(not POSIX, reason="symbolic links")
def test_a_link_is_written_through_to_its_target(tmp_path):
    target = tmp_path / "real.json"
    target.write_text("old")
    link = tmp_path / "link.json"
    link.symlink_to("real.json")
    atomic_write_bytes(link, b"new")
    assert link.is_symlink() and os.readlink(link) == "real.json"
    assert target.read_bytes() == b"new"
    assert _temps(tmp_path) == []


@pytest.mark.skipif(not POSIX, reason="symbolic links")
def test_a_dangling_link_creates_its_target(tmp_path):
    link = tmp_path / "link.json"
    link.symlink_to("made.json")
    atomic_write_bytes(link, b"made")
    assert link.is_symlink() and (tmp_path / "made.json").read_bytes() == b"made"


@pytest.mark.skipif(not POSIX, reason="symbolic links")
def test_a_link_loop_is_one_line(tmp_path):
    (tmp_path / "a.png").symlink_to("b.png")
    (tmp_path / "b.png").symlink_to("a.png")
    with pytest.raises(InputError, match="a.png: is a symbolic link that loops"):
        check_output_path(tmp_path / "a.png")


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="FIFOs")
def test_a_fifo_is_never_replaced(tmp_path):
    fifo = tmp_path / "out.png"
    os.mkfifo(fifo)
    for write in (lambda: check_output_path(fifo), lambda: atomic_write_bytes(fifo, b"x")):
        with pytest.raises(InputError, match=r"out.png: is a FIFO \(named pipe\); shotplan "
                                             "replaces only regular files"):
            write()
    assert stat.S_ISFIFO(os.stat(fifo).st_mode)


@pytest.mark.skipif(not os.path.exists("/dev/null"), reason="device nodes")
def test_a_device_is_never_replaced():
    with pytest.raises(InputError, match="/dev/null: is a device"):
        check_output_path("/dev/null")


def test_a_folder_is_never_replaced(tmp_path):
    (tmp_path / "out.png").mkdir()
    with pytest.raises(InputError, match="out.png: is a folder, not a file"):
        atomic_write_bytes(tmp_path / "out.png", b"x")


def test_a_folder_named_as_output_is_called_a_folder(tmp_path):
    # A folder with no suffix once got "unsupported file type '(none)'"
    # (found in a new-user trial of `draw -o FOLDER`).
    (tmp_path / "pictures").mkdir()
    with pytest.raises(InputError, match="pictures: is a folder, not a file; give a file name "
                                         "ending in one of .png, .svg"):
        check_output_path(tmp_path / "pictures", (".png", ".svg"))


@pytest.mark.skipif(not POSIX, reason="file modes")
def test_a_read_only_file_needs_force(tmp_path):
    ro = tmp_path / "kept.json"
    ro.write_text("old")
    ro.chmod(0o444)
    with pytest.raises(InputError, match="kept.json: the file is read-only; give --force"):
        check_output_path(ro)
    with pytest.raises(InputError, match="read-only"):
        atomic_write_bytes(ro, b"new")
    assert ro.read_text() == "old"
    atomic_write_bytes(ro, b"new", force=True)
    assert ro.read_text() == "new"
    assert stat.S_IMODE(os.stat(ro).st_mode) == 0o444  # still read-only
    assert _temps(tmp_path) == []


# ------------------------------------------------------------ write errors
def test_a_full_disk_names_the_file_typed(tmp_path):
    out = tmp_path / "sheet.png"
    out.write_bytes(b"old")
    with pytest.raises(WriteError) as info:
        with atomic_path(out) as tmp:
            tmp.write_bytes(b"half")
            raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))
    assert str(info.value) == f"{out}: cannot write: {os.strerror(errno.ENOSPC)}"
    assert info.value.errno == errno.ENOSPC and isinstance(info.value, OSError)
    assert out.read_bytes() == b"old" and _temps(tmp_path) == []


def test_a_failed_rename_names_the_file_typed_not_the_temporary(tmp_path, monkeypatch):
    out = tmp_path / "x.png"

    def refuse(src, dst):
        raise PermissionError(errno.EACCES, os.strerror(errno.EACCES), str(src))

    monkeypatch.setattr(os, "replace", refuse)
    with pytest.raises(WriteError) as info:
        atomic_write_bytes(out, b"data")
    assert str(info.value) == f"{out}: cannot write: {os.strerror(errno.EACCES)}"
    assert ".part" not in str(info.value)
    assert _temps(tmp_path) == [] and not out.exists()


def test_an_error_about_another_file_passes_through(tmp_path):
    with pytest.raises(FileNotFoundError) as info:
        with atomic_path(tmp_path / "x.png"):
            open(tmp_path / "elsewhere.txt")  # noqa: SIM115 - it raises
    assert info.value.filename == str(tmp_path / "elsewhere.txt")


def test_the_temporary_file_appears_only_when_written(tmp_path):
    with atomic_path(tmp_path / "x.png") as tmp:
        assert not tmp.exists() and _temps(tmp_path) == []
        tmp.write_bytes(b"now")
        assert _temps(tmp_path) == [tmp.name]
    assert (tmp_path / "x.png").read_bytes() == b"now" and _temps(tmp_path) == []


def test_a_very_long_name_still_gets_a_temporary_name_that_fits(tmp_path):
    name = "n" * 250 + ".png"  # 254 bytes: the usual limit is 255
    atomic_write_bytes(tmp_path / name, b"ok")
    assert (tmp_path / name).read_bytes() == b"ok"


# ------------------------------------------------------ stale temporaries
def _dead_pid() -> int:
    proc = subprocess.Popen([sys.executable, "-c", "pass"])
    proc.wait()
    return proc.pid


@pytest.mark.skipif(not POSIX, reason="process ids")
def test_stale_temporaries_of_dead_writers_go_on_the_next_write(tmp_path):
    from shotplan.files import write as fileio

    out = tmp_path / "d.png"
    host = fileio._host_tag()
    dead = tmp_path / f".d.png.{host}-{_dead_pid()}.0123abcd.part"
    alive = tmp_path / f".d.png.{host}-{os.getpid()}.4567cdef.part"
    other_host = tmp_path / f".d.png.zzzzzz-{_dead_pid()}.89abcdef.part"
    old_legacy = tmp_path / ".d.png.k2j4h5g6.part"
    new_legacy = tmp_path / ".d.png.a1b2c3d4.part"
    someone_elses = tmp_path / ".d.png.notes.part.txt"
    for p in (dead, alive, other_host, old_legacy, new_legacy, someone_elses):
        p.write_bytes(b"x")
    past = time.time() - LEGACY_STALE_SECONDS - 60
    os.utime(old_legacy, (past, past))
    assert sorted(stale_temporaries(out)) == sorted([dead, old_legacy])
    atomic_write_bytes(out, b"new")
    left = sorted(p.name for p in tmp_path.iterdir())
    assert left == sorted(p.name for p in (out, alive, other_host, new_legacy, someone_elses))


# ------------------------------------------------------------------ signals
@pytest.mark.skipif(not hasattr(signal, "SIGTERM") or not POSIX, reason="POSIX signals")
def test_sigterm_unwinds_and_removes_the_temporary_file(tmp_path):
    out = tmp_path / "t.png"
    out.write_bytes(b"old")
    before = signal.getsignal(signal.SIGTERM)
    with pytest.raises(Terminated) as info:
        with handle_termination():
            with atomic_path(out) as tmp:
                tmp.write_bytes(b"half")
                os.kill(os.getpid(), signal.SIGTERM)
                time.sleep(5)  # the handler raises before this ends
    assert info.value.signum == signal.SIGTERM
    assert out.read_bytes() == b"old" and _temps(tmp_path) == []
    assert signal.getsignal(signal.SIGTERM) == before  # put back


# ------------------------------------------------------------------ reading
@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="FIFOs")
def test_a_fifo_as_input_is_refused_without_waiting(tmp_path):
    fifo = tmp_path / "in.json"
    os.mkfifo(fifo)
    result: list[BaseException] = []

    def read() -> None:
        try:
            read_limited(fifo, 1000, LayoutError)
        except BaseException as e:  # noqa: BLE001 - kept for the check below
            result.append(e)

    t = threading.Thread(target=read, daemon=True)
    t.start()
    t.join(5.0)
    if t.is_alive():  # it opened the FIFO: release it, then fail
        os.close(os.open(fifo, os.O_WRONLY | os.O_NONBLOCK))
        pytest.fail("read_limited opened a FIFO and waited for a writer")
    assert isinstance(result[0], LayoutError)
    assert str(result[0]) == (f"{fifo}: is a FIFO (named pipe), not a file; only regular "
                              "files are read")


def test_a_newline_in_an_input_name_is_shown_escaped(tmp_path):
    name = tmp_path / "a\nb.json"
    with pytest.raises(LayoutError) as info:
        read_limited(name, 1000, LayoutError)
    assert "\n" not in str(info.value) and "\\n" in str(info.value)


def test_the_line_limit(tmp_path):
    p = tmp_path / "rows.csv"
    p.write_bytes(b"a\n" * 10)
    assert read_limited(p, 1000, InputError, max_lines=10) == b"a\n" * 10
    p.write_bytes(b"a\n" * 10 + b"last")  # 11 lines, the last without a newline
    with pytest.raises(InputError, match="rows.csv: 11 lines is too many, files hold at most "
                                         "10 lines"):
        read_limited(p, 1000, InputError, max_lines=10)


# ------------------------------------------------------------- the kill test
def _png_whole(path: Path) -> bool:
    from PIL import Image

    try:
        with Image.open(path) as im:
            im.load()  # decodes every row: a cut file fails here
        return True
    except Exception:  # noqa: BLE001 - any failure to decode means not whole
        return False


def _draw(out: Path, dpi: int) -> subprocess.Popen:
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    return subprocess.Popen([sys.executable, "-m", "shotplan", "draw", str(LAYOUT), "-o",
                             str(out), "--dpi", str(dpi)], env=env,
                            stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)


@pytest.mark.skipif(not POSIX, reason="POSIX signals")
def test_killed_writes_leave_the_old_or_the_new_file_whole(tmp_path):
    """Draw a large PNG and kill the process at random moments of its run
    (SIGKILL and SIGTERM in turn). After every kill the output decodes
    whole (the old picture or the new one); a SIGTERM leaves no temporary
    file at all; the next write removes what a SIGKILL left."""
    out = tmp_path / "big.png"
    start = time.monotonic()
    first = _draw(out, 400)
    assert first.wait(120) == 0, first.stderr.read() if first.stderr else ""
    run_s = time.monotonic() - start
    assert _png_whole(out)
    rng = random.Random(12)
    for k in range(3):
        sig = signal.SIGKILL if k % 2 == 0 else signal.SIGTERM
        proc = _draw(out, 400)
        time.sleep(rng.uniform(0.45, 1.0) * run_s)  # spread over the render and the write
        proc.send_signal(sig)
        code = proc.wait(60)
        assert _png_whole(out), f"kill {k} ({sig.name}) left a broken {out.name}"
        if sig == signal.SIGTERM:
            assert code in (0, -signal.SIGTERM, 128 + signal.SIGTERM), code
            assert _temps(tmp_path) == [], f"SIGTERM left {_temps(tmp_path)}"
            if code == 128 + signal.SIGTERM:
                assert proc.stderr is not None and b"Traceback" not in proc.stderr.read()
    last = _draw(out, 30)
    assert last.wait(60) == 0
    assert _png_whole(out)
    assert _temps(tmp_path) == []


# ------------------------------------------------------------- JSON reading
def test_parse_json_refuses_what_no_field_can_mean_and_names_the_field():
    # Our own rule (files/read.py): NaN, Infinity, numbers past 1e9 in size and
    # repeated keys are refused with the field they are in; 1e9 itself is kept.
    from shotplan.files.read import parse_json

    assert parse_json('{"a": [1e9, -1000000000]}', "f.json") == {"a": [1e9, -1000000000]}
    cases = {
        '{"balls": {"1": [NaN, 0]}}': "f.json: balls.1[0]: NaN is not a number",
        '{"a": {"b": -Infinity}}': "f.json: a.b: -Infinity is not a number",
        '{"a": 1.5e9}': "f.json: a: 1.5e9 is too large",
        '{"a": 1, "a": 2}': "f.json: the field 'a' appears twice",
        '{"x": {"odd key": 1e400}}': 'f.json: x["odd key"]: 1e400 is too large',
        "  ": "f.json: the file is empty",
        '{"a": }': "f.json: line 1, column 7: not valid JSON",
    }
    for text, start in cases.items():
        with pytest.raises(LayoutError) as e:
            parse_json(text, "f.json")
        assert str(e.value).startswith(start), (text, str(e.value))
        assert "\n" not in str(e.value)


def test_read_json_file_names_a_byte_that_is_not_utf8(tmp_path):
    # 0xff never occurs in UTF-8 (RFC 3629, section 1).
    from shotplan.files.read import read_json_file

    p = tmp_path / "bad.json"
    p.write_bytes(b'{"a": "\xff"}')
    with pytest.raises(LayoutError, match=r"bad\.json: not UTF-8 text \(byte 0xff at offset 7\)"):
        read_json_file(p)


def test_value_words_as_messages_quote_them():
    # JSON's own names for its kinds (RFC 8259, section 3), in our words.
    from shotplan.files.read import field_path, show_value, value_kind

    assert [value_kind(v) for v in (True, None, {}, [], "x", 2.5, 3)] == [
        "true/false", "null", "an object", "a list", "a string", "a number", "a number"]
    assert show_value([1, "é"]) == '[1, "é"]'
    assert show_value(list(range(200))).endswith("...")
    assert field_path("", "balls") == "balls"
    assert field_path("balls", "3") == "balls.3"
    assert field_path("balls", "cue ball") == 'balls["cue ball"]'
    assert field_path("balls", "a\nb") == 'balls["a\\nb"]'


def test_check_format_and_version_say_what_is_valid():
    from shotplan.files.read import check_format, check_version

    check_format({"format": "shotplan-drill"}, "d.json", "shotplan-drill", "drill")
    with pytest.raises(LayoutError, match=r'd\.json: format: missing, a drill file has '
                                          r'"format": "shotplan-drill"'):
        check_format({}, "d.json", "shotplan-drill", "drill")
    with pytest.raises(LayoutError, match=r"d\.json: version: true is not a version number"):
        check_version({"version": True}, "d.json", 1, "drill")
    with pytest.raises(LayoutError, match=r"version: 2 is not supported, this shotplan reads "
                                          r"drill version 1"):
        check_version({"version": 2}, "d.json", 1, "drill")
