"""Jinja2 templates that present a review; shipped inside the engine as reviewer.templates."""
