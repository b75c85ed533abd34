"""Output formats: one module per format, each consuming findings and rule metadata."""
