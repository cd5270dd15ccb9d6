// SPDX-License-Identifier: MIT
#include "species/canonical.h"

namespace sevenfold::detail {
namespace {

// Appends `text` as its byte count, a colon and the bytes, so no two sequences of texts collide.
void AppendLengthPrefixed(const std::string& text, std::string* out) {
  *out += std::to_string(text.size());
  *out += ':';
  *out += text;
}

}  // namespace

void AppendCanonical(const YAML::Node& node, std::string* out) {
  const std::string& tag = node.Tag();
  if (!tag.empty() && tag != "?" && tag != "!") {
    *out += '!';
    AppendLengthPrefixed(tag, out);
  }
  switch (node.Type()) {
    case YAML::NodeType::Undefined:
      *out += 'u';
      return;
    case YAML::NodeType::Null:
      *out += '~';
      return;
    case YAML::NodeType::Scalar:
      *out += 's';
      AppendLengthPrefixed(node.Scalar(), out);
      return;
    case YAML::NodeType::Sequence:
      *out += 'l' + std::to_string(node.size()) + ':';
      for (const YAML::Node& item : node) AppendCanonical(item, out);
      return;
    case YAML::NodeType::Map:
      *out += 'm' + std::to_string(node.size()) + ':';
      for (auto it = node.begin(); it != node.end(); ++it) {
        AppendCanonical(it->first, out);
        AppendCanonical(it->second, out);
      }
      return;
  }
}

std::string DefaultsCanonical(const YAML::Node& defaults) {
  std::string canonical = "\ndefaults\n";
  AppendCanonical(defaults, &canonical);
  return canonical;
}

}  // namespace sevenfold::detail
