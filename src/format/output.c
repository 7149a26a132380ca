#include "output.h"

#include <stdlib.h>
#include <string.h>

#include "arb_compat.h"
#include "scalar_arb.h"
#include "strbuf.h"
#include "util.h"
#include "print.h"
#include "value_str.h"

static const char *const out_format_names[] = {"exact", "decimal", "latex", "csv", "json"};

/* Maps a user-supplied name to a format.
   Returns 1 and sets *f on a match, 0 otherwise. */
int out_format_parse(out_format *f, const char *name)
{
    for (int i = 0; i < 5; i++)
        if (name && strcmp(name, out_format_names[i]) == 0) {
            *f = (out_format)i;
            return 1;
        }
    return 0;
}

/* Name of a format for messages and help.
   Returns static storage; "?" for an out-of-range value. */
const char *out_format_name(out_format f)
{
    return (int)f >= 0 && (int)f < 5 ? out_format_names[f] : "?";
}

/* ------------------------------------------------------------ decimals */

/* Rewrites Arb's 9.7e+1 as 97 in place when the exponent is smaller than
   the number of digits shown, so no zero is printed that was not computed. */
static void out_decimal_positional(char *s)
{
    char *e = strstr(s, "e+");
    if (!e)
        return;
    long k = strtol(e + 2, NULL, 10);
    char *m = s + (s[0] == '-'), digs[64];
    size_t nd = 0;
    for (char *p = m; p < e; p++)
        if (*p != '.' && nd < sizeof digs)
            digs[nd++] = *p;
    if (nd >= sizeof digs || k < 0 || (size_t)k >= nd)
        return;
    size_t w = 0;
    for (size_t i = 0; i < nd; i++) {
        m[w++] = digs[i];
        if (i == (size_t)k && i + 1 < nd)
            m[w++] = '.';
    }
    m[w] = '\0';
}

/* Evaluates p with enough working precision for `digits` correct digits.
   Terminates: a nonzero polynomial in pi is nonzero (pi is transcendental),
   so doubling the precision eventually separates it from 0. */
char *out_decimal(const fmpq_mpoly_t p, const scalar_ring *R, slong digits, int show_radius)
{
    if (!scalar_is_pi_only(p, R))
        return NULL;
    if (digits < 1)
        digits = 1;
    arb_t r;
    arb_init(r);
    slong want = (slong)((double)digits * 3.33) + 10;
    for (slong prec = want + 30;; prec *= 2) {
        scalar_get_arb(r, p, R, prec);
        if (arb_is_exact(r) || arb_rel_accuracy_bits(r) >= want)
            break;
    }
    char *t = arb_get_str(r, digits, show_radius ? 0 : ARB_STR_NO_RADIUS);
    char *s = xstrdup(t);
    if (!show_radius)
        out_decimal_positional(s);
    flint_free(t);
    arb_clear(r);
    return s;
}

/* ------------------------------------------------------------ LaTeX */

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
static void out_latex_put_text(strbuf *b, const char *s)
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
static void out_latex_put_name(strbuf *b, const char *name)
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

/* LaTeX of a scalar over one common denominator, like the exact text form.
   A lone negative term keeps its sign outside the fraction: -\frac{1}{2}. */
char *out_latex_scalar(const fmpq_mpoly_t p, const scalar_ring *R)
{
    strbuf b;
    strbuf_init(&b);
    slong len = fmpq_mpoly_length(p, R->ctx);
    if (len == 0) {
        strbuf_putc(&b, '0');
        return strbuf_take(&b);
    }
    fmpz_t d;
    fmpq_t c;
    fmpz_init(d);
    fmpq_init(c);
    fmpz_one(d);
    for (slong i = 0; i < len; i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
        fmpz_lcm(d, d, fmpq_denref(c));
    }
    fmpq_mpoly_get_term_coeff_fmpq(c, p, 0, R->ctx);
    int outer_minus = len == 1 && fmpq_sgn(c) < 0 && !fmpz_is_one(d);
    if (fmpz_is_one(d)) {
        out_latex_put_numerator(&b, p, d, R, 0);
    } else {
        strbuf_puts(&b, outer_minus ? "-\\frac{" : "\\frac{");
        out_latex_put_numerator(&b, p, d, R, outer_minus);
        strbuf_puts(&b, "}{");
        strbuf_put_fmpz(&b, d);
        strbuf_putc(&b, '}');
    }
    fmpq_clear(c);
    fmpz_clear(d);
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

static void out_latex_class_rec(strbuf *b, const cx *e, const scalar_ring *R);

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
static void out_latex_class_rec(strbuf *b, const cx *e, const scalar_ring *R)
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

/* ------------------------------------------------------------ CSV, JSON */

/* Returns s as one RFC 4180 field: quoted (quotes doubled) when it holds a
   comma, quote or line break, verbatim otherwise. Caller frees. */
static char *out_csv_field(const char *s)
{
    if (!strpbrk(s, ",\"\r\n"))
        return xstrdup(s);
    strbuf b;
    strbuf_init(&b);
    strbuf_putc(&b, '"');
    for (; *s; s++) {
        if (*s == '"')
            strbuf_putc(&b, '"');
        strbuf_putc(&b, *s);
    }
    strbuf_putc(&b, '"');
    return strbuf_take(&b);
}

/* Length of the valid UTF-8 sequence at s, or 0 when it is malformed
   (overlong, surrogate, above U+10FFFF, truncated). */
static int out_utf8_len(const unsigned char *s)
{
    int n = s[0] >= 0xF0 ? 4 : s[0] >= 0xE0 ? 3 : s[0] >= 0xC2 ? 2 : 0;
    if (n == 0 || s[0] > 0xF4)
        return 0;
    for (int i = 1; i < n; i++)
        if ((s[i] & 0xC0) != 0x80)
            return 0;
    if ((n == 3 && s[0] == 0xE0 && s[1] < 0xA0) || (n == 3 && s[0] == 0xED && s[1] >= 0xA0)
        || (n == 4 && s[0] == 0xF0 && s[1] < 0x90) || (n == 4 && s[0] == 0xF4 && s[1] >= 0x90))
        return 0;
    return n;
}

/* Appends s as a JSON string literal. Strings of the language may hold any
   bytes, so invalid UTF-8 becomes U+FFFD to keep the document parseable. */
static void out_json_put_string(strbuf *b, const char *str)
{
    const unsigned char *s = (const unsigned char *)str;
    strbuf_putc(b, '"');
    while (*s) {
        if (*s == '"' || *s == '\\') {
            strbuf_printf(b, "\\%c", *s++);
        } else if (*s == '\n' || *s == '\t' || *s == '\r') {
            strbuf_puts(b, *s == '\n' ? "\\n" : *s == '\t' ? "\\t" : "\\r");
            s++;
        } else if (*s < 0x20 || *s == 0x7F) {
            strbuf_printf(b, "\\u%04x", *s++);
        } else if (*s < 0x80) {
            strbuf_putc(b, (char)*s++);
        } else {
            int n = out_utf8_len(s);
            if (n == 0) {
                strbuf_puts(b, "\\ufffd");
                s++;
            }
            for (int i = 0; i < n; i++)
                strbuf_putc(b, (char)*s++);
        }
    }
    strbuf_putc(b, '"');
}

/* ------------------------------------------------------------ one value */

/* Why a value nested beyond the C-stack guard is not shown. */
#define OUT_TOO_DEEP "this value is nested too deeply to print (it was built by very deep recursion; " \
                     "integrate or reduce it in smaller steps)"

/* Exact text of v (the language's own printed form). Caller frees. */
static char *out_value_exact(const value *v, const scalar_ring *R)
{
    return value_get_str(v, R);
}

/* Name of the first formal variable in p, for "cannot show" messages. */
static const char *out_first_variable(const fmpq_mpoly_t p, const scalar_ring *R)
{
    slong deg[SCALAR_MAX_VARS];
    fmpq_mpoly_degrees_si(deg, p, R->ctx);
    for (int i = 0; i < SCALAR_PI; i++)
        if (deg[i] > 0 && R->names[i])
            return R->names[i];
    return "a formal variable";
}

/* A coefficient of a series in decimal or LaTeX (mode OUT_DECIMAL/OUT_LATEX).
   Returns NULL with *err when a decimal is asked of a formal variable. */
static char *out_coefficient(const fmpq_mpoly_t c, const scalar_ring *R, const out_style *st, char **err)
{
    if (st->fmt == OUT_LATEX)
        return out_latex_scalar(c, R);
    char *s = out_decimal(c, R, st->digits, st->show_radius);
    if (!s)
        *err = xasprintf("no decimal form for a value involving the formal variable %s", out_first_variable(c, R));
    return s;
}

/* Appends x^k of a series: x, x^{k} in LaTeX, x^k in decimal text. */
static void out_series_put_power(strbuf *b, const char *x, slong k, int latex)
{
    if (latex)
        out_latex_put_name(b, x);
    else
        strbuf_puts(b, x);
    if (k > 1)
        strbuf_printf(b, latex ? "^{%ld}" : "^%ld", (long)k);
}

/* A series c_0 + c_1 x + ... + O(x^n) with coefficients in decimal or LaTeX,
   laid out like print_series (format/print.c). NULL with *err on failure. */
static char *out_series(const tseries *ser, const scalar_ring *R, const out_style *st, char **err)
{
    int latex = st->fmt == OUT_LATEX, first = 1;
    const char *x = ser->var >= 0 && ser->var < SCALAR_MAX_VARS && R->names[ser->var] ? R->names[ser->var] : "x";
    strbuf b;
    strbuf_init(&b);
    fmpq_mpoly_t c;
    fmpq_mpoly_init(c, R->ctx);
    for (slong k = 0; k <= ser->order; k++) {
        tseries_coeff(c, ser, k, R->ctx);
        if (fmpq_mpoly_is_zero(c, R->ctx))
            continue;
        char *t = out_coefficient(c, R, st, err);
        if (!t)
            break;
        int neg = t[0] == '-' && fmpq_mpoly_length(c, R->ctx) == 1, paren = fmpq_mpoly_length(c, R->ctx) > 1 && k > 0;
        const char *body = neg ? t + 1 : t;
        strbuf_puts(&b, first ? (neg ? "-" : "") : (neg ? " - " : " + "));
        if (k == 0 || strcmp(body, "1") != 0)
            strbuf_printf(&b, paren ? (latex ? "\\left(%s\\right)%s" : "(%s)%s") : "%s%s", body,
                          k > 0 ? (latex ? " " : "*") : "");
        if (k > 0)
            out_series_put_power(&b, x, k, latex);
        free(t);
        first = 0;
    }
    fmpq_mpoly_clear(c, R->ctx);
    if (*err) {
        strbuf_clear(&b);
        return NULL;
    }
    strbuf_puts(&b, first ? "O(" : " + O(");
    if (latex)
        out_series_put_power(&b, x, ser->order + 1, 1);
    else
        strbuf_printf(&b, "%s^%ld", x, (long)(ser->order + 1));
    strbuf_putc(&b, ')');
    return strbuf_take(&b);
}

static char *out_value_styled(const value *v, const scalar_ring *R, const out_style *st, char **err);

/* A list [a, b, ...] with every item in the style (\left[ \right] in LaTeX).
   NULL with *err naming the first item that cannot be shown. */
static char *out_list(const value *v, const scalar_ring *R, const out_style *st, char **err)
{
    strbuf b;
    strbuf_init(&b);
    strbuf_puts(&b, st->fmt == OUT_LATEX ? "\\left[" : "[");
    for (slong i = 0; i < v->len; i++) {
        char *e = NULL, *t = out_value_styled(v->items[i], R, st, &e);
        if (!t) {
            *err = xasprintf("item %ld of the list: %s", (long)i + 1, e);
            free(e);
            strbuf_clear(&b);
            return NULL;
        }
        strbuf_printf(&b, "%s%s", i ? ", " : "", t);
        free(t);
    }
    strbuf_puts(&b, st->fmt == OUT_LATEX ? "\\right]" : "]");
    return strbuf_take(&b);
}

/* Decimal text of v; strings pass through unchanged.
   Sets *err for classes and for numbers involving formal variables. */
static char *out_value_decimal(const value *v, const scalar_ring *R, const out_style *st, char **err)
{
    switch (v->kind) {
    case V_STR:
        return xstrdup(v->str);
    case V_CLASS:
        *err = xstrdup("a class has no decimal value (integrate it first: int_{g,n} C)");
        return NULL;
    case V_SERIES:
        return out_series(v->ser, R, st, err);
    case V_LIST:
        return out_list(v, R, st, err);
    default:
        return out_coefficient(v->num, R, st, err);
    }
}

/* LaTeX of a number printed term by term (each term its own fraction). */
static char *out_latex_termwise(const fmpq_mpoly_t p, const scalar_ring *R)
{
    return scalar_join_terms(p, R, out_latex_scalar);
}

/* Math-mode LaTeX of v; strings become \mbox{...}. Never fails. */
static char *out_value_latex(const value *v, const scalar_ring *R, const out_style *st, char **err)
{
    strbuf b;
    switch (v->kind) {
    case V_NUM:
        return v->termwise ? out_latex_termwise(v->num, R) : out_latex_scalar(v->num, R);
    case V_SERIES:
        return out_series(v->ser, R, st, err);
    case V_LIST:
        return out_list(v, R, st, err);
    case V_CLASS:
        strbuf_init(&b);
        out_latex_class_rec(&b, v->cls, R);
        return strbuf_take(&b);
    default:
        strbuf_init(&b);
        out_latex_put_text(&b, v->str);
        return strbuf_take(&b);
    }
}

/* One JSON value: a list becomes an array, anything else its exact text as
   a string (exact numbers do not fit JSON's doubles). */
static void out_json_put_value(strbuf *b, const value *v, const scalar_ring *R)
{
    if (util_stack_exhausted()) {   /* lists nested by deep recursion: out_value refuses */
        print_mark_too_deep();
        return;
    }
    if (v->kind == V_LIST) {
        strbuf_putc(b, '[');
        for (slong i = 0; i < v->len; i++) {
            if (i)
                strbuf_puts(b, ", ");
            out_json_put_value(b, v->items[i], R);
        }
        strbuf_putc(b, ']');
        return;
    }
    char *s = v->kind == V_STR ? xstrdup(v->str) : out_value_exact(v, R);
    out_json_put_string(b, s);
    free(s);
}

/* Dispatch without the argument checks of out_value (used for list items). */
static char *out_value_styled(const value *v, const scalar_ring *R, const out_style *st, char **err)
{
    char *s, *t;
    strbuf b;
    if (util_stack_exhausted()) {
        *err = xstrdup(OUT_TOO_DEEP);
        return NULL;
    }
    if (v->kind == V_REAL) {
        /* a ball prints its certain digits in every format; JSON keeps it a string */
        s = print_real(v->re);
        if (st->fmt != OUT_JSON && st->fmt != OUT_CSV)
            return s;
        strbuf_init(&b);
        if (st->fmt == OUT_JSON)
            out_json_put_string(&b, s);
        else
            strbuf_puts(&b, s);
        free(s);
        return strbuf_take(&b);
    }
    switch (st->fmt) {
    case OUT_DECIMAL:
        return out_value_decimal(v, R, st, err);
    case OUT_LATEX:
        return out_value_latex(v, R, st, err);
    case OUT_CSV:
        s = out_value_exact(v, R);
        t = out_csv_field(s);
        free(s);
        return t;
    case OUT_JSON:
        strbuf_init(&b);
        out_json_put_value(&b, v, R);
        return strbuf_take(&b);
    default:
        return out_value_exact(v, R);
    }
}

/* Checks the arguments, then formats; see output.h for the contract.
   Only decimal output can fail on a valid value. */
char *out_value(const value *v, const scalar_ring *R, const out_style *st, char **err)
{
    *err = NULL;
    if (!v) {
        *err = xstrdup("no value to show");
        return NULL;
    }
    if (st->fmt == OUT_DECIMAL && (st->digits < 1 || st->digits > OUT_MAX_DIGITS)) {
        *err = xasprintf("the number of digits must be between 1 and %d", OUT_MAX_DIGITS);
        return NULL;
    }
    print_take_too_deep();
    char *s = out_value_styled(v, R, st, err);
    if (s && print_take_too_deep()) {   /* a printer stopped at the stack guard: no partial text */
        free(s);
        *err = xstrdup(OUT_TOO_DEEP);
        return NULL;
    }
    return s;
}

/* ------------------------------------------------------------ grids */

typedef struct out_table {
    slong nrows, ncols;
    char **rows, **cols, **cells; /* formatted texts, owned; NULL cell = blank */
} out_table;

/* Frees every formatted text of t (NULL entries allowed).
   Safe after a partial out_table_init. */
static void out_table_clear(out_table *t)
{
    for (slong i = 0; i < t->nrows; i++)
        free(t->rows[i]);
    for (slong j = 0; j < t->ncols; j++)
        free(t->cols[j]);
    for (slong k = 0; k < t->nrows * t->ncols; k++)
        free(t->cells[k]);
    free(t->rows);
    free(t->cols);
    free(t->cells);
}

/* Formats n labels; labels stay exact even in a decimal table because they
   name parameters (g = 2), not results. Returns 0 with *err on failure. */
static int out_table_labels(char **dst, value **src, slong n, const scalar_ring *R, const out_style *st,
                            const char *what, char **err)
{
    out_style ls = *st;
    if (ls.fmt == OUT_DECIMAL)
        ls.fmt = OUT_EXACT;
    for (slong i = 0; i < n; i++) {
        char *e = NULL;
        if (!(dst[i] = out_value(src[i], R, &ls, &e))) {
            *err = xasprintf("%s label %ld: %s", what, (long)i + 1, e);
            free(e);
            return 0;
        }
    }
    return 1;
}

/* Formats every label and cell into t (which the caller clears).
   Returns 0 with *err naming the first cell that cannot be shown. */
static int out_table_init(out_table *t, value **rl, slong nr, value **cl, slong nc, value **cells,
                          const scalar_ring *R, const out_style *st, char **err)
{
    t->nrows = nr;
    t->ncols = nc;
    t->rows = xcalloc((size_t)nr + 1, sizeof(char *));
    t->cols = xcalloc((size_t)nc + 1, sizeof(char *));
    t->cells = xcalloc((size_t)(nr * nc) + 1, sizeof(char *));
    if (!out_table_labels(t->rows, rl, nr, R, st, "row", err) || !out_table_labels(t->cols, cl, nc, R, st, "column", err))
        return 0;
    for (slong k = 0; k < nr * nc; k++) {
        char *e = NULL;
        if (cells[k] && !(t->cells[k] = out_value(cells[k], R, st, &e))) {
            char *rs = value_get_str(rl[k / nc], R), *cs = value_get_str(cl[k % nc], R);
            *err = xasprintf("cell in row %s, column %s: %s", rs, cs, e);
            free(rs);
            free(cs);
            free(e);
            return 0;
        }
    }
    return 1;
}

/* Display width of UTF-8 text: code points, not bytes. */
static size_t out_width(const char *s)
{
    size_t w = 0;
    for (; s && *s; s++)
        w += ((unsigned char)*s & 0xC0) != 0x80;
    return w;
}

/* Prints s right-aligned in a field of width w (plus a two-space gap). */
static void out_put_padded(FILE *out, const char *s, size_t w, int gap)
{
    for (size_t k = out_width(s); k < w; k++)
        fputc(' ', out);
    fprintf(out, "%s%s", s ? s : "", gap ? "  " : "");
}

/* Aligned plain text: a header of column labels, then one line per row. */
static void out_grid_text(FILE *out, const char *corner, const out_table *t)
{
    size_t *w = xcalloc((size_t)t->ncols + 1, sizeof(size_t));
    size_t w0 = out_width(corner);
    for (slong i = 0; i < t->nrows; i++)
        w0 = out_width(t->rows[i]) > w0 ? out_width(t->rows[i]) : w0;
    for (slong j = 0; j < t->ncols; j++) {
        w[j] = out_width(t->cols[j]);
        for (slong i = 0; i < t->nrows; i++)
            w[j] = out_width(t->cells[i * t->ncols + j]) > w[j] ? out_width(t->cells[i * t->ncols + j]) : w[j];
    }
    out_put_padded(out, corner, w0, t->ncols > 0);
    for (slong j = 0; j < t->ncols; j++)
        out_put_padded(out, t->cols[j], w[j], j + 1 < t->ncols);
    fputc('\n', out);
    for (slong i = 0; i < t->nrows; i++) {
        out_put_padded(out, t->rows[i], w0, t->ncols > 0);
        for (slong j = 0; j < t->ncols; j++)
            out_put_padded(out, t->cells[i * t->ncols + j], w[j], j + 1 < t->ncols);
        fputc('\n', out);
    }
    free(w);
}

/* A LaTeX tabular (no packages needed): labels and cells in math mode. */
static void out_grid_latex(FILE *out, const char *row_name, const char *col_name, const out_table *t)
{
    strbuf c;
    strbuf_init(&c);
    out_latex_put_name(&c, row_name);
    strbuf_puts(&c, " \\backslash ");
    out_latex_put_name(&c, col_name);
    fputs("\\begin{tabular}{r|", out);
    for (slong j = 0; j < t->ncols; j++)
        fputc('r', out);
    fprintf(out, "}\n$%s$", c.data);
    for (slong j = 0; j < t->ncols; j++)
        fprintf(out, " & $%s$", t->cols[j]);
    fputs(" \\\\\n\\hline\n", out);
    for (slong i = 0; i < t->nrows; i++) {
        fprintf(out, "$%s$", t->rows[i]);
        for (slong j = 0; j < t->ncols; j++) {
            const char *s = t->cells[i * t->ncols + j];
            fprintf(out, s ? " & $%s$" : " &", s);
        }
        fputs(" \\\\\n", out);
    }
    fputs("\\end{tabular}\n", out);
    strbuf_clear(&c);
}

/* CSV: a header record (corner, column labels), then one record per row;
   CRLF line ends as RFC 4180 asks. Cells are already quoted fields. */
static void out_grid_csv(FILE *out, const char *corner, const out_table *t)
{
    char *f = out_csv_field(corner);
    fputs(f, out);
    free(f);
    for (slong j = 0; j < t->ncols; j++)
        fprintf(out, ",%s", t->cols[j]);
    fputs("\r\n", out);
    for (slong i = 0; i < t->nrows; i++) {
        fputs(t->rows[i], out);
        for (slong j = 0; j < t->ncols; j++) {
            const char *s = t->cells[i * t->ncols + j];
            fprintf(out, ",%s", s ? s : "");
        }
        fputs("\r\n", out);
    }
}

/* Prints a JSON array of already-encoded JSON values (NULL -> null). */
static void out_json_array(FILE *out, char **items, slong n)
{
    fputc('[', out);
    for (slong i = 0; i < n; i++)
        fprintf(out, "%s%s", i ? ", " : "", items[i] ? items[i] : "null");
    fputc(']', out);
}

/* JSON object with the names, labels and a row-major array of cell rows. */
static void out_grid_json(FILE *out, const char *row_name, const char *col_name, const out_table *t)
{
    strbuf b;
    strbuf_init(&b);
    out_json_put_string(&b, row_name);
    strbuf_puts(&b, ",\n  \"col_name\": ");
    out_json_put_string(&b, col_name);
    fprintf(out, "{\n  \"row_name\": %s,\n  \"rows\": ", b.data);
    strbuf_clear(&b);
    out_json_array(out, t->rows, t->nrows);
    fputs(",\n  \"cols\": ", out);
    out_json_array(out, t->cols, t->ncols);
    fputs(",\n  \"cells\": [", out);
    for (slong i = 0; i < t->nrows; i++) {
        fputs(i ? ",\n    " : "\n    ", out);
        out_json_array(out, t->cells + i * t->ncols, t->ncols);
    }
    fputs(t->nrows ? "\n  ]\n}\n" : "]\n}\n", out);
}

/* Formats everything first, then prints in the chosen layout.
   See output.h; write failures are reported like formatting failures. */
int out_grid(FILE *out, const char *row_name, const char *col_name, value **row_labels, slong nrows,
             value **col_labels, slong ncols, value **cells, const scalar_ring *R, const out_style *st,
             char **err)
{
    *err = NULL;
    if (nrows < 0 || ncols < 0 || (nrows > 0 && ncols > 0 && !cells)) {
        *err = xstrdup("malformed table");
        return 0;
    }
    row_name = row_name ? row_name : "";
    col_name = col_name ? col_name : "";
    out_table t;
    int ok = out_table_init(&t, row_labels, nrows, col_labels, ncols, cells, R, st, err);
    if (ok) {
        char *corner = xasprintf("%s\\%s", row_name, col_name);
        if (st->fmt == OUT_LATEX)
            out_grid_latex(out, row_name, col_name, &t);
        else if (st->fmt == OUT_CSV)
            out_grid_csv(out, corner, &t);
        else if (st->fmt == OUT_JSON)
            out_grid_json(out, row_name, col_name, &t);
        else
            out_grid_text(out, corner, &t);
        free(corner);
        if (fflush(out) != 0 || ferror(out)) {
            *err = xstrdup("cannot write the table");
            ok = 0;
        }
    }
    out_table_clear(&t);
    return ok;
}
