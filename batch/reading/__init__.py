"""Stage 2, reading: an input file's bytes to the normalised document, with every cell located.

Workbooks (:mod:`batch.reading.workbook`, cell quirks in :mod:`batch.reading.cells`,
header matching in :mod:`batch.reading.headers`) and JSON documents
(:mod:`batch.reading.jsondoc`) are read into one normalised document and a locator
that turns a document path back into its sheet and cell
(:mod:`batch.reading.problems`). Hostile or odd files are refused first
(:mod:`batch.reading.safety`). Nothing here judges values: that is validation's.
"""
