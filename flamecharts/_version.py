"""The package version (its own module, so every layer can name it without importing the package)."""
__version__ = "0.1.0"
