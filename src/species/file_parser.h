// SPDX-License-Identifier: MIT
// The species-file parser shared by the reader's files (internal to src/species/): the problem
// list, a map's checked entries, the draft of a species being read, and FileParser, whose
// methods live in typed_values.cc (numbers, units, lists), section_readers.cc (one reader per
// section of a species) and species_reader.cc (the format check, one species, one file).
#pragma once

#include <fmt/format.h>
#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <tuple>
#include <utility>
#include <vector>

#include "core/error.h"
#include "species/formula.h"
#include "species/item_split.h"
#include "species/species.h"
#include "species/species_schema.h"

namespace sevenfold::detail {

// More problems than this are summarised in one closing line: beyond it the list stops helping.
inline constexpr std::size_t kMaxReportedProblems = 100;
using namespace schema;  // the bands and tolerances (species/species_schema.h)


// Allowed keys per map, in the order messages list them: from the key table.
inline const std::vector<std::string>& kTopKeys = KeysOf(KeySection::kTop);
inline const std::vector<std::string>& kDefaultsKeys = KeysOf(KeySection::kDefaults);
inline const std::vector<std::string>& kSpeciesKeys = KeysOf(KeySection::kSpecies);
inline const std::vector<std::string>& kTemperatureKeys = KeysOf(KeySection::kFitTemperatures);
inline const std::vector<std::string>& kThresholdKeys = KeysOf(KeySection::kFitThresholds);
inline const std::vector<std::string>& kErrorScaleKeys = KeysOf(KeySection::kFitErrorScales);
inline const std::vector<std::string>& kDiatomicKeys = KeysOf(KeySection::kRovibrationalMap);
inline const std::vector<std::string>& kDiatomicStateKeys = KeysOf(KeySection::kRovibrationalState);
inline const std::vector<std::string>& kNuclearSpinKeys = KeysOf(KeySection::kSpinStatistics);
inline const std::vector<std::string>& kTorsionKeys = KeysOf(KeySection::kHinderedRotor);
inline const std::vector<std::string>& kTabulatedKeys = KeysOf(KeySection::kTabulatedCp);
// The species keys of molecular data, refused next to tabulated-cp (which replaces them).
inline const std::vector<std::string> kMolecularKeys = {
    "formation-enthalpy-0k", "symmetry-number", "rotational-constants", "moments-of-inertia",
    "structure", "vibrations", "frequency-scale", "electronic-levels", "spin-multiplicity",
    "optical-isomers", "centrifugal-distortion", "rovibrational-constants", "spin-statistics",
    "hindered-rotors"};

inline std::string JoinWords(const std::vector<std::string>& words) {
  std::string text;
  for (const std::string& word : words) {
    if (!text.empty()) text += ", ";
    text += word;
  }
  return text;
}

inline std::string Number(double value) { return fmt::format("{}", value); }

inline std::string NumberList(const std::vector<double>& values, const char* format = "{}") {
  std::string text = "[";
  for (std::size_t i = 0; i < values.size(); ++i) {
    if (i > 0) text += ", ";
    text += fmt::format(fmt::runtime(format), values[i]);
  }
  return text + "]";
}

inline std::string CompositionText(const std::map<std::string, int>& counts) {
  return FormatFormula(std::vector<std::pair<std::string, int>>(counts.begin(), counts.end()), 0);
}

// What a node holds, for "what was found" in messages.
inline std::string Describe(const YAML::Node& node) {
  if (!node.IsDefined() || node.IsNull()) return "nothing";
  if (node.IsScalar()) {
    std::string text = node.Scalar();
    constexpr std::size_t kMaxEcho = 60;
    if (text.size() > kMaxEcho) text = text.substr(0, kMaxEcho) + "...";
    return "'" + text + "'";
  }
  if (node.IsSequence()) {
    return "a list of " + std::to_string(node.size()) + (node.size() == 1 ? " item" : " items");
  }
  return "a map";
}

struct Problem {
  int file_index = 0;
  int line = 0;
  int column = 0;
  std::string text;
};

// Every problem found so far, across files; thrown together at the end.
class Problems {
 public:
  void Add(int file_index, int line, int column, std::string text) {
    problems_.push_back(Problem{file_index, line, column, std::move(text)});
  }
  std::size_t size() const { return problems_.size(); }

  void ThrowIfAny() {
    if (problems_.empty()) return;
    std::stable_sort(problems_.begin(), problems_.end(), [](const Problem& a, const Problem& b) {
      return std::tie(a.file_index, a.line, a.column) < std::tie(b.file_index, b.line, b.column);
    });
    std::string message;
    const std::size_t shown = std::min(problems_.size(), kMaxReportedProblems);
    for (std::size_t i = 0; i < shown; ++i) {
      if (i > 0) message += "\n";
      message += problems_[i].text;
    }
    if (problems_.size() > shown) {
      message +=
          "\n... and " + std::to_string(problems_.size() - shown) + " more problems not shown";
    }
    throw Error(message);
  }

 private:
  std::vector<Problem> problems_;
};

// A species name and where it was written, for the duplicate check across files.
struct NameRecord {
  std::string name;
  SourceLocation where;
  int file_index = 0;
};

// A map's entries in file order, after checking every key against the allowed ones.
struct Entry {
  std::string key;
  YAML::Node key_node;
  YAML::Node value;
};

class Entries {
 public:
  void Add(Entry entry) { entries_.push_back(std::move(entry)); }
  const Entry* Find(const std::string& key) const {
    for (const Entry& entry : entries_) {
      if (entry.key == key) return &entry;
    }
    return nullptr;
  }

 private:
  std::vector<Entry> entries_;
};

// A species while it is read: its values so far, and what the later sections may rely on. The
// section readers take it instead of a row of flags.
struct SpeciesDraft {
  Species species;
  YAML::Node label;                  // the label key: where missing keys are reported
  const Entries* entries = nullptr;  // the species' keys
  bool formula_ok = false;           // composition and charge read
  bool shape_ok = false;             // shape read and consistent with the atom count
  bool vibrations_ok = false;        // vibrations read without a problem
  bool has_rovibrational = false;    // rovibrational-constants given (B and modes may be omitted)
};

// The file-level settings every species starts from.
struct Defaults {
  TemperatureRanges temperatures;
  double pressure_pa = constants::kStandardPressureBar;
  QualityThresholds thresholds;
  FitRequest fit_request;
};

// "an atom", "a linear species", "a nonlinear species".
inline std::string ShapePhrase(Shape shape) {
  return shape == Shape::kAtom ? "an atom" : "a " + ToString(shape) + " species";
}

inline std::string Plural(std::size_t count, const std::string& noun) {
  return std::to_string(count) + " " + noun + (count == 1 ? "" : "s");
}

inline std::string ShapeCountRule(Shape shape, int num_atoms) {
  switch (shape) {
    case Shape::kAtom:
      return "none for an atom";
    case Shape::kLinear:
      return std::to_string(3 * num_atoms - 5) + " (3N-5 for a linear species of " +
             std::to_string(num_atoms) + " atoms)";
    case Shape::kNonlinear:
      return std::to_string(3 * num_atoms - 6) + " (3N-6 for a nonlinear species of " +
             std::to_string(num_atoms) + " atoms)";
  }
  return "";
}

class FileParser {
 public:
  FileParser(const std::string& text,
             const std::string& file_name,
             int file_index,
             Problems* problems)
      : text_(text), file_name_(file_name), file_index_(file_index), problems_(problems) {}

  // Reads the file, by species items when SplitSpeciesItems is sure of them and `allow_split`
  // (items parsed on up to num_jobs threads, 0: hardware threads), else as one document.
  // Returns true when the split was used.
  bool Parse(std::vector<NameRecord>* names,
             bool allow_split,
             int num_jobs,
             std::vector<Species>* species);

 private:
  SourceLocation Where(const YAML::Mark& mark) const {
    if (mark.is_null()) return SourceLocation{file_name_, 0, 0};
    return SourceLocation{file_name_, line_offset_ + mark.line + 1, mark.column + 1};
  }
  SourceLocation Where(const YAML::Node& node) const { return Where(node.Mark()); }

  // Records "file:line:column: <context>: <key>: <found>; expected <expected>".
  void Fail(const YAML::Node& at,
            const std::string& key,
            const std::string& found,
            const std::string& expected) {
    FailText(at.Mark(), key, found + "; expected " + expected);
  }
  void FailText(const YAML::Mark& mark, const std::string& key, const std::string& text) {
    const SourceLocation where = Where(mark);
    std::string message = where.ToString() + ": ";
    if (!context_.empty()) message += context_ + ": ";
    if (!key.empty()) message += key + ": ";
    message += text;
    problems_->Add(file_index_, where.line, where.column, std::move(message));
  }

  std::optional<Entries> ReadEntries(const YAML::Node& map,
                                     const std::string& key,
                                     const std::vector<std::string>& allowed);
  std::optional<double> ReadNumber(const YAML::Node& value,
                                   const std::string& key,
                                   const std::string& expected);
  std::optional<double> ReadPositive(const YAML::Node& value,
                                     const std::string& key,
                                     const std::string& what);
  std::optional<double> ReadAtLeast(const YAML::Node& value,
                                    const std::string& key,
                                    double minimum,
                                    const std::string& what);
  // A number within [minimum, maximum]; `what` names it ("a wavenumber in cm^-1").
  std::optional<double> ReadInRange(const YAML::Node& value,
                                    const std::string& key,
                                    double minimum,
                                    double maximum,
                                    const std::string& what);
  std::optional<int> ReadInteger(const YAML::Node& value,
                                 const std::string& key,
                                 const std::string& expected);
  std::optional<std::string> ReadString(const YAML::Node& value,
                                        const std::string& key,
                                        const std::string& expected);
  std::optional<double> ReadEnergy(const YAML::Node& value, const std::string& key);
  bool IsSequence(const YAML::Node& value, const std::string& key, const std::string& expected) {
    if (value.IsSequence()) return true;
    Fail(value, key, Describe(value), expected);
    return false;
  }

  std::optional<Defaults> ReadDefaults(const YAML::Node& node);
  // fit-objective, fit-extrapolation-guard and fit-error-scales of a defaults or species map,
  // over what *request already holds (error scales merged key by key).
  void ReadFitRequest(const Entries& entries, FitRequest* request);
  // A list of rotational constants (to cm^-1) or moments of inertia (to amu angstrom^2), each a
  // number with an optional unit.
  std::optional<std::vector<double>> ReadRotationalList(const YAML::Node& value,
                                                        const std::string& key,
                                                        bool moments);
  void ReadSpinMultiplicity(const Entry& entry, const Entries& entries, Species* species);
  // Kramers: an odd-electron species cannot have a single ground level.
  void CheckKramers(const YAML::Node& label_node, const Entries& entries, const Species& species);
  // True when `root` is a map whose first key is the format key with the supported version;
  // else records why (also: a file of the first layout, with the way to convert it).
  bool CheckFormat(const YAML::Node& root);
  bool ReadTemperatures(const YAML::Node& value, const std::string& key, TemperatureRanges* ranges);
  bool ReadThresholds(const YAML::Node& value,
                      const std::string& key,
                      QualityThresholds* thresholds);
  std::optional<double> ReadStandardPressure(const YAML::Node& value, const std::string& key);

  std::optional<Species> ReadSpecies(const YAML::Node& label_node,
                                     const YAML::Node& node,
                                     int index,
                                     const Defaults& defaults,
                                     std::vector<NameRecord>* names);
  // The species of a split file, or nullopt (nothing recorded) on any doubt or problem at all.
  std::optional<std::vector<Species>> ParseSplit(const SpeciesItemsSplit& split,
                                                 int num_jobs,
                                                 std::vector<NameRecord>* names);
  std::vector<Species> ParseWholeDocument(std::vector<NameRecord>* names);
  bool ReadFormula(const YAML::Node& value, Species* species);
  // Symmetry number, rotation, vibrations, electronic levels and the rest of the molecular data.
  void ReadMolecularData(SpeciesDraft* draft);
  void ReadRotation(SpeciesDraft* draft);
  std::optional<std::vector<GeometryAtom>> ReadGeometry(const YAML::Node& value);
  void ReadVibrations(SpeciesDraft* draft);
  void ReadElectronicLevels(const YAML::Node& value, Species* species);
  void ReadDiatomic(const Entry& entry, SpeciesDraft* draft);
  std::optional<DiatomicState> ReadDiatomicState(const YAML::Node& value,
                                                 const std::string& key,
                                                 bool list_form);
  void ReadNuclearSpin(const Entry& entry, SpeciesDraft* draft);
  void ReadTorsions(const Entry& entry, SpeciesDraft* draft);
  // tabulated-cp: the rows, the entropy anchor and the Wilhoit limits (section_readers.cc).
  void ReadTabulated(const Entry& entry, SpeciesDraft* draft);

  const std::string& text_;
  const std::string& file_name_;
  int file_index_;
  Problems* problems_;
  std::string context_;  // "defaults", "species 'CO2'", "species #3"; empty at the top level
  int line_offset_ = 0;  // lines of the file before text_, when text_ is one species item
  std::string defaults_canonical_;  // DefaultsCanonical of the file's defaults, "" without any
};

}  // namespace sevenfold::detail
