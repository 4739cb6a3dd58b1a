"""Files in and out: nothing the user made is ever lost or left half-written,
and no input can make shotplan hang.

Writing. Every file shotplan writes goes through :func:`atomic_path` (or
:func:`atomic_write_bytes`, :func:`atomic_write_text`): the data go to a
temporary file ``.NAME.<host>-<pid>.<random>.part`` in the target's folder,
are flushed and fsync'd, and the temporary file is renamed over the target
(atomic on POSIX and on Windows' same-volume replace). The temporary file is
not made before the caller writes it (no empty file waits through a long
render), and it is removed if anything fails, if the process is interrupted
(SIGINT) or asked to stop (SIGTERM, SIGHUP: see :func:`handle_termination`).
Only SIGKILL or a power cut can leave one behind; the next write to the same
place removes those whose process is gone.

The target is checked first (:func:`check_output_path`, and again by
:func:`atomic_path`): a symbolic link is written through to the file it points
to (the link stays a link); anything that is not a regular file (a folder, a
FIFO, a device, a socket) is refused; a read-only file is refused unless
``--force`` was given (:func:`set_force`). Every message names the path the
user typed, never the temporary file, and says what went wrong (a full disk
names the file too).

Reading is :mod:`shotplan.files.read`.
"""

from __future__ import annotations

import contextlib
import errno as errno_codes
import hashlib
import os
import secrets
import signal
import socket
import stat
import threading
import time
from collections.abc import Iterator
from pathlib import Path
from typing import Any

from ..errors import InputError, Terminated, WriteError, quoted, show_path
from .read import file_kind

__all__ = ["atomic_path", "atomic_write_text", "atomic_write_bytes", "check_output_path",
           "set_force", "force_enabled", "handle_termination",
           "stale_temporaries", "FORCE_HELP", "LEGACY_STALE_SECONDS"]

FORCE_HELP = "replace an output file even if it is read-only"
"""The help text of every command's ``--force`` option."""

LEGACY_STALE_SECONDS = 3600.0
"""Temporary files in the older ``.NAME.XXXXXXXX.part`` form carry no owner;
they are removed once they are this old (no write takes an hour)."""

_NAME_BYTES = 180
"""At most this many bytes of the target's name go into a temporary file's
name, so that the temporary name stays within the usual 255-byte limit."""

_force = False


def set_force(on: bool) -> None:
    """Allow or refuse replacing read-only files (the command line's ``--force``).

    Parameters
    ----------
    on : bool
        ``True`` allows, ``False`` (the default state) refuses.
    """
    global _force
    _force = bool(on)


def force_enabled() -> bool:
    """Whether read-only outputs may be replaced (see :func:`set_force`).

    Returns
    -------
    bool
        The current setting.
    """
    return _force


# ------------------------------------------------------------------ targets
def _write_target(p: Path, shown: str) -> Path:
    """The file a write to ``p`` must replace: ``p`` itself, or, for a symbolic
    link, the file it points to (which may not exist yet)."""
    if not os.path.islink(p):
        return p
    try:
        os.stat(p)
    except FileNotFoundError:
        pass  # a dangling link: the write creates its target, as a shell would
    except OSError as e:
        if e.errno == errno_codes.ELOOP:
            raise InputError(f"{shown}: is a symbolic link that loops, not a file") from None
        raise WriteError(f"{shown}: cannot write: {e.strerror or e}", e.errno) from None
    return Path(os.path.realpath(p))


def _check_target(target: Path, shown: str, force: bool | None) -> None:
    """Refuse a target that is not a regular file, or is read-only without force."""
    try:
        st = os.stat(target)
    except FileNotFoundError:
        st = None
    except NotADirectoryError:
        raise InputError(f"{shown}: a part of the path is a file, not a folder") from None
    except OSError as e:
        raise WriteError(f"{shown}: cannot write: {e.strerror or e}", e.errno) from None
    except ValueError as e:  # a NUL byte in the name
        raise InputError(f"{shown}: not a usable file name ({e})") from None
    if st is not None:
        if stat.S_ISDIR(st.st_mode):
            raise InputError(f"{shown}: is a folder, not a file")
        if not stat.S_ISREG(st.st_mode):
            raise InputError(f"{shown}: is {file_kind(st.st_mode)}; shotplan replaces only "
                             "regular files")
        read_only = not st.st_mode & 0o222 or not os.access(target, os.W_OK)
        if read_only and not (_force if force is None else force):
            raise InputError(f"{shown}: the file is read-only; give --force to replace it")
    parent = target.parent if str(target.parent) else Path(".")
    if not parent.is_dir():
        where = "" if target == Path(shown) else f" (the link points to {show_path(target)})"
        raise InputError(f"{shown}: the folder {show_path(parent)} does not exist{where}")


def check_output_path(path: str | os.PathLike[str], suffixes: tuple[str, ...] | None = None,
                      *, force: bool | None = None) -> Path:
    """Check that ``path`` can be written, before any work is done.

    Its suffix is one of ``suffixes`` (if given), its folder exists, and what
    it names (through symbolic links) is a regular file or nothing, and not
    read-only unless ``force``.

    Parameters
    ----------
    path : str or os.PathLike
        The output file, as the user gave it.
    suffixes : tuple of str, optional
        Allowed suffixes, lower case with the dot (``(".png", ".svg")``).
    force : bool, optional
        Replace a read-only file; default :func:`force_enabled`.

    Returns
    -------
    Path
        ``Path(path)``.

    Raises
    ------
    InputError
        One line naming the path: a wrong suffix, a missing folder, a folder or
        other non-regular file, a read-only file without ``force``.
    WriteError
        If the path cannot be examined (no permission).
    """
    p = Path(path)
    shown = show_path(p)
    if suffixes is not None and os.path.isdir(p):
        raise InputError(f"{shown}: is a folder, not a file; give a file name ending in one of "
                         f"{', '.join(suffixes)}")
    if suffixes is not None and p.suffix.lower() not in suffixes:
        raise InputError(f"{shown}: unsupported file type {quoted(p.suffix or '(none)')}, "
                         f"must end in one of {', '.join(suffixes)}")
    _check_target(_write_target(p, shown), shown, force)
    return p


# -------------------------------------------------------- temporary files
def _host_tag() -> str:
    return hashlib.sha256(socket.gethostname().encode("utf-8", "replace")).hexdigest()[:6]


def _temp_stem(name: str) -> str:
    """``.NAME.``, with NAME cut to :data:`_NAME_BYTES` bytes."""
    raw = name.encode("utf-8", "surrogateescape")
    if len(raw) > _NAME_BYTES:
        name = raw[:_NAME_BYTES].decode("utf-8", "ignore")
    return f".{name}."


def _temp_name(name: str) -> str:
    return f"{_temp_stem(name)}{_host_tag()}-{os.getpid()}.{secrets.token_hex(4)}.part"


def _process_gone(pid: int) -> bool:
    if os.name == "nt" or pid <= 0:  # os.kill(pid, 0) would end it on Windows
        return False
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return True
    except OSError:
        return False  # it exists (perhaps another user's)
    return False


def stale_temporaries(path: str | os.PathLike[str], now: float | None = None) -> list[Path]:
    """Temporary files of earlier writes to ``path`` that can go.

    Ours, made on this machine by a process that no longer runs, or in the
    older form without an owner and older than :data:`LEGACY_STALE_SECONDS`;
    all older than ``now``. Never a folder or a link.

    Parameters
    ----------
    path : str or os.PathLike
        The target whose temporary files are looked for (in its folder).
    now : float, optional
        The current time (``time.time()`` by default).

    Returns
    -------
    list of Path
        The temporary files that may be removed (empty if the folder cannot be read).
    """
    target = Path(path)
    parent = target.parent if str(target.parent) else Path(".")
    stem = _temp_stem(target.name)
    now = time.time() if now is None else now
    host = _host_tag()
    out = []
    try:
        entries = list(os.scandir(parent))
    except OSError:
        return []
    for entry in entries:
        name = entry.name
        if not (name.startswith(stem) and name.endswith(".part")):
            continue
        middle = name[len(stem):-len(".part")]
        try:
            if not entry.is_file(follow_symlinks=False):
                continue
            age = now - entry.stat(follow_symlinks=False).st_mtime
        except OSError:
            continue
        if age < 0:
            continue
        owner, dot, token = middle.partition(".")
        tag, dash, pid = owner.partition("-")
        if dot and dash and pid.isdigit() and len(token) == 8:
            if tag == host and _process_gone(int(pid)):
                out.append(Path(entry.path))
        elif "." not in middle and len(middle) == 8 and age > LEGACY_STALE_SECONDS:
            out.append(Path(entry.path))
    return out


def _remove_stale(target: Path) -> None:
    for p in stale_temporaries(target):
        with contextlib.suppress(OSError):
            p.unlink()


def _write_error(e: OSError, shown: str) -> WriteError:
    what = e.strerror or str(e)
    return WriteError(f"{shown}: cannot write: {what}", e.errno)


@contextlib.contextmanager
def atomic_path(path: str | os.PathLike[str], *, force: bool | None = None) -> Iterator[Path]:
    """Yield a temporary path beside ``path``; on success rename it over ``path``.

    Write the temporary path completely inside the ``with`` block (it does
    not exist until you do). It is fsync'd before the rename, so a crash
    leaves either the old or the new file. ``path`` is checked as by
    :func:`check_output_path` (a link is written through; only a regular file
    is replaced; a read-only one only with ``force``).

    Parameters
    ----------
    path : str or os.PathLike
        The file to write, as the user gave it (messages name it).
    force : bool, optional
        Replace a read-only file; default :func:`force_enabled`.

    Yields
    ------
    Path
        The temporary file to write, in the target's folder.

    Raises
    ------
    InputError
        If the target is not a regular file, is read-only without ``force``, or
        its folder does not exist.
    WriteError
        If writing or renaming fails (a full disk, no permission), naming ``path``.
    """
    user = Path(path)
    shown = show_path(user)
    target = _write_target(user, shown)
    _check_target(target, shown, force)
    parent = target.parent if str(target.parent) else Path(".")
    _remove_stale(target)
    tmp = parent / _temp_name(target.name)
    try:
        try:
            yield tmp
        except OSError as e:
            if isinstance(e, WriteError) or e.filename not in (None, str(tmp), os.fspath(tmp)):
                raise  # about some other file: not ours to rename
            raise _write_error(e, shown) from None
        try:
            with open(tmp, "rb+") as fh:
                fh.flush()
                os.fsync(fh.fileno())
            try:
                mode = os.stat(target).st_mode & 0o777
            except FileNotFoundError:
                mode = 0o666 & ~_umask()
            with contextlib.suppress(OSError):
                os.chmod(tmp, mode)
            os.replace(tmp, target)
        except FileNotFoundError as e:
            if e.filename in (str(tmp), os.fspath(tmp)):
                raise WriteError(f"{shown}: nothing was written") from None
            raise _write_error(e, shown) from None
        except OSError as e:
            raise _write_error(e, shown) from None
        with contextlib.suppress(OSError):
            dir_fd = os.open(parent, os.O_RDONLY)
            try:
                os.fsync(dir_fd)
            finally:
                os.close(dir_fd)
    finally:
        with contextlib.suppress(OSError):
            tmp.unlink()


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def atomic_write_bytes(path: str | os.PathLike[str], data: bytes, *,
                       force: bool | None = None) -> None:
    """Write ``data`` to ``path`` atomically (see :func:`atomic_path`).

    Parameters
    ----------
    path : str or os.PathLike
        The file to write.
    data : bytes
        Its whole content.
    force : bool, optional
        Replace a read-only file; default :func:`force_enabled`.
    """
    with atomic_path(path, force=force) as tmp:
        fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600)
        with open(fd, "wb") as fh:
            fh.write(data)


def atomic_write_text(path: str | os.PathLike[str], text: str, *,
                      force: bool | None = None) -> None:
    """Write ``text`` (UTF-8) to ``path`` atomically (see :func:`atomic_path`).

    Parameters
    ----------
    path : str or os.PathLike
        The file to write.
    text : str
        Its whole content.
    force : bool, optional
        Replace a read-only file; default :func:`force_enabled`.
    """
    atomic_write_bytes(path, text.encode("utf-8"), force=force)


# ---------------------------------------------------------------- signals
def _raise_terminated(signum: int, _frame: Any) -> None:
    raise Terminated(signum)


@contextlib.contextmanager
def handle_termination() -> Iterator[None]:
    """Make SIGTERM and SIGHUP unwind the main thread as SIGINT does, inside the block.

    They raise :class:`~shotplan.errors.Terminated` (a ``KeyboardInterrupt``),
    so temporary files are removed and the old output stays whole. The
    previous handlers come back afterwards. Elsewhere than in the main
    thread, it does nothing.

    Yields
    ------
    None
        Inside the block the handlers are installed.
    """
    if threading.current_thread() is not threading.main_thread():
        yield
        return
    old: dict[int, Any] = {}
    for name in ("SIGTERM", "SIGHUP"):
        sig = getattr(signal, name, None)
        if sig is None:
            continue
        with contextlib.suppress(OSError, ValueError):
            old[sig] = signal.signal(sig, _raise_terminated)
    try:
        yield
    finally:
        for sig, handler in old.items():
            with contextlib.suppress(OSError, ValueError, TypeError):
                signal.signal(sig, handler)
