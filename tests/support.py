"""The one tolerance helper every test uses."""

import math


def assert_close(actual, expected, rel=0.0, abs=0.0, what=""):
    """Assert |actual - expected| <= max(rel * |expected|, abs); name the quantity on failure."""
    if rel == 0.0 and abs == 0.0:
        raise ValueError("assert_close needs a tolerance: rel or abs")
    limit = max(rel * math.fabs(expected), abs)
    error = math.fabs(actual - expected)
    assert error <= limit, (
        f"{what or 'value'}: got {actual!r}, expected {expected!r} "
        f"(error {error:.3g} > allowed {limit:.3g}; rel={rel}, abs={abs})"
    )
