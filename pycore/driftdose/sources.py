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
    "icrp66": (
        "ICRP (1994). Human Respiratory Tract Model for Radiological Protection. ICRP "
        "Publication 66, Ann. ICRP 24(1-3) (regional deposition model, Annex D; reference "
        "breathing parameters, Annex B)."
    ),
    "icrp68": (
        "ICRP (1994). Dose Coefficients for Intakes of Radionuclides by Workers. ICRP "
        "Publication 68, Ann. ICRP 24(4) (reference worker aerosol: 5 um AMAD, density "
        "3 g/cm3, shape factor 1.5)."
    ),
    "hinds1999_ch11": (
        "Hinds, W. C. (1999). Aerosol Technology, 2nd ed. Wiley, New York, section 11.4, "
        "eqs. 11.1-11.5 (simplified algebraic fits to the ICRP 66 deposition model)."
    ),
    "iso7708": (
        "ISO 7708:1995. Air quality - Particle size fraction definitions for health-related "
        "sampling (inhalable, thoracic, respirable and high-risk respirable conventions; "
        "identical to EN 481:1993)."
    ),
    "hatch_choate1929": (
        "Hatch, T., Choate, S. P. (1929). Statistical description of the size properties of "
        "non-uniform particulate substances. J. Franklin Inst. 207:369-387 (conversions "
        "between count, surface and mass medians of a lognormal)."
    ),
}


def cite(*keys: str) -> list[dict[str, str]]:
    """Return ``[{"key": k, "citation": SOURCES[k]}, ...]`` for the given keys."""
    return [{"key": k, "citation": SOURCES[k]} for k in keys]
