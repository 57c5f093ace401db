"""Geometry and statics of the framing, in SI floats; knows no design standard."""
