"""Wording, sources and judgements that rules of several areas share, so they never disagree."""
