"""Option parsers shared by the commands: whole numbers in a range, and lists.

One list syntax for the user: values separated by commas, as in
``--kinds direct,bank`` or ``--speeds 1,2.5,4``; an option that takes a list
has a plural name. The spellings of the version before (values separated by
spaces, singular names such as ``--cue-distance`` for a list) are still
accepted for one version, each with one line on stderr that names the new
spelling (:func:`deprecated`).
"""

from __future__ import annotations

import argparse
import math
import re
import sys
from collections.abc import Callable, Mapping, Sequence
from typing import Any, TypeVar

from ..errors import InputError

__all__ = [
    "int_in",
    "split_list",
    "parse_list",
    "number",
    "ListAction",
    "ListHelpFormatter",
    "add_list_option",
    "deprecated",
    "allow_negative_lists",
]

T = TypeVar("T")


def int_in(low: int, high: int) -> Callable[[str], int]:
    """An argparse type: a whole number between ``low`` and ``high``.

    Parameters
    ----------
    low, high : int
        The least and greatest value accepted.

    Returns
    -------
    callable
        Parses one option value; raises :class:`argparse.ArgumentTypeError`
        with the valid range otherwise.
    """

    def parse(text: str) -> int:
        try:
            value = int(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"{text!r} is not a whole number") from None
        if not low <= value <= high:
            raise argparse.ArgumentTypeError(
                f"{value} is out of range, must be between {low} and {high}")
        return value

    return parse


def split_list(text: str) -> list[str]:
    """The items of a comma-separated list, stripped, empty ones left out.

    Parameters
    ----------
    text : str
        For example ``"0.3, 0.9,"``.

    Returns
    -------
    list of str
        For example ``["0.3", "0.9"]``.
    """
    return [part.strip() for part in text.split(",") if part.strip()]


def parse_list(text: str, item: Callable[[str], T], option: str) -> list[T]:
    """A comma-separated list, each item parsed by ``item``.

    Parameters
    ----------
    text : str
        The option's value.
    item : callable
        Parses one item; raises :class:`ValueError` (or
        :class:`argparse.ArgumentTypeError`) with a message naming what is
        valid.
    option : str
        The option's name, which starts every message.

    Returns
    -------
    list
        The parsed items, in order.

    Raises
    ------
    InputError
        An item that does not parse, or a list with no items.
    """
    out: list[T] = []
    for part in split_list(text):
        try:
            out.append(item(part))
        except (ValueError, argparse.ArgumentTypeError) as e:
            raise InputError(f"{option}: {e}") from None
    if not out:
        raise InputError(f"{option}: {text!r} holds no values, give a comma-separated list")
    return out


def number(what: str = "a number", above: float | None = None,
           most: float | None = None) -> Callable[[str], float]:
    """An item parser: a finite number, optionally above a bound.

    Parameters
    ----------
    what : str
        What the number is, for the message (``"a distance in m"``).
    above : float, optional
        Values must be greater than this.
    most : float, optional
        Values must be at most this.

    Returns
    -------
    callable
        Parses one item; raises :class:`ValueError` with the valid range.
    """

    def parse(text: str) -> float:
        try:
            value = float(text)
        except ValueError:
            raise ValueError(f"{text!r} is not {what}") from None
        if not math.isfinite(value):
            raise ValueError(f"{text!r} is not a finite number")
        if above is not None and value <= above:
            raise ValueError(f"{text!r} is not {what} above {above:g}")
        if most is not None and value > most:
            raise ValueError(f"{text!r} is out of range, must be at most {most:g}")
        return value

    return parse


def deprecated(old: str, new: str) -> None:
    """Print the one line that says an old spelling still works, and the new one.

    Parameters
    ----------
    old : str
        What the user wrote (``"--speed 1 2"``).
    new : str
        The spelling of this version (``"--speeds 1,2"``).
    """
    print(f"shotplan: warning: '{old}' is the old spelling, write '{new}' (the old one is "
          "accepted until the next version)", file=sys.stderr, flush=True)


class ListAction(argparse.Action):
    """An option that takes a comma-separated list.

    The old forms are accepted with one :func:`deprecated` line: values
    separated by spaces (``--speeds 1 2``), and the option's old names
    (``old_names``, for example a singular ``--cue-distance`` for a list),
    and old words among the items (``renames``).
    The parsed list is stored (the last use of the option wins).

    Parameters
    ----------
    item : callable
        Parses one item (see :func:`parse_list`).
    old_names : sequence of str
        Option strings of the version before; they are registered with the
        parser too and print the deprecation line.
    most : int, optional
        Most values accepted (1 for an option that takes one value).
    renames : mapping of str to str, optional
        Old words of the list's items (lower case) and their new spelling.
    """

    def __init__(self, option_strings: Sequence[str], dest: str, *,
                 item: Callable[[str], Any], old_names: Sequence[str] = (),
                 most: int | None = None, renames: Mapping[str, str] | None = None,
                 **kwargs: Any) -> None:
        kwargs.setdefault("nargs", "+")
        super().__init__(option_strings, dest, **kwargs)
        self.item = item
        self.old_names = tuple(old_names)
        self.most = most
        self.renames = dict(renames or {})

    def __call__(self, parser: argparse.ArgumentParser, namespace: argparse.Namespace,
                 values: str | Sequence[Any] | None, option_string: str | None = None) -> None:
        texts = [values] if isinstance(values, str) else [str(v) for v in values or ()]
        name = self.option_strings[-1]  # the new name is given last
        items = split_list(",".join(texts))
        new_items = [self.renames.get(t.lower(), t) for t in items]
        try:
            parsed = parse_list(",".join(new_items), self.item, name)
        except InputError as e:
            raise argparse.ArgumentError(self, str(e).removeprefix(f"{name}: ")) from None
        if self.most is not None and len(parsed) > self.most:
            raise argparse.ArgumentError(
                self, f"takes one value, got {len(parsed)} ({','.join(items)})" if self.most == 1
                else f"{len(parsed)} values, at most {self.most} are accepted")
        if option_string in self.old_names or len(texts) > 1 or new_items != items:
            deprecated(f"{option_string} {' '.join(texts)}", f"{name} {','.join(new_items)}")
        setattr(namespace, self.dest, parsed)


class ListHelpFormatter(argparse.HelpFormatter):
    """Shows a :class:`ListAction` as its one comma-separated value
    (``--speeds MPS,...``): the spaces it still reads are the old spelling,
    not advertised."""

    def _format_args(self, action: argparse.Action, default_metavar: str) -> str:
        if isinstance(action, ListAction):
            return str(self._metavar_formatter(action, default_metavar)(1)[0])
        return super()._format_args(action, default_metavar)


def add_list_option(parser: argparse.ArgumentParser, name: str, item: Callable[[str], object], *,
                    old_names: Sequence[str] = (), most: int | None = None,
                    renames: Mapping[str, str] | None = None, metavar: str = "LIST",
                    help: str = "") -> None:
    """Add an option of :class:`ListAction` to ``parser``.

    Parameters
    ----------
    parser : argparse.ArgumentParser
        The command's parser.
    name : str
        The option's name (plural when it takes a list).
    item : callable
        Parses one item.
    old_names : sequence of str
        Names of the version before, still accepted with a deprecation line;
        they are not shown in ``--help``.
    most : int, optional
        Most values accepted.
    renames : mapping of str to str, optional
        Old words among the items and their new spelling.
    metavar, help : str
        As for :meth:`argparse.ArgumentParser.add_argument`.
    """
    dest = name.lstrip("-").replace("-", "_")
    parser.add_argument(*old_names, name, dest=dest, action=ListAction, item=item,
                        old_names=old_names, most=most, renames=renames, metavar=metavar,
                        help=help)
    if old_names:
        _hide_old_names(parser, name, old_names)


def _hide_old_names(parser: argparse.ArgumentParser, name: str, old: Sequence[str]) -> None:
    """Show only the new name in ``--help`` and in messages. The parser finds
    an option by its string in a map that keeps the old strings, so they
    still parse."""
    action = parser._option_string_actions[name]
    action.option_strings = [s for s in action.option_strings if s not in old]


_NUMBER_LIST = re.compile(r"^-(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?(,.*)?$")
"""A comma-separated list whose first value is negative (``-0.2,0.2``)."""


def allow_negative_lists(parser: argparse.ArgumentParser) -> None:
    """Let a list that starts with a negative number be an option's value.

    argparse reads an argument that starts with ``-`` as an option unless it
    looks like a negative number, and its test knows plain numbers only; the
    test is widened to comma lists of them (``--heights -0.2,0.2``). The
    parser must have no option that looks like a number.

    Parameters
    ----------
    parser : argparse.ArgumentParser
        The command's parser, changed in place.
    """
    if hasattr(parser, "_negative_number_matcher"):
        parser._negative_number_matcher = _NUMBER_LIST
