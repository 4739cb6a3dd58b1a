"""The one text-table formatter of the command line.

Every table a command prints (``plan``'s shots, ``tables``, the studies,
the drill's rates, the settings for a zone) is a list of :class:`Column`
and rows of already formatted cells, laid out by :func:`format_table`: each
column as wide as its widest cell (or its least width), aligned left or
right, with the given gap before it, and no blanks at the end of a line.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

__all__ = ["Column", "format_table", "left", "right"]


@dataclass(frozen=True, slots=True)
class Column:
    """One column of a text table."""

    title: str
    """Its heading."""
    align: str = "<"
    """``"<"`` left or ``">"`` right."""
    width: int = 0
    """Least width in characters (a wider cell widens the column)."""
    gap: str = "  "
    """Text before the column (not before the first one)."""

    def __post_init__(self) -> None:
        if self.align not in ("<", ">"):
            raise ValueError(f"Column.align: {self.align!r} must be '<' or '>'")


def left(*titles: str, gap: str = "  ") -> list[Column]:
    """Left-aligned columns with these headings.

    Parameters
    ----------
    *titles : str
        The headings.
    gap : str
        Text between columns.

    Returns
    -------
    list of Column
    """
    return [Column(t, "<", gap=gap) for t in titles]


def right(*titles: str, gap: str = "  ") -> list[Column]:
    """Right-aligned columns with these headings.

    Parameters
    ----------
    *titles : str
        The headings.
    gap : str
        Text between columns.

    Returns
    -------
    list of Column
    """
    return [Column(t, ">", gap=gap) for t in titles]


def format_table(columns: Sequence[Column], rows: Sequence[Sequence[str]],
                 header: bool = True) -> list[str]:
    """The lines of a text table.

    Parameters
    ----------
    columns : sequence of Column
        The columns, in order.
    rows : sequence of sequences of str
        The cells, one row per line, as many as there are columns.
    header : bool
        Print the headings as the first line (default True).

    Returns
    -------
    list of str
        One line per row (after the headings), without blanks at the end.

    Raises
    ------
    ValueError
        A row with another number of cells than there are columns.
    """
    lines = [[c.title for c in columns]] if header else []
    for row in rows:
        if len(row) != len(columns):
            raise ValueError(f"a row of {len(row)} cells in a table of {len(columns)} columns")
        lines.append(list(row))
    widths = [max([c.width, *(len(line[k]) for line in lines)]) for k, c in enumerate(columns)]
    out = []
    for line in lines:
        parts = []
        for k, (cell, col, w) in enumerate(zip(line, columns, widths, strict=True)):
            if k:
                parts.append(col.gap)
            parts.append(cell.ljust(w) if col.align == "<" else cell.rjust(w))
        out.append("".join(parts).rstrip())
    return out
