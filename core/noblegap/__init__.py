"""noblegap: screening calculations for dissimilar-metal joints.

The package is pure Python plus pint, and runs unchanged on CPython and in
Pyodide. The one public entry point is :func:`noblegap.api.run`.
"""

__version__ = "0.1.0"
