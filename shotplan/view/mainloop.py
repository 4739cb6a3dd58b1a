"""The table view's window loop: events, updates and frames, sleeping when idle.

While the view has work of its own (the animation, a drag, the search, a
fresh edit) it runs at 60 frames a second; idle, it sleeps in the event
queue, waking every :data:`IDLE_WAKE_MS` for its clocks, and draws a frame
only on input, work in progress or a change in what the frame shows.
"""

from __future__ import annotations

import gc
from typing import TYPE_CHECKING, Any

import pygame

from .controls import MIN_SIZE
from .frame import fit_screen

if TYPE_CHECKING:
    from .app import App

__all__ = ["run_window", "settle_memory", "IDLE_WAKE_MS"]

IDLE_WAKE_MS = 250
"""While idle the view sleeps in the event queue and wakes this often (ms) for
its clocks (a note that expires, the autosave)."""


def settle_memory() -> None:
    """Once the first frame is up: collect, then move every object made so
    far (modules, the engine, the widgets' theme: about 90,000) out of the
    garbage collector's sight. A full collection had to look at all of them,
    38-51 ms in the middle of a drag on a 2-core machine; after this it looks
    only at what the view made since."""
    gc.collect()
    gc.freeze()


def run_window(app: App) -> None:
    """Open the window and run ``app`` until it is closed.

    Parameters
    ----------
    app : App
        The view.
    """
    pygame.display.init()
    pygame.font.init()
    app.size = fit_screen(app.size, pygame.display.get_desktop_sizes())
    screen = pygame.display.set_mode(app.size, pygame.RESIZABLE)
    try:  # the panels are laid out for MIN_SIZE and up; SDL keeps the window there
        pygame.Window.from_display_module().minimum_size = MIN_SIZE
    except (AttributeError, pygame.error):  # pragma: no cover - an older pygame
        pass
    pygame.key.set_repeat(350, 35)
    app.start(screen.get_size())
    app.show_loading(screen)
    clock = pygame.time.Clock()
    shown: Any = None
    try:
        while app.running:
            if app.busy():
                dt = clock.tick(60) / 1000.0
                events = pygame.event.get()
            else:
                first = pygame.event.wait(IDLE_WAKE_MS)
                events = [] if first.type == pygame.NOEVENT else [first, *pygame.event.get()]
                dt = clock.tick() / 1000.0
            for event in events:
                app.process_event(event)
            app.update(dt)
            # Redraw only when something may look different: input, work in
            # progress, or a change in what the frame shows (the view's
            # widgets have no hover tips that appear without input).
            key = app.look()
            if events or app.busy() or key != shown:
                app.draw(screen)
                pygame.display.flip()
                if shown is None:
                    settle_memory()
                shown = key
    finally:
        app.close()
        pygame.quit()
