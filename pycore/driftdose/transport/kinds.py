"""The registry of sampling-stage kinds: one entry per kind, from which stages are built.

:data:`STAGE_KINDS` maps a kind key (``tube``, ``bend``, ``cyclone``, ``impactor``,
``screens``) to a :class:`StageKind`: its label, a one-line description naming the published
models, the stage class of :mod:`driftdose.transport.chain`, whether it carries air (so takes
a flow), and a builder that makes the stage from named SI parameters. :func:`build_stage`
dispatches by key; an unknown key raises ``ValueError``. Adding a stage kind is one class in
:mod:`.chain` and one entry here; the calculation and its form follow from the registry.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any

from .chain import Bend, Cyclone, Impactor, ScreenStack, Stage, Tube

__all__ = ["STAGE_KINDS", "StageKind", "build_stage"]

Builder = Callable[[Mapping[str, Any], float, str], Stage]


@dataclass(frozen=True)
class StageKind:
    """One kind of sampling stage.

    Attributes
    ----------
    key : str
        Registry key, also the stage's ``kind``.
    label : str
        Short name for people (``Straight tube``).
    help : str
        One line: what the stage models and after whom.
    stage : type
        The stage class of :mod:`driftdose.transport.chain`.
    uses_flow : bool
        Whether the stage carries air, so takes a flow [m^3/s].
    build : callable
        ``build(parameters, flow, name)`` makes the stage from named SI parameters, the
        flow through it [m^3/s] and its name.

    """

    key: str
    label: str
    help: str
    stage: type
    uses_flow: bool
    build: Builder


def _tube(v: Mapping[str, Any], flow: float, name: str) -> Tube:
    mechanisms = v.get("mechanisms", "both")
    return Tube(
        v["length"],
        v["tube_diameter"],
        flow,
        inclination=v.get("inclination", 0.0),
        diffusion=mechanisms in ("both", "diffusion"),
        settling=mechanisms in ("both", "settling"),
        name=name,
    )


def _bend(v: Mapping[str, Any], flow: float, name: str) -> Bend:
    return Bend(v["tube_diameter"], flow, v["bend_angle"], v["curvature_radius"], name=name)


def _cyclone(v: Mapping[str, Any], flow: float, name: str) -> Cyclone:
    return Cyclone(v["d50"], v["curve_gsd"], v.get("curve", "lognormal"), name=name)


def _impactor(v: Mapping[str, Any], flow: float, name: str) -> Impactor:
    jet = v.get("jet", "round")
    return Impactor(
        v["nozzle_diameter"],
        flow,
        v.get("n_nozzles", 1),
        jet,
        v.get("slit_length") if jet == "rectangular" else None,
        v["efficiency_width"],
        name=name,
    )


def _screens(v: Mapping[str, Any], flow: float, name: str) -> ScreenStack:
    return ScreenStack(
        v["wire_diameter"],
        v["solidity"],
        v["thickness"],
        flow,
        v["screen_diameter"],
        v.get("n_screens", 1),
        v.get("impaction", "off") == "on",
        name=name,
    )


STAGE_KINDS: dict[str, StageKind] = {
    k.key: k
    for k in (
        StageKind(
            "tube",
            "Straight tube",
            "Diffusion (Gormley & Kennedy; Friedlander) and settling (Fuchs; Heyder & "
            "Gebhart; Schwendiman) in a straight tube.",
            Tube,
            True,
            _tube,
        ),
        StageKind(
            "bend",
            "Bend",
            "Inertial loss in a bend (Pui, Romay-Novas & Liu 1987).",
            Bend,
            True,
            _bend,
        ),
        StageKind(
            "cyclone",
            "Cyclone or pre-separator",
            "A penetration curve from a cut size and its GSD, or the ideal ISO 7708 "
            "respirable curve.",
            Cyclone,
            False,
            _cyclone,
        ),
        StageKind(
            "impactor",
            "Impactor stage",
            "Cut size from the Stokes number at 50 % (Marple & Willeke 1976).",
            Impactor,
            True,
            _impactor,
        ),
        StageKind(
            "screens",
            "Wire screens",
            "A stack of wire screens as a fan-model filter (Cheng & Yeh 1980; Cheng, Yeh & "
            "Brinsko 1985).",
            ScreenStack,
            True,
            _screens,
        ),
    )
}
"""Stage kinds by key, in the order a form offers them."""


def build_stage(kind: str, parameters: Mapping[str, Any], flow: float, name: str) -> Stage:
    """Make a stage of kind ``kind`` from named SI parameters.

    Parameters
    ----------
    kind : str
        A key of :data:`STAGE_KINDS`.
    parameters : mapping
        The stage's parameters by name, in SI units: lengths [m], angles [rad], and the
        choices of its kind (``mechanisms``, ``curve``, ``jet``, ``impaction``).
    flow : float
        Flow through the stage (ignored by kinds that carry no air). [m^3/s]
    name : str
        The stage's name.

    Returns
    -------
    Stage
        A frozen stage of :mod:`driftdose.transport.chain`; its constructor raises
        :class:`~driftdose.transport.chain.StageInputError` for impossible parameters.

    Examples
    --------
    >>> tube = build_stage("tube", {"length": 1.0, "tube_diameter": 4e-3}, 2.5e-5, "Inlet")
    >>> tube.kind, tube.inclination
    ('tube', 0.0)

    """
    try:
        entry = STAGE_KINDS[kind]
    except KeyError:
        raise ValueError(f"unknown stage kind {kind!r}; valid: {', '.join(STAGE_KINDS)}") from None
    return entry.build(parameters, flow, name)
