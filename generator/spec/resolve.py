"""From validated values to a typed Spec: written forms to xy, names to references,
and the physical checks (inside the spectral locus, primaries that span an area,
white inside the gamut)."""
from __future__ import annotations

import hashlib
from pathlib import Path

import numpy as np

from ..colour.cct import xy_from_cct_duv
from ..colour.convert import XYZ_to_xy, uv_prime_to_xy, xy_to_XYZ
from ..colour.difference import Lab_to_XYZ
from ..colour.gamut import convex_hull, polygon_area
from ..colour.lamp_tolerance import quadrangle_corners_xy, quadrangle_outline_xy
from ..colour.region import in_polygon
from ..colour.spectrum import Resampled, resample_to_1nm, spectrum_XYZ
from ..colour.spectrum import luminance as spectrum_luminance
from ..colour.wavelength import outside_locus_distance
from ..data import ILLUMINANTS, REFERENCE_SPACES
from ..data.lamp_standards import ELLIPSE_STANDARDS, QUADRANGLE_STANDARDS
from ..measure.spectra_csv import SpectraFileError, parse_spectra_csv
from ..model import (
    Colour,
    FixedEllipse,
    FixedQuadrangle,
    GamutRequirement,
    Measurement,
    Primary,
    ReferenceGamut,
    Spec,
    SpectrumData,
    Tolerance,
    Unit,
    White,
)
from .problems import Problems, did_you_mean
from .measured import measured_table, uncertainty_of, uniformity_of
from .schema import RESERVED_COLOUR_NAMES, RESERVED_PRIMARY_NAMES, UNIT_KEYS
from .yamlnodes import Map, Mark, Node, Seq

# Published primaries on the locus (BT.2020, DCI-P3 red) fall up to ~3e-4 outside the
# 1 nm locus once rounded; targets within this xy distance count as on the locus.
LOCUS_TOLERANCE = 1e-3
# Measured values further outside than this are refused as impossible, not noise.
MEASURED_LOCUS_LIMIT = 0.02
_MIN_GAMUT_AREA = 1e-6


def mark_at(node: Node, path: list, key: bool = False) -> Mark:
    """The position of the value at ``path`` (keys and list indices), or the nearest parent;
    with ``key``, the position of the last key itself."""
    cur = node
    for i, p in enumerate(path):
        if isinstance(cur, Map) and p in cur.items:
            if key and i == len(path) - 1:
                return cur.key_marks[p]
            cur = cur.items[p]
        elif isinstance(cur, Seq) and isinstance(p, int) and p < len(cur.items):
            cur = cur.items[p]
        else:
            break
    return cur.mark


def _dotted(path: list) -> str:
    out = ""
    for p in path:
        out += f"[{p}]" if isinstance(p, int) else (f".{p}" if out else str(p))
    return out


def _tolerance(v: dict | None) -> Tolerance:
    v = v or {}
    return Tolerance(
        delta_uv=v.get("delta_uv"),
        box=(v["box"]["dx"], v["box"]["dy"]) if "box" in v else None,
        ellipse=(v["ellipse"]["a"], v["ellipse"]["b"], v["ellipse"]["angle"]) if "ellipse" in v else None,
        region=tuple(v["region"]) if "region" in v else None,
        cct=v.get("cct"),
        duv=v.get("duv"),
        delta_e2000=((v["delta_e2000"]["max"], v["delta_e2000"].get("kL", 1.0), v["delta_e2000"].get("kC", 1.0),
                      v["delta_e2000"].get("kH", 1.0)) if "delta_e2000" in v else None),
        delta_e76=v.get("delta_e76"),
        macadam_steps=v.get("macadam_steps"),
        dominant_wavelength=v.get("dominant_wavelength"),
        excitation_purity=v.get("excitation_purity"),
        ellipse_of=_ellipse_of(v["ellipse_of"]) if "ellipse_of" in v else None,
        quadrangle_of=_quadrangle_of(v["quadrangle_of"]) if "quadrangle_of" in v else None,
    )


def _ellipse_of(v: dict) -> FixedEllipse:
    std = ELLIPSE_STANDARDS[v["standard"]]
    e = std.figures[v["colour"]]
    return FixedEllipse(std.key, e.colour, v["steps"], e.centre, e.a, e.b, e.angle, std.citation, std.confidence)


def _quadrangle_of(v: dict) -> FixedQuadrangle:
    std = QUADRANGLE_STANDARDS[v["standard"]]
    q = std.figures[v["nominal_cct"]]
    cct = (q.cct - q.cct_tolerance, q.cct + q.cct_tolerance)
    duv = (q.duv - q.duv_tolerance, q.duv + q.duv_tolerance)

    def pts(a):
        return tuple((float(x), float(y)) for x, y in a)
    centre = tuple(float(c) for c in xy_from_cct_duv(q.cct, q.duv))
    return FixedQuadrangle(std.key, q.nominal_cct, cct, duv, centre, pts(quadrangle_corners_xy(cct, duv)),
                           pts(quadrangle_outline_xy(cct, duv)), std.citation, std.confidence)


def _refuse_lamp_figures(r, v: dict, observer: str) -> None:
    """The lighting standards tabulate their figures in CIE 1931 xy (2° observer): they do not
    apply to chromaticities of another observer."""
    places = [["white", "tolerance"]] if "white" in v else []
    if "colours" in v:
        places.append(["colours", "tolerance"])
        places += [["colours", k, "tolerance"] for k in v["colours"] if k not in RESERVED_COLOUR_NAMES]
    for path in places:
        tol = v
        for p in path:
            tol = tol.get(p) if isinstance(tol, dict) else None
        for key in ("ellipse_of", "quadrangle_of"):
            if isinstance(tol, dict) and key in tol:
                r.error(path + [key], f"expected observer cie1931-2 for a lighting standard's {key}, found "
                        f"observer {observer}", "the standards give these figures in CIE 1931 xy (2° observer); "
                        "use an ellipse or region in the spec's own observer instead", key=True)


def uses_lamp_standards(tols) -> bool:
    """True if any of the tolerances names a lighting standard's fixed figure."""
    return any(t.ellipse_of is not None or t.quadrangle_of is not None for t in tols)


class _Resolver:
    def __init__(self, file: str, node: Map, problems: Problems, observer: str = "cie1931-2",
                 folder: Path | None = None):
        self.file, self.node, self.problems = file, node, problems
        # the folder the spec file is in on disk (its shown name need not lead there)
        self.folder = folder if folder is not None else Path(file).parent
        self.observer = observer
        self.ok = True
        self.spectra: dict[str, SpectrumData] = {}    # dotted path -> spectrum
        self.luminance: dict[str, float] = {}         # dotted path -> cd/m² of a radiance spectrum
        self._tables: dict[str, object] = {}
        self.files: dict[str, str] = {}               # spectra file as written -> sha256 of its bytes
        self._warned: set[str] = set()

    def spectrum_xy(self, v: dict, path: list, label: str, is_white=False, sample=None):
        """xy of a spectrum given where a chromaticity is accepted (inline or from a CSV file)."""
        sp = v["spectrum"]
        spath = path + ["spectrum"]
        if "file" in sp:
            table = self.spectra_table(sp["file"], spath + ["file"])
            if table is None:
                return None
            if sp["channel"] not in table.channels:
                self.error(spath + ["channel"], f"expected a column of {sp['file']}, found '{sp['channel']}'",
                           did_you_mean(sp["channel"], table.channels) or "columns: " + ", ".join(table.channels))
                return None
            wl = np.array(table.wavelengths)
            values = np.array(table.channels[sp["channel"]])
            source = f"{sp['file']}, column {sp['channel']}"
        else:
            values = np.array(sp["values"], dtype=float)
            wl = sp["start"] + sp["step"] * np.arange(len(values))
            source = "inline"
        rs = resample_to_1nm(wl, values)
        # negative spectral power is not physical: measurement noise and interpolation ringing
        # beside narrow peaks are set to 0 before integrating
        rs = Resampled(rs.wavelengths, np.clip(rs.values, 0.0, None), rs.method)
        steps = np.diff(wl)
        sampling = (f"{wl[0]:g}-{wl[-1]:g} nm at {steps[0]:g} nm" if np.allclose(steps, steps[0], rtol=1e-6)
                    else f"{wl[0]:g}-{wl[-1]:g} nm, irregular, {len(wl)} points")
        # warn once per file (every column shares its wavelengths), once per inline spectrum
        warned = sp.get("file", _dotted(spath))
        if warned not in self._warned:
            self._warned.add(warned)
            what = f"spectra of {sp['file']}" if "file" in sp else "spectrum"
            if rs.method != "none":
                how = "Sprague interpolation" if rs.method == "sprague" else "a natural cubic spline"
                self.warn(spath, f"{what} sampled {sampling} resampled to 1 nm by {how} (CIE 167:2005)",
                          "give spectra at 1 nm to integrate them without interpolation")
            if wl[0] > 380 or wl[-1] < 780:
                self.warn(spath, f"{what} cover {wl[0]:g}-{wl[-1]:g} nm only and count as zero outside",
                          "CIE 15 integrates over 360-830 nm (380-780 nm at least)")
        XYZ = spectrum_XYZ(rs.wavelengths, rs.values, self.observer)
        xy = tuple(float(c) for c in XYZ_to_xy(XYZ))
        if not (np.all(np.isfinite(xy)) and XYZ[1] > 0):
            self.error(spath, "expected a spectrum with visible power, found one whose tristimulus values "
                       "define no chromaticity", "check the values and the wavelength range")
            return None
        key = _dotted(path)
        self.spectra[key] = SpectrumData(key, label, rs.wavelengths, rs.values, rs.method, sampling, source,
                                         sp["scale"], is_white, sample)
        if sp["scale"] == "radiance":
            self.luminance[key] = float(spectrum_luminance(XYZ))
        return xy

    def spectra_table(self, name: str, path: list):
        """A spectra CSV file relative to the spec, refused outside the spec's folder."""
        if name in self._tables:
            return self._tables[name]
        base = self.folder.resolve()
        target = (base / name).resolve()
        if Path(name).is_absolute() or not target.is_relative_to(base):
            self.error(path, f"expected a file inside the spec's folder, found '{name}'",
                       "spectra files live beside the spec or in a folder below it")
            self._tables[name] = None
            return None
        try:
            data = target.read_bytes()
            self.files[name] = hashlib.sha256(data).hexdigest()
            text = data.decode("utf-8-sig")
        except (OSError, UnicodeDecodeError) as e:
            self.error(path, f"expected a readable spectra CSV file, found '{name}' "
                       f"({getattr(e, 'strerror', None) or 'not UTF-8 text'})",
                       "give the path relative to the spec file")
            self._tables[name] = None
            return None
        try:
            table = parse_spectra_csv(text)
        except SpectraFileError as e:
            shown = (Path(self.file).parent / name).as_posix()
            self.problems.error(Mark(shown, e.line, e.col), "", e.message,
                                f"spectra files: a 'wavelength' column in nm, then one column per channel "
                                f"(read for {_dotted(path)})")
            self.ok = False
            table = None
        self._tables[name] = table
        return table

    def error(self, path, message, hint="", key=False):
        self.problems.error(mark_at(self.node, path, key), _dotted(path), message, hint)
        self.ok = False

    def warn(self, path, message, hint=""):
        self.problems.warn(mark_at(self.node, path), _dotted(path), message, hint)

    def xy_of(self, v: dict, path: list, label: str = "", is_white=False, sample=None
              ) -> tuple[float, float] | None:
        form = v["form"]
        if form == "spectrum":
            return self.spectrum_xy(v, path, label or _dotted(path), is_white, sample)
        if form == "name":
            ill = ILLUMINANTS.get(v["name"])
            if ill is None:
                self.error(path, f"expected a named illuminant, found '{v['name']}'",
                           did_you_mean(v["name"], ILLUMINANTS) or "known: " + ", ".join(ILLUMINANTS))
                return None
            return (ill.x, ill.y)
        if form == "xy":
            xy = (v["x"], v["y"])
        elif form == "uv":
            xy = tuple(float(c) for c in uv_prime_to_xy([v["u_prime"], v["v_prime"]]))
        elif form == "cct":
            xy = tuple(float(c) for c in xy_from_cct_duv(v["cct"], v.get("duv", 0.0), self.observer))
        else:  # XYZ
            xy = tuple(float(c) for c in XYZ_to_xy([v["X"], v["Y"], v["Z"]]))
        if not np.all(np.isfinite(xy)):
            self.error(path, "expected a chromaticity, found coordinates that define none")
            return None
        return xy

    def physical(self, xy, path, observer, measured=False) -> float | None:
        """Check a chromaticity is real; returns its distance outside the locus."""
        x, y = xy
        if x + y > 1 + 1e-12:
            self.error(path, f"expected x + y <= 1, found x + y = {x + y:.4f}",
                       "no real colour has x + y > 1; check for swapped or mistyped coordinates")
            return None
        d = float(outside_locus_distance(np.array(xy), observer))
        limit = MEASURED_LOCUS_LIMIT if measured else LOCUS_TOLERANCE
        if d > limit:
            what = "a measured chromaticity within" if measured else "a chromaticity inside"
            self.error(path, f"expected {what} the spectral locus, found ({x:.4f}, {y:.4f}), "
                       f"{d:.4f} outside it", "no real light has this chromaticity; check the coordinates"
                       + (f" (measurements up to {MEASURED_LOCUS_LIMIT} outside pass as noise)" if measured
                          else f" (targets up to {LOCUS_TOLERANCE} outside count as on the locus)"))
            return None
        if d > LOCUS_TOLERANCE:
            self.warn(path, f"measured chromaticity ({x:.4f}, {y:.4f}) lies {d:.4f} outside the spectral "
                      "locus; it is still assessed", "taken as instrument noise or a calibration error")
        return d


def _written(v: dict) -> str:
    f = v["form"]
    if f == "name":
        return v["name"]
    if f == "xy":
        return f"x {v['x']:g}, y {v['y']:g}" + (f", Y {v['Y']:g}" if "Y" in v else "")
    if f == "uv":
        return f"u' {v['u_prime']:g}, v' {v['v_prime']:g}"
    if f == "Lab":
        return f"L* {v['L']:g}, a* {v['a']:g}, b* {v['b']:g}"
    if f == "spectrum":
        sp = v["spectrum"]
        return f"spectrum ({sp['file']}, {sp['channel']})" if "file" in sp else "spectrum (inline)"
    if f == "cct":
        return f"CCT {v['cct']:g} K, Duv {v.get('duv', 0.0):+g}"
    return "XYZ"


def _reference_from_spec(other: dict) -> ReferenceGamut | None:
    prim = {k: p for k, p in (other.get("primaries") or {}).items() if k != "tolerance"}
    if len(prim) < 3 or any(p["form"] not in ("xy", "uv") for p in prim.values()):
        return None
    pts = []
    for p in prim.values():
        pts.append((p["x"], p["y"]) if p["form"] == "xy" else
                   tuple(float(c) for c in uv_prime_to_xy([p["u_prime"], p["v_prime"]])))
    return ReferenceGamut(other["id"], other.get("title", other["id"]), tuple(pts), (np.nan, np.nan),
                          f"spec {other['id']}")


def resolve_spec(file: str, node: Map, v: dict, by_id: dict, problems: Problems,
                 folder: Path | None = None, files=None) -> Spec | None:
    observer = v.get("observer", "cie1931-2")
    r = _Resolver(file, node, problems, observer, folder)
    if observer != "cie1931-2":
        _refuse_lamp_figures(r, v, observer)

    white = None
    if "white" in v:
        w = v["white"]
        xy = r.xy_of(w["target"], ["white", "target"], "white", is_white=True)
        if xy is not None and r.physical(xy, ["white", "target"], observer) is not None:
            white = White(xy, _written(w["target"]), _tolerance(w.get("tolerance")), w.get("luminance", {}),
                          r.luminance.get("white.target"))

    primaries: list[Primary] = []
    pv = v.get("primaries", {})
    default_tol = pv.get("tolerance")
    for name, p in pv.items():
        if name in RESERVED_PRIMARY_NAMES:
            continue
        xy = r.xy_of(p, ["primaries", name], name)
        if xy is None or r.physical(xy, ["primaries", name], observer) is None:
            continue
        own = p.get("tolerance")
        primaries.append(Primary(name, xy, _tolerance(own if own is not None else default_tol),
                                 "own" if own is not None else "default"))
    if "primaries" in v and r.ok:
        _check_gamut_shape(r, [n for n in pv if n not in RESERVED_PRIMARY_NAMES], primaries, white)

    references = {k: ReferenceGamut(k, s.title, s.primaries, s.white, s.source)
                  for k, s in REFERENCE_SPACES.items()}
    gamut = []
    for i, g in enumerate(v.get("gamut", [])):
        ref = g["reference"]
        if ref not in references:
            other = by_id.get(ref)
            rg = _reference_from_spec(other) if other is not None else None
            if other is not None and rg is None:
                r.error(["gamut", i, "reference"], f"expected a reference space or a spec with three or more "
                        f"primaries, found spec '{ref}', which has fewer")
                continue
            if rg is None:
                choices = list(REFERENCE_SPACES) + list(by_id)
                r.error(["gamut", i, "reference"], f"expected a reference space or spec id, found '{ref}'",
                        did_you_mean(ref, choices) or "known: " + ", ".join(REFERENCE_SPACES))
                continue
            references[ref] = rg
        if not primaries:
            r.error(["gamut", i], "expected primaries to assess this gamut requirement on, found none",
                    "add a primaries: section, or remove the requirement")
            continue
        if g["metric"].startswith("volume"):
            if len(primaries) != 3 or white is None:
                r.error(["gamut", i, "metric"], f"expected three primaries and a white for a CIELAB {g['metric']} "
                        f"requirement, found {len(primaries)} primaries{'' if white else ' and no white'}",
                        "the CIELAB volume is that of an additive RGB display with its white")
                continue
            if not np.all(np.isfinite(references[ref].white)):
                r.error(["gamut", i, "reference"], f"expected a named reference space for a CIELAB volume, "
                        f"found spec '{ref}'", "volumes compare with reference spaces that state a white")
                continue
        gamut.append(GamutRequirement(i, ref, g["metric"], g["diagram"], g.get("min"), g.get("max"),
                                      g.get("note", "")))

    colours = _colours(r, v.get("colours"), observer) if "colours" in v else []
    colour_by_name = {c.name: c for c in colours}
    declared_colours = [k for k in v.get("colours", {}) if k not in RESERVED_COLOUR_NAMES]

    units = []
    unit_lines = []
    names = [n for n in pv if n not in RESERVED_PRIMARY_NAMES]  # declared, even if one failed a check
    seen_serials: dict[str, int] = {}
    for i, u in enumerate(v.get("units", [])):
        serial = u["serial"]
        if serial in seen_serials:
            r.error(["units", i, "serial"], f"expected a serial of its own, found '{serial}' again "
                    f"(also units[{seen_serials[serial]}])", "every measured unit needs a unique serial")
            continue
        seen_serials[serial] = i
        white_m = (_measure(r, u.get("white"), ["units", i, "white"], observer, f"{serial} white", True, serial)
                   if "white" in u else None)
        prim_m = {}
        for key, m in u.items():
            if key in UNIT_KEYS:
                continue
            if key not in names:
                r.error(["units", i, key], f"expected a unit key or a primary of this spec, found unknown key '{key}'",
                        did_you_mean(key, names + list(UNIT_KEYS))
                        or f"primaries: {', '.join(names)}; unit keys: {', '.join(UNIT_KEYS)}", key=True)
                continue
            mm = _measure(r, m, ["units", i, key], observer, f"{serial} {key}", False, serial)
            if mm is not None:
                prim_m[key] = mm
        col_m = {}
        for cname, m in (u.get("colours") or {}).items():
            cpath = ["units", i, "colours", cname]
            c = colour_by_name.get(cname)
            if c is None:
                if cname not in declared_colours:   # a declared colour that failed is reported already
                    r.error(cpath, f"expected the name of one of the spec's colours, found unknown colour "
                            f"'{cname}'", did_you_mean(cname, declared_colours)
                            or "colours: " + (", ".join(declared_colours) or "none"), key=True)
                continue
            mm = _measure_colour(r, c, m, cpath, observer, serial)
            if mm is not None:
                col_m[cname] = mm
        units.append(Unit(serial, u.get("lot", ""), u.get("supplier", ""), white_m, prim_m, u.get("notes", ""),
                          col_m))
        unit_lines.append(mark_at(node, ["units", i]).line)

    uniformity = uniformity_of(v)
    if files is None:
        from ..measure.files import NoFiles

        files = NoFiles()
    table, shown_files, digests, unit_colours = measured_table(
        r, v, node, files, units, unit_lines, names, observer, uniformity.centre if uniformity else "C",
        (LOCUS_TOLERANCE, MEASURED_LOCUS_LIMIT), colours)
    if table is not None:
        _add_colour_only_units(table, file, units, unit_lines)

    if not r.ok:
        return None
    warnings = [p for p in problems.warnings if p.file == file or p.file in shown_files]
    # a spec judged against a lighting standard's figures is a lighting spec unless it says otherwise,
    # so that its page carries the caution of lighting products
    lamp = uses_lamp_standards(([white.tolerance] if white else []) + [c.tolerance for c in colours])
    return Spec(
        id=v["id"], file=file, title=v.get("title", v["id"]), product=v.get("product", ""),
        family=v.get("family", ""), category=v.get("category", "lighting" if lamp else "display"),
        revision=v.get("revision", ""), status=v.get("status", "draft"), observer=observer,
        extends=v.get("extends", ""), owner=v.get("owner", ""), notes=v.get("notes", ""),
        white=white, primaries=primaries, gamut=gamut, units=units, references=references, colours=colours,
        spectra=[r.spectra[k] for k in sorted(r.spectra, key=_spectrum_order)],
        inherited=dict(node.inherited), warnings=warnings, input_files=dict(sorted(r.files.items())),
        table=table, decision_rule=v.get("decision_rule", "simple"), uncertainty=uncertainty_of(v),
        uniformity=uniformity, measurements=shown_files, measurement_digests=digests, unit_colours=unit_colours)


def _add_colour_only_units(table, file: str, units: list[Unit], lines: list[int]) -> None:
    """Inline units that measured only colours (``units[].colours``) have no white or primary
    records; they are units all the same, with no channel measured."""
    have = set(table.serial)
    extra = [(u, line) for u, line in zip(units, lines) if u.colours and u.serial not in have]
    if not extra:
        return
    for u, line in extra:
        have.add(u.serial)
        table.serial.append(u.serial)
        table.lot.append(u.lot)
        table.supplier.append(u.supplier)
        table.source.append(f"{file}:{line}")
    k = len(extra)
    for name, arr in list(table.channels.items()):
        table.channels[name] = np.concatenate([arr, np.full((k, 3), np.nan)])
    if table.points is not None:
        P = table.points
        table.points = np.concatenate([P, np.full((k,) + P.shape[1:], np.nan)])


def _check_gamut_shape(r: _Resolver, names: list[str], primaries: list[Primary], white: White | None) -> None:
    """Three or more distinct primaries spanning an area, with the white inside their gamut."""
    if len(names) < 3:
        r.error(["primaries"], f"expected three or more primaries, found {len(names)}",
                "a gamut needs at least red, green and blue")
        return
    if _report_repeats(r, primaries):
        return
    hull = convex_hull(np.array([p.xy for p in primaries]))
    if len(hull) < 3 or polygon_area(hull) < _MIN_GAMUT_AREA:
        r.error(["primaries"], "expected primaries that span an area, found them on one line",
                "a gamut needs primaries at the corners of a triangle; check for a mistyped primary")
        return
    inner = [p.name for p in primaries if not _on_hull(p.xy, hull)]
    if inner:
        r.warn(["primaries"], f"primary {', '.join(inner)} lies inside the gamut of the others",
               "it adds nothing to the gamut area")
    if white is not None and not bool(in_polygon(np.array(white.xy), hull)):
        r.error(["white", "target"], "expected a white inside the gamut of the primaries, found "
                f"({white.xy[0]:.4f}, {white.xy[1]:.4f}) outside it",
                "a display cannot make a white outside its own gamut; check the white and primaries")


def _report_repeats(r: _Resolver, primaries: list[Primary]) -> bool:
    """Report every primary at the same chromaticity as an earlier one; True if any."""
    first: dict[tuple, str] = {}
    found = False
    for p in primaries:
        key = (round(p.xy[0], 9), round(p.xy[1], 9))
        if key in first:
            r.error(["primaries", p.name], f"expected a chromaticity of its own, found the same as {first[key]}",
                    "check for a copied or mistyped primary")
            found = True
        else:
            first[key] = p.name
    return found


def _on_hull(xy, hull) -> bool:
    return bool(np.any(np.all(np.isclose(hull, xy, atol=1e-12), axis=1)))


def _measure(r: _Resolver, m: dict | None, path, observer, label="", is_white=False, sample=None
             ) -> Measurement | None:
    if m is None:
        return None
    xy = r.xy_of(m, path, label, is_white, sample)
    if xy is None:
        return None
    d = r.physical(xy, path, observer, measured=True)
    if d is None:
        return None
    Y = m.get("Y", r.luminance.get(_dotted(path)))   # a radiance spectrum gives the luminance
    return Measurement(xy, Y, d)


def _spectrum_order(key: str):
    return (key.startswith("units"), key)


def _needs_lab(tol: Tolerance) -> bool:
    return tol.delta_e2000 is not None or tol.delta_e76 is not None


def _colours(r: _Resolver, cv: dict, observer) -> list[Colour]:
    """The colours section: targets to xy (and luminance factor), reference whites, limits."""
    out = []
    section_white = None
    if "reference_white" in cv:
        section_white = r.xy_of(cv["reference_white"], ["colours", "reference_white"])
    default_tol = cv.get("tolerance")
    for name, c in cv.items():
        if name in RESERVED_COLOUR_NAMES:
            continue
        path = ["colours", name]
        own_white = "reference_white" in c
        white = r.xy_of(c["reference_white"], path + ["reference_white"]) if own_white else section_white
        white_written = _written(c["reference_white"] if own_white else cv["reference_white"]) \
            if (own_white or "reference_white" in cv) else ""
        own = c.get("tolerance")
        tol = _tolerance(own if own is not None else default_tol)
        t = c["target"]
        if t["form"] == "Lab":
            if white is None:
                r.error(path + ["target"], "expected a reference_white for a CIELAB target, found none",
                        "add reference_white: D65 (or the white the target was measured against) to the "
                        "colour or to the colours section")
                continue
            XYZ = Lab_to_XYZ([t["L"], t["a"], t["b"]], xy_to_XYZ(np.array(white), 100.0))
            xy = tuple(float(c_) for c_ in XYZ_to_xy(XYZ))
            Y = float(XYZ[1])
        else:
            xy = r.xy_of(t, path + ["target"], name)
            Y = t.get("Y")
        if xy is None or r.physical(xy, path + ["target"], observer) is None:
            continue
        if _needs_lab(tol):
            tpath = path + ["tolerance"] if own is not None else ["colours", "tolerance"]
            if white is None:
                r.error(tpath, "expected a reference_white for a ΔE limit, found none",
                        "CIELAB differences need the white the colours are seen against, e.g. "
                        "reference_white: D65")
                continue
            if Y is None:
                r.error(path + ["target"], "expected a luminance factor Y (or a CIELAB target) for a ΔE limit, "
                        "found only a chromaticity", "write the target as {x, y, Y} with the reference white "
                        "at Y = 100, or as {L, a, b}")
                continue
        out.append(Colour(name, xy, Y, _written(t), white, white_written, tol,
                          "own" if own is not None else "default", c.get("note", "")))
    return out


def _measure_colour(r: _Resolver, c: Colour, m: dict, path, observer, serial: str) -> Measurement | None:
    if m["form"] == "Lab":
        if c.reference_white is None:
            r.error(path, "expected a reference_white for a CIELAB measurement, found none",
                    "add reference_white to the colour or to the colours section")
            return None
        XYZ = Lab_to_XYZ([m["L"], m["a"], m["b"]], xy_to_XYZ(np.array(c.reference_white), 100.0))
        xy = tuple(float(v) for v in XYZ_to_xy(XYZ))
        Y = float(XYZ[1])
    else:
        xy = r.xy_of(m, path, f"{serial} {c.name}", sample=serial)
        if xy is None:
            return None
        Y = m.get("Y")
    d = r.physical(xy, path, observer, measured=True)
    if d is None:
        return None
    if _needs_lab(c.tolerance) and Y is None:
        r.error(path, "expected a luminance factor Y (or CIELAB {L, a, b}) for a colour with a ΔE limit, "
                "found only a chromaticity", "write the measurement as {x, y, Y} with the reference white at Y = 100")
        return None
    return Measurement(xy, Y, d)
