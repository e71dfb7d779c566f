"""Bibliography of the published methods the core implements, keyed for replies and reports.

Every reply's ``sources`` list names entries of :data:`SOURCES`, so the page and the report
cite what was actually used.
"""

from __future__ import annotations

__all__ = ["SOURCES", "cite"]

SOURCES: dict[str, str] = {
    "sutherland_ussa1976": (
        "Sutherland's law for the viscosity of air with the constants of the U.S. Standard "
        "Atmosphere 1976 (NOAA/NASA/USAF, 1976), eq. 51."
    ),
    "willeke1976": (
        "Willeke, K. (1976). Temperature dependence of particle slip in a gaseous medium. "
        "J. Aerosol Sci. 7:381-387 (mean free path at T and P)."
    ),
    "kim2005": (
        "Kim, J. H., Mulholland, G. W., Kukuck, S. R., Pui, D. Y. H. (2005). Slip correction "
        "measurements of certified PSL nanoparticles using a nanometer DMA for Knudsen number "
        "from 0.5 to 83. J. Res. NIST 110:31-54 (slip correction; mean free path 67.3 nm)."
    ),
    "allen_raabe1985": (
        "Allen, M. D., Raabe, O. G. (1985). Slip correction measurements of spherical solid "
        "aerosol particles in an improved Millikan apparatus. Aerosol Sci. Technol. 4:269-286."
    ),
    "einstein1905": (
        "Einstein, A. (1905). Ann. Phys. 17:549-560 (Stokes-Einstein diffusion coefficient; "
        "rms displacement sqrt(2Dt))."
    ),
    "hinds1999": (
        "Hinds, W. C. (1999). Aerosol Technology, 2nd ed. Wiley, New York (chapters 3, 5, 7: "
        "settling, relaxation time, stopping distance, aerodynamic diameter, diffusion)."
    ),
    "schiller_naumann1933": (
        "Schiller, L., Naumann, A. (1933). Z. Ver. Dtsch. Ing. 77:318-320 (drag beyond the "
        "Stokes regime, Re < 800; see Clift, Grace & Weber 1978, Bubbles, Drops and Particles)."
    ),
}


def cite(*keys: str) -> list[dict[str, str]]:
    """Return ``[{"key": k, "citation": SOURCES[k]}, ...]`` for the given keys."""
    return [{"key": k, "citation": SOURCES[k]} for k in keys]
