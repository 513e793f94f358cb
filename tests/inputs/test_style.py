"""House style files: read with the job file's located reader, so every problem is reported
as FILE:LINE:COL field: message (the format the job loader uses, DESIGN.md); the logo must
stay inside the job's folder tree. Lines and columns below are counted by hand in the YAML
text each test writes.
"""

from __future__ import annotations

import io
import os

import pytest
from pypdf import PdfReader

from sheetgen.design.pipeline import design_from_file
from sheetgen.errors import InputError
from sheetgen.inputs.style import SECTION_NAMES, check_logo_inside, default_style, load_style
from sheetgen.report.results import results_json
from sheetgen.sheet import render_sheet
from tests.sheet.test_tools import SHARED, TEMPLATES


def _problems(tmp_path, text: str, job_dir=None) -> list[str]:
    path = tmp_path / "style.yaml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(InputError) as caught:
        load_style(path, job_dir or tmp_path)
    return [str(p).removeprefix(f"{path}:") for p in caught.value.problems]


def _png(path):
    from PIL import Image
    path.parent.mkdir(parents=True, exist_ok=True)
    Image.new("L", (60, 20), 128).save(path, format="PNG")


def test_default_style_lists_every_section_once():
    style = default_style()
    assert style.page_size == "A4"
    assert sorted(style.sections) == sorted(SECTION_NAMES)
    assert style.logo_path is None and style.organisation


@pytest.mark.parametrize("text, expected", [
    ("organisation: X\npage_size: A5\n", ['2:12 page_size: "A5" is not allowed; input should be \'A4\' or \'Letter\'']),
    ("organisation: X\npagesize: A4\n", ["2:1 pagesize: unknown key; did you mean 'page_size'?"]),
    ("page_size: A4\n", ["1:1 organisation: is missing"]),
    ("organisation: X\nsections:\n  - parts\n  - shematic\n  - parts\n",
     ['4:5 sections[1]: "shematic" is not allowed; did you mean \'schematic\'?',
      "5:5 sections[2]: 'parts' appears twice"]),
    ("organisation: X\nlogo: /etc/hostname\n", ['2:7 logo: "/etc/hostname" is an absolute path']),
    ("organisation: X\nlogo: ../outside.png\n", ['2:7 logo: "../outside.png" leads out of the']),
    ("organisation: X\nlogo: img/none.png\n", ['2:7 logo: "img/none.png" does not exist']),
    ("organisation: [a, b]\npage_size: Legal\n",
     ["1:15 organisation: a list: input should be a valid string",
      '2:12 page_size: "Legal" is not allowed']),
    ("organisation: X\n  bad: [\n", ["YAML syntax"]),
])
def test_bad_styles_say_where_and_what(tmp_path, text, expected):
    problems = _problems(tmp_path, text)
    assert len(problems) == len(expected), problems
    for problem, start in zip(problems, expected):
        assert start in problem, (problem, start)


def test_a_link_out_of_the_job_folder_is_refused(tmp_path):
    outside = tmp_path / "elsewhere" / "logo.png"
    _png(outside)
    job_dir = tmp_path / "job"
    job_dir.mkdir()
    os.symlink(outside, job_dir / "logo.png")
    problems = _problems(job_dir, "organisation: X\nlogo: logo.png\n", job_dir)
    assert len(problems) == 1 and problems[0].startswith("2:7 logo:") and "outside" in problems[0]


def test_a_file_that_is_not_an_image_is_refused(tmp_path):
    (tmp_path / "logo.png").write_text("not an image", encoding="utf-8")
    problems = _problems(tmp_path, "organisation: X\nlogo: logo.png\n")
    assert problems == ['2:7 logo: "logo.png" is not a PNG or JPEG image']


def test_logo_inside_the_job_folder_is_drawn(tmp_path):
    _png(tmp_path / "brand" / "logo.png")
    style_path = tmp_path / "style.yaml"
    style_path.write_text("organisation: Logo Works\nlogo: brand/logo.png\n", encoding="utf-8")
    style = load_style(style_path, tmp_path)
    job = tmp_path / "job.yaml"
    job.write_text((TEMPLATES / "series.yaml").read_text(encoding="utf-8"), encoding="utf-8")
    d = design_from_file(job, SHARED)
    pdf = render_sheet(d, job_text=job.read_text(encoding="utf-8"), results_text=results_json(d),
                       job_dir=tmp_path, style=style)
    reader = PdfReader(io.BytesIO(pdf))
    assert all(len(page.images) == 1 for page in reader.pages), "the logo on every page"
    with pytest.raises(InputError) as caught:  # the same style for a job elsewhere
        check_logo_inside(style, tmp_path / "other-job")
    assert "2:7 logo:" in str(caught.value)
