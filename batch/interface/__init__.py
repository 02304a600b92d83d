"""Stage 9 - spanfleet from Python: inputs, runs and results as pandas DataFrames.

The command line is a thin layer over this stage. A notebook needs three lines::

    from batch.interface import read, run
    results = run(read("sample_workbooks/kvha-inventory.xlsx"))
    results.envelopes

See :mod:`batch.interface.session` (read, run, write, read a store) and
:mod:`batch.interface.frames` (a result sheet as a DataFrame). Like the model, this
package re-exports what its users call.
"""

from batch.interface.session import (
    Input,
    InputChanged,
    InputError,
    Results,
    StoreMismatch,
    from_case,
    read,
    read_store,
    run,
)

__all__ = [
    "Input",
    "InputChanged",
    "InputError",
    "Results",
    "StoreMismatch",
    "from_case",
    "read",
    "read_store",
    "run",
]
