"""Brake rules: how the vehicle slows and stops."""
