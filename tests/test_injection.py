"""Specs full of script payloads (tests/payloads/): every text is escaped in HTML and in
the SVG diagrams, Markdown notes are sanitised, and in headless Chromium no payload runs.

The payloads try to set window.__pwned, change document.title or open a dialog."""
from __future__ import annotations

import html
import os
import re
import shutil
from html.parser import HTMLParser
from pathlib import Path
from xml.etree import ElementTree as ET

import pytest

PAYLOADS = Path(__file__).resolve().parent / "payloads"
SVG_NS = "{http://www.w3.org/2000/svg}"
REFERENCE_TITLE = "_Ref </text><script>window.__pwned='svg'</script> $\\frac{a}{$ & <b>bold</b> ]]>"
FORBIDDEN_TAGS = {"script", "iframe", "object", "embed", "base", "form", "button", "svg", "math", "style",
                  "animate", "frame", "frameset", "applet", "template", "input", "textarea"}
FIGURES = ("xy.svg", "uv.svg", "white.svg")
# what the templates themselves put on pages (never text from a spec): the index filter
# script, a file from the site's own static folder, and an empty favicon
OWN_SCRIPTS = ("static/filter.js", "static/reload.js")
OWN_LINKS = ({"rel": "icon", "href": "data:,"},)


@pytest.fixture(scope="module")
def payload_site(tmp_path_factory) -> Path:
    from generator.build import build

    work = tmp_path_factory.mktemp("payload")
    shutil.copytree(PAYLOADS, work / "specs")
    cwd = os.getcwd()
    os.chdir(work)
    try:
        build(Path("specs"), Path("site"))
    finally:
        os.chdir(cwd)
    return work / "site"


class Tags(HTMLParser):
    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.tags: list[tuple[str, dict]] = []

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))

    handle_startendtag = handle_starttag


def tags_of(html: str) -> list[tuple[str, dict]]:
    p = Tags()
    p.feed(html)
    return p.tags


def test_the_payload_specs_build(payload_site):
    pages = sorted(p.relative_to(payload_site).as_posix() for p in payload_site.rglob("*.html"))
    # the payload units' lots and supplier get pages of their own, named by a safe slug of the text
    assert pages == ["index.html", "payload-reference/index.html", "payload/index.html", "payload/lots/7-7.html",
                     "payload/lots/img-src-x-onerror-window.__pwned-lot.html",
                     "payload/suppliers/td-tr-table-script-window.__pwned-supplier-script.html"]
    assert all(re.fullmatch(r"[A-Za-z0-9._/-]+", p) for p in pages)


def test_no_page_has_a_script_an_event_handler_or_an_unsafe_link(payload_site):
    for page in sorted(payload_site.rglob("*.html")):
        for tag, attrs in tags_of(page.read_text(encoding="utf-8")):
            where = f"{page.relative_to(payload_site)}: <{tag} {attrs}>"
            if tag == "script" and set(attrs) == {"src"} and attrs["src"].endswith(OWN_SCRIPTS) \
                    and not attrs["src"].split("static/")[0].strip("./"):
                continue
            if tag == "link" and attrs in OWN_LINKS:
                continue
            if tag == "form" and page.name == "index.html" and attrs.get("id") == "filter" \
                    and not [a for a in attrs if a in ("action", "method")]:
                continue  # the index's own filter: no action, driven by static/filter.js
            if tag in ("input", "select") and page.name == "index.html" \
                    and attrs.get("id", "").startswith("filter-") and "formaction" not in attrs:
                continue  # the filter's own fields
            assert tag not in FORBIDDEN_TAGS, where
            assert not [a for a in attrs if a.startswith("on")], where
            if tag == "img":  # only the diagrams, never an image from a note
                assert attrs["src"] in FIGURES, where
            for a in ("href", "src", "action", "formaction", "data", "srcdoc", "style"):
                v = (attrs.get(a) or "").strip().lower()
                if a in ("srcdoc", "style"):
                    assert a not in attrs or page.name == "index.html" and a == "style", where
                elif ":" in v.split("/")[0]:
                    assert v.startswith(("https:", "http:", "mailto:")), where


def test_payload_text_is_shown_as_text(payload_site):
    html = (payload_site / "payload" / "index.html").read_text(encoding="utf-8")
    assert ("&lt;script&gt;window.__pwned=&#39;serial&#39;&lt;/script&gt;" in html)
    assert "&lt;/td&gt;&lt;/tr&gt;&lt;/table&gt;&lt;script&gt;window.__pwned=&#39;supplier&#39;" in html
    assert "<title>&lt;script&gt;window.__pwned=&#39;title&#39;;document.title=&#39;pwned&#39;&lt;/script&gt;" in html
    # template syntax in spec text is not evaluated
    assert "{{ 7*7 }}" in html or "49" not in re.findall(r"owner[^<]*", html)


def test_markdown_notes_keep_their_text_and_an_https_link_and_lose_every_active_part(payload_site):
    html = (payload_site / "payload" / "index.html").read_text(encoding="utf-8")
    notes = html[html.index('class="notes"'):]
    notes = notes[: notes.index("</section>")]
    assert "Notes with payloads:" in notes
    assert '<a href="https://example.invalid/" rel="noopener noreferrer">ok link</a>' in notes
    links = [a.get("href") for t, a in tags_of(notes) if t == "a"]
    assert links == [None] * 7 + ["https://example.invalid/", None]  # links kept as text, only the https one live
    for word in ("javascript", "data:", "vbscript", "onerror", "onclick", "<script", "<img", "<iframe"):
        assert word not in notes.lower().replace("&lt;script", ""), word


def test_every_svg_is_well_formed_without_script_and_draws_the_reference_title_literally(payload_site):
    svgs = sorted(payload_site.glob("*/*.svg"))
    assert svgs
    texts = []
    for p in svgs:
        root = ET.fromstring(p.read_bytes())
        for el in root.iter():
            assert el.tag not in (f"{SVG_NS}script", f"{SVG_NS}foreignObject"), p
            assert not [a for a in el.attrib if a.startswith("on")], p
            texts.append(el.text or "")
    # drawn as written: '$...$', a leading '_', markup and a CDATA end are all plain text
    assert REFERENCE_TITLE in texts


def test_a_title_with_mathtext_that_does_not_parse_builds(payload_site):
    xy = (payload_site / "payload" / "xy.svg").read_text(encoding="utf-8")
    assert "$\\frac{a}{$" in xy
    assert "&lt;script&gt;window.__pwned='svg'&lt;/script&gt;" in xy


# --- in a real browser ---------------------------------------------------------------------

def title_of(target: Path) -> str:
    """The document title as written in the file (a payload would replace it with 'pwned')."""
    m = re.search(r"<title\b[^>]*>(.*?)</title>", target.read_text(encoding="utf-8"), re.DOTALL)
    return " ".join(html.unescape(m.group(1)).split()) if m else ""


@pytest.mark.browser
def test_no_payload_runs_in_headless_chromium(payload_site):
    from .test_browser import ARGS, CHROMIUM

    if not CHROMIUM:
        if os.environ.get("CI"):
            pytest.fail("CI must install chromium for the browser tests (.ci/run does)")
        pytest.skip("chromium is not installed (apt-get install chromium)")
    from playwright.sync_api import sync_playwright

    targets = sorted(payload_site.rglob("*.html")) + sorted(payload_site.glob("*/*.svg"))
    with sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        try:
            ctx = browser.new_context()
            page = ctx.new_page()
            dialogs: list[str] = []
            page.on("dialog", lambda d: (dialogs.append(d.message), d.dismiss()))
            seen = []
            for target in targets:
                page.goto(target.as_uri())
                page.wait_for_load_state("load")
                # fire the events an inline handler could wait for, on every element
                page.evaluate("""() => document.querySelectorAll('*').forEach(el => ['mouseover', 'mouseenter',
                    'focus', 'toggle', 'load', 'error', 'begin'].forEach(t => el.dispatchEvent(new Event(t))))""")
                page.wait_for_timeout(50)  # let any queued handler or timer run
                state = page.evaluate("() => [typeof window.__pwned, document.title]")
                seen.append((target.relative_to(payload_site).as_posix(), state[0], state[1] != title_of(target)))
            ctx.close()
        finally:
            browser.close()
    assert [s for s in seen if s[1:] != ("undefined", False)] == []
    assert dialogs == []
    assert len(seen) == len(targets) >= 8


# --- property: whatever the notes say, the sanitised HTML has no active part --------------

from hypothesis import example, given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

from generator.render.pages import render_markdown  # noqa: E402

PIECES = st.sampled_from([
    "<script>", "</script>", "<img src=x onerror=alert(1)>", "<a href=\"javascript:alert(1)\">", "</a>",
    "[l](javascript:alert(1))", "![i](data:image/png;base64,AAAA)", "[d](data:text/html,x)", "<svg onload=x>",
    "<iframe>", "<style>", "`", "```\n", "\n\n", "> ", "* ", "| a | b |\n|---|---|\n", "&#106;", "&lt;", "java",
    "script:", "<", ">", "\"", "'", "=", " ", "x", "<div onclick=\"", "<p style=\"x\">", "<!--", "-->",
    "<![CDATA[", "]]>", "\\", "[r]: javascript:x\n", "[r][r]", "<a href=\"https://example.invalid\">",
])


@settings(max_examples=300, deadline=None)
@given(st.lists(PIECES, max_size=14).map("".join))
def test_sanitised_notes_never_carry_script_handlers_or_unsafe_urls(text):
    out = render_markdown(text)
    for tag, attrs in tags_of(out):
        assert tag not in FORBIDDEN_TAGS | {"img", "div"}, (text, out)
        assert not [a for a in attrs if a.startswith("on") or a == "style"], (text, out)
        for a in ("href", "src"):
            v = (attrs.get(a) or "").strip().lower()
            if ":" in v.split("/")[0]:  # has a scheme: only these
                assert v.startswith(("https:", "http:", "mailto:")), (text, out)


# --- property: any text as a title is shown as that text in pages and diagrams ------------

TEXT = st.text(st.characters(min_codepoint=0x20, max_codepoint=0x7e) | st.sampled_from("éß漢字€\u05d0\u200f\u00a0"),
               min_size=1, max_size=30)


def yaml_quoted(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


@settings(max_examples=6, deadline=None)
@given(TEXT)
@example("$x^2$ and </text>")
@example("_hidden & 字")
def test_any_title_is_escaped_in_pages_and_drawn_literally_in_svg(title):
    import tempfile

    from generator.build import evaluate, results_of
    from generator.render.site import render_site

    with tempfile.TemporaryDirectory() as d:
        specs = Path(d)
        (specs / "base.yaml").write_text("spec: 1\nid: fuzz-base\ntitle: " + yaml_quoted(title) + "\n"
                                         "primaries:\n  red: {x: 0.64, y: 0.33}\n  green: {x: 0.30, y: 0.60}\n"
                                         "  blue: {x: 0.15, y: 0.06}\n", encoding="utf-8")
        (specs / "other.yaml").write_text("spec: 1\nid: fuzz-other\nextends: fuzz-base\ntitle: other\n"
                                          "gamut:\n  - {reference: fuzz-base, metric: coverage, min: 1}\n",
                                          encoding="utf-8")
        evaluated, _ = evaluate(specs)
    site, _, _ = render_site(evaluated, results_of(evaluated))
    page = site.files["fuzz-base/index.html"].decode()
    h1 = re.search(r"<h1>(.*?)</h1>", page, re.DOTALL).group(1)
    assert html.unescape(h1) == title
    assert not [t for t, _ in tags_of(h1)]
    drawn = []
    for rel, data in site.files.items():
        if rel.endswith(".svg"):
            drawn += [el.text for el in ET.fromstring(data).iter() if el.text]
    assert any(t.removeprefix("\u200b") == title for t in drawn), (title, drawn[-12:])
