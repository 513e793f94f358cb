"""Physical constants, kept here so the engine imports no heavier module for them."""

# Vacuum magnetic permeability µ0 in H/m, CODATA 2022 (the value scipy.constants.mu_0 gives;
# tests/engine/test_magnetics.py checks the two agree).
MU_0_H_PER_M = 1.25663706127e-6
