"""Performance rules: what the drive can do on the build's hills."""
