"""cognomen: learns a team's naming habits and flags names that do not fit their use."""

__version__ = "0.1.0"
