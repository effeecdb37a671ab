"""JUnit XML for CI: one test suite per spec file, one test case per requirement row."""
from __future__ import annotations

from xml.etree import ElementTree as ET


def junit_xml(results: dict) -> str:
    root = ET.Element("testsuites", name="colourspec")
    total = failures = 0
    for s in results["specs"]:
        rows = s["requirements"]
        n_fail = sum(r["verdict"] != "pass" for r in rows)
        suite = ET.SubElement(root, "testsuite", name=s["file"], tests=str(len(rows)),
                              failures=str(n_fail), errors="0", skipped="0")
        for r in rows:
            name = r["id"] + (f" [{r['sample']}]" if r["sample"] else "")
            case = ET.SubElement(suite, "testcase", classname=s["id"], name=name)
            if r["verdict"] != "pass":
                f = ET.SubElement(case, "failure", type=r["verdict"],
                                  message=f"{r['id']}: value {r['value']} against {r['limit']} ({r['verdict']})")
                f.text = f"{s['file']}: {name} is {r['verdict']}"
        total += len(rows)
        failures += n_fail
    root.set("tests", str(total))
    root.set("failures", str(failures))
    return ET.tostring(root, encoding="unicode", xml_declaration=True) + "\n"
