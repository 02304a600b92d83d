"""``python -m batch``: the ``spanfleet`` command."""

from batch.cli import main

raise SystemExit(main())
