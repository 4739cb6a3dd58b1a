"""Make the README's diagrams in docs/diagrams/ from the demo files, with the
shotplan command itself (run: ``make screenshots``)."""

from __future__ import annotations

import pathlib
import sys

from shotplan.cli import main

ROOT = pathlib.Path(__file__).resolve().parent.parent
OUT = ROOT / "docs" / "diagrams"
LAYOUTS = ROOT / "assets" / "layouts"

COMMANDS = [
    ["draw", str(LAYOUTS / "club-night-2-cut-to-corner.json"), "--shot", "1",
     "-o", str(OUT / "cut-to-corner-shot1.png"), "--dpi", "100"],
    ["draw", str(LAYOUTS / "club-night-2-cut-to-corner.json"), "--shot", "4",
     "--style", "colour", "-o", str(OUT / "cut-to-corner-kick-colour.png"), "--dpi", "100"],
    ["position", str(LAYOUTS / "club-night-4-position-drill.json"), "--ball", "4",
     "--pocket", "foot-right", "--zone", "circle:1.9,0.9,0.2",
     "-o", str(OUT / "position-map.png"), "--dpi", "90"],
    ["study", "window", "--distances", "0.3,0.6,0.9",
     "-o", str(OUT / "study-window.png"), "--dpi", "90"],
]

if __name__ == "__main__":
    OUT.mkdir(parents=True, exist_ok=True)
    for argv in COMMANDS:
        code = main(argv)
        if code:
            sys.exit(code)
