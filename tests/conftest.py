"""Shared test set-up.

The table view's tests run headless: SDL's dummy video and audio drivers are
chosen before anything imports pygame (pygame reads them when its display
starts), and pygame's greeting is kept off the test output.
"""

import os

import pytest

os.environ.setdefault("SDL_VIDEODRIVER", "dummy")
os.environ.setdefault("SDL_AUDIODRIVER", "dummy")
os.environ.setdefault("PYGAME_HIDE_SUPPORT_PROMPT", "1")


@pytest.fixture(scope="module")
def display():
    """pygame's (dummy) display and fonts, for a module of view tests."""
    import pygame

    pygame.display.init()
    pygame.font.init()
    screen = pygame.display.set_mode((1280, 800))
    yield screen
    pygame.display.quit()
