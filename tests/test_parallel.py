"""The one parallel layer: fixed blocks, results in block order, the same
numbers whatever the number of worker processes; progress and Ctrl-C."""

from __future__ import annotations

import multiprocessing
import time
from pathlib import Path

import numpy as np
import pytest

from shotplan.parallel import default_workers, map_blocks, split

DEMO = Path(__file__).resolve().parent.parent / "assets" / "drills" / "club-night-drills.json"


def _normal_sum(seed: int, block: tuple[int, int]) -> float:
    """A block's own draws: seeded by the block, not by the worker."""
    start, stop = block
    return float(np.random.default_rng([seed, start]).standard_normal(stop - start).sum())


def _square(_shared: object, x: int) -> int:
    return x * x


def _fail_on_three(_shared: object, x: int) -> int:
    if x == 3:
        raise ValueError("block 3 is bad")
    return x


def _slow(_shared: object, x: int) -> int:
    time.sleep(0.2)
    return x


def test_split_by_hand() -> None:
    # Worked by hand: 10 items in blocks of 4 are 0-3, 4-7, 8-9.
    assert split(10, 4) == [(0, 4), (4, 8), (8, 10)]
    assert split(8, 4) == [(0, 4), (4, 8)]
    assert split(0, 4) == []
    with pytest.raises(ValueError):
        split(5, 0)


def test_same_numbers_whatever_the_workers() -> None:
    blocks = split(10_000, 1_000)
    # The reference: numpy itself, block by block, in this process.
    want = [float(np.random.default_rng([42, a]).standard_normal(b - a).sum())
            for a, b in blocks]
    for workers in (0, 1, 2):
        assert map_blocks(_normal_sum, blocks, 42, workers=workers) == want, workers


def test_results_in_block_order_and_progress() -> None:
    seen: list[tuple[int, int]] = []
    out = map_blocks(_square, list(range(7)), workers=2, sizes=[10] * 7,
                     progress=lambda d, t: seen.append((d, t)))
    assert out == [0, 1, 4, 9, 16, 25, 36]  # squares, by hand
    assert seen[0] == (0, 70) and seen[-1] == (70, 70)
    done = [d for d, _ in seen]
    assert done == sorted(done) and len(seen) == 8  # 0 first, then one call per block


def test_a_failing_block_raises_and_stops_the_workers() -> None:
    with pytest.raises(ValueError, match="block 3"):
        map_blocks(_fail_on_three, list(range(8)), workers=2)
    assert multiprocessing.active_children() == []


def test_ctrl_c_stops_the_workers() -> None:
    def interrupt(done: int, _total: int) -> None:
        if done >= 1:
            raise KeyboardInterrupt

    t0 = time.perf_counter()
    with pytest.raises(KeyboardInterrupt):
        map_blocks(_slow, list(range(40)), workers=2, progress=interrupt)
    # 40 blocks of 0.2 s on 2 workers would take 4 s; stopping takes far less.
    assert time.perf_counter() - t0 < 2.0
    assert multiprocessing.active_children() == []


def test_default_workers_is_a_core_count() -> None:
    # The cores this process may run on, as the operating system reports
    # them (Linux's affinity mask; os.cpu_count where there is none).
    import os

    cores = len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count()
    assert default_workers() == max(cores or 1, 1)


def test_drill_station_same_with_one_and_two_workers() -> None:
    from shotplan.drills import BLOCK_TRIALS, LEVELS, load_drill, plan_station, simulate_station

    drill = load_drill(DEMO)
    plan = plan_station(drill.stations[0])
    trials = 2 * BLOCK_TRIALS + 137  # three blocks, the last one short
    results = [simulate_station(plan, LEVELS["club"], trials=trials, seed=5, workers=w)
               for w in (0, 1, 2)]
    first = results[0]
    for r in results[1:]:
        assert (r.pocket, r.position, r.both, r.miscues, r.scratches) == \
            (first.pocket, first.position, first.both, first.miscues, first.scratches)
        np.testing.assert_array_equal(r.finishes, first.finishes)


def test_on_a_dask_cluster_the_same_numbers_and_each_result_as_it_arrives() -> None:
    distributed = pytest.importorskip("distributed")
    blocks = split(5_000, 1_000)
    want = map_blocks(_normal_sum, blocks, 42, workers=0)
    seen: dict[int, float] = {}
    with distributed.Client(processes=False, n_workers=1, threads_per_worker=2,
                            dashboard_address=None) as client:
        got = map_blocks(_normal_sum, blocks, 42, client=client,
                         on_result=lambda k, r: seen.__setitem__(k, r))
    assert got == want
    assert seen == dict(enumerate(want))


def test_sizes_must_match_the_blocks() -> None:
    with pytest.raises(ValueError, match="2 sizes for 3 blocks"):
        map_blocks(_square, [1, 2, 3], sizes=[1, 1], workers=0)


def _ended(pid: int) -> bool:
    """No such process, or one that has ended and waits to be reaped."""
    try:
        state = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0]
    except (FileNotFoundError, ProcessLookupError, IndexError):
        return True
    return state in ("Z", "X")


@pytest.mark.skipif(not Path("/proc/self/stat").exists(), reason="needs /proc (Linux)")
def test_workers_end_when_their_parent_is_killed_outright(tmp_path: Path) -> None:
    # A parent killed with SIGKILL cannot stop its pool; its workers must not
    # wait for work for ever (found: drill processes left behind by the test
    # that kills a sheet write). Each worker writes its pid, then blocks sleep.
    import os
    import signal
    import subprocess
    import sys

    script = tmp_path / "parent.py"
    script.write_text(
        "import os, sys, time\n"
        "from pathlib import Path\n"
        "from shotplan.parallel import map_blocks\n"
        "def block(folder, k):\n"
        "    Path(folder, f'{os.getpid()}.pid').write_text('')\n"
        "    time.sleep(60)\n"
        "    return k\n"
        "if __name__ == '__main__':\n"
        "    map_blocks(block, list(range(4)), sys.argv[1], workers=2)\n", encoding="utf-8")
    parent = subprocess.Popen([sys.executable, str(script), str(tmp_path)])
    deadline = time.monotonic() + 60.0
    pids: list[int] = []
    while len(pids) < 2 and time.monotonic() < deadline:
        time.sleep(0.1)
        pids = [int(p.stem) for p in tmp_path.glob("*.pid")]
    assert len(pids) == 2, "the workers did not start"
    os.kill(parent.pid, signal.SIGKILL)
    parent.wait()
    deadline = time.monotonic() + 10.0
    while not all(_ended(p) for p in pids) and time.monotonic() < deadline:
        time.sleep(0.1)
    left = [p for p in pids if not _ended(p)]
    for p in left:  # do not leave them behind even when the check fails
        os.kill(p, signal.SIGKILL)
    assert left == []
