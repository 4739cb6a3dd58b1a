"""The table view (pygame-ce window, pygame_gui widgets): the only part of
shotplan that imports pygame.

Modules: :mod:`~shotplan.view.transform` (table metres <-> screen pixels),
:mod:`~shotplan.view.draw` (scene shapes drawn with pygame),
:mod:`~shotplan.view.state` (the editable model, undo and redo),
:mod:`~shotplan.view.playback` (the animation's place),
:mod:`~shotplan.view.predict` (live simulation, window, proposals),
:mod:`~shotplan.view.layers` (the moving part of the picture as scene shapes),
:mod:`~shotplan.view.recovery` (the autosave file) and
:mod:`~shotplan.view.keeping` (the view's side of it),
:mod:`~shotplan.view.controls` (the controls' geometry and words),
:mod:`~shotplan.view.panels` (the widgets), :mod:`~shotplan.view.keys` and
:mod:`~shotplan.view.actions` (the key map and what each key does),
:mod:`~shotplan.view.pointer` (gestures on the table),
:mod:`~shotplan.view.words` and :mod:`~shotplan.view.frame` (the text and
the parts of a frame around the table), :mod:`~shotplan.view.app` (the
event loop) and :mod:`~shotplan.view.command` (``shotplan view``).

Importing this package imports nothing heavy; ``from shotplan.view.app import
App`` brings in pygame.
"""

__all__: list[str] = []
