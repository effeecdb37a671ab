"""From validated values to a typed Spec: written forms to xy, names to references,
and the physical checks (inside the spectral locus, primaries that span an area,
white inside the gamut)."""
from __future__ import annotations

import numpy as np

from ..colour.cct import xy_from_cct_duv
from ..colour.convert import XYZ_to_xy, uv_prime_to_xy
from ..colour.gamut import convex_hull, polygon_area
from ..colour.region import in_polygon
from ..colour.wavelength import outside_locus_distance
from ..data import ILLUMINANTS, REFERENCE_SPACES
from ..model import GamutRequirement, Measurement, Primary, ReferenceGamut, Spec, Tolerance, Unit, White
from .problems import Problems, did_you_mean
from .measured import measured_table, uncertainty_of, uniformity_of
from .schema import RESERVED_PRIMARY_NAMES, UNIT_KEYS
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
    )


class _Resolver:
    def __init__(self, file: str, node: Map, problems: Problems):
        self.file, self.node, self.problems = file, node, problems
        self.ok = True

    def error(self, path, message, hint="", key=False):
        self.problems.error(mark_at(self.node, path, key), _dotted(path), message, hint)
        self.ok = False

    def warn(self, path, message, hint=""):
        self.problems.warn(mark_at(self.node, path), _dotted(path), message, hint)

    def xy_of(self, v: dict, path: list) -> tuple[float, float] | None:
        form = v["form"]
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
            xy = tuple(float(c) for c in xy_from_cct_duv(v["cct"], v.get("duv", 0.0)))
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
        return f"x {v['x']:g}, y {v['y']:g}"
    if f == "uv":
        return f"u' {v['u_prime']:g}, v' {v['v_prime']:g}"
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


def resolve_spec(file: str, node: Map, v: dict, by_id: dict, problems: Problems, files=None) -> Spec | None:
    r = _Resolver(file, node, problems)
    observer = v.get("observer", "cie1931-2")

    white = None
    if "white" in v:
        w = v["white"]
        xy = r.xy_of(w["target"], ["white", "target"])
        if xy is not None and r.physical(xy, ["white", "target"], observer) is not None:
            white = White(xy, _written(w["target"]), _tolerance(w.get("tolerance")), w.get("luminance", {}))

    primaries: list[Primary] = []
    pv = v.get("primaries", {})
    default_tol = pv.get("tolerance")
    for name, p in pv.items():
        if name in RESERVED_PRIMARY_NAMES:
            continue
        xy = r.xy_of(p, ["primaries", name])
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
        gamut.append(GamutRequirement(i, ref, g["metric"], g["diagram"], g.get("min"), g.get("max"),
                                      g.get("note", "")))

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
        white_m = _measure(r, u.get("white"), ["units", i, "white"], observer) if "white" in u else None
        prim_m = {}
        for key, m in u.items():
            if key in UNIT_KEYS:
                continue
            if key not in names:
                r.error(["units", i, key], f"expected a unit key or a primary of this spec, found unknown key '{key}'",
                        did_you_mean(key, names + list(UNIT_KEYS))
                        or f"primaries: {', '.join(names)}; unit keys: {', '.join(UNIT_KEYS)}", key=True)
                continue
            mm = _measure(r, m, ["units", i, key], observer)
            if mm is not None:
                prim_m[key] = mm
        units.append(Unit(serial, u.get("lot", ""), u.get("supplier", ""), white_m, prim_m, u.get("notes", "")))
        unit_lines.append(mark_at(node, ["units", i]).line)

    uniformity = uniformity_of(v)
    if files is None:
        from ..measure.files import NoFiles

        files = NoFiles()
    table, shown_files, digests = measured_table(r, v, node, files, units, unit_lines, names, observer,
                                  uniformity.centre if uniformity else "C",
                                  (LOCUS_TOLERANCE, MEASURED_LOCUS_LIMIT))

    if not r.ok:
        return None
    warnings = [p for p in problems.warnings if p.file == file or p.file in shown_files]
    return Spec(
        id=v["id"], file=file, title=v.get("title", v["id"]), product=v.get("product", ""),
        family=v.get("family", ""), category=v.get("category", "display"),
        revision=v.get("revision", ""), status=v.get("status", "draft"), observer=observer,
        extends=v.get("extends", ""), owner=v.get("owner", ""), notes=v.get("notes", ""),
        white=white, primaries=primaries, gamut=gamut, units=units, references=references,
        inherited=dict(node.inherited), warnings=warnings, table=table,
        decision_rule=v.get("decision_rule", "simple"), uncertainty=uncertainty_of(v), uniformity=uniformity,
        measurements=shown_files, measurement_digests=digests)


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


def _measure(r: _Resolver, m: dict | None, path, observer) -> Measurement | None:
    if m is None:
        return None
    xy = r.xy_of(m, path)
    if xy is None:
        return None
    d = r.physical(xy, path, observer, measured=True)
    if d is None:
        return None
    Y = m.get("Y")
    return Measurement(xy, Y, d)
