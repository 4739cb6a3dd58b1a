"""Make the README's screenshots of the table view from the demo layouts.

Each ``assets/layouts/*.json`` is opened with ``shotplan view LAYOUT
--screenshot docs/screenshots/<name>.png`` (the first frame, with the
prediction and the proposed shots complete, drawn off screen with SDL's dummy
video driver), so the pictures always show the view as it is. ``make
screenshots`` runs this script.
"""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
LAYOUTS = ROOT / "assets" / "layouts"
OUT = ROOT / "docs" / "screenshots"


def main() -> int:
    OUT.mkdir(parents=True, exist_ok=True)
    env = {**os.environ, "SDL_VIDEODRIVER": "dummy", "SDL_AUDIODRIVER": "dummy",
           "PYGAME_HIDE_SUPPORT_PROMPT": "1"}
    layouts = sorted(LAYOUTS.glob("*.json"))
    if not layouts:
        print(f"no layouts in {LAYOUTS}", file=sys.stderr)
        return 2
    failed = 0
    for k, layout in enumerate(layouts, 1):
        out = OUT / f"{layout.stem}.png"
        print(f"[{k}/{len(layouts)}] {layout.relative_to(ROOT)} -> {out.relative_to(ROOT)}",
              flush=True)
        proc = subprocess.run([sys.executable, "-m", "shotplan", "view", str(layout),
                               "--screenshot", str(out)], env=env, cwd=ROOT,
                              capture_output=True, text=True)
        if proc.returncode != 0:
            failed += 1
            print(proc.stderr.strip(), file=sys.stderr)
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
