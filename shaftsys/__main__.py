"""``python -m shaftsys``: the same command line as the ``shaftsys`` console script."""

import sys

from shaftsys.cli import main

sys.exit(main())
