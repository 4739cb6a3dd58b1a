"""The public API of the model and the engine is documented in numpydoc style.

Our own rule (DEVELOPERS.md, "Docstrings"): every name in ``__all__`` of the
modules below that is a function, or a public method of a class in
``__all__``, has a one-line summary; if it takes parameters, a
``Parameters`` section naming each of them; if it returns something (its
return annotation is not ``None``), a ``Returns`` (or ``Yields``) section; if
its own body raises, a ``Raises`` section. The section layout is numpydoc's
(a title underlined with dashes; numpydoc style guide, "Sections"). A
dataclass documents its fields where they stand (an attribute docstring
under each), so its generated ``__init__`` needs no Parameters section.
Properties need only the summary.
"""

from __future__ import annotations

import ast
import dataclasses
import importlib
import inspect
import re
import textwrap

import pytest

MODULES = [
    "shotplan.errors", "shotplan.units", "shotplan.equipment.specs", "shotplan.equipment.presets",
    "shotplan.table",
    "shotplan.stroke", "shotplan.aim", "shotplan.layout", "shotplan.racks", "shotplan.players",
    "shotplan.tablefile", "shotplan.placement",
    "shotplan.files.read", "shotplan.files.write", "shotplan.files.jsonout",
    "shotplan.physics.params", "shotplan.physics.state", "shotplan.physics.run",
    "shotplan.physics.simulator", "shotplan.physics.strike", "shotplan.physics.jit",
    "shotplan.physics.roots", "shotplan.physics.motion", "shotplan.physics.collide",
    "shotplan.physics.events", "shotplan.physics.engine",
]


def _section(doc: str, title: str) -> str | None:
    """The body of numpydoc section ``title`` in ``doc``, or None."""
    m = re.search(rf"^{title}\n-{{{len(title)}}}\n(.*?)(?=^\S[^\n]*\n-{{3,}}\n|\Z)", doc,
                  re.M | re.S)
    return m.group(1) if m else None


def _documented_names(body: str) -> set[str]:
    names: set[str] = set()
    for line in body.splitlines():
        if line and not line[0].isspace():
            head = line.split(" : ")[0]
            names.update(n.strip().lstrip("*") for n in head.split(","))
    return names


def _raises_itself(func: object) -> bool:
    """Whether the function's own body (not a nested function) has a raise
    statement that raises something (a bare re-raise does not count)."""
    try:
        src = textwrap.dedent(inspect.getsource(func))  # type: ignore[arg-type]
    except (OSError, TypeError):
        return False
    tree = ast.parse(src)
    top = tree.body[0]
    stack = list(ast.iter_child_nodes(top))
    while stack:
        node = stack.pop()
        if isinstance(node, ast.FunctionDef | ast.AsyncFunctionDef | ast.Lambda | ast.ClassDef):
            continue
        if isinstance(node, ast.Raise) and node.exc is not None:
            return True
        stack.extend(ast.iter_child_nodes(node))
    return False


def _problems(name: str, func: object, skip_first: bool) -> list[str]:
    doc = inspect.getdoc(func) or ""
    out = []
    if not doc.strip() or not doc.splitlines()[0].strip():
        return [f"{name}: no summary line"]
    target = inspect.unwrap(func)  # type: ignore[arg-type]
    py_func = getattr(target, "py_func", target)  # a numba dispatcher's Python function
    try:
        sig = inspect.signature(py_func)
    except (TypeError, ValueError):
        return out
    params = [p for p in sig.parameters.values()
              if p.kind not in (p.VAR_POSITIONAL, p.VAR_KEYWORD)]
    if skip_first and params:
        params = params[1:]
    if params:
        body = _section(doc, "Parameters")
        if body is None:
            out.append(f"{name}: takes parameters but has no Parameters section")
        else:
            missing = [p.name for p in params if p.name not in _documented_names(body)]
            if missing:
                out.append(f"{name}: Parameters does not name {', '.join(missing)}")
    ret = sig.return_annotation
    if ret not in (inspect.Signature.empty, None, "None") \
            and _section(doc, "Returns") is None and _section(doc, "Yields") is None:
        out.append(f"{name}: returns {ret} but has no Returns section")
    if _raises_itself(py_func) and _section(doc, "Raises") is None:
        out.append(f"{name}: raises but has no Raises section")
    return out


def _public_callables(module_name: str):
    mod = importlib.import_module(module_name)
    for attr in getattr(mod, "__all__", []):
        obj = getattr(mod, attr)
        if getattr(obj, "__module__", module_name) != module_name:
            continue  # handed on from elsewhere: checked at home
        if inspect.isclass(obj):
            yield f"{module_name}.{attr}", obj, False
            for meth_name, meth in vars(obj).items():
                if meth_name.startswith("_") and meth_name != "__init__":
                    continue
                if meth_name == "__init__" and (dataclasses.is_dataclass(obj)
                                                or getattr(obj, "_is_protocol", False)):
                    continue  # fields documented where they stand; a protocol is not made
                if isinstance(meth, property):
                    yield f"{module_name}.{attr}.{meth_name}", meth, None
                elif isinstance(meth, classmethod | staticmethod):
                    yield (f"{module_name}.{attr}.{meth_name}", meth.__func__,
                           isinstance(meth, classmethod))
                elif inspect.isfunction(meth):
                    yield f"{module_name}.{attr}.{meth_name}", meth, True
        elif callable(obj) and (inspect.isfunction(obj) or hasattr(obj, "py_func")):
            yield f"{module_name}.{attr}", obj, False


def _module_problems(module_name: str) -> list[str]:
    out = []
    for name, obj, skip_first in _public_callables(module_name):
        if inspect.isclass(obj) or skip_first is None:  # a class or a property: summary only
            doc = inspect.getdoc(obj) or ""
            if not doc.strip():
                out.append(f"{name}: no summary line")
            continue
        if name.endswith(".__init__"):
            # documented in the class docstring or its own
            cls_doc = inspect.getdoc(importlib.import_module(module_name).__dict__[
                name.split(".")[-2]]) or ""
            own = inspect.getdoc(obj) or ""
            params = list(inspect.signature(obj).parameters)[1:]
            if params and _section(cls_doc, "Parameters") is None \
                    and _section(own, "Parameters") is None:
                out.append(f"{name}: the class takes parameters but documents none")
            continue
        out.extend(_problems(name, obj, skip_first))
    return out


@pytest.mark.parametrize("module_name", MODULES)
def test_public_api_is_documented_in_numpydoc(module_name):
    problems = _module_problems(module_name)
    assert not problems, "\n".join(problems)


def test_the_checker_catches_an_undocumented_function():
    # Guards against a checker that passes everything.
    def bare(x: int) -> int:
        """Twice x."""
        if x < 0:
            raise ValueError("negative")
        return 2 * x

    problems = _problems("bare", bare, False)
    assert any("no Parameters section" in p for p in problems)
    assert any("no Returns section" in p for p in problems)
    assert any("no Raises section" in p for p in problems)

    def good(x: int) -> int:
        """Twice x.

        Parameters
        ----------
        x : int
            A number.

        Returns
        -------
        int
            Twice ``x``.
        """
        return 2 * x

    assert _problems("good", good, False) == []
