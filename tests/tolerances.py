"""The tolerances of the test suite, named once (common practice: one meaning, one name).

Relative tolerances are fractions of the value compared (or of its natural size,
where a test says so); absolute ones are in the unit of the quantity compared.
"""

#: Exact engine against an exact closed form, hand arithmetic or an exact search: the
#: round-off of a long chain of float64 operations, far below any engineering meaning.
REL_TOL_EXACT = 1e-9

#: The same float64 numbers carried unchanged through a few operations (a sheet's cell
#: against the engine's array, a sum recomputed by hand in a different order).
REL_TOL_FLOAT = 1e-12

#: The independent finite-element library (PyNiteFEA) against the exact engine.
REL_TOL_LIBRARY = 1e-11

#: A spreadsheet program that writes numbers with 15 significant digits.
REL_TOL_15_DIGITS = 1e-14

#: A worked fixture whose results are quoted to three decimals.
REL_TOL_FIXTURE = 5e-4

#: A brute-force search on a 0.1 ft / 0.5 ft grid against the exact engine.
REL_TOL_GRID = 1e-3

#: A published table printed to four decimals (ordinates per unit load or length).
TABLE_TOL_4DP = 2e-4

#: A published table printed to two decimals (kip-ft, kip).
TABLE_TOL_2DP = 0.005

#: A published distribution factor printed to three decimals (lanes per girder, absolute).
DF_3DP = 5e-4

#: A published factor that is the product of two factors, each printed to three decimals and
#: then multiplied and rounded again (lanes per girder, absolute): 0.0005 on each factor of
#: size about 1, plus the final rounding.
DF_3DP_PRODUCT = 1.5e-3

# The order the meanings above imply (a tolerance loosened past its neighbour is a change
# of meaning, not of number): float round-off < the FE library < exact closed forms < what
# printed tables and grids allow.
assert REL_TOL_15_DIGITS < REL_TOL_FLOAT < REL_TOL_LIBRARY < REL_TOL_EXACT < REL_TOL_FIXTURE
assert REL_TOL_FIXTURE < REL_TOL_GRID and TABLE_TOL_4DP < TABLE_TOL_2DP
assert DF_3DP < DF_3DP_PRODUCT
