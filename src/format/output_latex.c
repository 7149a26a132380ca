/* LaTeX of scalars and class expressions (output.h, output_internal.h). */
#include "output.h"

#include <stdlib.h>
#include <string.h>

#include "output_internal.h"
#include "print.h"
#include "strbuf.h"
#include "util.h"

static const char *const out_greek[] = {
    "alpha", "beta",  "gamma", "delta", "epsilon", "zeta",  "eta",   "theta", "iota",    "kappa",
    "lambda", "mu",   "nu",    "xi",    "pi",      "rho",   "sigma", "tau",   "upsilon", "phi",
    "chi",   "psi",   "omega", "Gamma", "Delta",   "Theta", "Lambda", "Xi",   "Pi",      "Sigma",
    "Upsilon", "Phi", "Psi",   "Omega"};

/* True for a name of the form [A-Za-z][A-Za-z0-9_]*.
   Such names render as math symbols; anything else as escaped text. */
static int out_is_identifier(const char *s)
{
    if (!s || !((*s >= 'A' && *s <= 'Z') || (*s >= 'a' && *s <= 'z')))
        return 0;
    for (; *s; s++)
        if (!(*s == '_' || (*s >= '0' && *s <= '9') || (*s >= 'A' && *s <= 'Z') || (*s >= 'a' && *s <= 'z')))
            return 0;
    return 1;
}

/* Appends text escaped for LaTeX text mode inside \mbox{...}.
   Control bytes become spaces: they have no printable meaning in a table. */
void out_latex_put_text(strbuf *b, const char *s)
{
    strbuf_puts(b, "\\mbox{");
    for (; *s; s++) {
        unsigned char c = (unsigned char)*s;
        if (strchr("#$%&_{}", c))
            strbuf_printf(b, "\\%c", c);
        else if (c == '\\')
            strbuf_puts(b, "\\textbackslash{}");
        else if (c == '~')
            strbuf_puts(b, "\\textasciitilde{}");
        else if (c == '^')
            strbuf_puts(b, "\\textasciicircum{}");
        else if (c < 32 || c == 127)
            strbuf_putc(b, ' ');
        else
            strbuf_putc(b, (char)c);
    }
    strbuf_putc(b, '}');
}

/* Appends the base of a symbol name (the part before any '_').
   One letter stays italic, Greek names become macros, longer names \mathit. */
static void out_latex_put_base(strbuf *b, const char *base, size_t len)
{
    for (size_t i = 0; i < sizeof out_greek / sizeof out_greek[0]; i++)
        if (strlen(out_greek[i]) == len && strncmp(out_greek[i], base, len) == 0) {
            strbuf_printf(b, "\\%s", out_greek[i]);
            return;
        }
    if (len == 1)
        strbuf_putc(b, base[0]);
    else
        strbuf_printf(b, "\\mathit{%.*s}", (int)len, base);
}

/* Appends a variable or label name in math mode: L_1 -> L_{1}, pi -> \pi.
   Non-identifiers (free text such as a column title) go through \mbox. */
void out_latex_put_name(strbuf *b, const char *name)
{
    if (!out_is_identifier(name)) {
        out_latex_put_text(b, name ? name : "?");
        return;
    }
    const char *us = strchr(name, '_');
    size_t blen = us ? (size_t)(us - name) : strlen(name);
    out_latex_put_base(b, name, blen);
    if (!us)
        return;
    strbuf_puts(b, "_{");
    for (const char *s = us + 1; *s; s++)
        if (*s == '_')
            strbuf_puts(b, "\\_");
        else
            strbuf_putc(b, *s);
    strbuf_putc(b, '}');
}

/* Appends the variables of term i of p, e.g. L_{1}^{2} \pi^{2}.
   Returns 0 when the monomial is 1 (nothing appended). */
static int out_latex_put_monomial(strbuf *b, const fmpq_mpoly_t p, slong i, const scalar_ring *R)
{
    ulong exp[SCALAR_MAX_VARS];
    int any = 0;
    fmpq_mpoly_get_term_exp_ui(exp, p, i, R->ctx);
    for (int v = 0; v < SCALAR_MAX_VARS; v++) {
        if (exp[v] == 0)
            continue;
        if (any)
            strbuf_putc(b, ' ');
        any = 1;
        if (v == SCALAR_PINV) {
            strbuf_printf(b, "\\pi^{-%lu}", exp[v]);
            continue;
        }
        out_latex_put_name(b, R->names[v] ? R->names[v] : "?");
        if (exp[v] > 1)
            strbuf_printf(b, "^{%lu}", exp[v]);
        any = 1;
    }
    return any;
}

/* Appends the numerator d*p term by term (integers times monomials).
   With drop_sign the leading minus of a single term is left to the caller. */
static void out_latex_put_numerator(strbuf *b, const fmpq_mpoly_t p, const fmpz_t d, const scalar_ring *R,
                                    int drop_sign)
{
    fmpq_t c;
    fmpz_t a;
    fmpq_init(c);
    fmpz_init(a);
    for (slong i = 0; i < fmpq_mpoly_length(p, R->ctx); i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
        fmpz_divexact(a, d, fmpq_denref(c));
        fmpz_mul(a, a, fmpq_numref(c));
        if (fmpz_sgn(a) < 0 && !(drop_sign && i == 0))
            strbuf_puts(b, i == 0 ? "-" : " - ");
        else if (i > 0)
            strbuf_puts(b, " + ");
        fmpz_abs(a, a);
        strbuf t;
        strbuf_init(&t);
        int mono = out_latex_put_monomial(&t, p, i, R);
        if (!mono || !fmpz_is_one(a)) {
            strbuf_put_fmpz(b, a);
            if (mono)
                strbuf_putc(b, ' ');
        }
        strbuf_puts(b, t.data);
        strbuf_clear(&t);
    }
    fmpz_clear(a);
    fmpq_clear(c);
}

/* The denominator d pi^k of a fraction: 48, \pi, 2 \pi^{3}. */
static void out_latex_put_denominator(strbuf *b, const fmpz_t d, slong k)
{
    if (!fmpz_is_one(d) || k == 0)
        strbuf_put_fmpz(b, d);
    if (!fmpz_is_one(d) && k > 0)
        strbuf_putc(b, ' ');
    if (k == 1)
        strbuf_puts(b, "\\pi");
    else if (k > 1)
        strbuf_printf(b, "\\pi^{%ld}", (long)k);
}

/* LaTeX of a scalar over one common denominator, like the exact text form: negative powers of
   pi go into it (\frac{\pi^{2} + 3}{\pi^{2}}, as (pi^2 + 3)/pi^2 is printed).
   A lone negative term keeps its sign outside the fraction: -\frac{1}{2}. */
char *out_latex_scalar(const fmpq_mpoly_t p, const scalar_ring *R)
{
    strbuf b;
    strbuf_init(&b);
    fmpq_mpoly_t q;
    fmpq_mpoly_init(q, R->ctx);
    fmpq_mpoly_set(q, p, R->ctx);
    scalar_normalise(q, R);
    slong k = scalar_pinv_degree(q, R), len = fmpq_mpoly_length(q, R->ctx);
    if (len == 0) {
        fmpq_mpoly_clear(q, R->ctx);
        strbuf_putc(&b, '0');
        return strbuf_take(&b);
    }
    if (k > 0)
        scalar_mul_pi_pow(q, q, k, R);
    fmpz_t d;
    fmpq_t c;
    fmpz_init(d);
    fmpq_init(c);
    fmpz_one(d);
    for (slong i = 0; i < len; i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, q, i, R->ctx);
        fmpz_lcm(d, d, fmpq_denref(c));
    }
    fmpq_mpoly_get_term_coeff_fmpq(c, q, 0, R->ctx);
    int fraction = !fmpz_is_one(d) || k > 0;
    int outer_minus = len == 1 && fmpq_sgn(c) < 0 && fraction;
    if (!fraction) {
        out_latex_put_numerator(&b, q, d, R, 0);
    } else {
        strbuf_puts(&b, outer_minus ? "-\\frac{" : "\\frac{");
        out_latex_put_numerator(&b, q, d, R, outer_minus);
        strbuf_puts(&b, "}{");
        out_latex_put_denominator(&b, d, k);
        strbuf_putc(&b, '}');
    }
    fmpq_clear(c);
    fmpz_clear(d);
    fmpq_mpoly_clear(q, R->ctx);
    return strbuf_take(&b);
}

/* How tightly a class node binds when printed: 1 sums, 2 negative terms
   (fine as a left factor only), 3 products, 4 atoms. */
static int out_latex_level(const cx *e, const scalar_ring *R)
{
    switch (e->kind) {
    case CX_ADD:
        return 1;
    case CX_MUL:
        return 3;
    case CX_SCALAR:
        if (fmpq_mpoly_length(e->scalar, R->ctx) > 1)
            return 1;
        if (fmpq_mpoly_length(e->scalar, R->ctx) == 1) {
            fmpq_t c;
            fmpq_init(c);
            fmpq_mpoly_get_term_coeff_fmpq(c, e->scalar, 0, R->ctx);
            int neg = fmpq_sgn(c) < 0;
            fmpq_clear(c);
            if (neg)
                return 2;
        }
        return 3;
    default:
        return 4;
    }
}


/* Appends e, in \left( \right) when it binds less tightly than min_level.
   Returns the new text through a separate buffer so callers can inspect it. */
static char *out_latex_operand(const cx *e, int min_level, const scalar_ring *R)
{
    strbuf t;
    strbuf_init(&t);
    int paren = out_latex_level(e, R) < min_level;
    if (paren)
        strbuf_puts(&t, "\\left(");
    out_latex_class_rec(&t, e, R);
    if (paren)
        strbuf_puts(&t, "\\right)");
    return strbuf_take(&t);
}

/* Appends a chain of sums x0 + x1 + ... (sum[] builds long ones) in a loop,
   writing a + (-x) as a - x. No term needs parentheses: addition is
   associative. */
static void out_latex_put_sum(strbuf *b, const cx *e, const scalar_ring *R)
{
    const cx **ops;
    slong n = cx_chain(e, CX_ADD, &ops);
    for (slong i = 0; i < n; i++) {
        char *t = out_latex_operand(ops[i], 1, R);
        if (i == 0)
            strbuf_puts(b, t);
        else if (t[0] == '-')
            strbuf_printf(b, " - %s", t + 1);
        else
            strbuf_printf(b, " + %s", t);
        free(t);
    }
    free(ops);
}

/* Appends a chain of products by juxtaposition (prod[] builds long ones);
   \cdot only where two numbers would otherwise run together (2 \cdot 3,
   \frac{1}{2} \cdot \frac{1}{3}). */
static void out_latex_put_product(strbuf *b, const cx *e, const scalar_ring *R)
{
    const cx **ops;
    slong n = cx_chain(e, CX_MUL, &ops);
    for (slong i = 0; i < n; i++) {
        char *t = out_latex_operand(ops[i], i ? 3 : 2, R);
        int dot = (t[0] >= '0' && t[0] <= '9') || strncmp(t, "\\frac", 5) == 0;
        strbuf_printf(b, "%s%s", i == 0 ? "" : dot ? " \\cdot " : " ", t);
        free(t);
    }
    free(ops);
}

/* Appends the LaTeX of a class expression tree.
   Mirrors print_class (format/print.c) so both forms read the same. */
void out_latex_class_rec(strbuf *b, const cx *e, const scalar_ring *R)
{
    char *s;
    if (util_stack_exhausted()) {   /* out_value then refuses the value */
        print_mark_too_deep();
        return;
    }
    switch (e->kind) {
    case CX_SCALAR:
        s = out_latex_scalar(e->scalar, R);
        strbuf_puts(b, s);
        free(s);
        break;
    case CX_PSI:
        strbuf_printf(b, "\\psi_{%ld}", (long)e->index);
        break;
    case CX_KAPPA:
        strbuf_printf(b, "\\kappa_{%ld}", (long)e->index);
        break;
    case CX_THETA:
        strbuf_puts(b, "\\Theta");
        break;
    case CX_LAMBDA:
        strbuf_printf(b, "\\lambda_{%ld}", (long)e->index);
        break;
    case CX_CH:
        strbuf_printf(b, "\\mathrm{ch}_{%ld}", (long)e->index);
        break;
    case CX_BOUNDARY:
    case CX_STRATUM:
        print_boundary(b, e, 1);
        break;
    case CX_ADD:
        out_latex_put_sum(b, e, R);
        break;
    case CX_MUL:
        out_latex_put_product(b, e, R);
        break;
    case CX_POW:
        s = out_latex_operand(e->a, 4, R);
        strbuf_printf(b, "%s^{%ld}", s, (long)e->index);
        free(s);
        break;
    case CX_EXP:
        strbuf_puts(b, "\\exp\\left(");
        out_latex_class_rec(b, e->a, R);
        strbuf_puts(b, "\\right)");
        break;
    }
}

