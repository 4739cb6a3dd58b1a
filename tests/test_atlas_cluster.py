"""The atlas on a real Dask cluster: a scheduler and two workers started as
separate processes with dask's own commands, on this machine's loopback.

The atlas they return equals the one computed in this process, cell for
cell, even when one worker is killed in the middle of the run (Dask runs its
lost block again on the other).
"""

from __future__ import annotations

import socket
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pytest

from shotplan.atlas import BLOCK_CELLS, AtlasJob, run_atlas
from shotplan.layout import load_layout

ROOT = Path(__file__).resolve().parents[1]
CUT = ROOT / "assets" / "layouts" / "club-night-2-cut-to-corner.json"
DASK = Path(sys.executable).parent / "dask"


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return int(s.getsockname()[1])


@pytest.fixture
def cluster():
    if not DASK.exists():
        pytest.fail(f"dask's command is missing beside {sys.executable} (dask[distributed])")
    port = _free_port()
    address = f"tcp://127.0.0.1:{port}"
    procs = [subprocess.Popen([str(DASK), "scheduler", "--host", "127.0.0.1", "--port",
                               str(port), "--no-dashboard"],
                              stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)]
    time.sleep(1.0)
    for _ in range(2):
        procs.append(subprocess.Popen([str(DASK), "worker", address, "--nthreads", "1",
                                       "--no-nanny", "--no-dashboard"],
                                      stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL))
    from distributed import Client

    deadline = time.monotonic() + 60
    with Client(address, timeout="20s") as client:
        while len(client.scheduler_info()["workers"]) < 2:
            assert time.monotonic() < deadline, "the workers did not join"
            time.sleep(0.2)
    try:
        yield address, procs[1:]
    finally:
        for p in procs:
            p.kill()
        for p in procs:
            p.wait(timeout=10)


def test_a_real_cluster_gives_the_local_atlas_even_when_a_worker_dies(cluster):
    address, workers = cluster
    job = AtlasJob(load_layout(CUT), "2", cell_m=0.09, kinds=("direct",), adaptive=False)
    assert int(job.grid.open.sum()) >= 4 * BLOCK_CELLS
    here = run_atlas(job, workers=0)
    killed: list[int] = []

    def kill_one(done: int, total: int) -> None:
        if done >= BLOCK_CELLS and not killed:
            workers[0].kill()
            killed.append(done)

    there = run_atlas(job, scheduler=address, progress=kill_one)
    assert killed and killed[0] < int(job.grid.open.sum())  # killed mid-run
    for name, values in here.maps.items():
        assert np.array_equal(values, there.maps[name], equal_nan=True), name
    assert (here.pocket == there.pocket).all()
