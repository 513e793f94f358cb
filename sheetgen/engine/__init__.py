"""The engine: pure functions over SI floats. No I/O, no plotting, no reportlab."""
