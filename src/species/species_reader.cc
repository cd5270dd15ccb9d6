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
#include "core/units.h"
#include "species/formula.h"
#include "species/canonical.h"
#include "species/file_text.h"
#include "species/geometry.h"
#include "species/item_split.h"
#include "species/species_schema.h"
#include "species/text_checks.h"

namespace sevenfold {
namespace {

// More problems than this are summarised in one closing line: beyond it the list stops helping.
constexpr std::size_t kMaxReportedProblems = 100;
using namespace schema;  // the bands and tolerances (species/species_schema.h)
using detail::AppendCanonical;
using detail::BadByte;
using detail::DefaultsCanonical;
using detail::FindBadByte;
using detail::SecondDocumentLine;
using detail::SpeciesItemsSplit;
using detail::SplitSpeciesItems;


// Allowed keys per map, in the order messages list them: from the key table.
const std::vector<std::string>& kTopKeys = KeysOf(KeySection::kTop);
const std::vector<std::string>& kDefaultsKeys = KeysOf(KeySection::kDefaults);
const std::vector<std::string>& kSpeciesKeys = KeysOf(KeySection::kSpecies);
const std::vector<std::string>& kTemperatureKeys = KeysOf(KeySection::kFitTemperatures);
const std::vector<std::string>& kThresholdKeys = KeysOf(KeySection::kFitThresholds);
const std::vector<std::string>& kErrorScaleKeys = KeysOf(KeySection::kFitErrorScales);
const std::vector<std::string>& kDiatomicKeys = KeysOf(KeySection::kRovibrationalMap);
const std::vector<std::string>& kDiatomicStateKeys = KeysOf(KeySection::kRovibrationalState);
const std::vector<std::string>& kNuclearSpinKeys = KeysOf(KeySection::kSpinStatistics);
const std::vector<std::string>& kTorsionKeys = KeysOf(KeySection::kHinderedRotor);

std::string JoinWords(const std::vector<std::string>& words) {
  std::string text;
  for (const std::string& word : words) {
    if (!text.empty()) text += ", ";
    text += word;
  }
  return text;
}

std::string Number(double value) { return fmt::format("{}", value); }

std::string NumberList(const std::vector<double>& values, const char* format = "{}") {
  std::string text = "[";
  for (std::size_t i = 0; i < values.size(); ++i) {
    if (i > 0) text += ", ";
    text += fmt::format(fmt::runtime(format), values[i]);
  }
  return text + "]";
}

std::string CompositionText(const std::map<std::string, int>& counts) {
  return FormatFormula(std::vector<std::pair<std::string, int>>(counts.begin(), counts.end()), 0);
}

// What a node holds, for "what was found" in messages.
std::string Describe(const YAML::Node& node) {
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
std::string ShapePhrase(Shape shape) {
  return shape == Shape::kAtom ? "an atom" : "a " + ToString(shape) + " species";
}

std::string Plural(std::size_t count, const std::string& noun) {
  return std::to_string(count) + " " + noun + (count == 1 ? "" : "s");
}

std::string ShapeCountRule(Shape shape, int num_atoms) {
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

  const std::string& text_;
  const std::string& file_name_;
  int file_index_;
  Problems* problems_;
  std::string context_;  // "defaults", "species 'CO2'", "species #3"; empty at the top level
  int line_offset_ = 0;  // lines of the file before text_, when text_ is one species item
  std::string defaults_canonical_;  // DefaultsCanonical of the file's defaults, "" without any
};

std::optional<Entries> FileParser::ReadEntries(const YAML::Node& map,
                                               const std::string& key,
                                               const std::vector<std::string>& allowed) {
  if (!map.IsMap()) {
    Fail(map, key, Describe(map), "a map with keys " + JoinWords(allowed));
    return std::nullopt;
  }
  Entries entries;
  std::vector<std::string> seen;
  for (auto it = map.begin(); it != map.end(); ++it) {
    const YAML::Node key_node = it->first;
    const std::string prefix = key.empty() ? "" : key + ".";
    if (!key_node.IsScalar()) {
      Fail(key_node, key, Describe(key_node) + " as a key", "one of " + JoinWords(allowed));
      continue;
    }
    const std::string name = key_node.Scalar();
    if (std::find(allowed.begin(), allowed.end(), name) == allowed.end()) {
      Fail(key_node, prefix + name, "unknown key", "one of " + JoinWords(allowed));
      continue;
    }
    if (std::find(seen.begin(), seen.end(), name) != seen.end()) {
      const Entry* first = entries.Find(name);
      Fail(key_node,
           prefix + name,
           "given twice (first at " + Where(first->key_node).ToString() + ")",
           "each key once");
      continue;
    }
    seen.push_back(name);
    entries.Add(Entry{name, key_node, it->second});
  }
  return entries;
}

std::optional<double> FileParser::ReadNumber(const YAML::Node& value,
                                             const std::string& key,
                                             const std::string& expected) {
  if (value.IsScalar()) {
    if (const std::optional<double> number = ParsePlainNumber(value.Scalar())) return number;
  }
  Fail(value, key, Describe(value), expected);
  return std::nullopt;
}

std::optional<double> FileParser::ReadPositive(const YAML::Node& value,
                                               const std::string& key,
                                               const std::string& what) {
  const std::optional<double> number = ReadNumber(value, key, "a positive " + what);
  if (!number) return std::nullopt;
  if (*number <= 0.0) {
    Fail(value, key, Number(*number) + " is not positive", "a positive " + what);
    return std::nullopt;
  }
  return number;
}

std::optional<double> FileParser::ReadAtLeast(const YAML::Node& value,
                                              const std::string& key,
                                              double minimum,
                                              const std::string& what) {
  const std::string expected = what + " of at least " + Number(minimum);
  const std::optional<double> number = ReadNumber(value, key, expected);
  if (!number) return std::nullopt;
  if (*number < minimum) {
    Fail(value, key, Number(*number), expected);
    return std::nullopt;
  }
  return number;
}

std::optional<double> FileParser::ReadInRange(const YAML::Node& value,
                                              const std::string& key,
                                              double minimum,
                                              double maximum,
                                              const std::string& what) {
  const std::string expected = what + " within [" + Number(minimum) + ", " + Number(maximum) + "]";
  const std::optional<double> number = ReadNumber(value, key, expected);
  if (!number) return std::nullopt;
  if (*number < minimum || *number > maximum) {
    Fail(value, key, Number(*number), expected);
    return std::nullopt;
  }
  return number;
}

std::optional<int> FileParser::ReadInteger(const YAML::Node& value,
                                           const std::string& key,
                                           const std::string& expected) {
  // Integers beyond this are never meaningful here and would overflow int.
  constexpr double kMaxMagnitude = 1.0e9;
  if (value.IsScalar()) {
    const std::optional<double> number = ParsePlainNumber(value.Scalar());
    if (number && std::floor(*number) == *number && std::fabs(*number) < kMaxMagnitude) {
      return static_cast<int>(*number);
    }
  }
  Fail(value, key, Describe(value), expected);
  return std::nullopt;
}

std::optional<std::string> FileParser::ReadString(const YAML::Node& value,
                                                  const std::string& key,
                                                  const std::string& expected) {
  if (value.IsScalar()) return value.Scalar();
  Fail(value, key, Describe(value), expected);
  return std::nullopt;
}

std::optional<double> FileParser::ReadEnergy(const YAML::Node& value, const std::string& key) {
  if (!value.IsScalar()) {
    Fail(value,
         key,
         Describe(value),
         "a molar energy such as '-110.53 kJ/mol' (kJ/mol, kcal/mol, J/mol, eV, cm^-1; a bare "
         "number means kJ/mol)");
    return std::nullopt;
  }
  std::string problem;
  const std::optional<double> energy = TryParseEnergyJPerMol(value.Scalar(), &problem);
  if (!energy) FailText(value.Mark(), key, problem);
  return energy;
}


std::optional<double> FileParser::ReadStandardPressure(const YAML::Node& value,
                                                       const std::string& key) {
  const std::string expected = "'1 bar' or '1 atm' (the two standard-state conventions)";
  if (!value.IsScalar()) {
    Fail(value, key, Describe(value), expected);
    return std::nullopt;
  }
  std::string problem;
  const std::optional<double> pressure_pa = TryParsePressurePa(value.Scalar(), &problem);
  if (!pressure_pa) {
    FailText(value.Mark(), key, problem);
    return std::nullopt;
  }
  for (const double standard : {constants::kStandardPressureBar, constants::kStandardPressureAtm}) {
    if (std::fabs(*pressure_pa - standard) <= kPressureRelativeTolerance * standard) {
      return standard;
    }
  }
  Fail(value, key, Describe(value) + " (" + Number(*pressure_pa) + " Pa)", expected);
  return std::nullopt;
}

bool FileParser::ReadTemperatures(const YAML::Node& value,
                                  const std::string& key,
                                  TemperatureRanges* ranges) {
  const std::size_t before = problems_->size();
  const std::optional<Entries> entries = ReadEntries(value, key, kTemperatureKeys);
  if (!entries) return false;
  const std::string range_text = "a temperature in kelvin within [" + Number(kMinTemperatureK) +
                                 ", " + Number(kMaxTemperatureK) + "]";
  auto read_kelvin = [&](const Entry& entry) -> std::optional<double> {
    const std::string sub_key = key + "." + entry.key;
    const std::optional<double> t_k = ReadNumber(
        entry.value, sub_key, entry.key == "mid" ? range_text + " or 'auto'" : range_text);
    if (!t_k) return std::nullopt;
    if (*t_k < kMinTemperatureK || *t_k > kMaxTemperatureK) {
      Fail(entry.value, sub_key, Number(*t_k) + " K", range_text);
      return std::nullopt;
    }
    return t_k;
  };
  if (const Entry* low = entries->Find("low")) {
    if (const auto t_k = read_kelvin(*low)) ranges->low_k = *t_k;
  }
  if (const Entry* high = entries->Find("high")) {
    if (const auto t_k = read_kelvin(*high)) ranges->high_k = *t_k;
  }
  if (const Entry* mid = entries->Find("mid")) {
    if (mid->value.IsScalar() && mid->value.Scalar() == "auto") {
      ranges->mid_k.reset();
    } else if (const auto t_k = read_kelvin(*mid)) {
      ranges->mid_k = *t_k;
    }
  }
  if (problems_->size() != before) return false;
  if (ranges->low_k >= ranges->high_k) {
    Fail(value,
         key,
         "low " + Number(ranges->low_k) + " K is not below high " + Number(ranges->high_k) + " K",
         "low < high");
    return false;
  }
  if (ranges->mid_k && (*ranges->mid_k <= ranges->low_k || *ranges->mid_k >= ranges->high_k)) {
    Fail(value,
         key,
         "mid " + Number(*ranges->mid_k) + " K is outside (" + Number(ranges->low_k) + ", " +
             Number(ranges->high_k) + ") K",
         "low < mid < high, or mid: auto");
    return false;
  }
  return true;
}

bool FileParser::ReadThresholds(const YAML::Node& value,
                                const std::string& key,
                                QualityThresholds* thresholds) {
  const std::optional<Entries> entries = ReadEntries(value, key, kThresholdKeys);
  if (!entries) return false;
  bool ok = true;
  const std::pair<const char*, double*> fields[] = {{"cp", &thresholds->max_cp_relative},
                                                    {"enthalpy", &thresholds->max_h_over_rt},
                                                    {"entropy", &thresholds->max_s_over_r}};
  for (const auto& [name, field] : fields) {
    if (const Entry* entry = entries->Find(name)) {
      const auto threshold = ReadPositive(entry->value, key + "." + name, "dimensionless number");
      if (threshold) {
        *field = *threshold;
      } else {
        ok = false;
      }
    }
  }
  return ok;
}

std::optional<Defaults> FileParser::ReadDefaults(const YAML::Node& node) {
  context_ = "defaults";
  Defaults defaults;
  const std::optional<Entries> entries = ReadEntries(node, "", kDefaultsKeys);
  if (entries) {
    if (const Entry* entry = entries->Find("fit-temperatures")) {
      ReadTemperatures(entry->value, "fit-temperatures", &defaults.temperatures);
      if (entry->value.IsMap() && entry->value["mid"]) defaults.fit_request.mid_given = true;
    }
    if (const Entry* entry = entries->Find("standard-pressure")) {
      if (const auto pressure_pa = ReadStandardPressure(entry->value, "standard-pressure")) {
        defaults.pressure_pa = *pressure_pa;
      }
    }
    if (const Entry* entry = entries->Find("fit-thresholds")) {
      ReadThresholds(entry->value, "fit-thresholds", &defaults.thresholds);
    }
    ReadFitRequest(*entries, &defaults.fit_request);
  }
  context_.clear();
  return defaults;
}

bool FileParser::ReadFormula(const YAML::Node& value, Species* species) {
  const std::string expected = "a chemical formula such as CH4, C2H5OH, (CH3)2CO or HCO+";
  if (!value.IsScalar()) {
    Fail(value, "formula", Describe(value), expected);
    return false;
  }
  FormulaError error;
  const std::optional<ParsedFormula> formula = ParseFormula(value.Scalar(), &error);
  if (!formula) {
    // Point at the offending character: the value's column, past an opening quote.
    YAML::Mark mark = value.Mark();
    const bool quoted = value.Tag() == "!";
    if (!mark.is_null()) mark.column += static_cast<int>(error.offset) + (quoted ? 1 : 0);
    FailText(mark,
             "formula",
             "'" + value.Scalar() + "': " + error.found + " at character " +
                 std::to_string(error.offset + 1) + "; expected " + error.expected);
    return false;
  }
  species->composition = formula->counts;
  species->charge = formula->charge;
  return true;
}

std::optional<std::vector<GeometryAtom>> FileParser::ReadGeometry(const YAML::Node& value) {
  const std::string expected_atom = "[symbol, x, y, z] with coordinates in angstrom";
  if (!IsSequence(value, "structure", "a list of atoms, each " + expected_atom)) {
    return std::nullopt;
  }
  if (value.size() == 0) {
    Fail(value, "structure", "an empty list", "a list of atoms, each " + expected_atom);
    return std::nullopt;
  }
  std::vector<GeometryAtom> atoms;
  bool ok = true;
  for (std::size_t i = 0; i < value.size(); ++i) {
    const YAML::Node item = value[i];
    const std::string key = "structure[" + std::to_string(i) + "]";
    if (!item.IsSequence() || item.size() != 4) {
      Fail(item, key, Describe(item), expected_atom);
      ok = false;
      continue;
    }
    GeometryAtom atom;
    const YAML::Node symbol = item[0];
    if (!symbol.IsScalar() || !AtomicWeightGPerMol(symbol.Scalar())) {
      Fail(symbol,
           key,
           "unknown element " + Describe(symbol),
           "one of " + JoinWords(KnownElementSymbols()));
      ok = false;
    } else {
      atom.element = symbol.Scalar();
    }
    double* coordinates[] = {&atom.x_angstrom, &atom.y_angstrom, &atom.z_angstrom};
    for (int k = 0; k < 3; ++k) {
      const auto coordinate = ReadInRange(item[k + 1],
                                          key,
                                          -kMaxCoordinateAngstrom,
                                          kMaxCoordinateAngstrom,
                                          "a coordinate in angstrom");
      if (coordinate) {
        *coordinates[k] = *coordinate;
      } else {
        ok = false;
      }
    }
    atoms.push_back(atom);
  }
  if (!ok) return std::nullopt;
  return atoms;
}

void FileParser::ReadRotation(SpeciesDraft* draft) {
  const YAML::Node& block = draft->label;
  const Entries& entries = *draft->entries;
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  const bool has_diatomic = draft->has_rovibrational;
  Species* species = &draft->species;
  const Entry* constants_entry = entries.Find("rotational-constants");
  const Entry* moments_entry = entries.Find("moments-of-inertia");
  const Entry* geometry_entry = entries.Find("structure");
  if (!shape_ok) return;  // counts and consistency depend on the shape

  if (species->shape == Shape::kAtom) {
    for (const Entry* entry : {constants_entry, moments_entry, geometry_entry}) {
      if (entry) {
        Fail(entry->key_node,
             entry->key,
             "given for an atom",
             "no rotational data for shape 'atom'");
      }
    }
    return;
  }
  const bool linear = species->shape == Shape::kLinear;
  const std::size_t num_expected = linear ? 1 : 3;
  const std::string count_rule =
      linear ? "1 value (B) for a linear species" : "3 values (A, B, C) for a nonlinear species";
  if (!constants_entry && !moments_entry && !geometry_entry) {
    if (has_diatomic) return;  // B comes from the diatomic constants
    Fail(block,
         "rotational-constants",
         "missing (none of rotational-constants, moments-of-inertia, structure given)",
         "one of them for a " + ToString(species->shape) + " species");
    return;
  }
  if (constants_entry && moments_entry) {
    Fail(moments_entry->key_node,
         "moments-of-inertia",
         "given together with rotational-constants",
         "only one of the two");
    return;
  }

  // Explicit constants (or moments) win over the geometry, which is then only a cross-check.
  std::optional<std::vector<double>> explicit_cm1;
  const Entry* explicit_entry = constants_entry ? constants_entry : moments_entry;
  if (explicit_entry) {
    const bool moments = explicit_entry == moments_entry;
    const auto values = ReadRotationalList(explicit_entry->value, explicit_entry->key, moments);
    if (values && values->size() != num_expected) {
      Fail(explicit_entry->value, explicit_entry->key, NumberList(*values), count_rule);
    } else if (values) {
      explicit_cm1 = *values;
      if (moments) {
        for (double& value : *explicit_cm1) {
          value = constants::kRotationalConstantTimesInertia / value;
        }
      }
      std::sort(explicit_cm1->begin(), explicit_cm1->end(), std::greater<double>());
    }
  }

  std::optional<std::vector<double>> geometry_cm1;
  if (geometry_entry) {
    const std::optional<std::vector<GeometryAtom>> atoms = ReadGeometry(geometry_entry->value);
    if (atoms) {
      species->geometry = *atoms;
      std::map<std::string, int> geometry_counts;
      for (const GeometryAtom& atom : *atoms) ++geometry_counts[atom.element];
      std::map<std::string, int> composition_counts(species->composition.begin(),
                                                    species->composition.end());
      if (composition_ok && geometry_counts != composition_counts) {
        Fail(geometry_entry->value,
             "structure",
             "atoms " + CompositionText(geometry_counts),
             "the atoms of the formula " + FormatFormula(species->composition, 0));
      } else if (composition_ok) {
        const RigidRotor rotor = AnalyzeGeometry(*atoms);
        if (rotor.shape == Shape::kAtom) {
          Fail(geometry_entry->value,
               "structure",
               "all atoms at one point",
               "distinct atomic positions");
        } else if (rotor.shape != species->shape) {
          Fail(geometry_entry->value,
               "structure",
               rotor.shape == Shape::kLinear ? "collinear atoms (a linear geometry)"
                                             : "atoms not on one line (a nonlinear geometry)",
               "a structure matching shape '" + ToString(species->shape) + "'");
        } else {
          geometry_cm1 = rotor.rotational_constants_cm1;
        }
      }
    }
  }

  // Both sources end in rotational constants; check those against the plausibility band.
  const std::string band = "rotational constants within [" + Number(kMinRotationalConstantCm1) +
                           ", " + Number(kMaxRotationalConstantCm1) + "] cm^-1";
  const auto outside_band = [](const std::vector<double>& values_cm1) {
    return std::any_of(values_cm1.begin(), values_cm1.end(), [](double b) {
      return !(b >= kMinRotationalConstantCm1 && b <= kMaxRotationalConstantCm1);
    });
  };
  if (explicit_cm1 && outside_band(*explicit_cm1)) {
    Fail(explicit_entry->value,
         explicit_entry->key,
         "rotational constants " + NumberList(*explicit_cm1, "{:.6g}") + " cm^-1",
         band);
    explicit_cm1.reset();
  }
  // A rigid body has I_C <= I_A + I_B, i.e. 1/C <= 1/A + 1/B (equality when planar). Ground-state
  // constants exceed it by the inertia defect, a few percent for light planar molecules (H2O:
  // 2.8 % with A, B, C = 27.88, 14.51, 9.28 cm^-1, from memory of NIST CCCBDB); the 25 % margin
  // only stops constants no molecule can have, on which the engine's sums give nonsense (a
  // negative Cp; docs/robustness.md).
  constexpr double kInertiaDefectMargin = 0.25;
  if (explicit_cm1 && explicit_cm1->size() == 3) {
    const double a = (*explicit_cm1)[0], b = (*explicit_cm1)[1], c = (*explicit_cm1)[2];
    if (1.0 / c > (1.0 / a + 1.0 / b) * (1.0 + kInertiaDefectMargin)) {
      Fail(explicit_entry->value,
           explicit_entry->key,
           "rotational constants " + NumberList(*explicit_cm1, "{:.6g}") +
               " cm^-1 with 1/C above 1/A + 1/B by " +
               fmt::format("{:.3g}", 100.0 * (c * (1.0 / a + 1.0 / b) < 1.0
                                                  ? 1.0 / (c * (1.0 / a + 1.0 / b)) - 1.0
                                                  : 0.0)) +
               " %",
           "constants of a rigid body: 1/C <= 1/A + 1/B (within " +
               Number(100.0 * kInertiaDefectMargin) + " % for the inertia defect)");
      explicit_cm1.reset();
    }
  }
  if (geometry_cm1 && outside_band(*geometry_cm1)) {
    Fail(geometry_entry->value,
         "structure",
         "rotational constants " + NumberList(*geometry_cm1, "{:.6g}") + " cm^-1",
         band);
    geometry_cm1.reset();
  }
  if (explicit_cm1 && geometry_cm1) {
    double worst = 0.0;
    for (std::size_t k = 0; k < explicit_cm1->size(); ++k) {
      worst =
          std::max(worst, std::fabs((*explicit_cm1)[k] - (*geometry_cm1)[k]) / (*geometry_cm1)[k]);
    }
    if (worst > kGeometryConstantsRelativeTolerance) {
      Fail(explicit_entry->value,
           explicit_entry->key,
           "rotational constants " + NumberList(*explicit_cm1, "{:.6g}") +
               " cm^-1 differ from the structure's " + NumberList(*geometry_cm1, "{:.6g}") +
               " cm^-1 by up to " + fmt::format("{:.3g}", 100.0 * worst) + " %",
           "agreement within " + Number(100.0 * kGeometryConstantsRelativeTolerance) + " %");
    }
  }
  if (explicit_cm1) {
    species->rotational_constants_cm1 = *explicit_cm1;
  } else if (geometry_cm1) {
    species->rotational_constants_cm1 = *geometry_cm1;
  }
}

void FileParser::ReadVibrations(SpeciesDraft* draft) {
  const YAML::Node& block = draft->label;
  const Entries& entries = *draft->entries;
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  const bool has_diatomic = draft->has_rovibrational;
  Species* species = &draft->species;
  const Entry* entry = entries.Find("vibrations");
  const int num_atoms = species->NumAtoms();
  if (!entry) {
    if (shape_ok && composition_ok && species->shape != Shape::kAtom && !has_diatomic) {
      Fail(block,
           "vibrations",
           "missing",
           "a list of " + ShapeCountRule(species->shape, num_atoms) +
               " harmonic wavenumbers in cm^-1");
    }
    return;
  }
  const std::string expected = "a positive wavenumber in cm^-1";
  if (!IsSequence(entry->value, "vibrations", "a list of harmonic wavenumbers in cm^-1")) return;
  bool ok = true;
  std::vector<double> wavenumbers;
  for (std::size_t i = 0; i < entry->value.size(); ++i) {
    const YAML::Node item = entry->value[i];
    const std::string key = "vibrations[" + std::to_string(i) + "]";
    const std::optional<double> wavenumber = ReadNumber(item, key, expected);
    if (!wavenumber) {
      ok = false;
    } else if (*wavenumber < 0.0) {
      Fail(item,
           key,
           Number(*wavenumber) +
               " cm^-1 is negative, an imaginary mode (a saddle point such as a transition "
               "state, not a minimum)",
           expected);
      ok = false;
    } else if (*wavenumber == 0.0) {
      Fail(item, key, "0 cm^-1", expected + " (translations and rotations are not listed)");
      ok = false;
    } else if (*wavenumber < kMinWavenumberCm1 || *wavenumber > kMaxWavenumberCm1) {
      Fail(item,
           key,
           Number(*wavenumber) + " cm^-1",
           "a wavenumber within [" + Number(kMinWavenumberCm1) + ", " +
               Number(kMaxWavenumberCm1) + "] cm^-1");
      ok = false;
    } else {
      wavenumbers.push_back(*wavenumber);
    }
  }
  if (shape_ok && composition_ok) {
    const int num_expected = species->shape == Shape::kAtom     ? 0
                             : species->shape == Shape::kLinear ? 3 * num_atoms - 5
                                                                : 3 * num_atoms - 6;
    if (num_expected >= 0 && static_cast<int>(entry->value.size()) != num_expected) {
      Fail(entry->value,
           "vibrations",
           Plural(entry->value.size(), "wavenumber"),
           ShapeCountRule(species->shape, num_atoms));
      ok = false;
    }
  }
  if (ok) species->vibrations_cm1 = wavenumbers;
}

void FileParser::ReadElectronicLevels(const YAML::Node& value, Species* species) {
  const std::string expected_level = "[energy in cm^-1, degeneracy]";
  if (!IsSequence(value, "electronic-levels", "a list of levels, each " + expected_level)) return;
  if (value.size() == 0) {
    Fail(value, "electronic-levels", "an empty list", "at least the ground level [0, g]");
    return;
  }
  std::vector<ElectronicLevel> levels;
  bool ok = true;
  for (std::size_t i = 0; i < value.size(); ++i) {
    const YAML::Node item = value[i];
    const std::string key = "electronic-levels[" + std::to_string(i) + "]";
    if (!item.IsSequence() || item.size() != 2) {
      Fail(item, key, Describe(item), expected_level);
      ok = false;
      continue;
    }
    ElectronicLevel level;
    const auto energy = ReadNumber(item[0], key, "an energy in cm^-1");
    const auto degeneracy = ReadNumber(item[1], key, "a positive degeneracy");
    if (!energy || !degeneracy) {
      ok = false;
      continue;
    }
    if (i == 0 && *energy != 0.0) {
      Fail(item[0],
           key,
           "ground level at " + Number(*energy) + " cm^-1",
           "the first level at 0 cm^-1 (energies are measured from the ground level)");
      ok = false;
    } else if (*energy < 0.0) {
      Fail(item[0],
           key,
           Number(*energy) + " cm^-1, below the ground level",
           "an energy of at least 0 cm^-1");
      ok = false;
    }
    if (*degeneracy < 0.0) {
      Fail(item[1], key, "negative degeneracy " + Number(*degeneracy), "a positive degeneracy");
      ok = false;
    } else if (*degeneracy == 0.0) {
      Fail(item[1], key, "degeneracy 0", "a positive degeneracy");
      ok = false;
    } else if (*degeneracy > kMaxDegeneracy) {
      Fail(item[1],
           key,
           "degeneracy " + Number(*degeneracy),
           "a degeneracy of at most " + Number(kMaxDegeneracy));
      ok = false;
    }
    level.energy_cm1 = *energy;
    level.degeneracy = *degeneracy;
    levels.push_back(level);
  }
  if (ok) species->electronic_levels = levels;
}

std::optional<DiatomicState> FileParser::ReadDiatomicState(const YAML::Node& value,
                                                           const std::string& key,
                                                           bool list_form) {
  const std::size_t before = problems_->size();
  const auto entries = ReadEntries(value, key, list_form ? kDiatomicStateKeys : kDiatomicKeys);
  if (!entries) return std::nullopt;
  DiatomicState state;
  DiatomicConstants& c = state.constants;
  struct Field {
    const char* name;
    double* target;
    bool required;
    int sign;  // 1: must be > 0; 0: >= 0; -1: any finite value
  };
  const Field fields[] = {
      {"we", &c.we_cm1, true, 1},
      {"wexe", &c.wexe_cm1, false, -1},
      {"weye", &c.weye_cm1, false, -1},
      {"Be", &c.be_cm1, true, 1},
      {"alphae", &c.alphae_cm1, false, -1},
      {"gammae", &c.gammae_cm1, false, -1},
      {"De", &c.de_cm1, false, 0},
      {"dissociation-energy", &c.dissociation_cm1, true, 1},
      {"energy", &state.energy_cm1, false, 0},
      {"degeneracy", &state.degeneracy, false, 1},
  };
  for (const Field& field : fields) {
    const std::string sub_key = key + "." + field.name;
    const Entry* entry = entries->Find(field.name);
    if (!entry) {
      if (field.required) {
        Fail(value, sub_key, "missing", field.sign > 0 ? "a positive value in cm^-1" : "a value");
      }
      continue;
    }
    const std::string unit =
        std::string(field.name) == "degeneracy" ? "degeneracy" : "value in cm^-1";
    std::optional<double> number;
    if (field.sign > 0) {
      number = ReadPositive(entry->value, sub_key, unit);
    } else if (field.sign == 0) {
      number = ReadAtLeast(entry->value, sub_key, 0.0, "a " + unit);
    } else {
      number = ReadNumber(entry->value, sub_key, "a " + unit);
    }
    const double bound =
        std::string(field.name) == "degeneracy" ? kMaxDegeneracy : kMaxSpectroscopicConstantCm1;
    if (number && std::fabs(*number) > bound) {
      Fail(entry->value,
           sub_key,
           Number(*number),
           "a " + unit + " of magnitude at most " + Number(bound));
    } else if (number) {
      *field.target = *number;
    }
  }
  // A centrifugal constant comparable to Be leaves no bound rotational ladder worth the name
  // (real molecules have De/Be ~ 4 Be^2/we^2 < 1e-3; H2, the extreme, 8e-4): the engine would
  // silently treat the species as structureless.
  if (problems_->size() == before && c.de_cm1 > kMaxCentrifugalToRotational * c.be_cm1) {
    if (const Entry* de = entries->Find("De")) {
      Fail(de->value, key + ".De", Number(c.de_cm1),
           "a value below " + Number(kMaxCentrifugalToRotational) + " Be = " +
               Number(kMaxCentrifugalToRotational * c.be_cm1) + " cm^-1");
    }
  }
  if (problems_->size() != before) return std::nullopt;
  return state;
}

void FileParser::ReadDiatomic(const Entry& entry, SpeciesDraft* draft) {
  const Entries& entries = *draft->entries;
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  Species* species = &draft->species;
  if (composition_ok && shape_ok &&
      (species->shape != Shape::kLinear || species->NumAtoms() != 2)) {
    Fail(entry.key_node,
         "rovibrational-constants",
         "given for " + ShapePhrase(species->shape) +
             (species->shape == Shape::kAtom ? "" : " of " + Plural(species->NumAtoms(), "atom")),
         "a diatomic (shape linear, 2 atoms)");
    return;
  }
  if (entry.value.IsMap()) {
    std::optional<DiatomicState> state =
        ReadDiatomicState(entry.value, "rovibrational-constants", /*list_form=*/false);
    if (!state) return;
    // Map form: the ground electronic state; its degeneracy is that of the ground level.
    state->degeneracy = species->electronic_levels.front().degeneracy;
    species->diatomic_states = {*state};
    return;
  }
  if (!IsSequence(entry.value,
                  "rovibrational-constants",
                  "a map of constants, or a list of maps, one per electronic state")) {
    return;
  }
  if (entry.value.size() == 0) {
    Fail(entry.value, "rovibrational-constants", "an empty list", "at least the ground state");
    return;
  }
  if (const Entry* levels = entries.Find("electronic-levels")) {
    Fail(levels->key_node,
         "electronic-levels",
         "given together with the list form of rovibrational-constants",
         "the electronic states only in rovibrational-constants (energy, degeneracy)");
  }
  std::vector<DiatomicState> states;
  bool ok = true;
  for (std::size_t i = 0; i < entry.value.size(); ++i) {
    const std::string key = "rovibrational-constants[" + std::to_string(i) + "]";
    const auto state = ReadDiatomicState(entry.value[i], key, /*list_form=*/true);
    if (!state) {
      ok = false;
      continue;
    }
    if (i == 0 && state->energy_cm1 != 0.0) {
      Fail(entry.value[i],
           key + ".energy",
           "ground state at " + Number(state->energy_cm1) + " cm^-1",
           "the first state at energy 0 cm^-1");
      ok = false;
    }
    states.push_back(*state);
  }
  if (!ok) return;
  species->diatomic_states = states;
  species->electronic_levels.clear();
  for (const DiatomicState& state : states) {
    species->electronic_levels.push_back(ElectronicLevel{state.energy_cm1, state.degeneracy});
  }
}

void FileParser::ReadNuclearSpin(const Entry& entry, SpeciesDraft* draft) {
  const bool composition_ok = draft->formula_ok, shape_ok = draft->shape_ok;
  Species* species = &draft->species;
  if (composition_ok && shape_ok &&
      (species->shape != Shape::kLinear || species->composition.size() != 1 ||
       species->composition.front().second != 2)) {
    Fail(entry.key_node,
         "spin-statistics",
         "given for a species that is not a homonuclear diatomic",
         "spin-statistics only for a homonuclear diatomic such as H2 or D2");
    return;
  }
  const auto entries = ReadEntries(entry.value, "spin-statistics", kNuclearSpinKeys);
  if (!entries) return;
  NuclearSpin spin;
  bool ok = true;
  for (const auto& [name, target] :
       {std::pair<const char*, double*>{"even-j", &spin.even_weight}, {"odd-j", &spin.odd_weight}}) {
    const Entry* weight = entries->Find(name);
    const std::string key = std::string("spin-statistics.") + name;
    if (!weight) {
      Fail(entry.value, key, "missing", "a nuclear-spin weight of at least 0");
      ok = false;
      continue;
    }
    const auto value =
        ReadInRange(weight->value, key, 0.0, kMaxDegeneracy, "a nuclear-spin weight");
    if (value) {
      *target = *value;
    } else {
      ok = false;
    }
  }
  if (ok && spin.even_weight == 0.0 && spin.odd_weight == 0.0) {
    Fail(entry.value, "spin-statistics", "both weights 0", "at least one positive weight");
    ok = false;
  }
  if (const Entry* mixture = entries->Find("mixture")) {
    const auto text = ReadString(mixture->value, "spin-statistics.mixture", "equilibrium or normal");
    const std::optional<SpinMixture> parsed = text ? ParseSpinMixture(*text) : std::nullopt;
    if (text && !parsed) {
      Fail(mixture->value,
           "spin-statistics.mixture",
           Describe(mixture->value),
           "equilibrium or normal");
    }
    if (parsed) {
      spin.mixture = *parsed;
    } else {
      ok = false;
    }
  }
  if (ok) species->nuclear_spin = spin;
}

void FileParser::ReadTorsions(const Entry& entry, SpeciesDraft* draft) {
  const bool shape_ok = draft->shape_ok;
  // Modes can be matched only when the vibrations and the atom count behind them read cleanly.
  const bool vibrations_ok = draft->vibrations_ok && draft->formula_ok;
  Species* species = &draft->species;
  if (shape_ok && species->shape != Shape::kNonlinear) {
    Fail(entry.key_node,
         "hindered-rotors",
         "given for " + ShapePhrase(species->shape),
         "hindered-rotors only for a nonlinear species");
    return;
  }
  if (!IsSequence(entry.value, "hindered-rotors", "a list of maps with keys " + JoinWords(kTorsionKeys))) {
    return;
  }
  std::vector<bool> replaced(species->vibrations_cm1.size(), false);
  std::vector<Torsion> torsions;
  bool all_ok = true;
  for (std::size_t i = 0; i < entry.value.size(); ++i) {
    const YAML::Node item = entry.value[i];
    const std::string key = "hindered-rotors[" + std::to_string(i) + "]";
    const std::size_t before = problems_->size();
    const auto entries = ReadEntries(item, key, kTorsionKeys);
    if (!entries) {
      all_ok = false;
      continue;
    }
    Torsion torsion;
    if (const Entry* replaces = entries->Find("replaces")) {
      const auto wavenumber =
          ReadPositive(replaces->value, key + ".replaces", "wavenumber in cm^-1");
      if (wavenumber) {
        torsion.replaces_cm1 = *wavenumber;
        if (vibrations_ok) {
          // The closest listed vibration not yet taken by another torsion.
          std::optional<std::size_t> match;
          for (std::size_t k = 0; k < species->vibrations_cm1.size(); ++k) {
            const double distance = std::fabs(species->vibrations_cm1[k] - *wavenumber);
            if (!replaced[k] && distance <= kTorsionMatchToleranceCm1 &&
                (!match || distance < std::fabs(species->vibrations_cm1[*match] - *wavenumber))) {
              match = k;
            }
          }
          if (match) {
            replaced[*match] = true;
            torsion.mode_index = static_cast<int>(*match);
          } else {
            Fail(replaces->value,
                 key + ".replaces",
                 Number(*wavenumber) + " cm^-1 matches no vibration (or one already replaced)",
                 "one of the wavenumbers listed in vibrations, within " +
                     Number(kTorsionMatchToleranceCm1) + " cm^-1");
          }
        }
      }
    } else {
      Fail(item, key + ".replaces", "missing", "the wavenumber of the vibration it replaces");
    }

    const Entry* moment = entries->Find("reduced-moment");
    const Entry* constant = entries->Find("rotational-constant");
    if (moment && constant) {
      Fail(constant->key_node,
           key + ".rotational-constant",
           "given together with reduced-moment",
           "only one of the two");
    } else if (moment) {
      const auto i_red = ReadPositive(
          moment->value, key + ".reduced-moment", "reduced moment of inertia in amu*angstrom^2");
      if (i_red) {
        const double b_cm1 = constants::kRotationalConstantTimesInertia / *i_red;
        if (b_cm1 < kMinRotationalConstantCm1 || b_cm1 > kMaxRotationalConstantCm1) {
          Fail(moment->value,
               key + ".reduced-moment",
               Number(*i_red) + " amu*angstrom^2 (B = " + fmt::format("{:.6g}", b_cm1) +
                   " cm^-1)",
               "a reduced moment giving B within [" + Number(kMinRotationalConstantCm1) + ", " +
                   Number(kMaxRotationalConstantCm1) + "] cm^-1");
        } else {
          torsion.rotational_constant_cm1 = b_cm1;
        }
      }
    } else if (constant) {
      const auto b = ReadInRange(constant->value,
                                 key + ".rotational-constant",
                                 kMinRotationalConstantCm1,
                                 kMaxRotationalConstantCm1,
                                 "a rotational constant in cm^-1");
      if (b) torsion.rotational_constant_cm1 = *b;
    } else {
      Fail(item,
           key + ".reduced-moment",
           "missing (neither reduced-moment nor rotational-constant)",
           "one of the two");
    }

    if (const Entry* symmetry = entries->Find("symmetry-number")) {
      const auto n =
          ReadInteger(symmetry->value, key + ".symmetry-number", "a whole number of at least 1");
      if (n && *n < 1) {
        Fail(
            symmetry->value, key + ".symmetry-number", std::to_string(*n), "a whole number of at least 1");
      } else if (n) {
        torsion.symmetry = *n;
      }
    }

    const Entry* barrier = entries->Find("barrier-height");
    const Entry* fourier = entries->Find("cosine-terms");
    if (barrier && fourier) {
      Fail(fourier->key_node,
           key + ".cosine-terms",
           "given together with barrier-height",
           "only one of the two");
    } else if (barrier) {
      const auto v0 = ReadEnergy(barrier->value, key + ".barrier-height");
      if (v0 && *v0 < 0.0) {
        Fail(barrier->value,
             key + ".barrier-height",
             Describe(barrier->value) + " is negative",
             "a barrier height of at least 0");
      } else if (v0 && *v0 > kMaxTorsionBarrierJPerMol) {
        Fail(barrier->value,
             key + ".barrier-height",
             Describe(barrier->value),
             "a barrier height of at most " + Number(kMaxTorsionBarrierJPerMol * 1.0e-3) +
                 " kJ/mol");
      } else if (v0) {
        torsion.fourier_j_per_mol = {{torsion.symmetry, *v0}};
      }
    } else if (fourier) {
      const std::string term_text = "[k, V_k] with k a whole number >= 1 and V_k a molar energy";
      if (IsSequence(fourier->value, key + ".cosine-terms", "a list of terms " + term_text)) {
        for (std::size_t t = 0; t < fourier->value.size(); ++t) {
          const YAML::Node term = fourier->value[t];
          const std::string term_key = key + ".cosine-terms[" + std::to_string(t) + "]";
          if (!term.IsSequence() || term.size() != 2) {
            Fail(term, term_key, Describe(term), term_text);
            continue;
          }
          const auto k = ReadInteger(term[0], term_key, "a whole number of at least 1");
          const auto v_k = ReadEnergy(term[1], term_key);
          if (k && *k < 1) {
            Fail(term[0], term_key, std::to_string(*k), "a whole number of at least 1");
          } else if (v_k && std::fabs(*v_k) > kMaxTorsionBarrierJPerMol) {
            Fail(term[1],
                 term_key,
                 Describe(term[1]),
                 "a term of magnitude at most " + Number(kMaxTorsionBarrierJPerMol * 1.0e-3) +
                     " kJ/mol");
          } else if (k && v_k) {
            const bool repeated =
                std::any_of(torsion.fourier_j_per_mol.begin(),
                            torsion.fourier_j_per_mol.end(),
                            [&](const auto& existing) { return existing.first == *k; });
            if (repeated) {
              Fail(term[0], term_key, "k = " + std::to_string(*k) + " given twice", "each k once");
            } else {
              torsion.fourier_j_per_mol.emplace_back(*k, *v_k);
            }
          }
        }
      }
    } else {
      Fail(item,
           key + ".barrier-height",
           "missing (neither barrier-height nor cosine-terms)",
           "one of the two (barrier-height: 0 for a free rotor)");
    }
    if (problems_->size() != before) {
      all_ok = false;
    } else {
      torsions.push_back(torsion);
    }
  }
  if (all_ok) species->torsions = torsions;
}

void FileParser::ReadFitRequest(const Entries& entries, FitRequest* request) {
  if (const Entry* entry = entries.Find("fit-objective")) {
    const std::string expected = "minimax or least-squares";
    const auto text = ReadString(entry->value, entry->key, expected);
    const std::optional<FitObjective> objective = text ? ParseFitObjective(*text) : std::nullopt;
    if (objective) {
      request->objective = objective;
    } else if (text) {
      Fail(entry->value, entry->key, Describe(entry->value), expected);
    }
  }
  if (const Entry* entry = entries.Find("fit-extrapolation-guard")) {
    const std::string expected =
        "off, or FACTOR:BAND such as 1.25:0.2 (1 < FACTOR <= 4, 0 < BAND <= 1)";
    const auto text = ReadString(entry->value, entry->key, expected);
    const std::optional<ExtrapolationGuard> guard =
        text ? ParseExtrapolationGuard(*text) : std::nullopt;
    if (guard) {
      request->extrapolation_guard = guard;
    } else if (text) {
      Fail(entry->value, entry->key, Describe(entry->value), expected);
    }
  }
  if (const Entry* entry = entries.Find("fit-error-scales")) {
    const std::optional<Entries> scales = ReadEntries(entry->value, entry->key, kErrorScaleKeys);
    if (!scales) return;
    ErrorScales merged = request->error_scales.value_or(ErrorScales{});
    bool ok = true;
    const std::pair<const char*, double*> fields[] = {{"cp", &merged.cp_relative},
                                                      {"enthalpy", &merged.h_over_rt},
                                                      {"entropy", &merged.s_over_r}};
    for (const auto& [name, field] : fields) {
      if (const Entry* scale = scales->Find(name)) {
        const auto value = ReadPositive(scale->value, entry->key + "." + name, "dimensionless weight");
        if (value) {
          *field = *value;
        } else {
          ok = false;
        }
      }
    }
    if (ok) request->error_scales = merged;
  }
}

std::optional<std::vector<double>> FileParser::ReadRotationalList(const YAML::Node& value,
                                                                  const std::string& key,
                                                                  bool moments) {
  // Unit factors to the stored unit: cm^-1 for constants (a frequency nu in Hz is
  // B = nu / (100 c) cm^-1), amu angstrom^2 for moments.
  struct Unit {
    const char* name;
    double factor;
  };
  constexpr double kHzToCm1 = 1.0 / (100.0 * constants::kSpeedOfLight);
  static const Unit kConstantUnits[] = {{"cm^-1", 1.0}, {"GHz", 1.0e9 * kHzToCm1},
                                        {"MHz", 1.0e6 * kHzToCm1}};
  static const Unit kMomentUnits[] = {{"amu*A^2", 1.0},
                                      {"amu A^2", 1.0},
                                      {"amu*angstrom^2", 1.0},
                                      {"kg*m^2", 1.0 / constants::kAmuAngstrom2},
                                      {"kg m^2", 1.0 / constants::kAmuAngstrom2}};
  const std::string what = moments ? "moment of inertia (a number in amu*A^2, or with one of "
                                     "the units amu*A^2, kg*m^2)"
                                   : "rotational constant (a number in cm^-1, or with one of the "
                                     "units cm^-1, GHz, MHz)";
  if (!IsSequence(value, key, "a list of positive values, each a " + what)) return std::nullopt;
  std::vector<double> numbers;
  bool ok = true;
  for (std::size_t i = 0; i < value.size(); ++i) {
    const YAML::Node item = value[i];
    const std::string item_key = key + "[" + std::to_string(i) + "]";
    std::optional<double> number;
    if (item.IsScalar()) {
      const std::string& text = item.Scalar();
      number = ParsePlainNumber(text);
      if (!number) {
        const std::size_t split = text.find_first_of(" akgcGM");
        const std::optional<double> magnitude =
            split == std::string::npos ? std::nullopt : ParsePlainNumber(text.substr(0, split));
        std::string unit = split == std::string::npos ? "" : text.substr(split);
        unit.erase(0, unit.find_first_not_of(' '));
        if (magnitude) {
          const Unit* begin = moments ? std::begin(kMomentUnits) : std::begin(kConstantUnits);
          const Unit* end = moments ? std::end(kMomentUnits) : std::end(kConstantUnits);
          for (const Unit* known = begin; known != end; ++known) {
            if (unit == known->name) number = *magnitude * known->factor;
          }
        }
      }
    }
    if (!number || !std::isfinite(*number)) {
      Fail(item, item_key, Describe(item), "a positive " + what);
      ok = false;
    } else if (*number <= 0.0) {
      Fail(item, item_key, Describe(item) + " is not positive", "a positive " + what);
      ok = false;
    } else {
      numbers.push_back(*number);
    }
  }
  if (!ok) return std::nullopt;
  return numbers;
}

void FileParser::ReadSpinMultiplicity(const Entry& entry, const Entries& entries, Species* species) {
  if (entries.Find("electronic-levels")) {
    Fail(entry.key_node,
         entry.key,
         "given together with electronic-levels (its first level is the ground level)",
         "only one of the two: spin-multiplicity is a single ground level of degeneracy 2S+1");
    return;
  }
  if (const Entry* states = entries.Find("rovibrational-constants");
      states && states->value.IsSequence()) {
    Fail(entry.key_node,
         entry.key,
         "given together with the list form of rovibrational-constants",
         "the ground-state degeneracy only in rovibrational-constants[0].degeneracy");
    return;
  }
  const auto multiplicity = ReadInteger(entry.value, entry.key, "a whole number 2S+1 of at least 1");
  if (!multiplicity) return;
  if (*multiplicity < 1 || *multiplicity > kMaxDegeneracy) {
    Fail(entry.value,
         entry.key,
         std::to_string(*multiplicity),
         "a whole number 2S+1 within [1, " + Number(kMaxDegeneracy) + "]");
    return;
  }
  species->electronic_levels = {ElectronicLevel{0.0, static_cast<double>(*multiplicity)}};
}

void FileParser::CheckKramers(const YAML::Node& label_node,
                              const Entries& entries,
                              const Species& species) {
  const int electrons = species.NumElectrons();
  if (electrons % 2 == 0 || species.electronic_levels.empty() ||
      species.electronic_levels.front().degeneracy != 1.0) {
    return;
  }
  // Point at what set the ground level: the explicit level, the multiplicity, or the label.
  YAML::Node at = label_node;
  std::string key = "electronic-levels";
  std::string how = "(by default)";
  if (const Entry* levels = entries.Find("electronic-levels");
      levels && levels->value.IsSequence() && levels->value.size() > 0) {
    at = levels->value[0];
    key = "electronic-levels[0]";
    how = "(given)";
  } else if (const Entry* multiplicity = entries.Find("spin-multiplicity")) {
    at = multiplicity->value;
    key = "spin-multiplicity";
    how = "(given)";
  } else if (const Entry* states = entries.Find("rovibrational-constants");
             states && states->value.IsSequence() && states->value.size() > 0) {
    at = states->value[0];
    key = "rovibrational-constants[0].degeneracy";
  }
  Fail(at,
       key,
       "ground-level degeneracy 1 " + how + " for a species of " + std::to_string(electrons) +
           " electrons (an odd number: by Kramers' theorem every level is at least doubly "
           "degenerate)",
       "an odd-electron species needs its ground-state degeneracy: add electronic-levels or "
       "spin-multiplicity (2 for a doublet radical such as CH3)");
}

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
  const YAML::Node& version = first->second;
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
  // Electronic levels first: the map form of diatomic-constants takes the ground degeneracy.
  const Entry* levels_entry = entries.Find("electronic-levels");
  if (levels_entry) ReadElectronicLevels(levels_entry->value, &species);
  if (const Entry* entry = entries.Find("spin-multiplicity")) {
    ReadSpinMultiplicity(*entry, entries, &species);
  }
  if (diatomic_entry) ReadDiatomic(*diatomic_entry, &draft);
  draft.has_rovibrational = diatomic_entry != nullptr;
  const bool has_diatomic = draft.has_rovibrational;

  ReadRotation(&draft);
  if (has_diatomic && species.rotational_constants_cm1.empty() &&
      !species.diatomic_states.empty()) {
    // Rigid-rotor stand-in: B_0 = B_e - alpha_e / 2 of the ground state.
    const DiatomicConstants& ground = species.diatomic_states.front().constants;
    species.rotational_constants_cm1 = {ground.be_cm1 - 0.5 * ground.alphae_cm1};
  }
  const std::size_t before_vibrations = problems_->size();
  ReadVibrations(&draft);
  draft.vibrations_ok = problems_->size() == before_vibrations;

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
  if (const Entry* entry = entries.Find("spin-statistics")) {
    ReadNuclearSpin(*entry, &draft);
  }
  if (const Entry* entry = entries.Find("hindered-rotors")) {
    ReadTorsions(*entry, &draft);
  }

  if (problems_->size() == before && composition_ok) CheckKramers(label_node, entries, species);
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
  if (const std::optional<BadByte> bad = FindBadByte(text_)) {
    const SourceLocation where{file_name_, bad->line, bad->column};
    problems_->Add(file_index_,
                   bad->line,
                   bad->column,
                   where.ToString() +
                       fmt::format(": found the byte 0x{:02x}, {}; expected UTF-8 text",
                                   static_cast<unsigned>(bad->byte),
                                   bad->control ? "a control character YAML does not allow"
                                                : "which is not valid UTF-8"));
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

}  // namespace

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
    std::string problem;
    const std::optional<std::string> text = detail::ReadSpeciesFileText(paths[i], &problem);
    if (!text) {
      problems.Add(file_index, 0, 0, problem);
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
