/* scalar_terms.c - many terms into one polynomial of the scalar ring at once.
 *
 * An fmpq_mpoly is an integer polynomial times one rational content, so setting its coefficients
 * one at a time rescales every term whenever a new denominator arrives: quadratic in the number
 * of terms (a volume polynomial with 10^4 terms spent seconds there).  The collector keeps the
 * terms, then scales them once by the lcm of their denominators.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpz_mpoly.h>
#include <flint/fmpq_mpoly.h>
#include "util.h"
#include "scalar.h"

void scalar_terms_init(scalar_terms *T)
{
    T->c = NULL;
    T->exps = NULL;
    T->len = T->alloc = 0;
}

void scalar_terms_clear(scalar_terms *T)
{
    for (slong i = 0; i < T->len; i++)
        fmpq_clear(T->c + i);
    free(T->c);
    free(T->exps);
    scalar_terms_init(T);
}

void scalar_terms_push(scalar_terms *T, const fmpq_t c, const ulong *exps)
{
    if (fmpq_is_zero(c))
        return;
    if (T->len == T->alloc) {
        T->alloc = T->alloc ? 2 * T->alloc : 64;
        T->c = xrealloc(T->c, (size_t)T->alloc * sizeof(fmpq));
        T->exps = xrealloc(T->exps, (size_t)T->alloc * SCALAR_MAX_VARS * sizeof(ulong));
    }
    fmpq_init(T->c + T->len);
    fmpq_set(T->c + T->len, c);
    memcpy(T->exps + T->len * SCALAR_MAX_VARS, exps, SCALAR_MAX_VARS * sizeof(ulong));
    T->len++;
}

/* lcm of the denominators of the collected terms. */
static void scalar_terms_lcm(fmpz_t L, const scalar_terms *T)
{
    fmpz_one(L);
    for (slong i = 0; i < T->len; i++)
        if (!fmpz_is_one(fmpq_denref(T->c + i)))
            fmpz_lcm(L, L, fmpq_denref(T->c + i));
}

void scalar_terms_add_to(fmpq_mpoly_t res, scalar_terms *T, const scalar_ring *R)
{
    fmpq_mpoly_t sum;
    fmpz_t L, k;
    fmpq_mpoly_init(sum, R->ctx);
    fmpz_init(L);
    fmpz_init(k);
    scalar_terms_lcm(L, T);
    for (slong i = 0; i < T->len; i++) {
        fmpz_divexact(k, L, fmpq_denref(T->c + i));
        fmpz_mul(k, k, fmpq_numref(T->c + i));
        fmpz_mpoly_push_term_fmpz_ui(sum->zpoly, k, T->exps + i * SCALAR_MAX_VARS, R->ctx->zctx);
    }
    fmpz_mpoly_sort_terms(sum->zpoly, R->ctx->zctx);
    fmpz_mpoly_combine_like_terms(sum->zpoly, R->ctx->zctx);
    fmpz_one(fmpq_numref(sum->content));
    fmpz_set(fmpq_denref(sum->content), L);
    fmpq_mpoly_reduce(sum, R->ctx);
    fmpq_mpoly_add(res, res, sum, R->ctx);
    fmpq_mpoly_clear(sum, R->ctx);
    fmpz_clear(L);
    fmpz_clear(k);
    scalar_terms_clear(T);
}
