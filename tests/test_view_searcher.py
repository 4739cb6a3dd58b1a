"""The view's proposals searched in a worker process.

Reference: the same search run in this process, a slice a frame, as the
view did before (and still does when the worker is gone): the worker must
propose exactly the same shots, in the same order, for pool and carom
layouts; a newer job replaces an older one; a dead worker costs nothing but
the speed.
"""

from __future__ import annotations

import time
from pathlib import Path

import pytest

from shotplan.layout import Layout, load_layout
from shotplan.view.predict import Predictor
from shotplan.view.searcher import SearchWorker
from shotplan.view.state import ViewState

CUT = Path(__file__).resolve().parents[1] / "assets" / "layouts" / "club-night-2-cut-to-corner.json"
CAROM = {"format": "shotplan-layout", "version": 1, "game": "three-cushion", "table": "carom",
         "balls": {"cue": [0.7, 0.45], "yellow": [1.0, 0.9], "red": [2.2, 1.0]}}


@pytest.fixture(scope="module")
def worker():
    with SearchWorker() as w:
        yield w


def _key(shots):
    return [s.to_dict() for s in shots]


def _proposals(layout: Layout, worker: SearchWorker | None) -> ViewState:
    st = ViewState(layout, None, "")
    pred = Predictor()
    pred.worker = worker
    pred.update(st, 0.0)  # the layout is new at time 0, settled by the time settle looks
    pred.settle(st, 0.0, max_seconds=180.0)
    assert st.proposals_done
    return st


@pytest.mark.parametrize("layout", [load_layout(CUT), Layout.from_dict(CAROM)],
                         ids=["cut", "carom"])
def test_the_worker_proposes_what_the_view_finds_itself(worker, layout):
    here = _proposals(layout, None)
    there = _proposals(layout, worker)
    assert there.proposals and _key(there.proposals) == _key(here.proposals)
    assert [r.to_dict() for r in there.rejections] == [r.to_dict() for r in here.rejections]


def test_a_newer_job_replaces_the_one_in_hand(worker):
    lay = load_layout(CUT)
    moved = lay.with_ball("2", (1.9, 0.7))
    old = worker.submit(lay, lay.physics(), 20)
    new = worker.submit(moved, moved.physics(), 20)
    assert new == old + 1
    t0 = time.perf_counter()
    parts = []
    while not (parts and parts[-1].done) and time.perf_counter() - t0 < 120.0:
        parts += worker.parts(new)
        time.sleep(0.01)
    assert parts and parts[-1].done
    assert all(p.number == new for p in parts)
    assert _key(parts[-1].shots) == _key(_proposals(moved, None).proposals[:20])


def test_a_dead_worker_leaves_the_search_to_the_view():
    w = SearchWorker()
    w.close()
    assert not w.alive
    st = _proposals(load_layout(CUT), w)
    assert st.proposals == _proposals(load_layout(CUT), None).proposals


def test_the_last_part_of_the_list_is_drawn(tmp_path, display):
    # The view draws a frame only when what it shows changes once it is idle
    # (mainloop): the list arriving whole ends the search, so it must count
    # as a change, or the last part sent stays on the screen (seen: the
    # worker's final list never drawn until the next key or click).
    from shotplan.view.app import App

    app = App(load_layout(CUT), None, recovery_dir=tmp_path / "rec", offer_recovery=False)
    app.start((1280, 800))
    app.update(0.0)
    before = app.look()
    app.state.set_proposals(app.state.proposals, True)
    assert app.look() != before


def test_a_layout_the_carom_search_refuses_says_why_either_way(worker):
    # One object ball on a three-cushion table: no proposals, and the same
    # one reason from the worker as from the view's own frames (the carom
    # search's line, UMB: a carom needs both other balls).
    doc = dict(CAROM, balls={"cue": [0.7, 0.45], "red": [2.2, 1.0]})
    here = _proposals(Layout.from_dict(doc), None)
    there = _proposals(Layout.from_dict(doc), worker)
    assert not here.proposals and not there.proposals
    reasons = [r.reason for r in there.rejections]
    assert reasons == [r.reason for r in here.rejections]
    assert len(reasons) == 1 and "exactly two other balls" in reasons[0]
