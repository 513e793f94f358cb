"""The Job: a job file's content, validated, immutable, every quantity a float in SI units.

Each field documents itself (the descriptions feed `sheetgen schema` and docs/jobfile.md).
Quantities are written in engineering notation in the file ("150 pF") and parsed at the
edge by quantities.parse_quantity.
"""

from __future__ import annotations

import datetime as _dt
from typing import Annotated, Literal

from pydantic import BaseModel, BeforeValidator, ConfigDict, Field, WithJsonSchema, model_validator
from pydantic_core import PydanticCustomError

from . import quantities as qty


def _quantity(dimension: qty.Dimension, minimum: float | None = 0.0, inclusive: bool = False):
    """A float field read from engineering notation, checked finite and above `minimum`."""

    def parse(value: object) -> float:
        try:
            number = qty.parse_quantity(value, dimension)
        except qty.QuantityError as error:
            raise PydanticCustomError("quantity", str(error)) from None
        if minimum is not None and (number < minimum or (number == minimum and not inclusive)):
            bound = "at least" if inclusive else "greater than"
            shown = f'"{value}"' if isinstance(value, str) else repr(value)
            raise PydanticCustomError(
                "quantity", f"{shown} must be {bound} {minimum:g} {dimension.si_unit}".rstrip())
        return number

    schema = {
        "anyOf": [{"type": "string"}, {"type": "number"}],
        "description": f"{dimension.name} in {dimension.unit_name}, e.g. {dimension.example}",
        "examples": [dimension.example],
    }
    return Annotated[float, BeforeValidator(parse), WithJsonSchema(schema)]


Inductance = _quantity(qty.INDUCTANCE)
Capacitance = _quantity(qty.CAPACITANCE)
Resistance = _quantity(qty.RESISTANCE)
LossResistance = _quantity(qty.RESISTANCE, minimum=0.0, inclusive=True)
Frequency = _quantity(qty.FREQUENCY)
Voltage = _quantity(qty.VOLTAGE)
Current = _quantity(qty.CURRENT)
Power = _quantity(qty.POWER)
Fraction = _quantity(qty.FRACTION, minimum=0.0, inclusive=True)
PositiveNumber = _quantity(qty.DIMENSIONLESS)


def _text(value: object) -> object:
    """Dates and numbers written bare in YAML are kept as the text a person wrote."""
    if isinstance(value, (_dt.date, int, float)) and not isinstance(value, bool):
        return str(value)
    return value


Text = Annotated[str, BeforeValidator(_text), Field(min_length=1, max_length=2000)]


class Section(BaseModel):
    """Every part of a job: frozen, and no key that is not documented."""

    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)


def exactly_one(model: BaseModel, names: tuple[str, ...], what: str) -> None:
    given = [name for name in names if getattr(model, name) is not None]
    if len(given) != 1:
        listed = " or ".join(names)
        found = f"found {', '.join(given)}" if given else "found none"
        raise PydanticCustomError("exactly_one", f"give exactly one of {listed} for {what} "
                                  f"({found})")


class SheetIdentity(Section):
    """Who and what the sheet is: printed on every page and kept in the results."""

    id: Text = Field(description="sheet or drawing number, e.g. TS-0142")
    title: Text = Field(description="what the circuit is, in a line")
    revision: Text = Field(description="revision letter or number, e.g. B")
    designer: Text = Field(description="who designed it")
    date: Text = Field(description="date of this revision, e.g. 2026-12-01")
    checker: Text | None = Field(None, description="who checked the design (optional)")
    approver: Text | None = Field(None, description="who approved it for build (optional)")
    notes: str | None = Field(None, max_length=20000, description="free text for the sheet")


class DesignTargets(Section):
    """Design mode: what the circuit must do; sheetgen works out the missing part."""

    f0: Frequency | None = Field(None, description="resonant frequency wanted; with only one of "
                                 "inductance and capacitance given, the other is computed")
    bandwidth: Frequency | None = Field(None, description="half-power bandwidth wanted; the "
                                        "load resistance that gives it is computed")
    loaded_q: PositiveNumber | None = Field(None, description="loaded Q wanted (instead of "
                                            "bandwidth); the load resistance is computed")

    @model_validator(mode="after")
    def _one_selectivity(self):
        if self.bandwidth is not None and self.loaded_q is not None:
            raise PydanticCustomError("exclusive", "give bandwidth or loaded_q, not both")
        return self


class CircuitSection(Section):
    """How the parts are connected."""

    topology: Literal["series", "parallel"] = Field(
        description="series: source, coil, capacitor and load in one loop; parallel: coil "
        "and capacitor across one node, the load across it, fed through the source resistance")
    targets: DesignTargets | None = Field(None, description="design mode (optional)")


class GivenInductor(Section):
    """A coil whose inductance and loss are known (measured or from its maker's sheet)."""

    form: Literal["given"] = Field(description="given: inductance and loss are stated")
    inductance: Inductance | None = Field(
        None, description="inductance; omit to have it computed from targets.f0 and C")
    q: PositiveNumber | None = Field(None, description="the coil's unloaded Q at f0")
    resistance: LossResistance | None = Field(
        None, description="the coil's series loss resistance at f0 (instead of q)")

    @model_validator(mode="after")
    def _one_loss(self):
        exactly_one(self, ("q", "resistance"), "the coil's loss")
        return self


class CapacitorSection(Section):
    """The tuning capacitor."""

    capacitance: Capacitance | None = Field(
        None, description="capacitance; omit to have it computed from targets.f0 and L")
    esr: LossResistance | None = Field(None, description="equivalent series resistance at f0")
    dissipation_factor: Fraction | None = Field(
        None, description="dissipation factor tan δ at f0 (instead of esr), e.g. 0.1 %")
    preferred_series: Literal["E6", "E12", "E24", "E48", "E96", "E192"] = Field(
        "E12", description="IEC 60063 series that standard values are picked from")

    @model_validator(mode="after")
    def _one_loss(self):
        exactly_one(self, ("esr", "dissipation_factor"), "the capacitor's loss")
        return self


class SourceSection(Section):
    """What drives the circuit."""

    resistance: Resistance | None = Field(
        None, description="source resistance; omit for an ideal source (series: voltage "
        "source; parallel: current source)")
    voltage: Voltage | None = Field(None, description="open-circuit RMS voltage behind the "
                                    "source resistance")
    current: Current | None = Field(None, description="RMS drive current")
    available_power: Power | None = Field(
        None, description="available power V²/(4·Rs); needs resistance")

    @model_validator(mode="after")
    def _one_drive(self):
        exactly_one(self, ("voltage", "current", "available_power"), "the drive")
        if self.available_power is not None and self.resistance is None:
            raise PydanticCustomError("needs", "available_power needs the source resistance")
        return self


class LoadSection(Section):
    """What the circuit delivers into (series: in the loop; parallel: across the tank)."""

    resistance: Resistance | None = Field(
        None, description="load resistance; omit with circuit.targets.bandwidth or loaded_q to "
        "have it computed")


class SweepSection(Section):
    """Frequency range of the response plot and tables (defaults: around f0)."""

    start: Frequency | None = Field(None, description="lowest frequency")
    stop: Frequency | None = Field(None, description="highest frequency")
    points: int = Field(801, ge=11, le=20001, description="number of frequencies")

    @model_validator(mode="after")
    def _ordered(self):
        if self.start is not None and self.stop is not None and self.stop <= self.start:
            raise PydanticCustomError("order", "stop must be above start")
        return self


class Job(Section):
    """One tuned circuit to design, build and test."""

    sheet: SheetIdentity
    circuit: CircuitSection
    inductor: GivenInductor
    capacitor: CapacitorSection
    source: SourceSection
    load: LoadSection | None = None
    sweep: SweepSection = SweepSection()
