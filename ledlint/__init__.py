"""ledlint: design-rule checks for the LED circuits in KiCad schematic netlists."""

__version__ = "0.1.0"
