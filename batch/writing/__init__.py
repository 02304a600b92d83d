"""Stage 8, writing: the result sheets, spliced into the input workbook's own package.

:mod:`batch.writing.results` writes a run's result sheets (:func:`result_package`);
the sheets are declared in :mod:`batch.writing.columns` and written by
:mod:`batch.writing.tables`, :mod:`batch.writing.charts`, :mod:`batch.writing.ratings`,
:mod:`batch.writing.summary` and :mod:`batch.writing.runlog`;
:mod:`batch.writing.template` writes input workbooks. The zip-package plumbing is in
:mod:`batch.writing.package`, which knows nothing of what a sheet holds.
"""
