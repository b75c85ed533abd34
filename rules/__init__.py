"""Built-in design rules, one module per rule (installed as ``ledlint.rules``)."""
