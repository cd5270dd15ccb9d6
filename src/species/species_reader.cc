// SPDX-License-Identifier: MIT
// Species files: YAML in, validated Species out. Every problem in a file is collected with its
// location, then all are thrown together as one Error (one problem per line).
#include "species/species_reader.h"

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <functional>
#include <map>
#include <optional>
#include <tuple>
#include <string_view>
#include <utility>

#include "core/constants.h"
#include "core/digest.h"
#include "core/elements.h"
#include "core/parallel.h"
#include "core/read_file.h"
#include "core/units.h"
#include "core/utf8.h"
#include "species/formula.h"
#include "species/canonical.h"
#include "species/file_parser.h"
#include "species/geometry.h"
#include "species/item_split.h"
#include "species/species_schema.h"
#include "species/text_checks.h"

namespace sevenfold {
namespace detail {

using namespace schema;

bool FileParser::CheckFormat(const YAML::Node& root) {
  const std::string format_line = std::string(kFormatKey) + ": " + std::to_string(kFormatVersion);
  if (!root.IsMap()) {
    Fail(root, "", Describe(root), "a map starting with '" + format_line + "'");
    return false;
  }
  const auto first = root.begin();
  const bool first_is_format =
      first != root.end() && first->first.IsScalar() && first->first.Scalar() == kFormatKey;
  if (!first_is_format) {
    // Nodes are handles whose assignment copies content, so the finds are kept as iterators.
    auto format_key = root.end(), species = root.end();
    for (auto it = root.begin(); it != root.end(); ++it) {
      if (!it->first.IsScalar()) continue;
      if (it->first.Scalar() == kFormatKey && format_key == root.end()) format_key = it;
      if (it->first.Scalar() == "species") species = it;
    }
    if (format_key != root.end()) {
      Fail(format_key->first,
           std::string(kFormatKey),
           "not the first key",
           "the format key first, before every other key");
    } else if (species != root.end() && species->second.IsSequence()) {
      Fail(first->first,
           "",
           "a species file of the first layout (a 'species' list of 'name' items, no '" +
               std::string(kFormatKey) + "' key)",
           "the layout of version " + std::to_string(kFormatVersion) + "; " + kUpgradeHint);
    } else {
      Fail(first != root.end() ? first->first : root,
           std::string(kFormatKey),
           "missing",
           "'" + format_line + "' as the first key (the format and its version)");
    }
    return false;
  }
  // A copy: the iterator's -> yields a temporary pair, so a reference would dangle (ASan).
  const YAML::Node version = first->second;
  if (!version.IsScalar() || version.Scalar() != std::to_string(kFormatVersion)) {
    Fail(version,
         std::string(kFormatKey),
         "version " + Describe(version),
         "version " + std::to_string(kFormatVersion) +
             " (the version this build reads); files of the first layout have no version: " +
             kUpgradeHint);
    return false;
  }
  return true;
}

// The molecular data of a species (everything tabulated-cp replaces).
void FileParser::ReadMolecularData(SpeciesDraft* draft) {
  SpeciesDraft& draft_ref = *draft;
  Species& species = draft_ref.species;
  const Entries& entries = *draft_ref.entries;
  const YAML::Node& label_node = draft_ref.label;
  const bool shape_ok = draft_ref.shape_ok;
  if (const Entry* entry = entries.Find("symmetry-number")) {
    const auto sigma = ReadAtLeast(entry->value, "symmetry-number", 1.0, "a symmetry number");
    if (sigma) {
      if (shape_ok && species.shape == Shape::kAtom && *sigma != 1.0) {
        Fail(entry->value, "symmetry-number", Number(*sigma) + " for an atom", "1 (or omit it)");
      } else if (shape_ok && species.shape == Shape::kLinear && *sigma != 1.0 && *sigma != 2.0) {
        Fail(entry->value,
             "symmetry-number",
             Number(*sigma) + " for a linear species",
             "1 (no centre of symmetry) or 2 (centrosymmetric)");
      } else {
        species.symmetry_number = *sigma;
      }
    }
  } else if (shape_ok && species.shape != Shape::kAtom) {
    Fail(label_node,
         "symmetry-number",
         "missing",
         "the external symmetry number for a " + ToString(species.shape) + " species");
  }

  const Entry* diatomic_entry = entries.Find("rovibrational-constants");
  // Electronic levels first: the map form of rovibrational-constants takes the ground degeneracy.
  const Entry* levels_entry = entries.Find("electronic-levels");
  if (levels_entry) ReadElectronicLevels(levels_entry->value, &species);
  if (const Entry* entry = entries.Find("spin-multiplicity")) {
    ReadSpinMultiplicity(*entry, entries, &species);
  }
  if (diatomic_entry) ReadDiatomic(*diatomic_entry, draft);
  draft->has_rovibrational = diatomic_entry != nullptr;
  const bool has_diatomic = draft->has_rovibrational;

  ReadRotation(draft);
  if (has_diatomic && species.rotational_constants_cm1.empty() &&
      !species.diatomic_states.empty()) {
    // Rigid-rotor stand-in: B_0 = B_e - alpha_e / 2 of the ground state.
    const DiatomicConstants& ground = species.diatomic_states.front().constants;
    species.rotational_constants_cm1 = {ground.be_cm1 - 0.5 * ground.alphae_cm1};
  }
  const std::size_t before_vibrations = problems_->size();
  ReadVibrations(draft);
  draft->vibrations_ok = problems_->size() == before_vibrations;

  if (const Entry* entry = entries.Find("frequency-scale")) {
    if (const auto scale = ReadInRange(entry->value,
                                       "frequency-scale",
                                       kMinFrequencyScale,
                                       kMaxFrequencyScale,
                                       "a scale factor")) {
      species.frequency_scale = *scale;
    }
  }
  if (const Entry* entry = entries.Find("optical-isomers")) {
    if (const auto isomers = ReadAtLeast(entry->value, "optical-isomers", 1.0, "a count")) {
      species.optical_isomers = *isomers;
    }
  }
  if (const Entry* entry = entries.Find("centrifugal-distortion")) {
    if (shape_ok && species.shape != Shape::kLinear) {
      Fail(entry->key_node,
           "centrifugal-distortion",
           "given for " + ShapePhrase(species.shape),
           "centrifugal-distortion only for a linear species");
    } else if (const auto d = ReadAtLeast(
                   entry->value, "centrifugal-distortion", 0.0, "a distortion constant in cm^-1")) {
      species.centrifugal_distortion_cm1 = *d;
    }
  }
}

std::optional<Species> FileParser::ReadSpecies(const YAML::Node& label_node,
                                               const YAML::Node& node,
                                               int index,
                                               const Defaults& defaults,
                                               std::vector<NameRecord>* names) {
  context_ = "species #" + std::to_string(index + 1);
  const std::size_t before = problems_->size();
  SpeciesDraft draft;
  draft.label = label_node;
  Species& species = draft.species;
  species.location = Where(label_node);
  const std::string label = label_node.IsScalar() ? label_node.Scalar() : "";
  const bool label_bad = !label_node.IsScalar() || label.empty() ||
                         std::any_of(label.begin(), label.end(), [](char c) {
                           return static_cast<unsigned char>(c) <= ' ' || c == 0x7f;
                         });
  if (label_bad) {
    Fail(label_node,
         "label",
         Describe(label_node),
         "a species label (a non-empty text without spaces or control characters) as the key");
  } else {
    species.name = label;
    context_ = "species '" + label + "'";
    names->push_back(NameRecord{label, Where(label_node), file_index_});
  }
  const std::optional<Entries> entries_or = ReadEntries(node, "", kSpeciesKeys);
  if (!entries_or) return std::nullopt;
  const Entries& entries = *entries_or;
  draft.entries = &entries;

  species.temperatures = defaults.temperatures;
  species.standard_pressure_pa = defaults.pressure_pa;
  species.thresholds = defaults.thresholds;
  species.fit_request = defaults.fit_request;

  bool& composition_ok = draft.formula_ok;
  if (const Entry* entry = entries.Find("formula")) {
    composition_ok = ReadFormula(entry->value, &species);
  } else {
    Fail(label_node, "formula", "missing", "a chemical formula such as CH4, C2H5OH or HCO+");
  }

  const Entry* enthalpy_298 = entries.Find("formation-enthalpy");
  const Entry* enthalpy_0 = entries.Find("formation-enthalpy-0k");
  if (enthalpy_298 && enthalpy_0) {
    Fail(enthalpy_0->key_node,
         "formation-enthalpy-0k",
         "given together with formation-enthalpy",
         "only one of the two (the 298.15 K value is derived from the 0 K one)");
  } else if (enthalpy_298 || enthalpy_0) {
    const Entry* entry = enthalpy_298 ? enthalpy_298 : enthalpy_0;
    if (const auto h = ReadEnergy(entry->value, entry->key)) {
      if (std::fabs(*h) > kMaxFormationEnthalpyJPerMol) {
        Fail(entry->value,
             entry->key,
             Describe(entry->value),
             "a formation enthalpy of magnitude at most " +
                 Number(kMaxFormationEnthalpyJPerMol * 1.0e-3) + " kJ/mol");
      } else if (enthalpy_298) {
        species.formation_enthalpy_j_per_mol = *h;
      } else {
        species.formation_enthalpy_0k_j_per_mol = *h;
      }
    }
  } else {
    Fail(label_node,
         "formation-enthalpy",
         "missing",
         "the enthalpy of formation at 298.15 K (or formation-enthalpy-0k, at 0 K)");
  }

  bool& shape_ok = draft.shape_ok;
  const Entry* shape_entry = entries.Find("shape");
  if (shape_entry) {
    const auto text = ReadString(shape_entry->value, "shape", "atom, linear or nonlinear");
    const std::optional<Shape> shape = text ? ParseShape(*text) : std::nullopt;
    if (text && !shape) {
      Fail(shape_entry->value, "shape", Describe(shape_entry->value), "atom, linear or nonlinear");
    }
    if (shape) {
      species.shape = *shape;
      shape_ok = true;
    }
  } else {
    Fail(label_node, "shape", "missing", "atom, linear or nonlinear");
  }
  if (shape_ok && composition_ok) {
    const int num_atoms = species.NumAtoms();
    const int min_atoms = species.shape == Shape::kAtom     ? 1
                          : species.shape == Shape::kLinear ? 2
                                                            : 3;
    if ((species.shape == Shape::kAtom && num_atoms != 1) || num_atoms < min_atoms) {
      Fail(shape_entry->value,
           "shape",
           "'" + ToString(species.shape) + "' for a formula of " + Plural(num_atoms, "atom"),
           species.shape == Shape::kAtom
               ? "exactly 1 atom for shape 'atom'"
               : "at least " + std::to_string(min_atoms) + " atoms for shape '" +
                     ToString(species.shape) + "'");
      shape_ok = false;  // the shape-dependent counts below would only repeat this problem
    }
  }

  const Entry* tabulated_entry = entries.Find("tabulated-cp");
  if (tabulated_entry) {
    for (const std::string& key : kMolecularKeys) {
      if (const Entry* entry = entries.Find(key)) {
        Fail(entry->key_node,
             key,
             "given together with tabulated-cp",
             "either molecular data or tabulated-cp, not both");
      }
    }
    ReadTabulated(*tabulated_entry, &draft);
  } else {
    ReadMolecularData(&draft);
  }
  if (const Entry* entry = entries.Find("fit-temperatures")) {
    ReadTemperatures(entry->value, "fit-temperatures", &species.temperatures);
    if (entry->value.IsMap() && entry->value["mid"]) species.fit_request.mid_given = true;
  }
  ReadFitRequest(entries, &species.fit_request);
  if (const Entry* entry = entries.Find("standard-pressure")) {
    if (const auto pressure_pa = ReadStandardPressure(entry->value, "standard-pressure")) {
      species.standard_pressure_pa = *pressure_pa;
    }
  }
  if (const Entry* entry = entries.Find("fit-thresholds")) {
    ReadThresholds(entry->value, "fit-thresholds", &species.thresholds);
  }
  if (const Entry* entry = entries.Find("spin-statistics"); entry && !tabulated_entry) {
    ReadNuclearSpin(*entry, &draft);
  }
  if (const Entry* entry = entries.Find("hindered-rotors"); entry && !tabulated_entry) {
    ReadTorsions(*entry, &draft);
  }

  if (problems_->size() == before && composition_ok && !tabulated_entry) {
    CheckKramers(label_node, entries, species);
  }
  if (problems_->size() != before) return std::nullopt;
  std::string canonical = "sevenfold species v3\n";
  AppendCanonical(label_node, &canonical);
  AppendCanonical(node, &canonical);
  canonical += defaults_canonical_;
  species.input_digest = Sha256Hex(canonical);
  return std::move(species);
}

bool FileParser::Parse(std::vector<NameRecord>* names,
                       bool allow_split,
                       int num_jobs,
                       std::vector<Species>* species) {
  // The one validator of both readers (core/utf8.h).
  if (const std::optional<Utf8Problem> bad = FindUtf8Problem(text_)) {
    const SourceLocation where{file_name_, bad->line, bad->column};
    problems_->Add(file_index_,
                   bad->line,
                   bad->column,
                   where.ToString() +
                       fmt::format(": found the byte 0x{:02x}, {}; expected UTF-8 text",
                                   static_cast<unsigned>(bad->byte),
                                   bad->kind == Utf8ProblemKind::kControl
                                       ? "a control character YAML does not allow"
                                       : bad->Describe()));
    return false;
  }
  if (const std::optional<TextPosition> deep = TooDeepFlowNesting(text_)) {
    const SourceLocation where{file_name_, deep->line, deep->column};
    problems_->Add(file_index_, deep->line, deep->column,
                   where.ToString() + fmt::format(": flow collections ('[' or '{{') nested deeper "
                                                  "than {} levels; expected at most {}",
                                                  kMaxFlowNesting, kMaxFlowNesting));
    return false;
  }
  // yaml-cpp's Load silently keeps the first document only; its LoadAll loops forever on some
  // inputs that Load reads (found by fuzzing, docs/robustness.md). So a second document is
  // found from the text: a "---" marker after content, or content after a "..." end marker.
  if (const int line = SecondDocumentLine(text_); line > 0) {
    const SourceLocation where{file_name_, line, 1};
    problems_->Add(file_index_,
                   line,
                   1,
                   where.ToString() +
                       ": a second YAML document; expected one document per species file");
    return false;
  }
  if (allow_split) {
    if (const std::optional<SpeciesItemsSplit> split = SplitSpeciesItems(text_)) {
      if (std::optional<std::vector<Species>> read = ParseSplit(*split, num_jobs, names)) {
        *species = std::move(*read);
        return true;
      }
    }
  }
  *species = ParseWholeDocument(names);
  return false;
}

std::optional<std::vector<Species>> FileParser::ParseSplit(const SpeciesItemsSplit& split,
                                                           int num_jobs,
                                                           std::vector<NameRecord>* names) {
  // Problems are only counted here: any at all sends the file to ParseWholeDocument, which
  // reports them exactly as it always has.
  Problems problems;
  FileParser top(split.skeleton, file_name_, file_index_, &problems);
  Defaults defaults;
  try {
    const YAML::Node root = YAML::Load(split.skeleton);
    if (!top.CheckFormat(root)) return std::nullopt;
    const std::optional<Entries> entries = top.ReadEntries(root, "", kTopKeys);
    if (!entries) return std::nullopt;
    const Entry* list = entries->Find("species");
    if (list == nullptr || !list->value.IsNull()) return std::nullopt;
    if (const Entry* entry = entries->Find("defaults")) {
      if (const auto read = top.ReadDefaults(entry->value)) defaults = *read;
      if (problems.size() > 0) return std::nullopt;
      top.defaults_canonical_ = DefaultsCanonical(entry->value);
    }
  } catch (...) {
    return std::nullopt;
  }
  if (problems.size() > 0) return std::nullopt;

  struct ItemResult {
    std::optional<Species> species;
    std::vector<NameRecord> names;
  };
  const int num_items = static_cast<int>(split.items.size());
  std::vector<ItemResult> results(split.items.size());
  std::atomic<bool> failed{false};
  ParallelFor(num_items, num_jobs, [&](int i) {
    if (failed.load()) return;
    const SpeciesItemsSplit::Item& item = split.items[static_cast<std::size_t>(i)];
    ItemResult& result = results[static_cast<std::size_t>(i)];
    try {
      const std::string text = text_.substr(item.begin, item.end - item.begin);
      const YAML::Node root = YAML::Load(text);
      Problems item_problems;
      FileParser parser(text, file_name_, file_index_, &item_problems);
      parser.line_offset_ = item.first_line;
      parser.defaults_canonical_ = top.defaults_canonical_;
      // The item's text alone is a map of exactly this one label.
      if (root.IsMap() && root.size() == 1) {
        result.species =
            parser.ReadSpecies(root.begin()->first, root.begin()->second, i, defaults, &result.names);
      }
      if (!result.species || item_problems.size() > 0) failed = true;
    } catch (...) {
      failed = true;
    }
  });
  if (failed) return std::nullopt;
  std::vector<Species> species;
  species.reserve(results.size());
  for (ItemResult& result : results) {
    species.push_back(std::move(*result.species));
    for (NameRecord& record : result.names) names->push_back(std::move(record));
  }
  return species;
}

std::vector<Species> FileParser::ParseWholeDocument(std::vector<NameRecord>* names) {
  YAML::Node root;
  try {
    root = YAML::Load(text_);
  } catch (const YAML::Exception& error) {
    // ParserException (and DeepRecursion, one of its kinds) carries the mark of the syntax error.
    FailText(
        error.mark, "", "invalid YAML (" + error.msg + "); expected a well-formed YAML document");
    return {};
  }
  std::vector<Species> species_list;
  try {
    if (!root.IsDefined() || root.IsNull()) {
      const SourceLocation where{file_name_, 1, 1};
      problems_->Add(file_index_,
                     1,
                     1,
                     where.ToString() +
                         ": the file holds no data; expected a map starting with '" +
                         std::string(kFormatKey) + ": " + std::to_string(kFormatVersion) + "'");
      return {};
    }
    if (!CheckFormat(root)) return {};
    const std::optional<Entries> top = ReadEntries(root, "", kTopKeys);
    if (!top) return {};
    Defaults defaults;
    if (const Entry* entry = top->Find("defaults")) {
      const std::size_t before = problems_->size();
      if (const auto read = ReadDefaults(entry->value)) defaults = *read;
      // Only validated defaults are walked: their schema bounds the walk (an alias bomb is not).
      if (problems_->size() == before) defaults_canonical_ = DefaultsCanonical(entry->value);
    }
    const Entry* list = top->Find("species");
    const std::string expected_map = "a map from species labels to their data";
    if (!list) {
      Fail(root, "species", "missing", expected_map);
      return {};
    }
    if (!list->value.IsMap()) {
      Fail(list->value, "species", Describe(list->value), expected_map);
      return {};
    }
    if (list->value.size() == 0) {
      Fail(list->value, "species", "an empty map", "at least one species");
      return {};
    }
    int index = 0;
    for (auto it = list->value.begin(); it != list->value.end(); ++it, ++index) {
      std::optional<Species> species = ReadSpecies(it->first, it->second, index, defaults, names);
      if (species) species_list.push_back(std::move(*species));
    }
  } catch (const YAML::Exception& error) {
    // Not expected after a successful load (types are checked before every access); kept so a
    // yaml-cpp surprise still reports a location instead of escaping as a foreign exception.
    FailText(error.mark,
             "",
             "cannot read the YAML data (" + error.msg +
                 "); expected the schema "
                 "of docs/species-schema.md");
  }
  context_.clear();
  return species_list;
}

// Duplicate names, in the order they were written across all files.
void CheckDuplicateNames(const std::vector<NameRecord>& names, Problems* problems) {
  std::map<std::string, const NameRecord*> first_by_name;
  for (const NameRecord& record : names) {
    const auto [it, inserted] = first_by_name.emplace(record.name, &record);
    if (inserted) continue;
    problems->Add(record.file_index,
                  record.where.line,
                  record.where.column,
                  record.where.ToString() + ": species '" + record.name + "': label '" +
                      record.name + "' given twice, here and at " +
                      it->second->where.ToString() +
                      "; expected each label once across all species files read together");
  }
}

}  // namespace detail

using detail::CheckDuplicateNames;
using detail::FileParser;
using detail::NameRecord;
using detail::Problems;

std::vector<Species> ReadSpeciesText(const std::string& text,
                                     const std::string& file_name,
                                     int num_jobs) {
  return detail::ReadSpeciesTextForTesting(text, file_name, true, num_jobs, nullptr);
}

std::vector<Species> ReadSpeciesFiles(const std::vector<std::string>& paths, int num_jobs) {
  Problems problems;
  std::vector<NameRecord> names;
  std::vector<Species> all_species;
  for (std::size_t i = 0; i < paths.size(); ++i) {
    const int file_index = static_cast<int>(i);
    std::optional<std::string> text;
    try {
      text = ReadInputFile(paths[i], "species file");  // core/read_file.h: the one 16 MiB cap
    } catch (const Error& e) {
      problems.Add(file_index, 0, 0, e.what());
      continue;
    }
    std::vector<Species> species;
    FileParser(*text, paths[i], file_index, &problems).Parse(&names, true, num_jobs, &species);
    for (Species& one : species) all_species.push_back(std::move(one));
  }
  CheckDuplicateNames(names, &problems);
  problems.ThrowIfAny();
  return all_species;
}

namespace detail {

std::vector<Species> ReadSpeciesTextForTesting(const std::string& text,
                                               const std::string& file_name,
                                               bool allow_split,
                                               int num_jobs,
                                               bool* split_used) {
  Problems problems;
  std::vector<NameRecord> names;
  if (text.size() > kMaxSpeciesFileBytes) {
    problems.Add(0,
                 0,
                 0,
                 file_name +
                     ": species text is larger than 16 MiB, refused before parsing; "
                     "expected at most 16 MiB");
    problems.ThrowIfAny();
  }
  std::vector<Species> species;
  const bool split =
      FileParser(text, file_name, 0, &problems).Parse(&names, allow_split, num_jobs, &species);
  if (split_used != nullptr) *split_used = split;
  CheckDuplicateNames(names, &problems);
  problems.ThrowIfAny();
  return species;
}

}  // namespace detail

}  // namespace sevenfold
