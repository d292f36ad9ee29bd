"""The command line: parse arguments, draw progress, print tables, pick exit codes (one module per command)."""
from .main import main

__all__ = ["main"]
