"""The diagnosis engine: faults and what they do to every reading, Bayesian inference over them,
the next best safe check, the conclusion, simulation of faulty units and the benchmark.

Pure Python and numpy: no Qt, no database, no files, no clock.
"""

from fixbench.engine.diagnosis import DiagnosisState, Proposal, Suspect, start_diagnosis
from fixbench.engine.simulate import simulate_readings

__all__ = ["DiagnosisState", "Proposal", "Suspect", "simulate_readings", "start_diagnosis"]
