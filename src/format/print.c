#include "print.h"

#include <stdlib.h>
#include <string.h>

#include "util.h"

/* Binding strength of each kind, to decide where parentheses are needed. */
static int print_level(const cx *e, const scalar_ring *R)
{
    switch (e->kind) {
    case CX_ADD:
        return 1;
    case CX_MUL:
        return 2;
    case CX_SCALAR:
        return fmpq_mpoly_length(e->scalar, R->ctx) > 1 || fmpq_mpoly_is_fmpq(e->scalar, R->ctx) ? 1 : 2;
    default:
        return 3;
    }
}

static void print_class_rec(strbuf *b, const cx *e, const scalar_ring *R);

static void print_operand(strbuf *b, const cx *e, int min_level, const scalar_ring *R)
{
    int paren = print_level(e, R) < min_level;
    if (paren)
        strbuf_putc(b, '(');
    print_class_rec(b, e, R);
    if (paren)
        strbuf_putc(b, ')');
}

/* Set when a printer stopped at the stack guard; see print_take_too_deep. */
static _Thread_local int print_too_deep;

void print_mark_too_deep(void)
{
    print_too_deep = 1;
}

int print_take_too_deep(void)
{
    int r = print_too_deep;
    print_too_deep = 0;
    return r;
}

/* A chain of sums or products (long ones come from sum[] and prod[]) in a
   loop: the same text as nested binary nodes, without their recursion. */
static void print_chain(strbuf *b, const cx *e, const scalar_ring *R)
{
    const cx **ops;
    int add = e->kind == CX_ADD;
    slong n = cx_chain(e, e->kind, &ops);
    for (slong i = 0; i < n; i++) {
        if (i)
            strbuf_puts(b, add ? " + " : "*");
        print_operand(b, ops[i], add ? 1 : 2, R);
    }
    free(ops);
}

void print_boundary(strbuf *b, const cx *e, int latex)
{
    if (e->kind == CX_STRATUM) {
        strbuf_printf(b, latex ? "\\mathrm{stratum}_{%ld,%ld,%ld}" : "stratum_{%ld,%ld,%ld}", (long)e->graph[0],
                      (long)e->graph[1], (long)e->graph[2]);
        return;
    }
    if (e->index == CX_BOUNDARY_IRR) {
        strbuf_puts(b, latex ? "\\delta_{\\mathrm{irr}}" : "delta_{irr}");
        return;
    }
    if (e->legs == 0) {           /* no leg on the genus-h side: delta_{h}, as on Mbar_g */
        strbuf_printf(b, "%sdelta_{%ld}", latex ? "\\" : "", (long)e->index);
        return;
    }
    strbuf_printf(b, latex ? "\\delta_{%ld,\\{" : "delta_{%ld,[", (long)e->index);
    int first = 1;
    for (int i = 0; i < 64; i++)
        if (e->legs >> i & 1) {
            strbuf_printf(b, first ? "%d" : ",%d", i + 1);
            first = 0;
        }
    strbuf_puts(b, latex ? "\\}}" : "]}");
}

static void print_class_rec(strbuf *b, const cx *e, const scalar_ring *R)
{
    char *s;
    if (util_stack_exhausted()) {
        print_mark_too_deep();
        strbuf_puts(b, "...");
        return;
    }
    switch (e->kind) {
    case CX_SCALAR:
        s = scalar_get_str(e->scalar, R);
        strbuf_puts(b, s);
        free(s);
        break;
    case CX_PSI:
        strbuf_printf(b, "psi_%ld", (long)e->index);
        break;
    case CX_KAPPA:
        strbuf_printf(b, "kappa_%ld", (long)e->index);
        break;
    case CX_THETA:
        strbuf_puts(b, "Theta");
        break;
    case CX_LAMBDA:
        strbuf_printf(b, "lambda_%ld", (long)e->index);
        break;
    case CX_CH:
        strbuf_printf(b, "ch_%ld", (long)e->index);
        break;
    case CX_BOUNDARY:
    case CX_STRATUM:
        print_boundary(b, e, 0);
        break;
    case CX_ADD:
    case CX_MUL:
        print_chain(b, e, R);
        break;
    case CX_POW:
        print_operand(b, e->a, 3, R);
        strbuf_printf(b, "^%ld", (long)e->index);
        break;
    case CX_EXP:
        strbuf_puts(b, "exp(");
        print_class_rec(b, e->a, R);
        strbuf_putc(b, ')');
        break;
    }
}

char *print_class(const cx *e, const scalar_ring *R)
{
    strbuf b;
    strbuf_init(&b);
    print_class_rec(&b, e, R);
    return strbuf_take(&b);
}

char *print_series(const tseries *s, const scalar_ring *R)
{
    strbuf b;
    strbuf_init(&b);
    fmpq_mpoly_t c;
    fmpq_mpoly_init(c, R->ctx);
    const char *x = R->names[s->var] ? R->names[s->var] : "?";
    int first = 1;
    for (slong k = 0; k <= s->order; k++) {
        tseries_coeff(c, s, k, R->ctx);
        if (fmpq_mpoly_is_zero(c, R->ctx))
            continue;
        char *t = scalar_get_str(c, R);
        int neg = t[0] == '-' && fmpq_mpoly_length(c, R->ctx) == 1;
        const char *body = neg ? t + 1 : t;
        strbuf_puts(&b, first ? (neg ? "-" : "") : (neg ? " - " : " + "));
        int paren = fmpq_mpoly_length(c, R->ctx) > 1 && k > 0;
        if (k == 0 || strcmp(body, "1") != 0)
            strbuf_printf(&b, paren ? "(%s)%s" : "%s%s", body, k > 0 ? "*" : "");
        if (k == 1)
            strbuf_puts(&b, x);
        else if (k > 1)
            strbuf_printf(&b, "%s^%ld", x, (long)k);
        free(t);
        first = 0;
    }
    fmpq_mpoly_clear(c, R->ctx);
    strbuf_printf(&b, "%sO(%s^%ld)", first ? "" : " + ", x, (long)(s->order + 1));
    return strbuf_take(&b);
}

char *print_real(const arb_t x)
{
    slong bits = arb_rel_accuracy_bits(x);
    slong digits = arb_is_exact(x) ? 30 : (slong)(bits * 0.30102999566398) - 1;
    char *s = digits >= 1 ? arb_get_str(x, digits, ARB_STR_NO_RADIUS) : arb_get_str(x, 5, 0);
    char *r = xstrdup(s);
    flint_free(s);
    return r;
}

void print_correlator(strbuf *b, slong g, const slong *d, slong n)
{
    strbuf_putc(b, '<');
    for (slong i = n - 1; i >= 0;) {
        slong j = i;
        while (j >= 0 && d[j] == d[i])
            j--;
        strbuf_printf(b, "%stau_%ld", i < n - 1 ? " " : "", (long)d[i]);
        if (i - j > 1)
            strbuf_printf(b, "^%ld", (long)(i - j));
        i = j;
    }
    strbuf_printf(b, ">_%ld", (long)g);
}

/* Appends a coefficient c of a sum being written: " + c*" or " - c*" (c*
   alone, or -c*, when first), nothing but the sign for 1, and (c)* when c
   has several terms. */
void print_signed_coeff(strbuf *b, const fmpq_mpoly_t c, int first, const scalar_ring *ring)
{
    fmpq_mpoly_t a;
    fmpq_mpoly_init(a, ring->ctx);
    fmpq_mpoly_set(a, c, ring->ctx);
    int single = fmpq_mpoly_length(a, ring->ctx) == 1;
    fmpq_t lead;
    fmpq_init(lead);
    fmpq_mpoly_get_term_coeff_fmpq(lead, a, 0, ring->ctx);
    if (single && fmpq_sgn(lead) < 0) {
        strbuf_puts(b, first ? "-" : " - ");
        fmpq_mpoly_neg(a, a, ring->ctx);
    } else if (!first) {
        strbuf_puts(b, " + ");
    }
    if (!fmpq_mpoly_is_one(a, ring->ctx)) {
        char *s = scalar_get_str(a, ring);
        strbuf_printf(b, single ? "%s*" : "(%s)*", s);
        free(s);
    }
    fmpq_clear(lead);
    fmpq_mpoly_clear(a, ring->ctx);
}
