"""The capacitors to fit: the job's own value, or standard parts (IEC 60063) and a trimmer
setting for the capacitance the design needs."""

from __future__ import annotations

import math

from sheetgen.design.records import CapacitanceAcross, CapacitorChoice, TargetOffset, TargetRemedy
from sheetgen.engine.standard_values import (
    DEFAULT_STRAY_CAPACITANCE_F,
    SERIES_NAMES,
    SERIES_TOLERANCE,
    best_parallel_pair,
    nearest_standard,
)
from sheetgen.errors import FieldError
from sheetgen.inputs.model import Job


def capacitance_across(job: Job, coil=None) -> CapacitanceAcross:
    """What is across the tuning capacitor besides the parts: in a parallel tank the coil's
    self-capacitance (Medhurst's for a solenoid, the job's for a ring) and the strays
    (capacitor.stray); in a series circuit the strays only. The bench test puts nothing
    across the tank: its receiver is in the load (engine/bench.py).

    The default stray is counted only where sheetgen chooses the capacitor (design mode);
    a capacitance the job states is the tank's, plus only the stray the job writes."""
    cap = job.capacitor
    stated = cap.capacitance is not None
    if cap.stray is not None:
        stray, stray_source = cap.stray, "job"
    elif stated:
        stray, stray_source = 0.0, "none"
    else:
        stray, stray_source = DEFAULT_STRAY_CAPACITANCE_F, "default"
    if job.circuit.topology != "parallel":
        return CapacitanceAcross(0.0, stray, "none", stray_source, stated)
    own = getattr(coil, "self_capacitance_f", None) if coil is not None else None
    source = "none" if own is None else getattr(coil, "srf_basis", "job")
    return CapacitanceAcross(own or 0.0, stray, source, stray_source, stated)


def capacitor_choice(job: Job, required_c: float,
                     across: CapacitanceAcross | None = None,
                     band_fit_f: tuple[float, float] | None = None) -> CapacitorChoice:
    """What to fit: the given part, or standard parts (and a trimmer setting) for required_c
    (the capacitance to fit, what is already across it subtracted).

    With a tuning band, `band_fit_f` is the capacitance to fit at its two edges: the fixed
    part is then chosen so that the variable capacitor's mid-range sits midway between
    them (C ∝ 1/f², so each edge gets the same share of the range to spare)."""
    series = job.capacitor.preferred_series
    trimmer = job.capacitor.trimmer
    nearest = nearest_standard(required_c, series)
    tolerance = (job.capacitor.tolerance if job.capacitor.tolerance is not None
                 else SERIES_TOLERANCE[series])
    pair = best_parallel_pair(required_c, series, tolerance)
    if job.capacitor.capacitance is not None:
        return CapacitorChoice(required_c, series, nearest, pair, required_c, None, None,
                               required_c, False, across)
    if trimmer is None:
        return CapacitorChoice(required_c, series, nearest, pair, pair.total, None, None,
                               pair.total, True, across)
    middle = 0.5 * (trimmer.minimum + trimmer.maximum)
    if band_fit_f is not None:
        middle += required_c - 0.5 * sum(band_fit_f)
    if required_c - middle <= 0:
        raise FieldError("capacitor.trimmer", f"the trimmer's mid-range ({middle:.4g} F) "
                          f"exceeds the whole capacitance needed ({required_c:.4g} F); "
                          "choose a smaller trimmer")
    fixed = best_parallel_pair(required_c - middle, series, tolerance)
    setting = required_c - fixed.total
    in_range = trimmer.minimum <= setting <= trimmer.maximum
    clamped = min(max(setting, trimmer.minimum), trimmer.maximum)
    return CapacitorChoice(required_c, series, nearest, fixed, fixed.total, clamped, in_range,
                           fixed.total + clamped, True, across)


def target_offset(job: Job, choice: CapacitorChoice, inductance_h: float, target_hz: float,
                  built_hz: float, bandwidth_hz: float | None, window_hz: tuple[float, float],
                  turns: int | None = None) -> TargetOffset:
    """The built f0 against the target and, when it misses, the changes that would meet it
    (Thomson's formula f0 = 1/(2π√(LC)) for each candidate): two parts of the job's series
    in parallel, one part of a finer series, a turn more or less (L ∝ N², exact on a ring
    core, near enough on a solenoid) or the trimmer capacitance that makes up the rest."""
    offset = TargetOffset(target_hz, built_hz, bandwidth_hz, window_hz)
    if not offset.misses:
        return offset
    half = 0.5 * bandwidth_hz if bandwidth_hz else 0.5 * (window_hz[1] - window_hz[0])
    others = choice.across.total_f if choice.across is not None else 0.0
    total = choice.built_f + others
    fit = choice.required_f  # the parts' share of the capacitance for the target

    def f0(inductance: float, capacitance: float) -> float:
        return 1.0 / (2.0 * math.pi * math.sqrt(inductance * capacitance))

    def meets(f_hz: float) -> bool:
        return abs(f_hz - target_hz) <= half

    remedies = []
    series = choice.series
    if choice.from_standard_parts and fit > 0:
        pair = best_parallel_pair(fit, series, 0.0)
        parts = tuple(v for v in (pair.first, pair.second) if v is not None)
        if len(parts) == 2 and meets(f0(inductance_h, pair.total + others)):
            remedies.append(TargetRemedy("pair", f0(inductance_h, pair.total + others), parts,
                                         series))
        for finer in SERIES_NAMES[SERIES_NAMES.index(series) + 1:]:
            part = nearest_standard(fit, finer)
            if meets(f0(inductance_h, part + others)):
                remedies.append(TargetRemedy("series", f0(inductance_h, part + others),
                                             (part,), finer))
                break
    if turns is not None:
        for n in (turns - 1, turns + 1):
            f_n = f0(inductance_h * (n / turns) ** 2, total)
            if n > 0 and meets(f_n):
                remedies.append(TargetRemedy("turns", f_n, turns=n))
    if job.capacitor.trimmer is None:
        needed = 1.0 / ((2.0 * math.pi * target_hz) ** 2 * inductance_h) - total
        remedies.append(TargetRemedy("trimmer", target_hz, capacitance_f=needed))
    return TargetOffset(target_hz, built_hz, bandwidth_hz, window_hz, tuple(remedies))
