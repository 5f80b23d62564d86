"""The HTTP face: maps JSON onto the calculation core and back; it computes nothing itself."""
