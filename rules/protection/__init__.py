"""Protection rules: the fuse or breaker that guards the wires and the pack."""
