"""The lab-solvent table: identity, vapor-pressure correlation, solubility, flammability.

Data only; the functions that use it live in :mod:`vacsim.properties.solvents`. Every row
names its sources. Coefficients are the published numbers in the published form; the
form of each correlation (its ``kind``) is documented beside its implementation in
:mod:`vacsim.properties.solvents`.

Sources used below (short tags in the rows):

POLING-W
    Poling, Prausnitz & O'Connell, *The Properties of Gases and Liquids*, 5th ed.
    (McGraw-Hill, 2001), Appendix A, Section C: Wagner (2.5, 5) coefficients with the
    Tc and Pc listed there; valid from the tabulated Tmin to Tc.
POLING-A
    Same book, Appendix A, Section C: Antoine coefficients, log10 P[bar] = A - B/(T[degC] + C),
    valid between the tabulated Tmin and Tmax.
PERRY
    Perry's Chemical Engineers' Handbook, 8th ed. (Green & Perry, 2008), Table 2-8
    "Vapor Pressure of Inorganic and Organic Liquids" (DIPPR 801 project data, DIPPR
    equation 101), valid between the tabulated Tmin and Tmax.
VDI
    VDI Heat Atlas, 2nd ed. (Springer, 2010), section D3.1, PPDS vapor-pressure equation
    (the Wagner 2.5, 5 form), from the melting point to Tc.
LANDOLT
    Landolt-Boernstein New Series IV/20, *Vapor Pressure of Chemicals* (Dykyj, Svoboda,
    Wilhoit, Frenkel & Hall, Springer, 1999-2001): Antoine, log10 P[kPa] = A - B/(T[K] + C).
SANDER
    Sander, R. (2023), Compilation of Henry's law constants (version 5.0.0) for water as
    solvent, Atmos. Chem. Phys. 23, 10901-12440, doi:10.5194/acp-23-10901-2023. The entry
    used (the compilation lists several per species, most reliable type first) is named in
    each row. Values read from the compilation's species pages at henrys-law.org (for most
    species the page as of version 4.0, 2015, whose named entries version 5.0.0 carries over;
    ethyl acetate from the 5.0.0 page); rows marked "from memory" were not re-read.
NFPA497 / IEC60079
    NFPA 497 (2008 ed.) and IEC 60079-20-1 (2010) tables of flammability limits and closed-cup
    flash points (read through the transcription in the ``chemicals`` package); rows marked
    "from memory" quote NFPA 325 / safety-data-sheet values not re-checked.
CRC-SOL
    CRC Handbook of Chemistry and Physics, 97th ed. (2016), "Aqueous Solubility of Organic
    Compounds" (values from memory, not re-checked; None = miscible in all proportions).

Molar masses are computed from the IUPAC 2013 standard atomic weights (water: IAPWS R6-95).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..constants import MOLAR_MASS_WATER


@dataclass(frozen=True)
class VaporPressureCorrelation:
    """One published vapor-pressure correlation with its stated range.

    Attributes
    ----------
    kind : str
        Name of the equation form, a key of ``vacsim.properties.solvents.VAPOR_PRESSURE_EQUATIONS``.
    coefficients : tuple of float
        The published coefficients, in the order the equation form documents.
    t_min, t_max : float
        Validity range stated by the source [K].
    source : str
        Citation of the coefficients.
    """

    kind: str
    coefficients: tuple[float, ...]
    t_min: float
    t_max: float
    source: str


@dataclass(frozen=True)
class Compound:
    """A lab solvent: identity, vapor pressure, behaviour in water, fire data.

    Attributes
    ----------
    name : str
        Canonical name (lower case except where chemistry spells it otherwise).
    aliases : tuple of str
        Other names and the trade's abbreviations ("IPA", "DCM", "EtOAc").
    cas : str
        CAS registry number.
    molar_mass : float
        Molar mass [kg/mol].
    vapor_pressure : VaporPressureCorrelation
        Saturation-pressure correlation of the pure liquid.
    henry_hcp : float or None
        Henry's-law solubility constant Hcp in water at 298.15 K [mol/(m^3 Pa)], None if not on file.
    henry_dlnh_dinvt : float or None
        Its temperature coefficient d ln Hcp / d(1/T) [K], None if not published.
    henry_source : str
        Citation of the Henry's-law data (entry within Sander's compilation).
    solubility_mass_fraction : float or None
        Mass fraction of the compound in water saturated with it at 25 degC [-]; None = miscible.
    solubility_source : str
        Citation of the solubility.
    lower_flammability_limit, upper_flammability_limit : float or None
        Flammability limits in air as volume fractions [-]; None = not flammable or no limit
        on file (see ``flammability_source``).
    flash_point : float or None
        Closed-cup flash point [K]; None = none or not on file.
    flammability_source : str
        Citation of the limits and flash point.
    """

    name: str
    aliases: tuple[str, ...]
    cas: str
    molar_mass: float
    vapor_pressure: VaporPressureCorrelation
    henry_hcp: float | None
    henry_dlnh_dinvt: float | None
    henry_source: str
    solubility_mass_fraction: float | None
    solubility_source: str
    lower_flammability_limit: float | None
    upper_flammability_limit: float | None
    flash_point: float | None
    flammability_source: str


_POLING_W = "Poling, Prausnitz & O'Connell, Properties of Gases and Liquids, 5th ed. (2001), App. A, Wagner (2.5,5)"
_POLING_A = "Poling, Prausnitz & O'Connell, Properties of Gases and Liquids, 5th ed. (2001), App. A, Antoine"
_PERRY = "Perry's Chemical Engineers' Handbook, 8th ed. (2008), Table 2-8 (DIPPR 801, eq. 101)"
_VDI = "VDI Heat Atlas, 2nd ed. (2010), D3.1, PPDS vapor-pressure equation"
_LANDOLT = "Landolt-Boernstein IV/20, Vapor Pressure of Chemicals (Dykyj et al., 1999-2001), Antoine"
_IAPWS = "IAPWS SR1-86(1992), Wagner & Pruss 1993, J. Phys. Chem. Ref. Data 22, 783 (vacsim.properties.water)"

_NFPA = "NFPA 497 (2008), closed-cup flash point"
_IEC = "IEC 60079-20-1 (2010), closed-cup flash point"
_CRC_SOL = "CRC Handbook 97th ed., Aqueous Solubility of Organic Compounds (from memory)"
_MISCIBLE = "miscible with water (CRC Handbook 97th ed., Physical Constants of Organic Compounds)"


def _sander(entry: str) -> str:
    return f"Sander 2023, ACP 23, 10901, entry {entry}"


def _wagner(tc, pc, a, b, c, d, *, t_min, t_max, source=_POLING_W) -> VaporPressureCorrelation:
    return VaporPressureCorrelation("wagner_25_5", (tc, pc, a, b, c, d), t_min, t_max, source)


def _dippr101(c1, c2, c3, c4, c5, *, t_min, t_max) -> VaporPressureCorrelation:
    return VaporPressureCorrelation("dippr_101", (c1, c2, c3, c4, c5), t_min, t_max, _PERRY)


def _antoine(a, b, c, pressure_unit, celsius, *, t_min, t_max, source) -> VaporPressureCorrelation:
    """Antoine row; pressure_unit [Pa] and whether the source's T is in degC."""
    return VaporPressureCorrelation("antoine", (a, b, c, pressure_unit, 1.0 if celsius else 0.0), t_min, t_max, source)


COMPOUNDS: tuple[Compound, ...] = (
    Compound(
        "water", ("H2O",), "7732-18-5", MOLAR_MASS_WATER,
        VaporPressureCorrelation("iapws_water", (), 273.16, 647.096, _IAPWS),
        None, None, "the solvent itself",
        None, "the solvent itself",
        None, None, None, "not flammable",
    ),
    Compound(
        "methanol", ("MeOH", "methyl alcohol", "wood alcohol"), "67-56-1", 32.04186e-3,
        _wagner(512.64, 8092000.0, -8.63571, 1.17982, -2.479, -1.024, t_min=175.47, t_max=512.64),
        2.2, 5200.0, _sander("Sander et al. (2011), from memory"),
        None, _MISCIBLE,
        0.06, 0.36, 285.15, _NFPA,
    ),
    Compound(
        "ethanol", ("EtOH", "ethyl alcohol", "alcohol"), "64-17-5", 46.06844e-3,
        _wagner(513.92, 6132000.0, -8.68587, 1.17831, -4.8762, 1.588, t_min=159.05, t_max=513.92),
        1.9, 6400.0, _sander("Sander et al. (2011)"),
        None, _MISCIBLE,
        0.033, 0.19, 286.15, _NFPA,
    ),
    Compound(
        "isopropanol", ("2-propanol", "IPA", "isopropyl alcohol", "propan-2-ol", "iPrOH"), "67-63-0", 60.09502e-3,
        _wagner(508.3, 4763000.0, -8.73656, 2.1624, -8.70785, 4.77927, t_min=185.258, t_max=508.3),
        1.3, 7500.0, _sander("Sander et al. (2011), from memory"),
        None, _MISCIBLE,
        0.02, 0.127, 285.15, _NFPA,
    ),
    Compound(
        "1-butanol", ("n-butanol", "butanol", "butan-1-ol", "n-butyl alcohol", "BuOH"), "71-36-3", 74.1216e-3,
        _wagner(563.05, 4424000.0, -8.40615, 2.2301, -8.2486, -0.711, t_min=183.85, t_max=563.05),
        1.2, 7500.0, _sander("Sander et al. (2011)"),
        0.073, _CRC_SOL,
        0.014, 0.112, 309.15, _NFPA,
    ),
    Compound(
        "acetone", ("propanone", "2-propanone", "dimethyl ketone"), "67-64-1", 58.07914e-3,
        _wagner(508.1, 4702000.0, -7.55098, 1.60784, -1.9944, -3.2002, t_min=178.45, t_max=508.1),
        0.27, 5500.0, _sander("Sander et al. (2011)"),
        None, _MISCIBLE,
        0.025, 0.128, 253.15, _NFPA,
    ),
    Compound(
        "ethyl acetate", ("EtOAc", "ethyl ethanoate"), "141-78-6", 88.10512e-3,
        _dippr101(66.824, -6227.6, -6.41, 1.7914e-17, 6.0, t_min=189.6, t_max=523.3),
        6.5e-2, 5600.0, _sander("Burkholder et al. (2019)"),
        0.077, _CRC_SOL,
        0.02, 0.115, 269.15, _NFPA,
    ),
    Compound(
        "diethyl ether", ("ether", "Et2O", "ethoxyethane", "ethyl ether"), "60-29-7", 74.1216e-3,
        _wagner(466.74, 3650000.0, -7.43301, 1.78847, -2.4793, -3.2811, t_min=156.85, t_max=466.74),
        # the compilation's review entry (Steward et al. 1973) is at 310 K with no T dependence
        1.1e-2, 6600.0, _sander("Hiatt (2013), measured"),
        0.060, _CRC_SOL,
        0.019, 0.36, 228.15, _NFPA,
    ),
    Compound(
        "tetrahydrofuran", ("THF", "oxolane"), "109-99-9", 72.10572e-3,
        _dippr101(54.898, -5305.4, -4.7627, 1.4291e-17, 6.0, t_min=164.65, t_max=540.15),
        0.14, None, "HSDB 7.1e-5 atm m3/mol as listed in Sander 2023 (from memory, not re-read)",
        None, _MISCIBLE,
        0.02, 0.118, 259.15, _NFPA,
    ),
    Compound(
        "dichloromethane", ("DCM", "methylene chloride", "CH2Cl2"), "75-09-2", 84.93258e-3,
        _dippr101(101.6, -6541.6, -12.247, 1.2311e-05, 2.0, t_min=178.01, t_max=510.0),
        3.0e-3, None, "HSDB 3.25e-3 atm m3/mol as listed in Sander 2023 (from memory, not re-read)",
        0.013, _CRC_SOL,
        # hard to ignite; limits need a strong source and are often quoted as 'non-flammable'
        0.13, 0.23, None, "NFPA 325 (1994) (from memory); no flash point",
    ),
    Compound(
        "chloroform", ("trichloromethane", "CHCl3"), "67-66-3", 119.37764e-3,
        _dippr101(146.43, -7792.3, -20.614, 0.024578, 1.0, t_min=207.15, t_max=536.4),
        2.5e-3, 4500.0, _sander("Staudinger and Roberts (2001), from memory"),
        0.0080, _CRC_SOL,
        None, None, None, "not flammable (NFPA 325, from memory)",
    ),
    Compound(
        "hexane", ("n-hexane",), "110-54-3", 86.17536e-3,
        _wagner(507.9, 3035000.0, -7.53998, 1.83759, -2.5438, -3.163, t_min=177.83, t_max=507.9),
        6.1e-6, 3800.0, _sander("Abraham and Matteoli (1988)"),
        9.5e-6, _CRC_SOL,
        0.011, 0.075, 250.15, _NFPA,
    ),
    Compound(
        "heptane", ("n-heptane",), "142-82-5", 100.20194e-3,
        _dippr101(87.829, -6996.4, -9.8802, 7.2099e-06, 2.0, t_min=182.57, t_max=540.2),
        None, None, "not on file",
        3.4e-6, _CRC_SOL,
        0.01, 0.067, 269.15, _NFPA,
    ),
    Compound(
        "toluene", ("methylbenzene", "toluol", "PhMe"), "108-88-3", 92.13842e-3,
        _wagner(591.8, 4106000.0, -7.316, 1.59425, -1.93165, -3.7222, t_min=178.18, t_max=591.8),
        1.5e-3, 4300.0, _sander("Staudinger and Roberts (2001)"),
        5.3e-4, _CRC_SOL,
        0.011, 0.071, 277.15, _NFPA,
    ),
    Compound(
        "dimethyl sulfoxide", ("DMSO", "dimethylsulfoxide", "methyl sulfoxide"), "67-68-5", 78.13344e-3,
        _dippr101(56.273, -7620.6, -4.6279, 4.3819e-07, 2.0, t_min=291.67, t_max=729.0),
        None, None, "not on file",
        None, _MISCIBLE,
        0.026, 0.42, 360.15, "safety-data-sheet values (from memory)",
    ),
    Compound(
        "N,N-dimethylformamide", ("DMF", "dimethylformamide"), "68-12-2", 73.09378e-3,
        _dippr101(82.762, -7955.5, -8.8038, 4.2431e-06, 2.0, t_min=212.72, t_max=649.6),
        None, None, "not on file",
        None, _MISCIBLE,
        0.022, 0.152, 331.15, _NFPA,
    ),
    Compound(
        "acetic acid", ("ethanoic acid", "AcOH", "HOAc", "glacial acetic acid"), "64-19-7", 60.05196e-3,
        _wagner(592.71, 5786000.0, -8.2943, 0.97928, -0.21745, -5.72367, t_min=289.81, t_max=592.71),
        None, None, "not on file",
        None, _MISCIBLE,
        0.04, 0.199, 312.15, _IEC,
    ),
    Compound(
        "ethylene glycol", ("ethane-1,2-diol", "1,2-ethanediol", "glycol", "MEG", "EG"), "107-21-1", 62.06784e-3,
        _dippr101(84.09, -10411.0, -8.1976, 1.6536e-18, 6.0, t_min=260.15, t_max=720.0),
        None, None, "not on file",
        None, _MISCIBLE,
        0.032, 0.153, 384.15, "NFPA 325 (from memory)",
    ),
    Compound(
        "glycerol", ("glycerin", "glycerine", "propane-1,2,3-triol"), "56-81-5", 92.09382e-3,
        _wagner(850.05, 7500000.0, -6.94758, -0.33345, -5.98569, -1.33011, t_min=291.45, t_max=850.05, source=_VDI),
        None, None, "not on file",
        None, _MISCIBLE,
        None, None, 433.15, "flash point from memory (combustible); limits not on file",
    ),
    Compound(
        "acetonitrile", ("MeCN", "ACN", "methyl cyanide", "ethanenitrile"), "75-05-8", 41.05192e-3,
        _dippr101(58.302, -5385.6, -5.4954, 5.3634e-06, 2.0, t_min=229.32, t_max=545.5),
        None, None, "not on file",
        None, _MISCIBLE,
        0.03, 0.16, 279.15, _NFPA,
    ),
    Compound(
        "cyclohexane", ("hexahydrobenzene",), "110-82-7", 84.15948e-3,
        _dippr101(51.087, -5226.4, -4.2278, 9.7554e-18, 6.0, t_min=279.69, t_max=553.8),
        None, None, "not on file",
        5.5e-5, _CRC_SOL,
        0.013, 0.08, 256.15, _NFPA,
    ),
    Compound(
        "benzaldehyde", ("PhCHO",), "100-52-7", 106.12194e-3,
        _wagner(695.05, 4650000.0, -7.62714, 1.75696, -2.27084, -3.9193, t_min=216.05, t_max=695.05, source=_VDI),
        None, None, "not on file",
        6.9e-3, _CRC_SOL,
        0.014, None, 337.15, _IEC,
    ),
    Compound(
        "pentane", ("n-pentane",), "109-66-0", 72.14878e-3,
        _wagner(469.8, 3375000.0, -7.30698, 1.75845, -2.1629, -2.913, t_min=143.42, t_max=469.8),
        None, None, "not on file",
        3.8e-5, _CRC_SOL,
        0.015, 0.078, 233.15, _NFPA,
    ),
    Compound(
        "1-propanol", ("n-propanol", "propan-1-ol", "propyl alcohol", "nPrOH"), "71-23-8", 60.09502e-3,
        _wagner(536.78, 5168000.0, -8.53706, 1.96214, -7.6918, 2.945, t_min=146.95, t_max=536.78),
        None, None, "not on file",
        None, _MISCIBLE,
        0.022, 0.137, 288.15, _NFPA,
    ),
    Compound(
        "benzene", ("C6H6",), "71-43-2", 78.11184e-3,
        _wagner(562.16, 4898000.0, -7.01433, 1.55256, -1.8479, -3.713, t_min=278.68, t_max=562.16),
        1.7e-3, 4200.0, _sander("Staudinger and Roberts (2001)"),
        1.78e-3, _CRC_SOL,
        0.012, 0.078, 262.15, _NFPA,
    ),
    Compound(
        "p-xylene", ("para-xylene", "1,4-dimethylbenzene"), "106-42-3", 106.165e-3,
        _wagner(616.23, 3516000.0, -7.71694, 1.89119, -2.39695, -3.63026, t_min=286.41, t_max=616.23),
        None, None, "not on file",
        1.8e-4, _CRC_SOL,
        0.009, 0.076, 298.15, _IEC,
    ),
    Compound(
        "1,4-dioxane", ("dioxane", "p-dioxane"), "123-91-1", 88.10512e-3,
        _dippr101(44.494, -5406.7, -3.1287, 2.8913e-18, 6.0, t_min=284.95, t_max=587.0),
        None, None, "not on file",
        None, _MISCIBLE,
        0.02, 0.22, 285.15, _NFPA,
    ),
    Compound(
        "chlorobenzene", ("PhCl", "monochlorobenzene"), "108-90-7", 112.5569e-3,
        _dippr101(54.144, -6244.4, -4.5343, 4.703e-18, 6.0, t_min=227.95, t_max=632.35),
        2.7e-3, 3800.0, _sander("Staudinger and Roberts (2001)"),
        5.0e-4, _CRC_SOL,
        0.013, 0.096, 302.15, _NFPA,
    ),
    Compound(
        "butanone", ("MEK", "methyl ethyl ketone", "2-butanone"), "78-93-3", 72.10572e-3,
        _dippr101(72.698, -6143.6, -7.5779, 5.6476e-06, 2.0, t_min=186.48, t_max=535.5),
        0.18, 5700.0, _sander("Sander et al. (2011)"),
        0.24, _CRC_SOL,
        0.014, 0.114, 267.15, _NFPA,
    ),
    Compound(
        "pyridine", ("py", "azine"), "110-86-1", 79.0999e-3,
        _antoine(4.16749, 1373.026, 214.69, 1.0e5, True, t_min=292.51, t_max=413.57, source=_POLING_A),
        1.1, 6000.0, _sander("Bernauer and Dohnal (2009), measured"),
        None, _MISCIBLE,
        0.018, 0.124, 293.15, _NFPA,
    ),
    Compound(
        "N-methyl-2-pyrrolidone", ("NMP", "1-methyl-2-pyrrolidinone", "N-methylpyrrolidone"), "872-50-4", 99.13106e-3,
        _antoine(6.18001, 1655.29, -80.355, 1.0e3, False, t_min=336.0, t_max=477.0, source=_LANDOLT),
        None, None, "not on file",
        None, _MISCIBLE,
        0.013, 0.095, 364.15, "safety-data-sheet values (from memory)",
    ),
)
