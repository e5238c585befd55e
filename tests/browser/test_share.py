"""Save from the editor, open the share link in a second browser context, see the same design."""
from __future__ import annotations

from playwright.sync_api import expect

NAME = "Shared in the browser: invented hoist countershaft"


def _new_page(browser):
    ctx = browser.new_context(viewport={"width": 1440, "height": 1000})
    pg = ctx.new_page()
    pg.set_default_timeout(15000)
    return ctx, pg


def test_save_then_open_the_share_link_elsewhere(browser, page, live_server):
    page.goto(live_server + "/")
    page.fill("#f-name", NAME)
    page.fill("input[name=share_author]", "Ana <i>")
    page.fill("input[name=share_comment]", "first save")
    page.click("#share-save")
    link = page.locator("#share-link")
    expect(link).to_be_visible()
    href = link.get_attribute("href")
    assert href.startswith("/d/") and len(href) >= 3 + 22
    expect(page.locator(".share-ok")).to_contain_text("Saved as revision 1")

    ctx2, other = _new_page(browser)  # someone else, with no local copy
    try:
        other.goto(live_server + href)
        expect(other.locator("#f-name")).to_have_value(NAME)
        other.goto(live_server + href + "/r/1")
        expect(other.locator("h1")).to_have_text(NAME)
        expect(other.locator(".titleblock")).to_contain_text("Ana <i>")  # shown as text

        # the other person saves revision 2 from the share link ...
        other.goto(live_server + href)
        other.fill("#f-name", NAME + " (B)")
        other.fill("input[name=share_comment]", "renamed by B")
        other.click("#share-save")
        expect(other.locator(".share-ok")).to_contain_text("Saved as revision 2")
    finally:
        ctx2.close()

    # ... so the first person's next save, still on revision 1 and renaming too, clashes on
    # the name: both values side by side, a choice per key, nothing overwritten
    page.fill("#f-name", NAME + " (A)")
    page.fill("input[name=share_comment]", "my second save")
    page.click("#share-save")
    conflict = page.locator(".share-clash")
    expect(conflict).to_be_visible()
    expect(conflict).to_contain_text("Nothing was overwritten")
    expect(conflict).to_contain_text(NAME + " (B)")
    expect(conflict).to_contain_text(NAME + " (A)")
    expect(conflict.locator("tr[data-key=name]")).to_contain_text("keep mine")
    page.click("#share-save")  # no choice made: still not saved (this try is kept too)
    expect(page.locator(".share-clash")).to_contain_text("conflict record 2")
    page.check("input[name='share_resolve:name'][value=theirs]")
    page.click("#share-save")  # the merge with the choice becomes revision 3; the page shows it
    expect(page.locator(".share-merged")).to_contain_text("Saved as revision 3")
    expect(page.locator("#f-name")).to_have_value(NAME + " (B)")
    page.goto(live_server + href + "/revisions")
    expect(page.locator(".revision-list tbody tr")).to_have_count(3)
    expect(page.locator("body")).to_contain_text("Saves kept after a conflict")
