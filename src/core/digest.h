// SPDX-License-Identifier: MIT
// SHA-256 message digest (FIPS 180-4), used to fingerprint inputs for provenance.
#pragma once

#include <string>

namespace sevenfold {

// SHA-256 of the bytes of `data`, as 64 lowercase hexadecimal characters (FIPS 180-4, sec. 6.2).
std::string Sha256Hex(const std::string& data);

}  // namespace sevenfold
