"""Engineering helpers: plain physics and handbook tables, with no knowledge of rules or reports.

Each function works in SI floats (or the unit named in its argument) so it can be tested
against handbook values directly and stays fast inside a review.
"""
