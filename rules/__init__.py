"""Built-in design rules, one module per rule (installed as ``ledlint.rules``)."""

# The built-in rules, by module, in the order `ledlint rules` lists them. A rule module that is not
# listed here is not run (tests/rules/test_rule_docs.py checks that every module is).
BUILTIN = (
    "current_margin",
    "driver_headroom",
    "driver_parallel_strings",
    "junction_temperature",
    "missing_parameter",
    "pin_overcurrent",
    "resistor_overload",
    "reverse_bias",
    "shared_resistor_bank",
    "supply_headroom",
    "switch_drive",
    "switch_orientation",
    "thermal_runaway",
    "unlimited_led",
    "unrecognised_circuit",
)
