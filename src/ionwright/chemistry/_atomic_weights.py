"""Standard atomic weights of the elements Z = 1–92, in g/mol.

Molar masses of ingredients (for converting g, mg/L and % w/w into moles) come from
these values. For the elements whose standard atomic weight is an interval (their
isotopic composition varies in nature), the table holds the single conventional value
that the same report gives for such use; for the others it holds the standard value.
Elements that have no standard atomic weight (no stable isotope and no characteristic
terrestrial isotopic composition: Tc, Pm, Po, At, Rn, Fr, Ra, Ac) are listed in
:data:`NO_STANDARD_WEIGHT`; they are valid symbols in a formula but have no molar mass.

All values were written from memory of the CIAAW 2021 table (marked ``# from memory``
line by line) and have not been compared with a printed copy of the report; the
reference test ``tests/reference/test_molar_mass.py`` checks them against handbook
molar masses of common salts to 0.01 g/mol.

References
----------
Prohaska, T. et al. (2022) "Standard atomic weights of the elements 2021 (IUPAC
Technical Report)", Pure Appl. Chem. 94, 573–600 (Table 1, standard atomic weights;
Table 3, conventional values for the interval elements).
"""

from __future__ import annotations

from types import MappingProxyType

# (Z, symbol, weight in g/mol or None when the element has no standard atomic weight).
# Interval elements give the conventional value; the interval is in the comment.
_ROWS: tuple[tuple[int, str, float | None], ...] = (
    (1, "H", 1.008),  # from memory; interval [1.00784, 1.00811]
    (2, "He", 4.002602),  # from memory
    (3, "Li", 6.94),  # from memory; interval [6.938, 6.997]
    (4, "Be", 9.0121831),  # from memory
    (5, "B", 10.81),  # from memory; interval [10.806, 10.821]
    (6, "C", 12.011),  # from memory; interval [12.0096, 12.0116]
    (7, "N", 14.007),  # from memory; interval [14.00643, 14.00728]
    (8, "O", 15.999),  # from memory; interval [15.99903, 15.99977]
    (9, "F", 18.998403162),  # from memory
    (10, "Ne", 20.1797),  # from memory
    (11, "Na", 22.98976928),  # from memory
    (12, "Mg", 24.305),  # from memory; interval [24.304, 24.307]
    (13, "Al", 26.9815384),  # from memory
    (14, "Si", 28.085),  # from memory; interval [28.084, 28.086]
    (15, "P", 30.973761998),  # from memory
    (16, "S", 32.06),  # from memory; interval [32.059, 32.076]
    (17, "Cl", 35.45),  # from memory; interval [35.446, 35.457]
    (18, "Ar", 39.95),  # from memory; interval [39.792, 39.963]
    (19, "K", 39.0983),  # from memory
    (20, "Ca", 40.078),  # from memory
    (21, "Sc", 44.955907),  # from memory
    (22, "Ti", 47.867),  # from memory
    (23, "V", 50.9415),  # from memory
    (24, "Cr", 51.9961),  # from memory
    (25, "Mn", 54.938043),  # from memory
    (26, "Fe", 55.845),  # from memory
    (27, "Co", 58.933194),  # from memory
    (28, "Ni", 58.6934),  # from memory
    (29, "Cu", 63.546),  # from memory
    (30, "Zn", 65.38),  # from memory
    (31, "Ga", 69.723),  # from memory
    (32, "Ge", 72.630),  # from memory
    (33, "As", 74.921595),  # from memory
    (34, "Se", 78.971),  # from memory
    (35, "Br", 79.904),  # from memory; interval [79.901, 79.907]
    (36, "Kr", 83.798),  # from memory
    (37, "Rb", 85.4678),  # from memory
    (38, "Sr", 87.62),  # from memory
    (39, "Y", 88.905838),  # from memory
    (40, "Zr", 91.224),  # from memory
    (41, "Nb", 92.90637),  # from memory
    (42, "Mo", 95.95),  # from memory
    (43, "Tc", None),
    (44, "Ru", 101.07),  # from memory
    (45, "Rh", 102.90549),  # from memory
    (46, "Pd", 106.42),  # from memory
    (47, "Ag", 107.8682),  # from memory
    (48, "Cd", 112.414),  # from memory
    (49, "In", 114.818),  # from memory
    (50, "Sn", 118.710),  # from memory
    (51, "Sb", 121.760),  # from memory
    (52, "Te", 127.60),  # from memory
    (53, "I", 126.90447),  # from memory
    (54, "Xe", 131.293),  # from memory
    (55, "Cs", 132.90545196),  # from memory
    (56, "Ba", 137.327),  # from memory
    (57, "La", 138.90547),  # from memory
    (58, "Ce", 140.116),  # from memory
    (59, "Pr", 140.90766),  # from memory
    (60, "Nd", 144.242),  # from memory
    (61, "Pm", None),
    (62, "Sm", 150.36),  # from memory
    (63, "Eu", 151.964),  # from memory
    (64, "Gd", 157.25),  # from memory
    (65, "Tb", 158.925354),  # from memory
    (66, "Dy", 162.500),  # from memory
    (67, "Ho", 164.930329),  # from memory
    (68, "Er", 167.259),  # from memory
    (69, "Tm", 168.934219),  # from memory
    (70, "Yb", 173.045),  # from memory
    (71, "Lu", 174.9668),  # from memory
    (72, "Hf", 178.486),  # from memory
    (73, "Ta", 180.94788),  # from memory
    (74, "W", 183.84),  # from memory
    (75, "Re", 186.207),  # from memory
    (76, "Os", 190.23),  # from memory
    (77, "Ir", 192.217),  # from memory
    (78, "Pt", 195.084),  # from memory
    (79, "Au", 196.966570),  # from memory
    (80, "Hg", 200.592),  # from memory
    (81, "Tl", 204.38),  # from memory; interval [204.382, 204.385]
    (82, "Pb", 207.2),  # from memory; interval [206.14, 207.94]
    (83, "Bi", 208.98040),  # from memory
    (84, "Po", None),
    (85, "At", None),
    (86, "Rn", None),
    (87, "Fr", None),
    (88, "Ra", None),
    (89, "Ac", None),
    (90, "Th", 232.0377),  # from memory
    (91, "Pa", 231.03588),  # from memory
    (92, "U", 238.02891),  # from memory
)

#: Atomic number of every element symbol Z = 1–92.
ATOMIC_NUMBERS: MappingProxyType[str, int] = MappingProxyType(
    {symbol: z for z, symbol, _ in _ROWS})

#: Standard (or, for interval elements, conventional) atomic weight in g/mol.
STANDARD_ATOMIC_WEIGHTS: MappingProxyType[str, float] = MappingProxyType(
    {symbol: weight for _, symbol, weight in _ROWS if weight is not None})

#: Symbols (Z ≤ 92) of elements that have no standard atomic weight.
NO_STANDARD_WEIGHT: frozenset[str] = frozenset(
    symbol for _, symbol, weight in _ROWS if weight is None)
