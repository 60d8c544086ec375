"""Adapters turn a model source into a Frame and Results (SI units, the standard's axes)."""
