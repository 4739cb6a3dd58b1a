"""The README's examples print what the README says (a docs test).

Each ``$ shotplan ...`` example in README.md is run for real and its output
compared line by line (``...`` in the README stands for lines left out;
timings may differ). When a change alters an output on purpose, rerun
``python tests/readme_examples.py --write`` and read the diff.
"""

from __future__ import annotations

import pytest
import readme_examples as rx

EXAMPLES = rx.examples(rx.README.read_text(encoding="utf-8"))


@pytest.fixture(scope="module")
def cwd(tmp_path_factory):
    return rx.workdir()


def test_the_readme_has_examples():
    assert len(EXAMPLES) >= 8


@pytest.mark.parametrize("example", EXAMPLES, ids=lambda e: f"line{e.line}")
def test_readme_example(example: rx.Example, cwd):
    actual = rx.run(example, cwd)
    assert rx.matches(example.expected, actual), (
        f"README.md:{example.line}: $ {example.command}\n"
        + "README shows:\n" + "\n".join(example.expected)
        + "\nthe command prints:\n" + "\n".join(actual))


def test_wildcard_matching():
    # hand-worked cases of the matcher itself
    assert rx.matches(["a", "...", "d"], ["a", "b", "c", "d"])
    assert rx.matches(["a", "..."], ["a"])
    assert not rx.matches(["a", "b"], ["a", "c"])
    assert not rx.matches(["a", "...", "d"], ["a", "b"])
    assert rx.matches(["line 13: ... (z 15.8)"], ["line 13: 1.2, 3.4 (z 15.8)"])
    assert not rx.matches(["line 13: ... (z 15.8)"], ["line 14: 1.2 (z 15.8)"])
    assert rx.matches(["x (12 simulations, 334 ms)"], ["x (12 simulations, 1191 ms)"])
    assert not rx.matches(["x (12 simulations, 334 ms)"], ["x (13 simulations, 334 ms)"])


def python_blocks(text: str) -> list[str]:
    blocks, current = [], None
    for line in text.splitlines():
        if current is None and line.strip() == "```python":
            current = []
        elif current is not None and line.startswith("```"):
            blocks.append("\n".join(current))
            current = None
        elif current is not None:
            current.append(line)
    return blocks


def test_readme_python_examples(capsys, monkeypatch):
    """Each ```python block runs from the repository's folder, and every
    ``print(...)  # value`` line prints that value."""
    monkeypatch.chdir(rx.ROOT)
    blocks = python_blocks(rx.README.read_text(encoding="utf-8"))
    assert blocks
    for code in blocks:
        wanted = [ln.split("#", 1)[1].strip() for ln in code.splitlines()
                  if ln.startswith("print(") and "#" in ln]
        exec(compile(code, "README.md", "exec"), {})
        printed = capsys.readouterr().out.splitlines()
        assert printed[: len(wanted)] == wanted
