"""Claimed checks read from a calc package PDF."""
