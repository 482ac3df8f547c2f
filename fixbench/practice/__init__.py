"""Practice rounds: a unit with a hidden fault that a trainee diagnoses, and the debrief after.

Pure Python beside the engine: no Qt, no database, no clock. The round's clock is bench minutes,
the sum of the minutes of the checks taken. The ui shows rounds; the store keeps the attempts.
"""
