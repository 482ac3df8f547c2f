"""The owner's side of the window: the case history, one case's story, the figures and the reports."""
