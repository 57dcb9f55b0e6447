"""Portfolios beyond one process: a Dask cluster that maps per-project work over workers.

Per-project work stays a pure function of (projects, factor set, options), so a portfolio is
cut into pieces, each piece is scored on a worker exactly as it would be in one process, and the
results are gathered in order. ``--workers N`` starts a local cluster of N worker processes
(one thread each); ``--scheduler ADDRESS`` connects to an existing Dask scheduler instead
(its workers must be able to import carbonledger, and read the project files for Monte Carlo).

References
----------
.. [1] Rocklin, M. (2015). Dask: Parallel computation with blocked algorithms and task
   scheduling. Proceedings of the 14th Python in Science Conference, 130-136.
"""

from __future__ import annotations

import contextlib
from collections.abc import Callable, Iterator

from ..errors import InputError
from ..model.rulebooks import user_rulebooks

PIECES_PER_WORKER = 2


@contextlib.contextmanager
def dask_mapper(workers: int | None = None, scheduler: str | None = None) -> Iterator[tuple[Callable | None, int]]:
    """(map function, number of pieces) on a Dask cluster; (None, 1) when neither option is given."""
    if workers is None and scheduler is None:
        yield None, 1
        return
    if workers is not None and scheduler is not None:
        raise InputError(
            "--workers", str(workers), "either --workers (a local cluster) or --scheduler (an existing one), not both"
        )
    if workers is not None and workers < 1:
        raise InputError("--workers", str(workers), "at least 1 worker")
    if user_rulebooks():
        raise InputError(
            "--rulebook",
            next(iter(user_rulebooks().values())).user_file,
            "no --workers or --scheduler with a user rulebook (the workers read the shipped rulebooks only)",
        )
    import logging

    try:
        from distributed import Client, LocalCluster
    except ImportError:
        raise InputError(
            "--workers" if workers is not None else "--scheduler",
            str(workers or scheduler),
            "Dask installed (pip install 'carbonledger[cluster]')",
        ) from None

    logging.getLogger("distributed").setLevel(logging.ERROR)
    with contextlib.ExitStack() as stack:
        if scheduler is not None:
            try:
                client = stack.enter_context(Client(scheduler, timeout="10s"))
            except (OSError, TimeoutError) as error:
                raise InputError(
                    "--scheduler", scheduler, f"the address of a running Dask scheduler ({error})"
                ) from None
        else:
            cluster = stack.enter_context(
                LocalCluster(n_workers=workers, threads_per_worker=1, processes=True, dashboard_address=None)
            )
            client = stack.enter_context(Client(cluster))
        count = max(1, len(client.scheduler_info().get("workers", {})) or (workers or 1))

        def mapper(function: Callable, items: list) -> list:
            return client.gather(client.map(function, items, pure=False))

        yield mapper, count * PIECES_PER_WORKER
