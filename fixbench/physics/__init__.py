"""Physics of expected values: what a healthy unit of given ratings reads at each test point.

Pure functions, no I/O. Every formula carries its source beside it. Values are SI base units.
"""
