"""Stage 10 - the printed rating report: a run's results as a PDF for the bridge file.

:mod:`batch.reporting.report` chooses what goes in (inputs, envelope plots, governing
values, ratings, postings, cautions, a block for review and seal), taking every number
from the interface's DataFrames, so the report shows what the workbook shows;
:mod:`batch.reporting.layout` lays it out on pages with matplotlib.
"""
