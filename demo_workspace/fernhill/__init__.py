"""Irrigation controller for the Fernhill glasshouses."""
