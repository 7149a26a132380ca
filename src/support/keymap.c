#include "hash.h"
#include "keymap.h"

#include <stdlib.h>
#include <string.h>

#include "util.h"

/* Records are placed in blocks: one allocation per block instead of two per entry, and clearing
   frees blocks.  The first block has KEYMAP_FIRST words and each next one twice as many, up to
   KEYMAP_CHUNK, so that the many small maps stay small. */
#define KEYMAP_FIRST 256
#define KEYMAP_CHUNK 16384

/* Words of a record before the key: the fmpq value and the key length. */
#define KEYMAP_HEAD 3

void keymap_init(keymap *M)
{
    memset(M, 0, sizeof(keymap));
}

static fmpq *keymap_value(slong *rec)
{
    return (fmpq *) rec;
}

void keymap_clear(keymap *M)
{
    for (slong s = 0; s < M->nslots; s++)
        if (M->slots[s].rec)
            fmpq_clear(keymap_value(M->slots[s].rec));
    for (slong c = 0; c < M->nchunks; c++)
        free(M->chunks[c]);
    free(M->chunks);
    free(M->slots);
    memset(M, 0, sizeof(keymap));
}

static int keymap_key_equal(const slong *rec, const slong *key, slong n)
{
    if (rec[2] != n)
        return 0;
    for (slong i = 0; i < n; i++)
        if (rec[KEYMAP_HEAD + i] != key[i])
            return 0;
    return 1;
}

/* The slot holding key (hash h), or the empty slot where it would go. */
static slong keymap_find(const keymap *M, const slong *key, slong n, ulong h)
{
    ulong mask = (ulong) M->nslots - 1;
    ulong s = h & mask;
    while (M->slots[s].rec && (M->slots[s].hash != h || !keymap_key_equal(M->slots[s].rec, key, n)))
        s = (s + 1) & mask;
    return (slong) s;
}

const fmpq *keymap_get(const keymap *M, const slong *key, slong n)
{
    if (M->nslots == 0)
        return NULL;
    slong s = keymap_find(M, key, n, hash_slongs(key, n));
    return M->slots[s].rec ? keymap_value(M->slots[s].rec) : NULL;
}

/* Doubles the table, moving slots only (records stay where they are). */
static void keymap_grow(keymap *M)
{
    keymap old = *M;
    M->nslots = old.nslots ? 2 * old.nslots : 64;
    M->slots = xcalloc(M->nslots, sizeof(keymap_slot_t));
    for (slong s = 0; s < old.nslots; s++) {
        if (!old.slots[s].rec)
            continue;
        ulong mask = (ulong) M->nslots - 1, t = old.slots[s].hash & mask;
        while (M->slots[t].rec)
            t = (t + 1) & mask;
        M->slots[t] = old.slots[s];
    }
    free(old.slots);
}

/* A new record for key with a zero value, in the current block (a new block when it is full). */
static slong *keymap_new_record(keymap *M, const slong *key, slong n)
{
    slong need = KEYMAP_HEAD + n;
    if (M->nchunks == 0 || M->chunk_used + need > M->chunk_size) {
        slong size = M->nchunks >= 6 ? KEYMAP_CHUNK : KEYMAP_FIRST << M->nchunks;
        M->chunk_size = need > size ? need : size;
        M->chunks = xrealloc(M->chunks, (M->nchunks + 1) * sizeof(slong *));
        M->chunks[M->nchunks++] = xmalloc(M->chunk_size * sizeof(slong));
        M->chunk_used = 0;
    }
    slong *rec = M->chunks[M->nchunks - 1] + M->chunk_used;
    M->chunk_used += need;
    fmpq_init(keymap_value(rec));
    rec[2] = n;
    memcpy(rec + KEYMAP_HEAD, key, (size_t) n * sizeof(slong));
    return rec;
}

const fmpq *keymap_set(keymap *M, const slong *key, slong n, const fmpq_t value)
{
    if (2 * (M->len + 1) > M->nslots)
        keymap_grow(M);
    ulong h = hash_slongs(key, n);
    slong s = keymap_find(M, key, n, h);
    if (!M->slots[s].rec) {
        M->slots[s].rec = keymap_new_record(M, key, n);
        M->slots[s].hash = h;
        M->len++;
    }
    fmpq_set(keymap_value(M->slots[s].rec), value);
    return keymap_value(M->slots[s].rec);
}
