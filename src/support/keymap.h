/* A hash map from short integer vectors to exact rationals: the memo tables
   of the evaluator (integrals already computed) use it. */
#ifndef PSIKAPPA_KEYMAP_H
#define PSIKAPPA_KEYMAP_H

#include <flint/fmpq.h>

/* One slot: the key's hash is kept beside its record, so a probe that meets another key compares
   one word and does not follow the pointer (a cache miss per probe in large memos).  A record is
   the value followed by the key's length and entries, so a hit reads one place. */
typedef struct keymap_slot_t {
    ulong hash;
    slong *rec;        /* value (an fmpq in its first two words), n, key[0..n-1]; NULL: empty */
} keymap_slot_t;

typedef struct keymap {
    slong len, nslots;
    keymap_slot_t *slots;
    slong **chunks;    /* the records live in these blocks and never move; owned */
    slong nchunks, chunk_used, chunk_size;
} keymap;

void keymap_init(keymap *M);
void keymap_clear(keymap *M);

/* The value stored under key[0..n-1], or NULL. The pointer is valid until the map is cleared
   (keymap_set of the same key overwrites the number it points to). */
const fmpq *keymap_get(const keymap *M, const slong *key, slong n);

/* Stores a copy of value under a copy of key (replacing an old value); returns the stored value,
   valid as for keymap_get. */
const fmpq *keymap_set(keymap *M, const slong *key, slong n, const fmpq_t value);

#endif
