"""Reading supplier data files (spectra)."""
