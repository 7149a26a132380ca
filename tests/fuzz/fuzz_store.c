/* libFuzzer harness for the results store: the input chooses the file the
   store is opened on (none, a healthy store, a healthy store with input bytes
   written over it at an input-chosen offset, or input bytes alone) and then a
   list of operations (put, get, close and reopen) with keys and answers taken
   from the input. Every answer read must be the last one written for its key
   (in this run or while building the healthy store): a wrong answer aborts
   (a finding), as do crashes and sanitizer reports. Answers read back are also
   parsed as exact values (scalar_deserialise) and printed again.

   Build and run with tests/fuzz/run.sh store [SECONDS]. The files live in the
   scratch folder run.sh makes (PSIKAPPA_FUZZ_SCRATCH), else in /tmp. */
#ifndef _XOPEN_SOURCE
#define _XOPEN_SOURCE 700
#endif
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "scalar.h"
#include "store.h"

#define FUZZ_KEYS 16

static char fuzz_path[512];
static char *fuzz_known[FUZZ_KEYS];   /* last answer written for key i, NULL: none */

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    const char *dir = getenv("PSIKAPPA_FUZZ_SCRATCH");
    snprintf(fuzz_path, sizeof fuzz_path, "%s/fuzz-store-%ld.sqlite", dir && *dir ? dir : "/tmp", (long)getpid());
    return 0;
}

/* Removes the store file, its journals and any damaged copies. */
static void fuzz_remove_all(void)
{
    char name[600];
    const char *sides[] = {"", "-wal", "-shm", "-journal"};
    for (int i = 0; i < 4; i++) {
        snprintf(name, sizeof name, "%s%s", fuzz_path, sides[i]);
        unlink(name);
        for (int n = 1; n <= 4; n++) {
            snprintf(name, sizeof name, "%s.damaged-%d%s", fuzz_path, n, sides[i]);
            unlink(name);
        }
    }
}

static void fuzz_forget(void)
{
    for (int i = 0; i < FUZZ_KEYS; i++) {
        free(fuzz_known[i]);
        fuzz_known[i] = NULL;
    }
}

static void fuzz_key(int i, char key[16])
{
    snprintf(key, 16, "key-%d", i);
}

/* A healthy store holding answer "a<i>" for every key. */
static void fuzz_build_store(void)
{
    char *err = NULL, key[16], a[16];
    store *S = store_open(fuzz_path, "fuzz", &err);
    free(err);
    for (int i = 0; S && i < FUZZ_KEYS; i++) {
        fuzz_key(i, key);
        snprintf(a, sizeof a, "a%d", i);
        if (store_put(S, key, "label", a)) {
            free(fuzz_known[i]);
            fuzz_known[i] = strdup(a);
        }
    }
    store_close(S);
}

static void fuzz_write_at(long offset, const uint8_t *d, size_t n)
{
    FILE *f = fopen(fuzz_path, offset < 0 ? "wb" : "r+b");
    if (!f)
        return;
    if (offset > 0)
        fseek(f, offset, SEEK_SET);
    fwrite(d, 1, n, f);
    fclose(f);
}

/* Parses an answer as an exact value and prints it again (must not crash). */
static void fuzz_parse_answer(const char *a)
{
    scalar_ring R;
    scalar_ring_init(&R);
    fmpq_mpoly_t p;
    fmpq_mpoly_init(p, R.ctx);
    if (strlen(a) < 200 && scalar_deserialise(p, a, &R)) {
        char *s = scalar_serialise(p, &R);
        free(s);
    }
    fmpq_mpoly_clear(p, R.ctx);
    scalar_ring_clear(&R);
}

/* Looks key i up; a hit must be the last answer written for it. */
static void fuzz_get(store *S, int i)
{
    char key[16], *a = NULL;
    fuzz_key(i, key);
    if (store_get(S, key, &a)) {
        if (!fuzz_known[i] || strcmp(a, fuzz_known[i]) != 0) {
            fprintf(stderr, "store returned \"%s\" for %s, last written \"%s\"\n", a, key,
                    fuzz_known[i] ? fuzz_known[i] : "(nothing)");
            abort();
        }
        fuzz_parse_answer(a);
    }
    free(a);
    free(store_take_note(S));
}

static void fuzz_put(store *S, int i, const uint8_t *d, size_t n)
{
    char key[16], *a = malloc(n + 1);
    fuzz_key(i, key);
    for (size_t j = 0; j < n; j++)
        a[j] = d[j] ? (char)d[j] : '0';   /* answers are text */
    a[n] = '\0';
    if (store_put(S, key, "label", a)) {
        free(fuzz_known[i]);
        fuzz_known[i] = a;
    } else {
        free(a);
    }
    free(store_take_note(S));
}

/* Prepares the file as the first four bytes say; returns the bytes used. */
static size_t fuzz_prepare(const uint8_t *data, size_t size)
{
    if (size < 4)
        return size;
    int mode = data[0] % 4;
    long offset = (long)data[1] << 8 | data[2];
    size_t n = data[3] < size - 4 ? data[3] : size - 4;
    if (mode == 1 || mode == 2)
        fuzz_build_store();
    if (mode == 2)
        fuzz_write_at(offset, data + 4, n);
    if (mode == 3) {
        fuzz_write_at(-1, data + 4, n);
        fuzz_forget();
    }
    return 4 + n;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    fuzz_remove_all();
    fuzz_forget();
    size_t at = fuzz_prepare(data, size);
    char *err = NULL;
    store *S = store_open(fuzz_path, "fuzz", &err);
    free(err);
    while (at < size) {
        uint8_t op = data[at++];
        int key = (op >> 2) % FUZZ_KEYS;
        if (op % 4 == 0) {
            size_t n = at < size ? data[at++] % 64 : 0;
            n = n < size - at ? n : size - at;
            fuzz_put(S, key, data + at, n);
            at += n;
        } else if (op % 4 == 1) {
            fuzz_get(S, key);
        } else if (op % 4 == 2) {
            store_close(S);
            S = store_open(fuzz_path, "fuzz", &err);
            free(err);
            err = NULL;
        } else {
            for (int i = 0; i < FUZZ_KEYS; i++)
                fuzz_get(S, i);
        }
    }
    store_close(S);
    fuzz_remove_all();
    fuzz_forget();
    return 0;
}
