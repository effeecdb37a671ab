"""Assess: requirements to verdicts under a stated decision rule."""
