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


def _parts_until_done(worker, job):
    t0 = time.perf_counter()
    parts = []
    while not (parts and parts[-1].done) and time.perf_counter() - t0 < 120.0:
        parts += worker.parts(job)
        time.sleep(0.01)
    assert parts and parts[-1].done
    return parts


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
    parts = _parts_until_done(worker, new)
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


def _wait_window(worker, number, seconds=60.0):
    t0 = time.perf_counter()
    while time.perf_counter() - t0 < seconds:
        got = worker.window(number)
        if got is not None:
            return got
        time.sleep(0.005)
    raise AssertionError("no window result")


def test_a_window_job_answers_what_find_shots_finds_and_leaves_the_proposals_job_going(worker):
    from shotplan.search import find_shots

    lay = load_layout(CUT)
    search = {"balls": ["2"], "pockets": ["foot-left"], "kinds": ("direct",)}
    job = worker.submit(lay, lay.physics(), 20)
    win = worker.submit_window(lay, lay.physics(), search)
    got = _wait_window(worker, win)
    here = find_shots(lay, physics=lay.physics(), **search)
    assert got.error == "" and _key(got.shots) == _key(here.shots)
    assert [r.to_dict() for r in got.rejected] == [r.to_dict() for r in here.rejected]
    # The proposals job was not dropped for the window: it ends, whole.
    parts = _parts_until_done(worker, job)
    assert _key(parts[-1].shots) == _key(_proposals(lay, None).proposals[:20])
    bad = worker.submit_window(lay, lay.physics(), {"balls": ["7"]})
    assert "7" in _wait_window(worker, bad).error  # no ball 7 here: said, not raised
    # A burst (a slider moved): the newest is answered, as find_shots answers it.
    for speed in (1.0, 1.5, 2.0, 2.5):
        last = worker.submit_window(lay, lay.physics(), dict(search, speed=speed))
    got = _wait_window(worker, last)
    assert _key(got.shots) == _key(find_shots(lay, physics=lay.physics(), speed=2.5,
                                              **search).shots)


def test_a_dragged_ball_gets_the_window_from_the_worker_and_keeps_the_last_meanwhile(worker):
    # The same aim searched again (the object ball moved) goes to the worker:
    # no window search runs in the frame; the last window stays shown until
    # the answer, which is the one the view's own search finds.
    from shotplan.view.state import PocketAim

    lay = load_layout(CUT)
    st = ViewState(lay, None, "")
    pred = Predictor()
    pred.worker = worker
    st.aim_at_pocket("2", "foot-left")
    pred.update(st, 0.0)
    first = pred.window
    assert first is not None  # a new aim is searched at once, here
    x, y = st.layout.position("2")
    st.move_ball("2", (x + 0.01, y))
    pred.update(st, 1.0, dragging=True)
    assert pred.window is first and pred.busy(st)
    pred.settle(st, 1.0)
    assert pred.window is not first and pred.window is not None
    here = Predictor()
    st2 = ViewState(st.layout, None, "")
    st2.aim_at_pocket("2", "foot-left")
    here.update(st2, 0.0)
    assert pred.window.to_dict() == here.window.to_dict()
    assert isinstance(st.aim, PocketAim)
