"""The built demo site opened in headless Chromium, from file:// as a reader would."""
from __future__ import annotations

import os
import shutil

import pytest

pytestmark = pytest.mark.browser

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update",
        "--disable-sync", "--no-first-run", "--disable-quic"]


@pytest.fixture(scope="module")
def browser():
    if not CHROMIUM:
        if os.environ.get("CI"):
            pytest.fail("CI must install chromium for the browser tests (.ci/run does)")
        pytest.skip("chromium is not installed (apt-get install chromium)")
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        yield b
        b.close()


@pytest.fixture
def page(browser):
    ctx = browser.new_context(viewport={"width": 1280, "height": 900})
    pg = ctx.new_page()
    pg.errors = []
    pg.on("pageerror", lambda e: pg.errors.append(str(e)))
    pg.on("console", lambda m: pg.errors.append(m.text) if m.type == "error" else None)
    yield pg
    ctx.close()


def test_spec_page_shows_both_diagrams_and_the_compliance_table(page, demo_site):
    page.goto((demo_site / "corvinta-atlas-27-studio" / "index.html").as_uri())
    imgs = page.locator("figure img")
    assert imgs.count() == 3
    for i in range(3):
        assert page.evaluate("(el) => el.complete && el.naturalWidth > 0", imgs.nth(i).element_handle())
    assert page.locator("h2", has_text="Compliance").is_visible()
    assert page.locator("table.rows").first.is_visible()
    verdict = page.locator(".verdict-box .verdict").first.inner_text()
    assert verdict.startswith("✗ FAIL")
    # the diagrams are the first thing after the verdict: the first image is within one screen
    box = imgs.first.bounding_box()
    assert box["y"] < 900
    assert page.errors == []


def test_index_links_to_every_spec_page(page, demo_site, demo_results):
    page.goto((demo_site / "index.html").as_uri())
    links = page.locator("table.specs tbody a")
    assert links.count() == len(demo_results["specs"])
    links.first.click()
    page.wait_for_load_state()
    assert page.locator("figure img").count() >= 2
    assert page.errors == []
