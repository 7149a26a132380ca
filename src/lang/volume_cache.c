/* V_{g,n}(L_1..L_n) asked again: each polynomial is kept for the rest of the
   run, and in the results store like the answers of integrals (key: the
   words "volume polynomial", g and n), so that a function summing volume
   polynomials over g does not recompute them at every call. With --verify
   every request is computed (and checked) afresh. */
#include <stdlib.h>

#include "integrate.h"
#include "interp.h"
#include "results.h"
#include "sha256.h"
#include "util.h"

/* Polynomials with more lengths are kept for the run but not in the store. */
#define VOLUME_CACHE_STORE_MAX_N 12

typedef struct volume_cache {
    slong len, alloc;
    slong *g, *n;
    value **poly;   /* owned references */
} volume_cache;

static value *volume_cache_find(const volume_cache *C, slong g, slong n)
{
    for (slong i = 0; C && i < C->len; i++)
        if (C->g[i] == g && C->n[i] == n)
            return C->poly[i];
    return NULL;
}

static void volume_cache_add(interp *I, slong g, slong n, value *v)
{
    volume_cache *C = I->volcache;
    if (!C)
        C = I->volcache = xcalloc(1, sizeof(volume_cache));
    if (C->len == C->alloc) {
        C->alloc = 2 * C->alloc + 8;
        C->g = xrealloc(C->g, (size_t)C->alloc * sizeof(slong));
        C->n = xrealloc(C->n, (size_t)C->alloc * sizeof(slong));
        C->poly = xrealloc(C->poly, (size_t)C->alloc * sizeof(value *));
    }
    C->g[C->len] = g;
    C->n[C->len] = n;
    C->poly[C->len++] = value_ref(v);
}

void volume_cache_clear(interp *I)
{
    volume_cache *C = I->volcache;
    if (!C)
        return;
    for (slong i = 0; i < C->len; i++)
        value_release(C->poly[i]);
    free(C->g);
    free(C->n);
    free(C->poly);
    free(C);
    I->volcache = NULL;
}

/* The store's question for V_{g,n}(L); 0 when the store is off. */
static int volume_question(interp *I, slong g, slong n, results_question *q)
{
    if (I->store_off)
        return 0;
    sha256_ctx h;
    char num[64];
    sha256_init(&h);
    sha256_update_field(&h, "volume polynomial");
    snprintf(num, sizeof num, "%ld %ld", (long)g, (long)n);
    sha256_update_field(&h, num);
    sha256_final_hex(&h, q->key);
    q->label = xasprintf("V_{%ld,%ld}(L)", (long)g, (long)n);
    return 1;
}

value *volume_cached(interp *I, const node *where, slong g, slong n)
{
    if (I->verify)
        return integrate_volume(I, where, g, n);
    value *v = volume_cache_find(I->volcache, g, n);
    if (v)
        return value_ref(v);
    results_question q = {{0}, NULL};
    int asked = 0;
    if (2 * g - 2 + n > 0 && n <= VOLUME_CACHE_STORE_MAX_N) {   /* else the engine's own checks speak first */
        int vars[VOLUME_CACHE_STORE_MAX_N + 1];
        if (!integrate_declare_lengths(I, where, n, vars))
            return NULL;
        asked = volume_question(I, g, n, &q);
    }
    if (asked) {
        v = value_new_num(&I->ring);
        if (!results_lookup(I, &q, v->num)) {
            value_release(v);
            v = NULL;
        }
    }
    if (!v) {
        double t0 = results_clock();
        v = integrate_volume(I, where, g, n);
        if (v && asked)
            results_save(I, &q, v->num, results_clock() - t0);
    }
    results_question_clear(&q);
    if (v)
        volume_cache_add(I, g, n, v);
    return v;
}
