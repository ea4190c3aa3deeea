"""Mechanical rules: what carries the rider."""
