"""Stations whose zone is the next ball's shot atlas: the region, computed.

A station's ``"zone": {"atlas": NEXT_BALL, "min_window_deg": X, "grid_m": M}``
asks for the part of the table from which ``NEXT_BALL`` has a best window of
at least ``X`` degrees once the station's ball is down (its atlas on the
station's layout without that ball, cell size ``M``). :func:`resolve_atlas_zones`
computes every such region (once per distinct request) and gives each
station the zone; the drill then plays as with a drawn zone.
"""

from __future__ import annotations

import dataclasses

from ..atlas import AtlasJob, run_atlas
from ..parallel import Progress
from ..position import Zone
from .drill_file import Drill

__all__ = ["resolve_atlas_zones", "atlas_zone_label"]


def atlas_zone_label(ball: str, min_window_deg: float) -> str:
    """The words a zone from an atlas carries.

    Parameters
    ----------
    ball : str
        The next ball.
    min_window_deg : float
        The least window, degrees.

    Returns
    -------
    str
        ``ball 5's best window at least 0.5 deg``.
    """
    return f"ball {ball}'s best window at least {min_window_deg:g} deg"


def resolve_atlas_zones(drill: Drill, workers: int | None = None,
                        progress: Progress | None = None) -> Drill:
    """The drill with every atlas zone computed (stations without one unchanged).

    Parameters
    ----------
    drill : Drill
        The drill.
    workers : int, optional
        Worker processes of the atlases' local Dask cluster (0: this process).
    progress : callable, optional
        ``progress(done, total)`` of each atlas, in its cells.

    Returns
    -------
    Drill
        A copy whose atlas stations have their :attr:`~.Station.zone`.

    Raises
    ------
    LayoutError
        If no spot of the table gives the next ball the window asked for.
    """
    from ..errors import LayoutError

    stations = []
    done: dict[tuple[str, str, float, float], Zone] = {}
    for k, st in enumerate(drill.stations):
        spec = st.zone_atlas
        if spec is None or st.zone is not None:
            stations.append(st)
            continue
        after = st.layout.without_ball(st.ball)
        key = (after.to_json(), spec.ball, spec.min_window_deg, spec.grid_m)
        if key not in done:
            job = AtlasJob(after, spec.ball, cell_m=spec.grid_m)
            region = run_atlas(job, workers=workers, progress=progress).region(
                "window_deg", spec.min_window_deg)
            label = atlas_zone_label(spec.ball, spec.min_window_deg)
            if region.is_empty:
                raise LayoutError(f"station {k + 1} (stations[{k}]): zone: no cue-ball spot "
                                  f"gives {label} once ball {st.ball} is down; ask for less "
                                  "(min_window_deg)")
            done[key] = Zone.of_shape(region, label)
        stations.append(dataclasses.replace(st, zone=done[key]))
    return dataclasses.replace(drill, stations=tuple(stations))
