"""The input sheets that docs/workbook.md specifies, generated from the model's declarations.

Each table sheet's columns are the declared fields of its dataclass
(:func:`batch.model.declare.columns_of`); the Settings sheet has one row per
declared field of :class:`~batch.model.case.Settings`. The reader, the template,
the JSON Schema and the docs read these, so nothing here is declared twice.
"""

from __future__ import annotations

from batch.model.case import (
    Analysis,
    Bridge,
    Capacity,
    GirderLayout,
    Member,
    Segment,
    ServiceSection,
    Settings,
    Vehicle,
)
from batch.model.declare import InputColumn, InputSheet, columns_of

__all__ = [
    "ANALYSIS",
    "BRIDGES",
    "CAPACITIES",
    "INPUT_SHEETS",
    "LAYOUT",
    "MEMBERS",
    "SEGMENTS",
    "SERVICE",
    "SETTINGS",
    "SETTING_ROWS",
    "TABLE_SHEETS",
    "VEHICLES",
]

#: The rows of the Settings sheet: one per setting, in sheet order, with defaults.
SETTING_ROWS: tuple[InputColumn, ...] = columns_of(Settings)

SETTINGS = InputSheet(
    name="Settings",
    key="settings",
    purpose="Run settings: one row per setting; blank or missing rows take the default.",
    columns=(
        InputColumn(key="setting", header="Setting", kind="text", required=True),
        InputColumn(key="value", header="Value", kind="text", required=True),
        InputColumn(
            key="meaning",
            header="Meaning",
            kind="text",
            meaning="What the setting does; for the reader only, never read by the program.",
        ),
    ),
)

MEMBERS = InputSheet(
    required=True,
    name="Members",
    key="members",
    purpose="One row per girder line (member).",
    columns=columns_of(Member),
)

SEGMENTS = InputSheet(
    name="Segments",
    key="segments",
    purpose="Optional: stretches of a member whose stiffness is not its Span EI (cover plates, "
    "flange changes, cracked or haunched regions), one row each. A haunch is modelled as "
    "prismatic pieces, each with the EI at its middle: an approximation whose error shrinks "
    "with the number of pieces.",
    columns=columns_of(Segment),
)

ANALYSIS = InputSheet(
    name="Analysis",
    key="analysis",
    purpose="Optional: one row per member analysed other than as the settings say: its own "
    "stations per span; live-load deflection (with the member's EI scale) against a "
    "span/deflection limit.",
    columns=columns_of(Analysis),
)

LAYOUT = InputSheet(
    name="Girder Layout",
    key="layout",
    purpose="Optional: one row per member whose live-load distribution factors spanfleet "
    "computes from its place in the cross-section (AASHTO LRFD 4.6.2.2); a DF typed on "
    "Members prevails. The Distribution Factors sheet shows each factor and its article.",
    columns=columns_of(GirderLayout),
)

VEHICLES = InputSheet(
    required=True,
    name="Vehicles",
    key="vehicles",
    purpose="One row per vehicle or library load model.",
    columns=columns_of(Vehicle),
)

CAPACITIES = InputSheet(
    name="Capacities",
    key="capacities",
    purpose="Optional: one row per member and station to be rated.",
    columns=columns_of(Capacity),
)

SERVICE = InputSheet(
    name="Service",
    key="service",
    purpose="Optional: one row per member and station checked at an LRFR service limit "
    "state (steel Service II, prestressed concrete Service III, reinforced concrete Service "
    "I under permits): the section at the checked fibre and its allowable stress.",
    columns=columns_of(ServiceSection),
)

BRIDGES = InputSheet(
    name="Bridges",
    key="bridges",
    purpose="Optional: one row per bridge, its traffic (ADTT) and riding surface, for the "
    "rating factors of its members.",
    columns=columns_of(Bridge),
)

#: The sheets of one row per item (all but Settings), in workbook order.
TABLE_SHEETS: tuple[InputSheet, ...] = (
    MEMBERS,
    SEGMENTS,
    ANALYSIS,
    LAYOUT,
    VEHICLES,
    CAPACITIES,
    SERVICE,
    BRIDGES,
)

#: The sheets a run reads, in workbook order (Segments, Analysis, Capacities, Service and
#: Bridges are optional).
INPUT_SHEETS: tuple[InputSheet, ...] = (SETTINGS, *TABLE_SHEETS)
