"""The built demo site opened in headless Chromium, from file:// as a reader would, and
from a local web server. Outside CI the tests skip when no browser is installed; in CI
(the CI environment variable set) a missing browser fails them."""
from __future__ import annotations

import http.server
import json
import os
import shutil
import struct
import threading
from functools import partial
from urllib.parse import unquote, urldefrag, urlparse

import pytest

pytestmark = pytest.mark.browser

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update",
        "--disable-sync", "--no-first-run", "--disable-quic"]
WAIT_MS = 60_000  # upper bound for a rebuild on a busy machine; not a timing assertion


@pytest.fixture(scope="module")
def browser():
    if not CHROMIUM:
        if os.environ.get("CI"):
            pytest.fail("CI must install chromium for the browser tests (.ci/run does)")
        pytest.skip("chromium is not installed (apt-get install chromium); browser tests skipped")
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        if os.environ.get("CI"):
            raise
        pytest.skip("playwright is not installed (pip install -e '.[test]'); browser tests skipped")
    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        yield b
        b.close()


def _new_page(browser, **kw):
    ctx = browser.new_context(viewport={"width": 1280, "height": 900}, **kw)
    pg = ctx.new_page()
    pg.errors = []
    pg.on("pageerror", lambda e: pg.errors.append(str(e)))
    pg.on("console", lambda m: pg.errors.append(m.text) if m.type == "error" else None)
    pg.on("requestfailed", lambda r: pg.errors.append(f"request failed: {r.url}"))
    return ctx, pg


@pytest.fixture
def page(browser):
    ctx, pg = _new_page(browser)
    yield pg
    ctx.close()


@pytest.fixture(scope="module")
def web_server(demo_site):
    class Quiet(http.server.SimpleHTTPRequestHandler):
        def log_message(self, format, *args):
            pass

    handler = partial(Quiet, directory=str(demo_site))
    server = http.server.ThreadingHTTPServer(("127.0.0.1", 0), handler)
    threading.Thread(target=server.serve_forever, daemon=True).start()
    yield f"http://127.0.0.1:{server.server_address[1]}/"
    server.shutdown()
    server.server_close()


def _pages(site):
    return sorted(p.relative_to(site).as_posix() for p in site.rglob("*.html"))


def test_spec_page_answers_does_it_pass_and_why_not_within_one_screen(page, demo_site):
    page.goto((demo_site / "corvinta-atlas-27-studio" / "index.html").as_uri())
    verdict = page.locator("#verdict .verdict").first
    assert verdict.inner_text().startswith("✗ FAIL")
    failing = page.locator("#verdict ul.failing li")
    assert failing.count() >= 1
    assert "outside by" in failing.first.inner_text()
    box = page.locator("#verdict").bounding_box()
    assert box["y"] + box["height"] <= 900  # the whole verdict summary is on the first screen
    first_figure = page.locator("figure img").first.bounding_box()
    assert first_figure["y"] < 900  # and the diagrams start on it
    imgs = page.locator("figure img")
    assert imgs.count() == 3
    for i in range(3):
        assert page.evaluate("(el) => el.complete && el.naturalWidth > 0", imgs.nth(i).element_handle())
    assert page.locator("h2", has_text="Compliance").is_visible()
    assert page.errors == []


def test_every_spec_page_shows_its_whole_verdict_summary_on_the_first_screen(page, demo_site, demo_results):
    for spec in demo_results["specs"]:
        page.goto((demo_site / spec["id"] / "index.html").as_uri())
        word = page.locator("#verdict .verdict").first.inner_text()
        assert word.endswith(spec["verdict"].upper()), spec["id"]
        box = page.locator("#verdict").bounding_box()
        assert box["y"] + box["height"] <= 900, spec["id"]
        fails = sum(r["verdict"] != "pass" for r in spec["requirements"])
        assert page.locator("#verdict ul.failing li").count() == min(fails, 12) + (fails > 12), spec["id"]
    assert page.errors == []


@pytest.mark.parametrize("layout", ["file", "http"])
def test_every_page_loads_without_console_errors(browser, demo_site, web_server, layout):
    ctx, pg = _new_page(browser)
    try:
        for rel in _pages(demo_site):
            url = (demo_site / rel).as_uri() if layout == "file" else web_server + rel
            pg.goto(url)
            pg.wait_for_load_state("load")
            assert pg.title(), rel
        assert pg.errors == []
    finally:
        ctx.close()


def test_every_internal_link_and_anchor_resolves(page, demo_site):
    ids_of: dict[str, set] = {}

    def ids(path):
        if path not in ids_of:
            page.goto(path.as_uri())
            ids_of[path] = set(page.evaluate("Array.from(document.querySelectorAll('[id]')).map(e => e.id)"))
        return ids_of[path]

    checked = 0
    for rel in _pages(demo_site):
        src = demo_site / rel
        page.goto(src.as_uri())
        hrefs = page.evaluate("Array.from(document.querySelectorAll('a[href], link[href], img[src], script[src]'))"
                              ".map(e => e.href || e.src)")
        for href in hrefs:
            url, frag = urldefrag(href)
            u = urlparse(url)
            if u.scheme in ("http", "https", "mailto", "data"):
                continue
            assert u.scheme == "file", href
            target = type(demo_site)(unquote(u.path))
            assert target.is_file(), f"{rel}: {href}"
            assert demo_site in target.parents or target == demo_site, f"{rel}: link leaves the site: {href}"
            if frag:
                assert target.suffix == ".html" and frag in ids(target), f"{rel}: missing anchor #{frag}"
            checked += 1
    assert checked > 50
    assert page.errors == []


@pytest.mark.parametrize("layout", ["file", "http"])
def test_filter_narrows_the_index_by_text_status_and_verdict(page, demo_site, demo_results, web_server, layout):
    page.goto((demo_site / "index.html").as_uri() if layout == "file" else web_server + "index.html")
    rows = page.locator("tr.spec-row:visible")
    total = len(demo_results["specs"])
    assert rows.count() == total
    page.fill("#filter-text", "pocket")
    assert rows.count() == 1 and "Pocket 6" in rows.first.inner_text()
    assert page.locator("#filter-count").inner_text() == f"1 of {total} specs shown"
    page.fill("#filter-text", "")
    page.select_option("#filter-verdict", "pass")
    n_pass = sum(s["verdict"] == "pass" for s in demo_results["specs"])
    assert rows.count() == n_pass
    assert all("pass" in rows.nth(i).get_attribute("data-verdict") for i in range(rows.count()))
    page.select_option("#filter-status", "draft")
    n = sum(s["verdict"] == "pass" and s["status"] == "draft" for s in demo_results["specs"])
    assert rows.count() == n
    page.fill("#filter-text", "no such product")
    assert rows.count() == 0 and page.locator("#filter-none").is_visible()
    assert page.locator("tbody.family:visible").count() == 0
    assert page.errors == []


def test_index_links_to_every_spec_page(page, demo_site, demo_results):
    page.goto((demo_site / "index.html").as_uri())
    links = page.locator("table.specs tr.spec-row a")
    assert links.count() == len(demo_results["specs"])
    links.first.click()
    page.wait_for_load_state()
    assert page.locator("figure img").count() >= 2
    assert page.errors == []


def test_keyboard_reaches_skip_link_then_content_and_the_filter(page, demo_site):
    page.goto((demo_site / "index.html").as_uri())
    page.keyboard.press("Tab")
    assert page.evaluate("document.activeElement.className") == "skip"
    assert page.locator("a.skip").is_visible()
    page.keyboard.press("Enter")
    assert page.evaluate("location.hash") == "#main"
    for _ in range(12):
        page.keyboard.press("Tab")
        if page.evaluate("document.activeElement.id") == "filter-text":
            break
    assert page.evaluate("document.activeElement.id") == "filter-text"
    page.keyboard.type("halo")
    assert page.locator("tr.spec-row:visible").count() == 1


_CONTRAST_JS = """() => {
  function rgb(s) { const m = s.match(/[\\d.]+/g).map(Number); return m.length > 3 ? m : [...m, 1]; }
  function lum(c) { const f = v => { v /= 255; return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4); };
    return 0.2126 * f(c[0]) + 0.7152 * f(c[1]) + 0.0722 * f(c[2]); }
  function bg(el) { for (; el; el = el.parentElement) { const c = rgb(getComputedStyle(el).backgroundColor);
    if (c[3] > 0) return c; } return [255, 255, 255, 1]; }
  const worst = []; let checked = 0;
  for (const el of document.querySelectorAll('body *')) {
    if (!el.offsetParent && el.tagName !== 'BODY') continue;
    const own = Array.from(el.childNodes).some(n => n.nodeType === 3 && n.textContent.trim());
    if (!own) continue;
    checked += 1;
    const a = lum(rgb(getComputedStyle(el).color)), b = lum(bg(el));
    const ratio = (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
    if (ratio < 4.5) worst.push([el.tagName, el.className, el.textContent.trim().slice(0, 30), ratio.toFixed(2)]);
  }
  return {checked, worst};
}"""


@pytest.mark.parametrize("scheme", ["light", "dark"])
def test_text_contrast_is_at_least_4_5_to_1_in_both_themes(browser, demo_site, scheme):
    ctx, pg = _new_page(browser, color_scheme=scheme)
    try:
        for rel in ("index.html", "corvinta-atlas-27-studio/index.html", "corvinta-halo-rgbw-module/index.html"):
            pg.goto((demo_site / rel).as_uri())
            pg.evaluate("document.querySelectorAll('details').forEach(d => d.open = true)")
            found = pg.evaluate(_CONTRAST_JS)
            assert found["checked"] > 40 and found["worst"] == [], rel
    finally:
        ctx.close()


def test_dark_theme_never_retints_swatches_or_diagrams(browser, demo_site):
    colours = {}
    for scheme in ("light", "dark"):
        ctx, pg = _new_page(browser, color_scheme=scheme)
        try:
            pg.goto((demo_site / "corvinta-atlas-27-studio" / "index.html").as_uri())
            colours[scheme] = pg.evaluate(
                "[Array.from(document.querySelectorAll('.swatch')).map(e => getComputedStyle(e).backgroundColor),"
                " Array.from(document.querySelectorAll('figure img')).map(e => getComputedStyle(e).backgroundColor),"
                " getComputedStyle(document.body).backgroundColor]")
        finally:
            ctx.close()
    assert colours["light"][0] == colours["dark"][0] and len(colours["light"][0]) == 4
    assert colours["light"][1] == colours["dark"][1] == ["rgb(255, 255, 255)"] * 3
    assert colours["light"][2] != colours["dark"][2]  # the page itself did change theme


def test_print_layout_keeps_figures_and_tables_whole_and_hides_navigation(page, demo_site):
    page.goto((demo_site / "corvinta-atlas-27-studio" / "index.html").as_uri())
    page.emulate_media(media="print")
    styles = page.evaluate("""() => ({
      table: getComputedStyle(document.querySelector('table.rows')).breakInside,
      figure: getComputedStyle(document.querySelector('figure')).breakInside,
      toc: getComputedStyle(document.querySelector('nav.toc')).display,
      swatch: getComputedStyle(document.querySelector('.swatch')).printColorAdjust,
      figdata: getComputedStyle(document.querySelector('.figdata')).overflow})""")
    assert styles == {"table": "avoid", "figure": "avoid", "toc": "none", "swatch": "exact", "figdata": "visible"}
    pdf = page.pdf(format="A4")
    assert pdf.startswith(b"%PDF") and len(pdf) > 50_000


def test_screenshot_of_a_spec_page_has_the_viewport_size_and_content(page, demo_site, tmp_path):
    page.goto((demo_site / "corvinta-atlas-27-studio" / "index.html").as_uri())
    shot = tmp_path / "spec.png"
    page.screenshot(path=str(shot), full_page=True)
    data = shot.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    width, height = struct.unpack(">II", data[16:24])
    assert width == 1280 and height > 2000  # a full page: verdict, three diagrams, tables
    assert len(data) > 100_000  # diagrams and text drawn, not a blank page


def test_served_page_reloads_after_a_saved_spec_and_shows_a_broken_specs_errors(browser, tmp_path):
    from generator.serve import State, rebuild, start_server, watch

    from .conftest import copy_demo

    specs = copy_demo(tmp_path)
    out = tmp_path / "site"
    state = State()
    rebuild(specs, out, state)
    server = start_server(out, state, 0)
    stop = threading.Event()
    watcher = threading.Thread(target=watch, args=(specs, out, state, 0.05, stop), daemon=True)
    watcher.start()
    ctx, pg = _new_page(browser)
    try:
        pg.goto(f"http://127.0.0.1:{server.server_address[1]}/corvinta-atlas-27-studio/index.html")
        assert "revision C" in pg.locator("p.meta").inner_text()
        spec = specs / "corvinta-atlas-27-studio.yaml"
        text = spec.read_text(encoding="utf-8")
        spec.write_text(text.replace("revision: C", "revision: [C"), encoding="utf-8")
        pg.wait_for_selector("#build-error", timeout=WAIT_MS)
        assert "YAML syntax error" in pg.locator("#build-error").inner_text()
        assert "revision C" in pg.locator("p.meta").inner_text()  # the last good page stays
        spec.write_text(text.replace("revision: C", "revision: D"), encoding="utf-8")
        pg.wait_for_function("document.querySelector('p.meta').textContent.includes('revision D')",
                             timeout=WAIT_MS)
        assert pg.locator("#build-error").count() == 0
        assert json.loads(pg.evaluate("fetch('/__colourspec/status.json').then(r => r.text())"))["errors"] == []
        assert pg.errors == []
    finally:
        ctx.close()
        stop.set()
        watcher.join(WAIT_MS / 1000)
        server.shutdown()
        server.server_close()
