#include "output.h"

#include <stdlib.h>
#include <string.h>

#include "arb_compat.h"
#include "scalar_arb.h"
#include "strbuf.h"
#include "util.h"
#include "print.h"
#include "value_str.h"
#include "output_internal.h"

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

/* ------------------------------------------------------------ CSV, JSON */

/* Returns s as one RFC 4180 field: quoted (quotes doubled) when it holds a
   comma, quote or line break, verbatim otherwise. Caller frees. */
char *out_csv_field(const char *s)
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
void out_json_put_string(strbuf *b, const char *str)
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
    for (int i = 0; i < SCALAR_PINV; i++)
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

