# SPDX-License-Identifier: MIT
# Tests of the Python module: the same answers as the C++ library and the command line, errors
# as sevenfold.Error with the library's messages, and the exact tables against Debian's
# python3-ase ideal-gas thermochemistry.
import math
import os
import subprocess
import sys
import tempfile

import numpy as np
import pytest

import sevenfold

SOURCE = os.environ.get("SEVENFOLD_SOURCE_DIR", os.path.join(os.path.dirname(__file__), "..", ".."))
REFERENCE = os.path.join(SOURCE, "tests", "data", "reference-species.yaml")
DEMO = os.path.join(SOURCE, "species", "h2-o2-core.yaml")


def by_name(species, name):
    return next(s for s in species if s.name == name)


def test_exact_table_is_a_dict_of_arrays_with_units_in_the_keys():
    n2 = by_name(sevenfold.load_species(REFERENCE), "N2")
    table = n2.table([298.15, 1000.0])
    assert set(table) == {"t_k", "cp_j_per_mol_k", "s_j_per_mol_k", "h_minus_h298_j_per_mol",
                          "h_j_per_mol"}
    assert isinstance(table["cp_j_per_mol_k"], np.ndarray)
    # JANAF Thermochemical Tables, 4th ed. (Chase 1998), N2 at 298.15 K: Cp 29.124, S 191.609
    # J/(mol K) (from memory); the rigid-rotor/harmonic model is within 0.5 % there.
    assert table["cp_j_per_mol_k"][0] == pytest.approx(29.124, rel=0.005)
    assert table["s_j_per_mol_k"][0] == pytest.approx(191.609, rel=0.005)
    assert table["h_minus_h298_j_per_mol"][0] == 0.0


def test_exact_entropy_and_enthalpy_agree_with_ase_ideal_gas_thermo():
    # ASE's IdealGasThermo (Debian python3-ase; Cramer, Essentials of Computational Chemistry,
    # 2004, ch. 10): classical rotor, harmonic vibrations. For CO2 (theta_rot 0.56 K) the
    # classical rotor differs from our explicit sum by ~theta/(3T) ~ 6e-4 in ln q, about 1e-5
    # of S; ASE's constants (CODATA 2014) differ from CODATA 2018 by < 1e-7. Tolerance 1e-4.
    from ase import Atoms
    from ase.thermochemistry import IdealGasThermo
    from ase.units import invcm, kJ, mol
    co2 = by_name(sevenfold.load_species(REFERENCE), "CO2")
    assert co2.shape == "linear"
    # O=C=O with the bond length that reproduces the species' own B: I = 2 m_O r^2, and
    # B [cm^-1] = 16.857629 / I [amu A^2] (h / (8 pi^2 c), CODATA 2018).
    m_o = Atoms("O").get_masses()[0]
    inertia = 16.857629206 / co2.rotational_constants_cm1[0]
    r = math.sqrt(inertia / (2.0 * m_o))
    atoms = Atoms("CO2", positions=[(0, 0, 0), (0, 0, r), (0, 0, -r)])
    vibrations = np.array(co2.vibrations_cm1) * co2.frequency_scale * invcm
    ase = IdealGasThermo(vib_energies=vibrations, geometry="linear", atoms=atoms,
                         symmetrynumber=int(co2.symmetry_number), spin=0, potentialenergy=0.0)
    ours = co2.table([298.15, 1000.0])
    ev_per_k_to_j_per_mol_k = 1.0 / (kJ / mol) * 1000.0
    for i, t in enumerate([298.15, 1000.0]):
        s_ase = ase.get_entropy(t, 1e5, verbose=False) * ev_per_k_to_j_per_mol_k
        assert ours["s_j_per_mol_k"][i] == pytest.approx(s_ase, rel=1e-4)
    dh_ase = (ase.get_enthalpy(1000.0, verbose=False) - ase.get_enthalpy(298.15, verbose=False)) \
        * ev_per_k_to_j_per_mol_k
    assert ours["h_minus_h298_j_per_mol"][1] == pytest.approx(dh_ase, rel=1e-4)


def test_fit_write_read_evaluate_round_trip(tmp_path):
    species = sevenfold.load_species(DEMO)
    entries = sevenfold.fit(species, jobs=2)
    assert len(entries) == len(species)
    assert entries.names == [s.name for s in species]
    path = tmp_path / "demo.entries"
    entries.write(str(path))
    again = sevenfold.read_entries(str(path))
    for a, b in zip(entries, again):
        assert a.coefficients_low == b.coefficients_low
        assert a.coefficients_high == b.coefficients_high
    water = again["H2O"]
    assert len(water.coefficients_low) == 7
    assert water.t_low_k < water.t_mid_k < water.t_high_k
    values = water.evaluate([300.0, 1000.0, 2.0 * water.t_high_k])
    assert list(values["outside_range"]) == [False, False, True]
    exact = by_name(species, "H2O").table([300.0, 1000.0])
    # Fitted Cp follows the exact Cp within the entry's own recorded worst error.
    worst = max(water.low_range["max_cp_relative"], water.high_range["max_cp_relative"])
    for i in range(2):
        assert abs(values["cp_j_per_mol_k"][i] / exact["cp_j_per_mol_k"][i] - 1.0) <= worst * 1.0001
    g = values["h_j_per_mol"] - values["t_k"] * values["s_j_per_mol_k"]
    assert np.allclose(values["g_j_per_mol"], g, rtol=1e-14, atol=1e-9)


def test_fit_gives_the_same_entries_as_the_command_line(tmp_path):
    # ctest sets SEVENFOLD_BINARY_DIR to the build tree that holds both.
    binary = os.path.join(os.environ["SEVENFOLD_BINARY_DIR"], "sevenfold")
    cli_path = tmp_path / "cli.entries"
    subprocess.run([binary, "fit", DEMO, "-o", str(cli_path), "-q", "--jobs", "2",
                    "--allow-poor-fits"], check=True)
    py_path = tmp_path / "py.entries"
    sevenfold.fit(sevenfold.load_species(DEMO), jobs=1).write(str(py_path))
    assert py_path.read_text() == cli_path.read_text()


def test_errors_are_sevenfold_errors_with_the_library_message(tmp_path):
    bad = tmp_path / "bad.yaml"
    bad.write_text("not: [a species file\n")
    with pytest.raises(sevenfold.Error) as raised:
        sevenfold.load_species(str(bad))
    assert str(bad) in str(raised.value)
    species = sevenfold.load_species(DEMO)
    with pytest.raises(sevenfold.Error, match="--objective fastest"):
        sevenfold.fit(species, objective="fastest")
    with pytest.raises(sevenfold.Error, match="outside the engine's range"):
        species[0].table([5.0])


def test_the_example_of_docs_python_md_runs_and_writes_the_csv(tmp_path):
    text = open(os.path.join(SOURCE, "docs", "python.md")).read()
    script = text.split("```python\n", 1)[1].split("```", 1)[0]
    path = tmp_path / "example.py"
    path.write_text(script)
    csv_path = tmp_path / "coefficients.csv"
    run = subprocess.run([sys.executable, str(path), DEMO, str(tmp_path / "demo.entries"),
                          str(csv_path)], capture_output=True, text=True, check=True)
    assert "(outside the fitted range)" in run.stdout
    import csv
    rows = list(csv.reader(open(csv_path)))
    assert rows[0][:4] == ["label", "range", "t_from_k", "t_to_k"]
    species = sevenfold.load_species(DEMO)
    assert len(rows) == 1 + 2 * len(species)
    entries = sevenfold.read_entries(str(tmp_path / "demo.entries"))
    water_low = next(r for r in rows if r[0] == "H2O" and r[1] == "low")
    assert [float(x) for x in water_low[4:11]] == entries["H2O"].coefficients_low
