"""One module per process stage: small pure functions from parameters to exchange amounts.

Every function here uses arithmetic only (no branches on numeric values, no math module), so
the same code runs on floats, on numpy arrays of Monte Carlo draws, and on the symbolic cells
of the audit workbook. Branches on text options (route, technology) are fine.
"""
