"""The package's own rules for its layout (our own rules, no outside source).

* Arrows point down: each part of ``shotplan`` imports only parts of a lower
  layer in :data:`LAYERS` (imports under ``if TYPE_CHECKING:`` are for the
  type checker only and do not count).
* No module imports a private name (``_name``) from another module.
* No module is longer than :data:`MAX_LINES` lines.

DEVELOPERS.md draws the same layers as a picture; a test below keeps the
two in step.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
PKG = ROOT / "shotplan"

LAYERS: list[set[str]] = [
    {"errors", "units"},
    {"files", "equipment", "players", "parallel"},
    {"table", "tablefile"},
    {"stroke", "aim", "placement", "games"},
    {"physics"},
    {"layout"},
    {"search", "racks"},
    {"study", "cushion", "position", "atlas"},
    {"drills"},
    {"render"},
    {"cli", "view"},
    {"__init__", "__main__"},
]
"""Lowest first. A part is a top-level module or subpackage of ``shotplan``."""

MAX_LINES = 800

KNOWN_UPWARD: set[tuple[str, str]] = set()
"""Upward imports still to be removed (module, imported part); empty when the
house is in order."""

KNOWN_PRIVATE: set[tuple[str, str]] = set()
"""Private names still imported across modules (module, name)."""

KNOWN_LONG: set[str] = set()
"""Modules still above :data:`MAX_LINES`."""


def _layer(part: str) -> int:
    for i, layer in enumerate(LAYERS):
        if part in layer:
            return i
    raise AssertionError(f"shotplan/{part} is in no layer of tests/test_house.py: add it")


def _modules() -> list[tuple[str, list[str], Path]]:
    out = []
    for f in sorted(PKG.rglob("*.py")):
        parts = list(f.relative_to(PKG).with_suffix("").parts)
        name = ".".join(parts)
        here = parts[:-1]  # the package a relative import starts from
        out.append((name, here, f))
    return out


def _type_checking_nodes(tree: ast.AST) -> set[int]:
    skip: set[int] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test):
            for sub in node.body:
                for inner in ast.walk(sub):
                    skip.add(id(inner))
    return skip


def _imports(here: list[str], f: Path):
    """(imported dotted module inside shotplan, names, line) for each import."""
    tree = ast.parse(f.read_text(encoding="utf-8"))
    skip = _type_checking_nodes(tree)
    for node in ast.walk(tree):
        if id(node) in skip:
            continue
        if isinstance(node, ast.ImportFrom):
            if node.level > 0:
                base = here[: len(here) - (node.level - 1)] if node.level > 1 else here
                target = ".".join([*base, *([node.module] if node.module else [])])
            elif (node.module or "").startswith("shotplan"):
                target = node.module.removeprefix("shotplan").lstrip(".") if node.module else ""
            else:
                continue
            names = [a.name for a in node.names]
            folder = PKG.joinpath(*target.split(".")) if target else PKG
            subs = [n for n in names if (folder / f"{n}.py").exists() or (folder / n).is_dir()]
            for n in subs:  # "from . import study": the submodule itself
                yield ".".join([*([target] if target else []), n]), [], node.lineno
            if len(subs) < len(names):
                yield target, [n for n in names if n not in subs], node.lineno
        elif isinstance(node, ast.Import):
            for a in node.names:
                if a.name.startswith("shotplan."):
                    yield a.name.removeprefix("shotplan."), [], node.lineno


def _part(dotted: str) -> str:
    return dotted.split(".")[0] if dotted else "__init__"


def test_arrows_point_down():
    upward = set()
    for name, here, f in _modules():
        me = _part(name)
        for target, _names, line in _imports(here, f):
            them = _part(target)
            if them == me:
                continue
            if _layer(them) >= _layer(me):
                upward.add((name, them))
                assert (name, them) in KNOWN_UPWARD, (
                    f"shotplan/{f.relative_to(PKG)}:{line} imports {them}, which is not below "
                    f"{me} in tests/test_house.py LAYERS")
    assert upward >= KNOWN_UPWARD, f"fixed, take off KNOWN_UPWARD: {KNOWN_UPWARD - upward}"


def test_no_private_name_crosses_modules():
    found = set()
    for name, here, f in _modules():
        for target, names, line in _imports(here, f):
            for n in names:
                if n.startswith("_") and not n.startswith("__"):
                    found.add((name, n))
                    assert (name, n) in KNOWN_PRIVATE, (
                        f"shotplan/{f.relative_to(PKG)}:{line} imports {n} from "
                        f"{target or 'shotplan'}: make it public or keep it home")
    assert found >= KNOWN_PRIVATE, f"fixed, take off KNOWN_PRIVATE: {KNOWN_PRIVATE - found}"


def test_no_module_is_too_long():
    long = set()
    for name, _here, f in _modules():
        n = len(f.read_text(encoding="utf-8").splitlines())
        if n > MAX_LINES:
            long.add(name)
            assert name in KNOWN_LONG, f"shotplan/{f.relative_to(PKG)} has {n} lines (> {MAX_LINES})"
    assert long >= KNOWN_LONG, f"now short enough, take off KNOWN_LONG: {KNOWN_LONG - long}"


@pytest.mark.parametrize("layer", range(len(LAYERS)))
def test_developers_md_draws_the_same_layers(layer):
    # The picture in DEVELOPERS.md lists each layer on one line, lowest last,
    # as "layer N: a, b, c" followed by two spaces and a description.
    text = (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")
    m = re.search(rf"^layer {layer}: (.+?)(?: {{2,}}|$)", text, re.M)
    assert m, f"DEVELOPERS.md has no 'layer {layer}:' line"
    drawn = {w.strip().strip("/").removesuffix(".py") for w in m.group(1).split(",")}
    assert drawn == LAYERS[layer]
