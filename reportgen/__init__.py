"""reportgen: intact-stability calculation sheets to the IMO 2008 IS Code."""

__version__ = "0.2.0"
NAME = "reportgen"
