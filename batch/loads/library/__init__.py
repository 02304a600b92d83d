"""Built-in library of published load models, usable by name in the Vehicles sheet.

Each model is data (:class:`LoadModel`): its parts, its unit system of
definition, its published source and a short description. A name in the
Vehicles sheet's Library column is matched forgivingly: case, spaces and
punctuation are ignored ("hl93", "HL 93" and "HL-93" are the same), and some
models have aliases ("HS20-44"). :func:`model_cases` gives the parts as engine
load cases in the run's units, converted exactly (see :mod:`batch.model.units`).
"""

from __future__ import annotations

import re
from typing import NamedTuple

from batch.loads.cases import LoadCase
from batch.loads.library.aashto import US_MODELS
from batch.loads.library.metric import SI_MODELS
from batch.loads.library.models import LoadModel, Part
from batch.model.units import UnitSystem

__all__ = ["LoadModel", "ModelRow", "Part", "describe", "model", "model_cases", "names"]

MODELS: tuple[LoadModel, ...] = (*US_MODELS, *SI_MODELS)


def _key(name: str) -> str:
    """Lookup key of a name: lower case letters and digits only."""
    return re.sub(r"[^0-9a-z]", "", name.lower())


def _index(models: tuple[LoadModel, ...]) -> dict[str, LoadModel]:
    index: dict[str, LoadModel] = {}
    for m in models:
        for name in (m.name, *m.aliases):
            key = _key(name)
            if key in index and index[key] is not m:
                raise ValueError(f"library name {name!r} clashes with {index[key].name!r}")
            index[key] = m
    return index


_INDEX = _index(MODELS)


class ModelRow(NamedTuple):
    """One line of the library listing.

    ``axles`` and ``weight`` describe the model's first part (e.g. the HL-93
    design truck); ``weight`` is in kip for a US listing and kN for an SI one.
    """

    name: str
    axles: int
    weight: float
    source: str


def names() -> tuple[str, ...]:
    """Names of every built-in load model, as typed in the Library column."""
    return tuple(m.name for m in MODELS)


def model(name: str) -> LoadModel:
    """The load model called ``name`` (or one of its aliases), matched forgivingly.

    Raises ``KeyError`` for an unknown name; its message lists the known names.
    """
    found = _INDEX.get(_key(str(name)))
    if found is None:
        raise KeyError(f"{name!r} is not a built-in load model; use one of: {', '.join(names())}")
    return found


def model_cases(name: str, units: UnitSystem, impact: float) -> list[LoadCase]:
    """The load cases (parts) of library model ``name`` in the run's ``units``.

    ``impact`` is the run's dynamic load allowance, used by models that take
    the run's value. Raises ``KeyError`` for an unknown name.
    """
    return model(name).cases(units, impact)


def describe(units: UnitSystem = "US") -> list[ModelRow]:
    """One :class:`ModelRow` per model, weights in kip ("US") or kN ("SI")."""
    return [ModelRow(m.name, m.axles, m.weight(units), m.source) for m in MODELS]
