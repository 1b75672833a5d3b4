"""The version of formkit (one place, imported by the package and by the table stores)."""

__version__ = "0.1.0"
