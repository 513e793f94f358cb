"""`python -m sheetgen`: the same as the sheetgen command."""

import sys

from sheetgen.cli import main

sys.exit(main())
