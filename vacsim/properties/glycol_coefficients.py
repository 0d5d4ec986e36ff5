"""Melinder's double-polynomial coefficients for aqueous ethylene and propylene glycol.

Source: Å. Melinder, *Properties of Secondary Working Fluids for Indirect Systems*,
2nd ed., International Institute of Refrigeration (IIR), Paris, 2010, "Ethylene glycol"
and "Propylene glycol" chapters: each property is

    f(x, t) = sum_{i, j} c_ij (x - x_m)^i (t - t_m)^j,   i = 0..5, j = 0..3, i + j <= 5

with x the glycol concentration in mass per cent, t the temperature in degC and
x_m, t_m the mean concentration and temperature of the data Melinder fitted.
Transcribed from the tables as reproduced in the CoolProp repository
(dev/incompressible_liquids/CPIncomp/MelinderFluids.py, classes EGSolution and
PGSolution, reference "Melinder2010"); the numbers are Melinder's, not CoolProp's.

Each matrix has one row per (i, j) pair, in Melinder's order given by EXPONENTS, and
five columns: freezing point [degC], density [kg/m^3], specific heat capacity
[J/(kg K)], thermal conductivity [W/(m K)], ln(dynamic viscosity / mPa s).
The freezing point depends on concentration only: its j > 0 entries are residues of
the fit and Melinder's freezing curve uses the j = 0 entries alone.
"""

from __future__ import annotations

import numpy as np

# (i, j): power of (x - x_m) and of (t - t_m), in the order of the rows below.
EXPONENTS = (
    (0, 0), (0, 1), (0, 2), (0, 3),
    (1, 0), (1, 1), (1, 2), (1, 3),
    (2, 0), (2, 1), (2, 2), (2, 3),
    (3, 0), (3, 1), (3, 2),
    (4, 0), (4, 1),
    (5, 0),
)  # fmt: skip

# Column order of the matrices.
PROPERTIES = ("freezing_point", "density", "heat_capacity", "thermal_conductivity", "ln_viscosity")

# Ethylene glycol: x_m [mass %], t_m [degC], coefficients (Melinder 2010).
ETHYLENE_X_MEAN = 30.8462
ETHYLENE_T_MEAN = 31.728
ETHYLENE = np.array([
    [-15.25, 1034, 3737, 0.472, 0.4705],
    [-0.000001566, -0.4781, 2.93, 0.0008903, -0.0255],
    [-0.0000002278, -0.002692, -0.004675, -0.000001058, 0.0001782],
    [0.000000002169, 0.000004725, -0.00001389, -0.000000002789, -0.0000007669],
    [-0.808, 1.311, -17.99, -0.004286, 0.02471],
    [-0.000001339, -0.006876, 0.1046, -0.00001473, -0.0001171],
    [0.00000002047, 0.00004805, -0.0004147, 0.0000001059, 0.000001052],
    [-0.00000000002717, 0.0000000169, 0.0000001847, -0.0000000001142, -0.00000001634],
    [-0.01334, 0.0000749, -0.09933, 0.00001747, 0.000003328],
    [0.00000006322, 0.00007855, 0.0003516, 0.00000006814, 0.000001086],
    [0.0000000002373, -0.0000003995, 0.000005109, -0.000000003612, 0.00000001051],
    [-0.000000000002183, 0.000000004982, -0.00000007138, 0.000000000002365, -0.0000000006475],
    [-0.00007293, -0.0001062, 0.00261, 0.00000003017, 0.000001659],
    [0.000000001764, 0.000001229, -0.000001189, -0.000000002412, 0.000000003157],
    [-0.00000000002442, -0.00000001153, -0.0000001643, 0.00000000004004, 0.0000000004063],
    [0.000001006, -0.0000009623, 0.00001537, -0.000000001322, 0.00000003089],
    [-0.00000000007662, -0.00000007211, -0.0000004272, 0.00000000002555, 0.0000000001831],
    [0.00000000114, 0.00000004891, -0.000001618, 0.00000000002678, -0.000000001865],
])  # fmt: skip

# Propylene glycol: x_m [mass %], t_m [degC], coefficients (Melinder 2010).
PROPYLENE_X_MEAN = 30.7031
PROPYLENE_T_MEAN = 32.7083
PROPYLENE = np.array([
    [-13.25, 1018, 3882, 0.4513, 0.6837],
    [-0.0000382, -0.5406, 2.699, 0.0007955, -0.03045],
    [0.0000007865, -0.002666, -0.001659, 0.00000003482, 0.0002525],
    [-0.000000001733, 0.00001347, -0.00001032, -0.000000005966, -0.000001399],
    [-0.6631, 0.7604, -13.04, -0.004795, 0.03328],
    [0.000006774, -0.00945, 0.0507, -0.00001678, -0.0003984],
    [-0.00000006242, 0.00005541, -0.00004752, 0.00000008941, 0.000004332],
    [-0.0000000007819, -0.0000001343, 0.000001522, 0.0000000001493, -0.0000000186],
    [-0.01094, -0.002498, -0.1598, 0.00002076, 0.00005453],
    [0.00000005332, 0.000027, 0.00009534, 0.0000001563, -0.000000086],
    [-0.000000004169, -0.0000004018, 0.00001167, -0.000000004615, -0.00000001593],
    [0.00000000003288, 0.000000003376, -0.0000000487, 0.000000000009897, -0.00000000004465],
    [-0.0002283, -0.000155, 0.0003539, -0.00000009083, -0.0000039],
    [-0.00000001131, 0.000002829, 0.00003102, -0.000000002518, 0.0000001054],
    [0.0000000001918, -0.000000007175, -0.000000295, 0.00000000006543, -0.000000001589],
    [-0.000003409, -0.000001131, 0.00005, -0.0000000005952, -0.00000001587],
    [0.00000000008035, -0.00000002221, -0.0000007135, -0.00000000003605, 0.0000000004475],
    [0.00000001465, 0.00000002342, -0.0000004959, 0.00000000002104, 0.000000003564],
])  # fmt: skip
