"""`shaftwright schema`, docs/design-format.md and the OpenAPI bodies: one description, from the models.

The check is independent of our models: the ``jsonschema`` library (a test dependency)
validates the demo designs and real API answers against the schemas we publish.
"""
from __future__ import annotations

import json

import jsonschema
import pytest

import engine
from app.cli import main
from app.schema import DESCRIPTIONS, RESULT_DESCRIPTIONS, design_schema, markdown, result_schema
from tests.conftest import ROOT, SAMPLES, load_sample

DEMOS = sorted(p.name for p in SAMPLES.glob("*.json"))


def _printed(capsys, *argv) -> dict:
    assert main(["schema", *argv]) == 0
    return json.loads(capsys.readouterr().out)


@pytest.mark.parametrize("name", DEMOS)
def test_every_demo_design_validates_against_the_printed_schema(name, capsys):
    schema = _printed(capsys)
    jsonschema.Draft202012Validator.check_schema(schema)
    jsonschema.Draft202012Validator(schema).validate(load_sample(name))


@pytest.mark.parametrize("name", DEMOS)
def test_every_demo_result_validates_against_the_result_schema(name, capsys):
    schema = _printed(capsys, "--result")
    jsonschema.Draft202012Validator.check_schema(schema)
    result = engine.solve(load_sample(name)).model_dump(mode="json")
    jsonschema.Draft202012Validator(schema).validate(result)


def test_the_schema_refuses_what_the_engine_refuses():
    validator = jsonschema.Draft202012Validator(design_schema())
    for change in (lambda d: d["supports"][0].update(x_mm="far"),      # not a number
                   lambda d: d["elements"][0].update(kind="flywheel"),  # unknown kind
                   lambda d: d.update(colour="red"),                    # unknown key
                   lambda d: d["shaft"]["segments"][0].update(d_mm=0),  # not positive
                   lambda d: d.pop("load_cases")):                      # required
        d = load_sample("countershaft.json")
        change(d)
        assert not validator.is_valid(d)
        with pytest.raises(engine.DesignError):
            engine.solve(d)


def test_docs_page_is_generated_from_the_models():
    """docs/design-format.md is `python3 -m app.schema`'s output: regenerate it after a model change."""
    on_disk = (ROOT / "docs" / "design-format.md").read_text(encoding="utf-8")
    assert on_disk == markdown(), "docs/design-format.md is stale: run `python3 -m app.schema > docs/design-format.md`"
    for words in ("sagging-positive", "applies *to* the shaft", "exerts *on* the shaft",
                  "`pitch_cone_angle_deg`", "`Lnm_h`", "`torque_alternating_pct`"):
        assert words in on_disk


def test_every_description_names_a_key_that_exists():
    """No description outlives its key (a renamed key would leave a stale line)."""
    def keys(schema):
        out = {(schema["title"], k) for k in schema.get("properties", {})}
        return out | {(n, k) for n, d in schema.get("$defs", {}).items() for k in d.get("properties", {})}

    for table, schema, top in ((DESCRIPTIONS, design_schema(), "Design"), (RESULT_DESCRIPTIONS, result_schema(), "Result")):
        present = {(top if n == schema["title"] else n, k) for n, k in keys(schema)}
        names = {k for _, k in present}
        for entry in table:
            model, _, key = entry.rpartition(".")
            assert ((model, key) in present) if model else (key in names), f"stale description {entry!r}"


# --- the JSON API, typed from the same models ------------------------------------------------

@pytest.fixture(scope="module")
def spec_and_client():
    from fastapi.testclient import TestClient

    from app.main import create_app

    app = create_app()
    return app.openapi(), TestClient(app)


def _validate(spec, name, value):
    schema = {"$ref": f"#/components/schemas/{name}", "components": spec["components"]}
    jsonschema.Draft202012Validator(schema).validate(value)


def test_openapi_bodies_name_the_models(spec_and_client):
    spec, _ = spec_and_client
    op = spec["paths"]["/api/solve"]["post"]
    assert op["requestBody"]["content"]["application/json"]["schema"] == {"$ref": "#/components/schemas/Design"}
    assert op["responses"]["200"]["content"]["application/json"]["schema"] == {"$ref": "#/components/schemas/Result"}
    assert op["responses"]["422"]["content"]["application/json"]["schema"] == {"$ref": "#/components/schemas/ErrorList"}
    for path in ("/api/designs", "/api/study", "/api/arrangements", "/api/designs/{design_id}/revisions"):
        body = spec["paths"][path]["post"]["requestBody"]["content"]["application/json"]["schema"]
        assert "$ref" in body or "anyOf" in body, path
    design = spec["components"]["schemas"]["Design"]
    assert set(design["properties"]) == set(design_schema()["properties"])


def test_docs_page_shows_every_key(spec_and_client):
    _, client = spec_and_client
    page = client.get("/docs").text
    for schema in (design_schema(), result_schema()):
        for _, d in [("", schema), *schema["$defs"].items()]:
            for key in d.get("properties", {}):
                assert f"<td>{key}</td>" in page, key
    assert "Request body: <a href='#schema-Design'>Design</a>" in page


def test_real_answers_match_their_documented_schemas(spec_and_client):
    spec, client = spec_and_client
    design = load_sample("countershaft.json")
    r = client.post("/api/solve", json=design)
    assert r.status_code == 200
    _validate(spec, "Result", r.json())
    bad = client.post("/api/solve", json={**design, "supports": []})
    assert bad.status_code == 422
    _validate(spec, "ErrorList", bad.json())
    saved = client.post("/api/designs", json={"design": design, "author": "schema test"})
    assert saved.status_code == 201
    _validate(spec, "Revision", saved.json())
    listed = client.get(saved.json()["api_url"] + "/revisions")
    _validate(spec, "RevisionList", listed.json())
    _validate(spec, "SaveRequest", {"design": design, "author": "a", "comment": "b", "base_revision": 1})
    study = client.post("/api/study", json={"design": design, "vary": ["supports.B.x_mm=200:260:3"]})
    assert study.status_code == 200
    _validate(spec, "StudyResult", study.json())
    cmp = client.post("/api/arrangements", json={"design": design})
    assert cmp.status_code == 200
    _validate(spec, "ArrangementComparison", cmp.json())
