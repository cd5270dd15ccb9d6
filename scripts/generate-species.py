#!/usr/bin/python3
# SPDX-License-Identifier: MIT
"""Writes N synthetic species (a YAML species file) for the performance benchmark.

Usage: generate-species.py N [OUTPUT.yaml] [--seed S]

The species are INVENTED: random but physically plausible constants, valid under
docs/species-schema.md, for measuring speed only (never use them as data). The mix: ~5 % atoms,
~10 % diatomics, ~10 % linear molecules of 3 to 12 atoms, the rest nonlinear molecules of 3 to 40
atoms (about a third of those with 4 or more atoms carry one hindered internal rotor). Vibrations
lie between 50 and 4000 cm^-1 (3N-5 or 3N-6 of them); rotational constants follow from a moment of
inertia that grows with the size; some species get excited electronic levels. Temperatures are the
defaults 200 / auto / 6000 K. The output depends only on N and the seed (stdlib random, fixed seed).
"""

import random
import sys

# Atomic masses, amu (rounded standard atomic weights; only used to size moments of inertia).
HEAVY = [("C", 12.011), ("N", 14.007), ("O", 15.999)]
H_MASS = 1.008
# Atomic numbers, for the electron count: an odd-electron species needs a degenerate ground level.
ATOMIC_NUMBER = {"H": 1, "C": 6, "N": 7, "O": 8}
# B (cm^-1) = B_FROM_I / I (amu angstrom^2): h / (8 pi^2 c) in these units.
B_FROM_I = 16.857629


def composition_of(num_atoms, rng):
    """A composition with num_atoms atoms: roughly 40 % hydrogen, the rest C, N, O."""
    num_h = int(round(num_atoms * rng.uniform(0.25, 0.55))) if num_atoms > 2 else rng.choice([0, 1])
    num_h = min(num_h, num_atoms - 1)
    counts = {}
    mass = num_h * H_MASS
    for _ in range(num_atoms - num_h):
        symbol, atom_mass = rng.choice(HEAVY)
        counts[symbol] = counts.get(symbol, 0) + 1
        mass += atom_mass
    if num_h:
        counts["H"] = num_h
    return counts, mass


def vibrations(count, rng):
    """count wavenumbers in [50, 4000] cm^-1: soft skeletal modes, fingerprint, X-H stretches."""
    modes = []
    for _ in range(count):
        kind = rng.random()
        if kind < 0.2:
            value = rng.uniform(50.0, 400.0)
        elif kind < 0.8:
            value = rng.uniform(400.0, 1700.0)
        else:
            value = rng.uniform(2800.0, 4000.0)
        modes.append(round(value, 1))
    return sorted(modes)


def electronic_levels(rng):
    if rng.random() < 0.75:
        return None
    ground = rng.choice([1, 2, 3])
    levels = [[0, ground]]
    for _ in range(rng.randint(1, 3)):
        levels.append([round(rng.uniform(100.0, 20000.0), 1), rng.choice([1, 2, 3, 4])])
    return levels


def spin_consistent(levels, counts):
    """The levels with an even ground degeneracy (a doublet) if the species has an odd number of
    electrons (Kramers: its ground level cannot be single), else unchanged."""
    electrons = sum(ATOMIC_NUMBER[symbol] * count for symbol, count in counts.items())
    if electrons % 2 == 0:
        return levels
    if levels is None:
        return [[0, 2]]
    if levels[0][1] % 2 == 1:
        levels[0][1] += 1
    return levels


def formula(counts):
    return "".join(symbol + (str(count) if count != 1 else "") for symbol, count in counts.items())


def fmt_list(values):
    return "[" + ", ".join(str(v) for v in values) + "]"


def species_block(index, rng):
    kind = rng.random()
    lines = []
    name = "G%05d" % index
    if kind < 0.05:
        symbol, _ = rng.choice(HEAVY)
        lines += ["  %s:" % name,
                  "    formula: %s" % symbol,
                  "    formation-enthalpy: %.2f kJ/mol" % rng.uniform(100.0, 700.0),
                  "    shape: atom"]
        levels = spin_consistent(electronic_levels(rng), {symbol: 1})
        if levels:
            lines.append("    electronic-levels: [%s]" % ", ".join(fmt_list(l) for l in levels))
        return lines
    if kind < 0.15:
        num_atoms, shape = 2, "linear"
    elif kind < 0.25:
        num_atoms, shape = rng.randint(3, 12), "linear"
    else:
        num_atoms, shape = rng.randint(3, 40), "nonlinear"
    counts, mass = composition_of(num_atoms, rng)
    lines += ["  %s:" % name,
              "    formula: %s" % formula(counts),
              "    formation-enthalpy: %.2f kJ/mol" % rng.uniform(-400.0, 400.0),
              "    shape: %s" % shape]
    if shape == "linear":
        # Atoms ~1.2 angstrom apart on a line: I = sum m z^2 about the centre.
        if num_atoms == 2:
            inertia = mass / 4.0 * rng.uniform(0.8, 1.6) ** 2 * 0.5
        else:
            inertia = mass / num_atoms * sum(
                ((k - (num_atoms - 1) / 2.0) * 1.2) ** 2 for k in range(num_atoms))
        inertia *= rng.uniform(0.8, 1.2)
        lines.append("    symmetry-number: %d" % rng.choice([1, 2]))
        lines.append("    rotational-constants: [%.6g]" % (B_FROM_I / inertia))
        modes = vibrations(3 * num_atoms - 5, rng)
    else:
        # Radius of gyration ~ 0.9 N^(1/3) angstrom; three principal moments with I_C <= I_A + I_B.
        base = 0.4 * mass * (0.9 * num_atoms ** (1.0 / 3.0)) ** 2
        i_a = base * rng.uniform(0.3, 1.0)
        i_b = max(i_a, base * rng.uniform(0.6, 1.2))
        i_c = min(i_a + i_b, i_b * rng.uniform(1.0, 1.6))
        constants = [B_FROM_I / i for i in (i_a, i_b, i_c)]
        lines.append("    symmetry-number: %d" % rng.choice([1, 1, 1, 2, 3]))
        lines.append("    rotational-constants: [%s]" % ", ".join("%.6g" % b for b in constants))
        modes = vibrations(3 * num_atoms - 6, rng)
    lines.append("    vibrations: %s" % fmt_list(modes))
    levels = spin_consistent(electronic_levels(rng), counts)
    if levels:
        lines.append("    electronic-levels: [%s]" % ", ".join(fmt_list(l) for l in levels))
    if shape == "nonlinear" and num_atoms >= 4 and rng.random() < 0.33:
        # One methyl- or hydroxyl-like top replacing the softest mode.
        lines += ["    hindered-rotors:",
                  "      - replaces: %s" % modes[0],
                  "        rotational-constant: %.4g" % rng.uniform(2.0, 12.0),
                  "        symmetry-number: %d" % rng.choice([1, 2, 3]),
                  "        barrier-height: %.2f kJ/mol" % rng.uniform(1.0, 15.0)]
    return lines


def main(argv):
    args = [a for a in argv[1:] if not a.startswith("--seed")]
    seed = 20261202
    for a in argv[1:]:
        if a.startswith("--seed="):
            seed = int(a.split("=", 1)[1])
    if not args or not args[0].isdigit():
        sys.stderr.write(__doc__)
        return 2
    count = int(args[0])
    rng = random.Random(seed)
    out = ["# INVENTED species for the performance benchmark (scripts/generate-species.py %d, seed %d)."
           % (count, seed),
           "# Random but plausible constants; not data. Fits may miss the thresholds.",
           "sevenfold-species: 2",
           "defaults:",
           "  fit-temperatures: {low: 200, mid: auto, high: 6000}",
           "  fit-thresholds: {cp: 0.04, enthalpy: 0.07, entropy: 0.07}",
           "species:"]
    for index in range(count):
        out += species_block(index, rng)
    text = "\n".join(out) + "\n"
    if len(args) > 1:
        with open(args[1], "w", encoding="utf-8") as handle:
            handle.write(text)
    else:
        sys.stdout.write(text)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
