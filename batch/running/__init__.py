"""Stage 7, running: a whole case, member by member, in one process, on local workers or a cluster.

:mod:`batch.running.executor` analyses the members in chunks and gathers their
results; :mod:`batch.running.store` keeps finished members in a checkpoint store
so that an interrupted run resumes.
"""
