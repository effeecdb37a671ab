"""colourspec: validate product colour specifications, compute their figures, assess them
and publish a static site."""
__version__ = "0.1.0"
