/* F_{g} with t_k = ..., order x^N: the specialisation of the Witten-Kontsevich
   free energy at times given by rules, and FTheta_{g} with ... (node op 'T')
   that of the Brezin-Gross-Witten free energy of the Theta-psi numbers. The
   rules are evaluated lazily, only for the k the plan (src/engines/series/spec.h)
   asks for. */
#include <ctype.h>
#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "interp.h"
#include "verify_account.h"
#include "series/spec.h"
#include "series_ops.h"
#include "theta_lang.h"
#include "util.h"
#include "specialise.h"
#include "eval.h"
#include "failure.h"

typedef struct {
    interp *I;
    scope *s;
    const node *n;
    slong g, var, order;
    slong *lo, *hi;          /* per rule: range of k it covers (hi < 0: unbounded) */
    tseries *t;              /* times t_0..t_{nt-1}, all initialised (zero until asked) */
    char *have;              /* have[k]: t_k was evaluated */
    slong nt;
    int failed;
} spec_ctx;

/* Index of t_<digits>, or -1 when the name is t_<letter...>. -2 when not t_. */
static slong spec_literal_index(const char *name)
{
    if (strncmp(name, "t_", 2) != 0 || name[2] == '\0')
        return -2;
    for (const char *p = name + 2; *p; p++)
        if (!isdigit((unsigned char)*p))
            return -1;
    return strlen(name + 2) > 12 ? -3 : atol(name + 2);
}

/* Checks the left-hand side of a rule and evaluates its range. */
static int spec_rule_check(spec_ctx *C, int i)
{
    const node *r = C->n->list->items[i];
    slong idx = spec_literal_index(r->text);
    const char *var = r->list ? r->list->items[0]->text : NULL;
    if (idx == -2 || idx == -3 || (idx == -1 && (!var || strcmp(r->text + 2, var) != 0))
        || (idx >= 0 && var)) {
        diag_error(&r->loc, "a rule defines t_N for a number N (t_0 = x) or t_k for its own "
                            "variable (t_k = ... for k >= 2); got '%s'", r->text);
        return 0;
    }
    C->lo[i] = C->hi[i] = idx;
    if (idx >= 0)
        return 1;
    if (!eval_slong(C->I, C->s, r->b, "rule start", 0, &C->lo[i]))
        return 0;
    C->hi[i] = -1;
    return !r->c || eval_slong(C->I, C->s, r->c, "rule end", 0, &C->hi[i]);
}

/* Refuses a second rule for the same t_N (t_0 = x, ..., t_0 = 2x): which
   one was meant cannot be guessed. Ranges may overlap: the last one wins. */
static int spec_rule_unique(const spec_ctx *C, int i)
{
    const node *r = C->n->list->items[i];
    for (int j = 0; !r->list && j < i; j++) {
        const node *q = C->n->list->items[j];
        if (!q->list && C->lo[j] == C->lo[i]) {
            diag_error(&r->loc, "t_%ld is defined twice (first at line %d, column %d)", (long)C->lo[i], q->loc.first_line,
                       q->loc.first_column);
            diag_note(&q->loc, "t_%ld is first defined here", (long)C->lo[i]);
            return 0;
        }
    }
    return 1;
}

/* The rule defining t_k: a single override wins, else the last covering rule. */
static int spec_rule_for(const spec_ctx *C, slong k)
{
    int found = -1;
    for (int i = 0; i < C->n->list->len; i++) {
        const node *r = C->n->list->items[i];
        if (!r->list && C->lo[i] == k)
            return i;
        if (r->list && k >= C->lo[i] && (C->hi[i] < 0 || k <= C->hi[i]))
            found = i;
    }
    return found;
}

static value *spec_eval_rule(spec_ctx *C, int i, slong k)
{
    const node *r = C->n->list->items[i];
    if (!r->list)
        return eval_expr(C->I, C->s, r->a);
    scope *body = scope_new(C->s);
    scope_bind_value(body, r->list->items[0]->text, value_new_si(&C->I->ring, k));
    value *v = eval_expr(C->I, body, r->a);
    scope_free(body);
    return v;
}

/* Makes room for t_0..t_k, each a zero series until evaluated. */
static void spec_grow(spec_ctx *C, slong k)
{
    if (k < C->nt)
        return;
    slong nt = 2 * k + 8;
    C->t = xrealloc(C->t, nt * sizeof(tseries));
    C->have = xrealloc(C->have, nt);
    for (slong j = C->nt; j < nt; j++) {
        tseries_init(C->t + j, C->var, C->order, C->I->ring.ctx);
        C->have[j] = 0;
    }
    C->nt = nt;
}

/* Evaluates t_k once and caches it; NULL after reporting an error. */
static tseries *spec_time(spec_ctx *C, slong k)
{
    spec_grow(C, k);
    if (C->have[k])
        return C->t + k;
    int i = spec_rule_for(C, k);
    if (i < 0) {
        diag_error(&C->n->loc, "t_%ld is needed at this order but no rule defines it", (long)k);
        return NULL;
    }
    value *v = spec_eval_rule(C, i, k);
    if (!v)
        return NULL;
    int ok = series_from_value(C->I, C->t + k, v, C->n->list->items[i]->a);
    value_release(v);
    C->have[k] = (char)ok;
    return ok ? C->t + k : NULL;
}

static slong spec_valuation_cb(void *data, slong k)
{
    spec_ctx *C = data;
    if (C->failed)
        return -2;
    tseries *t = spec_time(C, k);
    if (!t) {
        C->failed = 1;
        return -2;
    }
    return tseries_valuation(t, C->I->ring.ctx);
}

static void spec_ctx_clear(spec_ctx *C)
{
    for (slong j = 0; j < C->nt; j++)
        tseries_clear(C->t + j, C->I->ring.ctx);
    free(C->t);
    free(C->have);
    free(C->lo);
    free(C->hi);
}

/* Reads genus, order variable and order, and checks every rule. */
static int spec_ctx_setup(spec_ctx *C)
{
    interp *I = C->I;
    const node *n = C->n;
    binding *b = scope_lookup(C->s, n->text);
    slong var = -1;
    if (b && b->kind == B_VALUE && b->val->kind == V_NUM && fmpq_mpoly_length(b->val->num, I->ring.ctx) == 1
        && fmpq_mpoly_is_gen(b->val->num, -1, I->ring.ctx)) {
        for (slong v = 0; v < I->ring.nvars && var < 0; v++)
            if (fmpq_mpoly_is_gen(b->val->num, v, I->ring.ctx))
                var = v;
    }
    if (var < 0) {
        diag_error(&n->loc, "the order variable '%s' must be a declared formal variable (var %s)", n->text,
                   n->text);
        return 0;
    }
    C->var = var;
    if (!eval_slong(I, C->s, n->a, "genus", 0, &C->g) || !eval_slong(I, C->s, n->b, "order", 0, &C->order))
        return 0;
    if (n->op == 'T' && !theta_genus_ok(I, n->a, C->g))
        return 0;
    if (C->g > SPEC_MAX_GENUS || C->order > SPEC_MAX_ORDER) {
        int genus = C->g > SPEC_MAX_GENUS;
        diag_error(&(genus ? n->a : n->b)->loc, "%s %ld is too large for a specialisation (at most %d)",
                   genus ? "genus" : "order", (long)(genus ? C->g : C->order), genus ? SPEC_MAX_GENUS : SPEC_MAX_ORDER);
        return 0;
    }
    C->lo = xcalloc(n->list->len, sizeof(slong));
    C->hi = xcalloc(n->list->len, sizeof(slong));
    for (int i = 0; i < n->list->len; i++)
        if (!spec_rule_check(C, i) || !spec_rule_unique(C, i))
            return 0;
    return 1;
}

static void spec_report_plan_error(spec_ctx *C, int rc)
{
    int i0 = spec_rule_for(C, 0), i1 = spec_rule_for(C, 1);
    const node *n = C->n;
    if (rc == SPEC_T0_CONSTANT)
        diag_error(&(i0 >= 0 ? n->list->items[i0] : n)->loc,
                   "t_0 must vanish at %s = 0: with a constant term every order would get infinitely many terms",
                   C->I->ring.names[C->var]);
    else if (rc == SPEC_T1_CONSTANT)
        diag_error(&(i1 >= 0 ? n->list->items[i1] : n)->loc,
                   "t_1 must vanish at %s = 0: with a constant term every order would get infinitely many terms",
                   C->I->ring.names[C->var]);
    else if (rc == SPEC_TOO_BIG)
        diag_error(&n->loc, "this specialisation needs more than %.3g correlators (raise the limit with --max-terms N)",
                   C->I->lim.max_terms);
    else if (rc == SPEC_BADARG)
        diag_error(&n->loc, "genus %ld or order %ld is out of range (at most genus %d and order %d)", (long)C->g,
                   (long)C->order, SPEC_MAX_GENUS, SPEC_MAX_ORDER);
    else if (!C->failed)
        failure_report(n, "the specialisation's planner", rc, -1, NULL);
}

/* Builds the plan; on success *P is owned by the caller. */
static int spec_prepare(spec_ctx *C, spec_plan **P)
{
    if (!spec_ctx_setup(C))
        return 0;
    int rc = C->n->op == 'T' ? spec_plan_build_theta(P, C->g, C->order, spec_valuation_cb, C, C->I->lim.max_terms)
                             : spec_plan_build(P, C->g, C->order, spec_valuation_cb, C, C->I->lim.max_terms);
    if (rc != SPEC_OK) {
        spec_report_plan_error(C, rc);
        return 0;
    }
    return 1;
}

value *specialise_value(interp *I, scope *s, const node *n)
{
    spec_ctx C = {I, s, n, 0, 0, 0, NULL, NULL, NULL, NULL, 0, 0};
    spec_plan *P = NULL;
    value *r = NULL;
    if (spec_prepare(&C, &P)) {
        slong kmax = spec_plan_max_k(P);
        int ok = 1;
        for (slong k = 0; k <= kmax && ok; k++)
            ok = spec_time(&C, k) != NULL;
        if (ok && n->op == 'T') {
            r = value_new_series(C.var, C.order, &I->ring);
            if (!theta_spec_evaluate(I, n, r->ser, P, C.t)) {
                value_release(r);
                r = NULL;
            }
        } else if (ok) {
            r = value_new_series(C.var, C.order, &I->ring);
            int rc = spec_plan_evaluate(r->ser, P, I->wk, C.t, I->ring.ctx);
            if (rc != SPEC_OK) {
                static const failure_words words[] = {
                    {SPEC_WK, "the correlator table reached its size limit (raise it with --max-table N)"},
                    {0, NULL},
                };
                failure_report(n, "the specialisation's evaluation", rc, -1, words);
                value_release(r);
                r = NULL;
            } else if (I->verify) {
                r = verify_unchecked_value(I, n, r, VERIFY_WHY_NO_ROUTE_SERIES);
            }
        }
    }
    spec_plan_free(P);
    spec_ctx_clear(&C);
    return r;
}

int specialise_explain(interp *I, scope *s, const node *n)
{
    spec_ctx C = {I, s, n, 0, 0, 0, NULL, NULL, NULL, NULL, 0, 0};
    spec_plan *P = NULL;
    int ok = spec_prepare(&C, &P);
    if (ok)
        spec_plan_print(I->out, P);
    if (ok && spec_plan_is_theta(P)) {
        double entries = theta_estimate_entries(C.g);
        fprintf(I->out, "  memo estimate: at most %.3g Theta entr%s\n", entries, entries == 1 ? "y" : "ies");
    }
    spec_plan_free(P);
    spec_ctx_clear(&C);
    return ok;
}
