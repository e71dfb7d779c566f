"""Every public function of the core documents exactly its parameters, each quantity with a unit.

The numpydoc convention kept by scientific Python libraries (its ``validate`` checks PR01-PR03
and the ``Parameters`` layout): the ``Parameters`` section names the signature's parameters,
in order, no more and no fewer; here, in addition, every numeric parameter states its unit in
brackets (``[m]``, ``[kg/m^3]``, ``[-]`` for a dimensionless number or a count), since the
core computes in SI and a number without a unit is the commonest misuse of a physics function.

Covered: the module-level public functions (name without a leading underscore, defined in the
module) of every module of ``driftdose`` but the api boundary (``driftdose.api``) and the
command line (``driftdose.cli``, ``driftdose.__main__``), which take JSON and text rather than SI
numbers. Numeric means annotated ``float`` or ``int`` (optionally ``| None``) or a sequence of
``float``.
"""

from __future__ import annotations

import importlib
import inspect
import pkgutil
import re
from collections.abc import Callable, Iterator
from types import ModuleType

import pytest

import driftdose

SKIPPED_PACKAGES = ("driftdose.api", "driftdose.cli", "driftdose.__main__")

#: (module.function, parameter) -> why the parameter carries no unit (numeric but no quantity)
_SEED = "a seed of the random generator, not a quantity"
_DATE = "a field of a calendar date, not a quantity"
_INDEX = "a position in a file (column or line number), not a quantity"
NO_UNIT: dict[tuple[str, str], str] = {
    ("driftdose.uncertainty.spreads.design", "seed"): _SEED,
    ("driftdose.uncertainty.propagation.propagate", "seed"): _SEED,
    ("driftdose.shift.clock.days_from_civil", "year"): _DATE,
    ("driftdose.shift.clock.days_from_civil", "month"): _DATE,
    ("driftdose.shift.clock.days_from_civil", "day"): _DATE,
    ("driftdose.spectrum_import.parse_spectrum_csv", "header_line"): _INDEX,
    ("driftdose.tables.reader.read_table", "header_line"): _INDEX,
    ("driftdose.shift.series.read_series", "time_index"): _INDEX,
    ("driftdose.shift.series.read_series", "date_index"): _INDEX,
}


def _modules() -> Iterator[ModuleType]:
    def walk(path: list[str], prefix: str) -> Iterator[ModuleType]:
        for info in pkgutil.iter_modules(path, prefix):
            if info.name.startswith(SKIPPED_PACKAGES):
                continue
            module = importlib.import_module(info.name)
            yield module
            if info.ispkg:
                yield from walk(module.__path__, info.name + ".")

    yield driftdose
    yield from walk(driftdose.__path__, "driftdose.")


def _public_functions() -> list[tuple[str, Callable]]:
    found = []
    for module in _modules():
        for name, obj in vars(module).items():
            if name.startswith("_") or not inspect.isfunction(obj):
                continue
            if obj.__module__ == module.__name__:
                found.append((f"{module.__name__}.{name}", obj))
    return sorted(found, key=lambda item: item[0])


FUNCTIONS = _public_functions()


def _sections(doc: str) -> dict[str, list[str]]:
    """The numpydoc sections: a title line underlined with dashes, then its lines."""
    lines = inspect.cleandoc(doc).splitlines()
    sections: dict[str, list[str]] = {}
    current = None
    for i, line in enumerate(lines):
        if re.fullmatch(r"-{3,}", line.strip()):
            continue
        if i + 1 < len(lines) and re.fullmatch(r"-{3,}", lines[i + 1].strip()) and line.strip():
            current = line.strip()
            sections[current] = []
        elif current is not None:
            sections[current].append(line)
    return sections


def _documented(lines: list[str]) -> list[tuple[str, str]]:
    """(name, type line and description) per documented parameter, in order.

    ``x, y : float`` documents two parameters with one description.
    """
    entries: list[tuple[list[str], list[str]]] = []
    for line in lines:
        if line.strip() and not line[0].isspace():
            head, _, kind = line.partition(" : ")
            names = [n.strip() for n in head.split(",") if n.strip()]
            entries.append((names, [kind.strip()]))
        elif line.strip() and entries:
            entries[-1][1].append(line.strip())
    return [(name, " ".join(text)) for names, text in entries for name in names]


def _signature_names(func: Callable) -> list[str]:
    names = []
    for p in inspect.signature(func).parameters.values():
        prefix = {p.VAR_POSITIONAL: "*", p.VAR_KEYWORD: "**"}.get(p.kind, "")
        names.append(prefix + p.name)
    return names


def _numeric(annotation: object) -> bool:
    text = str(annotation).replace(" ", "")
    parts = [t for t in text.split("|") if t != "None"]
    scalar = {"float", "int"}
    sequence = re.compile(r"(Sequence|list|tuple|Iterable)\[float(,\.\.\.)?\]")
    return bool(parts) and all(t in scalar or sequence.fullmatch(t) for t in parts)


def test_the_core_has_public_functions():
    """The walk reaches the physics modules (a walk that finds nothing would pass anything)."""
    names = {name for name, _ in FUNCTIONS}
    assert "driftdose.particle.slip.slip_correction" in names
    assert "driftdose.deposition.icrp66.icrp66" in names
    assert not any(n.startswith(SKIPPED_PACKAGES) for n in names)


@pytest.mark.parametrize(
    ("module", "least"),
    [("driftdose.particle", 20), ("driftdose.uncertainty", 4), ("driftdose.retention.model", 8)],
)
def test_reexported_functions_are_covered(module, least):
    """A module that re-exports its topic modules' functions (``driftdose.particle``) has
    each of them checked once, in the module that defines it."""
    package = importlib.import_module(module)
    names = {name for name, _ in FUNCTIONS}
    exported = [getattr(package, n) for n in package.__all__]
    functions = [f for f in exported if inspect.isfunction(f)]
    assert len(functions) >= least
    for func in functions:
        assert f"{func.__module__}.{func.__name__}" in names


@pytest.mark.parametrize(("name", "func"), FUNCTIONS, ids=[n for n, _ in FUNCTIONS])
def test_parameters_section_matches_signature(name, func):
    wanted = [n.lstrip("*") for n in _signature_names(func)]
    if not wanted:
        return
    sections = _sections(func.__doc__ or "")
    assert "Parameters" in sections, f"{name}: no numpydoc Parameters section"
    documented = [n.lstrip("*") for n, _ in _documented(sections["Parameters"])]
    assert documented == wanted, f"{name}: documents {documented}, signature has {wanted}"


@pytest.mark.parametrize(("name", "func"), FUNCTIONS, ids=[n for n, _ in FUNCTIONS])
def test_numeric_parameters_carry_a_unit(name, func):
    sections = _sections(func.__doc__ or "")
    described = {n.lstrip("*"): text for n, text in _documented(sections.get("Parameters", []))}
    missing = []
    for p in inspect.signature(func).parameters.values():
        if not _numeric(p.annotation) or (name, p.name) in NO_UNIT:
            continue
        if not re.search(r"\[[^\[\]]+\]", described.get(p.name, "")):
            missing.append(p.name)
    assert not missing, f"{name}: no unit in brackets for {missing}"


def test_exemptions_name_real_parameters():
    """An exemption for a parameter that no longer exists is removed, not kept."""
    functions = dict(FUNCTIONS)
    for name, parameter in NO_UNIT:
        assert parameter in inspect.signature(functions[name]).parameters, (name, parameter)
