"""Wiring rules: what each battery, motor and phase wire carries, and how hot it gets."""
