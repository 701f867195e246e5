"""The catalog's tables against the published tables."""
