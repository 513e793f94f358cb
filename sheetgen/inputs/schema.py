"""The JSON Schema of job files (`sheetgen schema`), from the job model."""

from __future__ import annotations

import json

from sheetgen.inputs.model import Job

JSON_SCHEMA_DIALECT = "https://json-schema.org/draft/2020-12/schema"


def job_schema() -> dict:
    """The job model's JSON Schema with its dialect and title."""
    schema = Job.model_json_schema()
    schema["$schema"] = JSON_SCHEMA_DIALECT
    schema["title"] = "sheetgen job file"
    return schema


def job_schema_json() -> str:
    return json.dumps(job_schema(), indent=2, ensure_ascii=False) + "\n"
