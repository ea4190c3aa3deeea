"""Battery rules: what the drive asks of the pack, and what keeps its cells within limits."""
