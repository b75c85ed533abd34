"""Numeric LED-circuit engine: diode model, operating points, corners, Monte Carlo, thermal."""
