"""What each template is given: every value already formatted as text (templates compute
nothing). ``base.html`` uses ``root``, ``canonical`` and ``reload`` of either context."""
from __future__ import annotations

from typing import TypedDict


class Base(TypedDict):
    root: str           # relative path from the page to the site root ('' or '../')
    canonical: str      # absolute URL of the page when the build has a site_url, else ''
    reload: bool        # add the live-reload script (colourspec serve only)


class FigureView(TypedDict):
    key: str            # 'xy', 'uv', 'spectra', 'volume' or 'white'
    file: str           # the SVG, beside the page
    csv: str            # the plotted numbers as CSV, beside the page
    json: str           # the plotted numbers and tolerance outlines as JSON
    title: str
    alt: str            # text alternative (also the SVG's <desc>)
    width: int          # shown size in CSS pixels (keeps the layout stable while loading)
    height: int
    axes: list[str]     # the two column names, e.g. ["u'", "v'"]; spectra: peak λ and FWHM;
                        # volume: the spec's and the reference's slice areas
    rows: list[dict]    # kind, name, a, b (formatted numbers), verdict and symbol ('' for targets)
    tolerances: list[str]
    units_listed: int   # unit points in rows (at most diagrams.TABLE_UNIT_POINTS)
    units_drawn: int    # unit points drawn (every one is in the CSV and JSON)


class SpecContext(Base):
    """templates/spec.html"""
    spec: dict          # id, title, product, revision, status, file, observer, extends, family, owner,
                        # inherited: sorted (dotted key path, ancestor id) pairs
    verdict: str        # pass | fail | indeterminate
    verdict_symbol: str
    counts: dict        # rows, fail, indeterminate, units, units_fail
    failing: list[dict]  # the first failing rows (pages.row_view) with 'what' (subject: label) and shortfall
    failing_more: int
    figures: list[FigureView]
    design_rows: list[dict]
    units: list[dict]   # the units listed (the least passing first when there are many): serial, lot,
                        # supplier, verdict, symbol, failing (text), rows, source
    n_units: int        # every measured unit, inline and from measurement files
    unit_rows: list[dict]  # up to MAX_UNIT_ROWS unit requirement rows, not passing first (pages.row_view)
    n_unit_rows: int
    lots: list[dict]    # lot, n, n_fail, n_indeterminate, n_pass, suppliers, verdict, symbol, page (lots/PAGE.html)
    suppliers: list[dict]  # supplier, n, n_fail, n_indeterminate, lots, verdict, symbol, page
    measurements: list[str]  # measurement files read, as shown
    decision: str       # the decision rule in words (pages.decision_text)
    white: dict | None  # written, x, y, u, v, cct, duv, swatch (#rrggbb preview)
    primaries: list[dict]
    colours: list[dict]  # name, written, note, x, y, Y, L, a, b, dominant, complementary, purity, swatch,
                         # white (reference white as written), limits (kinds, and whether the section default)
    spectra: list[dict]  # label, sample, source, sampling, interpolation, x, y, luminance, peak, centroid,
                         # fwhm, cct, duv
    gamut: dict | None  # area_xy, area_uv, vs (key, title, cov_xy, cov_uv, ratio_xy, ratio_uv),
                        # volume (CIELAB volume, or None), volume_vs (key, title, volume, ratio, coverage),
                        # volume_figure (the page has the CIELAB slices figure)
    npm: list[list[str]] | None
    npm_inverse: list[list[str]] | None
    notes_html: str     # rendered and sanitised Markdown
    methods: list[tuple[str, str]]
    caution: str        # the safety caution for signal/safety/lighting specs, else ''
    warnings: list[str]
    history: list[dict] | None  # commit, date, revision, change, subject (history.py), newest first;
                                # None: no history section (build without history)
    sections: list[tuple[str, str]]  # (anchor, heading) for the page's table of contents


class IndexContext(Base):
    """templates/index.html"""
    items: list[dict]   # one per spec: id, title, product, revision, status, family, verdict, symbol,
                        # key_figures, cct, duv, n_units, n_fail, search (lower-case text the filter matches)
    groups: list[dict]  # family, anchor, specs: the same items grouped by product family
    counts: dict        # pass, fail, indeterminate
    statuses: list[str]
    verdicts: list[str]
