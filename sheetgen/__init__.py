"""sheetgen: tuned LC circuits from a YAML job file to a build-and-test sheet."""

__version__ = "0.1.0"
