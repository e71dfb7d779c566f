"""Calculation ``uncertainty``: how sure the regional dose and the retained burden are.

Takes the inputs of ``burden`` (aerosol as lognormal modes, breathing, exposure, work
pattern, clearance model) and a spread for each uncertain input (every mode's median and
GSD, particle density, shape factor, breathing rate, concentration): none, uniform or
triangular within ± a percentage, or a lognormal factor with a geometric standard deviation.
A Latin-hypercube (or plain Monte Carlo) sample drawn from a recorded seed gives the 5th,
50th and 95th percentiles of the dose per region over the exposure and of the retained
burden, and the Spearman rank correlation of each output with each input, naming the input
that drives the spread most.

The page runs a propagation in blocks of :data:`BLOCK` samples (``block`` = 1, 2, ...), to
show progress and stop when the inputs change; the engine keeps the samples of the newest
inputs between blocks. ``block`` 0 (the default) computes every sample at once; both ways
give the same numbers.
"""

from __future__ import annotations

import json
import math
from typing import Any

from ..compose.aerosol import ModeSpec, aerosol_from_modes, scaled_modes
from ..distribution import WEIGHTS, Multimodal
from ..retention import deposition_rates, split_deposit
from ..retention.model import RATE_SETS, network
from ..sources import cite
from ..uncertainty import (
    INPUTS,
    DepositionTables,
    Propagation,
    Spread,
    design,
    propagate,
    table_nodes,
)
from . import burden_inputs
from .dose_rows import DOSE_UNITS
from .exposure_fields import particle_description
from .fields import Field, FieldError
from .labels import REGION_LABELS, WEIGHT_WORDS
from .range_fields import BLOCK, INPUT_LABELS, RANGE_FIELDS
from .reply import quantity, row

TITLE = "Ranges of dose and retained burden (uncertainty)"

DOSE_REGIONS = ("ET1", "ET2", "BB", "bb", "AI", "total")
BURDEN_REGIONS = ("AI", "lungs", "LN")
PERCENTILES = (5.0, 50.0, 95.0)

FIELDS: tuple[Field, ...] = burden_inputs.FIELDS + RANGE_FIELDS

_CACHE: dict[str, Any] = {}


def spreads_of(v: dict[str, Any]) -> dict[str, Spread]:
    """The spread of every input, from the validated fields."""
    out = {}
    for name in INPUTS:
        kind = v[f"{name}_spread"]
        p = v[f"{name}_percent"] / 100.0
        if kind in ("uniform", "triangular"):
            out[name] = Spread(kind, 1.0 - p, 1.0 + p)
        elif kind == "lognormal":
            out[name] = Spread(kind, gsd=v[f"{name}_gsd"])
        else:
            out[name] = Spread()
    return out


def describe_spread(s: Spread) -> str:
    """Words for a spread, as the record shows it."""
    if s.kind in ("uniform", "triangular"):
        pct = (s.high - 1.0) * 100.0
        return f"{s.kind}, ± {pct:.4g} % (factor {s.low:.4g} to {s.high:.4g})"
    if s.kind == "lognormal":
        lo, hi = s.bounds()
        return f"lognormal factor, GSD {s.gsd:.4g} (drawn from {lo:.3g} to {hi:.3g})"
    return "none (as entered)"


def _builder(v: dict[str, Any], entered: tuple[ModeSpec, ...]) -> Any:
    """Factors -> the sample's modes, converted to the models' diameters as the deposition
    calculation converts what was entered (diameter type, density basis)."""

    def build(f: dict[str, float]) -> Multimodal:
        desc = particle_description(v, f.get("density", 1.0), f.get("shape_factor", 1.0))
        modes = scaled_modes(
            entered, f.get("median", 1.0), f.get("gsd", 1.0), f.get("concentration", 1.0)
        )
        return aerosol_from_modes(modes, desc).distribution

    return build


def _check_ranges(v: dict[str, Any], spreads: dict[str, Spread], nominal: Multimodal) -> None:
    lo = {k: s.bounds()[0] for k, s in spreads.items()}
    hi = {k: s.bounds()[1] for k, s in spreads.items()}
    gsd_min = min(m.gsd for m in nominal.modes) * lo["gsd"]
    if gsd_min <= 1.01:
        raise FieldError(
            "gsd_spread",
            f"The GSD range reaches {gsd_min:.3g}; every mode's GSD must stay above 1.01. "
            "Narrow the range.",
        )
    rho_lo, rho_hi = v["particle_density"] * lo["density"], v["particle_density"] * hi["density"]
    if rho_lo < 100.0 or rho_hi > 25000.0:
        raise FieldError("density_spread", "The density range must stay within 0.1 to 25 g/cm³.")
    chi_lo, chi_hi = v["shape_factor"] * lo["shape_factor"], v["shape_factor"] * hi["shape_factor"]
    if chi_lo < 1.0 or chi_hi > 5.0:
        raise FieldError(
            "shape_factor_spread",
            f"The shape factor range ({chi_lo:.3g} to {chi_hi:.3g}) must stay within 1 to 5; "
            "a shape factor of 1 (spheres) can only grow.",
        )
    for m in nominal.modes:
        if m.cmd * lo["median"] < 0.5e-9 or m.median("mass") * hi["median"] > 200e-6:
            raise FieldError("median_spread", "The median range leaves 1 nm to 100 µm.")


def _milestone_responses(v: dict[str, Any]) -> dict[str, tuple[float, list[float]]]:
    """Modal responses g_k(t) at the reported moments of the burden ranges."""
    net = network(v["transport_rates"])
    schedule = burden_inputs.schedule_of(v)
    marks = {k: t for k, _, t in burden_inputs.milestones(v)}
    keep = ("life", "after") if v["exposure_pattern"] == "work" else ("year", "after")
    return {k: (marks[k], net.responses(schedule, marks[k])) for k in keep if k in marks}


def _outputs_fn(v: dict[str, Any], responses: dict[str, Any]) -> Any:
    """Outputs of one sample: dose per region and retained burden at the moments reported.

    The burden is linear in the compartment inputs u: each region's amount is R u with R the
    summed rows of V diag(g(t)) W. A sample's burden is taken as the burden calculation's
    own nominal value times (R u_sample) / (R u_nominal), so that a sample at the nominal
    inputs reproduces :func:`driftdose.retention.retained_burden` exactly.
    """
    rate_set = v["transport_rates"]
    net = network(rate_set)
    rs = RATE_SETS[rate_set]
    duration = v["exposure_duration"]
    n = len(net.order)
    groups = {r: [net.index(c) for c in rs.groups[r]] for r in ("BB", "bb", "AI", "LN")}
    groups_of = {"AI": ("AI",), "lungs": ("BB", "bb", "AI"), "LN": ("LN",)}
    rows: dict[str, list[float]] = {}
    for key, (_, g) in responses.items():
        vg = [[net.V[i][k] * g[k] for k in range(n)] for i in range(n)]
        for region in BURDEN_REGIONS:
            idx = [i for grp in groups_of[region] for i in groups[grp]]
            rows[f"{key}_{region}"] = [
                math.fsum(vg[i][k] * net.W[k][j] for i in idx for k in range(n)) for j in range(n)
            ]
    exact_cache: dict[str, Any] = {}

    def exact_burden(comp: dict[str, float]) -> dict[str, float]:
        z = net.modal_input({c: x for c, x in comp.items() if c in net.order})
        out = {}
        for key, (_, g) in responses.items():
            x = net.amounts(z, g)
            reg = {name: math.fsum(x[i] for i in idx) for name, idx in groups.items()}
            out[f"{key}_AI"] = reg["AI"]
            out[f"{key}_lungs"] = reg["BB"] + reg["bb"] + reg["AI"]
            out[f"{key}_LN"] = reg["LN"]
        return out

    def outputs(rates: dict[str, dict[str, float]], _vf: float) -> dict[str, float]:
        out: dict[str, float] = {}
        for w in WEIGHTS:
            r = rates[w]
            for region in DOSE_REGIONS:
                out[f"dose_{region}_{w}"] = r[region] * duration
            comp = split_deposit(rate_set, r)
            u = [comp.get(c, 0.0) for c in net.order]
            fast = {k: sum([a * b for a, b in zip(row, u, strict=True)]) for k, row in rows.items()}
            if w not in exact_cache:  # the first call is the nominal one
                exact_cache[w] = (exact_burden(comp), fast)
            exact, base = exact_cache[w]
            for k, value in fast.items():
                b = base[k]
                out[f"burden_{k}_{w}"] = exact[k] * (value / b) if b > 0.0 else value
        return out

    return outputs


def _nodes(nominal: float, lo: float, hi: float) -> list[float]:
    """Table nodes from the smallest to the largest drawn value (nominal included)."""
    return table_nodes(nominal, min(lo, nominal) / nominal, max(hi, nominal) / nominal)


def _context(v: dict[str, Any]) -> dict[str, Any]:
    key = json.dumps({k: val for k, val in v.items() if k != "block"}, sort_keys=True, default=str)
    if _CACHE.get("key") == key:
        return _CACHE["context"]
    if v["model"] != "icrp66":
        raise FieldError(
            "model",
            "The ranges need the regional deposition of the full ICRP 66 model; choose it.",
        )
    if v["size_source"] != "lognormal":
        raise FieldError(
            "size_source",
            "The ranges are computed for lognormal modes; describe the aerosol by modes.",
        )
    dist, subject, _, entered = burden_inputs.aerosol_and_subject(v)
    spreads = spreads_of(v)
    _check_ranges(v, spreads, dist)
    n, seed, method = v["samples"], v["seed"], v["sampling_method"]
    factors = design(spreads, n, seed, method)
    nominal = {"density": dist.modes[0].density, "shape_factor": dist.modes[0].shape_factor}
    span = {}
    for name, key in (("density", "model_density"), ("shape_factor", "model_shape_factor")):
        fs = factors[name]
        lo = particle_description(
            v, min(fs) if name == "density" else 1.0, min(fs) if name == "shape_factor" else 1.0
        )
        hi = particle_description(
            v, max(fs) if name == "density" else 1.0, max(fs) if name == "shape_factor" else 1.0
        )
        span[name] = (getattr(lo, key), getattr(hi, key))
    thermo = v["thermodynamic_convention"]
    exact = deposition_rates(dist, subject, thermodynamic=thermo)
    rows = _milestone_responses(v)
    ctx = {
        "dist": dist,
        "subject": subject,
        "spreads": spreads,
        "tables": DepositionTables(
            subject,
            _nodes(nominal["density"], *span["density"]),
            _nodes(nominal["shape_factor"], *span["shape_factor"]),
            thermo,
        ),
        "nominal": nominal,
        "exact": exact,
        "build": _builder(v, entered),
        "outputs": _outputs_fn(v, rows),
        "rows": rows,
        "done": Propagation(n, seed, method, {k: [] for k in spreads}, {}),
    }
    ctx["nominal_outputs"] = ctx["outputs"](exact, 1.0)
    _CACHE.clear()
    _CACHE.update({"key": key, "context": ctx})
    return ctx


def run(v: dict[str, Any]) -> dict[str, Any]:
    """Compute the uncertainty reply (or one block of it) from validated SI inputs."""
    ctx = _context(v)
    n = v["samples"]
    target = n if v["block"] == 0 else min(n, v["block"] * BLOCK)
    prev: Propagation = ctx["done"]
    have = len(next(iter(prev.outputs.values()), []))
    if target > have:
        more = propagate(
            ctx["spreads"],
            n,
            v["seed"],
            ctx["build"],
            ctx["subject"],
            ctx["nominal"],
            ctx["outputs"],
            ctx["exact"],
            v["sampling_method"],
            samples=range(have, target),
            tables=ctx["tables"],
        )
        for k, vals in more.factors.items():
            prev.factors[k].extend(vals)
        for k, vals in more.outputs.items():
            prev.outputs.setdefault(k, []).extend(vals)
        have = target
    progress = {"done": have, "total": n}
    if have < n:
        return {
            "results": {"progress": quantity(f"Samples computed (of {n})", float(have))},
            "curves": {"progress": progress},
            "warnings": [],
            "sources": [],
        }
    part = Propagation(
        n,
        v["seed"],
        v["sampling_method"],
        {k: vals[:n] for k, vals in prev.factors.items()},
        {k: vals[:n] for k, vals in prev.outputs.items()},
    )
    return _reply(v, ctx, part, progress)


def _reply(
    v: dict[str, Any], ctx: dict[str, Any], prop: Propagation, progress: dict[str, int]
) -> dict[str, Any]:
    summary = prop.summary(PERCENTILES)
    spreads: dict[str, Spread] = ctx["spreads"]
    method = "Latin hypercube" if v["sampling_method"] == "lhs" else "plain Monte Carlo"
    results: dict[str, Any] = {
        "propagation": {
            "label": "Propagation",
            "text": f"{prop.n} samples, {method}, seed {v['seed']}",
            "note": "",
        }
    }
    for name in INPUTS:
        results[f"spread_{name}"] = {
            "label": f"Uncertainty of the {INPUT_LABELS[name]}",
            "text": describe_spread(spreads[name]),
            "note": "",
        }
    hours = v["exposure_duration"] / 3600.0
    bands: dict[str, Any] = {
        "keys": list(DOSE_REGIONS),
        "regions": [REGION_LABELS[r] for r in DOSE_REGIONS],
        "per": f"{hours:g} h",
    }
    for w in WEIGHTS:
        factor, unit, si_unit = DOSE_UNITS[w]
        word = WEIGHT_WORDS[w]
        for region in DOSE_REGIONS:
            key = f"dose_{region}_{w}"
            name = REGION_LABELS[region]
            _rows(
                results,
                f"range_{key}",
                f"{name}: {word} deposited in {hours:g} h",
                summary[key],
                ctx["nominal_outputs"][key],
                factor,
                unit,
                si_unit,
            )
        for tag, p in (("p5", 5.0), ("p50", 50.0), ("p95", 95.0)):
            bands[f"{w}_{tag}"] = {
                "label": f"{word.capitalize()} deposited in {hours:g} h, {p:g}th percentile",
                "unit": unit,
                "y": [summary[f"dose_{r}_{w}"]["percentiles"][p] / factor for r in DOSE_REGIONS],
            }
        bands[f"{w}_nominal"] = {
            "label": f"{word.capitalize()} deposited in {hours:g} h, as entered",
            "unit": unit,
            "y": [ctx["nominal_outputs"][f"dose_{r}_{w}"] / factor for r in DOSE_REGIONS],
        }
    marks = {k: lab for k, lab, _ in burden_inputs.milestones(v)}
    for key in ctx["rows"]:
        for w in WEIGHTS:
            factor, unit, si_unit = burden_inputs.UNITS[w]
            for region in BURDEN_REGIONS:
                out_key = f"burden_{key}_{region}_{w}"
                _rows(
                    results,
                    f"range_{out_key}",
                    f"Retained {WEIGHT_WORDS[w]}, {burden_inputs.REGION_LABELS[region]}, "
                    f"{marks[key]}",
                    summary[out_key],
                    ctx["nominal_outputs"][out_key],
                    factor,
                    unit,
                    si_unit,
                )
    uncertain = [name for name in INPUTS if spreads[name].uncertain]
    table_rows = []
    shown = ["dose_AI_mass", "dose_total_mass", "dose_AI_number"]
    life = "life" if "life" in ctx["rows"] else next(iter(ctx["rows"]))
    shown.append(f"burden_{life}_AI_mass")
    for name in uncertain:
        table_rows.append(
            {
                "input": INPUT_LABELS[name],
                "quantities": [
                    {
                        "label": f"Rank correlation with {_short(k)}",
                        "unit": "1",
                        "value": summary[k]["spearman"].get(name),
                    }
                    for k in shown
                ],
            }
        )
    results["rank_correlations"] = {
        "label": "Spearman rank correlation of each output with each uncertain input",
        "rows": table_rows,
    }
    warnings = [
        "Percentiles describe the spread that follows from the ranges you entered; they are no "
        "better than those ranges, and leave out the uncertainty of the models themselves.",
        "The breathing-rate factor scales the air inhaled; the deposition fractions stay those "
        "of the breathing chosen.",
    ]
    if prop.n < 200:
        warnings.append(
            f"With {prop.n} samples the 5th and 95th percentiles are rough; use 1000 or more."
        )
    if not uncertain:
        warnings.append("No input has a spread: every sample equals the single calculation.")
    return {
        "results": results,
        "curves": {"dose_bands": bands, "progress": progress},
        "warnings": warnings,
        "sources": cite(
            "icrp66", "icrp66_transport", "mckay1979", "spearman1904", "hyndman_fan1996"
        ),
    }


def _short(key: str) -> str:
    parts = key.split("_")
    if parts[0] == "dose":
        return f"dose {parts[1]} by {parts[2]}"
    return f"retained {parts[-1]} in {parts[-2]}"


def _rows(
    results: dict[str, Any],
    key: str,
    label: str,
    entry: dict[str, Any],
    nominal: float,
    factor: float,
    unit: str,
    si_unit: str,
) -> None:
    for tag, p in (("p5", 5.0), ("p50", 50.0), ("p95", 95.0)):
        si = entry["percentiles"][p]
        results[f"{key}_{tag}"] = row(f"{label}, {p:g}th percentile", si, factor, unit, si_unit)
    results[f"{key}_nominal"] = row(f"{label}, as entered", nominal, factor, unit, si_unit)
    lead = entry["leading"]
    results[f"{key}_leading"] = {
        "label": f"{label}: input driving the spread most",
        "text": INPUT_LABELS[lead] if lead else "none",
        "note": "",
    }
