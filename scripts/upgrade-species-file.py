#!/usr/bin/env python3
# SPDX-License-Identifier: MIT
"""Turns a species file of the first layout (a `species:` list of `name:` items with a
`composition:` map) into the current layout, version 2 (docs/species-schema.md).

usage: scripts/upgrade-species-file.py OLD.yaml [-o NEW.yaml]      (default: to stdout)

The file is rewritten line by line, so comments, blank lines and flow or block style stay where
they were; an item the line rewrite does not recognise (a flow-style item, a composition written
over several lines) is written out afresh, and its comments are lost (a note on stderr says
which). The result is read back and must hold exactly the data of the input, converted; anything
the script does not understand (an unknown key, a file already in the new layout, a second
document) is refused with exit status 2 and nothing written. Needs PyYAML (Debian python3-yaml).
"""

import argparse
import json
import re
import sys

import yaml

FORMAT_KEY = "sevenfold-species"
FORMAT_VERSION = "2"

# Old key -> new key, inside a species map (None: folded into `formula`).
SPECIES_RENAMES = {
    "name": None,
    "composition": None,
    "charge": None,
    "formation-enthalpy": "formation-enthalpy",
    "shape": "shape",
    "symmetry-number": "symmetry-number",
    "rotational-constants": "rotational-constants",
    "moments-of-inertia": "moments-of-inertia",
    "geometry": "structure",
    "vibrations": "vibrations",
    "frequency-scale": "frequency-scale",
    "electronic-levels": "electronic-levels",
    "optical-isomers": "optical-isomers",
    "centrifugal-distortion": "centrifugal-distortion",
    "temperatures": "fit-temperatures",
    "pressure": "standard-pressure",
    "fit-thresholds": "fit-thresholds",
    "diatomic-constants": "rovibrational-constants",
    "nuclear-spin": "spin-statistics",
    "torsions": "hindered-rotors",
}
DEFAULTS_RENAMES = {
    "temperatures": "fit-temperatures",
    "pressure": "standard-pressure",
    "fit-thresholds": "fit-thresholds",
}
# Keys of the inner maps, old -> new.
DIATOMIC_RENAMES = {k: k for k in ("energy", "degeneracy", "we", "wexe", "weye", "Be", "alphae",
                                   "gammae", "De")}
DIATOMIC_RENAMES["dissociation"] = "dissociation-energy"
SPIN_RENAMES = {"even": "even-j", "odd": "odd-j", "mixture": "mixture"}
TORSION_RENAMES = {"replaces": "replaces", "reduced-moment": "reduced-moment",
                   "rotational-constant": "rotational-constant", "symmetry": "symmetry-number",
                   "barrier": "barrier-height", "fourier": "cosine-terms"}
TEMPERATURE_KEYS = ("low", "mid", "high")
THRESHOLD_KEYS = ("cp", "enthalpy", "entropy")
# Keys renamed wherever they appear as a key in a species item's text (they occur nowhere else in
# the first layout); the read-back check catches any other hit.
TEXT_RENAMES = {
    "geometry": "structure",
    "temperatures": "fit-temperatures",
    "pressure": "standard-pressure",
    "diatomic-constants": "rovibrational-constants",
    "nuclear-spin": "spin-statistics",
    "torsions": "hindered-rotors",
    "dissociation": "dissociation-energy",
    "even": "even-j",
    "odd": "odd-j",
    "symmetry": "symmetry-number",
    "barrier": "barrier-height",
    "fourier": "cosine-terms",
}


class Refused(Exception):
    pass


class StrictLoader(yaml.BaseLoader):
    """BaseLoader (every scalar stays text, as sevenfold's own reader sees it: NO is not False)
    that refuses a key given twice in one map instead of keeping the last."""

    def construct_mapping(self, node, deep=False):
        seen = {}
        for key_node, _ in node.value:
            key = self.construct_object(key_node, deep=deep)
            if isinstance(key, str) and key in seen:
                raise Refused(f"line {key_node.start_mark.line + 1}: key '{key}' given twice "
                              f"(first on line {seen[key] + 1})")
            if isinstance(key, str):
                seen[key] = key_node.start_mark.line
        return super().construct_mapping(node, deep=deep)


def load(text):
    try:
        docs = list(yaml.load_all(text, Loader=StrictLoader))
    except yaml.YAMLError as error:
        raise Refused(f"not valid YAML ({error})")
    except RecursionError:
        raise Refused("YAML nested too deeply to read")
    if len(docs) != 1:
        raise Refused(f"{len(docs)} YAML documents; expected one")
    return docs[0]


def check_keys(where, data, allowed):
    if not isinstance(data, dict):
        raise Refused(f"{where}: not a map")
    for key in data:
        if key not in allowed:
            raise Refused(f"{where}: unknown key '{key}'; expected one of {', '.join(allowed)}")


def rename_map(where, data, renames):
    check_keys(where, data, renames)
    return {renames[k]: v for k, v in data.items()}


def formula_of(where, composition, charge):
    if not isinstance(composition, dict) or not composition:
        raise Refused(f"{where}: composition is not a non-empty map of element counts")
    text = ""
    for symbol, count in composition.items():
        if not re.fullmatch(r"[A-Z][a-z]?", symbol) or not re.fullmatch(r"[1-9][0-9]*", str(count)):
            raise Refused(f"{where}: composition entry {symbol}: {count} is not an element "
                          "symbol with a whole count of at least 1")
        text += symbol + ("" if count == "1" else count)
    if charge is not None:
        if not isinstance(charge, str) or not re.fullmatch(r"[+-]?[0-9]+", charge):
            raise Refused(f"{where}: charge '{charge}' is not a whole number")
        value = int(charge)
        if value != 0:
            sign = "+" if value > 0 else "-"
            text += sign if abs(value) == 1 else f"{sign}{abs(value)}"
    return text


def convert_species(index, item):
    where = f"species item {index + 1}"
    check_keys(where, item, SPECIES_RENAMES)
    if "name" not in item or not isinstance(item["name"], str):
        raise Refused(f"{where}: no name")
    label = item["name"]
    where = f"species '{label}'"
    if "composition" not in item:
        raise Refused(f"{where}: no composition")
    out = {}
    for key, value in item.items():
        if key == "name":
            continue
        if key == "composition":
            out["formula"] = formula_of(where, value, item.get("charge"))
            continue
        if key == "charge":
            continue
        new_key = SPECIES_RENAMES[key]
        if key == "diatomic-constants":
            if isinstance(value, list):
                value = [rename_map(f"{where}: {key}[{i}]", v, DIATOMIC_RENAMES)
                         for i, v in enumerate(value)]
            else:
                value = rename_map(f"{where}: {key}", value, DIATOMIC_RENAMES)
        elif key == "nuclear-spin":
            value = rename_map(f"{where}: {key}", value, SPIN_RENAMES)
        elif key == "torsions":
            if not isinstance(value, list):
                raise Refused(f"{where}: torsions is not a list")
            value = [rename_map(f"{where}: torsions[{i}]", v, TORSION_RENAMES)
                     for i, v in enumerate(value)]
        elif key == "temperatures":
            check_keys(f"{where}: {key}", value, TEMPERATURE_KEYS)
        elif key == "fit-thresholds":
            check_keys(f"{where}: {key}", value, THRESHOLD_KEYS)
        out[new_key] = value
    return label, out


def convert_data(data):
    if isinstance(data, dict) and FORMAT_KEY in data:
        raise Refused(f"already in the current layout ('{FORMAT_KEY}: {data[FORMAT_KEY]}')")
    check_keys("the top level", data, ("defaults", "species"))
    if not isinstance(data.get("species"), list) or not data["species"]:
        raise Refused("the top level: 'species' is not a non-empty list")
    new = {FORMAT_KEY: FORMAT_VERSION}
    if "defaults" in data:
        defaults = rename_map("defaults", data["defaults"], DEFAULTS_RENAMES)
        if "fit-temperatures" in defaults:
            check_keys("defaults: temperatures", defaults["fit-temperatures"], TEMPERATURE_KEYS)
        if "fit-thresholds" in defaults:
            check_keys("defaults: fit-thresholds", defaults["fit-thresholds"], THRESHOLD_KEYS)
        new["defaults"] = defaults
    species = {}
    labels = []
    for index, item in enumerate(data["species"]):
        label, converted = convert_species(index, item)
        if label in species:
            raise Refused(f"species '{label}' is defined twice")
        species[label] = converted
        labels.append(label)
    new["species"] = species
    return new, labels


PLAIN = re.compile(r"[A-Za-z0-9(+\-.][A-Za-z0-9_+\-().'/ ^*]*(?<! )")


def scalar_text(text):
    # Plain where YAML reads it back as the same text, else double-quoted (JSON is valid YAML).
    if PLAIN.fullmatch(text) and yaml.load(text, Loader=yaml.BaseLoader) == text:
        return text
    return json.dumps(text)


def emit(value, indent):
    """Block YAML for a converted item (used only where the line rewrite does not apply)."""
    pad = " " * indent
    if isinstance(value, dict):
        lines = []
        for key, item in value.items():
            if isinstance(item, (dict, list)) and not is_flat(item):
                lines.append(f"{pad}{scalar_text(key)}:")
                lines.extend(emit(item, indent + 2))
            else:
                lines.append(f"{pad}{scalar_text(key)}: {flow(item)}")
        return lines
    lines = []
    for item in value:
        lines.append(f"{pad}- {flow(item)}")
    return lines


def is_flat(value):
    items = value.values() if isinstance(value, dict) else value
    return all(not isinstance(v, (dict, list)) or (isinstance(v, list) and is_flat(v))
               for v in items)


def flow(value):
    if isinstance(value, dict):
        return "{" + ", ".join(f"{scalar_text(k)}: {flow(v)}" for k, v in value.items()) + "}"
    if isinstance(value, list):
        return "[" + ", ".join(flow(v) for v in value) + "]"
    return scalar_text(value)


def split_comment(line):
    # The content and the comment of a line (a '#' after a space, outside quotes).
    quote = None
    for i, c in enumerate(line):
        if quote:
            if c == quote:
                quote = None
        elif c in "\"'" and (i == 0 or line[i - 1] in " [{,:"):
            quote = c
        elif c == "#" and (i == 0 or line[i - 1] == " "):
            return line[:i], line[i:]
    return line, ""


def rename_keys(content, renames):
    for old, new in renames.items():
        content = re.sub(r"(^|[\s{,])" + re.escape(old) + r"(\s*:(\s|$))",
                         lambda m: m.group(1) + new + m.group(2), content)
    return content


def rewrite(text, new, labels):
    lines = text.split("\n")
    out = []
    notes = []
    i = 0
    inserted = False
    top_key = None
    while i < len(lines):
        line = lines[i]
        content, comment = split_comment(line)
        is_top = bool(content) and not content[0].isspace() and content.strip()
        if is_top and content.strip() == "---":
            out.append(line)
            i += 1
            continue
        if is_top:
            if not inserted:
                out.append(f"{FORMAT_KEY}: {FORMAT_VERSION}   # species-file layout version "
                           "(docs/species-schema.md)")
                inserted = True
            top_key = content.split(":")[0].strip()
            if content.rstrip() != top_key + ":" and not content.rstrip().startswith("- "):
                raise Refused(f"line {i + 1}: top-level key '{top_key}' in flow style; expected "
                              "the block style of docs/species-schema.md")
            out.append(line)
            i += 1
            if top_key == "species":
                i = rewrite_species(lines, i, new, labels, out, notes)
                top_key = None
            continue
        if top_key == "defaults":
            content = rename_keys(content, DEFAULTS_RENAMES)
        out.append(content + comment)
        i += 1
    return "\n".join(out), notes


def rewrite_species(lines, i, new, labels, out, notes):
    """Rewrites the block sequence of species items starting at line i; returns the next line."""
    # Group the lines into items: each starts with "- " at the items' indentation.
    items = []  # (start, end) line ranges
    dash_indent = None
    end = i
    while end < len(lines):
        content, _ = split_comment(lines[end])
        if content.strip() == "":
            end += 1
            continue
        indent = len(content) - len(content.lstrip(" "))
        if indent == 0 and not content.startswith("- "):
            break  # the next top-level key
        if content.lstrip(" ").startswith("- ") and (dash_indent is None or indent == dash_indent):
            dash_indent = indent
            items.append([end, None])
        elif dash_indent is None or indent <= dash_indent:
            raise Refused(f"line {end + 1}: expected a species item ('- name: ...')")
        end += 1
    # Trailing comments and blank lines stay after the block.
    last = end
    while last > i and split_comment(lines[last - 1])[0].strip() == "":
        last -= 1
    for k, item in enumerate(items):
        item[1] = items[k + 1][0] if k + 1 < len(items) else last
    if len(items) != len(labels):
        raise Refused(f"found {len(items)} species items in the text, {len(labels)} in the data")
    shift = "  " if dash_indent == 0 else ""
    for line in lines[i:items[0][0] if items else last]:
        out.append(shift + line if line.strip() else line)
    for (start, stop), label in zip(items, labels):
        body = lines[start:stop]
        converted = rewrite_item(body, dash_indent, label, new["species"][label])
        if converted is None:
            notes.append(f"species '{label}': written afresh, its comments are not kept")
            converted = [" " * dash_indent + f"{scalar_text(label)}:"]
            converted += emit(new["species"][label], dash_indent + 2)
            # Keep the blank lines and comments that followed the item.
            tail = []
            for line in reversed(body):
                if split_comment(line)[0].strip():
                    break
                tail.insert(0, line)
            converted += tail
        for line in converted:
            out.append(shift + line if line.strip() else line)
    for line in lines[last:end]:
        out.append(line)
    return end


def rewrite_item(body, dash_indent, label, data):
    """The item's lines in the new layout, or None when the line rewrite does not apply."""
    key_indent = dash_indent + 2
    first, first_comment = split_comment(body[0])
    match = re.fullmatch(r" *- name: *(\S.*?) *", first)
    if not match:
        return None
    out = [" " * dash_indent + f"{scalar_text(label)}:" + (" " + first_comment
                                                          if first_comment else "")]
    saw_formula = False
    for line in body[1:]:
        content, comment = split_comment(line)
        stripped = content.strip()
        indent = len(content) - len(content.lstrip(" "))
        if indent == key_indent and stripped.startswith("composition:"):
            if not re.fullmatch(r"composition: *\{[^{}]*\}", stripped):
                return None  # a composition over several lines
            out.append(" " * key_indent + f"formula: {scalar_text(data['formula'])}"
                       + (" " + comment if comment else ""))
            saw_formula = True
            continue
        if indent == key_indent and stripped.startswith("charge:"):
            if comment:
                out.append(" " * key_indent + comment)
            continue
        out.append(rename_keys(content, TEXT_RENAMES) + comment)
    return out if saw_formula else None


def main():
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("old", help="species file in the first layout")
    parser.add_argument("-o", "--output", help="where to write the new file (default: stdout)")
    args = parser.parse_args()
    try:
        with open(args.old, encoding="utf-8") as handle:
            text = handle.read()
    except (OSError, UnicodeDecodeError) as error:
        print(f"error: {args.old}: cannot read: {error}", file=sys.stderr)
        return 2
    try:
        new, labels = convert_data(load(text))
        result, notes = rewrite(text, new, labels)
        if load(result) != new:
            raise Refused("the rewritten text does not read back as the converted data "
                          "(an unusual construct); convert this file by hand")
    except Refused as error:
        print(f"error: {args.old}: {error}; nothing written", file=sys.stderr)
        return 2
    for note in notes:
        print(f"note: {args.old}: {note}", file=sys.stderr)
    if args.output:
        with open(args.output, "w", encoding="utf-8") as handle:
            handle.write(result)
    else:
        sys.stdout.write(result)
    return 0


if __name__ == "__main__":
    sys.exit(main())
