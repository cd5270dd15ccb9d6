// SPDX-License-Identifier: MIT
// A cheap text scan that cuts a species file into its species items, so that each is parsed on its
// own (small node trees, in parallel) when the scan is sure of the layout.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

namespace sevenfold::detail {

// The items of a species file's top-level `species:` map (one label each), found by a cheap scan of the
// text, and the rest of the file (the skeleton: top-level keys, `defaults`, comments). Parsing each
// item on its own holds one small node tree at a time instead of the whole document's, and lets
// items be parsed in parallel.
struct SpeciesItemsSplit {
  struct Item {
    std::size_t begin = 0;  // byte range: the item's label line up to the next item's
    std::size_t end = 0;
    int first_line = 0;  // 0-based line of `begin` in the file
  };
  std::vector<Item> items;
  std::string skeleton;
};

// The split of `text`, or nullopt unless the scan is sure of it. Sure means: a block-style
// top-level map whose column-0 lines are only `sevenfold-species:`, `defaults:`, `species:`
// (nothing after its colon), a leading "---" and comments; the species value is a block map whose
// label keys sit at one indentation, every other line of the block indented deeper (or a
// comment); no flow collection or quoted scalar spans an item boundary or a top-level key
// (ScanLineForSplit). A wrong guess can only cut a multi-line construct, which makes the cut item
// fail to parse; the caller then reads the whole document, so errors are reported exactly as
// before.
std::optional<SpeciesItemsSplit> SplitSpeciesItems(const std::string& text);

}  // namespace sevenfold::detail
