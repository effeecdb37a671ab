"""Colorimetry: pure numpy functions on arrays. Nothing here knows about YAML or HTML."""
