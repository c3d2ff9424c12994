"""The built-in material library (``library.toml``), read by :mod:`axialfe.io`."""
