"""The calculation core: pure functions on numpy arrays, no web framework."""
