"""Enclosure rules: ingress protection of the parts and the battery housing."""
