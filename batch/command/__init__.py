"""Stage 9, the command: ``spanfleet`` (also ``python -m batch``), a thin layer over the stages."""
