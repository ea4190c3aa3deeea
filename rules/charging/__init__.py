"""Charging rules: the charger and charge port against the pack and its BMS."""
