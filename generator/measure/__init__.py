"""Reading supplier data: instrument files (CSV, CGATS.17) into measurement records."""
