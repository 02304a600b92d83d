"""Every rating factor of the sample run recomputed from its sheet row alone.

The checker's test of the Rating Detail sheet: read back from the workbook the
``spanfleet run`` command wrote for the KVHA samples (US and SI), and for every
row recompute, with nothing but that row's cells,

* C = (phi c phi s) * (phi Rn), and phi c phi s = max(phi c * phi s, 0.85) for moment,
  phi c for shear (MBE Eq. 6A.4.2.1-2 and -3; the floor verified in M. A. Khan, Bridge and
  Highway Structure Rehabilitation and Repair, McGraw-Hill 2010, p. 187);
* LL+IM = (1 + IM) * LL axles + (1 + IM on lane) * LL lane (IM on lane 0 for these loads:
  the lane load takes no dynamic allowance, AASHTO LRFD 3.6.2.1, seen in published excerpts);
* RF = (C - gamma DC * DC - gamma DW * DW) / (gamma LL * (LL+IM)), and the operating RF
  with gamma LL operating (MBE 6A.4.2.1, from memory);
* gamma DC / gamma DW: 1.25 / 1.50 (or the bridge's own), 0.90 / 0.65 where the dead load
  relieves (AASHTO LRFD Table 3.4.1-2 minimums);

to :data:`REL_TOL_EXACT` (1e-9, the issue's promise). The Ratings sheet's row of each member
and vehicle is the detail row marked Governs, with the smallest RF. The Dead Loads sheet
of a simple span gives wL^2/8 and wL/2 (statics, common practice); the Postings sheet's
posted value is its posting load rounded down to whole tons (the Settings' default).
"""

from __future__ import annotations

import contextlib
import io
import math
import shutil
from pathlib import Path

import pandas as pd
import pytest
from tolerances import REL_TOL_EXACT

from batch.command.cli import main

SAMPLES = Path(__file__).resolve().parent.parent / "sample_workbooks"


@pytest.fixture(scope="module", params=["kvha-inventory.xlsx", "kvha-si-demo.xlsx"])
def sheets(request, tmp_path_factory) -> dict[str, pd.DataFrame]:
    folder = tmp_path_factory.mktemp("detail")
    book = folder / request.param
    shutil.copy(SAMPLES / request.param, book)
    out = folder / "rated.xlsx"
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
        assert main(["run", str(book), "--out", str(out), "--no-store"]) == 0
    names = ["Rating Detail", "Ratings", "Dead Loads", "Postings", "Members"]
    return pd.read_excel(out, sheet_name=names)


def _close(a: float, b: float) -> bool:
    return math.isclose(a, b, rel_tol=REL_TOL_EXACT, abs_tol=1e-12 * max(1.0, abs(b)))


def test_every_rf_recomputed_from_its_row_alone(sheets) -> None:
    detail = sheets["Rating Detail"]
    assert len(detail) > 40
    rated = 0
    for _, row in detail.iterrows():
        if str(row["Limit state"]).startswith("Service"):
            rated += _service_row_recomputed(row)
            continue
        flexure = row["Effect"] in ("M+", "M-")
        phi = max(row["phi c"] * row["phi s"], 0.85) if flexure else row["phi c"]
        assert row["phi s"] == 1.0 or flexure
        assert _close(row["phi c phi s"], phi)
        assert (row["Floor applied"] == "yes") == (flexure and row["phi c"] * row["phi s"] < 0.85)
        assert _close(row["C"], row["phi c phi s"] * row["phi Rn"])
        # DW 1.25 is Wren Ferry's own factor (overlay thickness measured, MBE Table
        # 6A.4.2.2-1, from memory). LFR: A1 = 1.3 on DC and DW; ASR: 1 (MBE 6B.4, from memory).
        lrfr = (("DC", "gamma DC", {1.25}, 0.9), ("DW", "gamma DW", {1.5, 1.25}, 0.65))
        for load, gamma, full, relief in lrfr:
            if row["Method"] == "LRFR":
                assert row[gamma] == relief if row[load] < 0 else row[gamma] in full
            else:
                assert row[gamma] == {"LFR": 1.3, "ASR": 1.0}[row["Method"]]
        if pd.isna(row["RF"]):
            assert row["LL+IM"] == 0  # nothing of this sense here: not rated
            continue
        live = (1 + row["IM"]) * row["LL axles"] + (1 + row["IM on lane"]) * row["LL lane"]
        assert _close(row["LL+IM"], live)
        dead = row["gamma DC"] * row["DC"] + row["gamma DW"] * row["DW"]
        numerator = row[row["C used"]] - dead
        assert _close(row["RF"], numerator / (row["gamma LL"] * row["LL+IM"]))
        if row["Category"] == "design":
            operating = (row["C operating"] - dead) / (row["gamma LL operating"] * row["LL+IM"])
            assert _close(row["RF operating"], operating)
        else:
            assert pd.isna(row["RF operating"])
        rated += 1
    assert rated > 20


def _cell(row: pd.Series, name: str) -> float:
    """The cell of the column headed ``name`` (with its unit, if any)."""
    return row[next(c for c in row.index if c == name or c.startswith(f"{name} ("))]


def _service_row_recomputed(row: pd.Series) -> int:
    """A service check's row, in stresses (ksi: 12 M / S; MPa: 1e6 M / S, exact units).

    C = fR: 0.95 Rh Fy composite, 0.80 Rh Fy non-composite (AASHTO LRFD 6.10.4.2.2, from
    memory), the allowable tension plus the prestress compression (prestressed); DC = s M DC /
    S nc + (1 - s) M DC / S lt, DW = M DW / S lt, LL+IM = M LL+IM / S st; dead-load factors 1
    (MBE Table 6A.4.2.2-1, from memory). Returns 1 where the row is rated.
    """
    per = {"ksi": 12.0, "MPa": 1e6}[row["Unit"]]
    assert pd.isna(row["phi Rn"]) and row["C used"] == "C = fR"
    assert row["gamma DC"] == row["gamma DW"] == 1.0
    rule, fy, rh = row["fR from"], _cell(row, "Fy"), row["Rh"]
    if rule.startswith("0.95 Rh Fy"):
        assert _close(row["C"], 0.95 * rh * fy)
    elif rule.startswith("0.80 Rh Fy"):
        assert _close(row["C"], 0.80 * rh * fy)
    elif rule.startswith("Allowable stress +"):
        assert _close(row["C"], _cell(row, "Allowable stress") + _cell(row, "Prestress stress"))
    share, m_dc, s_nc, s_lt = (_cell(row, n) for n in ("DC1 share", "M DC", "S nc", "S lt"))
    assert _close(row["DC"], per * (share * m_dc / s_nc + (1 - share) * m_dc / s_lt))
    assert _close(row["DW"], per * _cell(row, "M DW") / s_lt)
    assert _close(row["LL+IM"], per * _cell(row, "M LL+IM") / _cell(row, "S st"))
    if pd.isna(row["RF"]):
        return 0
    rf = (row["C"] - row["DC"] - row["DW"]) / (row["gamma LL"] * row["LL+IM"])
    assert _close(row["RF"], rf)
    if not pd.isna(row["RF operating"]):
        assert _close(
            row["RF operating"],
            (row["C"] - row["DC"] - row["DW"]) / (row["gamma LL operating"] * row["LL+IM"]),
        )
    return 1


def test_the_ratings_row_is_the_governing_detail_row(sheets) -> None:
    detail, ratings = sheets["Rating Detail"], sheets["Ratings"]
    governs = detail[detail["Governs"] == "yes"].set_index(["Member", "Vehicle"])
    for _, row in ratings.iterrows():
        if pd.isna(row["RF"]):
            continue
        mine = detail[(detail["Member"] == row["Member"]) & (detail["Vehicle"] == row["Vehicle"])]
        assert row["RF"] == mine["RF"].min()
        chosen = governs.loc[(row["Member"], row["Vehicle"])]
        for column in ("RF", "Effect", "C", "DC", "DW", "LL+IM", "gamma LL", "IM", "DF"):
            assert row[column] == chosen[column], column


def test_limit_states_and_one_lane_factors_follow_the_vehicle(sheets) -> None:
    detail = sheets["Rating Detail"]
    detail = detail[detail["Method"] == "LRFR"]
    service = detail["Limit state"].str.startswith("Service")
    strength2 = (detail["Category"] == "permit") & ~service
    assert set(detail.loc[strength2, "Limit state"]) == {"Strength II"}
    assert set(detail.loc[~strength2 & ~service, "Limit state"]) == {"Strength I"}
    # Service checks by material (MBE Table 6A.4.2.2-1, from memory): their rows say which,
    # and a kind the manual does not check there is not rated (blank RF).
    assert set(detail.loc[service, "Limit state"]) <= {"Service I", "Service II", "Service III"}
    unchecked = (
        service & (detail["Limit state"] == "Service III") & (detail["Category"] == "permit")
    )
    assert detail.loc[unchecked, "RF"].isna().all()
    special = detail["Permit type"].isin(["single-trip escorted", "single-trip", "multiple-trip"])
    assert set(detail.loc[special, "DF lanes"]) <= {"one lane / 1.2"}
    assert set(detail.loc[~special, "DF lanes"]) == {"multi-lane"}


def test_dead_loads_of_a_simple_span(sheets) -> None:
    dead, members = sheets["Dead Loads"], sheets["Members"]
    simple = members[~members.iloc[:, 1].astype(str).str.contains(",")].iloc[0]
    member, span = simple.iloc[0], float(simple.iloc[1])
    w = float(simple[next(c for c in members.columns if c.startswith("DC load"))])
    rows = dead[dead["Member"] == member]
    mid = rows[rows["Station"] == 0.5].iloc[0]
    dc_m = next(c for c in dead.columns if c.startswith("DC M"))
    dc_v = next(c for c in dead.columns if c.startswith("DC V"))
    dc_r = next(c for c in dead.columns if c.startswith("DC R"))
    assert _close(mid[dc_m], w * span**2 / 8)
    first = rows[rows["Station"] == 0.0].iloc[0]
    assert _close(first[dc_v], w * span / 2)
    support = rows[rows["Support"] == 1].iloc[0]
    assert _close(support[dc_r], w * span / 2)


def test_postings_are_rounded_down_by_the_owners_rule(sheets) -> None:
    postings = sheets["Postings"]
    posting = [c for c in postings.columns if " posting (" in c]
    assert posting
    for column in posting:
        posted = column.replace(" posting (", " posted (")
        for value, rounded in zip(postings[column], postings[posted], strict=True):
            if pd.isna(value):
                assert pd.isna(rounded)
            else:
                assert rounded == math.floor(value)


def test_a_ranged_vehicle_says_the_spacing_it_governs_with(sheets) -> None:
    # The HL-93 design truck's rear spacing varies from 14 to 30 ft (AASHTO LRFD 9th ed.,
    # 3.6.1.2.2), and the two trucks of the 90 % negative-moment load are at least 50 ft
    # apart (3.6.1.3.1): every row such a load case governs (US sample) says the spacing
    # used for its ranged gap, within its range, with the unit; a load case of fixed
    # spacings (the tandem) says none. Every spacing cell is numbers and the length unit.
    detail, ratings = sheets["Rating Detail"], sheets["Ratings"]
    unit = " m" if "at (m)" in detail else " ft"
    for text in pd.concat([detail["spacing"], ratings["spacing"]]).dropna():
        assert text.endswith(unit), text
        assert all(float(v) > 0 for v in text.removesuffix(unit).split("; ")), text
    if unit == " m":
        return
    label = detail["Load case"].fillna("")
    for part, low, high in (("HL-93 (truck + lane)", 14.0, 30.0), ("two trucks", 50.0, 1e4)):
        said = detail.loc[label.str.contains(part, regex=False), "spacing"].dropna()
        assert len(said) > 0, part
        for text in said:
            assert low <= float(text.removesuffix(unit)) <= high, (part, text)
    assert detail.loc[label.str.contains("tandem"), "spacing"].isna().all()
