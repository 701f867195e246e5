"""Input schema (frozen dataclasses) and the TOML loader."""

from calcreport.model.loader import load, loads
from calcreport.model.schema import Model

__all__ = ["Model", "load", "loads"]
