"""Reading model files: TOML in, a checked :class:`~axialfe.model.Model` out (``modelfile``)."""

from .modelfile import builtin_materials, parse_model, read_model

__all__ = ["read_model", "parse_model", "builtin_materials"]
