// SPDX-License-Identifier: MIT
// The Python module `sevenfold` (docs/python.md): pybind11 bindings of the public C++ API
// (src/api/sevenfold.h) and nothing else. Tables come back as dicts of numpy arrays whose keys
// carry their units; errors as sevenfold.Error with the library's message.
#include <string>
#include <vector>

#include <pybind11/numpy.h>
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include "api/sevenfold.h"

namespace py = pybind11;

namespace {

using sevenfold::Entry;
using sevenfold::EntriesFile;
using sevenfold::Species;

std::vector<double> Temperatures(const py::object& t) {
  // A scalar or any sequence / array of numbers.
  const py::array_t<double, py::array::c_style | py::array::forcecast> array =
      py::array_t<double, py::array::c_style | py::array::forcecast>::ensure(t);
  if (!array) throw py::type_error("temperatures: expected a number or a sequence of numbers");
  return std::vector<double>(array.data(), array.data() + array.size());
}

py::array_t<double> Array(const std::vector<double>& values) {
  return py::array_t<double>(static_cast<py::ssize_t>(values.size()), values.data());
}

py::dict TableDict(const std::vector<sevenfold::ThermoPoint>& points) {
  std::vector<double> t, cp, s, dh, h;
  for (const sevenfold::ThermoPoint& p : points) {
    t.push_back(p.t_k);
    cp.push_back(p.cp_j_per_mol_k);
    s.push_back(p.s_j_per_mol_k);
    dh.push_back(p.h_minus_h298_j_per_mol);
    h.push_back(p.h_j_per_mol);
  }
  py::dict table;
  table["t_k"] = Array(t);
  table["cp_j_per_mol_k"] = Array(cp);
  table["s_j_per_mol_k"] = Array(s);
  table["h_minus_h298_j_per_mol"] = Array(dh);
  table["h_j_per_mol"] = Array(h);
  return table;
}

py::dict EvaluateDict(const Entry& entry, const py::object& t) {
  const std::vector<sevenfold::EntryValue> values = sevenfold::Evaluate(entry, Temperatures(t));
  std::vector<sevenfold::ThermoPoint> points;
  std::vector<double> g;
  py::array_t<bool> outside(static_cast<py::ssize_t>(values.size()));
  auto flags = outside.mutable_unchecked<1>();
  for (size_t i = 0; i < values.size(); ++i) {
    points.push_back(values[i].point);
    g.push_back(values[i].g_j_per_mol);
    flags(static_cast<py::ssize_t>(i)) = values[i].outside_range;
  }
  py::dict table = TableDict(points);
  table["g_j_per_mol"] = Array(g);
  table["outside_range"] = outside;
  return table;
}

py::dict RangeDict(const sevenfold::RangeQuality& q) {
  py::dict d;
  d["num_points"] = q.num_points;
  d["max_cp_relative"] = q.max_cp_relative;
  d["rms_cp_relative"] = q.rms_cp_relative;
  d["max_h_over_rt"] = q.max_h_over_rt;
  d["rms_h_over_rt"] = q.rms_h_over_rt;
  d["max_s_over_r"] = q.max_s_over_r;
  d["rms_s_over_r"] = q.rms_s_over_r;
  d["max_g_over_rt"] = q.max_g_over_rt;
  d["rms_g_over_rt"] = q.rms_g_over_rt;
  return d;
}

std::vector<double> Coefficients(const sevenfold::NasaCoefficients& a) {
  return std::vector<double>(a.begin(), a.end());
}

}  // namespace

PYBIND11_MODULE(sevenfold, m) {
  m.doc() = "Exact ideal-gas thermochemistry from molecular constants and its two-range NASA "
            "7-coefficient fits (docs/python.md).";
  m.attr("__version__") = SEVENFOLD_VERSION;
  static py::exception<sevenfold::Error> error(m, "Error", PyExc_ValueError);
  py::register_exception_translator([](std::exception_ptr p) {
    try {
      if (p) std::rethrow_exception(p);
    } catch (const sevenfold::Error& e) {
      error(e.what());
    }
  });

  py::class_<Species>(m, "Species", "One species read from a species file.")
      .def_readonly("name", &Species::name)
      .def_readonly("composition", &Species::composition)
      .def_readonly("charge", &Species::charge)
      .def_readonly("symmetry_number", &Species::symmetry_number)
      .def_readonly("rotational_constants_cm1", &Species::rotational_constants_cm1)
      .def_readonly("vibrations_cm1", &Species::vibrations_cm1)
      .def_readonly("frequency_scale", &Species::frequency_scale)
      .def_readonly("formation_enthalpy_j_per_mol", &Species::formation_enthalpy_j_per_mol)
      .def_readonly("standard_pressure_pa", &Species::standard_pressure_pa)
      .def_property_readonly("shape", [](const Species& s) { return sevenfold::ToString(s.shape); })
      .def_property_readonly("t_low_k", [](const Species& s) { return s.temperatures.low_k; })
      .def_property_readonly("t_high_k", [](const Species& s) { return s.temperatures.high_k; })
      .def_property_readonly("source", [](const Species& s) { return s.location.ToString(); })
      .def(
          "table",
          [](const Species& s, const py::object& t) {
            return TableDict(sevenfold::ExactTable(s, Temperatures(t)));
          },
          py::arg("t_k"),
          "Exact Cp, S, H - H298 and H at the temperatures t_k (K), SI per mole, as a dict of "
          "numpy arrays.")
      .def("__repr__", [](const Species& s) { return "<sevenfold.Species " + s.name + ">"; });

  py::class_<Entry>(m, "Entry", "One fitted two-range polynomial with its quality figures.")
      .def_readonly("name", &Entry::name)
      .def_readonly("composition", &Entry::composition)
      .def_readonly("charge", &Entry::charge)
      .def_readonly("formation_enthalpy_j_per_mol", &Entry::formation_enthalpy_j_per_mol)
      .def_readonly("reference_pressure_pa", &Entry::reference_pressure_pa)
      .def_property_readonly("t_low_k", [](const Entry& e) { return e.polynomial.t_low_k; })
      .def_property_readonly("t_mid_k", [](const Entry& e) { return e.polynomial.t_mid_k; })
      .def_property_readonly("t_high_k", [](const Entry& e) { return e.polynomial.t_high_k; })
      .def_property_readonly("coefficients_low",
                             [](const Entry& e) { return Coefficients(e.polynomial.low); })
      .def_property_readonly("coefficients_high",
                             [](const Entry& e) { return Coefficients(e.polynomial.high); })
      .def_property_readonly("meets_thresholds",
                             [](const Entry& e) { return e.quality.MeetsThresholds(); })
      .def_property_readonly("threshold_failures",
                             [](const Entry& e) { return e.quality.threshold_failures; })
      .def_property_readonly("low_range", [](const Entry& e) { return RangeDict(e.quality.low_range); })
      .def_property_readonly("high_range",
                             [](const Entry& e) { return RangeDict(e.quality.high_range); })
      .def("evaluate", &EvaluateDict, py::arg("t_k"),
           "Cp, S, H - H298, H and G of the polynomial at t_k (K), SI per mole, and a boolean "
           "array outside_range, as a dict of numpy arrays.")
      .def("__repr__", [](const Entry& e) { return "<sevenfold.Entry " + e.name + ">"; });

  py::class_<EntriesFile>(m, "Entries", "The entries of an entries file, in file order.")
      .def("__len__", [](const EntriesFile& f) { return f.entries.size(); })
      .def(
          "__getitem__",
          [](const EntriesFile& f, py::object key) -> const Entry& {
            if (py::isinstance<py::str>(key)) {
              const std::string name = key.cast<std::string>();
              for (const Entry& e : f.entries) {
                if (e.name == name) return e;
              }
              throw py::key_error(name);
            }
            py::ssize_t i = key.cast<py::ssize_t>();
            const auto n = static_cast<py::ssize_t>(f.entries.size());
            if (i < 0) i += n;
            if (i < 0 || i >= n) throw py::index_error("entry index out of range");
            return f.entries[static_cast<size_t>(i)];
          },
          py::return_value_policy::reference_internal)
      .def(
          "__iter__",
          [](const EntriesFile& f) { return py::make_iterator(f.entries.begin(), f.entries.end()); },
          py::keep_alive<0, 1>())
      .def_property_readonly("names",
                             [](const EntriesFile& f) {
                               std::vector<std::string> names;
                               for (const Entry& e : f.entries) names.push_back(e.name);
                               return names;
                             })
      .def(
          "write", [](const EntriesFile& f, const std::string& path) { sevenfold::WriteEntries(f, path); },
          py::arg("path"), "Writes the entries file atomically.");

  m.def("load_species", &sevenfold::LoadSpecies, py::arg("path"), py::kw_only(),
        py::arg("jobs") = 0, py::call_guard<py::gil_scoped_release>(),
        "Reads and validates a species file on `jobs` threads (0: the hardware threads); a list "
        "of Species in file order.");
  m.def("load_species_from_text", &sevenfold::LoadSpeciesFromText, py::arg("text"),
        py::arg("file_name") = "<text>");
  m.def(
      "fit",
      [](const std::vector<Species>& species, py::object mid, py::object objective,
         py::object extrapolation_guard, bool smooth_curvature, int jobs) {
        sevenfold::FitSettings settings;
        // mid: None (each species' own), "auto" or a number of kelvin.
        if (!mid.is_none()) {
          settings.mid = py::isinstance<py::str>(mid) ? mid.cast<std::string>()
                                                      : py::str(py::float_(mid)).cast<std::string>();
        }
        if (!objective.is_none()) settings.objective = objective.cast<std::string>();
        if (!extrapolation_guard.is_none()) {
          settings.extrapolation_guard = extrapolation_guard.cast<std::string>();
        }
        settings.smooth_curvature = smooth_curvature;
        settings.jobs = jobs;
        py::gil_scoped_release release;  // the fit touches no Python object
        return sevenfold::Fit(species, settings);
      },
      py::arg("species"), py::kw_only(), py::arg("mid") = py::none(),
      py::arg("objective") = py::none(), py::arg("extrapolation_guard") = py::none(),
      py::arg("smooth_curvature") = false, py::arg("jobs") = 0,
      "Fits every species with the options and defaults of `sevenfold fit`; an Entries.");
  m.def("read_entries", &sevenfold::ReadEntries, py::arg("path"), "Reads an entries file.");
}
