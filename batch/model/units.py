"""The two unit systems, their labels, and exact conversion between them.

US models are defined in kip, ft and kip/ft; SI models in kN, m and kN/m. The
factors are exact by definition: 1 ft = 0.3048 m and 1 lbf = 4.4482216152605 N
(international yard and pound, 1959; NIST SP 811, Appendix B), so
1 kip = 4.4482216152605 kN and 1 kip/ft = 4.4482216152605 / 0.3048 kN/m.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal, get_args

__all__ = [
    "IN_CONSISTENT_UNITS",
    "KN_PER_KIP",
    "M_PER_FT",
    "UNIT_LABELS",
    "UNIT_SYSTEMS",
    "Conversion",
    "Quantity",
    "UnitSystem",
    "conversion",
]

UnitSystem = Literal["US", "SI"]
#: A physical quantity whose unit a header shows ("" for a plain number).
Quantity = Literal[
    "",
    "length",
    "force",
    "moment",
    "line_load",
    "rigidity",
    "deflection",
    "thickness",
    "area",
    "inertia",
    "angle",
    "stress",
    "section_modulus",
]
UNIT_SYSTEMS: tuple[str, ...] = get_args(UnitSystem)

#: Unit labels of each system, by quantity, as shown in headers.
#: Flexural rigidity (an input) and deflection (a result) are in the units engineers use
#: for them, not in the run's consistent force and length units (IN_CONSISTENT_UNITS); so
#: are a girder layout's section dimensions (thickness, area, second moment of area: in,
#: in2, in4 or mm, mm2, mm4) and its skew angle (degrees in both systems).
UNIT_LABELS: dict[str, dict[str, str]] = {
    "US": {
        "force": "kip",
        "length": "ft",
        "moment": "kip-ft",
        "line_load": "kip/ft",
        "rigidity": "kip-in2",
        "deflection": "in",
        "thickness": "in",
        "area": "in2",
        "inertia": "in4",
        "angle": "deg",
        "stress": "ksi",
        "section_modulus": "in3",
    },
    "SI": {
        "force": "kN",
        "length": "m",
        "moment": "kN-m",
        "line_load": "kN/m",
        "rigidity": "kN-m2",
        "deflection": "mm",
        "thickness": "mm",
        "area": "mm2",
        "inertia": "mm4",
        "angle": "deg",
        "stress": "MPa",
        "section_modulus": "mm3",
    },
}

#: What one unit of a quantity whose label is not the run's consistent unit is in the
#: consistent units (kip and ft, or kN and m): 1 kip-in2 = 1/144 kip-ft2, 1 in = 1/12 ft,
#: 1 ksi = 144 kip/ft2, 1 in3 = 1/1728 ft3; 1 mm = 0.001 m, 1 MPa = 1000 kN/m2,
#: 1 mm3 = 1e-9 m3 (exact by definition).
IN_CONSISTENT_UNITS: dict[str, dict[str, float]] = {
    "US": {
        "rigidity": 1.0 / 144.0,
        "deflection": 1.0 / 12.0,
        "stress": 144.0,
        "section_modulus": 1.0 / 1728.0,
    },
    "SI": {"rigidity": 1.0, "deflection": 1e-3, "stress": 1e3, "section_modulus": 1e-9},
}

#: kN in one kip (exact: 1000 lbf of 4.4482216152605 N).
KN_PER_KIP = 4.4482216152605
#: Metres in one foot (exact).
M_PER_FT = 0.3048


@dataclass(frozen=True)
class Conversion:
    """Multipliers that take force, length and line load from one system to another."""

    force: float
    length: float

    @property
    def line_load(self) -> float:
        """Multiplier for a force per unit length."""
        return self.force / self.length

    @property
    def moment(self) -> float:
        """Multiplier for a moment (force times length)."""
        return self.force * self.length


def conversion(source: UnitSystem, target: UnitSystem) -> Conversion:
    """Multipliers from ``source`` units to ``target`` units ("US" or "SI")."""
    if source == target:
        return Conversion(1.0, 1.0)
    if (source, target) == ("US", "SI"):
        return Conversion(KN_PER_KIP, M_PER_FT)
    if (source, target) == ("SI", "US"):
        return Conversion(1.0 / KN_PER_KIP, 1.0 / M_PER_FT)
    raise ValueError(f"unknown unit system {source!r} or {target!r}; use 'US' or 'SI'")
