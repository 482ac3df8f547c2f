"""Helpers shared by the tests: running outside reference tools such as ngspice."""
