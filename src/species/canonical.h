// SPDX-License-Identifier: MIT
// The canonical form of species-file YAML nodes from which the provenance digest (input_digest)
// is computed: content only, not comments or layout (docs/species-schema.md).
#pragma once

#include <string>

#include <yaml-cpp/yaml.h>

namespace sevenfold::detail {

// Appends a canonical form of `node` for the input digest: a type letter, then a scalar's
// length-prefixed text, or a collection's item count followed by its items (maps: key, value, in
// file order). Explicit tags enter it; comments, indentation, quoting and flow or block style do
// not, so only content changes the digest. Aliases are written out in full; the node must have
// passed validation, whose schema bounds its depth (no cycles reach here).
void AppendCanonical(const YAML::Node& node, std::string* out);

// The part of every species' digest that comes from the file's `defaults` node.
std::string DefaultsCanonical(const YAML::Node& defaults);

}  // namespace sevenfold::detail
