"""Bench: grading filled test records and measured sweeps against a sheet's archived windows."""
