/* SHA-256 (FIPS 180-4), streaming. None of the libraries the program links
   (FLINT, GMP, MPFR, SQLite, libedit, the C library) offers a hash function,
   and the results store needs one for its keys and row checksums. */
#ifndef PSIKAPPA_SHA256_H
#define PSIKAPPA_SHA256_H

#include <stddef.h>
#include <stdint.h>

typedef struct sha256_ctx {
    uint32_t h[8];
    uint64_t bytes;            /* message length so far */
    unsigned char block[64];   /* pending input, `fill` bytes of it */
    size_t fill;
} sha256_ctx;

void sha256_init(sha256_ctx *c);
/* Adds n bytes of data to the message. */
void sha256_update(sha256_ctx *c, const void *data, size_t n);
/* Adds the string s followed by its terminating NUL byte, so that
   consecutive fields cannot slide into each other. */
void sha256_update_field(sha256_ctx *c, const char *s);
/* Finishes the message; writes the digest as 64 lowercase hex digits and a NUL
   into hex. c must be initialised again before reuse. */
void sha256_final_hex(sha256_ctx *c, char hex[65]);

#endif
