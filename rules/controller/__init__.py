"""Controller rules: its power switch, freewheel path and current measurement."""
