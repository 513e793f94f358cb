"""Once per process, ahead of the first sheet: the fonts registered and the field font cut.

A batch's fork server imports this before it forks its workers (batch/runner.py, PRELOAD),
so every worker inherits the registered fonts and the cut field font instead of making
them again (the cut alone costs about a third of a second). Both are pure functions of the
font files, so a sheet's bytes do not depend on where they were made.
"""

from sheetgen.sheet import fonts

fonts.register_fonts()
fonts.field_font()
