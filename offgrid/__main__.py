"""``python -m offgrid``."""

from offgrid.cli import main

raise SystemExit(main())
