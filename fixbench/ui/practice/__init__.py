"""The practice screen: pick a unit, diagnose it blind on a running clock, read the debrief."""
