"""Build the site into site/: ``python3 build.py --help``; the stages are in site_build/."""
import sys

from site_build.__main__ import main

if __name__ == "__main__":
    sys.exit(main())
