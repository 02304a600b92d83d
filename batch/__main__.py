"""``python -m batch``: the ``spanfleet`` command."""

from batch.command.cli import main

raise SystemExit(main())
