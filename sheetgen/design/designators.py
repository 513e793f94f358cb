"""Reference designators of the parts as built, decided once for the schematic, the parts
list, the rating checks and the cautions."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Designators:
    """L1 the tank coil, C1 (and C2) the fixed capacitor(s), then the trimmer, R1 the source
    resistance, R2 the load, L2 a link winding, R3 a bleeder across the capacitor. None where
    the part is not fitted."""

    coil: str
    fixed_capacitors: tuple[str, ...]
    trimmer: str | None
    source_resistor: str | None
    load_resistor: str | None
    link: str | None
    bleeder: str | None = None

    @property
    def capacitors(self) -> tuple[str, ...]:
        return self.fixed_capacitors + ((self.trimmer,) if self.trimmer else ())


def designators(fixed_count: int, has_trimmer: bool, has_source_resistor: bool,
                has_load: bool, has_link: bool, has_bleeder: bool = False) -> Designators:
    """Number the parts in the order above."""
    fixed = tuple(f"C{i + 1}" for i in range(fixed_count))
    return Designators(
        coil="L1", fixed_capacitors=fixed,
        trimmer=f"C{fixed_count + 1}" if has_trimmer else None,
        source_resistor="R1" if has_source_resistor else None,
        load_resistor="R2" if has_load else None,
        link="L2" if has_link else None, bleeder="R3" if has_bleeder else None)
