"""Reading supplier data: spectra, and instrument files (CSV, CGATS.17) into measurement records."""
