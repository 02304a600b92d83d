"""Built-in library of published load models, usable by name in the Vehicles sheet.

Placeholder interface; the models themselves arrive with the load-model issue.
"""

from __future__ import annotations

from batch.engine.envelope import LoadCase
from batch.model import UnitSystem

__all__ = ["model_cases", "names"]


def names() -> tuple[str, ...]:
    """Names of every built-in load model, as typed in the Library column."""
    return ()


def model_cases(name: str, units: UnitSystem, impact: float) -> list[LoadCase]:
    """The load cases (parts) of library model ``name`` in the run's ``units``.

    ``impact`` is the run's dynamic load allowance, used by models that take
    the run's value. Raises ``KeyError`` for an unknown name.
    """
    raise KeyError(name)
