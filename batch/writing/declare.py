"""How a result sheet is declared: once, as a table of columns over blocks of rows.

A result sheet is a :class:`ResultTable`: one header row, then records. Its
rows come in *blocks*, one block per member (a member's stations, its supports,
its rated vehicles, ...), taken from a run's results by the table's ``blocks``
function; each :class:`ResultColumn` turns a block into that column's cells.
The sheet writer (:mod:`batch.writing.tables`), the Result Guide sheet and the
docs read these declarations, so a column or a sheet is added in one place
(:mod:`batch.writing.columns`).

Units: a column's ``quantity`` gives the unit shown in its header, from the
run's unit system (``weight`` is US tons or tonnes).
"""

from __future__ import annotations

from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Generic, Literal, TypeVar

from batch.model.units import Quantity

if TYPE_CHECKING:
    from batch.model import Case
    from batch.running.executor import RunResult

__all__ = [
    "FORMAT_FACTOR",
    "FORMAT_FRACTION",
    "FORMAT_RATIO",
    "FORMAT_TEXT",
    "FORMAT_VALUE",
    "FORMAT_WHOLE",
    "WEIGHT_LABELS",
    "Overflow",
    "ResultColumn",
    "ResultQuantity",
    "ResultTable",
]

FORMAT_VALUE = "0.0"  # moments, shears, reactions, positions, weights
FORMAT_FRACTION = "0.000"  # station fractions of a span
FORMAT_WHOLE = "0"  # span and support numbers
FORMAT_RATIO = "0.00"  # rating factors and screening ratios
FORMAT_FACTOR = "0.000"  # load, resistance and distribution factors, dynamic allowances
FORMAT_TEXT = "@"

#: A result column's quantity: an input quantity, or a weight in tons or tonnes.
ResultQuantity = Quantity | Literal["weight"]

#: The label of a weight, by unit system (US tons of 2 kip, tonnes of 9.80665 kN).
WEIGHT_LABELS = {"US": "tons", "SI": "tonnes"}

#: What happens when a table has more rows than a sheet holds: ``continue`` on
#: numbered sheets (``Envelopes 2``, ...), a member's rows never split; or ``store``:
#: the sheet is left out with a remark, its numbers being in the checkpoint store.
Overflow = Literal["continue", "store"]

B = TypeVar("B")


@dataclass(frozen=True, kw_only=True)
class ResultColumn(Generic[B]):
    """One result column: its header, unit, format, width and cells, declared once.

    ``values`` gives the column's cells for one block of rows (``None`` is an
    empty cell). ``highlight`` names the table's highlight rule that marks a
    row of the block in this column (``""``: never). ``fill`` gives a cell's
    fill colour (RGB hex) from its value, or None for none. ``text`` cells are
    always written as text, never as formulas; ``wrap`` cells wrap within the
    column's width, their rows as tall as the text needs. ``unit_in_cells``
    puts the unit of ``quantity`` at the end of every text cell instead of in
    the header (``14.0 ft``), so that a cell holding one number is still read
    as text, not as a number.
    """

    header: str
    quantity: ResultQuantity = ""
    number_format: str = ""
    width: float = 10.0
    values: Callable[[B], Sequence[object]]
    highlight: str = ""
    fill: Callable[[object], str | None] | None = None
    text: bool = False
    wrap: bool = False
    unit_in_cells: bool = False
    meaning: str = ""

    def title(self, unit_labels: Mapping[str, str]) -> str:
        """Header text with its unit, e.g. ``"M max (kip-ft)"``."""
        if self.quantity and not self.unit_in_cells:
            return f"{self.header} ({unit_labels[self.quantity]})"
        return self.header

    def cells(self, block: B, unit_labels: Mapping[str, str]) -> Sequence[object]:
        """The column's cells for one block, each text cell with its unit if it takes one."""
        values = self.values(block)
        if not (self.unit_in_cells and self.quantity):
            return values
        unit = unit_labels[self.quantity]
        return [f"{v} {unit}" if isinstance(v, str) else v for v in values]


def _always(_result: RunResult) -> bool:
    return True


@dataclass(frozen=True, kw_only=True)
class ResultTable(Generic[B]):
    """One result sheet: one header row, then one block of rows per member.

    ``blocks`` gives the blocks from a run's results, ``rows`` counts their rows
    (cheaply, without reading them), ``wanted`` says whether the run writes this
    sheet at all. ``per_vehicle`` adds one column per vehicle of the run after
    ``columns`` (a matrix of members against vehicles). ``highlights`` maps a
    rule's name to the block row it marks (None: none). ``frozen_columns`` stay
    in view when scrolling right.
    """

    sheet: str
    purpose: str
    columns: tuple[ResultColumn[B], ...]
    blocks: Callable[[RunResult], Iterable[B]]
    rows: Callable[[RunResult], int]
    wanted: Callable[[RunResult], bool] = _always
    per_vehicle: Callable[[Case], tuple[ResultColumn[B], ...]] | None = None
    highlights: Mapping[str, Callable[[B], int | None]] = field(default_factory=dict)
    frozen_columns: int = 1
    overflow: Overflow = "continue"

    def all_columns(self, case: Case) -> tuple[ResultColumn[B], ...]:
        """The columns of this run's sheet (with one per vehicle for a matrix)."""
        return self.columns + (self.per_vehicle(case) if self.per_vehicle else ())

    def column(self, header: str) -> ResultColumn[B]:
        """The declared column whose header (without unit) is ``header``."""
        for col in self.columns:
            if col.header == header:
                return col
        raise KeyError(f"{self.sheet} has no column {header!r}")


#: A table of any block type (the writer treats them all alike).
AnyTable = ResultTable[Any]
