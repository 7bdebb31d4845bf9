"""``python -m clinometry`` behaves exactly like the ``clinometry`` console script."""

import sys

from .cli import main

if __name__ == "__main__":
    sys.exit(main())
