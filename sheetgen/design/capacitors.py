"""The capacitors to fit: the job's own value, or standard parts (IEC 60063) and a trimmer
setting for the capacitance the design needs."""

from __future__ import annotations

from sheetgen.design.records import CapacitorChoice
from sheetgen.engine.standard_values import SERIES_TOLERANCE, best_parallel_pair, nearest_standard
from sheetgen.errors import FieldError
from sheetgen.inputs.model import Job


def capacitor_choice(job: Job, required_c: float) -> CapacitorChoice:
    """What to fit: the given part, or standard parts (and a trimmer setting) for required_c."""
    series = job.capacitor.preferred_series
    trimmer = job.capacitor.trimmer
    nearest = nearest_standard(required_c, series)
    tolerance = (job.capacitor.tolerance if job.capacitor.tolerance is not None
                 else SERIES_TOLERANCE[series])
    pair = best_parallel_pair(required_c, series, tolerance)
    if job.capacitor.capacitance is not None:
        return CapacitorChoice(required_c, series, nearest, pair, required_c, None, None,
                               required_c, False)
    if trimmer is None:
        return CapacitorChoice(required_c, series, nearest, pair, pair.total, None, None,
                               pair.total, True)
    middle = 0.5 * (trimmer.minimum + trimmer.maximum)
    if required_c - middle <= 0:
        raise FieldError("capacitor.trimmer", f"the trimmer's mid-range ({middle:.4g} F) "
                          f"exceeds the whole capacitance needed ({required_c:.4g} F); "
                          "choose a smaller trimmer")
    fixed = best_parallel_pair(required_c - middle, series, tolerance)
    setting = required_c - fixed.total
    in_range = trimmer.minimum <= setting <= trimmer.maximum
    clamped = min(max(setting, trimmer.minimum), trimmer.maximum)
    return CapacitorChoice(required_c, series, nearest, fixed, fixed.total, clamped, in_range,
                           fixed.total + clamped, True)
