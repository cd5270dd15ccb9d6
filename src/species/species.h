// SPDX-License-Identifier: MIT
// The molecular data of one species, as read and validated from a species file.
// Plain data in fixed units (named in each field); species_reader.h fills it.
#pragma once

#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/error.h"
#include "core/fit_settings.h"

namespace sevenfold {

enum class Shape { kAtom, kLinear, kNonlinear };
// "atom", "linear", "nonlinear"; ParseShape returns nullopt for anything else.
std::string ToString(Shape shape);
std::optional<Shape> ParseShape(const std::string& text);

// The temperatures of a two-range fit, kelvin. mid_k empty means "auto": the fitter chooses.
struct TemperatureRanges {
  double low_k = 200.0;
  std::optional<double> mid_k;
  double high_k = 6000.0;
};

// What the species file asks of the fit beyond the temperatures and thresholds. An empty
// optional means the file says nothing: then the command line, then (for `check`) what the
// committed entry records, then the default decides (docs/fitting.md).
struct FitRequest {
  // True when the file sets the mid temperature (a value or auto) for this species or in its
  // defaults; false when TemperatureRanges::mid_k is only the built-in default.
  bool mid_given = false;
  std::optional<FitObjective> objective;
  std::optional<ExtrapolationGuard> extrapolation_guard;
  std::optional<ErrorScales> error_scales;
};

struct ElectronicLevel {
  double energy_cm1 = 0.0;
  double degeneracy = 1.0;
};

// Dunham-type constants of a diatomic electronic state, cm^-1 (issue: rovibrational direct sum).
struct DiatomicConstants {
  double we_cm1 = 0.0;
  double wexe_cm1 = 0.0;
  double weye_cm1 = 0.0;
  double be_cm1 = 0.0;
  double alphae_cm1 = 0.0;
  double gammae_cm1 = 0.0;
  double de_cm1 = 0.0;             // centrifugal distortion D_e
  double dissociation_cm1 = 0.0;   // D_0 measured from the v=0, J=0 level of this state
};

// One electronic state with its own diatomic constants (list form of rovibrational-constants).
struct DiatomicState {
  double energy_cm1 = 0.0;  // T_e-like term value of the state's v=0,J=0 level above the ground's
  double degeneracy = 1.0;
  DiatomicConstants constants;
};

enum class SpinMixture { kEquilibrium, kNormal };
std::string ToString(SpinMixture mixture);
std::optional<SpinMixture> ParseSpinMixture(const std::string& text);

// Nuclear-spin weights of even and odd J for a homonuclear diatomic.
struct NuclearSpin {
  double even_weight = 1.0;
  double odd_weight = 1.0;
  SpinMixture mixture = SpinMixture::kEquilibrium;
};

// A 1-D hindered internal rotor replacing one harmonic mode.
struct Torsion {
  double replaces_cm1 = 0.0;            // wavenumber of the vibration it replaces, as written
  // Index into Species::vibrations_cm1 of the mode it replaces, resolved once by the reader
  // (within its stated tolerance, docs/species-schema.md); -1 when unresolved. The engine uses
  // this index and never matches wavenumbers itself.
  int mode_index = -1;
  double rotational_constant_cm1 = 0.0; // B = h / (8 pi^2 c I_red); from reduced-moment if given
  int symmetry = 1;                     // torsional symmetry number n
  // V(phi) = sum_k V_k / 2 (1 - cos k phi), J/mol. A plain barrier V0 is the single term k = n.
  std::vector<std::pair<int, double>> fourier_j_per_mol;
};

struct GeometryAtom {
  std::string element;  // symbol, D and T allowed
  double x_angstrom = 0.0, y_angstrom = 0.0, z_angstrom = 0.0;
};

// How the formation enthalpy of an ion treats the electron (docs/species-schema.md). Thermal
// (the electron an ideal gas with H(298.15) - H(0) = 5/2 R T, as JANAF tables do) or stationary
// (the "ion convention": the electron's enthalpy is 0 at every temperature).
enum class ElectronConvention { kThermal, kStationary };
// "thermal", "stationary".
std::string ToString(ElectronConvention convention);

// The convention of every formation enthalpy a species file gives for an ion, at 298.15 K or at
// 0 K, and of the conversion between the two (statmech/formation_enthalpy.h).
inline constexpr ElectronConvention kFormationEnthalpyElectronConvention =
    ElectronConvention::kThermal;

// A species given as a table of Cp instead of molecular constants (docs/species-schema.md,
// "Tabulated species"); statmech/tabulated_cp.h turns it into exact curves.
struct TabulatedCp {
  // Strictly increasing temperatures, K, and Cp at each, J/(mol K); at least
  // schema::kMinTabulatedPoints rows.
  std::vector<double> t_k;
  std::vector<double> cp_j_per_mol_k;
  // Optional columns (empty, or one value per row): H(T) - H(298.15 K), J/mol, and S, J/(mol K).
  // Given, they are checked against the integrals of the interpolated Cp.
  std::vector<double> h_minus_h298_j_per_mol;
  std::vector<double> s_j_per_mol_k;
  // The entropy anchor: S at entropy_t_k. From the key reference-entropy, or the first row's S.
  double entropy_t_k = 298.15;
  double entropy_j_per_mol_k = 0.0;
  // Wilhoit limits Cp(0) and Cp(infinity), J/(mol K); empty: from the atom count and the shape.
  std::optional<double> cp_zero_j_per_mol_k;
  std::optional<double> cp_infinity_j_per_mol_k;
  // Where each row was written, for the consistency errors of statmech.
  std::vector<SourceLocation> row_locations;
};

struct Species {
  std::string name;
  // Element symbol and count, in the order written in the file.
  std::vector<std::pair<std::string, int>> composition;
  int charge = 0;
  // dfH at 298.15 K. When the file gives the value at 0 K instead, this is 0 and
  // formation_enthalpy_0k_j_per_mol holds it: the exact thermo (statmech) converts it with the
  // species' own H(298.15) - H(0), SpeciesThermo::FormationEnthalpy298JPerMol.
  double formation_enthalpy_j_per_mol = 0.0;
  std::optional<double> formation_enthalpy_0k_j_per_mol;
  ElectronConvention electron_convention = kFormationEnthalpyElectronConvention;
  Shape shape = Shape::kAtom;
  double symmetry_number = 1.0;
  // Linear: {B}. Nonlinear: {A, B, C} sorted A >= B >= C. cm^-1. From moments-of-inertia or
  // geometry when those were given instead.
  std::vector<double> rotational_constants_cm1;
  std::vector<double> vibrations_cm1;  // harmonic wavenumbers as written, before frequency_scale
  double frequency_scale = 1.0;
  std::vector<ElectronicLevel> electronic_levels{ElectronicLevel{}};
  double optical_isomers = 1.0;
  double centrifugal_distortion_cm1 = 0.0;  // D of a linear rotor
  TemperatureRanges temperatures;
  double standard_pressure_pa = 1.0e5;
  QualityThresholds thresholds;
  FitRequest fit_request;

  // Optional physics beyond the rigid rotor / harmonic oscillator.
  std::vector<DiatomicState> diatomic_states;  // empty: rigid rotor + harmonic oscillator
  std::optional<NuclearSpin> nuclear_spin;
  std::vector<Torsion> torsions;
  std::vector<GeometryAtom> geometry;  // empty unless given
  // Set for a species given by tabulated-cp: then the molecular data above are unused.
  std::optional<TabulatedCp> tabulated;

  // Where the species' block starts, and a hex SHA-256 of its canonical content (defaults
  // merged), used as provenance to detect entries that were not regenerated after an edit.
  SourceLocation location;
  std::string input_digest;

  // Molar mass in kg/mol from composition and charge (electron mass removed per positive charge).
  double MolarMassKgPerMol() const;
  // Total number of atoms.
  int NumAtoms() const;
  // Electrons: the atomic numbers of the composition minus the charge.
  int NumElectrons() const;
};

}  // namespace sevenfold
