"""Regenerate the expected event sequences of the known-answer files.

Each ``tests/known/*.json`` file holds a layout (table preset, ball
positions), a stroke, the physics values, and the event sequence the engine
produced when the file was made, after the sequence had been checked by hand
(what was checked is in the file's ``note``). ``tests/test_known_answers.py``
replays them.

Run this ONLY after a deliberate change of the physics, and only after
checking by hand that the new sequences are still physically right (update
each ``note`` to say what you checked)::

    .venv/bin/python tests/known/regenerate.py           # show what would change
    .venv/bin/python tests/known/regenerate.py --write   # rewrite the files

Without ``--write`` nothing is written. Files are replaced atomically.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path
from typing import Any

from shotplan.equipment import TableSpec
from shotplan.files.write import atomic_write_text
from shotplan.physics import Physics, Simulator
from shotplan.stroke import Stroke
from shotplan.table import Table

__all__ = ["KNOWN_DIR", "FORMAT", "replay", "event_rows", "main"]

KNOWN_DIR = Path(__file__).resolve().parent
FORMAT = "shotplan-known-answer"
"""The ``format`` field of a known-answer file (version 1)."""


def replay(data: dict[str, Any]) -> Any:
    """Run the layout and stroke of a known-answer file; returns the Outcome."""
    spec = TableSpec.preset(data["table"])
    physics = Physics.from_dict(data["physics"], where="known-answer physics")
    sim = Simulator(Table(spec), physics)
    ids = list(data["balls"])
    positions = [data["balls"][b] for b in ids]
    return sim.run(ids, positions, Stroke.from_dict(data["stroke"]))


def event_rows(outcome: Any) -> list[dict[str, Any]]:
    """The event sequence as stored: time (s, rounded to 1e-9), kind, balls, where."""
    return [
        {"t": round(e.t, 9), "kind": e.kind.word, "balls": list(e.balls), "where": e.where}
        for e in outcome.events
    ]


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--write", action="store_true", help="rewrite the files")
    args = parser.parse_args(argv)
    changed = 0
    for path in sorted(KNOWN_DIR.glob("*.json")):
        data = json.loads(path.read_text(encoding="utf-8"))
        if data.get("format") != FORMAT or data.get("version") != 1:
            print(f"{path.name}: not a {FORMAT} version 1 file, skipped", file=sys.stderr)
            continue
        rows = event_rows(replay(data))
        if rows == data.get("events"):
            print(f"{path.name}: unchanged ({len(rows)} events)")
            continue
        changed += 1
        print(f"{path.name}: {len(data.get('events', []))} -> {len(rows)} events")
        for row in rows:
            print(f"    {row['t']:12.9f}  {row['kind']:<9} {','.join(row['balls']):<8} {row['where']}")
        if args.write:
            data["events"] = rows
            atomic_write_text(path, json.dumps(data, indent=2) + "\n")
    if changed and not args.write:
        print("dry run: pass --write to rewrite (only after a deliberate physics change)")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
