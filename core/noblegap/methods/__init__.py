"""Published methods on plain SI floats: Faraday's law, the Nernst equation,
mixed-potential kinetics, coating breakdown.

A method may read a table through :mod:`noblegap.materials`; it never
imports a calculator or builds page text.
"""
