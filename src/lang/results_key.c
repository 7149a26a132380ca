#include "results_key.h"

#include <stdlib.h>
#include <string.h>

#include "sha256.h"
#include "strbuf.h"
#include "util.h"

/* Version of the serialisation below: bumped when it changes. */
#define RESULTS_KEY_FORMAT "psikappa-question-1"

static slong results_key_nodes;

slong results_key_last_nodes(void)
{
    return results_key_nodes;
}

/* Adds an integer field (decimal text and a NUL). */
static void key_put_si(sha256_ctx *h, slong v)
{
    char buf[32];
    snprintf(buf, sizeof buf, "%ld", (long)v);
    sha256_update_field(h, buf);
}

/* The text of term i of p: coefficient, then " name^e" in name order.
   NULL when an exponent does not fit a word or a variable has no name. */
static char *key_term_text(const fmpq_mpoly_t p, slong i, const scalar_ring *R)
{
    if (!fmpq_mpoly_term_exp_fits_ui(p, i, R->ctx))
        return NULL;
    ulong exp[SCALAR_MAX_VARS];
    fmpq_mpoly_get_term_exp_ui(exp, p, i, R->ctx);
    int order[SCALAR_MAX_VARS], k = 0;
    for (int v = 0; v < SCALAR_MAX_VARS; v++) {
        if (exp[v] == 0)
            continue;
        if (!R->names[v])
            return NULL;
        int j = k++;
        for (; j > 0 && strcmp(R->names[order[j - 1]], R->names[v]) > 0; j--)
            order[j] = order[j - 1];
        order[j] = v;
    }
    fmpq_t c;
    fmpq_init(c);
    fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
    strbuf b;
    strbuf_init(&b);
    strbuf_put_fmpq(&b, c);
    fmpq_clear(c);
    for (int j = 0; j < k; j++)
        strbuf_printf(&b, " %s^%lu", R->names[order[j]], (unsigned long)exp[order[j]]);
    return strbuf_take(&b);
}

static int key_cmp_text(const void *a, const void *b)
{
    return strcmp(*(char *const *)a, *(char *const *)b);
}

int results_key_scalar(sha256_ctx *h, const fmpq_mpoly_t p, const scalar_ring *R)
{
    slong len = fmpq_mpoly_length(p, R->ctx);
    char **terms = xcalloc(len > 0 ? (size_t)len : 1, sizeof(char *));
    int ok = 1;
    for (slong i = 0; i < len && ok; i++)
        ok = (terms[i] = key_term_text(p, i, R)) != NULL;
    if (ok) {
        /* variable indices depend on the order of declaration; names do not */
        qsort(terms, (size_t)len, sizeof(char *), key_cmp_text);
        key_put_si(h, len);
        for (slong i = 0; i < len; i++)
            sha256_update_field(h, terms[i]);
    }
    for (slong i = 0; i < len; i++)
        free(terms[i]);
    free(terms);
    return ok;
}

/* Identifiers of the nodes already hashed (open addressing on the pointer). */
typedef struct {
    const cx **node;
    slong *id;
    slong len, cap;
} key_ids;

static size_t key_slot(const key_ids *M, const cx *e)
{
    size_t s = ((size_t)(uintptr_t)e >> 4) * 11400714819323198485ull;
    s &= (size_t)M->cap - 1;
    while (M->node[s] && M->node[s] != e)
        s = (s + 1) & ((size_t)M->cap - 1);
    return s;
}

static slong key_ids_get(const key_ids *M, const cx *e)
{
    if (M->cap == 0)
        return -1;
    size_t s = key_slot(M, e);
    return M->node[s] ? M->id[s] : -1;
}

static void key_ids_add(key_ids *M, const cx *e)
{
    if (2 * (M->len + 1) > M->cap) {
        key_ids old = *M;
        M->cap = old.cap ? 2 * old.cap : 256;
        M->node = xcalloc((size_t)M->cap, sizeof(cx *));
        M->id = xmalloc((size_t)M->cap * sizeof(slong));
        for (slong s = 0; s < old.cap; s++)
            if (old.node[s]) {
                size_t t = key_slot(M, old.node[s]);
                M->node[t] = old.node[s];
                M->id[t] = old.id[s];
            }
        free(old.node);
        free(old.id);
    }
    size_t s = key_slot(M, e);
    M->node[s] = e;
    M->id[s] = M->len++;
}

/* Hashes one node whose children are hashed already: its kind, its own data
   and the identifiers of its children. Returns 0 when a scalar has no key. */
static int key_put_node(sha256_ctx *h, const key_ids *M, const cx *e, const scalar_ring *R)
{
    /* one name per cx_kind, in the enum's order: a kind added to classexpr.h
       without a name here fails the assertion below at compile time */
    static const char *kinds[] = {"scalar", "psi", "kappa", "add", "mul", "pow", "exp", "lambda", "ch", "theta", "boundary", "stratum"};
    _Static_assert(sizeof kinds / sizeof kinds[0] == CX_STRATUM + 1, "a class kind has no key name");
    sha256_update_field(h, kinds[e->kind]);
    switch (e->kind) {
    case CX_SCALAR:
        return results_key_scalar(h, e->scalar, R);
    case CX_THETA:
        return 1;
    case CX_BOUNDARY:
        key_put_si(h, e->index);
        key_put_si(h, (slong)(e->legs & 0xffffffffUL));
        key_put_si(h, (slong)(e->legs >> 32));
        return 1;
    case CX_STRATUM:
        for (int i = 0; i < 3; i++)
            key_put_si(h, e->graph[i]);
        return 1;
    case CX_PSI:
    case CX_KAPPA:
    case CX_LAMBDA:
    case CX_CH:
        key_put_si(h, e->index);
        return 1;
    case CX_POW:
        key_put_si(h, e->index);
        key_put_si(h, key_ids_get(M, e->a));
        return 1;
    case CX_EXP:
        key_put_si(h, key_ids_get(M, e->a));
        return 1;
    default:
        key_put_si(h, key_ids_get(M, e->a));
        key_put_si(h, key_ids_get(M, e->b));
        return 1;
    }
}

/* Hashes the expression as a list of nodes in post-order, each node once,
   children named by their position in the list. An explicit stack: products
   built in loops are hundreds of thousands of levels deep. */
static int key_put_dag(sha256_ctx *h, const cx *root, const scalar_ring *R)
{
    key_ids M = {NULL, NULL, 0, 0};
    slong cap = 64, top = 0;
    const cx **stack = xmalloc((size_t)cap * sizeof(cx *));
    stack[top++] = root;
    int ok = 1;
    while (top > 0 && ok) {
        const cx *e = stack[top - 1];
        if (key_ids_get(&M, e) >= 0) {
            top--;
            continue;
        }
        const cx *kids[2] = {e->kind == CX_SCALAR ? NULL : e->a, e->kind == CX_SCALAR ? NULL : e->b};
        int pushed = 0;
        for (int i = 1; i >= 0; i--)
            if (kids[i] && key_ids_get(&M, kids[i]) < 0) {
                if (top + 1 >= cap)
                    stack = xrealloc(stack, (size_t)(cap *= 2) * sizeof(cx *));
                stack[top++] = kids[i];
                pushed = 1;
            }
        if (pushed)
            continue;
        ok = key_put_node(h, &M, e, R);
        key_ids_add(&M, e);
        top--;
    }
    results_key_nodes = M.len;
    key_put_si(h, M.len);
    free(stack);
    free(M.node);
    free(M.id);
    return ok;
}

int results_key_integral(const scalar_ring *R, slong g, slong n, const cx *e, char hex[65])
{
    sha256_ctx h;
    sha256_init(&h);
    sha256_update_field(&h, RESULTS_KEY_FORMAT);
    sha256_update_field(&h, "integral");
    key_put_si(&h, g);
    key_put_si(&h, n);
    if (!key_put_dag(&h, e, R))
        return 0;
    sha256_final_hex(&h, hex);
    return 1;
}
