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

The blocks run through the one parallel layer, :func:`shotplan.parallel.map_blocks`
(in this process, or a task per block on the Dask cluster, the job sent to
every worker once per phase); each task is one block
(:data:`~shotplan.atlas.grid.BLOCK_CELLS` cells) and builds its simulator
once (the search's simulators are cached per process). Results do not
depend on where or in what order blocks ran: each cell is computed from the
same inputs alone.

The resume folder holds ``atlas.json`` (the job's fingerprint) and one
``block-PHASE-NNNNN.json`` per finished block, each written atomically as it
arrives, so a run stopped by Ctrl-C, a lost worker or a closed laptop
continues where it stopped; a folder made for another job is refused.
"""

from __future__ import annotations

import json
import os
import time
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

import numpy as np

from ..errors import InputError
from ..files.write import atomic_write_text
from ..parallel import map_blocks
from .adaptive import Squares, coarse_cells, lattice_step
from .cells import AtlasJob, BlockResult, compute_block
from .grid import chunks
from .result import Atlas, assemble

__all__ = ["run_atlas", "AtlasCluster", "AtlasInterrupted", "ResumeFolder"]

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
        super().__init__(f"atlas interrupted: {done} of {total} cells finished, {kept}")


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

    def _file(self, phase: str, block: int) -> Path:
        return self.path / f"block-{phase}-{block:05d}.json"

    def load(self, phase: str, blocks: Sequence[np.ndarray]) -> dict[int, BlockResult]:
        """Blocks of a phase already finished (unreadable files, and files
        whose cells are not the block's, are ignored and redone).

        Parameters
        ----------
        phase : str
            The phase.
        blocks : sequence of ndarray
            Each block's cells.

        Returns
        -------
        dict
            Block number -> its result.
        """
        out: dict[int, BlockResult] = {}
        for i, cells in enumerate(blocks):
            f = self._file(phase, i)
            if not f.exists():
                continue
            try:
                data = json.loads(f.read_text(encoding="utf-8"))
                if data.get("fingerprint") != self.fingerprint:
                    continue
                result = BlockResult.from_dict(data)
            except (OSError, ValueError, KeyError, TypeError):
                continue
            if np.array_equal(result.cells, cells):
                out[i] = result
        return out

    def save(self, result: BlockResult) -> None:
        """Keep one finished block.

        Parameters
        ----------
        result : BlockResult
            The block.
        """
        data = {"fingerprint": self.fingerprint, **result.to_dict()}
        atomic_write_text(self._file(result.phase, result.block),
                          json.dumps(data, allow_nan=False) + "\n")


class AtlasCluster:
    """Where blocks run: this process, a local Dask cluster or a running one.

    Started on first use and kept until :meth:`close` (or the end of a
    ``with`` block), so several atlases (a batch) share one cluster.

    Parameters
    ----------
    workers : int, optional
        Worker processes of a local cluster (default one per core); 0 runs
        every block in this process, without Dask.
    scheduler : str, optional
        Address of a running Dask scheduler (``tcp://HOST:8786``); then
        ``workers`` is not used and nothing is started but the client.
    """

    def __init__(self, workers: int | None = None, scheduler: str | None = None):
        self.wanted = workers
        self.scheduler = scheduler
        self._client: Any = None
        self._local: Any = None
        self.workers = 0
        """Workers of the cluster once started (0 in this process)."""

    @property
    def in_process(self) -> bool:
        """Blocks run here, without Dask."""
        return self.scheduler is None and self.wanted == 0

    @property
    def client(self) -> Any:
        """The Dask client (the cluster is started on first use).

        Raises
        ------
        InputError
            If the scheduler cannot be reached.
        """
        if self._client is None:
            from distributed import Client, LocalCluster  # heavy: only when used

            if self.scheduler is not None:
                try:
                    self._client = Client(self.scheduler, timeout="4s")
                except OSError as exc:
                    raise InputError(f"--scheduler {self.scheduler}: cannot reach the "
                                     f"scheduler: {exc}, must be the address a running "
                                     "'dask scheduler' prints (tcp://HOST:8786)") from None
            else:
                n = self.wanted if self.wanted else (os.cpu_count() or 1)
                # The cluster's small web servers on free ports of this machine
                # (":0"), so two atlases at once never fight over Dask's fixed
                # default port; logs only for critical failures (a worker's
                # heartbeat that meets the scheduler closing at the end of a
                # busy run logs a whole traceback at the error level, and task
                # errors reach this process as exceptions anyway). Dask's nanny gives its
                # workers MALLOC_TRIM_THRESHOLD_=65536, which returns every
                # freed block above 64 KiB to the system: the engine's event
                # arrays are then fresh pages at every run, and a worker ran
                # the atlas's searches 2.1x slower than this process (numpy's
                # zeros 8x). The workers started here keep the C library's
                # default instead.
                import dask

                environ = dict(dask.config.get("distributed.nanny.pre-spawn-environ", {}))
                environ.pop("MALLOC_TRIM_THRESHOLD_", None)
                with dask.config.set({"distributed.nanny.pre-spawn-environ": environ}):
                    self._local = LocalCluster(n_workers=n, threads_per_worker=1,
                                               processes=True, host="127.0.0.1",
                                               dashboard_address=":0",
                                               worker_dashboard_address=":0", silence_logs=50)
                self._client = Client(self._local)
            self.workers = len(self._client.scheduler_info().get("workers", {}))
        return self._client

    def close(self) -> None:
        """Close the client, and the local cluster if this started one."""
        if self._client is not None:
            self._client.close()
        if self._local is not None:
            self._local.close()
        self._client = self._local = None

    def __enter__(self) -> AtlasCluster:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()


def run_atlas(job: AtlasJob, *, workers: int | None = None, scheduler: str | None = None,
              resume: str | os.PathLike[str] | None = None,
              progress: Progress | None = None,
              cluster: AtlasCluster | None = None) -> Atlas:
    """Compute an atlas.

    With ``job.adaptive`` (and a grid fine enough for a lattice), the lattice
    is searched first and then the cells it cannot vouch for
    (:mod:`shotplan.atlas.adaptive`); otherwise every open cell is searched.

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
        ``progress(done, total)`` in cells, called as blocks finish (the
        total grows when the lattice tells how many cells are left).
    cluster : AtlasCluster, optional
        A cluster to run on and leave open (instead of ``workers`` and
        ``scheduler``): several atlases share it.

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
    store = ResumeFolder(resume, job) if resume is not None else None
    R = job.layout.geometry.ball_radius
    k = 1
    if job.adaptive:
        k = job.lattice if job.lattice is not None else lattice_step(grid.cell_m, R)
    own = cluster is None
    where = AtlasCluster(workers, scheduler) if cluster is None else cluster
    runner = _Runner(job, where, store, progress)
    try:
        if k > 1:
            balls = np.array([job.layout.position(b) for b in job.layout.ball_ids
                              if b != "cue"], dtype=float).reshape(-1, 2)
            squares = Squares(grid, k, balls, R)
            first = runner.phase("coarse", coarse_cells(grid, k))
            squares.add(first)
            centres = squares.centres()
            runner.expected += len(centres)
            second = runner.phase("centre", centres)
            squares.add(second)
            rest, filled = squares.fine_plan()
            runner.expected += len(rest)
            blocks = first + second + runner.phase("fine", rest) + [filled]
        else:
            blocks = runner.phase("all", np.flatnonzero(grid.open.ravel()))
    except KeyboardInterrupt:
        raise AtlasInterrupted(runner.cells_done, runner.expected,
                               store.path if store else None) from None
    finally:
        if own:
            where.close()
    return assemble(job, grid, blocks, time.perf_counter() - t0, where.workers,
                    runner.reused)


def _block(job: AtlasJob, item: tuple[str, int, np.ndarray]) -> BlockResult:
    """One block of a phase, as :func:`shotplan.parallel.map_blocks` calls it."""
    phase, number, cells = item
    return compute_block(job, phase, number, cells)


class _Runner:
    """Runs a job's phases on a cluster, keeping and reporting the blocks."""

    def __init__(self, job: AtlasJob, cluster: AtlasCluster, store: ResumeFolder | None,
                 progress: Progress | None):
        self.job = job
        self.cluster = cluster
        self.store = store
        self.progress = progress
        self.reused = 0
        self.cells_done = 0
        self.expected = 0

    def _report(self) -> None:
        if self.progress is not None:
            self.progress(self.cells_done, max(self.expected, self.cells_done))

    def phase(self, name: str, cells: np.ndarray) -> list[BlockResult]:
        blocks = chunks(np.asarray(cells, dtype=np.int64))
        if name in ("all", "coarse"):
            self.expected += len(cells)
        done: dict[int, BlockResult] = {}
        if self.store is not None:
            done = self.store.load(name, blocks)
            self.reused += len(done)
        self.cells_done += sum(len(b.cells) for b in done.values())
        self._report()
        todo = [(i, b) for i, b in enumerate(blocks) if i not in done]

        def finish(result: BlockResult) -> None:
            done[result.block] = result
            if self.store is not None:
                self.store.save(result)
            self.cells_done += len(result.cells)
            self._report()

        if todo:
            # The one parallel layer (shotplan.parallel): in this process, or
            # a task per block on the Dask cluster, each result kept as it
            # arrives.
            map_blocks(_block, [(name, i, b) for i, b in todo], self.job, workers=0,
                       client=None if self.cluster.in_process else self.cluster.client,
                       on_result=lambda _k, result: finish(result))
        return [done[i] for i in range(len(blocks))]
