"""The netlist model, and one reader per KiCad input format that builds it."""
