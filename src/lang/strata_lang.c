/* strata_lang.c - the language's bridge to the stable-graph engine (src/strata/):
 *   stablegraphs_{g,n}      the stable graphs of Mbar_{g,n}, printed as [g0{1} g0{2} | 1-2 1-2]
 *   stablegraphs_{g,n,k}    those with k edges
 *   graphcount_{g,n}        [number with 0 edges, 1 edge, ..., 3g-3+n edges]
 *   mvvolume_{g,n}          the Masur-Veech volume Vol Q_{g,n} (a rational times pi^{6g-6+2n})
 *   multicurves_{g,n}       per graph with edges: [graph, edges, |Aut|, Vol(Gamma), Vol(Gamma)/Vol Q,
 *                           primitive part], the last proportional to Mirzakhani's frequency of the
 *                           multicurve with all weights 1 (mvvol.h)
 * Requests whose estimated number of graphs exceeds --max-table / 30 (about 30 table entries'
 * worth of memory per graph) are refused before any work.
 */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>
#include <flint/fmpq_vec.h>

#include "cancel.h"
#include "diag.h"
#include "correlators/wk_kdv.h"
#include "strata/mvvol.h"
#include "strata/sgraph.h"
#include "strata_lang.h"
#include "util.h"
#include "verify_account.h"
#include "eval.h"

#define STRATA_TABLE_PER_GRAPH 30.0

typedef enum { SL_GRAPHS, SL_COUNT, SL_VOLUME, SL_CURVES } sl_kind;

static const struct {
    const char *name;
    sl_kind kind;
} sl_names[] = {
    {"stablegraphs", SL_GRAPHS}, {"graphcount", SL_COUNT}, {"mvvolume", SL_VOLUME}, {"multicurves", SL_CURVES},
};

static value *sl_fail(const node *at, char *msg)
{
    diag_error(&at->loc, "%s", msg);
    free(msg);
    return NULL;
}

/* Reports an engine failure at n; always returns NULL. */
static value *sl_engine_error(const node *n, int rc, int g, int np)
{
    if (rc == SG_CANCELLED)
        return sl_fail(n, xasprintf("interrupted"));
    if (rc == SG_NOMEM)
        return sl_fail(n, xasprintf("out of memory while enumerating the stable graphs of Mbar_{%d,%d}", g, np));
    return sl_fail(n, xasprintf("the stable graphs of Mbar_{%d,%d} are beyond the engine's limits (%d vertices, "
                                "%d legs, %d edges)", g, np, SG_MAX_V, SG_MAX_N, SG_MAX_E));
}

int strata_lang_graphs(interp *I, const node *n, int g, int np, int k, sg_list *L)
{
    double est = sg_estimate_count(g, np), lim = I->lim.max_table / STRATA_TABLE_PER_GRAPH;
    if (est > lim) {
        char about[48];
        if (est > 1e15)
            snprintf(about, sizeof about, "more than 1e15");
        else
            snprintf(about, sizeof about, "about %.2g", est);
        sl_fail(n, xasprintf("Mbar_{%d,%d} has %s stable graphs (estimate), more than the %.2g allowed "
                             "(--max-table / %g); raise --max-table to enumerate them",
                             g, np, about, lim, STRATA_TABLE_PER_GRAPH));
        return 0;
    }
    sg_list_init(L);
    int rc = sg_enumerate(L, g, np, k, 0, &cancel_flag);
    if (rc != SG_OK) {
        sl_engine_error(n, rc, g, np);
        sg_list_clear(L);
        return 0;
    }
    return 1;
}

static value *sl_graph_str(interp *I, const sgraph *G)
{
    slong need = sgraph_snprint(NULL, 0, G);
    char *buf = xmalloc((size_t) need + 1);
    sgraph_snprint(buf, need + 1, G);
    return value_new_str(buf, &I->ring);
}

/* q * pi^e as a value. */
static value *sl_pi_value(interp *I, const fmpq_t q, slong e)
{
    value *r = value_new_num(&I->ring);
    fmpq_mpoly_t p;
    fmpq_mpoly_init(p, I->ring.ctx);
    scalar_set_gen(p, &I->ring, SCALAR_PI);
    fmpq_mpoly_pow_ui(r->num, p, (ulong) e, I->ring.ctx);
    fmpq_mpoly_scalar_mul_fmpq(r->num, r->num, q, I->ring.ctx);
    fmpq_mpoly_clear(p, I->ring.ctx);
    return r;
}

static value *sl_list_of_graphs(interp *I, const sg_list *L)
{
    value *r = value_new_list(L->len, &I->ring);
    for (slong i = 0; i < L->len; i++)
        r->items[i] = sl_graph_str(I, &L->gr[i]);
    return r;
}

static value *sl_counts(interp *I, const sg_list *L, int dim)
{
    value *r = value_new_list(dim + 1, &I->ring);
    for (int k = 0; k <= dim; k++) {
        slong c = 0;
        for (slong i = 0; i < L->len; i++)
            c += L->gr[i].ne == k;
        r->items[k] = value_new_si(&I->ring, c);
    }
    return r;
}

/* The KdV recursion's correlators (the session's own table, made on first use) into *kdv;
   0 when memory is exhausted. */
static int sl_kdv_source(interp *I, mv_source *kdv)
{
    if (I->wk_kdv == NULL) {
        I->wk_kdv = wk_kdv_table_new();
        if (I->wk_kdv == NULL)
            return 0;
        wk_kdv_table_set_cancel(I->wk_kdv, &cancel_flag);
        wk_kdv_table_set_limit(I->wk_kdv, I->lim.max_table > 1e15 ? (slong) 1e15 : (slong) I->lim.max_table);
    }
    kdv->T = NULL;
    kdv->K = I->wk_kdv;
    return 1;
}

/* --verify for mvvolume_{g,n}: the volume again with the correlators of the KdV recursion in
   place of DVV, over the labelled graphs L when given, else over the shapes of (g, np); r is
   returned, or NULL (released) after a failure. */
static value *sl_verify_volume(interp *I, const node *n, const sg_list *L, int g, int np, const fmpq_t total,
                               value *r)
{
    mv_source kdv;
    if (!sl_kdv_source(I, &kdv))
        return verify_unchecked_value(I, n, r, "out of memory for the KdV recursion's table");
    fmpq_t second;
    fmpq_init(second);
    verify_second_begin(I);
    int rc = L != NULL ? mv_volume_of(second, L, &kdv, &cancel_flag)
                       : mv_volume_by_shapes(second, g, np, &kdv, 0, &cancel_flag);
    verify_second_end(I);
    int same = rc == SG_OK && fmpq_equal(second, total);
    fmpq_clear(second);
    if (rc != SG_OK)
        return verify_unchecked_value(I, n, r, "the KdV recursion stopped (limits)");
    if (!same) {
        value_release(r);
        diag_error(&n->loc, "verification failed: the volume with KdV correlators differs (please report this input)");
        return NULL;
    }
    verify_checked(I, VERIFY_VALUE, 1);
    return r;
}

/* mvvolume_{g,n} by the shapes of (g, n) (graphs with unlabelled legs, one term each: a few
   thousand for Mbar_{0,12}, whose labelled graphs number about 10^10).  --verify recomputes it
   with KdV correlators over the labelled graphs when their estimate is within the limit, else
   over the shapes. */
static value *sl_volume_by_shapes(interp *I, const node *n, int g, int np)
{
    mv_source src = {I->wk, NULL};
    double lim = I->lim.max_table / STRATA_TABLE_PER_GRAPH;
    fmpq_t vol;
    value *r = NULL;
    fmpq_init(vol);
    int rc = mv_volume_by_shapes(vol, g, np, &src, (slong) lim, &cancel_flag);
    if (rc == SG_LIMIT && cancel_flag == 0)
        sl_fail(n, xasprintf("Vol Q_{%d,%d} needs more than %.2g graph shapes or a correlator table beyond "
                             "--max-table; raise --max-table", g, np, lim));
    else if (rc != SG_OK)
        sl_engine_error(n, rc, g, np);
    else {
        r = sl_pi_value(I, vol, 6 * g - 6 + 2 * np);
        if (I->verify && sg_estimate_count(g, np) <= lim) {
            sg_list L;
            sg_list_init(&L);
            if (sg_enumerate(&L, g, np, -1, 0, &cancel_flag) == SG_OK)
                r = sl_verify_volume(I, n, &L, g, np, vol, r);
            else
                r = verify_unchecked_value(I, n, r, "the labelled graphs could not be enumerated");
            sg_list_clear(&L);
        } else if (I->verify) {
            r = sl_verify_volume(I, n, NULL, g, np, vol, r);
        }
    }
    fmpq_clear(vol);
    return r;
}

/* Vol Q_{g,n} (volume = 1) or the table of multicurves, from the graphs L. */
static value *sl_volumes(interp *I, const node *n, const sg_list *L, int g, int np, int table)
{
    mv_source src = {I->wk, NULL};
    slong e = 6 * g - 6 + 2 * np, rows = 0;
    fmpq *vol = _fmpq_vec_init(L->len), *prim = _fmpq_vec_init(L->len);
    fmpq_t total, share;
    fmpq_init(total);
    fmpq_init(share);
    value *r = NULL;
    int rc = SG_OK;
    for (slong i = 0; i < L->len && rc == SG_OK; i++) {
        rc = mv_graph(vol + i, prim + i, &L->gr[i], &src);
        fmpq_add(total, total, vol + i);
        rows += L->gr[i].ne > 0;
        if (cancel_flag)
            rc = SG_CANCELLED;
    }
    if (rc != SG_OK)
        sl_engine_error(n, rc, g, np);
    else if (!table) {
        r = sl_pi_value(I, total, e);
        if (I->verify)
            r = sl_verify_volume(I, n, L, g, np, total, r);
    }
    else {
        r = value_new_list(rows, &I->ring);
        rows = 0;
        for (slong i = 0; i < L->len; i++) {
            if (L->gr[i].ne == 0)
                continue;
            fmpz_t aut;
            fmpz_init(aut);
            sgraph_aut(aut, &L->gr[i]);
            value *row = value_new_list(6, &I->ring);
            row->items[0] = sl_graph_str(I, &L->gr[i]);
            row->items[1] = value_new_si(&I->ring, L->gr[i].ne);
            fmpq_set_fmpz_frac(share, aut, (fmpz[]){1});
            row->items[2] = value_new_fmpq(&I->ring, share);
            row->items[3] = sl_pi_value(I, vol + i, e);
            fmpq_div(share, vol + i, total);
            row->items[4] = value_new_fmpq(&I->ring, share);
            row->items[5] = value_new_fmpq(&I->ring, prim + i);
            r->items[rows++] = row;
            fmpz_clear(aut);
        }
    }
    _fmpq_vec_clear(vol, L->len);
    _fmpq_vec_clear(prim, L->len);
    fmpq_clear(total);
    fmpq_clear(share);
    return r;
}

/* The subscripts g, n (and k for stablegraphs) as integers with their ranges. */
static int sl_subscripts(interp *I, scope *s, const node *n, sl_kind kind, slong *g, slong *np, slong *k)
{
    int nsub = n->list->len, maxsub = kind == SL_GRAPHS ? 3 : 2;
    *k = -1;
    if (nsub < 2 || nsub > maxsub) {
        sl_fail(n, xasprintf("%s_{g,n%s} takes %s subscripts (got %d)", n->text, maxsub == 3 ? "[,k]" : "",
                             maxsub == 3 ? "two or three" : "two", nsub));
        return 0;
    }
    if (!eval_slong(I, s, n->list->items[0], "genus", 0, g) || !eval_slong(I, s, n->list->items[1], "number of legs", 0, np))
        return 0;
    if (*g > 1000 || *np > 1000) {
        sl_fail(n, xasprintf("Mbar_{%ld,%ld} is too large for the stable-graph engine (at most %d legs, %d edges, "
                             "%d vertices)", (long) *g, (long) *np, SG_MAX_N, SG_MAX_E, SG_MAX_V));
        return 0;
    }
    if (2 * *g - 2 + *np <= 0) {
        sl_fail(n, xasprintf("Mbar_{%ld,%ld} is not stable (2g-2+n must be positive)", (long) *g, (long) *np));
        return 0;
    }
    if (*np > SG_MAX_N || 3 * *g - 3 + *np > SG_MAX_E || 2 * *g - 2 + *np > SG_MAX_V) {
        sl_fail(n, xasprintf("Mbar_{%ld,%ld} is too large for the stable-graph engine (at most %d legs, "
                             "%d edges, %d vertices)", (long) *g, (long) *np, SG_MAX_N, SG_MAX_E, SG_MAX_V));
        return 0;
    }
    if ((kind == SL_VOLUME || kind == SL_CURVES) && 3 * *g - 3 + *np < 1) {
        sl_fail(n, xasprintf("Mbar_{%ld,%ld} is a point: Q_{%ld,%ld} holds no quadratic differential with a "
                             "cylinder", (long) *g, (long) *np, (long) *g, (long) *np));
        return 0;
    }
    if (nsub == 3) {
        if (!eval_slong(I, s, n->list->items[2], "number of edges", 0, k))
            return 0;
        if (*k > 3 * *g - 3 + *np) {
            sl_fail(n, xasprintf("a stable graph of Mbar_{%ld,%ld} has at most 3g-3+n = %ld edges", (long) *g,
                                 (long) *np, (long) (3 * *g - 3 + *np)));
            return 0;
        }
    }
    return 1;
}

int strata_lang_subscript(interp *I, scope *s, const node *n, value **out)
{
    int which = -1;
    for (size_t i = 0; i < sizeof sl_names / sizeof sl_names[0]; i++)
        if (strcmp(n->text, sl_names[i].name) == 0)
            which = (int) i;
    if (which < 0)
        return 0;
    sl_kind kind = sl_names[which].kind;
    slong g, np, k;
    sg_list L;
    *out = NULL;
    if (!sl_subscripts(I, s, n, kind, &g, &np, &k))
        return 1;
    if (kind == SL_VOLUME && g < SG_SHAPE_BASE && np <= SG_SHAPE_MAX_LEGS) {
        *out = sl_volume_by_shapes(I, n, (int) g, (int) np);
        return 1;
    }
    if (!strata_lang_graphs(I, n, (int) g, (int) np, (int) k, &L))
        return 1;
    if (kind == SL_GRAPHS)
        *out = sl_list_of_graphs(I, &L);
    else if (kind == SL_COUNT)
        *out = sl_counts(I, &L, (int) (3 * g - 3 + np));
    else
        *out = sl_volumes(I, n, &L, (int) g, (int) np, kind == SL_CURVES);
    sg_list_clear(&L);
    return 1;
}
