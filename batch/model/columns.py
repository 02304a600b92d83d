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

from batch.model.units import Quantity

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


# Rating settings: the published values quoted in their meanings are those of the MBE
# (AASHTO Manual for Bridge Evaluation, 2nd ed. 2011 onward) and of AASHTO LRFD Table
# 3.4.1-2 for the relieving (minimum) dead-load factors, all from memory (published-facts
# 2.1, tagged [M]); batch/rating.py keeps the same values beside the checks that use them.

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
    SettingRow(
        name="DC factor",
        key="dc_factor",
        kind="number",
        default=1.25,
        meaning="Rating: load factor on component dead load DC, Strength I (MBE Table "
        "6A.4.2.2-1: 1.25). Allowed 1.0 to 2.5.",
    ),
    SettingRow(
        name="DW factor",
        key="dw_factor",
        kind="number",
        default=1.5,
        meaning="Rating: load factor on wearing-surface dead load DW, Strength I (MBE: 1.50; "
        "1.25 where the overlay thickness is measured in the field). Allowed 1.0 to 2.5.",
    ),
    SettingRow(
        name="DC factor relieving",
        key="dc_factor_relieving",
        kind="number",
        default=0.9,
        meaning="Rating: factor on DC where the dead load relieves the rated effect (opposite "
        "sign), so that relief is not overstated (LRFD Table 3.4.1-2 minimum: 0.90). "
        "Allowed 0 to 1.",
    ),
    SettingRow(
        name="DW factor relieving",
        key="dw_factor_relieving",
        kind="number",
        default=0.65,
        meaning="Rating: factor on DW where it relieves the rated effect (LRFD Table 3.4.1-2 "
        "minimum: 0.65). Allowed 0 to 1.",
    ),
    SettingRow(
        name="LL factor design",
        key="ll_factor_design",
        kind="number",
        default=1.75,
        meaning="Rating: live-load factor for design loads at the inventory level (MBE Table "
        "6A.4.2.2-1: 1.75). Allowed 1.0 to 2.5.",
    ),
    SettingRow(
        name="LL factor design operating",
        key="ll_factor_operating",
        kind="number",
        default=1.35,
        meaning="Rating: live-load factor for design loads at the operating level (MBE: 1.35). "
        "Design loads report both levels. Allowed 1.0 to 2.5.",
    ),
    SettingRow(
        name="LL factor legal",
        key="ll_factor_legal",
        kind="number",
        default=1.45,
        meaning="Rating: live-load factor for legal loads, routine commercial traffic. 1.45 is "
        "the MBE value for ADTT >= 5000 (Table 6A.4.4.2.3a-1), the highest of that table and "
        "the conservative choice when the ADTT is not known; 1.30 for ADTT <= 1000, "
        "interpolate between. "
        "Allowed 1.0 to 2.5.",
    ),
    SettingRow(
        name="LL factor permit",
        key="ll_factor_permit",
        kind="number",
        default=1.3,
        meaning="Rating: live-load factor for permit loads. 1.30 is the MBE value for routine "
        "(annual) permits mixed with traffic, ADTT > 5000, with the multi-lane distribution "
        "factor (MBE 6A.4.5.4.2; 1.20 at ADTT 1000, 1.10 below 100). Single-trip permits "
        "take other values and a one-lane distribution factor. Allowed 1.0 to 2.5.",
    ),
    SettingRow(
        name="Reference vehicle",
        key="reference_vehicle",
        kind="text",
        default="",
        meaning="Screening: a Vehicles row id or a built-in load model (e.g. HL-93), such as "
        "the load the members were designed for. When given, every vehicle's effects are "
        "compared with this one's (Screening sheet). Blank: no screening.",
    ),
    SettingRow(
        name="Screening floor",
        key="screening_floor",
        kind="number",
        default=0.1,
        meaning="Screening compares effects only where the reference's effect is at least this "
        "fraction of its largest effect of the same kind on the member (0.1 = 10 %), so that "
        "near-zero effects do not give meaningless ratios. spanfleet's choice, not a published "
        "value; 0 compares wherever the reference gives any effect.",
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
