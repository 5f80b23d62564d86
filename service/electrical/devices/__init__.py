"""Protective devices and their time-current characteristics."""
