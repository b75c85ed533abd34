"""Run the command line as ``python -m ledlint``."""

from ledlint.cli import main

raise SystemExit(main())
