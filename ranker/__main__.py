"""Allow ``python -m ranker``."""

from .cli import main

raise SystemExit(main())
