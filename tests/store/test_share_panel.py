"""POST /d/save: the editor's share panel saves the form as a revision (or says why not)."""
from __future__ import annotations

from app import web
from tests.store.test_escaping import MARK, PAYLOAD


def _form(design: dict, **share) -> dict:
    form = web.design_to_form(design, "si")
    form.update({f"share_{k}": str(v) for k, v in share.items()})
    return form


def test_first_save_gives_a_link_then_revisions_follow(client, design):
    r = client.post("/d/save", data=_form(design, author="Ana", comment="first"),
                    headers={"HX-Request": "true"})
    assert r.status_code == 200 and r.headers["x-shaftwright-status"] == "200"
    assert "Saved as revision 1" in r.text
    did = r.headers["hx-push-url"].rsplit("/", 1)[-1]
    stored = client.get(f"/api/designs/{did}").json()
    assert stored["author"] == "Ana" and stored["design"]["name"] == design["name"]
    assert [s["id"] for s in stored["design"]["supports"]] == ["L", "R"]
    r = client.post("/d/save", data=_form({**design, "name": "second"}, design_id=did,
                                          base_revision=1, comment="renamed"))
    assert r.status_code == 200 and "Saved as revision 2" in r.text
    assert 'name="share_base_revision" value="2"' in r.text


def test_stale_save_shows_the_changes_and_keeps_both(client, design):
    did = client.post("/api/designs", json=design).json()["id"]
    client.post(f"/api/designs/{did}/revisions", json={"design": {**design, "name": "theirs"},
                                                      "base_revision": 1, "author": "Ben"})
    r = client.post("/d/save", data=_form({**design, "name": PAYLOAD.format("mine")},
                                          design_id=did, base_revision=1))
    assert r.status_code == 409
    assert "Not saved yet" in r.text and "conflict record 1" in r.text and "by Ben" in r.text
    assert "theirs" in r.text and "swmine" in r.text and not MARK.search(r.text)
    # the base stays revision 1 (a second Save merges again; it never goes blindly on top of 2)
    assert 'name="share_base_revision" value="1"' in r.text
    assert 'name="share_resolve:name" value="mine"' in r.text and "keep mine" in r.text
    assert 'name="share_resolve:name" value="theirs"' in r.text and "take theirs" in r.text
    assert client.get(f"/api/designs/{did}").json()["design"]["name"] == "theirs"
    assert client.get(f"/api/designs/{did}/conflicts/1").json()["document"]["name"].endswith("</script>")
    # saving again without a choice changes nothing; with "take theirs" the merge is saved
    again = client.post("/d/save", data=_form({**design, "name": PAYLOAD.format("mine")},
                                              design_id=did, base_revision=1))
    assert again.status_code == 409 and client.get(f"/api/designs/{did}").json()["revision"] == 2
    form = _form({**design, "name": PAYLOAD.format("mine")}, design_id=did, base_revision=1)
    form["share_resolve:name"] = "theirs"
    done = client.post("/d/save", data=form, follow_redirects=False)
    assert done.status_code == 303
    latest = client.get(f"/api/designs/{did}").json()
    assert latest["revision"] == 3 and latest["design"]["name"] == "theirs"


def test_invalid_form_is_not_saved_and_says_where(client, design):
    form = _form(design)
    form["supports[1].x_mm"] = "far"
    r = client.post("/d/save", data=form)
    assert r.status_code == 422 and "Not saved" in r.text and "supports[1].x_mm" in r.text
