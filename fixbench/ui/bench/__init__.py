"""The technician's guided bench: intake, cautions, one step at a time, suspects, repair, close."""
