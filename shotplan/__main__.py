"""``python -m shotplan``: the same as the ``shotplan`` command."""

import sys

from .cli.main import main

sys.exit(main())
