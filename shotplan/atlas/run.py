"""Running an atlas: blocks on a Dask cluster (or in this process), a resume
folder that keeps finished blocks, progress and a clean interruption.

Where the blocks run:

* ``workers=None`` (the default): a ``distributed.LocalCluster`` with one
  worker process per core (one thread each: the searches hold the GIL),
  started and closed here;
* ``scheduler="tcp://host:8786"``: an existing cluster (``dask scheduler``
  and ``dask worker`` on any machines with shotplan installed); nothing is
  started or closed but the client;
* ``workers=0``: in this process, no Dask at all (for small atlases, tests
  and debugging).

The job is sent to the workers once (``Client.scatter``); each task is one
block (:data:`~shotplan.atlas.grid.BLOCK_CELLS` cells) and builds its
simulator once (the search's simulators are cached per process). Results do
not depend on where or in what order blocks ran: each cell is computed from
the same inputs alone.

The resume folder holds ``atlas.json`` (the job's fingerprint) and one
``block-NNNNN.json`` per finished block, each written atomically as it
arrives, so a run stopped by Ctrl-C, a lost worker or a closed laptop
continues where it stopped; a folder made for another job is refused.
"""

from __future__ import annotations

import json
import os
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

from ..errors import InputError
from ..files.write import atomic_write_text
from .cells import AtlasJob, BlockResult, compute_block
from .result import Atlas, assemble

__all__ = ["run_atlas", "AtlasInterrupted", "ResumeFolder"]

Progress = Callable[[int, int], None]


class AtlasInterrupted(Exception):
    """The run was interrupted (Ctrl-C); finished blocks are in the resume
    folder if there is one."""

    def __init__(self, done: int, total: int, folder: Path | None):
        self.done = done
        self.total = total
        self.folder = folder
        kept = (f"kept in {folder} (run again with --resume {folder} to continue)"
                if folder is not None else "not kept (use --resume DIR to keep them)")
        super().__init__(f"atlas interrupted: {done} of {total} blocks finished, {kept}")


class ResumeFolder:
    """Finished blocks of one job, on disk."""

    def __init__(self, folder: str | os.PathLike[str], job: AtlasJob):
        """Open (or start) the folder for ``job``.

        Parameters
        ----------
        folder : str or os.PathLike
            The folder; made if missing.
        job : AtlasJob
            The atlas it keeps.

        Raises
        ------
        InputError
            If the folder cannot be made, is a file, or holds another atlas.
        """
        self.path = Path(folder)
        self.fingerprint = job.fingerprint()
        head = self.path / "atlas.json"
        try:
            self.path.mkdir(parents=True, exist_ok=True)
        except OSError as exc:
            raise InputError(f"--resume {folder}: cannot make the folder: "
                             f"{exc.strerror or exc}") from None
        if head.exists():
            try:
                kept = json.loads(head.read_text(encoding="utf-8")).get("fingerprint")
            except (OSError, ValueError, AttributeError):
                kept = None
            if kept != self.fingerprint:
                raise InputError(f"--resume {folder}: the folder holds another atlas (other "
                                 "layout or settings), must be a new folder or this atlas's")
        else:
            atomic_write_text(head, json.dumps({"fingerprint": self.fingerprint,
                                                "ball": job.ball, "grid_m": job.cell_m}) + "\n")

    def _file(self, block: int) -> Path:
        return self.path / f"block-{block:05d}.json"

    def load(self, n_blocks: int) -> dict[int, BlockResult]:
        """Blocks already finished (unreadable files are ignored and redone).

        Parameters
        ----------
        n_blocks : int
            Blocks of the grid.

        Returns
        -------
        dict
            Block number -> its result.
        """
        out: dict[int, BlockResult] = {}
        for b in range(n_blocks):
            f = self._file(b)
            if not f.exists():
                continue
            try:
                data = json.loads(f.read_text(encoding="utf-8"))
                if data.get("fingerprint") != self.fingerprint:
                    continue
                out[b] = BlockResult.from_dict(data)
            except (OSError, ValueError, KeyError, TypeError):
                continue
        return out

    def save(self, result: BlockResult) -> None:
        """Keep one finished block.

        Parameters
        ----------
        result : BlockResult
            The block.
        """
        data = {"fingerprint": self.fingerprint, **result.to_dict()}
        atomic_write_text(self._file(result.block), json.dumps(data, allow_nan=False) + "\n")


def _local_cluster(workers: int | None) -> Any:
    from distributed import LocalCluster  # a heavy import: only when used

    n = workers if workers else (os.cpu_count() or 1)
    return LocalCluster(n_workers=n, threads_per_worker=1, processes=True,
                        dashboard_address=None, silence_logs=50)


def run_atlas(job: AtlasJob, *, workers: int | None = None, scheduler: str | None = None,
              resume: str | os.PathLike[str] | None = None,
              progress: Progress | None = None) -> Atlas:
    """Compute an atlas.

    Parameters
    ----------
    job : AtlasJob
        What to compute.
    workers : int, optional
        Worker processes of the local cluster (default one per core); 0
        computes in this process without Dask.
    scheduler : str, optional
        Address of an existing Dask scheduler; then ``workers`` is not used.
    resume : str or os.PathLike, optional
        A folder that keeps finished blocks (see the module docstring).
    progress : callable, optional
        ``progress(done, total)`` in blocks, called as blocks finish.

    Returns
    -------
    Atlas
        The maps.

    Raises
    ------
    AtlasInterrupted
        On Ctrl-C (finished blocks are kept in ``resume``).
    InputError
        For a bad resume folder or a scheduler that cannot be reached.
    """
    t0 = time.perf_counter()
    grid = job.grid
    total = grid.n_blocks
    store = ResumeFolder(resume, job) if resume is not None else None
    done = store.load(total) if store is not None else {}
    reused = len(done)
    todo = [b for b in range(total) if b not in done]
    if progress is not None:
        progress(len(done), total)

    def finish(result: BlockResult) -> None:
        done[result.block] = result
        if store is not None:
            store.save(result)
        if progress is not None:
            progress(len(done), total)

    used = 0
    try:
        if todo and scheduler is None and workers == 0:
            for b in todo:
                finish(compute_block(job, b))
        elif todo:
            used = _run_on_dask(job, todo, workers, scheduler, finish)
    except KeyboardInterrupt:
        raise AtlasInterrupted(len(done), total, store.path if store else None) from None
    return assemble(job, grid, list(done.values()), time.perf_counter() - t0, used, reused)


def _run_on_dask(job: AtlasJob, todo: list[int], workers: int | None, scheduler: str | None,
                 finish: Callable[[BlockResult], None]) -> int:
    from distributed import Client, as_completed

    cluster = None
    try:
        if scheduler is not None:
            try:
                client = Client(scheduler, timeout="10s")
            except OSError as exc:
                raise InputError(f"--scheduler {scheduler}: cannot reach the scheduler: "
                                 f"{exc}, must be the address a running 'dask scheduler' "
                                 "prints (tcp://HOST:8786)") from None
        else:
            cluster = _local_cluster(workers)
            client = Client(cluster)
        try:
            n_workers = len(client.scheduler_info().get("workers", {}))
            shared = client.scatter(job, broadcast=True)
            futures = [client.submit(compute_block, shared, b, key=f"atlas-{b}-{job.fingerprint()}",
                                     retries=2) for b in todo]
            try:
                for fut in as_completed(futures):
                    finish(fut.result())
            finally:
                client.cancel(futures)
        finally:
            client.close()
    finally:
        if cluster is not None:
            cluster.close()
    return n_workers
