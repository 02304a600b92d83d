"""Live-load deflection of a member under the LRFD deflection loading, against its limit.

A member whose Analysis row gives its EI scale (the absolute E*I that a stiffness
of 1 stands for) gets a deflection envelope: at every station, the largest
downward and the largest upward deflection as the deflection loading crosses the
member (the design truck alone, and 25 % of it with the lane load; AASHTO LRFD
3.6.1.3.2, :data:`batch.loads.library.aashto.DEFLECTION_LOADING`), with the run's
dynamic load allowance on the truck and the member's deflection distribution
factor. The deflection influence lines are exact piecewise cubics (the stations
are nodes of the stiffness model, :func:`batch.engine.influence.influence_lines`),
so the envelope is exact at the stations, like the force envelopes.

For each span, the largest downward deflection at its stations gives the ratio
span / deflection, compared with the member's limit (AASHTO LRFD 2.5.2.6.2:
800 for vehicular load). Between stations the true largest deflection may be a
little larger; more stations per span bring the value closer.

Signs: deflection downward positive (the sag of a loaded span); an upward
deflection (of a span beside a loaded one) is negative. Deflections are in the
run's deflection unit (in or mm).
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence

import numpy as np

from batch.engine.asbuilt import MemberDeflection
from batch.engine.effects import Governing
from batch.engine.envelope import case_effects, governing
from batch.engine.influence import influence_lines
from batch.loads.library.aashto import DEFLECTION_LOADING
from batch.model import Member, Settings
from batch.model.case import DEFAULT_DEFLECTION_LIMIT
from batch.model.layout import Section
from batch.model.units import IN_CONSISTENT_UNITS

__all__ = ["member_deflection"]


def member_deflection(
    member: Member,
    settings: Settings,
    sections: Sequence[Section] = (),
    layout_df: float | None = None,
) -> MemberDeflection | None:
    """The deflection envelope of ``member``, or None when it gives no EI scale.

    ``sections`` are the stations added off the grid (as for its envelope);
    ``layout_df`` the deflection distribution factor computed from its girder
    layout, used when its Analysis row gives none (else its DF moment). Units as
    in the module docstring; lengths in the run's length unit.
    """
    own = member.analysis
    if own is None or own.ei_scale is None:
        return None
    if own.df_deflection is not None:
        df, source = own.df_deflection, 0
    elif layout_df is not None:
        df, source = layout_df, 1
    else:
        df, source = member.df_moment, 2
    il = influence_lines(
        member.spans,
        member.stiffness,
        member.hinges,
        member.stations_per_span or settings.stations_per_span,
        pieces=member.stiffness_pieces,
        sections=sections,
        deflection=True,
    )
    cases = DEFLECTION_LOADING.cases(settings.units, settings.impact)
    loaded = dataclasses.replace(member, df_moment=df, df_shear=df)
    effects = case_effects(loaded, cases, directions=settings.directions, il=il)
    units = IN_CONSISTENT_UNITS[settings.units]
    # Ordinates are per unit EI: divide by the absolute EI in consistent units, then
    # express the length in the deflection unit.
    shown = 1.0 / (own.ei_scale * units["rigidity"] * units["deflection"])
    rows = il.deflection_rows
    out = []
    for values, positions, directions, spacings, sign in (
        (effects.max_value, effects.max_position, effects.max_direction, effects.max_spacing, 1.0),
        (effects.min_value, effects.min_position, effects.min_direction, effects.min_spacing, -1.0),
    ):
        v, case, p, d, s = governing(
            values[:, rows] * shown,
            positions[:, rows],
            directions[:, rows],
            spacings[:, rows],
            sign,
        )
        # (a deflection has no companion effect)
        none = np.full(v.shape, np.nan)
        out.append(
            Governing(value=v, case=case, position=p, direction=d, spacing=s, concurrent=none)
        )
    spans = np.asarray(member.spans, dtype=float)
    per_span = np.array(
        [out[0].value[il.station_span == k + 1].max(initial=0.0) for k in range(spans.size)]
    )
    in_length = per_span * units["deflection"]  # back in the length unit, for the ratio
    with np.errstate(divide="ignore"):
        ratio = np.where(in_length > 0, spans / np.where(in_length > 0, in_length, 1.0), np.inf)
    return MemberDeflection(
        labels=tuple(c.label for c in cases),
        down=out[0],
        up=out[1],
        span_length=spans,
        span_deflection=per_span,
        span_ratio=ratio,
        limit=DEFAULT_DEFLECTION_LIMIT if own.deflection_limit is None else own.deflection_limit,
        df=df,
        df_source=source,
    )
