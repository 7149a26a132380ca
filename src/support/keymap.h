/* A hash map from short integer vectors to exact rationals: the memo tables
   of the evaluator (integrals already computed) use it. */
#ifndef PSIKAPPA_KEYMAP_H
#define PSIKAPPA_KEYMAP_H

#include <flint/fmpq.h>

typedef struct keymap {
    slong len, nslots;
    slong **keys;      /* keys[s][0] is the key length, then the entries; owned */
    fmpq *values;      /* one per slot */
} keymap;

void keymap_init(keymap *M);
void keymap_clear(keymap *M);

/* The value stored under key[0..n-1], or NULL. The pointer is valid until the next insertion. */
const fmpq *keymap_get(const keymap *M, const slong *key, slong n);

/* Stores a copy of value under a copy of key (replacing an old value); returns the stored value,
   valid until the next insertion. */
const fmpq *keymap_set(keymap *M, const slong *key, slong n, const fmpq_t value);

#endif
