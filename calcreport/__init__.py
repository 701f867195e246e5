"""calcreport: pump-system calculations a reviewer can check."""

__version__ = "0.1.0"
