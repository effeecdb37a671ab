"""Reference data: colour-matching functions, illuminants and reference colour spaces.

Every table names its source in its own module or file header. Nothing is fetched at
run time; the CSV files ship inside the package.
"""
from __future__ import annotations

from functools import cache
from importlib import resources

import numpy as np

from .illuminants import ILLUMINANTS, Illuminant
from .spaces import REFERENCE_SPACES, ReferenceSpace

__all__ = ["ILLUMINANTS", "Illuminant", "REFERENCE_SPACES", "ReferenceSpace", "cmfs",
           "OBSERVERS"]

# observer key -> (file, description)
OBSERVERS = {
    "cie1931-2": ("cie1931_2deg.csv", "CIE 1931 2° standard observer"),
    "cie1964-10": ("cie1964_10deg.csv", "CIE 1964 10° standard observer"),
}


@cache
def cmfs(observer: str = "cie1931-2") -> tuple[np.ndarray, np.ndarray]:
    """Return (wavelengths_nm, cmf) with cmf of shape (n, 3): x̄, ȳ, z̄ at 1 nm, 360-830 nm."""
    try:
        filename = OBSERVERS[observer][0]
    except KeyError:
        raise ValueError(f"unknown observer {observer!r}; known: {', '.join(OBSERVERS)}") from None
    text = resources.files(__package__).joinpath(filename).read_text(encoding="utf-8")
    table = np.loadtxt(text.splitlines(), delimiter=",", comments="#", skiprows=5)
    wl = table[:, 0]
    values = np.ascontiguousarray(table[:, 1:4])
    wl.setflags(write=False)
    values.setflags(write=False)
    return wl, values
