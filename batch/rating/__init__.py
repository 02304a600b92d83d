"""Stage 6, rating: load ratings and fleet screening of a member from its live-load effects.

:mod:`batch.rating.lrfr` holds the rating equations, dead loads and posting;
:mod:`batch.rating.screening` the screening against a reference load;
:mod:`batch.rating.assess` what a run rates and screens, applied to one member.
Pure numpy: no file input or output.
"""
