"""Tables and their lookups: the CSV loader, alloys, environments, reference
electrodes, standard potentials, and the checks on every table.

Imports only :mod:`noblegap.units`, :mod:`noblegap.errors` and
:mod:`noblegap.schema` from above it; never a method or a calculator.
"""
