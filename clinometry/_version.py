"""The package version, in a module of its own so any module can read it without importing the package root."""

__all__ = ["__version__"]

__version__ = "0.1.0"
