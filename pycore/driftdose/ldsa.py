"""Lung-deposited surface area (LDSA): deposited particle surface per volume of inhaled air.

LDSA of a region is the surface area of the particles in one unit volume of air that
deposit in that region when the air is breathed:

    LDSA_r = integral of DF_r(d) dS(d) = sum over sizes of S(d) DF_r(d)   [m^2/m^3]

with dS(d) the airborne surface-area concentration per size and DF_r the regional deposition
fraction of the chosen model. It is the quantity that diffusion-charger surface-area
monitors report, usually in um^2/cm^3 (1 m^2/m^3 = 10^6 um^2/cm^3), for the alveolar and
the tracheobronchial region, using the ICRP 66 deposition curves of a reference worker
(Fissan et al. 2007, J. Nanopart. Res. 9:53-59; Asbach et al. 2009, J. Nanopart. Res.
11:101-109; both from memory). Here the deposition fractions are those of the model and
breathing the user chose, so the value is the one that model gives, not that of a monitor.

Surface area is that of spheres of the model's diameter (volume-equivalent spheres, or for
agglomerates described by an effective density the mobility-equivalent sphere); the real
surface of an agglomerate of primary particles is larger.
"""

from __future__ import annotations

from .dose import DoseResult

__all__ = ["LDSA_GROUPS", "lung_deposited_surface_area"]

LDSA_GROUPS: dict[str, dict[str, tuple[str, ...]]] = {
    "icrp66": {
        "alveolar": ("AI",),
        "tracheobronchial": ("BB", "bb"),
        "total": ("total",),
    },
    "simplified": {
        "alveolar": ("alveolar",),
        "tracheobronchial": ("tracheobronchial",),
        "total": ("total",),
    },
}
"""Regions summed for each LDSA value, by model: alveolar (ICRP AI), tracheobronchial (ICRP
BB + bb) and total (every region, the head airways included)."""


def lung_deposited_surface_area(result: DoseResult) -> dict[str, float]:
    """Alveolar, tracheobronchial and total LDSA of a dose result.

    Parameters
    ----------
    result : DoseResult
        Output of :func:`driftdose.dose.deposited_dose`.

    Returns
    -------
    dict
        ``alveolar``, ``tracheobronchial`` and ``total``: deposited particle surface area
        per volume of inhaled air. [m^2/m^3]

    Notes
    -----
    LDSA_r = S DF_r,S with S the airborne surface-area concentration [m^2/m^3] and DF_r,S the
    surface-weighted deposition fraction of region r (the definition behind diffusion-charger
    LDSA monitors, Fissan et al. 2007; from memory). The regions of each value are in
    :data:`LDSA_GROUPS`.

    Examples
    --------
    >>> from driftdose.distribution import BinnedSpectrum
    >>> from driftdose.deposition import REFERENCE_WORKER
    >>> from driftdose.dose import deposited_dose
    >>> one_size = BinnedSpectrum((100e-9, 200e-9), (1e10, 0.0))  # 10^4 per cm^3 of 100 nm
    >>> r = deposited_dose(one_size, REFERENCE_WORKER, 3600.0)
    >>> ldsa = lung_deposited_surface_area(r)
    >>> s = 1e10 * 3.141592653589793 * (100e-9) ** 2  # 3.14e-4 m^2/m^3 = 314 um^2/cm^3
    >>> abs(ldsa["alveolar"] - s * r.fractions["AI"]["number"]) < 1e-12 * s
    True

    """
    try:
        groups = LDSA_GROUPS[result.model]
    except KeyError:
        raise ValueError(f"no LDSA regions for model {result.model!r}") from None
    surface = result.ambient["surface"]
    return {
        key: sum(result.fractions[r]["surface"] for r in regions) * surface
        for key, regions in groups.items()
    }
