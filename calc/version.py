"""The calculation core's version, recorded with every assessment."""

__version__ = "0.2.0"
