"""Speed rules: how fast each rider goes against the profile's class limits."""
