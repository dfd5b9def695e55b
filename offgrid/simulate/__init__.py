"""Reliability simulation: synthetic weather, energy balance, battery life, trade-off."""
