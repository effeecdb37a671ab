"""Specs: loading YAML with source positions, validation against the declared schema,
inheritance and reference resolution into typed Spec objects."""
