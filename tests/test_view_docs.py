"""The view's public API is documented in numpydoc, and its words are right.

The rule is the one of tests/test_docstrings.py (our own, DEVELOPERS.md).
"""

from __future__ import annotations

import os

import pytest

os.environ.setdefault("SDL_VIDEODRIVER", "dummy")
pytest.importorskip("pygame")

from test_docstrings import _module_problems  # noqa: E402

from shotplan.equipment import TableSpec  # noqa: E402
from shotplan.table import Table  # noqa: E402

DOCUMENTED = ["app", "frame", "words", "keeping", "pointer", "layers", "draw", "predict", "transform",
              "keys", "actions", "command", "state", "panels", "controls", "playback", "recovery"]


@pytest.mark.parametrize("name", DOCUMENTED)
def test_view_api_is_documented(name):
    problems = _module_problems(f"shotplan.view.{name}")
    assert not problems, "\n".join(problems)


def test_pointer_words_in_diamonds_hand_worked():
    # A pool table has 8 diamond spacings along a long rail and 4 across a
    # short one (common practice, no source): the middle of the cloth is 4
    # along and 2 across; the head-right corner of the noses is 0, 0.
    from shotplan.view.words import pointer_words

    table = Table(TableSpec.preset("pool-9ft"))
    mid = pointer_words(table.length / 2, table.width / 2, table)
    assert "4.00 diamonds along, 2.00 across" in mid
    assert f"x {table.length / 2 * 1000:6.0f} mm" in mid
    assert "0.00 diamonds along, 0.00 across" in pointer_words(0.0, 0.0, table)


def test_escape_markup_hand_worked():
    from shotplan.view.words import escape_markup

    assert escape_markup("a < b & c > d") == "a &lt; b &amp; c &gt; d"
    assert escape_markup("&lt;") == "&amp;lt;"  # escaped once, not taken as markup
