"""End to end through ``python -m batch``: sample workbooks in, result sheets read back with pandas.

Every number in Envelopes, Reactions and Governing is compared with the engine's
envelope of the same case (read from the same workbook by the reader), and one
case is checked against closed forms for the 72 kip three-axle design truck on a
simple span (8, 32, 32 kip at 14 ft; no impact):

* midspan moment 18 L - 280 kip-ft for L >= 28 ft (closed form derived here by
  statics: 1520.0 kip-ft at L = 100 ft);
* end shear 72 - 672 / L kip (closed form derived here by statics, L >= 28 ft:
  65.28 kip at L = 100 ft; the AASHTO Standard Specifications Appendix A table
  gives 65.3 kip, from memory).
"""

from __future__ import annotations

import shutil
import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from tolerances import REL_TOL_EXACT

from batch.engine.effects import EFFECTS
from batch.engine.envelope import member_envelope, member_influence
from batch.loads.fleet import fleet_cases
from batch.rating.assess import AssessmentPlan
from batch.validating import read_input
from batch.writing.columns import direction_text

SAMPLES = Path(__file__).resolve().parent.parent / "sample_workbooks"


def _spanfleet(*args: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run(
        [sys.executable, "-m", "batch", *args],
        capture_output=True,
        text=True,
        timeout=120,
        check=False,
    )


def _assert_matches_engine(input_path: Path, results: Path) -> None:
    """Envelopes, Reactions and Governing equal the engine's envelope of the same case."""
    case = read_input(input_path).case
    assert case is not None
    units = case.settings.unit_labels
    sheets = pd.read_excel(results, sheet_name=["Envelopes", "Reactions", "Governing"])
    env_df, react_df, gov_df = sheets["Envelopes"], sheets["Reactions"], sheets["Governing"]
    cases = fleet_cases(case.vehicles, case.settings)
    n_env = n_react = 0
    plan = AssessmentPlan.of(case)
    for k, member in enumerate(case.members):
        # Rated sections off the grid are stations of the run's envelope too.
        sections = () if plan is None else plan.sections(member)
        il = member_influence(member, case.settings.stations_per_span, sections)
        env = member_envelope(
            member, cases, case.settings.stations_per_span, case.settings.directions, il=il
        )
        rows = {
            "station": env_df[env_df["Member"] == member.id],
            "support": react_df[react_df["Member"] == member.id],
        }
        n_env += len(rows["station"])
        n_react += len(rows["support"])
        assert np.allclose(rows["station"][f"x ({units['length']})"], env.station_x)
        assert np.array_equal(rows["support"]["Support"], np.arange(1, env.support_x.size + 1))
        gov = gov_df.iloc[k]
        assert gov["Member"] == member.id
        for eff in EFFECTS:
            ext = eff.extremes(env)
            df = rows[eff.rows]
            head = f"{eff.name} ({units[eff.quantity]})"
            assert np.allclose(df[head], ext.value, rtol=REL_TOL_EXACT, atol=0.0)
            vehicles = [env.labels[c] if c >= 0 else None for c in ext.case]
            assert [v if isinstance(v, str) else None for v in df[f"{eff.name} vehicle"]] == (
                vehicles
            )
            directions = [
                direction_text(d) if c >= 0 else None
                for c, d in zip(ext.case, ext.direction, strict=True)
            ]
            assert [v if isinstance(v, str) else None for v in df[f"{eff.name} direction"]] == (
                directions
            )
            extreme = eff.sense * np.max(eff.sense * ext.value)
            assert gov[head] == pytest.approx(extreme, rel=REL_TOL_EXACT)
    assert (n_env, n_react) == (len(env_df), len(react_df))


def test_us_sample_through_the_command_with_out(tmp_path: Path) -> None:
    src = tmp_path / "kvha-inventory.xlsx"
    shutil.copyfile(SAMPLES / src.name, src)
    before = src.read_bytes()
    out = tmp_path / "results.xlsx"
    done = _spanfleet("run", str(src), "--out", str(out))
    assert done.returncode == 0, done.stderr
    assert "Traceback" not in done.stderr
    assert src.read_bytes() == before
    _assert_matches_engine(src, out)
    header = pd.read_excel(out, sheet_name="Envelopes", nrows=0).columns
    assert "M max (kip-ft)" in header and "V min (kip)" in header and "x (ft)" in header


def test_si_sample_in_place(tmp_path: Path) -> None:
    src = tmp_path / "kvha-si-demo.xlsx"
    shutil.copyfile(SAMPLES / src.name, src)
    done = _spanfleet("run", str(src))
    assert done.returncode == 0, done.stderr
    _assert_matches_engine(src, src)
    header = pd.read_excel(src, sheet_name="Envelopes", nrows=0).columns
    assert "M max (kN-m)" in header and "V max (kN)" in header and "x (m)" in header
    react = pd.read_excel(src, sheet_name="Reactions", nrows=0).columns
    assert "R min (kN)" in react
    # The results workbook is still a valid input: a second run works and replaces them.
    again = _spanfleet("run", str(src))
    assert again.returncode == 0, again.stderr


def test_design_truck_closed_forms_through_the_command(tmp_path: Path, make_workbook) -> None:
    length = 100.0
    book = make_workbook(
        tmp_path,
        settings={"Stations per span": 10, "Dynamic load allowance": 0},
        members=[{"Member": "KV-0900 G1", "Spans (ft)": length}],
        vehicles=[
            {
                "Vehicle": "KVHA 3-axle 72",
                "Axle loads (kip)": "8, 32, 32",
                "Axle spacings (ft)": "14, 14",
            }
        ],
    )
    done = _spanfleet("run", str(book))
    assert done.returncode == 0, done.stderr
    env = pd.read_excel(book, sheet_name="Envelopes")
    mid = env[env["Station"] == 0.5].iloc[0]
    # Closed form derived here by statics: truck midspan moment 18 L - 280 (L >= 28 ft).
    assert mid["M max (kip-ft)"] == pytest.approx(18 * length - 280, rel=REL_TOL_EXACT)
    end = env[env["Station"] == 0.0].iloc[0]
    # Closed form derived here by statics: end shear 72 - 672 / L; heavy axles lead into
    # the span.
    assert end["V max (kip)"] == pytest.approx(72 - 672 / length, rel=REL_TOL_EXACT)
    react = pd.read_excel(book, sheet_name="Reactions")
    assert react["R max (kip)"].iloc[0] == pytest.approx(72 - 672 / length, rel=REL_TOL_EXACT)


def test_exit_statuses_of_the_installed_module(tmp_path: Path, make_workbook) -> None:
    assert _spanfleet("--version").returncode == 0
    assert _spanfleet("run").returncode == 2
    bad = make_workbook(tmp_path, members=[{"Member": "X", "Spans (ft)": "-5"}])
    before = bad.read_bytes()
    done = _spanfleet("run", str(bad))
    assert done.returncode == 1
    assert "Members!B2: " in done.stderr and "Traceback" not in done.stderr
    assert bad.read_bytes() == before
