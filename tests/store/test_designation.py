"""The designer's chosen bearing (``supports[].designation``, issue 13) survives a save and a
reload on both store backends, and the reloaded design rates that bearing; a wrong one is
refused by the solve at its key."""
from __future__ import annotations

import engine


def test_chosen_bearing_survives_save_and_reload(client, design):
    first = engine.solve(design).bearings[0]
    pick = first.candidates[1].designation                  # not the first ranked
    design["supports"][0]["designation"] = pick
    did = client.post("/api/designs", json={"design": design, "author": "Ana", "comment": "chose L"}).json()["id"]
    back = client.get(f"/api/designs/{did}").json()["design"]
    assert back["supports"][0]["designation"] == pick
    solved = client.post("/api/solve", json=back)
    assert solved.status_code == 200
    b = solved.json()["bearings"][0]
    assert b["designation"] == pick and b["chosen_by"] == "designer"


def test_wrong_designation_is_an_error_at_its_key(client, design):
    design["supports"][0]["designation"] = "no such bearing"
    r = client.post("/api/solve", json=design)
    assert r.status_code == 422
    assert "supports[0].designation" in r.text
