"""Outputs: every file is a view of the one results table, never a second computation."""
