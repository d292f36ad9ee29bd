"""``python -m flamecharts`` is the same as the ``flamecharts`` command."""
import sys

from .cli import main

sys.exit(main())
