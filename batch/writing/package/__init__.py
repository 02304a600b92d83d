"""The workbook package plumbing: zip parts, streamed sheet XML, styles and the atomic save.

Nothing here knows what a result sheet holds: the sheets of :mod:`batch.writing`
write their rows through :class:`~batch.writing.package.splice.ResultBook`, and
:func:`~batch.writing.package.save.atomic_save` puts the finished package on disk.
"""
