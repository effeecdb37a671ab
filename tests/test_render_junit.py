"""JUnit XML read back by an XML parser: structure, counts, and escaping of awkward text."""
from __future__ import annotations

from xml.etree import ElementTree as ET

from generator.render.junit import junit_xml


def _row(rid, verdict, sample=None):
    return {"id": rid, "subject": "white", "sample": sample, "quantity": "cct", "value": 6100.0,
            "unit": "K", "limit": {"min": 6300, "max": 6800}, "verdict": verdict}


def _doc():
    return {"specs": [
        {"id": "a-panel", "file": "specs/a & <b>.yaml",
         "requirements": [_row("white.cct", "pass"), _row("white.cct", "fail", 'S-1 "x"&y')]},
        {"id": "b-panel", "file": "specs/b.yaml", "requirements": [_row("white.duv", "indeterminate")]},
        {"id": "c-panel", "file": "specs/c.yaml", "requirements": []},
    ]}


def test_parses_with_one_suite_per_file_and_one_case_per_row():
    root = ET.fromstring(junit_xml(_doc()).encode("utf-8"))
    assert root.tag == "testsuites"
    assert [s.get("name") for s in root.findall("testsuite")] == ["specs/a & <b>.yaml", "specs/b.yaml",
                                                                  "specs/c.yaml"]
    assert [int(s.get("tests")) for s in root.findall("testsuite")] == [2, 1, 0]
    assert [int(s.get("failures")) for s in root.findall("testsuite")] == [1, 1, 0]
    assert (root.get("tests"), root.get("failures")) == ("3", "2")


def test_cases_name_row_and_sample_and_failures_say_why():
    root = ET.fromstring(junit_xml(_doc()).encode("utf-8"))
    cases = root.findall("testsuite/testcase")
    assert [(c.get("classname"), c.get("name")) for c in cases] == [
        ("a-panel", "white.cct"), ("a-panel", 'white.cct [S-1 "x"&y]'), ("b-panel", "white.duv")]
    assert cases[0].find("failure") is None
    f = cases[1].find("failure")
    assert f.get("type") == "fail"
    assert f.get("message") == "white.cct: value 6100.0 against {'min': 6300, 'max': 6800} (fail)"
    assert cases[2].find("failure").get("type") == "indeterminate"


def test_every_element_and_attribute_is_of_the_common_junit_shape():
    root = ET.fromstring(junit_xml(_doc()).encode("utf-8"))
    allowed = {"testsuites": {"name", "tests", "failures"},
               "testsuite": {"name", "tests", "failures", "errors", "skipped"},
               "testcase": {"name", "classname"}, "failure": {"message", "type"}}
    for el in root.iter():
        assert el.tag in allowed
        assert set(el.attrib) <= allowed[el.tag], el.tag
    for s in root.findall("testsuite"):
        assert int(s.get("tests")) == len(s.findall("testcase"))
        assert int(s.get("failures")) == len(s.findall("testcase/failure"))
