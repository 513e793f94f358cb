"""The Job: a job file's content, validated, immutable, every quantity a float in SI units.

Each field documents itself (the descriptions feed `sheetgen schema` and docs/jobfile.md).
Quantities are written in engineering notation in the file ("150 pF") and parsed at the
edge by quantities.parse_quantity.
"""

from __future__ import annotations

import datetime as _dt
import math
import re
from typing import Annotated, Literal

from pydantic import (
    BaseModel,
    BeforeValidator,
    ConfigDict,
    Discriminator,
    Field,
    Tag,
    WithJsonSchema,
    model_validator,
)
from pydantic_core import PydanticCustomError

from sheetgen import quantities
from sheetgen.engine.bench import DEFAULT_NOISE_FLOOR_DBM_PER_HZ, DEFAULT_PORT_TOLERANCE
from sheetgen.engine.insulation import (
    DEFAULT_ALTITUDE_M,
    DEFAULT_MATERIAL_GROUP,
    DEFAULT_POLLUTION_DEGREE,
)
from sheetgen.engine.limits import (
    DEFAULT_FREQUENCY_ACCURACY,
    DEFAULT_LCR_ACCURACY,
)
from sheetgen.engine.ratings import DEFAULT_CURRENT_DERATING, DEFAULT_VOLTAGE_DERATING
from sheetgen.engine.standard_values import DEFAULT_STRAY_CAPACITANCE_F, SERIES_TOLERANCE
from sheetgen.engine.variation import (
    BOUGHT_COIL_TOLERANCE,
    COIL_Q_SPREAD,
    DEFAULT_COVERAGE,
    DEFAULT_SEED,
    DEFAULT_TRIALS,
)

# The physical range of every quantity a job, library or style file may hold: the size
# (magnitude) of a non-zero value must lie within it. The bounds are wide, so no real part
# or bench is refused, and they keep every product and power the engine forms inside the
# float range (1e+308 V, 1e-300 Hz reached overflow and division by zero). Each is common
# practice unless a source is named; README "Physical ranges" lists them.
PHYSICAL_RANGES: dict[str, tuple[float, float, str]] = {
    # 1 pH is a fraction of a millimetre of lead; 100 H is a large mains choke.
    "inductance": (1e-12, 100.0, "from 1 pH (a millimetre of lead) to 100 H (a large choke)"),
    # 1 fF is below any fixture's stray capacitance; 10 F is a large electrolytic bank.
    "capacitance": (1e-15, 10.0, "from 1 fF (below any stray) to 10 F"),
    "resistance": (1e-6, 1e12, "from 1 µΩ (a busbar joint) to 1 TΩ (an insulation test)"),
    # 1 Hz … 10 GHz: below, not a tuned LC circuit; above, lumped parts stop being lumped.
    "frequency": (1.0, 10e9, "from 1 Hz to 10 GHz (beyond, parts are not lumped)"),
    "voltage": (1e-9, 1e6, "from 1 nV to 1 MV"),
    "current": (1e-12, 1e5, "from 1 pA to 100 kA"),
    "power": (1e-15, 1e7, "from 1 fW (−120 dBm) to 10 MW"),
    # 0.1 µm is thinner than any wire's insulation film; 20 km is above any altitude of use
    # IEC 60664-1 table A.2 lists (it stops at 20 000 m).
    "length": (1e-7, 20e3, "from 0.1 µm to 20 km (IEC 60664-1 table A.2 ends at 20 000 m)"),
    # The highest saturation of any core material is about 2.4 T (cobalt-iron, from memory).
    "flux density": (1e-9, 10.0, "from 1 nT to 10 T (no core material saturates above 2.5 T)"),
    "inductance factor": (1e-12, 1e-3, "from 1 pH/turn² to 1 mH/turn²"),
    "temperature": (-273.15, 1000.0, "from −273.15 °C (absolute zero) to 1000 °C"),
    # Thermistors reach a few %/K (from memory); 10 %/K is beyond any part.
    "temperature coefficient": (0.0, 0.1, "a size up to 10 %/K (a thermistor's is a few %/K)"),
    "fraction": (0.0, 100.0, "up to 10 000 %"),
    "number": (1e-12, 1e12, "from 1e-12 to 1e12"),
}


def _check_physical(number: float, dimension: quantities.Dimension, value: object) -> None:
    """Refuse a value whose size is outside the dimension's PHYSICAL_RANGES (0 passes here:
    whether zero is allowed is the field's own minimum)."""
    low, high, text = PHYSICAL_RANGES[dimension.name]
    size = abs(number) if dimension is not quantities.TEMPERATURE else number
    if number != 0.0 and not low <= size <= high:
        raise PydanticCustomError(
            "quantity", f"{quantities.shown_input(value)} is outside the physical range of "
            f"{'an' if dimension.name[0] in 'aeiou' else 'a'} {dimension.name}; expected {text}")


def _quantity(dimension: quantities.Dimension, minimum: float | None = 0.0, inclusive: bool = False,
              maximum: float | None = None, maximum_inclusive: bool = True, why: str = ""):
    """A float field read from engineering notation, checked finite and above `minimum`
    (and not beyond `maximum`; `why` says what the maximum stands for), and inside the
    dimension's physical range (PHYSICAL_RANGES)."""

    def parse(value: object) -> float:
        try:
            number = quantities.parse_quantity(value, dimension)
        except quantities.QuantityError as error:
            raise PydanticCustomError("quantity", str(error)) from None
        if minimum is not None and (number < minimum or (number == minimum and not inclusive)):
            bound = "at least" if inclusive else "greater than"
            raise PydanticCustomError(
                "quantity", f"{quantities.shown_input(value)} must be {bound} {minimum:g} "
                f"{dimension.si_unit}".rstrip())
        if maximum is not None and (number > maximum
                                    or (number == maximum and not maximum_inclusive)):
            bound = "at most" if maximum_inclusive else "below"
            limit = (f"{maximum * 100:g} %" if dimension is quantities.FRACTION
                     else quantities.format_quantity(maximum, dimension.si_unit))
            raise PydanticCustomError(
                "quantity", f"{quantities.shown_input(value)} must be {bound} {limit}{why}")
        _check_physical(number, dimension, value)
        return number

    schema = {
        "anyOf": [{"type": "string"}, {"type": "number"}],
        "description": f"{dimension.name} in {dimension.unit_name}, e.g. {dimension.example}",
        "examples": [dimension.example],
    }
    return Annotated[float, BeforeValidator(parse), WithJsonSchema(schema)]


Inductance = _quantity(quantities.INDUCTANCE)
Capacitance = _quantity(quantities.CAPACITANCE)
SmallCapacitance = _quantity(quantities.CAPACITANCE, minimum=0.0, inclusive=True)
Resistance = _quantity(quantities.RESISTANCE)
LossResistance = _quantity(quantities.RESISTANCE, minimum=0.0, inclusive=True)
Frequency = _quantity(quantities.FREQUENCY)
Voltage = _quantity(quantities.VOLTAGE)
Current = _quantity(quantities.CURRENT)
Power = _quantity(quantities.POWER)
Fraction = _quantity(quantities.FRACTION, minimum=0.0, inclusive=True)
PortTolerance = _quantity(quantities.FRACTION, minimum=0.0, inclusive=True, maximum=0.5,
                          why="a port further than ±50 % from 50 Ω is not a 50 Ω port")
PositiveNumber = _quantity(quantities.DIMENSIONLESS)
# Steinmetz exponents of real materials lie between about 1 and 3 (common practice); 5
# admits any fit while f**alpha and B**beta stay inside the float range.
SteinmetzExponent = _quantity(quantities.DIMENSIONLESS, maximum=5.0,
                              why=" (a Steinmetz exponent; real materials lie near 1 to 3)")
Length = _quantity(quantities.LENGTH)
LeadLength = _quantity(quantities.LENGTH, minimum=0.0, inclusive=True)
# Common practice: a tuned circuit's leads are kept to centimetres; 300 mm is already a
# tenth of the wavelength at 100 MHz, beyond which a lead is a transmission line.
LeadRun = _quantity(quantities.LENGTH, minimum=0.0, inclusive=True, maximum=0.3,
                    why=" (a lead runs from the winding to its terminal; a longer run is a "
                    "cable outside the tank)")
# A ±100 % tolerance lets a part be zero: every spread stays below it (a uniform band is
# then always positive; engine/variation.py Spread).
Tolerance = _quantity(quantities.FRACTION, minimum=0.0, inclusive=True, maximum=1.0,
                      maximum_inclusive=False, why=" (at ±100 % a part could be zero)")
NORMAL_BAND_MAX = 0.5  # engine/variation.py Spread: a normal band is at most ±50 %
# A derating is the share of a rating a part may carry: above 0, at most all of it.
Derating = _quantity(quantities.FRACTION, minimum=0.0, inclusive=False, maximum=1.0,
                     why=" (a derating is the share of the rating a part may carry)")
FluxDensity = _quantity(quantities.FLUX_DENSITY)
InductanceFactor = _quantity(quantities.INDUCTANCE_FACTOR)
TemperatureCoefficient = _quantity(quantities.TEMPERATURE_COEFFICIENT, minimum=None)
Temperature = _quantity(quantities.TEMPERATURE, minimum=-273.15)
Name = Annotated[str, Field(min_length=1, max_length=200, pattern=r"^[A-Za-z0-9][A-Za-z0-9._-]*$")]


def _text(value: object) -> object:
    """Dates and numbers written bare in YAML are kept as the text a person wrote."""
    if isinstance(value, (_dt.date, int, float)) and not isinstance(value, bool):
        return str(value)
    return value


Text = Annotated[str, BeforeValidator(_text), Field(min_length=1, max_length=2000)]


def _iso_date(value: object) -> object:
    """A calendar date written YYYY-MM-DD (ISO 8601), kept as the text written."""
    text = _text(value)
    if not isinstance(text, str):
        return text
    expected = "expected the date as YYYY-MM-DD, e.g. 2026-12-01"
    if not re.fullmatch(r"\d{4}-\d{2}-\d{2}", text.strip()):
        raise PydanticCustomError("date", f"{quantities.shown_input(text)} is not a date; "
                                  f"{expected}")
    try:
        _dt.date.fromisoformat(text.strip())
    except ValueError as error:
        raise PydanticCustomError("date", f"{quantities.shown_input(text)} is not a date "
                                  f"({error}); {expected}") from None
    return text.strip()


IsoDate = Annotated[str, BeforeValidator(_iso_date)]


# Tags of the "a name, or the thing inline" unions; they appear in error locations only.
BY_NAME, INLINE = "by-name", "inline"


def _name_or_inline(value: object) -> str:
    return BY_NAME if isinstance(value, str) else INLINE


def name_or(model):
    """A field that takes a parts-library name or the part's properties inline."""
    return Annotated[Annotated[Name, Tag(BY_NAME)] | Annotated[model, Tag(INLINE)],
                     Discriminator(_name_or_inline)]


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


class RevisionEntry(Section):
    """One earlier revision of the sheet: what changed, when and by whom."""

    revision: Text = Field(description="the revision, e.g. A")
    date: Text = Field(description="its date, e.g. 2026-10-14")
    change: Text = Field(description="what changed in it, in a line or two")
    by: Text = Field(description="who made the change")


class SheetIdentity(Section):
    """Who and what the sheet is: printed on every page and kept in the results."""

    id: Text = Field(description="sheet or drawing number, e.g. TS-0142")
    title: Text = Field(description="what the circuit is, in a line")
    revision: Text = Field(description="revision letter or number, e.g. B")
    designer: Text = Field(description="who designed it")
    date: IsoDate = Field(description="date of this revision, YYYY-MM-DD, e.g. 2026-12-01")
    checker: Text | None = Field(None, description="who checked the design (optional)")
    approver: Text | None = Field(None, description="who approved it for build (optional)")
    notes: str | None = Field(None, max_length=20000, description="free text for the sheet")
    style: str | None = Field(None, min_length=1, max_length=1000, description="house style of "
                              "the sheet: a name (style-NAME.yaml in the parts library folder, "
                              "else in sheetgen's templates) or a path to a style file relative "
                              "to this job file")
    history: tuple[RevisionEntry, ...] = Field((), description="earlier revisions, oldest "
                                               "first; the sheet prints them with this one")


class TuningBand(Section):
    """A band the tank is tuned across by its variable capacitor (capacitor.trimmer)."""

    low: Frequency = Field(description="lowest frequency the tank must tune to")
    high: Frequency = Field(description="highest frequency the tank must tune to")

    @model_validator(mode="after")
    def _ordered(self):
        if not self.high > self.low:
            raise PydanticCustomError("order", "high must be above low")
        return self

    @property
    def centre(self) -> float:
        """The geometric centre √(low·high): C ∝ 1/f², so the middle of the tuning range."""
        return math.sqrt(self.low * self.high)


class DesignTargets(Section):
    """Design mode: what the circuit must do; sheetgen works out the missing part."""

    f0: Frequency | None = Field(None, description="resonant frequency wanted; with only one of "
                                 "inductance and capacitance given, the other is computed "
                                 "(with a band: the design centre, default the band's "
                                 "geometric centre)")
    band: TuningBand | None = Field(None, description="tune across this band with the variable "
                                    "capacitor capacitor.trimmer: its range is checked to reach "
                                    "both edges over the parts' spread, and the sheet gives the "
                                    "setting and windows at the edges and the middle")
    bandwidth: Frequency | None = Field(None, description="half-power bandwidth wanted; the "
                                        "load resistance that gives it is computed")
    loaded_q: PositiveNumber | None = Field(None, description="loaded Q wanted (instead of "
                                            "bandwidth); the load resistance is computed")

    @model_validator(mode="after")
    def _one_selectivity(self):
        if self.bandwidth is not None and self.loaded_q is not None:
            raise PydanticCustomError("exclusive", "give bandwidth or loaded_q, not both")
        if (self.band is not None and self.f0 is not None
                and not self.band.low <= self.f0 <= self.band.high):
            raise PydanticCustomError("band", "f0 must lie within the band")
        return self

    @property
    def f0_wanted(self) -> float | None:
        """The f0 the design is centred on: f0, else the band's geometric centre."""
        if self.f0 is None and self.band is not None:
            return self.band.centre
        return self.f0


class CircuitSection(Section):
    """How the parts are connected."""

    topology: Literal["series", "parallel"] = Field(
        description="series: source, coil, capacitor and load in one loop; parallel: coil "
        "and capacitor across one node, the load across it, fed through the source resistance")
    targets: DesignTargets | None = Field(None, description="design mode (optional)")
    dc_voltage: Voltage | None = Field(None, description="DC supply voltage the tank carries "
                                       "(e.g. a supply fed through the coil); omit when none. "
                                       "The tank then sits at it against the chassis (the "
                                       "clearances count it); a series loop's capacitor takes "
                                       "it across itself (its rating counts it)")
    dc_blocked: bool = Field(False, description="true when a series blocking capacitor keeps "
                             "a parallel tank's coil from discharging its capacitor for DC: "
                             "the capacitor is then charged to dc_voltage and rated for it "
                             "plus the RF peak; false: the coil holds both its ends at the "
                             "supply and it is rated for the RF alone")


QTolerance = Field(None, description="± unit-to-unit spread of the coil's Q (of its loss "
                   "resistance), e.g. 15 % (omit: variation.loss_tolerance, else "
                   f"{COIL_Q_SPREAD * 100:g} %, common "
                   "practice for a maker's stated Q, a measured prototype or an estimate)")


PartDescription = Annotated[str | None, Field(min_length=1, max_length=300)]


class GivenInductor(Section):
    """A coil whose inductance and loss are known (measured or from its maker's sheet)."""

    form: Literal["given"] = Field(description="given: inductance and loss are stated")
    description: PartDescription = Field(None, description="what to buy, for the parts list, "
                                         "e.g. axial moulded RF inductor, 0.5 A")
    inductance: Inductance | None = Field(
        None, description="inductance; omit to have it computed from targets.f0 and C")
    q: PositiveNumber | None = Field(None, description="the coil's unloaded Q at f0")
    resistance: LossResistance | None = Field(
        None, description="the coil's series loss resistance at f0 (instead of q)")
    tolerance: Tolerance | None = Field(None, description="± tolerance of the inductance, e.g. "
                                       f"5 % (omit: {BOUGHT_COIL_TOLERANCE * 100:g} %, common "
                                       "practice for a bought RF inductor; 0 % for a coil "
                                       "measured and selected)")
    q_tolerance: Tolerance | None = QTolerance
    temperature_coefficient: TemperatureCoefficient | None = Field(
        None, description="temperature coefficient of the inductance, e.g. 50 ppm/K")

    @model_validator(mode="after")
    def _one_loss(self):
        exactly_one(self, ("q", "resistance"), "the coil's loss")
        return self


class LossPoint(Section):
    """One row of a material's loss table: the loss at one frequency."""

    f: Frequency = Field(description="frequency of this row")
    loss_factor: PositiveNumber | None = Field(
        None, description="relative loss factor tan δ / µi (IEC 60401-3), e.g. 50e-6")
    q: PositiveNumber | None = Field(None, description="material Q of a coil on the core "
                                     "(instead of loss_factor)")

    @model_validator(mode="after")
    def _one_value(self):
        exactly_one(self, ("loss_factor", "q"), "this loss row")
        return self


class SteinmetzSpec(Section):
    """Core loss per volume P_v = k · f^alpha · B^beta (W/m³, f in Hz, peak B in T)."""

    k: PositiveNumber = Field(description="Steinmetz coefficient k, SI units")
    alpha: SteinmetzExponent = Field(description="frequency exponent (at most 5)")
    beta: SteinmetzExponent = Field(description="flux density exponent (at most 5)")


class MaterialSpec(Section):
    """A magnetic core material, described only by its physical properties."""

    description: str | None = Field(None, max_length=500, description="what it is for")
    mu_i: PositiveNumber = Field(description="initial permeability µi")
    mu_i_tolerance: Tolerance | None = Field(None, description="tolerance of µi (and of AL), e.g. 5 %")
    mu_tc: TemperatureCoefficient | None = Field(
        None, description="temperature coefficient of µi (and of AL), e.g. 150 ppm/K")
    flux_density_max: FluxDensity = Field(
        description="peak flux density the material may be used up to at RF")
    loss: tuple[LossPoint, ...] = Field(min_length=1, description="loss against frequency, "
                                        "rows in rising frequency, all loss_factor or all q")
    steinmetz: SteinmetzSpec | None = Field(None, description="Steinmetz coefficients, if known")

    @model_validator(mode="after")
    def _loss_rows(self):
        kinds = {row.loss_factor is None for row in self.loss}
        if len(kinds) > 1:
            raise PydanticCustomError("loss", "give every loss row as loss_factor or every "
                                      "row as q, not a mix")
        freqs = [row.f for row in self.loss]
        if any(b <= a for a, b in zip(freqs, freqs[1:])):
            raise PydanticCustomError("loss", "loss rows must be in rising frequency")
        return self


class CoreSpec(Section):
    """A ring (toroidal) core: its size, its material and, where known, its AL."""

    description: str | None = Field(None, max_length=500, description="what it is")
    material: name_or(MaterialSpec) = Field(description="a material of the parts library by "
                                          "name, or the material's properties inline")
    outer_diameter: Length = Field(description="outer diameter OD")
    inner_diameter: Length = Field(description="inner diameter ID (the hole)")
    height: Length = Field(description="height (axial thickness)")
    chamfer: LeadLength = Field(0.0, description="edge chamfer or radius (optional)")
    al: InductanceFactor | None = Field(
        None, description="inductance factor AL when the core's data gives one; in nH/turn², "
        "µH/100 turns or mH/1000 turns. Without it AL follows from µi and the geometry "
        "(IEC 60205)")
    al_tolerance: Tolerance | None = Field(None, description="tolerance of AL (default: µi's)")

    @model_validator(mode="after")
    def _geometry(self):
        if not self.inner_diameter < self.outer_diameter:
            raise PydanticCustomError("geometry", "inner_diameter must be below outer_diameter")
        radial = (self.outer_diameter - self.inner_diameter) / 2
        if not 2 * self.chamfer < min(radial, self.height):
            raise PydanticCustomError("geometry", "chamfer must be under half the section's "
                                      "width and height")
        return self


class PartsLibraryFile(Section):
    """One file of the team's parts library: materials and/or cores by name."""

    materials: dict[Name, MaterialSpec] = Field(default_factory=dict)
    cores: dict[Name, CoreSpec] = Field(default_factory=dict)


WireSize = Annotated[str, Field(min_length=1, max_length=40, description='wire size: "AWG 24", '
                            '"24 AWG" or a copper diameter "0.50 mm"')]


class LinkWinding(Section):
    """A coupling winding over the tank coil that matches a resistance to the tank."""

    resistance: Resistance = Field(description="the resistance the link connects to, e.g. 50 Ω")
    wire: WireSize | None = Field(None, description="link wire (default: the tank's wire)")


class Tap(Section):
    """A tap on the tank winding (an autotransformer) that matches a resistance to the tank."""

    resistance: Resistance = Field(description="the resistance connected between the tap and "
                                   "the cold (start) end, e.g. 50 Ω; it is matched to the "
                                   "tank's load resistance")


class ToroidInductor(Section):
    """A coil that sheetgen designs on a ring core from the parts library (or given inline)."""

    form: Literal["toroid"] = Field(description="toroid: wind a ring core")
    inductance: Inductance | None = Field(
        None, description="inductance wanted; omit to have it computed from targets.f0 and C")
    core: name_or(CoreSpec) = Field(description="a core of the parts library by name, or inline")
    wire: WireSize
    enamel_grade: Literal[1, 2, 3] = Field(2, description="enamel build grade 1 (thin), 2 or 3 (thick)")
    lead_length: LeadRun = Field(0.025, description="length of each lead beyond the core "
                                 "(at most 300 mm)")
    link: LinkWinding | None = Field(None, description="a link winding (optional)")
    tap: Tap | None = Field(None, description="a tap on the winding instead of a link "
                            "(optional)")
    self_capacitance: Capacitance | None = Field(
        None, description="the wound coil's self-capacitance, measured or from a like coil "
        "(optional; sheetgen makes no estimate for a ring core), for its self-resonance and "
        "its Q near it")
    q: PositiveNumber | None = Field(None, description="measured Q at f0, to use instead of "
                                     "the estimate (optional)")
    q_tolerance: Tolerance | None = QTolerance
    tolerance: Tolerance | None = Field(None, description="± tolerance of the wound inductance "
                                       "(default: the core's AL tolerance, else its material's "
                                       "µi tolerance)")

    @model_validator(mode="after")
    def _one_coupling(self):
        if self.link is not None and self.tap is not None:
            raise PydanticCustomError("exclusive", "give a link or a tap, not both")
        return self
    temperature_coefficient: TemperatureCoefficient | None = Field(
        None, description="temperature coefficient of the inductance (default: the material's "
        "µi coefficient)")


class SolenoidInductor(Section):
    """A single-layer air-core coil that sheetgen designs on a cylindrical former."""

    form: Literal["solenoid"] = Field(description="solenoid: single-layer air-core coil")
    inductance: Inductance | None = Field(
        None, description="inductance wanted; omit to have it computed from targets.f0 and C")
    former_diameter: Length = Field(description="outside diameter of the former (or mandrel)")
    wire: WireSize
    enamel_grade: Literal[1, 2, 3] = Field(2, description="enamel build grade 1 (thin), 2 or 3 (thick)")
    pitch: Length | None = Field(None, description="turn-to-turn spacing (centre to centre)")
    length: Length | None = Field(None, description="winding length (instead of pitch)")
    former_length: Length | None = Field(None, description="usable length of the former")
    tap: Tap | None = Field(None, description="a tap on the winding (optional)")
    lead_length: LeadRun = Field(0.025, description="length of each lead beyond the winding "
                                 "(at most 300 mm)")
    q: PositiveNumber | None = Field(None, description="measured Q at f0, to use instead of "
                                     "the estimate (optional)")
    q_tolerance: Tolerance | None = QTolerance
    tolerance: Tolerance | None = Field(None, description="± tolerance of the wound inductance "
                                       "(default 5 %, common practice for hand-wound coils)")
    temperature_coefficient: TemperatureCoefficient | None = Field(
        None, description="temperature coefficient of the inductance (omit: not varied)")

    @model_validator(mode="after")
    def _spacing(self):
        exactly_one(self, ("pitch", "length"), "the winding's spacing")
        return self


Inductor = Annotated[GivenInductor | ToroidInductor | SolenoidInductor,
                     Field(discriminator="form")]


class Trimmer(Section):
    """A variable capacitor across the fixed one, for tuning f0 on the bench."""

    description: PartDescription = Field(None, description="what to buy, for the parts list, "
                                         "e.g. film-dielectric trimmer, 10 mm")
    minimum: Capacitance = Field(description="capacitance at minimum mesh")
    maximum: Capacitance = Field(description="capacitance at maximum mesh")
    rated_voltage: Voltage | None = Field(None, description="the trimmer's rated (peak) voltage")

    @model_validator(mode="after")
    def _ordered(self):
        if not self.maximum > self.minimum:
            raise PydanticCustomError("order", "maximum must be above minimum")
        return self


class CapacitorSection(Section):
    """The tuning capacitor."""

    description: PartDescription = Field(None, description="what to buy, for the parts list, "
                                         "e.g. silver mica, radial leads")
    capacitance: Capacitance | None = Field(
        None, description="capacitance; omit to have it computed from targets.f0 and L")
    esr: LossResistance | None = Field(None, description="equivalent series resistance at f0")
    dissipation_factor: Fraction | None = Field(
        None, description="dissipation factor tan δ at f0 (instead of esr), e.g. 0.1 %")
    preferred_series: Literal["E6", "E12", "E24", "E48", "E96", "E192"] = Field(
        "E12", description="IEC 60063 series that standard values are picked from")
    trimmer: Trimmer | None = Field(None, description="a trimmer in parallel that re-centres "
                                    "f0 (optional)")
    tolerance: Tolerance | None = Field(
        None, description="± tolerance of the fixed part(s) (default: the one IEC 60063 pairs "
        "with the preferred series: " + ", ".join(f"{name} {share * 100:g} %" for name, share
                                                  in SERIES_TOLERANCE.items()) + ")")
    dielectric: Literal["C0G", "NP0", "X7R", "X5R", "Y5V"] | None = Field(
        None, description="ceramic dielectric, which sets how C moves with temperature "
        "(C0G/NP0 class 1: 0 ± 30 ppm/K; X7R, X5R, Y5V class 2)")
    temperature_coefficient: TemperatureCoefficient | None = Field(
        None, description="temperature coefficient of C for a class 1 part other than C0G "
        "(e.g. -750 ppm/K); instead of dielectric")
    rated_voltage: Voltage | None = Field(None, description="rated voltage of each fixed part "
                                          "(peak; a DC rating), checked against the peak RF "
                                          "voltage with derating")
    rated_current: Current | None = Field(None, description="RF current rating of each fixed "
                                          "part (RMS), checked with derating")
    rated_power: Power | None = Field(None, description="power each fixed part may dissipate "
                                      "in its ESR")
    thermal_resistance: PositiveNumber | None = Field(
        None, description="thermal resistance of each fixed part to the air around it, in "
        "K/W as a plain number (from its maker's sheet); with it the part's heating by its "
        "ESR is checked against its dielectric's highest rated temperature")
    bleeder: Resistance | None = Field(None, description="bleeder resistor across the "
                                       "capacitor, for the discharge time in the cautions")
    bleeder_rated_power: Power | None = Field(
        None, description="power rating of the bleeder, checked at half its rating (common "
        "practice) against V̂²/(2R) at the tank's RF peak (omit: the sheet states the minimum "
        "to buy)")
    bleeder_rated_voltage: Voltage | None = Field(
        None, description="working-voltage rating of the bleeder (peak), checked against the "
        "tank's RF peak (omit: the sheet states the minimum to buy)")
    stray: SmallCapacitance | None = Field(
        None, description="wiring and layout capacitance across the capacitor. Design mode "
        "(no capacitance given): subtracted from the capacitance to fit (omit: "
        f"{DEFAULT_STRAY_CAPACITANCE_F * 1e12:g} pF, common practice for short point-to-point "
        "wiring). With a capacitance given: added to it (omit: none, the capacitance given is "
        "the tank's)")

    @model_validator(mode="after")
    def _one_loss(self):
        exactly_one(self, ("esr", "dissipation_factor"), "the capacitor's loss")
        if self.dielectric is not None and self.temperature_coefficient is not None:
            raise PydanticCustomError("exclusive", "give dielectric or temperature_coefficient, "
                                      "not both")
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
    tolerance: Tolerance | None = Field(None, description="± tolerance of the load resistance "
                                       "(omit: exact)")


class OperatingTemperature(Section):
    """The ambient range the circuit must meet its limits over."""

    minimum: Temperature = Field(15.0, description="lowest ambient temperature")
    maximum: Temperature = Field(35.0, description="highest ambient temperature")

    @model_validator(mode="after")
    def _ordered(self):
        if self.maximum < self.minimum:
            raise PydanticCustomError("order", "maximum must not be below minimum")
        return self


class BenchAmbient(OperatingTemperature):
    """The ambient range of the bench test."""

    minimum: Temperature = Field(20.0, description="lowest bench ambient temperature")
    maximum: Temperature = Field(30.0, description="highest bench ambient temperature")


class VariationSection(Section):
    """How part tolerances and temperature turn into test limits."""

    method: Literal["monte-carlo", "worst-case"] = Field(
        "monte-carlo", description="monte-carlo: limits at a coverage of random builds; "
        "worst-case: limits spanning every corner of the tolerance bands")
    distribution: Literal["uniform", "normal"] = Field(
        "uniform", description="how a tolerance band is read: uniform within the band, or "
        "normal with the band at ±3σ")
    trials: int = Field(DEFAULT_TRIALS, ge=100, le=2_000_000, description="Monte Carlo trials")
    seed: int = Field(DEFAULT_SEED, ge=0, description="random seed; the same job and seed give the same "
                      "limits")
    coverage: Fraction = Field(DEFAULT_COVERAGE, description="share of correctly built units the limits "
                               "must pass, e.g. 99.73 %")
    loss_tolerance: Tolerance | None = Field(
        None, description="± spread of the capacitor's ESR and (unless inductor.q_tolerance "
        "is given) of the coil's loss resistance (omit: ESR exact, coil "
        f"{COIL_Q_SPREAD * 100:g} %, common practice)")
    temperature: OperatingTemperature = Field(
        OperatingTemperature(), description="operating ambient range (default 15 to 35 °C, a "
        "bench and indoor range)")

    @model_validator(mode="after")
    def _coverage(self):
        if not 0.5 <= self.coverage < 1.0:
            raise PydanticCustomError("coverage", "coverage must be at least 50 % and below 100 %")
        return self


class TestSection(Section):
    """The bench test: what the instruments resolve."""

    __test__ = False  # not a pytest test class

    frequency_resolution: Frequency | None = Field(
        None, description="frequency resolution of the test set; limits are rounded outward "
        "to it (default: a power of ten near bandwidth/50)")
    frequency_accuracy: Fraction = Field(
        DEFAULT_FREQUENCY_ACCURACY, description="accuracy of the generator's or analyser's "
        "frequency (default 10 ppm, an ordinary crystal time base, common practice); windows "
        "are widened by it")
    lcr_accuracy: Fraction = Field(
        DEFAULT_LCR_ACCURACY, description="accuracy of the LCR meter (and of |Z| read on the "
        "analyser) (default 1 %, common practice); the L, C and impedance windows are "
        "widened by it")
    tuning_tolerance: Frequency | None = Field(
        None, description="how close the technician is asked to trim f0 to its target "
        "(default 5 % of the bandwidth, common practice); tuned windows are widened by it")
    ambient: BenchAmbient = Field(
        BenchAmbient(), description="ambient range of the bench test, which the windows are "
        "set for (default 20 to 30 °C, a laboratory, common practice); the operating range "
        "(variation.temperature) gives separate over-temperature figures")
    port_tolerance: PortTolerance = Field(
        DEFAULT_PORT_TOLERANCE, description="how far the generator's and the receiver's "
        "50 Ω ports may be from 50 Ω (default 5 %: return loss 32 dB, an analyser calibrated "
        "at the fixture's connectors or a 10 dB attenuator at each port, common practice); "
        "the fixture makes the circuit's source and load from these ports, and the windows "
        "include it")
    receiver_noise_floor: float = Field(
        DEFAULT_NOISE_FLOOR_DBM_PER_HZ, ge=-200.0, le=0.0,
        description="the receiver's (or analyser's) noise floor in dBm per hertz of its "
        "resolution bandwidth, a number such as -130 (default -130, i.e. -100 dBm in 1 kHz: "
        "a bench receiver without a preamplifier, common practice); the test set-up is "
        "chosen so the half-power points read at least 20 dB above it in the bandwidth the "
        "sheet sets")


class Acceptance(Section):
    """An explicit, reasoned acceptance of one failed rating check."""

    check: str = Field(min_length=1, max_length=100, description='the check, as the sheet names '
                       'it: part and quantity, e.g. "C1 peak voltage"')
    reason: str = Field(min_length=10, max_length=2000, description="why it is acceptable, and "
                        "who accepted it")


class RatingsSection(Section):
    """Derating and recorded acceptances for the component rating checks."""

    voltage_derating: Derating = Field(DEFAULT_VOLTAGE_DERATING, description="share of a capacitor's rated voltage "
                                       "it may carry (default 50 %, common practice)")
    current_derating: Derating = Field(DEFAULT_CURRENT_DERATING, description="share of a rated current a part may "
                                       "carry (default 80 %, common practice)")
    accept: tuple[Acceptance, ...] = Field((), description="failed checks accepted on purpose")


class InsulationSection(Section):
    """Where the circuit works, for the insulation distances of its kilovolt points."""

    pollution_degree: Literal[1, 2, 3] = Field(
        DEFAULT_POLLUTION_DEGREE, description="IEC 60664-1 pollution degree of the place the "
        "circuit works in (1 sealed, 2 ordinary indoor, 3 conductive dust or condensation)")
    material_group: Literal["I", "II", "III"] = Field(
        DEFAULT_MATERIAL_GROUP, description="IEC 60664-1 material group of the insulating "
        "parts by their tracking index (III, the worst, when not known)")
    altitude: Length = Field(DEFAULT_ALTITUDE_M, description="altitude of use; above 2000 m "
                             "clearances grow (IEC 60664-1)")


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

    library: str | None = Field(None, max_length=1000, description="folder of the parts "
                                "library, relative to this file (default: the nearest "
                                "shared/ folder above it, else the library shipped with "
                                "sheetgen)")

    sheet: SheetIdentity
    circuit: CircuitSection
    inductor: Inductor
    capacitor: CapacitorSection
    source: SourceSection
    load: LoadSection | None = None
    sweep: SweepSection = SweepSection()
    variation: VariationSection = VariationSection()
    test: TestSection = TestSection()
    ratings: RatingsSection = RatingsSection()
    insulation: InsulationSection = InsulationSection()

    @model_validator(mode="after")
    def _normal_bands(self):
        """A band read as normal (±3σ) is at most ±50 %, so no draw is ever ≤ 0."""
        if self.variation.distribution != "normal":
            return self
        bands = {"inductor.tolerance": self.inductor.tolerance,
                 "capacitor.tolerance": self.capacitor.tolerance,
                 "load.tolerance": self.load.tolerance if self.load is not None else None,
                 "variation.loss_tolerance": self.variation.loss_tolerance,
                 "inductor.q_tolerance": self.inductor.q_tolerance}
        for field, band in bands.items():
            if band is not None and band > NORMAL_BAND_MAX:
                raise PydanticCustomError(
                    "normal_band", f"±{band * 100:g} % is wider than ±{NORMAL_BAND_MAX * 100:g} %, "
                    "the widest tolerance read as a normal band (±3σ) whose draws stay "
                    "positive; give at most that, or variation.distribution: uniform",
                    {"field": field})
        return self
