// SPDX-License-Identifier: MIT
// A straightforward SHA-256 after FIPS 180-4 (NIST, August 2015), sections 4.1.2, 4.2.2, 5 and 6.2.
#include "core/digest.h"

#include <array>
#include <cstdint>
#include <cstring>

namespace sevenfold {
namespace {

// FIPS 180-4 sec. 4.2.2: first 32 bits of the fractional parts of the cube roots of the first
// 64 primes.
constexpr std::array<std::uint32_t, 64> kRoundConstants = {
    0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5,
    0xd807aa98, 0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174,
    0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc, 0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da,
    0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7, 0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967,
    0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85,
    0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070,
    0x19a4c116, 0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3,
    0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7, 0xc67178f2,
};

// FIPS 180-4 sec. 5.3.3: initial hash value.
constexpr std::array<std::uint32_t, 8> kInitialHash = {
    0x6a09e667,
    0xbb67ae85,
    0x3c6ef372,
    0xa54ff53a,
    0x510e527f,
    0x9b05688c,
    0x1f83d9ab,
    0x5be0cd19,
};

constexpr std::uint32_t RotateRight(std::uint32_t x, int n) { return (x >> n) | (x << (32 - n)); }

void ProcessBlock(const unsigned char* block, std::array<std::uint32_t, 8>* hash) {
  std::array<std::uint32_t, 64> w{};
  for (int t = 0; t < 16; ++t) {
    w[t] = (std::uint32_t{block[4 * t]} << 24) | (std::uint32_t{block[4 * t + 1]} << 16) |
           (std::uint32_t{block[4 * t + 2]} << 8) | std::uint32_t{block[4 * t + 3]};
  }
  for (int t = 16; t < 64; ++t) {
    const std::uint32_t s0 =
        RotateRight(w[t - 15], 7) ^ RotateRight(w[t - 15], 18) ^ (w[t - 15] >> 3);
    const std::uint32_t s1 =
        RotateRight(w[t - 2], 17) ^ RotateRight(w[t - 2], 19) ^ (w[t - 2] >> 10);
    w[t] = w[t - 16] + s0 + w[t - 7] + s1;
  }
  std::uint32_t a = (*hash)[0], b = (*hash)[1], c = (*hash)[2], d = (*hash)[3];
  std::uint32_t e = (*hash)[4], f = (*hash)[5], g = (*hash)[6], h = (*hash)[7];
  for (int t = 0; t < 64; ++t) {
    const std::uint32_t big_s1 = RotateRight(e, 6) ^ RotateRight(e, 11) ^ RotateRight(e, 25);
    const std::uint32_t choose = (e & f) ^ (~e & g);
    const std::uint32_t t1 = h + big_s1 + choose + kRoundConstants[t] + w[t];
    const std::uint32_t big_s0 = RotateRight(a, 2) ^ RotateRight(a, 13) ^ RotateRight(a, 22);
    const std::uint32_t majority = (a & b) ^ (a & c) ^ (b & c);
    const std::uint32_t t2 = big_s0 + majority;
    h = g;
    g = f;
    f = e;
    e = d + t1;
    d = c;
    c = b;
    b = a;
    a = t1 + t2;
  }
  (*hash)[0] += a;
  (*hash)[1] += b;
  (*hash)[2] += c;
  (*hash)[3] += d;
  (*hash)[4] += e;
  (*hash)[5] += f;
  (*hash)[6] += g;
  (*hash)[7] += h;
}

}  // namespace

std::string Sha256Hex(const std::string& data) {
  std::array<std::uint32_t, 8> hash = kInitialHash;
  const auto* bytes = reinterpret_cast<const unsigned char*>(data.data());
  const std::size_t size = data.size();
  std::size_t offset = 0;
  for (; offset + 64 <= size; offset += 64) ProcessBlock(bytes + offset, &hash);

  // Padding (sec. 5.1.1): a 1 bit, zeros, then the message length in bits as 64-bit big endian.
  unsigned char tail[128] = {};
  const std::size_t remaining = size - offset;
  if (remaining > 0) std::memcpy(tail, bytes + offset, remaining);
  tail[remaining] = 0x80;
  const std::size_t tail_size = remaining + 1 + 8 <= 64 ? 64 : 128;
  const std::uint64_t length_bits = static_cast<std::uint64_t>(size) * 8;
  for (int i = 0; i < 8; ++i) {
    tail[tail_size - 1 - i] = static_cast<unsigned char>(length_bits >> (8 * i));
  }
  for (std::size_t block = 0; block < tail_size; block += 64) ProcessBlock(tail + block, &hash);

  static const char kHexDigits[] = "0123456789abcdef";
  std::string hex;
  hex.reserve(64);
  for (const std::uint32_t word : hash) {
    for (int shift = 28; shift >= 0; shift -= 4) hex += kHexDigits[(word >> shift) & 0xf];
  }
  return hex;
}

}  // namespace sevenfold
