"""``python -m cablewright``."""

import sys

from .cli import main

sys.exit(main())
