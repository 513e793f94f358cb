"""Inputs: job, parts-library and style files read into validated, frozen models."""
