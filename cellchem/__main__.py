"""``python -m cellchem``: the same as the ``cellchem`` command."""

import sys

from .cli import main

if __name__ == "__main__":
    sys.exit(main())
