"""Analyses over scored projects: compare, portfolio recalculation, lifetime, metered periods."""
