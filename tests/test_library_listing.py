"""``spanfleet library``: every model's axles, spacings, lane load and dynamic allowance.

The listing shows what each built-in model puts on a member, so an engineer can check
it against the standard without reading the source; ``--json`` gives the same to
scripts, with each value's source and status. Checked against the HL-93 design
truck, tandem and lane of AASHTO LRFD Art. 3.6.1.2.2 to 3.6.1.2.4 (8, 32, 32 kip at
14 ft and 14 to 30 ft; two 25 kip axles 4 ft apart; 0.64 kip/ft; the run's IM,
3.6.2.1), the Fatigue truck's fixed 30 ft rear spacing and 15 % allowance (3.6.1.4.1,
Table 3.6.2.1-1), and the exact conversion 1 kip = 4.4482216152605 kN,
1 ft = 0.3048 m (NIST SP 811, Appendix B).
"""

from __future__ import annotations

import contextlib
import io
import json

import pytest

from batch.command.cli import EXIT_OK, main
from batch.loads import library

KIP_KN = 4.4482216152605
FT_M = 0.3048
REL_TOL_CONVERSION = 1e-12


def _run(*argv: str) -> str:
    out = io.StringIO()
    with contextlib.redirect_stdout(out):
        assert main(list(argv)) == EXIT_OK
    return out.getvalue()


def _line(text: str, start: str) -> list[str]:
    line = next(ln for ln in text.splitlines() if ln.strip().startswith(start))
    return [cell.strip() for cell in line.strip()[len(start) :].split("  ") if cell.strip()]


def test_the_listing_shows_each_parts_axles_spacings_lane_and_allowance() -> None:
    listing = _run("library")
    text = listing[listing.index("\nParts (") :]
    assert _line(text, "HL-93 (truck + lane)") == ["8, 32, 32", "14, 14-30", "0.64", "run's", "1"]
    assert _line(text, "HL-93 (tandem + lane)") == ["25, 25", "4", "0.64", "run's", "1"]
    assert _line(text, "Fatigue truck ")[:4] == ["8, 32, 32", "14, 30", "0", "0.15"]
    # the verification status of each model stays in the listing
    assert "partly from memory" in listing and "from memory" in listing


def test_json_gives_every_model_its_parts_and_sourced_values() -> None:
    doc = json.loads(_run("library", "--json"))
    models = {m["name"]: m for m in doc["models"]}
    assert set(models) == set(library.names())
    hl93 = models["HL-93"]
    truck = hl93["parts"][0]
    assert truck["axle_loads"] == [8.0, 32.0, 32.0]
    assert truck["spacings"] == [[14.0, 14.0], [14.0, 30.0]]
    assert truck["lane_load"] == 0.64 and truck["dynamic_allowance"] is None
    two_trucks = hl93["parts"][2]
    assert [50.0, None] in two_trucks["spacings"]  # at least 50 ft apart: no upper end
    assert all(v["status"] in doc["statuses"] for m in doc["models"] for v in m["values"])
    assert all(v["source"] for m in doc["models"] for v in m["values"])


def test_si_listing_converts_exactly() -> None:
    us = {m["name"]: m for m in json.loads(_run("library", "--json"))["models"]}
    si = {m["name"]: m for m in json.loads(_run("library", "--json", "--units", "SI"))["models"]}
    a, b = us["HS20"]["parts"][0], si["HS20"]["parts"][0]
    assert b["axle_loads"] == pytest.approx(
        [p * KIP_KN for p in a["axle_loads"]], rel=REL_TOL_CONVERSION
    )
    assert b["spacings"][1] == pytest.approx([s * FT_M for s in a["spacings"][1]])
