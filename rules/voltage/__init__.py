"""Voltage rules: every part's voltage rating against what the pack can put across it."""
