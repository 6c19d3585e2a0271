"""`python -m briefer`."""

import sys

from briefer.cli import main

sys.exit(main())
