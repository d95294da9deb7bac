"""One module per page: parse (the schema's fields), compute (numbers in,
numbers out) and report (the page text built from the numbers).

A calculator imports methods and materials; only :mod:`noblegap.api`
imports a calculator.
"""
