"""`python -m fixbench` does what `fixbench` does."""

import sys

from fixbench.cli import main

sys.exit(main())
