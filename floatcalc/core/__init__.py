"""Numeric core: plain floats and NumPy arrays in scaled or SI variables, no pint, no I/O.

Each module holds one model or algorithm. Lengths are in capillary lengths and forces per unit
length in units of the surface tension wherever a module says it works in scaled variables.
"""
