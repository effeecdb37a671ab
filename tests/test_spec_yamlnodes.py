"""YAML to positioned nodes: syntax errors with positions, no YAML 1.1 typing, and the
guards against duplicate keys, alias bombs and deep nesting."""
from __future__ import annotations

import pytest

from generator.spec.problems import Problems
from generator.spec.yamlnodes import MAX_DEPTH, MAX_NODES, Map, Mark, Scalar, Seq, parse_yaml


def parse(text: str | bytes):
    problems = Problems()
    data = text.encode("utf-8") if isinstance(text, str) else text
    node = parse_yaml(data, "s.yaml", problems)
    return node, [p.format() for p in problems.items]


def test_scalars_keep_their_source_text_and_position():
    node, errors = parse("spec: 1\nwhite:\n  tolerance: {delta_uv: 5e-3}\n")
    assert errors == []
    assert isinstance(node, Map)
    tol = node.items["white"].items["tolerance"]
    assert tol.items["delta_uv"].text == "5e-3"
    assert tol.items["delta_uv"].mark == Mark("s.yaml", 3, 25)
    assert tol.key_marks["delta_uv"] == Mark("s.yaml", 3, 15)


@pytest.mark.parametrize("written", ["no", "on", "NO", "010", "1:20", "5e-3", "1.0e3", "~"])
def test_yaml_1_1_words_and_numbers_stay_plain_text(written):
    node, errors = parse(f"value: {written}\n")
    assert errors == []
    scalar = node.items["value"]
    assert (scalar.text, scalar.plain) == (written, True)


def test_a_quoted_value_is_marked_as_not_plain():
    node, _ = parse("x: '0.31'\ny: 0.31\n")
    assert (node.items["x"].plain, node.items["y"].plain) == (False, True)


def test_byte_order_mark_is_accepted_and_positions_start_after_it():
    node, errors = parse(b"\xef\xbb\xbfspec: 1\nid: a\n")
    assert errors == []
    assert node.items["id"].mark == Mark("s.yaml", 2, 5)


def test_empty_file():
    node, errors = parse("")
    assert node is None
    assert errors == ["s.yaml:1:1: expected a spec mapping, found an empty file\n"
                      "    hint: run 'colourspec new' for a starter spec"]


def test_file_of_only_comments_counts_as_empty():
    _, errors = parse("# to be written\n\n")
    assert errors[0].startswith("s.yaml:1:1: expected a spec mapping, found an empty file")


def test_malformed_flow_list_names_where_the_list_starts():
    _, errors = parse("spec: 1\nid: [a\n")
    assert errors == ["s.yaml:3:1: YAML syntax error: did not find expected ',' or ']' "
                      "(parsing a flow sequence that starts at line 2, column 5)"]


def test_unclosed_quote_is_reported_where_the_quote_opens():
    _, errors = parse("spec: 1\nid: 'a\ntitle: b\n")
    assert errors == ["s.yaml:2:5: YAML syntax error: found the end of the file "
                      "(scanning a quoted text that starts here)"]


def test_bad_indentation_has_a_hint():
    _, errors = parse("white:\n  target: D65\n tolerance: 1\n")
    assert errors == ["s.yaml:3:2: YAML syntax error: did not find expected key "
                      "(parsing a block mapping that starts at line 1, column 1)\n"
                      "    hint: check this line's indentation against the lines above"]


def test_colon_inside_a_plain_value():
    _, errors = parse("title: Orbit: the panel\n")
    assert errors == ["s.yaml:1:13: YAML syntax error: mapping values are not allowed in this context\n"
                      "    hint: quote a value that contains ': '"]


def test_tab_indentation_points_at_the_tab():
    _, errors = parse("spec: 1\nwhite:\n\ttarget: D65\n")
    assert errors == ["s.yaml:3:1: expected spaces for indentation, found a tab\n"
                      "    hint: YAML indents with spaces only; replace the tabs with spaces"]


def test_tab_after_spaces_in_indentation():
    _, errors = parse("white:\n  target: D65\n  \ttolerance: 1\n")
    assert errors == ["s.yaml:3:3: expected spaces for indentation, found a tab\n"
                      "    hint: YAML indents with spaces only; replace the tabs with spaces"]


def test_tab_as_separator_after_a_colon_is_fine():
    node, errors = parse("title:\tOrbit\n")
    assert (errors, node.items["title"].text) == ([], "Orbit")


def test_non_utf8_byte_is_located():
    _, errors = parse(b"spec: 1\nid: a\ntitle: caf\xe9\n")
    assert errors == ["s.yaml:3:11: expected UTF-8 text, found the byte 0xe9\n    hint: save the file as UTF-8"]


def test_non_utf8_byte_after_a_byte_order_mark_is_located():
    _, errors = parse(b"\xef\xbb\xbfid: \xff\n")
    assert errors[0].startswith("s.yaml:1:5: expected UTF-8 text, found the byte 0xff")


def test_nul_character_is_refused():
    _, errors = parse(b"spec: 1\nid: a\x00\n")
    assert errors == ["s.yaml:2:6: expected text, found a NUL character (is this a binary file?)"]


def test_control_character_is_located():
    _, errors = parse("spec: 1\ntitle: a\x01b\n")
    assert errors == ["s.yaml:2:9: expected printable text, found the character U+0001\n"
                      "    hint: remove the control character"]


def test_duplicate_key_is_an_error_at_the_second_key():
    _, errors = parse("spec: 1\ntitle: a\nwhite:\n  target: D65\n  target: D50\ntitle: b\n")
    assert errors == [
        "s.yaml:5:3: white.target: expected each key once, found 'target' again (first at line 4, column 3)\n"
        "    hint: YAML would silently keep only the last value; remove one of them",
        "s.yaml:6:1: title: expected each key once, found 'title' again (first at line 2, column 1)\n"
        "    hint: YAML would silently keep only the last value; remove one of them",
    ]


def test_quoted_and_plain_spellings_of_one_key_are_duplicates():
    _, errors = parse("id: a\n'id': b\n")
    assert errors[0].startswith("s.yaml:2:1: id: expected each key once, found 'id' again")


def test_several_documents_in_one_file():
    _, errors = parse("spec: 1\n---\nspec: 1\n")
    assert errors == ["s.yaml:3:1: expected one YAML document, found several\n"
                      "    hint: put each spec in a file of its own"]


def test_merge_key_is_refused():
    _, errors = parse("base: &b {x: 1}\nred:\n  <<: *b\n")
    assert errors == ["s.yaml:3:3: red: expected a plain key, found a YAML merge key '<<'\n"
                      "    hint: use 'extends: <spec id>' to inherit from another spec"]


def test_custom_tag_is_refused():
    _, errors = parse("owner: !person Ada\n")
    assert errors == ["s.yaml:1:8: owner: expected a plain value, found the YAML tag '!person'\n"
                      "    hint: remove the tag"]


def test_list_as_key_is_refused():
    _, errors = parse("? [a, b]\n: 1\n")
    assert errors == ["s.yaml:1:3: expected a plain key, found a mapping or list as key"]


def test_undefined_alias():
    _, errors = parse("id: *spec\n")
    assert errors == ["s.yaml:1:5: YAML syntax error: found undefined alias\n"
                      "    hint: a '*name' needs an '&name' earlier in the file; quote text that starts with '*'"]


def test_small_aliases_expand_to_copies():
    node, errors = parse("a: &p {x: 0.3, y: 0.6}\nb: *p\n")
    assert errors == []
    assert node.items["b"].items["x"].text == "0.3"


def _alias_bomb(levels: int = 9, fan: int = 10) -> str:
    lines = ["l0: &l0 [" + ", ".join(["lol"] * fan) + "]"]
    for i in range(1, levels):
        lines.append(f"l{i}: &l{i} [" + ", ".join([f"*l{i - 1}"] * fan) + "]")
    return "\n".join(lines) + "\n"


def test_alias_bomb_is_refused_without_expanding_it():
    # ten to the ninth values once expanded: finishing at all shows nothing was expanded
    node, errors = parse(_alias_bomb())
    assert node is None
    assert errors == [f"s.yaml:5:5: expected at most {MAX_NODES} values once aliases are expanded, found more\n"
                      "    hint: YAML aliases that expand this far are refused"]


def test_alias_that_contains_itself_is_refused():
    node, errors = parse("a: &a [1, *a]\n")
    assert node is None
    assert errors == ["s.yaml:1:4: expected a value, found an alias that refers to itself\n"
                      "    hint: remove the alias, or write the value out"]


def test_nesting_just_within_the_limit_is_accepted():
    node, errors = parse("a: " + "[" * MAX_DEPTH + "]" * MAX_DEPTH + "\n")
    assert errors == []
    depth, cur = 0, node.items["a"]
    while isinstance(cur, Seq) and cur.items:
        cur, depth = cur.items[0], depth + 1
    assert depth == MAX_DEPTH - 1


def test_deeply_nested_document_is_refused_where_it_gets_too_deep():
    node, errors = parse("a: " + "[" * 200 + "]" * 200 + "\n")
    assert node is None
    assert errors == [f"s.yaml:1:{4 + MAX_DEPTH}: expected at most {MAX_DEPTH} levels of nesting, found more\n"
                      "    hint: a spec needs a few levels; this looks like a generated or corrupted file"]


def test_nesting_beyond_the_parser_limit_is_refused_too():
    node, errors = parse("a: " + "[" * 5000 + "]" * 5000 + "\n")
    assert node is None
    assert len(errors) == 1
    assert f"expected at most {MAX_DEPTH} levels of nesting, found far more" in errors[0]


def test_deep_block_mappings_are_refused():
    text = "".join("  " * i + f"k{i}:\n" for i in range(100)) + "  " * 100 + "v: 1\n"
    node, errors = parse(text)
    assert node is None
    assert f"expected at most {MAX_DEPTH} levels of nesting, found more" in errors[0]


def test_null_scalars():
    node, _ = parse("a: ~\nb:\nc: null\nd: '~'\n")
    assert [node.items[k].is_null for k in "abcd"] == [True, True, True, False]
    assert isinstance(node.items["a"], Scalar)
