// SPDX-License-Identifier: MIT
// Microbenchmarks of the inner kernels of `sevenfold fit` (docs/performance.md): exact tables on
// the fit grid, the constrained fit at a fixed and at an automatic mid temperature, the
// asymmetric-top level construction and one torsion's levels. The molecule is INVENTED (a
// 20-atom nonlinear molecule without torsions, constants of plausible size), for timing only.
#include <benchmark/benchmark.h>

#include <string>
#include <vector>

#include "fit/fitter.h"
#include "mechanism/regenerate.h"
#include "species/species_reader.h"
#include "statmech/harmonic.h"
#include "statmech/rotor.h"
#include "statmech/species_thermo.h"
#include "statmech/torsion.h"

namespace sevenfold {
namespace {

// 20 atoms, 54 modes between 60 and 3900 cm^-1, an asymmetric top; invented for timing.
const char* const kTwentyAtomYaml = R"(
species:
  - name: bench20
    composition: {C: 7, N: 2, O: 2, H: 9}
    formation-enthalpy: -120 kJ/mol
    shape: nonlinear
    symmetry-number: 1
    rotational-constants: [0.0912, 0.0411, 0.0327]
    vibrations: [62.4, 88.1, 121.7, 160.3, 201.9, 248.6, 287.0, 333.3, 371.5, 412.8, 455.0, 497.2,
                 540.9, 588.6, 631.4, 679.9, 722.3, 768.0, 811.6, 857.1, 902.4, 948.8, 991.3,
                 1034.6, 1081.2, 1123.9, 1168.4, 1212.0, 1257.7, 1301.5, 1346.2, 1390.8, 1434.1,
                 1478.9, 1520.3, 1566.6, 1611.2, 1654.8, 1702.5, 2851.0, 2898.4, 2934.7, 2977.3,
                 3012.9, 3055.6, 3098.0, 3141.2, 3185.7, 3228.3, 3274.9, 3318.6, 3402.2, 3655.1,
                 3893.0]
)";

const Species& TwentyAtomSpecies() {
  static const std::vector<Species> species = ReadSpeciesText(kTwentyAtomYaml, "bench.yaml");
  return species.front();
}

// Exact tables on the fit grid (200-6000 K), including the model construction.
void BM_ExactCurvesTwentyAtoms(benchmark::State& state) {
  const Species& species = TwentyAtomSpecies();
  for (auto _ : state) benchmark::DoNotOptimize(ExactCurvesFor(species));
}
BENCHMARK(BM_ExactCurvesTwentyAtoms)->Unit(benchmark::kMicrosecond);

// Only the model construction (rotor levels, vibrations) of the same species.
void BM_SpeciesThermoConstruction(benchmark::State& state) {
  const Species& species = TwentyAtomSpecies();
  for (auto _ : state) benchmark::DoNotOptimize(SpeciesThermo(species));
}
BENCHMARK(BM_SpeciesThermoConstruction)->Unit(benchmark::kMicrosecond);

// One constrained fit at a fixed mid temperature of 1000 K.
void BM_FitFixedMid(benchmark::State& state) {
  const ExactCurves curves = ExactCurvesFor(TwentyAtomSpecies());
  FitOptions options;
  options.t_mid_k = 1000.0;
  for (auto _ : state) benchmark::DoNotOptimize(FitTwoRange(curves, options, QualityThresholds{}));
}
BENCHMARK(BM_FitFixedMid)->Unit(benchmark::kMicrosecond);

// One fit with the mid temperature chosen automatically (scan + refinement + final solve).
void BM_FitAutoMid(benchmark::State& state) {
  const ExactCurves curves = ExactCurvesFor(TwentyAtomSpecies());
  FitOptions options;
  for (auto _ : state) benchmark::DoNotOptimize(FitTwoRange(curves, options, QualityThresholds{}));
}
BENCHMARK(BM_FitAutoMid)->Unit(benchmark::kMicrosecond);

// Exact tables plus automatic fit: the per-species engine work of `sevenfold fit`.
void BM_TablesAndAutoFit(benchmark::State& state) {
  const Species& species = TwentyAtomSpecies();
  FitOptions options;
  for (auto _ : state) {
    const ExactCurves curves = ExactCurvesFor(species);
    benchmark::DoNotOptimize(FitTwoRange(curves, options, QualityThresholds{}));
  }
}
BENCHMARK(BM_TablesAndAutoFit)->Unit(benchmark::kMicrosecond);

// Asymmetric-top levels (diagonalisation per J) for the quantum sum, with the tail matching.
// Argument: A/C. The number of J blocks grows as sqrt(A/C) (levels up to 50 T_switch =
// 1500 A), the work as (A/C)^1.5. 3 is the 20-atom molecule above; 30 a long prolate chain.
void BM_AsymmetricTopConstruction(benchmark::State& state) {
  const double ratio = static_cast<double>(state.range(0));
  for (auto _ : state) {
    benchmark::DoNotOptimize(RotorContribution::Nonlinear({0.0327 * ratio, 0.0411, 0.0327}, 1.0));
  }
}
BENCHMARK(BM_AsymmetricTopConstruction)->Arg(3)->Arg(30)->Unit(benchmark::kMicrosecond);

// One torsion's levels: a methyl-like rotor (B = 5.3 cm^-1 ~ 7.6 K, threefold, V3 ~ 1400 K).
void BM_TorsionLevels(benchmark::State& state) {
  for (auto _ : state) {
    benchmark::DoNotOptimize(
        TorsionContribution(7.6, 3, std::vector<std::pair<int, double>>{{3, 1400.0}}));
  }
}
BENCHMARK(BM_TorsionLevels)->Unit(benchmark::kMicrosecond);

// The harmonic kernel alone: the 54 modes at every temperature of the fit grid.
void BM_HarmonicOnGrid(benchmark::State& state) {
  const std::vector<double> grid = FitGrid(200.0, 6000.0);
  std::vector<double> theta_k;
  // c2 = hc/k = 1.438776877 cm K (CODATA 2018), for the conversion of the invented wavenumbers.
  for (const double w : TwentyAtomSpecies().vibrations_cm1) theta_k.push_back(1.438776877 * w);
  for (auto _ : state) {
    for (const double t : grid) benchmark::DoNotOptimize(HarmonicMoments(theta_k, t));
  }
  state.counters["pairs/s"] = benchmark::Counter(
      static_cast<double>(grid.size() * theta_k.size()), benchmark::Counter::kIsIterationInvariantRate);
}
BENCHMARK(BM_HarmonicOnGrid)->Unit(benchmark::kMicrosecond);

}  // namespace
}  // namespace sevenfold

BENCHMARK_MAIN();
