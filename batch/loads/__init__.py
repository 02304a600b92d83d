"""Stage 3, loads: published load models and factors as data, and the fleet as load cases.

:mod:`batch.loads.library` holds the built-in load models (HL-93, legal loads, ...),
:mod:`batch.loads.factors` the published factors of the rating codes,
:mod:`batch.loads.cases` the load case the engine moves, and
:mod:`batch.loads.fleet` turns a run's vehicles into load cases.
"""
