"""The ``shotplan`` command: the parser, the dispatch, errors to exit codes.

Each command lives in its own module of :mod:`shotplan.cli`, which has
``add_subcommands(sub)``: it declares the command's arguments and sets
``run``, a function ``run(args) -> int`` that calls the library and prints.
To add a command, write its module and list it in :data:`COMMAND_MODULES`.

Every fault the user can cause (a bad file, a bad value, a usage mistake)
ends as one line on stderr, ``shotplan: error: <message>``, and exit code 2;
no traceback, and nothing written or half-written.
"""

from __future__ import annotations

import argparse
import re
import sys
from collections.abc import Sequence
from typing import Any, NoReturn

from ..errors import ShotplanError, Terminated, show_path
from ..files.jsonout import NonFiniteError
from ..files.write import FORCE_HELP, handle_termination, set_force
from .common import EXIT_ERROR, error_line
from .options import ListHelpFormatter

__all__ = ["main", "build_parser", "exit_now", "COMMANDS", "COMMAND_MODULES"]

COMMANDS: dict[str, str] = {
    "tables": "shotplan.cli.tables",
    "check": "shotplan.cli.check",
    "draw": "shotplan.cli.draw",
    "simulate": "shotplan.cli.simulate",
    "plan": "shotplan.cli.plan",
    "view": "shotplan.view.command",
    "position": "shotplan.cli.position",
    "atlas": "shotplan.cli.atlas",
    "drill": "shotplan.cli.drills",
    "cushion": "shotplan.cli.cushion",
    "study": "shotplan.cli.study",
}
"""Each command's name and the module that adds it, in the order ``--help``
lists them. A command line naming one of them imports that module alone
(start-up time: the other commands' libraries stay unloaded)."""

COMMAND_MODULES: tuple[str, ...] = tuple(COMMANDS.values())
"""The modules that add the commands, in the order ``--help`` lists them.
Each has ``add_subcommands(sub)``; a module whose capability is not
installed in this tree (the table view without pygame) is left out."""


class UsageError(Exception):
    """A command-line mistake; turned into one error line by :func:`main`."""


NEGATIVE_VALUE = re.compile(r"^-\.?\d[\d.eE+-]*(,\s*[-+]?\.?\d[\d.eE+-]*)*,?$")
"""A command-line word that is a negative number or a comma list starting with one."""


class _Parser(argparse.ArgumentParser):
    """An argparse parser whose errors are one line, not usage plus message,
    and whose help shows a list option as one comma-separated value."""

    def __init__(self, *args: Any, **kwargs: Any) -> None:
        kwargs.setdefault("formatter_class", ListHelpFormatter)
        super().__init__(*args, **kwargs)
        # A value that starts with a minus and a digit is a value, a comma
        # list too (`--distances -0.3,0.9`): argparse's own test takes only
        # one plain number, and so read the list as an unknown option.
        self._negative_number_matcher = NEGATIVE_VALUE

    def error(self, message: str) -> NoReturn:
        raise UsageError(f"{message} (see '{self.prog} --help')")


def _os_message(error: OSError) -> str:
    where = show_path(error.filename) if error.filename is not None else ""
    what = error.strerror or str(error)
    return f"{where}: {what}" if where else what


def _add_module_commands(sub: argparse._SubParsersAction,
                         modules: Sequence[str] = COMMAND_MODULES) -> None:
    import importlib

    for name in modules:
        try:
            module = importlib.import_module(name)
        except ModuleNotFoundError as e:
            if e.name != name and not name.startswith(str(e.name) + "."):
                raise
            continue  # that capability is not installed in this tree
        module.add_subcommands(sub)


def _version() -> str:
    """The installed version (written once, in pyproject.toml)."""
    from importlib import metadata

    try:
        return metadata.version("shotplan")
    except metadata.PackageNotFoundError:  # a source tree never installed
        return "0+unknown"


def build_parser(command: str | None = None) -> argparse.ArgumentParser:
    """The ``shotplan`` argument parser with every command, or with one.

    Parameters
    ----------
    command : str, optional
        A name in :data:`COMMANDS`: only that command's module is imported
        and added (what :func:`main` does for a command line that names
        one). By default, or for a name not in :data:`COMMANDS`, or when
        that command is not installed, every command.

    Returns
    -------
    argparse.ArgumentParser
        Its errors raise :class:`UsageError` instead of exiting.
    """
    parser = _Parser(
        prog="shotplan",
        description="Plan shots on billiard tables: to-scale layouts, physics, shot search.",
    )
    parser.add_argument("--version", action="version", version=f"shotplan {_version()}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    if command in COMMANDS:
        _add_module_commands(sub, (COMMANDS[command],))
        if command not in sub.choices:  # not installed here: the full list for the error
            return build_parser()
    else:
        _add_module_commands(sub)
    _add_force_options(parser)
    return parser


_OUTPUT_OPTIONS = frozenset({"-o", "--output", "--csv", "--plot", "--screenshot"})
"""Options that name a file a command writes: every parser with one of them
gets ``--force`` (see :func:`shotplan.files.write.set_force`)."""


def _add_force_options(parser: argparse.ArgumentParser) -> None:
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            for child in dict.fromkeys(action.choices.values()):
                _add_force_options(child)
    writes = any(set(a.option_strings) & _OUTPUT_OPTIONS for a in parser._actions)
    if writes and "--force" not in parser._option_string_actions:
        parser.add_argument("--force", action="store_true", help=FORCE_HELP)


def _parse(parser: argparse.ArgumentParser, argv: Sequence[str] | None) -> argparse.Namespace:
    args = parser.parse_args(argv)
    if args.command is None:
        names = ", ".join(_command_names(parser))
        raise UsageError(f"a command is needed, one of {names} (see 'shotplan --help')")
    return args


def main(argv: Sequence[str] | None = None) -> int:
    """Run the ``shotplan`` command.

    Parameters
    ----------
    argv : sequence of str, optional
        The arguments after ``shotplan``. Without them the command is the
        program (the ``shotplan`` script, ``python -m shotplan``): it reads
        the process's arguments and, once its output is flushed, ends the
        process itself with the exit code (see :func:`exit_now`).

    Returns
    -------
    int
        The exit code: 0 done, 2 bad input or usage, 1 an internal error or
        a reader that went away, 128 + N after signal N.
    """
    if argv is None:
        import os

        from .engine import COMPILE_NOTICE, NOTICE_VARIABLE

        os.environ.setdefault(NOTICE_VARIABLE, COMPILE_NOTICE)  # for any command that compiles
    code = _main(argv)
    if argv is None:
        exit_now(code)
    return code


def exit_now(code: int) -> NoReturn:
    """Flush stdout and stderr and end the process, skipping the
    interpreter's teardown.

    Tearing down the modules of numba, numpy and matplotlib costs about
    0.13 s of CPU at the end of every command, to free memory the system
    frees anyway. Everything a command writes is closed when it returns
    (files go through :mod:`shotplan.files.write`, worker pools and
    clusters are shut down by the code that started them), so only the two
    standard streams are left to flush.

    Parameters
    ----------
    code : int
        The exit code; a reader that went away while the last output was
        flushed makes 0 into 1, as :func:`main` does.
    """
    import os

    for stream in (sys.stdout, sys.stderr):
        try:
            stream.flush()
        except (OSError, ValueError):
            if stream is sys.stdout and code == 0:
                code = 1
    os._exit(code)


def _main(argv: Sequence[str] | None) -> int:
    _one_blas_thread()
    words = list(sys.argv[1:] if argv is None else argv)
    parser = build_parser(words[0] if words else None)
    try:
        args = _parse(parser, words)
    except UsageError as e:
        error_line(str(e))
        return EXIT_ERROR
    except SystemExit as e:  # --help and --version end here
        return e.code if isinstance(e.code, int) else 0
    set_force(bool(getattr(args, "force", False)))
    try:
        with handle_termination():
            code: int = args.run(args)
            return code
    except BrokenPipeError:
        # The reader went away (``| head``): stop quietly, and keep Python
        # from complaining again when it flushes stdout at exit.
        _silence_stdout()
        return 1
    except ShotplanError as e:
        error_line(str(e))
        return EXIT_ERROR
    except OSError as e:
        error_line(_os_message(e))
        return EXIT_ERROR
    except Terminated as e:
        return 128 + e.signum
    except KeyboardInterrupt:
        return 130
    except NonFiniteError as e:
        # Inside shotplan a NaN is a bug: say so in one line, not a traceback.
        error_line(f"internal error: a non-finite number in the JSON output ({e}); "
                   "please report this with the command line")
        return 1


def _one_blas_thread() -> None:
    """Ask numpy's BLAS for one thread, unless the user chose a number.

    OpenBLAS starts a thread per core when numpy loads, and those threads
    cost about 0.1 s of CPU at every start; shotplan's linear algebra is a
    few small matrices, and its parallel work is in processes
    (:mod:`shotplan.parallel`), which would only oversubscribe the cores.
    Must run before numpy is imported; a no-op after.
    """
    import os

    os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")


def _silence_stdout() -> None:
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError):
        pass


def _command_names(parser: argparse.ArgumentParser) -> list[str]:
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            return list(action.choices)
    return []


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
