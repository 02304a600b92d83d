"""The input sheets and columns of the workbook contract, declared once.

The reader, the template writer and the documentation all read these
declarations, so a column is added in one place. Header matching is forgiving
(case, surrounding spaces and a trailing part in parentheses are ignored), see
:func:`header_key`.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Literal

__all__ = [
    "CAPACITIES",
    "INPUT_SHEETS",
    "MEMBERS",
    "SETTINGS",
    "SETTING_ROWS",
    "VEHICLES",
    "InputColumn",
    "InputSheet",
    "SettingRow",
    "header_key",
]

#: Kind of value in a column; ``unit`` names the quantity whose unit the header shows.
ValueKind = Literal["text", "number", "list", "spacing-list", "choice"]
Quantity = Literal["", "length", "force", "moment", "line_load"]


@dataclass(frozen=True, kw_only=True)
class InputColumn:
    """One column of an input sheet."""

    header: str
    key: str  # field name in the normalised JSON document
    kind: ValueKind
    required: bool = False
    quantity: Quantity = ""
    choices: tuple[str, ...] = ()
    meaning: str = ""
    example: str | float | None = None


@dataclass(frozen=True, kw_only=True)
class InputSheet:
    """One input sheet: its name, columns and what it is for."""

    name: str
    columns: tuple[InputColumn, ...]
    purpose: str


@dataclass(frozen=True, kw_only=True)
class SettingRow:
    """One row of the Settings sheet."""

    name: str
    key: str
    kind: ValueKind
    default: str | float | int
    choices: tuple[str, ...] = ()
    meaning: str = ""


def header_key(text: object) -> str:
    """Normalise a header for matching: lower case, no trailing ``(...)``, no outer spaces."""
    s = str(text if text is not None else "").strip()
    s = re.sub(r"\s*\([^()]*\)\s*$", "", s)
    return re.sub(r"\s+", " ", s).strip().lower()


#: Member id used by the example rows of Members and Capacities (they must agree).
_EXAMPLE_MEMBER = "KV-0412 G1"

SETTING_ROWS: tuple[SettingRow, ...] = (
    SettingRow(
        name="Units",
        key="units",
        kind="choice",
        default="US",
        choices=("US", "SI"),
        meaning="US: kip, ft, kip-ft, kip/ft. SI: kN, m, kN-m, kN/m.",
    ),
    SettingRow(
        name="Directions",
        key="directions",
        kind="choice",
        default="both",
        choices=("both", "left-to-right", "right-to-left"),
        meaning="Directions of travel to consider.",
    ),
    SettingRow(
        name="Stations per span",
        key="stations_per_span",
        kind="number",
        default=10,
        meaning="Whole number n >= 1: stations at 0, 1/n, ..., 1 of every span.",
    ),
    SettingRow(
        name="Dynamic load allowance",
        key="impact",
        kind="number",
        default=0.33,
        meaning="Fraction added to axle loads only (0.33 = 33 %); never to lane loads.",
    ),
    SettingRow(
        name="Chart members",
        key="chart_members",
        kind="number",
        default=50,
        meaning="How many members get a moment-envelope chart (the first n).",
    ),
)

SETTINGS = InputSheet(
    name="Settings",
    purpose="Run settings: one row per setting; blank or missing rows take the default.",
    columns=(
        InputColumn(header="Setting", key="setting", kind="text", required=True),
        InputColumn(header="Value", key="value", kind="text", required=True),
        InputColumn(
            header="Meaning",
            key="meaning",
            kind="text",
            meaning="What the setting does; for the reader only, never read by the program.",
        ),
    ),
)

MEMBERS = InputSheet(
    name="Members",
    purpose="One row per girder line (member).",
    columns=(
        InputColumn(
            header="Member",
            key="id",
            kind="text",
            required=True,
            meaning="Unique id of the girder line.",
            example=_EXAMPLE_MEMBER,
        ),
        InputColumn(
            header="Spans",
            key="spans",
            kind="list",
            required=True,
            quantity="length",
            meaning="Span lengths, left to right; supports at both ends of every span.",
            example="60, 80, 60",
        ),
        InputColumn(
            header="Hinges",
            key="hinges",
            kind="list",
            quantity="length",
            meaning="Internal moment releases, measured from the member's left end.",
        ),
        InputColumn(
            header="Span EI",
            key="span_ei",
            kind="list",
            meaning="Relative flexural stiffness, one per span (default all 1).",
            example="1, 1.5, 1",
        ),
        InputColumn(
            header="DF moment",
            key="df_moment",
            kind="number",
            meaning="Live-load distribution factor on moments (default 1).",
            example=0.62,
        ),
        InputColumn(
            header="DF shear",
            key="df_shear",
            kind="number",
            meaning="Live-load distribution factor on shears and reactions (default 1).",
            example=0.7,
        ),
        InputColumn(
            header="DC load",
            key="dc_load",
            kind="number",
            quantity="line_load",
            meaning="Uniform dead load of components on the whole member, for rating.",
            example=1.15,
        ),
        InputColumn(
            header="DW load",
            key="dw_load",
            kind="number",
            quantity="line_load",
            meaning="Uniform dead load of the wearing surface on the whole member, for rating.",
            example=0.18,
        ),
        InputColumn(
            header="Condition factor",
            key="condition_factor",
            kind="number",
            meaning="Rating condition factor (default 1).",
            example=1,
        ),
        InputColumn(
            header="System factor",
            key="system_factor",
            kind="number",
            meaning="Rating system factor (default 1).",
            example=1,
        ),
        InputColumn(
            header="Description",
            key="description",
            kind="text",
            meaning="Free text.",
            example="EXAMPLE, replace or delete: Harlow Creek overpass, girder 1 (KVHA)",
        ),
    ),
)

VEHICLES = InputSheet(
    name="Vehicles",
    purpose="One row per vehicle or library load model.",
    columns=(
        InputColumn(
            header="Vehicle",
            key="id",
            kind="text",
            required=True,
            meaning="Unique id of the vehicle.",
            example="KV-P3",
        ),
        InputColumn(
            header="Axle loads",
            key="axle_loads",
            kind="list",
            quantity="force",
            meaning="Axle loads, front axle first (required unless Library is given).",
            example="12, 34, 34",
        ),
        InputColumn(
            header="Axle spacings",
            key="spacings",
            kind="spacing-list",
            quantity="length",
            meaning="Distances between consecutive axles; an entry may be a range 14-30 "
            "(the worst spacing within it is used).",
            example="14, 14-30",
        ),
        InputColumn(
            header="Lane load",
            key="lane_load",
            kind="number",
            quantity="line_load",
            meaning="Uniform load placed on the adverse parts of the member, no dynamic allowance.",
        ),
        InputColumn(
            header="Factor",
            key="factor",
            kind="number",
            meaning="Multiplier on the whole row's effects (default 1).",
            example=1,
        ),
        InputColumn(
            header="Library",
            key="library",
            kind="text",
            meaning="Name of a built-in load model; leave the axle columns empty.",
        ),
        InputColumn(
            header="Category",
            key="category",
            kind="choice",
            choices=("design", "legal", "permit"),
            meaning="Which live-load factor rating uses (default design).",
            example="permit",
        ),
        InputColumn(
            header="Description",
            key="description",
            kind="text",
            meaning="Free text.",
            example="EXAMPLE, replace or delete: KVHA 3-axle permit truck",
        ),
    ),
)

CAPACITIES = InputSheet(
    name="Capacities",
    purpose="Optional: one row per member and station to be rated.",
    columns=(
        InputColumn(
            header="Member",
            key="member",
            kind="text",
            required=True,
            meaning="Id of a member listed on the Members sheet.",
            example=_EXAMPLE_MEMBER,
        ),
        InputColumn(
            header="Span",
            key="span",
            kind="number",
            required=True,
            meaning="Span number, counted from 1 at the member's left end.",
            example=1,
        ),
        InputColumn(
            header="Station",
            key="station",
            kind="number",
            required=True,
            meaning="Fraction of the span (0 to 1), one of the stations of the Envelopes sheet.",
            example=0.4,
        ),
        InputColumn(
            header="Resistance M+",
            key="resistance_m_pos",
            kind="number",
            quantity="moment",
            meaning="Factored resistance for sagging moment; blank: not rated.",
            example=4100,
        ),
        InputColumn(
            header="Resistance M-",
            key="resistance_m_neg",
            kind="number",
            quantity="moment",
            meaning="Factored resistance for hogging moment, as a positive magnitude; "
            "blank: not rated.",
        ),
        InputColumn(
            header="Resistance V",
            key="resistance_v",
            kind="number",
            quantity="force",
            meaning="Factored shear resistance; blank: not rated.",
            example=380,
        ),
        InputColumn(
            header="DC M",
            key="dc_m",
            kind="number",
            quantity="moment",
            meaning="Signed component dead-load moment here; blank: from the member's DC load.",
        ),
        InputColumn(
            header="DW M",
            key="dw_m",
            kind="number",
            quantity="moment",
            meaning="Signed wearing-surface moment here; blank: from the member's DW load.",
        ),
        InputColumn(
            header="DC V",
            key="dc_v",
            kind="number",
            quantity="force",
            meaning="Signed component dead-load shear here; blank: from the member's DC load.",
        ),
        InputColumn(
            header="DW V",
            key="dw_v",
            kind="number",
            quantity="force",
            meaning="Signed wearing-surface shear here; blank: from the member's DW load.",
        ),
    ),
)

#: The sheets a run reads, in workbook order (Capacities is optional).
INPUT_SHEETS: tuple[InputSheet, ...] = (SETTINGS, MEMBERS, VEHICLES, CAPACITIES)
