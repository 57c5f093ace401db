"""Readers of what the reviewer supplies: the model, the claims and the calc package PDF."""
