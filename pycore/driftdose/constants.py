"""Physical constants and reference conditions used across the core. [SI]

Values are the CODATA 2018 exact definitions where they exist, and the conventional
standard gravity (CGPM 1901).
"""

BOLTZMANN = 1.380649e-23
"""Boltzmann constant, exact by the 2019 SI definition. [J/K]"""

GAS_CONSTANT = 8.314462618
"""Molar gas constant, N_A k (CODATA 2018). [J/(mol K)]"""

STANDARD_GRAVITY = 9.80665
"""Standard acceleration of gravity (3rd CGPM, 1901). [m/s^2]"""

AIR_MOLAR_MASS = 0.0289644
"""Molar mass of dry air (U.S. Standard Atmosphere 1976). [kg/mol]"""

WATER_DENSITY = 1000.0
"""Unit density that defines the aerodynamic diameter (common practice). [kg/m^3]"""

T_DEFAULT = 293.15
"""Default temperature, 20 degrees Celsius. [K]"""

P_DEFAULT = 101325.0
"""Default pressure, one standard atmosphere. [Pa]"""
