"""Render: figures (deterministic SVG), pages (Jinja2) and results.json, in memory."""
