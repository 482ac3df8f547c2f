"""The PySide6 front end: the only package that imports Qt."""
