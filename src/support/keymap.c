#include "hash.h"
#include "keymap.h"

#include <stdlib.h>
#include <string.h>

#include "util.h"

void keymap_init(keymap *M)
{
    memset(M, 0, sizeof(keymap));
}

void keymap_clear(keymap *M)
{
    for (slong s = 0; s < M->nslots; s++) {
        if (M->keys[s])
            fmpq_clear(M->values + s);
        free(M->keys[s]);
    }
    free(M->keys);
    free(M->values);
    memset(M, 0, sizeof(keymap));
}

static slong keymap_slot(const keymap *M, const slong *key, slong n)
{
    ulong mask = (ulong)M->nslots - 1;
    ulong s = hash_slongs(key, n) & mask;
    while (M->keys[s] && (M->keys[s][0] != n || memcmp(M->keys[s] + 1, key, n * sizeof(slong)) != 0))
        s = (s + 1) & mask;
    return (slong)s;
}

const fmpq *keymap_get(const keymap *M, const slong *key, slong n)
{
    if (M->nslots == 0)
        return NULL;
    slong s = keymap_slot(M, key, n);
    return M->keys[s] ? M->values + s : NULL;
}

/* Doubles the table, moving keys and values without copying the numbers. */
static void keymap_grow(keymap *M)
{
    keymap old = *M;
    M->nslots = old.nslots ? 2 * old.nslots : 64;
    M->keys = xcalloc(M->nslots, sizeof(slong *));
    M->values = xmalloc(M->nslots * sizeof(fmpq));
    for (slong s = 0; s < old.nslots; s++) {
        if (!old.keys[s])
            continue;
        slong t = keymap_slot(M, old.keys[s] + 1, old.keys[s][0]);
        M->keys[t] = old.keys[s];
        M->values[t] = old.values[s];
    }
    free(old.keys);
    free(old.values);
}

const fmpq *keymap_set(keymap *M, const slong *key, slong n, const fmpq_t value)
{
    if (2 * (M->len + 1) > M->nslots)
        keymap_grow(M);
    slong s = keymap_slot(M, key, n);
    if (!M->keys[s]) {
        M->keys[s] = xmalloc((n + 1) * sizeof(slong));
        M->keys[s][0] = n;
        memcpy(M->keys[s] + 1, key, n * sizeof(slong));
        fmpq_init(M->values + s);
        M->len++;
    }
    fmpq_set(M->values + s, value);
    return M->values + s;
}
