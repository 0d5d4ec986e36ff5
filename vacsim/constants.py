"""Physical constants and exact unit definitions, one place for the whole package.

Sources: CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010); exact unit
definitions from CGPM 1954 and NIST SP 811 (2008).
"""

# CODATA 2018 (exact since the 2019 SI redefinition)
GAS_CONSTANT = 8.314462618  # J/(mol K)
BOLTZMANN = 1.380649e-23  # J/K
AVOGADRO = 6.02214076e23  # 1/mol

# Standard values and exact unit definitions (CGPM 1954; NIST SP 811)
STANDARD_ATMOSPHERE = 101325.0  # Pa
TORR = STANDARD_ATMOSPHERE / 760.0  # Pa
MMHG = 133.322387415  # Pa, conventional millimetre of mercury
INHG = 3386.389  # Pa, conventional inch of mercury
PSI = 6894.757293168  # Pa
BAR = 1.0e5  # Pa
MBAR = 100.0  # Pa
STANDARD_GRAVITY = 9.80665  # m/s^2

ZERO_CELSIUS = 273.15  # K
WATER_TRIPLE_POINT_TEMPERATURE = 273.16  # K, IAPWS
WATER_TRIPLE_POINT_PRESSURE = 611.657  # Pa, IAPWS R14-08(2011)
WATER_CRITICAL_TEMPERATURE = 647.096  # K, IAPWS R6-95
WATER_CRITICAL_PRESSURE = 22.064e6  # Pa, IAPWS R6-95

MOLAR_MASS_WATER = 18.015268e-3  # kg/mol, IAPWS R6-95
MOLAR_MASS_AIR = 28.9647e-3  # kg/mol, ISO 2533 dry air
MOLAR_MASS_ETHYLENE_GLYCOL = 62.068e-3  # kg/mol
MOLAR_MASS_PROPYLENE_GLYCOL = 76.095e-3  # kg/mol

# ISO 2533:1975 standard atmosphere, troposphere
ISA_SEA_LEVEL_TEMPERATURE = 288.15  # K
ISA_LAPSE_RATE = 0.0065  # K/m
ISA_MOLAR_MASS_AIR = 0.0289644  # kg/mol (value used by ISO 2533)
ISA_GAS_CONSTANT = 8.31432  # J/(mol K) (value used by ISO 2533)
