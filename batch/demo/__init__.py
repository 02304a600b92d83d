"""Demo and benchmark data, apart from the pipeline: no stage imports this package.

:mod:`batch.demo.kvha` is the invented inventory of the fictional Kestrel Valley
Highway Authority used by the sample workbooks; :mod:`batch.demo.synthetic` the
seeded synthetic inventory and fleet of the benchmark and the large-run tests.
"""
