"""What a person reads: the HTML memo, its sketches, JSON, CSV and terminal tables."""
