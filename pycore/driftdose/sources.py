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
    "clift_gauvin1970": (
        "Clift, R., Gauvin, W. H. (1970). Proc. Chemeca '70, 1:14-28; as given by Clift, "
        "Grace & Weber (1978), Bubbles, Drops and Particles, Table 5.2 (drag of a sphere to "
        "Re 3e5, for settling and, integrated in the equation of motion, stopping distance)."
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
    "icrp66_transport": (
        "ICRP (1994). Human Respiratory Tract Model for Radiological Protection. ICRP "
        "Publication 66, Ann. ICRP 24(1-3), chapter 5 (particle transport: compartments, "
        "clearance rates of Table 17, size-dependent slow-cleared bronchial fraction)."
    ),
    "icrp130": (
        "ICRP (2015). Occupational Intakes of Radionuclides: Part 1. ICRP Publication 130, "
        "Ann. ICRP 44(2) (revised particle transport of the respiratory tract model)."
    ),
    "mckay1979": (
        "McKay, M. D., Beckman, R. J. & Conover, W. J. (1979). A comparison of three methods "
        "for selecting values of input variables in the analysis of output from a computer "
        "code. Technometrics 21(2):239-245 (Latin hypercube sampling)."
    ),
    "spearman1904": (
        "Spearman, C. (1904). The proof and measurement of association between two things. "
        "Am. J. Psychol. 15(1):72-101 (rank correlation)."
    ),
    "hyndman_fan1996": (
        "Hyndman, R. J. & Fan, Y. (1996). Sample quantiles in statistical packages. Am. Stat. "
        "50(4):361-365 (definition 7, linear interpolation between order statistics)."
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
    # --- transport (sampling lines and stages) ---
    "gormley_kennedy1949": (
        "Gormley, P. G., Kennedy, M. (1949). Diffusion from a stream flowing through a "
        "cylindrical tube. Proc. R. Irish Acad. 52A:163-169 (laminar tube diffusion losses)."
    ),
    "brockmann2001": (
        "Brockmann, J. E. (2001). Sampling and transport of aerosols. In Baron, P. A., "
        "Willeke, K. (eds.), Aerosol Measurement, 2nd ed. Wiley, New York, ch. 8 (collected "
        "forms of the tube, settling and bend loss models)."
    ),
    "friedlander1977": (
        "Friedlander, S. K. (1977). Smoke, Dust and Haze. Wiley, New York (turbulent "
        "diffusion deposition velocity 0.04 U Re^-1/4 Sc^-2/3)."
    ),
    "fuchs1964": (
        "Fuchs, N. A. (1964). The Mechanics of Aerosols. Pergamon, Oxford (settling in a "
        "horizontal tube in laminar flow)."
    ),
    "thomas1958": (
        "Thomas, J. W. (1958). Gravity settling of particles in a horizontal tube. J. Air "
        "Pollut. Control Assoc. 8:32-34."
    ),
    "heyder_gebhart1977": (
        "Heyder, J., Gebhart, J. (1977). Gravitational deposition of particles from laminar "
        "aerosol flow through inclined circular tubes. J. Aerosol Sci. 8:289-295."
    ),
    "schwendiman1975": (
        "Schwendiman, L. C., Stegen, G. E., Glissmeyer, J. A. (1975). Report BNWL-SA-5138, "
        "Battelle Pacific Northwest Laboratories (settling in turbulent tube flow)."
    ),
    "pui1987": (
        "Pui, D. Y. H., Romay-Novas, F., Liu, B. Y. H. (1987). Experimental study of particle "
        "deposition in bends of circular cross section. Aerosol Sci. Technol. 7:301-315."
    ),
    "marple_willeke1976": (
        "Marple, V. A., Willeke, K. (1976). Impactor design. Atmos. Environ. 10:891-896 "
        "(Stokes number at the 50 % cut: 0.24 round, 0.59 rectangular jets)."
    ),
    "cheng_yeh1980": (
        "Cheng, Y. S., Yeh, H. C. (1980). Theory of a screen-type diffusion battery. "
        "J. Aerosol Sci. 11:313-320 (fan-model screen penetration, eta_D = 2.7 Pe^-2/3)."
    ),
    "cheng_yeh_brinsko1985": (
        "Cheng, Y. S., Yeh, H. C., Brinsko, K. J. (1985). Use of wire screens as a fan model "
        "filter. Aerosol Sci. Technol. 4:165-174 (diffusion and interception on screens)."
    ),
    "kirsch1978": (
        "Kirsch, A. A., Stechkina, I. B. (1978). The theory of aerosol filtration with "
        "fibrous filters. In Shaw, D. T. (ed.), Fundamentals of Aerosol Science. Wiley, "
        "New York (fan model hydrodynamic factor)."
    ),
    "decarlo2004": (
        "DeCarlo, P. F., Slowik, J. G., Worsnop, D. R., Davidovits, P., Jimenez, J. L. (2004). "
        "Particle morphology and density characterization by combined mobility and "
        "aerodynamic diameter measurements. Part 1: Theory. Aerosol Sci. Technol. "
        "38:1185-1205 (mobility, volume-equivalent and aerodynamic diameters with slip and "
        "the dynamic shape factor; effective density)."
    ),
    "ldsa_fissan2007": (
        "Fissan, H., Neumann, S., Trampe, A., Pui, D. Y. H., Shin, W. G. (2007). Rationale "
        "and principle of an instrument measuring lung deposited nanoparticle surface area. "
        "J. Nanopart. Res. 9:53-59; Asbach, C. et al. (2009). J. Nanopart. Res. 11:101-109 "
        "(LDSA: airborne surface area times the regional deposition fraction of ICRP 66; "
        "cited from memory)."
    ),
    "landahl_herrmann1949": (
        "Landahl, H. D., Herrmann, K. (1949). Sampling of liquid aerosols by wires, "
        "cylinders and slides, and the efficiency of impaction of the droplets. J. Colloid "
        "Sci. 4:103-136 (impaction on an isolated cylinder)."
    ),
    "en689_2018": (
        "EN 689:2018+AC:2019. Workplace exposure - Measurement of exposure by inhalation to "
        "chemical agents - Strategy for testing compliance with occupational exposure limit "
        "values (8-h time-weighted average over the 8-h reference period; 15-min short-term "
        "reference period; cited from memory)."
    ),
    "en529_2005": (
        "EN 529:2005. Respiratory protective devices - Recommendations for selection, use, "
        "care and maintenance (assigned protection factor: ambient over inhaled "
        "concentration; cited from memory)."
    ),
}


def cite(*keys: str) -> list[dict[str, str]]:
    """Return ``[{"key": k, "citation": SOURCES[k]}, ...]`` for the given keys.

    Parameters
    ----------
    *keys : str
        Keys of :data:`SOURCES`.
    """
    return [{"key": k, "citation": SOURCES[k]} for k in keys]
