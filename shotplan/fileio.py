"""Atomic file writes: nothing the user made is ever left half-written.

Every file shotplan writes goes through :func:`atomic_path`: the data go to a
temporary file in the same folder, are flushed and fsync'd, and the temporary
file is renamed over the target (atomic on POSIX and on Windows' same-volume
replace). If anything fails on the way, the temporary file is removed and the
old file, if any, is untouched.
"""

from __future__ import annotations

import contextlib
import os
import stat
import tempfile
from collections.abc import Iterator
from pathlib import Path

from .errors import InputError

__all__ = ["atomic_path", "atomic_write_text", "atomic_write_bytes", "check_output_path",
           "read_limited"]


def check_output_path(path: str | os.PathLike[str], suffixes: tuple[str, ...] | None = None) -> Path:
    """Check that ``path`` can be written: its folder exists, it is not a folder,
    and (if given) its suffix is one of ``suffixes``. Raises :class:`InputError`."""
    p = Path(path)
    if suffixes is not None and p.suffix.lower() not in suffixes:
        raise InputError(f"{str(p)!r}: unsupported file type {p.suffix or '(none)'!r}, "
                         f"must end in one of {', '.join(suffixes)}")
    if p.is_dir():
        raise InputError(f"{str(p)!r} is a folder, not a file")
    parent = p.parent if str(p.parent) else Path(".")
    if not parent.is_dir():
        raise InputError(f"{str(p)!r}: the folder {str(parent)!r} does not exist")
    return p


@contextlib.contextmanager
def atomic_path(path: str | os.PathLike[str]) -> Iterator[Path]:
    """Yield a temporary path beside ``path``; on success rename it over ``path``.

    Write the temporary path completely inside the ``with`` block. It is
    fsync'd before the rename, so a crash leaves either the old or the new file.
    """
    target = Path(path)
    parent = target.parent if str(target.parent) else Path(".")
    fd, tmp_name = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".part", dir=parent)
    os.close(fd)
    tmp = Path(tmp_name)
    try:
        yield tmp
        with open(tmp, "rb+") as fh:
            fh.flush()
            os.fsync(fh.fileno())
        if target.exists():
            with contextlib.suppress(OSError):
                os.chmod(tmp, target.stat().st_mode & 0o777)
        else:
            with contextlib.suppress(OSError):
                os.chmod(tmp, 0o666 & ~_umask())
        os.replace(tmp, target)
        with contextlib.suppress(OSError):
            dir_fd = os.open(parent, os.O_RDONLY)
            try:
                os.fsync(dir_fd)
            finally:
                os.close(dir_fd)
    finally:
        with contextlib.suppress(FileNotFoundError):
            tmp.unlink()


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def atomic_write_bytes(path: str | os.PathLike[str], data: bytes) -> None:
    """Write ``data`` to ``path`` atomically."""
    with atomic_path(path) as tmp:
        with open(tmp, "wb") as fh:
            fh.write(data)


def atomic_write_text(path: str | os.PathLike[str], text: str) -> None:
    """Write ``text`` (UTF-8) to ``path`` atomically."""
    atomic_write_bytes(path, text.encode("utf-8"))


def read_limited(path: str | os.PathLike[str], max_bytes: int, error: type[Exception],
                 noun: str = "file", plural: str = "files") -> bytes:
    """The bytes of an input file, every way that can fail turned into one
    ``error`` line starting with the file name: missing, unreadable, a folder
    (``is a folder, not a <noun>``), larger than ``max_bytes``."""
    name = str(path)
    p = Path(path)
    size_mb = f"{max_bytes / (1024 * 1024):g} MB"
    try:
        st = p.stat()
    except (FileNotFoundError, NotADirectoryError):
        raise error(f"{name}: no such file") from None
    except OSError as e:
        raise error(f"{name}: cannot read: {e.strerror or e}") from None
    except ValueError as e:  # a NUL byte in the name
        raise error(f"{name!r}: not a usable file name ({e})") from None
    if stat.S_ISDIR(st.st_mode):
        raise error(f"{name}: is a folder, not a {noun}")
    if stat.S_ISREG(st.st_mode) and st.st_size > max_bytes:
        raise error(f"{name}: the file is too large ({st.st_size / 1e6:.1f} MB), "
                    f"{plural} are at most {size_mb}")
    try:
        with open(p, "rb") as fh:
            data = fh.read(max_bytes + 1)
    except OSError as e:
        raise error(f"{name}: cannot read: {e.strerror or e}") from None
    if len(data) > max_bytes:
        raise error(f"{name}: the file is too large, {plural} are at most {size_mb}")
    return data
