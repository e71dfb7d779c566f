"""Layout rule of the api (common practice for a translation layer): each calculation module
imports shared field, label and reply modules, never another calculation's module."""

from __future__ import annotations

import ast
import inspect

import pytest

from driftdose.api.registry import CALCULATIONS

CALC_MODULES = {m.__name__.rsplit(".", 1)[1] for m in CALCULATIONS.values()}


def _imported_api_modules(source: str) -> set[str]:
    """Names of driftdose.api modules imported by ``source`` (relative or absolute)."""
    tree = ast.parse(source)
    out: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level == 1 and node.module is None:  # from . import x
                out.update(a.name for a in node.names)
            elif node.level == 1 and node.module:  # from .x import y
                out.add(node.module.split(".")[0])
            elif node.module and node.module.startswith("driftdose.api."):
                out.add(node.module.split(".")[2])
        elif isinstance(node, ast.Import):
            for a in node.names:
                if a.name.startswith("driftdose.api."):
                    out.add(a.name.split(".")[2])
    return out


@pytest.mark.parametrize("kind", sorted(CALCULATIONS))
def test_a_calculation_imports_no_other_calculation(kind):
    module = CALCULATIONS[kind]
    own = module.__name__.rsplit(".", 1)[1]
    others = (_imported_api_modules(inspect.getsource(module)) & CALC_MODULES) - {own}
    assert not others, f"{own} imports the calculation module(s) {sorted(others)}"


def test_the_check_sees_an_import_of_another_calculation():
    # the rule's own check: each form of import of a calculation module is caught
    for source in (
        "from . import burden\n",
        "from .burden import FIELDS\n",
        "from driftdose.api.burden import FIELDS\n",
        "import driftdose.api.burden\n",
    ):
        assert "burden" in _imported_api_modules(source) & CALC_MODULES, source
    assert not _imported_api_modules("from .burden_inputs import FIELDS\n") & CALC_MODULES
