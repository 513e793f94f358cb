"""Words of the sweep test report: an as-found row reads as English (no capital
mid-phrase, as "as found Frequency of the peak" once printed)."""

from types import SimpleNamespace

from sheetgen.bench.report_pdf import verdict_row_name


def test_as_found_rows_keep_the_label_whole_and_mark_it_after():
    label = "Frequency of the peak"
    assert verdict_row_name(SimpleNamespace(label=label, as_found=False)) == label
    found = verdict_row_name(SimpleNamespace(label=label, as_found=True))
    assert found == "Frequency of the peak (as found)"
    assert found[0].isupper() and not any(c.isupper() for c in found[1:])
