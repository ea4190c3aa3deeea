"""Logic rules: the microcontroller's pins and the regulator that feeds it."""
