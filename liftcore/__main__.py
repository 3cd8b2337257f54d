"""``python -m liftcore``: the command line."""

import sys

from liftcore.cli import main

if __name__ == "__main__":
    sys.exit(main())
