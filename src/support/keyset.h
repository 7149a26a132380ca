/* The key side of every memo table of the engines: short slong arrays stored once in a pool,
   each given a stable index (0, 1, 2, ... in order of insertion), found again by an
   open-addressing hash. The values live in the caller's own array at the same index, so tables
   of integers (the DVV table), of rationals (the KdV table) and of Theta numbers share this one
   container while their recursions share nothing. Out of memory is a return code, never an
   abort: the engines turn it into their own limit status. */
#ifndef PSIKAPPA_KEYSET_H
#define PSIKAPPA_KEYSET_H

#include <flint/flint.h>

typedef struct {
    ulong hash;   /* full hash of the key, to skip most key comparisons */
    slong off;    /* start of the key inside the pool */
    slong n;      /* key length */
} keyset_entry;

/* A slot of the open addressing: the entry's hash is kept beside its index, so a probe that meets
   another key compares one word without reading the entry (a cache miss in large tables). */
typedef struct {
    ulong hash;
    slong idx;                 /* -1 = empty, otherwise an entry index */
} keyset_slot;

typedef struct keyset {
    slong len, alloc;          /* keys stored / entries allocated */
    keyset_entry *ent;
    keyset_slot *slot;
    slong nslots;              /* a power of two, kept >= 2 len */
    slong *pool;               /* all keys, concatenated */
    slong pool_len, pool_alloc;
} keyset;

/* An empty set; 0 when memory is exhausted (K is then empty and may be cleared). */
int keyset_init(keyset *K);
void keyset_clear(keyset *K);

/* Index of key[0..n) (h = hash_slongs(key, n)), or -1 when absent. */
slong keyset_find(const keyset *K, const slong *key, slong n, ulong h);

/* Adds key[0..n) (absent, h its hash) and returns its index, which is the number of keys before
   it; -1 when memory is exhausted (nothing is added then). */
slong keyset_add(keyset *K, const slong *key, slong n, ulong h);

#endif
