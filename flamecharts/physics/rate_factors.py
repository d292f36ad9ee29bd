"""Rate-constant uncertainty factors that ship with the package: hydrogen-oxygen and C1 reactions.

Each entry is a reaction (matched to any mechanism through
physics.kinetic_uncertainty.reaction_key, so direction, collision partners and '(+M)' do
not matter) with its uncertainty factor f: the rate constant lies between k/f and k*f.
Values are the prior ("trial model") uncertainty factors of FFCM-2, Zhang, Dong,
Vandewalle, Xu, Smith & Wang, Combust. Flame 251 (2023) 112679 (its published table of
trial-model parameters), each taken by FFCM-2 from the primary source named beside it
(mostly the Baulch et al. 2005 evaluation, J. Phys. Chem. Ref. Data 34 (2005) 757, and
Tsang & Hampson 1986, J. Phys. Chem. Ref. Data 15 (1986) 1087). Where FFCM-2 gives a
low- and a high-temperature branch, the high-temperature factor is used (flames burn at
1000-2500 K). FFCM-2 applies f to the pre-exponential factor, independent of temperature;
so does this table. Third-body variants of a reaction (GRI-Mech 3.0 writes H + O2 + M,
H + 2 O2, H + O2 + H2O, ...) share their reaction's factor.

A study adds or overrides factors in its [uncertainty] table; reactions neither names get
DEFAULT_RATE_FACTOR.
"""
from __future__ import annotations

from .kinetic_uncertainty import reaction_key

#: Factor of reactions without one: FFCM-2 gives its estimated rates f = 3-5 (Zhang et al. 2023).
DEFAULT_RATE_FACTOR = 3.0
#: Largest factor a study may give (a rate known to two orders of magnitude either way).
MAX_RATE_FACTOR = 100.0
#: Standard deviations of ln k that ln f stands for: 2, the convention of the H. Wang group whose
#: factors these are (x = ln(k/k0)/ln f bounded to [-1, 1] read as 2 sigma; from memory). The
#: T. Turanyi group reads evaluators' limits as 3 sigma (Nagy & Turanyi 2012; from memory), which
#: would narrow every band by a factor 1.5. A study may set its own (``factor_sigmas``).
SIGMAS_PER_FACTOR = 2.0

_FFCM2 = "FFCM-2 prior (Zhang et al. 2023)"

#: (equation, f, primary source as FFCM-2 cites it)
_TABLE = (
    # hydrogen-oxygen
    ("H + O2 <=> O + OH", 1.15, "Hong, Davidson & Hanson 2011"),
    ("O + H2 <=> H + OH", 1.6, "Baulch et al. 2005"),
    ("OH + H2 <=> H + H2O", 1.2, "Michael & Sutherland 1988"),
    ("2 OH <=> O + H2O", 1.4, "Baulch et al. 2005"),
    ("H + O2 (+M) <=> HO2 (+M)", 2.0, "Burke et al. 2012; Michael et al. 2002"),
    ("H + HO2 <=> O2 + H2", 2.0, "Michael, Sutherland, Harding & Wagner 2000"),
    ("H + HO2 <=> 2 OH", 2.0, "Mueller, Kim, Yetter & Dryer 1999"),
    ("H + HO2 <=> O + H2O", 3.0, "Baulch et al. 2005"),
    ("O + HO2 <=> OH + O2", 3.0, "Baulch et al. 2005"),
    ("OH + HO2 <=> O2 + H2O", 1.35, "Hong et al. 2013 (high-T branch)"),
    ("2 HO2 <=> O2 + H2O2", 2.0, "Kappel, Luther & Troe 2002 (high-T branch)"),
    ("H2O2 (+M) <=> 2 OH (+M)", 2.5, "Troe 2011"),
    ("H + H2O2 <=> OH + H2O", 2.0, "Tsang & Hampson 1986"),
    ("H + H2O2 <=> HO2 + H2", 2.0, "Tsang & Hampson 1986"),
    ("O + H2O2 <=> OH + HO2", 3.0, "Tsang & Hampson 1986"),
    ("OH + H2O2 <=> HO2 + H2O", 1.3, "Hong et al. 2010 (high-T branch)"),
    ("2 H + M <=> H2 + M", 3.0, "Tsang & Hampson 1986"),
    ("2 O + M <=> O2 + M", 3.0, "Tsang & Hampson 1986"),
    ("H + O + M <=> OH + M", 5.0, "Tsang & Hampson 1986"),
    ("H + OH + M <=> H2O + M", 3.2, "Srinivasan & Michael 2006"),
    # C1
    ("CO + OH <=> CO2 + H", 1.5, "Joshi & Wang 2006 (high-T branch)"),
    ("CO + O (+M) <=> CO2 (+M)", 3.0, "Jasper 2015; Troe 1975"),
    ("CO + HO2 <=> CO2 + OH", 2.0, "You, Wang, Goos et al. 2007"),
    ("HCO + M <=> H + CO + M", 1.7, "Friedrichs et al. 2002"),
    ("HCO + O2 <=> HO2 + CO", 2.0, "FFCM-2 review"),
    ("HCO + H <=> CO + H2", 2.5, "Baulch et al. 2005"),
    ("HCO + O <=> CO + OH", 2.0, "Baulch et al. 2005"),
    ("HCO + OH <=> CO + H2O", 2.0, "Baulch et al. 2005"),
    ("CH3 + H (+M) <=> CH4 (+M)", 1.5, "Cobos & Troe 1990; Baulch et al. 2005"),
    ("CH4 + H <=> CH3 + H2", 1.5, "Baulch et al. 2005"),
    ("CH4 + OH <=> CH3 + H2O", 1.2, "Srinivasan et al. 2005"),
    ("CH4 + O <=> CH3 + OH", 1.4, "Baulch et al. 1994"),
    ("CH4 + HO2 <=> CH3 + H2O2", 2.5, "Baulch et al. 2005"),
    ("CH3 + O <=> H + CH2O", 1.4, "Baulch et al. 2005"),
    ("CH3 + OH (+M) <=> CH3OH (+M)", 2.0, "Jasper et al. 2007"),
    ("CH3 + OH <=> CH2(S) + H2O", 3.0, "Baulch et al. 2005"),
    ("CH3 + OH <=> CH2 + H2O", 2.0, "Jasper et al. 2007"),
    ("CH3 + OH <=> CH2O + H2", 3.0, "Jasper et al. 2007"),
    ("2 CH3 (+M) <=> C2H6 (+M)", 2.0, "Stewart, Larson & Golden 1989"),
    ("2 CH3 <=> C2H5 + H", 2.0, "Stewart, Larson & Golden 1989"),
    ("CH2O + H <=> HCO + H2", 2.0, "FFCM-2 (transition-state theory)"),
    ("CH2O + OH <=> HCO + H2O", 5.0, "Vasudevan et al. 2005"),
    ("CH2O + O <=> HCO + OH", 5.0, "Baulch et al. 2005"),
    ("CH2O + O2 <=> HCO + HO2", 3.0, "Baulch et al. 2005"),
    ("CH2O + CH3 <=> HCO + CH4", 2.0, "Baulch et al. 2005"),
    ("H + HCO (+M) <=> CH2O (+M)", 3.0, "Troe 2007"),
    ("CH3 + HO2 <=> CH3O + OH", 3.0, "Scire et al. 2001; Zhu & Lin 2001"),
    ("CH3 + HO2 <=> CH4 + O2", 3.0, "Jasper et al. 2009"),
    ("CH3 + O2 <=> O + CH3O", 2.0, "Srinivasan et al. 2005"),
    ("CH3 + O2 <=> OH + CH2O", 3.0, "Herbon et al. 2005"),
    ("H + CH2O (+M) <=> CH3O (+M)", 2.0, "Dames & Golden 2013"),
    ("CH2(S) + O2 <=> CH2 + O2", 2.5, "Baulch et al. 2005"),
    ("CH2(S) + N2 <=> CH2 + N2", 2.0, "Baulch et al. 2005"),
    ("CH2(S) + H2O <=> CH2 + H2O", 2.5, "Baulch et al. 2005"),
    ("CH2 + CH3 <=> C2H4 + H", 3.0, "Baulch et al. 2005"),
)

#: reaction_key -> (f, source). The three CH2(S) quenching entries share one key (the collision
#: partner cancels); the first listed (O2) wins, as the largest of them.
RATE_FACTORS: dict[str, tuple[float, str]] = {}
for _eq, _f, _src in _TABLE:
    RATE_FACTORS.setdefault(reaction_key(_eq), (_f, f"{_src}, via {_FFCM2}"))
