"""Cables: conductor resistance, current-carrying capacity, the protective conductor, sizing and the longest run."""
