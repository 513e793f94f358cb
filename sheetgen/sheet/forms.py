"""Fillable AcroForm fields as platypus flowables, placed wherever a table cell puts them.

The field names are the record's stable names from sheetgen.report.procedure (form_field_names);
work-order systems read a filled sheet by those names. Fields print with a border so a
sheet printed blank is filled by hand in the same boxes.
"""

from __future__ import annotations

from reportlab.lib.colors import Color, black, white
from reportlab.platypus import Flowable

from sheetgen.sheet import fonts

FIELD_FONT = "Helvetica"  # AcroForm appearance streams need a standard PDF font
FIELD_BORDER = Color(0.25, 0.25, 0.25)
FIELD_FILL = Color(0.97, 0.97, 0.97)


class TextField(Flowable):
    """A one-line (or multi-line) text field as wide as its cell."""

    def __init__(self, name: str, tooltip: str, height: float = 15.0, multiline: bool = False,
                 max_length: int = 200):
        super().__init__()
        self.name, self.tooltip, self.multiline = name, tooltip, multiline
        self.field_height, self.max_length = height, max_length

    def wrap(self, available_width, available_height):
        self.width, self.height = available_width, self.field_height
        return self.width, self.height

    def draw(self):
        self.canv.acroForm.textfield(
            name=self.name, tooltip=self.tooltip, x=0, y=0, width=self.width,
            height=self.height, relative=True, fontName=FIELD_FONT, fontSize=9 if not
            self.multiline else 8, borderWidth=0.6, borderColor=FIELD_BORDER,
            fillColor=FIELD_FILL, textColor=black, maxlen=self.max_length,
            fieldFlags="multiline" if self.multiline else "", forceBorder=True)


class RadioChoice(Flowable):
    """One choice of a one-choice group (pass or fail: choosing one clears the other),
    followed by its word; the group is the field `name`, the choice its `value`."""

    SIZE = 11.0

    def __init__(self, name: str, value: str, tooltip: str):
        super().__init__()
        self.name, self.value, self.tooltip = name, value, tooltip

    def wrap(self, available_width, available_height):
        self.width, self.height = min(available_width, 48.0), self.SIZE
        return self.width, self.height

    def draw(self):
        self.canv.acroForm.radio(
            name=self.name, tooltip=self.tooltip, value=self.value, selected=False, x=0, y=0,
            size=self.SIZE, relative=True, buttonStyle="check", shape="square",
            borderWidth=0.8, borderColor=black, fillColor=white, textColor=black,
            forceBorder=True)
        self.canv.setFont(fonts.REGULAR, 8.5)
        self.canv.drawString(self.SIZE + 3, 2.2, self.value)


class CheckBox(Flowable):
    """A check box followed by its word (pass / fail): the meaning is in the text."""

    SIZE = 11.0

    def __init__(self, name: str, word: str, tooltip: str):
        super().__init__()
        self.name, self.word, self.tooltip = name, word, tooltip

    def wrap(self, available_width, available_height):
        self.width, self.height = min(available_width, 48.0), self.SIZE
        return self.width, self.height

    def draw(self):
        self.canv.acroForm.checkbox(
            name=self.name, tooltip=self.tooltip, x=0, y=0, size=self.SIZE, relative=True,
            buttonStyle="cross", borderWidth=0.8, borderColor=black, fillColor=white,
            textColor=black, fieldFlags="", forceBorder=True)
        self.canv.setFont(fonts.REGULAR, 8.5)
        self.canv.drawString(self.SIZE + 3, 2.2, self.word)
