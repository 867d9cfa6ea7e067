"""The criteria: core.py (Check, State, running sets), sets.py (the one list of sets, as
data), and one module per set (general.py: IS Code 2008 Part A 2.2; weather.py and rolling.py:
2.3)."""
