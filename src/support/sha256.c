#include "sha256.h"

#include <string.h>

/* The round constants: the first 32 bits of the fractional parts of the cube
   roots of the first 64 primes (FIPS 180-4, section 4.2.2). */
static const uint32_t sha256_k[64] = {
    0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5,
    0xd807aa98, 0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174,
    0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc, 0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da,
    0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7, 0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967,
    0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85,
    0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070,
    0x19a4c116, 0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3,
    0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7, 0xc67178f2};

static uint32_t sha256_rotr(uint32_t x, int n)
{
    return (x >> n) | (x << (32 - n));
}

/* One compression of a 64-byte block into the state (FIPS 180-4, 6.2.2). */
static void sha256_compress(uint32_t h[8], const unsigned char *p)
{
    uint32_t w[64], v[8];
    for (int t = 0; t < 16; t++)
        w[t] = (uint32_t)p[4 * t] << 24 | (uint32_t)p[4 * t + 1] << 16 | (uint32_t)p[4 * t + 2] << 8 | p[4 * t + 3];
    for (int t = 16; t < 64; t++) {
        uint32_t s0 = sha256_rotr(w[t - 15], 7) ^ sha256_rotr(w[t - 15], 18) ^ (w[t - 15] >> 3);
        uint32_t s1 = sha256_rotr(w[t - 2], 17) ^ sha256_rotr(w[t - 2], 19) ^ (w[t - 2] >> 10);
        w[t] = w[t - 16] + s0 + w[t - 7] + s1;
    }
    memcpy(v, h, sizeof v);
    for (int t = 0; t < 64; t++) {
        uint32_t e = v[4], a = v[0];
        uint32_t t1 = v[7] + (sha256_rotr(e, 6) ^ sha256_rotr(e, 11) ^ sha256_rotr(e, 25)) + ((e & v[5]) ^ (~e & v[6]))
                      + sha256_k[t] + w[t];
        uint32_t t2 = (sha256_rotr(a, 2) ^ sha256_rotr(a, 13) ^ sha256_rotr(a, 22)) + ((a & v[1]) ^ (a & v[2]) ^ (v[1] & v[2]));
        memmove(v + 1, v, 7 * sizeof(uint32_t));
        v[4] += t1;
        v[0] = t1 + t2;
    }
    for (int i = 0; i < 8; i++)
        h[i] += v[i];
}

void sha256_init(sha256_ctx *c)
{
    /* the first 32 bits of the fractional parts of the square roots of the first 8 primes */
    static const uint32_t h0[8] = {0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a,
                                   0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19};
    memcpy(c->h, h0, sizeof h0);
    c->bytes = 0;
    c->fill = 0;
}

void sha256_update(sha256_ctx *c, const void *data, size_t n)
{
    const unsigned char *p = data;
    c->bytes += n;
    while (n > 0) {
        size_t take = 64 - c->fill < n ? 64 - c->fill : n;
        memcpy(c->block + c->fill, p, take);
        c->fill += take;
        p += take;
        n -= take;
        if (c->fill == 64) {
            sha256_compress(c->h, c->block);
            c->fill = 0;
        }
    }
}

void sha256_update_field(sha256_ctx *c, const char *s)
{
    sha256_update(c, s, strlen(s) + 1);
}

void sha256_final_hex(sha256_ctx *c, char hex[65])
{
    /* padding: a 1 bit, zeros to 56 mod 64 bytes, the length in bits (big-endian) */
    uint64_t bits = c->bytes * 8;
    unsigned char pad[72] = {0x80};
    size_t npad = (c->fill < 56 ? 56 : 120) - c->fill;
    for (int i = 0; i < 8; i++)
        pad[npad + i] = (unsigned char)(bits >> (56 - 8 * i));
    sha256_update(c, pad, npad + 8);
    static const char digits[] = "0123456789abcdef";
    for (int i = 0; i < 32; i++) {
        unsigned char b = (unsigned char)(c->h[i / 4] >> (24 - 8 * (i % 4)));
        hex[2 * i] = digits[b >> 4];
        hex[2 * i + 1] = digits[b & 15];
    }
    hex[64] = '\0';
}
