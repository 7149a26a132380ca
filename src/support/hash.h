/* One hash for the memo tables and maps of every layer: FNV-1a over the words or bytes of a key,
   with a final mix so that the low bits, which pick the slot, depend on every input bit. */
#ifndef PSIKAPPA_HASH_H
#define PSIKAPPA_HASH_H

#include <stddef.h>
#include <flint/flint.h>

/* Hash of key[0..n). Equal keys give equal hashes. */
ulong hash_slongs(const slong *key, slong n);

/* Hash of the n bytes at key. */
ulong hash_bytes(const unsigned char *key, size_t n);

#endif
