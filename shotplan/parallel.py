"""Work spread over local processes, the same answer whatever their number.

The caller cuts its work into fixed blocks (their number and contents never
depend on how many workers run them) and :func:`map_blocks` calls one
function on every block, in worker processes, returning the results in block
order. Whatever carries chance (seeds, random draws) belongs to the blocks,
so 0, 1 or 16 workers give the very same numbers.

* ``workers=0``: in this process, one block after the other (tests, small
  jobs, debugging).
* ``workers=N``: ``N`` local processes (:class:`concurrent.futures.ProcessPoolExecutor`).
  They are forked where the system can (Linux): a fork inherits the engine's
  machine code already loaded, so a worker starts in milliseconds; elsewhere
  they are spawned, and each loads what it needs.
* ``client=``: a Dask ``distributed.Client`` (a cluster of machines, or a
  ``LocalCluster``): ``shared`` is scattered to every worker once and each
  block is one task; the caller starts and closes the cluster.

What every block needs (a station, a layout) goes to each worker once, as
``shared``; the function receives it beside the block. Progress comes back
in the one shape shotplan uses, ``progress(done, total)``, as blocks finish,
counted in the blocks' ``sizes``; ``on_result(k, result)`` sees each block's
result as it arrives (to keep it on disk, say). Ctrl-C in the parent stops the workers at
once (they ignore SIGINT themselves, so they print nothing) and raises
:class:`KeyboardInterrupt` in the caller, with nothing half-returned. A
parent killed outright (``kill -9``) cannot stop them: each worker then
notices, within :data:`PARENT_CHECK_S`, that its parent is gone and ends.
"""

from __future__ import annotations

import multiprocessing
import os
import signal
from collections.abc import Callable, Sequence
from concurrent.futures import FIRST_COMPLETED, Future, ProcessPoolExecutor, wait
from typing import Any, TypeVar

__all__ = ["Progress", "PARENT_CHECK_S", "default_workers", "split", "map_blocks"]

Progress = Callable[[int, int], None]
"""``progress(done, total)``: the work done so far and the whole."""

B = TypeVar("B")
R = TypeVar("R")


def default_workers() -> int:
    """The cores this process may run on (at least 1).

    Returns
    -------
    int
        ``len(os.sched_getaffinity(0))`` where the system has it, else
        ``os.cpu_count()``.
    """
    try:
        return max(len(os.sched_getaffinity(0)), 1)
    except AttributeError:  # pragma: no cover - not on Linux
        return max(os.cpu_count() or 1, 1)


def split(total: int, size: int) -> list[tuple[int, int]]:
    """Cut ``range(total)`` into blocks of ``size`` (the last may be shorter).

    Parameters
    ----------
    total : int
        Items, 0 or more.
    size : int
        Items per block, at least 1.

    Returns
    -------
    list of (int, int)
        ``(start, stop)`` of every block, in order.

    Examples
    --------
    >>> split(5, 2)
    [(0, 2), (2, 4), (4, 5)]
    """
    if size < 1:
        raise ValueError(f"block size {size} must be at least 1")
    return [(a, min(a + size, total)) for a in range(0, total, size)]


_SHARED: list[Any] = []
"""What the caller shares with every block, in a worker process."""


PARENT_CHECK_S = 0.5
"""How often a worker looks whether the process that started it is still there, s."""


def _watch_parent(parent: int) -> None:
    """End this worker when its parent is gone (killed outright, so it never
    stopped its pool): a worker waiting for work would otherwise wait for
    ever, holding its memory."""
    import time

    while os.getppid() == parent:
        time.sleep(PARENT_CHECK_S)
    os._exit(1)


def _start_worker(shared: Any, parent: int) -> None:
    import threading

    signal.signal(signal.SIGINT, signal.SIG_IGN)  # the parent handles Ctrl-C
    threading.Thread(target=_watch_parent, args=(parent,), daemon=True,
                     name="shotplan-parent-watch").start()
    _SHARED[:] = [shared]


def _call(func: Callable[[Any, Any], Any], block: Any) -> Any:
    return func(_SHARED[0], block)


def _context() -> multiprocessing.context.BaseContext:
    if "fork" in multiprocessing.get_all_start_methods():
        return multiprocessing.get_context("fork")
    return multiprocessing.get_context("spawn")  # pragma: no cover - not on Linux


def map_blocks(func: Callable[[Any, B], R], blocks: Sequence[B], shared: Any = None, *,
               workers: int | None = None, sizes: Sequence[int] | None = None,
               progress: Progress | None = None,
               on_result: Callable[[int, R], None] | None = None,
               client: Any = None) -> list[R]:
    """``[func(shared, b) for b in blocks]``, on local worker processes.

    Parameters
    ----------
    func : callable
        A module-level function (workers find it by name), called as
        ``func(shared, block)``; it must not depend on the process it runs in.
    blocks : sequence
        The fixed blocks of work.
    shared : object
        Handed to every call; sent to each worker once.
    workers : int, optional
        Worker processes; ``0`` runs in this process; by default
        :func:`default_workers`. Never more than there are blocks, and a
        single block runs in this process.
    sizes : sequence of int, optional
        Each block's share of the work, for ``progress`` (default 1 each).
    progress : callable, optional
        ``progress(done, total)``: called with 0 first, then as blocks
        finish, in any order of blocks.
    on_result : callable, optional
        ``on_result(k, result)`` as block ``k``'s result arrives, before
        ``progress`` hears of it.
    client : distributed.Client, optional
        Run the blocks on this Dask cluster instead (``workers`` is not
        used).

    Returns
    -------
    list
        One result per block, in block order.

    Raises
    ------
    KeyboardInterrupt
        Ctrl-C: the workers are stopped first.
    """
    weights = list(sizes) if sizes is not None else [1] * len(blocks)
    if len(weights) != len(blocks):
        raise ValueError(f"{len(weights)} sizes for {len(blocks)} blocks")
    total = sum(weights)
    results: list[Any] = [None] * len(blocks)
    done = 0

    def arrived(k: int, result: Any) -> None:
        nonlocal done
        results[k] = result
        if on_result is not None:
            on_result(k, result)
        done += weights[k]
        if progress is not None:
            progress(done, total)

    if progress is not None:
        progress(0, total)
    if client is not None:
        _on_dask(client, func, blocks, shared, arrived)
        return results
    n = default_workers() if workers is None else workers
    n = min(n, len(blocks))
    if n <= 0 or len(blocks) == 1:
        for k, block in enumerate(blocks):
            arrived(k, func(shared, block))
        return results
    pool = ProcessPoolExecutor(max_workers=n, mp_context=_context(), initializer=_start_worker,
                               initargs=(shared, os.getpid()))
    try:
        pending: dict[Future[Any], int] = {pool.submit(_call, func, b): k
                                           for k, b in enumerate(blocks)}
        while pending:
            finished, _ = wait(pending, return_when=FIRST_COMPLETED)
            for fut in finished:
                arrived(pending.pop(fut), fut.result())
    except BaseException:
        _stop(pool)
        raise
    pool.shutdown(wait=True)
    return results


def _on_dask(client: Any, func: Callable[[Any, Any], Any], blocks: Sequence[Any], shared: Any,
             arrived: Callable[[int, Any], None]) -> None:
    """The blocks as tasks of a Dask cluster; whatever is left is cancelled
    on the way out (done, failed or Ctrl-C)."""
    from distributed import as_completed

    # hash=False: a key of its own for each call. Scattered by content, the
    # same shared data in two calls in a row (the atlas's phases) gets one key,
    # and the first call's release of it can land after the second's scatter:
    # the scheduler forgets the data and cancels the tasks ("lost
    # dependencies").
    shared_there = client.scatter(shared, broadcast=True, hash=False)
    futures = [client.submit(func, shared_there, b, pure=False) for b in blocks]
    index = {f.key: k for k, f in enumerate(futures)}
    try:
        for fut in as_completed(futures):
            arrived(index[fut.key], fut.result())
    finally:
        client.cancel(futures)


def _stop(pool: ProcessPoolExecutor) -> None:
    """Stop a pool's workers now (Ctrl-C, or a block that failed) and reap them."""
    procs = list((getattr(pool, "_processes", None) or {}).values())
    for p in procs:
        p.terminate()
    pool.shutdown(wait=True, cancel_futures=True)
    for p in procs:
        p.join(timeout=5)
