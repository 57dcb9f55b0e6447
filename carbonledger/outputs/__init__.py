"""Outputs: tables, CSV, JSON and files. They read a ScoreResult and never recompute."""
