#include "scalar.h"

#include <stdlib.h>
#include <string.h>

#include "strbuf.h"
#include "util.h"

void scalar_ring_init(scalar_ring *R)
{
    fmpq_mpoly_ctx_init(R->ctx, SCALAR_MAX_VARS, ORD_DEGLEX);
    memset(R->names, 0, sizeof R->names);
    R->names[SCALAR_PI] = xstrdup("pi");
    R->names[SCALAR_PINV] = xstrdup("1/pi");   /* the serial form's name; printing shows pi^-k */
    R->nvars = 0;
}

void scalar_ring_clear(scalar_ring *R)
{
    for (int i = 0; i < SCALAR_MAX_VARS; i++)
        free(R->names[i]);
    fmpq_mpoly_ctx_clear(R->ctx);
}

int scalar_ring_declare(scalar_ring *R, const char *name)
{
    for (int i = 0; i < R->nvars; i++)
        if (strcmp(R->names[i], name) == 0)
            return i;
    if (R->nvars >= SCALAR_MAX_DECLARED)
        return -1;
    R->names[R->nvars] = xstrdup(name);
    return R->nvars++;
}

void scalar_set_gen(fmpq_mpoly_t p, const scalar_ring *R, int var)
{
    fmpq_mpoly_gen(p, var, R->ctx);
}

int scalar_get_fmpq(fmpq_t q, const fmpq_mpoly_t p, const scalar_ring *R)
{
    if (!fmpq_mpoly_is_fmpq(p, R->ctx))
        return 0;
    fmpq_mpoly_get_fmpq(q, p, R->ctx);
    return 1;
}

int scalar_get_slong(slong *v, const fmpq_mpoly_t p, const scalar_ring *R)
{
    fmpq_t q;
    fmpq_init(q);
    int ok = scalar_get_fmpq(q, p, R) && fmpz_is_one(fmpq_denref(q)) && fmpz_fits_si(fmpq_numref(q));
    if (ok)
        *v = fmpz_get_si(fmpq_numref(q));
    fmpq_clear(q);
    return ok;
}

int scalar_is_pi_only(const fmpq_mpoly_t p, const scalar_ring *R)
{
    slong deg[SCALAR_MAX_VARS];
    if (fmpq_mpoly_is_zero(p, R->ctx))
        return 1;
    fmpq_mpoly_degrees_si(deg, p, R->ctx);
    for (int i = 0; i < SCALAR_PINV; i++)
        if (deg[i] > 0)
            return 0;
    return 1;
}

char *scalar_monomial_str(const fmpq_mpoly_t p, slong i, const scalar_ring *R)
{
    ulong exp[SCALAR_MAX_VARS];
    fmpq_mpoly_get_term_exp_ui(exp, p, i, R->ctx);
    strbuf b;
    strbuf_init(&b);
    for (int v = 0; v < SCALAR_MAX_VARS; v++) {
        if (exp[v] == 0)
            continue;
        if (b.len > 0)
            strbuf_putc(&b, '*');
        if (v == SCALAR_PINV) {
            strbuf_printf(&b, "pi^-%lu", exp[v]);
            continue;
        }
        strbuf_puts(&b, R->names[v] ? R->names[v] : "?");
        if (exp[v] > 1)
            strbuf_printf(&b, "^%lu", exp[v]);
    }
    return strbuf_take(&b);
}

/* Writes c*m for an integer coefficient c (sign handled by the caller). */
static void scalar_put_term(strbuf *b, const fmpz_t c, const char *mono)
{
    if (mono[0] == '\0') {
        strbuf_put_fmpz(b, c);
    } else if (fmpz_is_one(c)) {
        strbuf_puts(b, mono);
    } else {
        strbuf_put_fmpz(b, c);
        strbuf_putc(b, '*');
        strbuf_puts(b, mono);
    }
}

/* Common denominator of all coefficients, so that the polynomial prints as
   (integer polynomial)/d. */
static void scalar_denominator(fmpz_t d, const fmpq_mpoly_t p, const scalar_ring *R)
{
    fmpq_t c;
    fmpq_init(c);
    fmpz_one(d);
    for (slong i = 0; i < fmpq_mpoly_length(p, R->ctx); i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
        fmpz_lcm(d, d, fmpq_denref(c));
    }
    fmpq_clear(c);
}

static void scalar_put_numerator(strbuf *b, const fmpq_mpoly_t p, const fmpz_t d, const scalar_ring *R)
{
    fmpq_t c;
    fmpz_t a;
    fmpq_init(c);
    fmpz_init(a);
    for (slong i = 0; i < fmpq_mpoly_length(p, R->ctx); i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
        fmpz_divexact(a, d, fmpq_denref(c));
        fmpz_mul(a, a, fmpq_numref(c));
        if (fmpz_sgn(a) < 0)
            strbuf_puts(b, i == 0 ? "-" : " - ");
        else if (i > 0)
            strbuf_puts(b, " + ");
        fmpz_abs(a, a);
        char *mono = scalar_monomial_str(p, i, R);
        scalar_put_term(b, a, mono);
        free(mono);
    }
    fmpz_clear(a);
    fmpq_clear(c);
}

char *scalar_join_terms(const fmpq_mpoly_t p, const scalar_ring *R, scalar_term_fn term)
{
    strbuf b;
    strbuf_init(&b);
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, R->ctx);
    slong len = fmpq_mpoly_length(p, R->ctx);
    for (slong i = 0; i < len; i++) {
        fmpq_mpoly_get_term(t, p, i, R->ctx);
        char *s = term(t, R);
        int neg = s[0] == '-';
        if (i > 0)
            strbuf_puts(&b, neg ? " - " : " + ");
        strbuf_puts(&b, i > 0 && neg ? s + 1 : s);
        free(s);
    }
    if (len == 0)
        strbuf_putc(&b, '0');
    fmpq_mpoly_clear(t, R->ctx);
    return strbuf_take(&b);
}

char *scalar_get_str_termwise(const fmpq_mpoly_t p, const scalar_ring *R)
{
    return scalar_join_terms(p, R, scalar_get_str);
}

/* p with negative powers of pi, over the common denominator d*pi^k:
   1/pi, 3/(4*pi^2), (L_1^2 + 4*pi^2)/(48*pi^2). */
static char *scalar_get_str_laurent(const fmpq_mpoly_t p, const scalar_ring *R)
{
    fmpq_mpoly_t q;
    fmpq_mpoly_init(q, R->ctx);
    fmpq_mpoly_set(q, p, R->ctx);
    scalar_normalise(q, R);
    slong k = scalar_pinv_degree(q, R);
    if (k == 0) {   /* only pi * (1/pi) pairs: a polynomial after all */
        char *t = scalar_get_str(q, R);
        fmpq_mpoly_clear(q, R->ctx);
        return t;
    }
    scalar_mul_pi_pow(q, q, k, R);
    strbuf b;
    strbuf_init(&b);
    fmpz_t d;
    fmpz_init(d);
    scalar_denominator(d, q, R);
    int paren = fmpq_mpoly_length(q, R->ctx) > 1;
    strbuf_puts(&b, paren ? "(" : "");
    scalar_put_numerator(&b, q, d, R);
    strbuf_puts(&b, paren ? ")/" : "/");
    if (!fmpz_is_one(d)) {
        strbuf_putc(&b, '(');
        strbuf_put_fmpz(&b, d);
        strbuf_putc(&b, '*');
    }
    strbuf_puts(&b, "pi");
    if (k > 1)
        strbuf_printf(&b, "^%ld", (long)k);
    if (!fmpz_is_one(d))
        strbuf_putc(&b, ')');
    fmpz_clear(d);
    fmpq_mpoly_clear(q, R->ctx);
    return strbuf_take(&b);
}

char *scalar_get_str(const fmpq_mpoly_t p, const scalar_ring *R)
{
    strbuf b;
    strbuf_init(&b);
    slong len = fmpq_mpoly_length(p, R->ctx);
    if (len == 0)
        return strbuf_puts(&b, "0"), strbuf_take(&b);
    if (scalar_pinv_degree(p, R) > 0) {
        strbuf_clear(&b);
        return scalar_get_str_laurent(p, R);
    }
    fmpz_t d;
    fmpz_init(d);
    scalar_denominator(d, p, R);
    int paren = len > 1 && !fmpz_is_one(d);
    if (paren)
        strbuf_putc(&b, '(');
    scalar_put_numerator(&b, p, d, R);
    if (paren)
        strbuf_putc(&b, ')');
    if (!fmpz_is_one(d)) {
        strbuf_putc(&b, '/');
        strbuf_put_fmpz(&b, d);
    }
    fmpz_clear(d);
    return strbuf_take(&b);
}

char *scalar_serialise(const fmpq_mpoly_t p, const scalar_ring *R)
{
    strbuf b;
    strbuf_init(&b);
    fmpq_t c;
    fmpq_init(c);
    ulong exp[SCALAR_MAX_VARS];
    for (slong i = 0; i < fmpq_mpoly_length(p, R->ctx); i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
        fmpq_mpoly_get_term_exp_ui(exp, p, i, R->ctx);
        strbuf_put_fmpq(&b, c);
        for (int v = 0; v < SCALAR_MAX_VARS; v++)
            if (exp[v] > 0)
                strbuf_printf(&b, " %s^%lu", R->names[v] ? R->names[v] : "?", exp[v]);
        strbuf_putc(&b, '\n');
    }
    fmpq_clear(c);
    return strbuf_take(&b);
}

/* Reads one "name^e" factor into exp; returns the text after it or NULL. */
static const char *scalar_read_factor(const char *s, ulong *exp, scalar_ring *R)
{
    const char *caret = strchr(s, '^');
    const char *end = strpbrk(s, " \n");
    if (!caret || (end && caret > end))
        return NULL;
    char *name = xasprintf("%.*s", (int)(caret - s), s);
    int v = strcmp(name, "pi") == 0 ? SCALAR_PI : strcmp(name, "1/pi") == 0 ? SCALAR_PINV : scalar_ring_declare(R, name);
    free(name);
    char *after;
    unsigned long e = strtoul(caret + 1, &after, 10);
    if (v < 0 || after == caret + 1)
        return NULL;
    exp[v] += e;
    return after;
}

/* Reads one line "c f1 f2 ..." and adds the term to p; NULL on malformed text. */
static const char *scalar_read_term(fmpq_mpoly_t p, const char *s, scalar_ring *R)
{
    ulong exp[SCALAR_MAX_VARS] = {0};
    size_t len = strcspn(s, " \n");
    char *num = xasprintf("%.*s", (int)len, s);
    fmpq_t c;
    fmpq_init(c);
    int ok = fmpq_set_str(c, num, 10) == 0;
    free(num);
    for (s += len; ok && *s == ' ';)
        ok = (s = scalar_read_factor(s + 1, exp, R)) != NULL;
    ok = ok && *s == '\n';
    if (ok) {
        fmpq_mpoly_t t;
        fmpq_mpoly_init(t, R->ctx);
        fmpq_mpoly_set_coeff_fmpq_ui(t, c, exp, R->ctx);
        fmpq_mpoly_add(p, p, t, R->ctx);
        fmpq_mpoly_clear(t, R->ctx);
    }
    fmpq_clear(c);
    return ok ? s + 1 : NULL;
}

int scalar_deserialise(fmpq_mpoly_t p, const char *text, scalar_ring *R)
{
    fmpq_mpoly_zero(p, R->ctx);
    for (const char *s = text; s && *s;)
        if (!(s = scalar_read_term(p, s, R))) {
            fmpq_mpoly_zero(p, R->ctx);
            return 0;
        }
    return 1;
}
