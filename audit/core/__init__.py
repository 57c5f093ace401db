"""Shared ground: located errors, the YAML reader that keeps positions, units at the edge, safe writes."""
