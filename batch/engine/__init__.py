"""Stage 5, the engine: exact influence lines and moving-load extremes.

Pure numpy, with a numba-compiled sweep; it knows nothing of workbooks. Import
from the modules themselves: :mod:`batch.engine.influence` (influence lines and the
method's sign conventions), :mod:`batch.engine.moving` and :mod:`batch.engine.kernel`
(exact extremes of axle trains), :mod:`batch.engine.envelope` (per-case effects and
a member's envelope) and :mod:`batch.engine.effects` (the envelope's types and the
six effects, which load without numba).
"""
