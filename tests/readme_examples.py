"""The README's command examples, run for real.

Every line of a fenced block in README.md that starts with ``$ shotplan``
is a command; the lines after it, up to the next ``$`` line or the end of
the block, are its output. A line ``...`` stands for any number of lines
(the README shows the head or the tail of a long output), and ``...``
inside a line stands for any text. Timings
(``334 ms``) are the only thing that may differ.

Run as a script to check (exit 1 on a difference) or, with ``--write``, to
rewrite the README's outputs from what the commands print now, keeping
each block's ``...`` where it was.

The commands run in a fresh folder holding a link to ``assets/`` and the
files in ``tests/docs/`` (for example the ``bad.json`` of the check
example), so the files they write never land in the repository.
"""

from __future__ import annotations

import argparse
import os
import re
import shlex
import shutil
import subprocess
import sys
import tempfile
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
README = ROOT / "README.md"
FIXTURES = Path(__file__).resolve().parent / "docs"
ELLIPSIS = "..."
_TIMING = re.compile(r"\b\d+(\.\d+)? ?(ms|s)\)")


@dataclass
class Example:
    """One ``$ shotplan ...`` line of the README and the output shown under it."""

    line: int
    """Line number of the command in README.md (1-based)."""
    command: str
    expected: list[str]


def examples(text: str) -> list[Example]:
    """Every command example in the README's fenced blocks, in order."""
    out: list[Example] = []
    in_block = False
    current: Example | None = None
    for n, line in enumerate(text.splitlines(), 1):
        if line.startswith("```"):
            in_block = not in_block
            current = None
            continue
        if not in_block:
            continue
        if line.startswith("$ "):
            current = None
            if line.startswith("$ shotplan "):
                current = Example(n, line[2:], [])
                out.append(current)
        elif current is not None:
            current.expected.append(line)
    return out


def normal(line: str) -> str:
    """A line with its timing masked and its right end trimmed."""
    return _TIMING.sub("N ms)", line.rstrip())


def _same(expected: str, actual: str) -> bool:
    """One line: equal, or with ``...`` inside it standing for any text."""
    if ELLIPSIS not in expected:
        return expected == actual
    pattern = ".*".join(re.escape(part) for part in expected.split(ELLIPSIS))
    return re.fullmatch(pattern, actual) is not None


def matches(expected: list[str], actual: list[str]) -> bool:
    """Whether the actual lines fit the expected ones, ``...`` matching any
    run of lines (including none)."""
    exp = [normal(x) for x in expected]
    act = [normal(x) for x in actual]
    # classic wildcard matching over lines
    memo: dict[tuple[int, int], bool] = {}

    def fit(i: int, j: int) -> bool:
        key = (i, j)
        if key in memo:
            return memo[key]
        if i == len(exp):
            ok = j == len(act)
        elif exp[i] == ELLIPSIS:
            ok = fit(i + 1, j) or (j < len(act) and fit(i, j + 1))
        else:
            ok = j < len(act) and _same(exp[i], act[j]) and fit(i + 1, j + 1)
        memo[key] = ok
        return ok

    sys.setrecursionlimit(max(sys.getrecursionlimit(), 10 * (len(exp) + len(act)) + 100))
    return fit(0, 0)


def workdir() -> Path:
    """A fresh folder with ``assets`` linked and the fixtures copied in."""
    d = Path(tempfile.mkdtemp(prefix="shotplan-readme-"))
    os.symlink(ROOT / "assets", d / "assets")
    for f in FIXTURES.glob("*"):
        shutil.copy(f, d / f.name)
    return d


def run(example: Example, cwd: Path) -> list[str]:
    """Run one example's command; its stdout and stderr lines, in order."""
    exe = Path(sys.executable).with_name("shotplan")
    argv = shlex.split(example.command)
    argv[0] = str(exe) if exe.exists() else "shotplan"
    env = dict(os.environ, COLUMNS="100", MPLBACKEND="Agg", SDL_VIDEODRIVER="dummy")
    proc = subprocess.run(argv, cwd=cwd, env=env, stdout=subprocess.PIPE,
                          stderr=subprocess.STDOUT, text=True, timeout=600)
    return proc.stdout.splitlines()


def rewrite(expected: list[str], actual: list[str]) -> list[str]:
    """New output lines for a block: the actual ones, with the block's
    ``...`` kept: as many lines before the first and after the last as the
    README showed. A block with ``...`` in its middle too loses that middle
    part: put it back by hand (the check says so)."""
    actual = [line.rstrip() for line in actual]
    if ELLIPSIS not in expected:
        return actual
    first = expected.index(ELLIPSIS)
    last = len(expected) - 1 - expected[::-1].index(ELLIPSIS)
    head, tail = first, len(expected) - 1 - last
    if head + tail >= len(actual):
        return actual
    return actual[:head] + [ELLIPSIS] + (actual[len(actual) - tail:] if tail else [])


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--write", action="store_true", help="rewrite README.md's outputs")
    args = parser.parse_args(argv)
    lines = README.read_text(encoding="utf-8").splitlines()
    cwd = workdir()
    bad = 0
    replacements: list[tuple[int, int, list[str]]] = []
    for ex in examples("\n".join(lines)):
        actual = run(ex, cwd)
        if not matches(ex.expected, actual):
            bad += 1
            print(f"README.md:{ex.line}: $ {ex.command}")
            print("  README shows:\n    " + "\n    ".join(ex.expected))
            print("  the command prints:\n    " + "\n    ".join(actual))
            replacements.append((ex.line, ex.line + len(ex.expected), rewrite(ex.expected, actual)))
    if args.write and replacements:
        for start, end, new in reversed(replacements):
            lines[start:end] = new
        README.write_text("\n".join(lines) + "\n", encoding="utf-8")
        print(f"rewrote {len(replacements)} example(s) in README.md")
    shutil.rmtree(cwd, ignore_errors=True)
    return 1 if bad and not args.write else 0


if __name__ == "__main__":
    sys.exit(main())
