"""What to do when a measured value fails its window: likely causes, the rework with its
effect in numbers, and when to stop and return the unit to engineering.

The effects come from engine/bench.py (one turn more or less, the next standard capacitor);
this module words them for the technician.
"""

from __future__ import annotations

from dataclasses import dataclass

from sheetgen.design.records import Design
from sheetgen.engine.bench import (
    adjacent_standard_values,
    f0_with_capacitance_hz,
    f0_with_turns_hz,
)
from sheetgen.report.formatting import quantity_text, signed

RETURN_TO_ENGINEERING = (
    "Stop and return the unit to engineering, with its test record, when a value still fails "
    "after one rework, when the rework needed is more than one turn or one standard "
    "capacitor step, or when two or more values fail together.")


@dataclass(frozen=True)
class Rework:
    """One measured value's fail disposition."""

    key: str  # the measurement key of report/procedure.py
    label: str
    causes: str
    actions: str


def _shift(f_new_hz: float, f0_hz: float) -> str:
    return f"{signed((f_new_hz - f0_hz) / 1e3, 1)} kHz" if abs(f_new_hz - f0_hz) < 1e6 else \
        quantity_text(f_new_hz - f0_hz, "Hz")


def _frequency_actions(design: Design) -> str:
    """How to bring f0 back: the trimmer, a turn, or the next standard capacitor."""
    f0 = design.resonance.f0_hz
    choice = design.capacitor_choice
    names = design.designators
    steps = []
    if choice.trimmer_setting_f is not None:
        steps.append(f"re-adjust the trimmer {names.trimmer}")
    coil = design.coil
    if coil is not None:
        n = coil.result.turns
        more = f0_with_turns_hz(f0, n, n + 1)
        fewer = f0_with_turns_hz(f0, n, n - 1) if n > 1 else None
        text = (f"f0 too high: add one turn to {names.coil} (moves f0 by {_shift(more, f0)}, "
                f"to {quantity_text(more, 'Hz')})")
        if fewer is not None:
            text += (f"; f0 too low: take one turn off (moves f0 by {_shift(fewer, f0)}, to "
                     f"{quantity_text(fewer, 'Hz')})")
        steps.append(text)
    if choice.from_standard_parts:
        below, above = adjacent_standard_values(choice.pair.first, choice.series)
        fixed = names.fixed_capacitors[0]
        c_total = design.circuit.capacitance_f
        for new, wanted_when in ((above, "high"), (below, "low")):
            shifted = f0_with_capacitance_hz(f0, c_total, c_total - choice.pair.first + new)
            steps.append(f"f0 too {wanted_when}: change {fixed} to "
                         f"{quantity_text(new, 'F', 3)} (the next {choice.series} value "
                         f"{'up' if new > choice.pair.first else 'down'}; moves f0 by "
                         f"{_shift(shifted, f0)})")
    else:
        steps.append("change the capacitance to C × (f measured / f wanted)² "
                     "(from f0 = 1/(2π√(LC)))")
    return "; ".join(steps) + "."


def rework_rows(design: Design) -> tuple[Rework, ...]:
    """The fail disposition of each measured value of the test record."""
    names = design.designators
    coil = design.coil
    turns = coil.result.turns if coil is not None else None
    wound = (f"a miscounted winding (one turn on {turns} changes L by about "
             f"{200.0 / turns:.0f} %), " if turns else "")
    load = names.load_resistor
    rows = [
        Rework("inductance", f"Inductance of {names.coil}",
               f"{wound}a wrong core or wire, or the meter's test leads included",
               ("recount the turns (each pass through the centre is one); check the core's "
                "dimensions against the parts list" if coil.form == "toroid" else
                "recount the turns (each full turn round the former is one); check the "
                "winding length and the former's diameter against the winding section")
               + "; measure again with the meter's leads nulled." if coil is not None else
               "measure again with the meter's leads nulled; replace a coil outside its "
               "tolerance."),
        Rework("capacitance", "Capacitance of the fixed part(s)",
               "a wrong or damaged part, or the meter's lead capacitance included",
               "null the meter's leads; replace a part outside its tolerance with one from a "
               "different batch."),
        Rework("f0", "Frequency of the response maximum",
               "the coil or capacitor off value (check their records), strays from long "
               "leads, a probe or extra cable left on the circuit",
               _frequency_actions(design)),
        Rework("bandwidth", "Bandwidth (−3 dB) and loaded Q",
               "too wide: extra loss (a poor solder joint, a lossy former or core, the wrong "
               f"wire) or {load or 'the load'} too heavy; too narrow: "
               f"{load or 'the load'} missing, open or of too high a value (check the "
               "test set-up's parts against its list, a probe's ground lead, and that "
               "each port is 50 Ω)",
               f"check {load + ' and ' if load else ''}the solder joints; the bandwidth goes "
               "with 1/Q, so a value outside the window with the right f0 points to the "
               "losses or the load, not the tuning."),
    ]
    return tuple(rows)
