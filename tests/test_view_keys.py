"""The view's key map is its help and its dispatch: every row of the help
has a key, every key has a row that names it, and pressing a key calls the
action the table names, with its value (headless: SDL's dummy drivers are
set in conftest.py before pygame is imported)."""

from __future__ import annotations

import pygame
import pytest

from shotplan.view import actions
from shotplan.view.app import App
from shotplan.view.keys import HELP_ROWS, KEY_MAP, KEYS, binding_for


@pytest.fixture(scope="module", autouse=True)
def display():
    pygame.init()
    pygame.display.set_mode((1280, 800))
    yield
    pygame.quit()


# How the help spells a key that pygame names otherwise (our own help wording).
SPELLED = {"escape": "esc", "keypad 0": "0", "backspace": "delete"}


def test_every_help_row_has_a_binding_and_every_binding_a_row():
    rows = {(b.label, b.text) for b in KEY_MAP}
    assert set(KEYS) == rows
    assert all(row in HELP_ROWS for row in rows)
    assert len(KEYS) == len(set(KEYS))
    assert all(b.action in actions.ACTIONS for b in KEY_MAP)


@pytest.mark.parametrize("binding", KEY_MAP, ids=lambda b: f"{b.action}-{b.value}")
def test_the_help_row_names_the_key_and_its_modifiers(binding):
    label = binding.label.lower()
    names = [SPELLED.get(pygame.key.name(k), pygame.key.name(k)) for k in binding.keys]
    assert any(n in label for n in names), (names, label)
    if binding.ctrl:
        assert "ctrl" in label
    if binding.shift:
        assert "shift" in binding.label.lower() + binding.text.lower()


def test_the_first_matching_binding_wins():
    # Written out by hand from the help text, not from the table.
    assert binding_for(pygame.K_s, pygame.KMOD_CTRL).action == "save"
    assert binding_for(pygame.K_s, pygame.KMOD_CTRL | pygame.KMOD_SHIFT).action == "save-as"
    assert binding_for(pygame.K_z, pygame.KMOD_CTRL | pygame.KMOD_SHIFT).action == "redo"
    assert binding_for(pygame.K_DELETE, pygame.KMOD_CTRL).action == "clear"
    assert binding_for(pygame.K_DELETE, 0).action == "remove"
    assert binding_for(pygame.K_LEFT, pygame.KMOD_SHIFT).value == 1.0
    assert binding_for(pygame.K_RIGHT, 0).value == -0.1
    assert binding_for(pygame.K_SLASH, pygame.KMOD_SHIFT, "?").action == "help"
    assert binding_for(pygame.K_s, 0) is None
    assert binding_for(pygame.K_a, 0).action == "atlas"
    assert binding_for(pygame.K_j, 0) is None


def _mods(b):
    return (pygame.KMOD_CTRL if b.ctrl else 0) | (pygame.KMOD_SHIFT if b.shift else 0)


@pytest.mark.parametrize("binding", KEY_MAP, ids=lambda b: f"{b.action}-{b.value}")
def test_pressing_each_key_calls_its_action(binding, tmp_path, monkeypatch):
    app = App(recovery_dir=tmp_path / "recovery", offer_recovery=False)
    app.start((1280, 800))
    calls = []
    monkeypatch.setitem(actions.ACTIONS, binding.action, lambda a, v: calls.append((a, v)))
    for code in binding.keys:
        app.process_event(pygame.event.Event(pygame.KEYDOWN, key=code, mod=_mods(binding),
                                             unicode="", scancode=0))
    assert calls == [(app, binding.value)] * len(binding.keys)
    app.close()
