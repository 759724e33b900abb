"""``python -m amalgebra``: the same as the ``amalgebra`` command (see :mod:`amalgebra.cli`).

>>> import subprocess, sys
>>> done = subprocess.run([sys.executable, "-m", "amalgebra", "parse", "j^2"],
...                       capture_output=True, text=True, check=False)
>>> done.returncode, done.stdout
(0, 'j^2\\n')
"""

import sys

from amalgebra.cli import main

__all__ = ["main"]

if __name__ == "__main__":
    sys.exit(main())
