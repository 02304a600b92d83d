"""Every problem an engineer can meet in an input, as a table of (sheet, cell, code).

Sources, by rule:
* sheets, headers, list syntax (the number rule of batch/reading/cells.py),
  settings and their choices: the workbook format, docs/workbook.md;
* hinge stability: statics of a line of rigid parts joined by hinges: each part
  has two freedoms (deflection and rotation), each support and each hinge takes
  one, so a member with n spans is a mechanism with more than n - 1 hinges, and
  a hinge at an end releases nothing (common practice);
* dynamic load allowance above 75 %: AASHTO LRFD Table 3.6.2.1-1, whose largest
  value is 75 % for deck joints (seen quoted in an engineers' forum thread at
  engineerboards.com);
* condition × system factor of at least 0.85: MBE 6A.4.2.1 (from memory);
* condition and system factors of at least 0.85 each (the lowest of the MBE's
  tables, from memory), rating load factors from 1.0 to 2.5 with a warning away
  from the published values (MBE Table 6A.4.2.2-1 and the legal and permit
  tables, from memory);
* Capacities rows: docs/workbook.md ("Capacities": member, span and
  station as in Envelopes; resistances; a blank resistance is not rated);
* Segments rows: a stretch lies on its member and runs forwards, stretches of one
  member do not overlap (one stiffness per point), a haunch has a stiffness at
  each end; a stiffness twenty times away from the member's is a likely typing
  slip (common practice: cover plates add tens of percent, deep haunches a few
  times);
* Analysis rows: one per member; the deflection inputs need the EI scale, and
  without DF deflection the moment DF is used, which AASHTO LRFD 2.5.2.6.2 (all
  lanes loaded, all girders deflecting equally) does not ask for: a warning;
* Girder Layout rows: one per member; Kg or n, I, A and eg (AASHTO LRFD Eq.
  4.6.2.2.1-1), not both; an exterior girder's overhang de (Tables 4.6.2.2.2d-1 and
  4.6.2.2.3b-1); the ranges of applicability of Tables 4.6.2.2.2b-1 and 4.6.2.2.3a-1
  (4.5 <= ts <= 12 in, 20 <= L <= 240 ft, from memory; a warning, the formula still used);
  a DF typed on Members prevails over the layout's (docs/workbook.md, Girder Layout);
* Bridges and permit kinds: the workbook contract (docs/workbook.md, Bridges;
  the MBE's permit kinds of Table 6A.4.5.4.2a-1 and its crawl-speed rule,
  6A.4.5.5, from memory);
* JSON: RFC 8259 (no NaN or Infinity; object names should be unique) and RFC
  6901 (JSON pointers);
* text a cell cannot hold: W3C XML 1.0 (Fifth Edition) §2.2, production [2] Char,
  and the 32,767 characters of a cell (Microsoft's "Excel specifications and limits");
* the least span and the least ratio of spans, and the refusals of factors and dead
  loads: batch/validating/checks.py (MIN_SPAN, MIN_SPAN_RATIO, LIMITS; common practice,
  and the engine's precision measured in tests/test_refusals.py).
"""

from __future__ import annotations

import datetime as dt
import json
from pathlib import Path

import openpyxl
import pytest

from batch.reading.problems import JSON_SHEET, Problem
from batch.validating import read_input

M = {"Member": "KV-0101 G1", "Spans": 60}
MC = M | {"DC load": 1.1}  # a member with a dead load, as rating needs
CAP = ["Member", "Span", "Station", "Resistance M+"]
SVC = ["Member", "Span", "Station", "Material", "S nc", "Fy"]
SEG = ["Member", "From", "To", "EI"]
CAPX = ["Member", "Span", "x", "Resistance M+"]
V = {"Vehicle": "KV-T3", "Axle loads": "10, 30, 30", "Axle spacings": "14, 16"}
F = {"Vehicle": "KV-FAT", "Library": "Fatigue I"}
MF = M | {"DF moment single lane": 0.5, "DF shear single lane": 0.6}  # as fatigue needs
E, W = "error", "warning"
GL = ["Member", "Cross-section", "Girder", "Girders", "Spacing (ft)", "Deck thickness (in)", "Kg"]
GLI = ["KV-0101 G1", "a", "interior", 5, 8.5, 8]  # a girder layout row up to its Kg
BRIDGES = [["Bridge", "ADTT"], ["KV-0101", 1200]]


def _found(report) -> list[tuple[str, str, str, str]]:
    return sorted((p.sheet, p.cell, p.code, p.severity) for p in report.problems + report.warnings)


def _sheet(*rows: list) -> list[list]:
    return [list(r) for r in rows]


# (test id, make_workbook arguments, expected problems)
WORKBOOK_CASES = [
    # sheets and headers
    ("no-vehicles-sheet", {"omit": ("Vehicles",)}, [("Vehicles", "", "missing-sheet", E)]),
    ("no-settings-sheet", {"omit": ("Settings",)}, [("Settings", "", "missing-sheet", E)]),
    (
        "no-spans-header",
        {"members": [{"Member": "M1", "Span": 60}]},
        [("Members", "", "missing-header", E), ("Members", "B1", "unknown-column", W)],
    ),
    (
        "no-value-header",
        {"omit": ("Settings",), "extra": {"Settings": _sheet(["Setting", "Val"], ["Units", "US"])}},
        [("Settings", "", "missing-header", E), ("Settings", "B1", "unknown-column", W)],
    ),
    (
        "header-twice",
        {"extra": {"Members": _sheet(["Member", "Spans", "spans (ft)"], ["M1", 60, 70])}},
        [("Members", "C1", "duplicate-header", E)],
    ),
    (
        "metres-header-in-us",
        {"members": [{"Member": "M1", "Spans (m)": 18}]},
        [("Members", "B1", "header-unit-mismatch", E)],
    ),
    (
        "inches-header",
        {"members": [{"Member": "M1", "Spans (in)": 720}]},
        [("Members", "B1", "header-unit-mismatch", E)],
    ),
    (
        "kip-header-in-si",
        {
            "settings": {"Units": "SI"},
            "members": [{"Member": "M1", "Spans (m)": 18}],
            "vehicles": [{"Vehicle": "V1", "Axle loads (kip)": "10, 10", "Axle spacings": 1.2}],
        },
        [("Vehicles", "B1", "header-unit-mismatch", E)],
    ),
    (
        "unknown-column",
        {"vehicles": [V | {"Remarks": "x"}]},
        [("Vehicles", "D1", "unknown-column", W)],
    ),
    (
        "unknown-unit-header",
        {"members": [{"Member": "M1", "Spans (furlongs)": 60}]},
        [("Members", "B1", "header-unit-unknown", E)],
    ),
    (
        "a-note-in-a-unit-header",
        {
            "vehicles": [
                {"Vehicle": "V1", "Axle loads (front first)": "10, 30", "Axle spacings": 14}
            ]
        },
        [("Vehicles", "B1", "header-unit-unknown", E)],
    ),
    (
        "two-members-sheets",
        {"extra": {" members ": _sheet(["Member", "Spans"], ["KV-0207 G2", 70])}},
        [("Members", "", "duplicate-sheet", E)],
    ),
    (
        "data-without-header",
        {"extra": {"Members": _sheet(["Member", "Spans"], ["KV-0101 G1", 60, "30"])}},
        [("Members", "C2", "data-without-header", E)],
    ),
    (
        "row-with-data-only-in-unread-columns",
        {
            "extra": {
                "Members": _sheet(
                    ["Member", "Spans", "Remarks"], ["KV-0101 G1", 60], [None, None, "KV-0102?"]
                )
            }
        },
        [("Members", "C1", "unknown-column", W), ("Members", "C3", "row-not-read", E)],
    ),
    (
        "capacities-headers-only",
        {"extra": {"Capacities": _sheet(["Member", "Span", "Station"])}},
        [],
    ),
    (
        "capacities-without-station-header",
        {
            "members": [MC],
            "extra": {"Capacities": _sheet(CAP[:2] + CAP[3:], ["KV-0101 G1", 1, 900])},
        },
        [("Capacities", "A2", "no-section", E)],
    ),
    # capacities
    (
        "capacity-unknown-member",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-9999", 1, 0.5, 900])}},
        [("Capacities", "A2", "unknown-member", E)],
    ),
    (
        "capacity-span-2-of-1",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 2, 0.5, 900])}},
        [("Capacities", "B2", "span-not-on-member", E)],
    ),
    (
        "capacity-span-zero",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 0, 0.5, 900])}},
        [("Capacities", "B2", "too-small", E)],
    ),
    (
        "capacity-span-fraction",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1.5, 0.5, 900])}},
        [("Capacities", "B2", "not-a-whole-number", E)],
    ),
    # members as built: a rated section anywhere
    (
        "capacity-station-off-grid-adds-a-station",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.45, 900])}},
        [],
    ),
    (
        "capacity-by-x",
        {"members": [MC], "extra": {"Capacities": _sheet(CAPX, ["KV-0101 G1", None, 7.5, 900])}},
        [],
    ),
    (
        "capacity-by-x-off-the-member",
        {"members": [MC], "extra": {"Capacities": _sheet(CAPX, ["KV-0101 G1", None, 61, 900])}},
        [("Capacities", "C2", "x-off-member", E)],
    ),
    (
        "capacity-by-x-at-an-interior-support",
        {
            "members": [MC | {"Spans": "60, 60"}],
            "extra": {"Capacities": _sheet(CAPX, ["KV-0101 G1", None, 60, 900])},
        },
        [("Capacities", "B2", "x-at-support", E)],
    ),
    (
        "capacity-by-x-at-an-interior-support-with-its-span",
        {
            "members": [MC | {"Spans": "60, 60"}],
            "extra": {"Capacities": _sheet(CAPX, ["KV-0101 G1", 2, 60, 900])},
        },
        [],
    ),
    (
        "capacity-by-x-in-another-span",
        {
            "members": [MC | {"Spans": "60, 60"}],
            "extra": {"Capacities": _sheet(CAPX, ["KV-0101 G1", 1, 75, 900])},
        },
        [("Capacities", "C2", "x-not-in-span", E)],
    ),
    (
        "capacity-station-and-x",
        {
            "members": [MC],
            "extra": {"Capacities": _sheet([*CAP, "x"], ["KV-0101 G1", 1, 0.5, 900, 30])},
        },
        [("Capacities", "E2", "station-and-x", E)],
    ),
    (
        "capacity-no-section",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, None, 900])}},
        [("Capacities", "C2", "no-section", E)],
    ),
    (
        "capacity-x-twice-as-a-fraction",
        {
            "members": [MC],
            "extra": {
                "Capacities": _sheet(
                    [*CAP, "x"],
                    ["KV-0101 G1", 1, 0.25, 900, None],
                    ["KV-0101 G1", None, None, 900, 15],
                )
            },
        },
        [("Capacities", "A3", "duplicate-capacity", E)],
    ),
    (
        "capacity-station-on-a-finer-grid",
        {
            "settings": {"Stations per span": 20},
            "members": [MC],
            "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.45, 900])},
        },
        [],
    ),
    (
        "capacity-station-within-tolerance",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.3000004, 900])}},
        [],
    ),
    (
        "capacity-station-above-1",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 1.2, 900])}},
        [("Capacities", "C2", "too-large", E)],
    ),
    (
        "capacity-negative-resistance",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.5, -900])}},
        [("Capacities", "D2", "too-small", E)],
    ),
    (
        "capacity-no-resistance",
        {"members": [MC], "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.5, None])}},
        [("Capacities", "D2", "no-resistance", E)],
    ),
    (
        "capacity-twice",
        {
            "members": [MC],
            "extra": {
                "Capacities": _sheet(
                    CAP, ["KV-0101 G1", 1, 0.5, 900], [" kv-0101 g1", 1, 0.5000001, 950]
                )
            },
        },
        [("Capacities", "A3", "duplicate-capacity", E)],
    ),
    (
        "capacity-without-dead-load",
        {"extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.5, 900])}},
        [("Capacities", "A2", "no-dead-load", W)],
    ),
    (
        "capacity-dead-load-given-on-the-row",
        {
            "extra": {
                "Capacities": _sheet([*CAP, "DC M", "DC V"], ["KV-0101 G1", 1, 0.5, 900, 410, 0])
            }
        },
        [],
    ),
    (
        "capacity-dead-load-text",
        {
            "members": [MC],
            "extra": {"Capacities": _sheet([*CAP, "DC M"], ["KV-0101 G1", 1, 0.5, 900, "lots"])},
        },
        [("Capacities", "E2", "not-a-number", E)],
    ),
    # members as built: stiffness along a member (Segments)
    (
        "segment-ok-haunch",
        {
            "extra": {
                "Segments": _sheet(
                    [*SEG, "EI at To", "Haunch"], ["KV-0101 G1", 40, 60, 1, 3, "parabolic"]
                )
            }
        },
        [],
    ),
    (
        "segment-unknown-member",
        {"extra": {"Segments": _sheet(SEG, ["KV-9999", 10, 20, 1.4])}},
        [("Segments", "A2", "unknown-member", E)],
    ),
    (
        "segment-backwards",
        {"extra": {"Segments": _sheet(SEG, ["KV-0101 G1", 30, 20, 1.4])}},
        [("Segments", "C2", "segment-backwards", E)],
    ),
    (
        "segment-beyond-the-member",
        {"extra": {"Segments": _sheet(SEG, ["KV-0101 G1", 50, 61, 1.4])}},
        [("Segments", "C2", "segment-off-member", E)],
    ),
    (
        "segments-overlap",
        {
            "extra": {
                "Segments": _sheet(SEG, ["KV-0101 G1", 0, 20, 1.4], ["kv-0101 g1", 15, 30, 1.2])
            }
        },
        [("Segments", "B3", "segment-overlap", E)],
    ),
    (
        "segment-haunch-without-end",
        {"extra": {"Segments": _sheet([*SEG, "Haunch"], ["KV-0101 G1", 40, 60, 1, "linear"])}},
        [("Segments", "E2", "haunch-without-end", E)],
    ),
    (
        "segment-end-without-haunch",
        {"extra": {"Segments": _sheet([*SEG, "EI at To"], ["KV-0101 G1", 40, 60, 1, 2])}},
        [("Segments", "E2", "end-without-haunch", E)],
    ),
    (
        "segment-ei-typing-slip",
        {"extra": {"Segments": _sheet(SEG, ["KV-0101 G1", 40, 60, 140])}},
        [("Segments", "D2", "implausible-stiffness", W)],
    ),
    (
        "segment-unknown-haunch",
        {"extra": {"Segments": _sheet([*SEG, "Haunch"], ["KV-0101 G1", 40, 60, 1, "curved"])}},
        [("Segments", "E2", "not-a-choice", E)],
    ),
    # members as built: a member's own analysis options (Analysis)
    (
        "analysis-own-stations",
        {"extra": {"Analysis": _sheet(["Member", "Stations per span"], ["KV-0101 G1", 20])}},
        [],
    ),
    (
        "analysis-unknown-member",
        {"extra": {"Analysis": _sheet(["Member", "Stations per span"], ["KV-9999", 20])}},
        [("Analysis", "A2", "unknown-member", E)],
    ),
    (
        "analysis-twice",
        {
            "extra": {
                "Analysis": _sheet(
                    ["Member", "Stations per span"], ["KV-0101 G1", 20], ["kv-0101 g1", 12]
                )
            }
        },
        [("Analysis", "A3", "duplicate-analysis", E)],
    ),
    (
        "analysis-limit-without-ei",
        {"extra": {"Analysis": _sheet(["Member", "Deflection limit"], ["KV-0101 G1", 1000])}},
        [("Analysis", "B2", "deflection-without-ei", E)],
    ),
    (
        "analysis-deflection-takes-df-moment",
        {"extra": {"Analysis": _sheet(["Member", "EI scale (kip-in2)"], ["KV-0101 G1", 2e9])}},
        [("Analysis", "B2", "deflection-takes-df-moment", W)],
    ),
    (
        "analysis-deflection-with-its-df",
        {
            "extra": {
                "Analysis": _sheet(
                    ["Member", "EI scale", "DF deflection"], ["KV-0101 G1", 2e9, 0.5]
                )
            }
        },
        [],
    ),
    (
        "analysis-ei-scale-in-kip-ft2",
        {
            "extra": {
                "Analysis": _sheet(
                    ["Member", "EI scale (kip-ft2)", "DF deflection"], ["KV-0101 G1", 2e7, 0.5]
                )
            }
        },
        [("Analysis", "B1", "header-unit-mismatch", E)],
    ),
    # distribution factors from the girder layout (Girder Layout)
    (
        "layout-within-every-range",
        {"extra": {"Girder Layout": _sheet(GL, [*GLI, 1_500_000])}},
        [],
    ),
    (
        "layout-unknown-member",
        {"extra": {"Girder Layout": _sheet(GL, ["KV-9999", *GLI[1:], 1_500_000])}},
        [("Girder Layout", "A2", "unknown-member", E)],
    ),
    (
        "layout-twice",
        {
            "extra": {
                "Girder Layout": _sheet(GL, [*GLI, 1_500_000], ["kv-0101 g1", *GLI[1:], 1_500_000])
            }
        },
        [("Girder Layout", "A3", "duplicate-layout", E)],
    ),
    (
        "layout-no-stiffness",
        {"extra": {"Girder Layout": _sheet(GL[:-1], GLI)}},
        [("Girder Layout", "A2", "stiffness-missing", E)],
    ),
    (
        "layout-section-incomplete",
        {"extra": {"Girder Layout": _sheet([*GL[:-1], "n", "Girder I (in4)"], [*GLI, 8, 24000])}},
        [("Girder Layout", "A2", "stiffness-missing", E)],
    ),
    (
        "layout-stiffness-twice",
        {"extra": {"Girder Layout": _sheet([*GL, "n"], [*GLI, 1_500_000, 8])}},
        [("Girder Layout", "H2", "stiffness-twice", E)],
    ),
    (
        "layout-exterior-without-overhang",
        {"extra": {"Girder Layout": _sheet(GL, ["KV-0101 G1", "a", "exterior", *GLI[3:], 1e6])}},
        [("Girder Layout", "A2", "overhang-missing", E)],
    ),
    (
        "layout-interior-overhang-unused",
        {"extra": {"Girder Layout": _sheet([*GL, "Overhang de (ft)"], [*GLI, 1_500_000, 2])}},
        [("Girder Layout", "H2", "overhang-unused", W)],
    ),
    (
        "layout-deck-outside-the-range",
        {"extra": {"Girder Layout": _sheet(GL, [*GLI[:5], 13, 1_500_000])}},
        [("Girder Layout", "F2", "outside-range", W)],
    ),
    (
        "layout-span-outside-the-range",
        {
            "members": [M | {"Spans": 15}],
            "extra": {"Girder Layout": _sheet(GL, [*GLI, 1_500_000])},
        },
        [("Members", "B2", "outside-range", W)],
    ),
    (
        "layout-two-girders",
        {"extra": {"Girder Layout": _sheet(GL, [*GLI[:3], 2, *GLI[4:], 1_500_000])}},
        [("Girder Layout", "D2", "too-small", E)],
    ),
    (
        "layout-unknown-cross-section",
        {"extra": {"Girder Layout": _sheet(GL, ["KV-0101 G1", "b", *GLI[2:], 1_500_000])}},
        [("Girder Layout", "B2", "not-a-choice", E)],
    ),
    (
        "layout-deck-in-feet",
        {
            "extra": {
                "Girder Layout": _sheet([*GL[:5], "Deck thickness (ft)", GL[6]], [*GLI, 1_500_000])
            }
        },
        [("Girder Layout", "F1", "header-unit-mismatch", E)],
    ),
    (
        "layout-df-typed-on-members-prevails",
        {
            "members": [M | {"DF moment": 0.7}],
            "extra": {"Girder Layout": _sheet(GL, [*GLI, 1_500_000])},
        },
        [("Members", "C2", "df-prevails", W)],
    ),
    # settings
    (
        "unknown-setting",
        {"settings": {"Colour": "red"}},
        [("Settings", "A2", "unknown-setting", W)],
    ),
    (
        "setting-twice",
        {"settings": {"Units": "US", "units ": "SI"}},
        [("Settings", "A3", "duplicate-setting", E)],
    ),
    (
        "value-without-setting",
        {"omit": ("Settings",), "extra": {"Settings": _sheet(["Setting", "Value"], [None, 5])}},
        [("Settings", "B2", "setting-without-name", W)],
    ),
    ("units-metric", {"settings": {"Units": "metric"}}, [("Settings", "B2", "not-a-choice", E)]),
    (
        "directions-bad",
        {"settings": {"Directions": "north"}},
        [("Settings", "B2", "not-a-choice", E)],
    ),
    (
        "stations-fraction",
        {"settings": {"Stations per span": 2.5}},
        [("Settings", "B2", "not-a-whole-number", E)],
    ),
    ("stations-zero", {"settings": {"Stations per span": 0}}, [("Settings", "B2", "too-small", E)]),
    (
        "stations-500",
        {"settings": {"Stations per span": 500}},
        [("Settings", "B2", "too-large", E)],
    ),
    (
        "impact-percent",
        {"settings": {"Dynamic load allowance": 33}},
        [("Settings", "B2", "too-large", E)],
    ),
    (
        "impact-negative",
        {"settings": {"Dynamic load allowance": -0.1}},
        [("Settings", "B2", "too-small", E)],
    ),
    (
        "impact-above-lrfd-largest",
        {"settings": {"Dynamic load allowance": 0.8}},
        [("Settings", "B2", "implausible-value", W)],
    ),
    ("dc-factor-below-1", {"settings": {"DC factor": 0.9}}, [("Settings", "B2", "too-small", E)]),
    (
        "ll-factor-legal-3",
        {"settings": {"LL factor legal": 3}},
        [("Settings", "B2", "too-large", E)],
    ),
    (
        "ll-factor-design-1.6",
        {"settings": {"LL factor design": 1.6}},
        [("Settings", "B2", "unpublished-factor", W)],
    ),
    ("dw-factor-field-measured", {"settings": {"DW factor": 1.25}}, []),
    (
        "relieving-factor-above-1",
        {"settings": {"DC factor relieving": 1.1}},
        [("Settings", "B2", "too-large", E)],
    ),
    (
        "reference-unknown",
        {"settings": {"Reference vehicle": "KV-T9"}},
        [("Settings", "B2", "unknown-reference", E)],
    ),
    ("reference-in-the-fleet", {"settings": {"Reference vehicle": " kv-t3"}}, []),
    ("reference-in-the-library", {"settings": {"Reference vehicle": "hl93"}}, []),
    (
        "screening-floor-1",
        {"settings": {"Screening floor": 1}},
        [("Settings", "B2", "too-large", E)],
    ),
    (
        "chart-members-negative",
        {"settings": {"Chart members": -1}},
        [("Settings", "B2", "too-small", E)],
    ),
    # cells
    (
        "formula-not-calculated",
        {"members": [M | {"DF moment": "=0.5+0.1"}]},
        [("Members", "C2", "formula-not-calculated", E)],
    ),
    (
        "boolean-span",
        {"members": [{"Member": "M1", "Spans": True}]},
        [("Members", "B2", "boolean-in-number-cell", E)],
    ),
    (
        "date-span",
        {"members": [{"Member": "M1", "Spans": dt.datetime(2024, 6, 1)}]},
        [("Members", "B2", "date-in-number-cell", E)],
    ),
    (
        "unit-in-cell",
        {"members": [{"Member": "M1", "Spans": "60 ft"}]},
        [("Members", "B2", "not-a-number", E)],
    ),
    (
        "decimal-comma",
        {"members": [M | {"DF moment": "0,62"}]},
        [("Members", "C2", "ambiguous-decimal-comma", E)],
    ),
    (
        "si-decimal-comma-in-spans",
        {
            "settings": {"Units": "SI"},
            "members": [{"Member": "M1", "Spans": "12,5, 14"}],
            "vehicles": [{"Vehicle": "V1", "Axle loads": "100, 100", "Axle spacings": 1.2}],
        },
        [("Members", "B2", "ambiguous-decimal-comma", E)],
    ),
    (
        "si-decimal-comma-in-spacings",
        {
            "settings": {"Units": "SI"},
            "members": [{"Member": "M1", "Spans": "18"}],
            "vehicles": [{"Vehicle": "V1", "Axle loads": "100, 100", "Axle spacings": "1,2"}],
        },
        [("Vehicles", "C2", "ambiguous-decimal-comma", E)],
    ),
    (
        "list-typed-without-spaces",
        {"members": [{"Member": "M1", "Spans": "60,80,60"}]},
        [("Members", "B2", "ambiguous-decimal-comma", E)],
    ),
    (
        "thousands-separated-by-spaces-in-a-list",
        {"vehicles": [V | {"Axle loads": "1 250, 30, 30"}]},
        [("Vehicles", "B2", "mixed-separators", E)],
    ),
    (
        "no-break-space-thousands",
        {"members": [M | {"DC load": "1\u00a0250"}]},
        [("Members", "C2", "thousands-separator", E)],
    ),
    ("overflow", {"members": [M | {"DF shear": "1e999"}]}, [("Members", "C2", "not-finite", E)]),
    (
        "overflow-in-a-list",
        {"members": [{"Member": "M1", "Spans": "60, 1e999"}]},
        [("Members", "B2", "not-finite", E)],
    ),
    (
        "error-value",
        {"members": [M | {"DF shear": "#DIV/0!"}]},
        [("Members", "C2", "formula-error", E)],
    ),
    (
        "range-backwards",
        {"vehicles": [V | {"Axle spacings": "14, 30-14"}]},
        [("Vehicles", "C2", "inverted-range", E)],
    ),
    (
        "range-of-three",
        {"vehicles": [V | {"Axle spacings": "14, 14-30-40"}]},
        [("Vehicles", "C2", "bad-range", E)],
    ),
    # required values and rows
    ("no-members", {"members": []}, [("Members", "", "no-rows", E)]),
    ("no-vehicles", {"vehicles": []}, [("Vehicles", "", "no-rows", E)]),
    (
        "member-without-id",
        {"members": [{"Member": None, "Spans": 60}]},
        [("Members", "A2", "missing-value", E)],
    ),
    (
        "member-without-spans",
        {"members": [{"Member": "M1", "Spans": None, "Hinges": 10}]},
        [("Members", "B2", "missing-value", E)],
    ),
    # values out of range
    (
        "span-zero",
        {"members": [{"Member": "M1", "Spans": "60, 0"}]},
        [("Members", "B2", "too-small", E)],
    ),
    (
        "span-negative",
        {"members": [{"Member": "M1", "Spans": -60}]},
        [("Members", "B2", "too-small", E)],
    ),
    ("df-zero", {"members": [M | {"DF moment": 0}]}, [("Members", "C2", "too-small", E)]),
    ("dead-load-negative", {"members": [M | {"DC load": -1}]}, [("Members", "C2", "too-small", E)]),
    (
        "condition-factor-above-1",
        {"members": [M | {"Condition factor": 1.2}]},
        [("Members", "C2", "too-large", E)],
    ),
    (
        "category-unknown",
        {"vehicles": [V | {"Category": "rental"}]},
        [("Vehicles", "D2", "not-a-choice", E)],
    ),
    (
        "axle-zero",
        {"vehicles": [V | {"Axle loads": "10, 0, 30"}]},
        [("Vehicles", "B2", "too-small", E)],
    ),
    (
        "lane-negative",
        {"vehicles": [V | {"Lane load": -0.64}]},
        [("Vehicles", "D2", "too-small", E)],
    ),
    (
        "condition-factor-below-poor",
        {"members": [M | {"Condition factor": 0.8}]},
        [("Members", "C2", "factor-below-published", E)],
    ),
    (
        "system-factor-below-mbe",
        {"members": [M | {"System factor": 0.75}]},
        [("Members", "C2", "factor-below-published", E)],
    ),
    (
        "capacity-factors-below-mbe-floor",
        {"members": [M | {"Condition factor": 0.85, "System factor": 0.9}]},
        [("Members", "C2", "low-capacity-factors", W)],
    ),
    # cross-field checks: members
    (
        "same-member-twice",
        {"members": [M, M | {"Member": "  kv-0101 g1 "}]},
        [("Members", "A3", "duplicate-id", E)],
    ),
    (
        "span-ei-count",
        {"members": [M | {"Span EI": "1, 2"}]},
        [("Members", "C2", "count-mismatch", E)],
    ),
    (
        "hinge-at-end",
        {"members": [M | {"Hinges": 60}]},
        [("Members", "C2", "hinge-outside-member", E)],
    ),
    (
        "hinge-beyond-end",
        {"members": [M | {"Hinges": 75}]},
        [("Members", "C2", "hinge-outside-member", E)],
    ),
    ("hinge-zero", {"members": [M | {"Hinges": 0}]}, [("Members", "C2", "too-small", E)]),
    (
        "hinge-twice",
        {"members": [{"Member": "M1", "Spans": "60, 60", "Hinges": "70, 70"}]},
        [("Members", "C2", "duplicate-hinge", E)],
    ),
    # one span, one hinge: two parts on one support each (n - 1 = 0 hinges allowed)
    (
        "simple-span-with-hinge",
        {"members": [M | {"Hinges": 30}]},
        [("Members", "C2", "mechanism", E)],
    ),
    # two spans, a hinge in each: 2 > n - 1 = 1
    (
        "two-hinges-two-spans",
        {"members": [{"Member": "M1", "Spans": "60, 60", "Hinges": "30, 90"}]},
        [("Members", "C2", "mechanism", E)],
    ),
    (
        "31-spans",
        {"members": [{"Member": "M1", "Spans": ", ".join(["40"] * 31)}]},
        [("Members", "B2", "limit-exceeded", E)],
    ),
    (
        "span-20000-ft",
        {"members": [{"Member": "M1", "Spans": 20000}]},
        [("Members", "B2", "limit-exceeded", E)],
    ),
    (
        "span-1200-ft",
        {"members": [{"Member": "M1", "Spans": 1200}]},
        [("Members", "B2", "implausible-value", W)],
    ),
    (
        "span-half-a-foot",
        {"members": [{"Member": "M1", "Spans": "60, 0.5, 60"}]},
        [("Members", "B2", "span-too-short", E)],
    ),
    (
        "span-a-thousandth-of-the-longest",
        {"members": [{"Member": "M1", "Spans": "1500, 1.2"}]},
        [("Members", "B2", "implausible-value", W), ("Members", "B2", "span-too-short", E)],
    ),
    ("df-2.5", {"members": [M | {"DF shear": 2.5}]}, [("Members", "C2", "implausible-value", W)]),
    ("df-1e300", {"members": [M | {"DF moment": 1e300}]}, [("Members", "C2", "limit-exceeded", E)]),
    (
        "dead-load-500",
        {"members": [M | {"DC load": 500}]},
        [("Members", "C2", "limit-exceeded", E)],
    ),
    (
        "dead-load-40",
        {"members": [M | {"DW load": 40}]},
        [("Members", "C2", "implausible-value", W)],
    ),
    # cross-field checks: vehicles
    ("same-vehicle-twice", {"vehicles": [V, V]}, [("Vehicles", "A3", "duplicate-id", E)]),
    (
        "lane-only",
        {"vehicles": [{"Vehicle": "KV-LANE", "Lane load": 0.64}]},
        [("Vehicles", "A2", "no-axle-loads", E)],
    ),
    (
        "library-and-axles",
        {"vehicles": [V | {"Library": "HL-93"}]},
        [("Vehicles", "B2", "library-with-axles", E)],
    ),
    (
        "library-and-lane",
        {"vehicles": [{"Vehicle": "KV-HL", "Library": "HL-93", "Lane load": 0.64}]},
        [("Vehicles", "C2", "library-with-lane-load", E)],
    ),
    (
        # A library model sets its own impact (HS20: the Standard Specifications' formula).
        "library-and-impact",
        {"vehicles": [{"Vehicle": "KV-HS", "Library": "HS20", "Impact": "Settings"}]},
        [("Vehicles", "C2", "library-with-impact", E)],
    ),
    (
        "impact-rule-unknown",
        {"vehicles": [V | {"Impact": "LRFD 33 %"}]},
        [("Vehicles", "D2", "not-a-choice", E)],
    ),
    (
        "library-unknown",
        {"vehicles": [{"Vehicle": "KV-X", "Library": "KVHA-99"}]},
        [("Vehicles", "B2", "unknown-library", E)],
    ),
    # what was probably meant (batch/validating/friendly.py: a value unusual in the Units
    # setting's system but ordinary in the other; HL-93 in AASHTO LRFD 3.6.1.2: axles 8, 32,
    # 32 kip = 35, 145, 145 kN, lane 0.64 kip/ft = 9.3 kN/m; common practice for the bounds)
    (
        "kN-axles-in-a-US-workbook",
        {"vehicles": [V | {"Axle loads": "35, 145, 145"}]},
        [("Vehicles", "B2", "unit-mixup", W)],
    ),
    (
        "kN-lane-in-a-US-workbook",
        {"vehicles": [V | {"Lane load": 9.3}]},
        [("Vehicles", "D2", "unit-mixup", W)],
    ),
    (
        "kip-axles-in-an-SI-workbook",
        {
            "settings": {"Units": "SI"},
            "members": [M],
            "vehicles": [V | {"Axle loads": "8, 32, 32"}],
        },
        [("Vehicles", "B2", "unit-mixup", W)],
    ),
    (
        "kip-lane-in-an-SI-workbook",
        {
            "settings": {"Units": "SI"},
            "members": [M],
            "vehicles": [V | {"Axle loads": "50, 150, 150", "Lane load": 0.64}],
        },
        [("Vehicles", "D2", "unit-mixup", W)],
    ),
    (
        "ft-spans-in-an-SI-workbook",
        {
            "settings": {"Units": "SI"},
            "members": [M | {"Spans": "180, 240"}],
            "vehicles": [V | {"Axle loads": "50, 150, 150"}],
        },
        [("Members", "B2", "unit-mixup", W)],
    ),
    (
        "no-axle-loads-column",
        {"vehicles": [{"Vehicle": f"KV-T{k}", "Axle spacing": "14"} for k in range(3)]},
        [("Vehicles", "", "no-axle-loads-column", E), ("Vehicles", "B1", "unknown-column", W)],
    ),
    (
        "former-factor-header",
        {"vehicles": [V | {"Factor": 1.1}]},
        [],
    ),
    (
        "load-multiplier-header",
        {"vehicles": [V | {"Load multiplier": 1.2}]},
        [],
    ),
    (
        "spacing-count",
        {"vehicles": [V | {"Axle spacings": "14"}]},
        [("Vehicles", "C2", "count-mismatch", E)],
    ),
    (
        "two-axles-no-spacing",
        {"vehicles": [{"Vehicle": "V2", "Axle loads": "20, 20"}]},
        [("Vehicles", "A2", "count-mismatch", E)],
    ),
    (
        "five-ranges",
        {
            "vehicles": [
                {
                    "Vehicle": "V6",
                    "Axle loads": "10, 10, 10, 10, 10, 10",
                    "Axle spacings": "4-8, 4-8, 4-8, 4-8, 4-8",
                }
            ]
        },
        [("Vehicles", "C2", "too-many-ranges", E)],
    ),
    (
        "81-axles",
        {
            "vehicles": [
                {
                    "Vehicle": "V81",
                    "Axle loads": ", ".join(["5"] * 81),
                    "Axle spacings": ", ".join(["4"] * 80),
                }
            ]
        },
        [("Vehicles", "B2", "limit-exceeded", E)],
    ),
    (
        "axle-600-kip",
        {"vehicles": [V | {"Axle loads": "10, 600, 30"}]},
        [("Vehicles", "B2", "implausible-value", W)],
    ),
    (
        "axle-6000-kip",
        {"vehicles": [V | {"Axle loads": "10, 6000, 30"}]},
        [("Vehicles", "B2", "limit-exceeded", E)],
    ),
    (
        "spacing-1500-ft",
        {"vehicles": [V | {"Axle spacings": "14, 14-1500"}]},
        [("Vehicles", "C2", "implausible-value", W)],
    ),
    (
        "lane-12-klf",
        {"vehicles": [V | {"Lane load": 12}]},
        [("Vehicles", "D2", "implausible-value", W)],
    ),
    ("factor-20", {"vehicles": [V | {"Factor": 20}]}, [("Vehicles", "D2", "implausible-value", W)]),
    (
        "factor-5000",
        {"vehicles": [V | {"Factor": 5000}]},
        [("Vehicles", "D2", "limit-exceeded", E)],
    ),
    # library models' needs: a fatigue load uses the single-lane distribution factors
    # (AASHTO LRFD 3.6.1.1.2, from memory); an emergency vehicle is rated with the generic
    # legal factor, the MBE's own EV factors not being in published text (a warning).
    (
        "fatigue-without-single-lane-df",
        {"members": [M | {"DF moment single lane": 0.5}], "vehicles": [F]},
        [("Members", "A2", "fatigue-needs-single-lane-df", E)],
    ),
    ("fatigue-with-single-lane-df", {"members": [MF], "vehicles": [F]}, []),
    (
        "fatigue-reference-without-single-lane-df",
        {"settings": {"Reference vehicle": "Fatigue II"}},
        [("Members", "A2", "fatigue-needs-single-lane-df", E)],
    ),
    (
        "emergency-vehicle-rated",
        {
            "members": [MC],
            "vehicles": [V, {"Vehicle": "KV-EV3", "Library": "EV3"}],
            "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.5, 900])},
        },
        [("Vehicles", "D3", "library-caution", W)],
    ),
    ("emergency-vehicle-not-rated", {"vehicles": [V, {"Vehicle": "KV-EV3", "Library": "EV3"}]}, []),
    # per-bridge traffic and permit kinds (MBE Tables 6A.4.4.2.3a-1 and 6A.4.5.4.2a-1 and
    # 6A.4.5.5, from memory; the workbook contract's Bridges sheet)
    (
        "bridge-not-on-bridges-sheet",
        {"members": [M | {"Bridge": "KV-0999"}], "extra": {"Bridges": BRIDGES}},
        [("Members", "C2", "unknown-bridge", E)],
    ),
    (
        "bridge-but-no-bridges-sheet",
        {"members": [M | {"Bridge": "KV-0101"}]},
        [("Members", "C2", "unknown-bridge", E)],
    ),
    (
        "bridge-twice",
        {"extra": {"Bridges": [*BRIDGES, ["kv-0101 ", 300]]}},
        [("Bridges", "A3", "duplicate-id", E)],
    ),
    (
        "adtt-blank-with-legal-loads",
        {
            "vehicles": [V | {"Category": "legal"}],
            "extra": {"Bridges": _sheet(["Bridge", "Riding surface"], ["KV-0101", "smooth"])},
        },
        [("Bridges", "A2", "no-adtt", W)],
    ),
    (
        "adtt-blank-design-loads-only",
        {"extra": {"Bridges": _sheet(["Bridge", "Riding surface"], ["KV-0101", "smooth"])}},
        [],
    ),
    (
        "adtt-negative",
        {"extra": {"Bridges": _sheet(["Bridge", "ADTT"], ["KV-0101", -5])}},
        [("Bridges", "B2", "too-small", E)],
    ),
    (
        "riding-surface-unknown",
        {"extra": {"Bridges": _sheet(["Bridge", "Riding surface"], ["KV-0101", "bumpy"])}},
        [("Bridges", "B2", "not-a-choice", E)],
    ),
    (
        "bridge-legal-factor-unpublished",
        {"extra": {"Bridges": _sheet(["Bridge", "ADTT", "LL factor legal"], ["KV-0101", 9, 2.2])}},
        [("Bridges", "C2", "unpublished-factor", W)],
    ),
    (
        "permit-type-on-a-legal-load",
        {"vehicles": [V | {"Category": "legal", "Permit type": "routine"}]},
        [("Vehicles", "E2", "permit-type-not-permit", E)],
    ),
    (
        "permit-type-unknown",
        {"vehicles": [V | {"Category": "permit", "Permit type": "annual superload"}]},
        [("Vehicles", "E2", "not-a-choice", E)],
    ),
    (
        "crawl-speed-not-escorted",
        {
            "vehicles": [
                V | {"Category": "permit", "Permit type": "single-trip", "Crawl speed": "yes"}
            ]
        },
        [("Vehicles", "F2", "crawl-not-escorted", E)],
    ),
    (
        "special-permit-without-single-lane-df",
        {
            "members": [MC],
            "vehicles": [V | {"Category": "permit", "Permit type": "single-trip escorted"}],
            "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.5, 2000])},
        },
        [("Members", "A2", "no-single-lane-df", W)],
    ),
    # rating methods (MBE Section 6B): ASR needs its operating allowables
    (
        "asr-without-operating-capacity",
        {
            "members": [MC | {"Rating method": "ASR"}],
            "extra": {"Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.5, 900])},
        },
        [("Capacities", "A2", "no-operating-capacity", E)],
    ),
    (
        "asr-with-operating-capacity",
        {
            "members": [MC | {"Rating method": "asr"}],
            "extra": {
                "Capacities": _sheet([*CAP, "Operating M+"], ["KV-0101 G1", 1, 0.5, 900, 1200])
            },
        },
        [],
    ),
    (
        "operating-capacity-on-an-lrfr-member",
        {
            "members": [MC],
            "extra": {
                "Capacities": _sheet([*CAP, "Operating M+"], ["KV-0101 G1", 1, 0.5, 900, 1200])
            },
        },
        [("Capacities", "E2", "operating-not-asr", E)],
    ),
    (
        "rating-method-unknown",
        {"members": [M | {"Rating method": "WSD"}]},
        [("Members", "C2", "not-a-choice", E)],
    ),
    (
        "special-permit-with-single-lane-dfs",
        {
            "members": [MC | {"DF moment single lane": 0.5, "DF shear single lane": 0.6}],
            "vehicles": [V | {"Category": "permit", "Permit type": "multiple-trip"}],
            "extra": {
                "Capacities": _sheet(CAP, ["KV-0101 G1", 1, 0.5, 2000]),
                "Bridges": BRIDGES,
            },
        },
        [],
    ),
    # The Service sheet (LRFR service limit states, batch/validating/service.py).
    (
        "service-row-of-an-unknown-member",
        {
            "members": [MC],
            "extra": {"Service": _sheet(SVC, ["KV-0999 G1", 1, 0.5, "steel", 600, 50])},
        },
        [("Service", "A2", "unknown-member", E)],
    ),
    (
        "service-row-without-a-section",
        {
            "members": [MC],
            "extra": {"Service": _sheet(SVC, ["KV-0101 G1", 1, None, "steel", 600, 50])},
        },
        [("Service", "C2", "no-section", E)],
    ),
    (
        "service-row-without-material-or-s-nc",
        {
            "members": [MC],
            "extra": {"Service": _sheet(SVC, ["KV-0101 G1", 1, 0.5, None, None, 50])},
        },
        [("Service", "D2", "missing-value", E), ("Service", "E2", "missing-value", E)],
    ),
    (
        "service-on-an-lfr-member",
        {
            "members": [MC | {"Rating method": "LFR"}],
            "extra": {"Service": _sheet(SVC, ["KV-0101 G1", 1, 0.5, "steel", 600, 50])},
        },
        [("Service", "A2", "service-not-lrfr", E)],
    ),
    (
        "service-two-materials-on-one-member",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    SVC,
                    ["KV-0101 G1", 1, 0.5, "steel", 600, 50],
                    ["KV-0101 G1", 1, 0.3, "reinforced concrete", 600, 60],
                )
            },
        },
        [("Service", "D3", "service-two-materials", E)],
    ),
    (
        "service-station-twice",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    SVC,
                    ["KV-0101 G1", 1, 0.5, "steel", 600, 50],
                    ["KV-0101 G1", 1, 0.5, "steel", 700, 50],
                )
            },
        },
        [("Service", "A3", "duplicate-capacity", E)],
    ),
    (
        "steel-service-without-a-stress-limit",
        {"members": [MC], "extra": {"Service": _sheet(SVC, ["KV-0101 G1", 1, 0.5, "steel", 600])}},
        [("Service", "F2", "service-no-limit", E)],
    ),
    (
        "steel-service-with-two-stress-limits",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    [*SVC, "Allowable stress"], ["KV-0101 G1", 1, 0.5, "steel", 600, 50, 40]
                )
            },
        },
        [("Service", "G2", "service-two-limits", E)],
    ),
    (
        "prestressed-service-without-its-stresses",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    [*SVC[:5], "Allowable stress", "Prestress stress"],
                    ["KV-0101 G1", 1, 0.5, "prestressed concrete", 9000],
                )
            },
        },
        [
            ("Service", "F2", "service-no-allowable", E),
            ("Service", "G2", "service-no-prestress", E),
        ],
    ),
    (
        "prestressed-service-in-hogging-with-fy",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    [*SVC, "Allowable stress", "Prestress stress", "Service effect"],
                    ["KV-0101 G1", 1, 0.5, "prestressed concrete", 9000, 60, 0.465, 2.4, "M-"],
                )
            },
        },
        [
            ("Service", "F2", "service-input-not-for-material", E),
            ("Service", "I2", "service-prestressed-hogging", E),
        ],
    ),
    (
        "rh-and-prestress-on-reinforced-concrete",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    [*SVC, "Rh", "Prestress stress", "Prestress losses"],
                    [
                        "KV-0101 G1",
                        1,
                        0.5,
                        "reinforced concrete",
                        900,
                        60,
                        0.9,
                        1,
                        "refined with elastic gains",
                    ],
                )
            },
        },
        [
            ("Service", "G2", "service-input-not-for-material", E),
            ("Service", "H2", "service-input-not-for-material", E),
            ("Service", "I2", "service-input-not-for-material", E),
        ],
    ),
    (
        "service-inputs-out-of-range",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    [*SVC, "Rh", "DC1 share"],
                    ["KV-0101 G1", 1, 0.5, "aluminium", 0, 50, 1.2, 1.5],
                )
            },
        },
        [
            ("Service", "D2", "not-a-choice", E),
            ("Service", "E2", "too-small", E),
            ("Service", "G2", "too-large", E),
            ("Service", "H2", "too-large", E),
        ],
    ),
    (
        "service-section-modulus-in-the-other-units",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    [*SVC[:4], "S nc (mm3)", "Fy (ksi)"], ["KV-0101 G1", 1, 0.5, "steel", 600, 50]
                )
            },
        },
        [("Service", "E1", "header-unit-mismatch", E)],
    ),
    (
        "service-check-alone-composite-steel",
        {
            "members": [MC],
            "extra": {
                "Service": _sheet(
                    [*SVC, "S lt", "S st", "Rh", "DC1 share"],
                    ["KV-0101 G1", 1, 0.5, "steel", 600, 50, 800, 1000, 1, 0.8],
                )
            },
        },
        [],
    ),
]


@pytest.mark.parametrize(
    ("arguments", "expected"),
    [pytest.param(a, e, id=i) for i, a, e in WORKBOOK_CASES],
)
def test_workbook_problem_table(make_workbook, tmp_path, arguments, expected):
    report = read_input(make_workbook(tmp_path, **arguments))
    assert _found(report) == sorted(expected), [p.render() for p in report.problems]
    assert report.ok == (not report.problems)
    assert (report.case is None) == bool(report.problems)
    for problem in report.problems + report.warnings:
        assert "; " in problem.message, f"no fix given: {problem.render()}"


def test_all_problems_are_reported_at_once(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        settings={"Units": "metric"},
        members=[{"Member": "M1", "Spans": "60, x"}, {"Member": "M2", "Spans": 0}],
        vehicles=[{"Vehicle": "V1", "Axle loads": "10, 30", "Library": "HL-93"}],
    )
    assert _found(read_input(path)) == [
        ("Members", "B2", "not-a-number", E),
        ("Members", "B3", "too-small", E),
        ("Settings", "B2", "not-a-choice", E),
        ("Vehicles", "B2", "library-with-axles", E),
    ]


def test_problems_are_listed_in_workbook_order(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        settings={"Units": "metric"},
        members=[{"Member": "M1", "Spans": "60, x"}, {"Member": "M2", "Spans": 0}],
        vehicles=[{"Vehicle": "V1", "Axle loads": "10, 30", "Library": "HL-93"}],
    )
    cells = [p.render().split(":")[0] for p in read_input(path).problems]
    assert cells == ["Settings!B2", "Members!B2", "Members!B3", "Vehicles!B2"]


def test_a_list_stored_as_one_number(tmp_path, make_workbook):
    path = make_workbook(tmp_path, members=[{"Member": "M1", "Spans": 120100}])
    wb = openpyxl.load_workbook(path)
    wb["Members"]["B2"].number_format = "#,##0"  # how "120,100" typed into a cell is stored
    wb.save(path)
    assert _found(read_input(path)) == [("Members", "B2", "list-stored-as-number", E)]


def test_a_formula_stored_as_text(tmp_path, make_workbook):
    path = make_workbook(tmp_path, members=[M | {"DF moment": 0.6}])
    wb = openpyxl.load_workbook(path)
    cell = wb["Members"]["C2"]
    cell.value, cell.data_type = "=0.5+0.1", "s"  # text that looks like a formula
    wb.save(path)
    assert _found(read_input(path)) == [("Members", "C2", "formula-as-text", E)]


def test_messages_name_the_fix(make_workbook, tmp_path):
    path = make_workbook(
        tmp_path,
        members=[{"Member": "M1", "Spans": 60, "Hinges": 30}],
        vehicles=[{"Vehicle": "V1", "Library": "KVHA-99"}],
    )
    rendered = [p.render() for p in read_input(path).problems]
    assert rendered[0].startswith("Members!C2: the hinges make the member a mechanism: ")
    assert "the part from 0 to 30 ft and the part from 30 to 60 ft" in rendered[0]
    assert rendered[1].startswith("Vehicles!B2: 'KVHA-99' is not a built-in load model; ")
    assert "HL-93" in rendered[1]


def test_an_unknown_library_name_suggests_the_nearest(make_workbook, tmp_path):
    path = make_workbook(tmp_path, vehicles=[{"Vehicle": "V1", "Library": "Type3S"}])
    (problem,) = read_input(path).problems
    assert "did you mean Type 3S2" in problem.render()


def test_a_missing_axle_column_is_one_message(make_workbook, tmp_path):
    rows = [{"Vehicle": f"KV-T{k}", "Lane load": 0.64} for k in range(5)]
    problems = read_input(make_workbook(tmp_path, vehicles=rows)).problems
    assert [p.code for p in problems] == ["no-axle-loads-column"]
    assert "Axle loads (kip)" in problems[0].render()


def test_the_load_multiplier_is_read_under_its_former_header(make_workbook, tmp_path):
    path = make_workbook(tmp_path, vehicles=[V | {"Factor": 1.1}])
    assert read_input(path).case.vehicles[0].factor == 1.1


def test_render_shapes():
    def problem(sheet: str, cell: str) -> Problem:
        return Problem(code="x", sheet=sheet, cell=cell, message="what; fix")

    assert problem("Members", "C7").render() == "Members!C7: what; fix"
    assert problem("Members", "").render() == "Members: what; fix"
    assert problem("", "").render() == "file: what; fix"
    assert problem(JSON_SHEET, "/members/3/spans").render() == "JSON /members/3/spans: what; fix"
    as_dict = problem("Members", "C7").to_dict()
    assert as_dict["text"] == "Members!C7: what; fix"
    assert as_dict["severity"] == "error"


GOOD_MEMBER = {"id": "KV-0101 G1", "spans": [60]}
GOOD_VEHICLE = {"id": "KV-T3", "axle_loads": [10, 30, 30], "spacings": [14, 16]}


def _doc(**kw) -> dict:
    return {"members": [GOOD_MEMBER], "vehicles": [GOOD_VEHICLE]} | kw


# (test id, document text, expected (cell, code) with sheet "JSON")
JSON_CASES = [
    (
        "nan",
        '{"settings": {"impact": NaN}, "members": [{"id": "M", "spans": [60]}], '
        '"vehicles": [{"id": "V", "axle_loads": [5]}]}',
        [("/settings/impact", "not-finite")],
    ),
    (
        "huge-number",
        '{"members": [{"id": "M", "spans": [1e999]}], '
        '"vehicles": [{"id": "V", "axle_loads": [5]}]}',
        [("/members/0/spans/0", "not-finite")],
    ),
    (
        "key-twice",
        '{"members": [{"id": "M", "spans": [60], "spans": [70]}], '
        '"vehicles": [{"id": "V", "axle_loads": [5]}]}',
        [("/members/0/spans", "duplicate-key")],
    ),
    ("not-an-object", "[1, 2]", [("", "json-not-object")]),
    (
        "text-span",
        json.dumps(_doc(members=[{"id": "M", "spans": ["60"]}])),
        [("/members/0/spans/0", "not-a-number")],
    ),
    (
        "spans-not-list",
        json.dumps(_doc(members=[{"id": "M", "spans": 60}])),
        [("/members/0/spans", "wrong-type")],
    ),
    (
        "empty-spans",
        json.dumps(_doc(members=[{"id": "M", "spans": []}])),
        [("/members/0/spans", "empty-list")],
    ),
    (
        "blank-id",
        json.dumps(_doc(members=[{"id": " ", "spans": [60]}])),
        [("/members/0/id", "blank-text")],
    ),
    (
        "misspelt-key",
        json.dumps(_doc(members=[GOOD_MEMBER | {"hinge": [30]}])),
        [("/members/0/hinge", "unknown-key")],
    ),
    ("unknown-top-key", json.dumps(_doc(decks=[])), [("/decks", "unknown-key")]),
    (
        "capacity-unknown-member",
        json.dumps(
            _doc(capacities=[{"member": "KV-9", "span": 1, "station": 0.5, "resistance_v": 90}])
        ),
        [("/capacities/0/member", "unknown-member")],
    ),
    (
        "capacity-unknown-key",
        json.dumps(
            _doc(capacities=[{"member": "KV-0101 G1", "span": 1, "station": 0.5, "Rn": 90}])
        ),
        [("/capacities/0/Rn", "unknown-key"), ("/capacities/0/resistance_m_pos", "no-resistance")],
    ),
    ("no-spans", json.dumps(_doc(members=[{"id": "M"}])), [("/members/0/spans", "missing-value")]),
    ("no-members-key", json.dumps({"vehicles": [GOOD_VEHICLE]}), [("/members", "missing-value")]),
    (
        "range-backwards",
        json.dumps(_doc(vehicles=[GOOD_VEHICLE | {"spacings": [14, {"low": 30, "high": 14}]}])),
        [("/vehicles/0/spacings/1", "inverted-range")],
    ),
    (
        "range-half",
        json.dumps(_doc(vehicles=[GOOD_VEHICLE | {"spacings": [14, {"low": 30}]}])),
        [("/vehicles/0/spacings/1/high", "missing-value")],
    ),
    (
        "spacing-negative",
        json.dumps(_doc(vehicles=[GOOD_VEHICLE | {"spacings": [14, -16]}])),
        [("/vehicles/0/spacings/1", "too-small")],
    ),
    (
        "spacing-text",
        json.dumps(_doc(vehicles=[GOOD_VEHICLE | {"spacings": [14, "16"]}])),
        [("/vehicles/0/spacings/1", "wrong-type")],
    ),
    (
        "stations-fraction",
        json.dumps(_doc(settings={"stations_per_span": 2.5})),
        [("/settings/stations_per_span", "not-a-whole-number")],
    ),
    (
        "boolean-factor",
        json.dumps(_doc(vehicles=[GOOD_VEHICLE | {"factor": True}])),
        [("/vehicles/0/factor", "not-a-number")],
    ),
    (
        "same-id",
        json.dumps(_doc(members=[GOOD_MEMBER, GOOD_MEMBER])),
        [("/members/1/id", "duplicate-id")],
    ),
    (
        "vehicles-a-number",  # found by the JSON fuzz: once an internal error
        '{"members": [{"id": "M", "spans": [60]}], "vehicles": 1e308}',
        [("/vehicles", "wrong-type")],
    ),
    (
        "control-character-in-an-id",
        json.dumps(_doc(members=[{"id": "KV-0101\u0007 G1", "spans": [60]}])),
        [("/members/0/id", "text-control-character")],
    ),
    (
        "unpaired-surrogate-in-a-description",
        '{"members": [{"id": "M", "spans": [60], "description": "Heron \\ud800 Creek"}], '
        '"vehicles": [{"id": "V", "axle_loads": [5]}]}',
        [("/members/0/description", "text-not-unicode")],
    ),
    (
        "text-longer-than-a-cell",
        json.dumps(_doc(vehicles=[GOOD_VEHICLE | {"description": "x" * 32_768}])),
        [("/vehicles/0/description", "text-too-long")],
    ),
    (
        "tab-and-line-feed-are-text",
        json.dumps(_doc(vehicles=[GOOD_VEHICLE | {"description": "KVHA\tgravel\ntruck"}])),
        [],
    ),
]


@pytest.mark.parametrize(("text", "expected"), [pytest.param(t, e, id=i) for i, t, e in JSON_CASES])
def test_json_problem_table(tmp_path, text, expected):
    path = tmp_path / "case.json"
    path.write_text(text, "utf-8")
    report = read_input(path)
    assert sorted((p.cell, p.code) for p in report.problems) == sorted(expected), [
        p.render() for p in report.problems
    ]
    assert all(p.sheet == JSON_SHEET for p in report.problems)
    assert (report.case is None) == bool(expected)


@pytest.mark.parametrize(
    ("data", "code"),
    [
        pytest.param(b'{"members": [}', "invalid-json", id="syntax"),
        pytest.param('{"members": "é"}'.encode("latin-1"), "json-not-utf8", id="latin-1"),
        pytest.param(b"[" * 100_000 + b"]" * 100_000, "invalid-json", id="deep"),
    ],
)
def test_unreadable_json(tmp_path, data, code):
    path = tmp_path / "case.json"
    path.write_bytes(data)
    report = read_input(path)
    assert [(p.sheet, p.cell, p.code) for p in report.problems] == [("", "", code)]
    assert report.problems[0].render().startswith("file: ")


def test_json_pointer_escapes_keys(tmp_path):
    # RFC 6901: "~" is written "~0" and "/" is written "~1".
    path = tmp_path / "case.json"
    path.write_text(json.dumps(_doc(members=[GOOD_MEMBER | {"a/b~c": 1}])), "utf-8")
    (problem,) = read_input(path).problems
    assert problem.cell == "/members/0/a~1b~0c"


def test_missing_file(tmp_path: Path):
    report = read_input(tmp_path / "nowhere.xlsx")
    assert [(p.code, p.render()[:5]) for p in report.problems] == [("file-not-found", "file:")]
    assert read_input(tmp_path).problems[0].code == "not-a-file"
