"""Numbers with units: value text to quantities, ranges, IEC 60063 E-series, resistor power ratings."""
