"""Many jobs at once: collect job files, run each in isolation (worker processes), report."""
