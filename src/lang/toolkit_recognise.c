/* recognise(x, basis, digits): a closed form for the real number x as a
   rational combination of the basis, found as an integer relation
   a_0 x + a_1 b_1 + ... + a_k b_k = 0 by LLL (fmpz_lll) on the lattice of
   rows (e_i, round(2^s v_i)), and accepted only when the relation is far
   smaller than chance would give at that precision (see tk_row_accept). */
#include <ctype.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include <flint/fmpz_lll.h>
#include <flint/fmpz_mat.h>
#include <flint/fmpz_vec.h>

#include "arb_compat.h"
#include "builtins.h"
#include "strbuf.h"
#include "util.h"

/* toolkit_numeric.c */
#include "scalar_arb.h"
int toolkit_arb_of_decimal(arb_t r, const char *s, slong prec);

#define TK_LOG2_10 3.321928094887362
#define TK_LOG10_2 0.3010299956639812
#define TK_MAX_BASIS 30      /* LLL on larger lattices is slow and rarely meaningful */
#define TK_MAX_PIPOW 64
#define TK_MIN_DIGITS 8      /* below this every relation is "found by chance" */
#define TK_MAX_RDIGITS 5000

/* Where the value of an item comes from. */
typedef enum { TK_NUM, TK_DECIMAL, TK_PIPOW, TK_LOG2, TK_ZETA3, TK_EULER, TK_SQRTPI, TK_INVSQRTPI } tk_src;
/* How a rational coefficient c combines with the item in the answer:
   a rational (merged into one constant), c*name, or c/name. */
typedef enum { TK_RATIONAL, TK_TIMES, TK_OVER } tk_shape;

typedef struct {
    tk_src src;
    const value *val; /* TK_NUM, TK_DECIMAL: the argument (borrowed) */
    slong pipow;      /* TK_PIPOW: the power of pi */
    tk_shape shape;
    fmpq_t q;         /* TK_RATIONAL: the item's value */
    char *name;       /* TK_TIMES, TK_OVER: its text (owned) */
} tk_item;

/* Prepares an empty item; pairs with tk_item_clear. */
static void tk_item_init(tk_item *it)
{
    memset(it, 0, sizeof *it);
    fmpq_init(it->q);
}

static void tk_item_clear(tk_item *it)
{
    fmpq_clear(it->q);
    free(it->name);
}

/* Parses an optionally negative decimal integer filling all of s, |v| <= TK_MAX_PIPOW. */
static int tk_parse_small_int(const char *s, slong *v)
{
    const char *d = s + (*s == '-');
    if (!*d)
        return 0;
    for (const char *p = d; *p; p++)
        if (!isdigit((unsigned char)*p) || p - d > 3)
            return 0;
    *v = strtol(s, NULL, 10);
    return *v >= -TK_MAX_PIPOW && *v <= TK_MAX_PIPOW;
}

/* Recognises "1", "pi", "pi^k", "1/pi", "1/pi^k" (k a small integer) and sets *k. */
static int tk_parse_pipow(const char *s, slong *k)
{
    int inv = strncmp(s, "1/", 2) == 0 && strcmp(s, "1/") != 0;
    const char *t = inv ? s + 2 : s;
    if (strcmp(s, "1") == 0) {
        *k = 0;
        return 1;
    }
    if (strcmp(t, "pi") == 0)
        *k = 1;
    else if (strncmp(t, "pi^", 3) != 0 || !tk_parse_small_int(t + 3, k) || (inv && *k <= 0))
        return 0;
    if (inv)
        *k = -*k;
    return 1;
}

/* Sets up a power of pi: 1 is rational, pi^k (k > 0) a factor, pi^-k a divisor. */
static void tk_item_set_pipow(tk_item *it, slong k)
{
    it->src = TK_PIPOW;
    it->pipow = k;
    if (k == 0) {
        it->shape = TK_RATIONAL;
        fmpq_one(it->q);
        return;
    }
    slong m = k < 0 ? -k : k;
    it->shape = k > 0 ? TK_TIMES : TK_OVER;
    it->name = m == 1 ? xstrdup("pi") : xasprintf("pi^%ld", (long)m);
}

/* A named constant of the fixed set; 0 when s names none of them. */
static int tk_item_set_name(tk_item *it, const char *s)
{
    static const struct {
        const char *name, *shown;
        tk_src src;
        tk_shape shape;
    } named[] = {
        {"log2", "log2", TK_LOG2, TK_TIMES},         {"zeta3", "zeta3", TK_ZETA3, TK_TIMES},
        {"euler", "euler", TK_EULER, TK_TIMES},      {"sqrtpi", "sqrtpi", TK_SQRTPI, TK_TIMES},
        {"1/sqrtpi", "sqrtpi", TK_INVSQRTPI, TK_OVER},
    };
    slong k;
    if (tk_parse_pipow(s, &k)) {
        tk_item_set_pipow(it, k);
        return 1;
    }
    for (size_t i = 0; i < sizeof named / sizeof named[0]; i++)
        if (strcmp(s, named[i].name) == 0) {
            it->src = named[i].src;
            it->shape = named[i].shape;
            it->name = xstrdup(named[i].shown);
            return 1;
        }
    return 0;
}

/* A number of Q[pi] as a basis item: rationals merge into the constant,
   others print as c*(text), with parentheses unless the text is one word. */
static void tk_item_set_num(tk_item *it, const value *v, const scalar_ring *R)
{
    it->src = TK_NUM;
    it->val = v;
    if (scalar_get_fmpq(it->q, v->num, R)) {
        it->shape = TK_RATIONAL;
        return;
    }
    it->shape = TK_TIMES;
    char *t = scalar_get_str(v->num, R);
    int word = 1;
    for (const char *p = t; *p; p++)
        word &= isalnum((unsigned char)*p) || *p == '^' || *p == '_';
    it->name = word ? t : xasprintf("(%s)", t);
    if (!word)
        free(t);
}

/* Reads argument or list item v as x (basis = 0) or a basis item.
   Returns 0 with *why set to a static message when v is unusable. */
static int tk_item_read(tk_item *it, const value *v, int basis, const scalar_ring *R, const char **why)
{
    arb_t t;
    if (v->kind == V_NUM && scalar_is_pi_only(v->num, R)) {
        tk_item_set_num(it, v, R);
        return 1;
    }
    if (v->kind == V_STR && basis && tk_item_set_name(it, v->str))
        return 1;
    arb_init(t);
    int ok = v->kind == V_STR && !basis && toolkit_arb_of_decimal(t, v->str, 64);
    arb_clear(t);
    if (ok) {
        it->src = TK_DECIMAL;
        it->val = v;
    }
    *why = basis ? "expected a number in Q[pi] or one of the names \"1\", \"pi\", \"pi^k\", \"1/pi^k\", \"log2\", "
                   "\"zeta3\", \"euler\", \"sqrtpi\", \"1/sqrtpi\""
                 : "expected a number in Q[pi] (no formal variables) or a decimal string";
    return ok;
}

/* r = the value of the item as a ball at precision prec. */
static void tk_item_eval(arb_t r, const tk_item *it, const scalar_ring *R, slong prec)
{
    switch (it->src) {
    case TK_NUM:
        scalar_get_arb(r, it->val->num, R, prec);
        return;
    case TK_DECIMAL:
        toolkit_arb_of_decimal(r, it->val->str, prec);
        return;
    case TK_PIPOW:
        arb_const_pi(r, prec);
        arb_pow_ui(r, r, (ulong)(it->pipow < 0 ? -it->pipow : it->pipow), prec);
        if (it->pipow < 0)
            arb_inv(r, r, prec);
        return;
    case TK_LOG2:
        arb_const_log2(r, prec);
        return;
    case TK_ZETA3:
        arb_zeta_ui(r, 3, prec);
        return;
    case TK_EULER:
        arb_const_euler(r, prec);
        return;
    case TK_SQRTPI:
    case TK_INVSQRTPI:
        arb_const_sqrt_pi(r, prec);
        if (it->src == TK_INVSQRTPI)
            arb_inv(r, r, prec);
        return;
    }
}

/* The search: n = k+1 values v (x first), their scale 2^E > max |v_i|, and
   the precision actually used (digits, and bits = digits * log2(10)). */
typedef struct {
    slong n, E, digits, bits, wp;
    arb_ptr v;
} tk_search;

/* Evaluates all items at s->wp and sets E; returns 0 when every value is zero. */
static int tk_search_eval(tk_search *s, const tk_item *items, const scalar_ring *R)
{
    s->E = WORD_MIN;
    for (slong i = 0; i < s->n; i++) {
        tk_item_eval(s->v + i, items + i, R, s->wp);
        if (!arf_is_zero(arb_midref(s->v + i)))
            s->E = FLINT_MAX(s->E, arf_abs_bound_lt_2exp_si(arb_midref(s->v + i)));
    }
    return s->E != WORD_MIN;
}

/* Digits of x at the scale 2^E: at most the request, fewer when x is a
   decimal string that carries fewer. */
static slong tk_search_digits(const tk_search *s, slong requested)
{
    if (mag_is_zero(arb_radref(s->v)))
        return requested;
    arf_t r;
    arf_init(r);
    arf_set_mag(r, arb_radref(s->v));
    slong e = arf_abs_bound_lt_2exp_si(r);
    arf_clear(r);
    return FLINT_MIN(requested, (slong)floor((double)(s->E - e) * TK_LOG10_2));
}

/* B = the (n x n+1) lattice: identity, then round(2^(bits - E) * v_i). */
static void tk_search_lattice(fmpz_mat_t B, const tk_search *s)
{
    arf_t t;
    arf_init(t);
    for (slong i = 0; i < s->n; i++) {
        fmpz_one(fmpz_mat_entry(B, i, i));
        arf_mul_2exp_si(t, arb_midref(s->v + i), s->bits - s->E);
        arf_get_fmpz(fmpz_mat_entry(B, i, s->n), t, ARF_RND_NEAR);
    }
    arf_clear(t);
}

/* Normalises the relation a (n entries): primitive, a_0 > 0. Sets H to its
   height max |a_i|. Returns 0 when a_0 = 0 (the relation does not involve x). */
static int tk_relation_normalise(fmpz *a, slong n, fmpz_t H)
{
    fmpz_t g;
    if (fmpz_is_zero(a))
        return 0;
    fmpz_init(g);
    _fmpz_vec_content(g, a, n);
    _fmpz_vec_scalar_divexact_fmpz(a, a, n, g);
    if (fmpz_sgn(a) < 0)
        _fmpz_vec_neg(a, a, n);
    _fmpz_vec_height(H, a, n);
    fmpz_clear(g);
    return 1;
}

/* Accepts relation a only when (1) its height H < 10^(digits/(n+1)), far
   below the 10^(digits/n) that a random vector of n reals admits, and (2)
   |sum a_i v_i| < 2^E 10^(-digits/2) as a certified ball bound; then sets
   *res_exp with |residual| < 2^res_exp (WORD_MIN when exactly zero). */
static int tk_row_accept(const tk_search *s, const fmpz *a, const fmpz_t H, slong *res_exp)
{
    if (log10(fmpz_get_d(H)) >= (double)s->digits / (double)(s->n + 1))
        return 0;
    arb_t r, t;
    arf_t u;
    arb_init(r);
    arb_init(t);
    arf_init(u);
    for (slong i = 0; i < s->n; i++) {
        arb_mul_fmpz(t, s->v + i, a + i, s->wp);
        arb_add(r, r, t, s->wp);
    }
    arb_get_abs_ubound_arf(u, r, s->wp);
    *res_exp = arf_is_zero(u) ? WORD_MIN : arf_abs_bound_lt_2exp_si(u);
    int ok = *res_exp <= s->E - (slong)ceil(s->digits / 2.0 * TK_LOG2_10);
    arb_clear(r);
    arb_clear(t);
    arf_clear(u);
    return ok;
}

/* Runs LLL and copies into best the accepted relation of least height.
   Returns 1 when one was accepted. */
static int tk_search_run(const tk_search *s, fmpz *best, slong *res_exp)
{
    fmpz_mat_t B;
    fmpz_lll_t fl;
    fmpz_t H, Hbest;
    fmpz_mat_init(B, s->n, s->n + 1);
    fmpz_init(H);
    fmpz_init(Hbest);
    tk_search_lattice(B, s);
    fmpz_lll_context_init_default(fl);
    fmpz_lll(B, NULL, fl);
    int found = 0;
    for (slong i = 0; i < s->n; i++) {
        fmpz *a = B->rows[i];
        slong e;
        if (!tk_relation_normalise(a, s->n, H) || (found && fmpz_cmp(H, Hbest) >= 0) || !tk_row_accept(s, a, H, &e))
            continue;
        _fmpz_vec_set(best, a, s->n);
        fmpz_set(Hbest, H);
        *res_exp = e;
        found = 1;
    }
    fmpz_mat_clear(B);
    fmpz_clear(H);
    fmpz_clear(Hbest);
    return found;
}

/* Appends the term c (nonzero) times the item to b: "p/q", "p*name/q" or
   "p/(q*name)", with its sign as the separator unless it is the first term. */
static void tk_put_term(strbuf *b, const fmpq_t c, tk_shape shape, const char *name, int *first)
{
    fmpz_t p;
    fmpz_init(p);
    fmpz_abs(p, fmpq_numref(c));
    strbuf_puts(b, fmpq_sgn(c) < 0 ? (*first ? "-" : " - ") : (*first ? "" : " + "));
    *first = 0;
    int p1 = fmpz_is_one(p), q1 = fmpz_is_one(fmpq_denref(c));
    if (shape != TK_TIMES || !p1)
        strbuf_put_fmpz(b, p);
    if (shape == TK_TIMES)
        strbuf_printf(b, "%s%s", p1 ? "" : "*", name);
    if (shape == TK_OVER)
        strbuf_puts(b, q1 ? "/" : "/(");
    if (!q1) {
        strbuf_puts(b, shape == TK_OVER ? "" : "/");
        strbuf_put_fmpz(b, fmpq_denref(c));
    }
    if (shape == TK_OVER)
        strbuf_printf(b, "%s%s%s", q1 ? "" : "*", name, q1 ? "" : ")");
    fmpz_clear(p);
}

/* Appends "x = ..." for the relation a: the rational items merged into one
   constant first, then the others in the order of the basis. */
static void tk_put_answer(strbuf *b, const tk_item *items, slong n, const fmpz *a)
{
    fmpq_t c, cst;
    fmpq_init(c);
    fmpq_init(cst);
    int first = 1;
    strbuf_puts(b, "x = ");
    for (slong i = 1; i < n; i++)
        if (items[i].shape == TK_RATIONAL) {
            fmpq_set_fmpz_frac(c, a + i, a);
            fmpq_submul(cst, c, items[i].q);
        }
    if (!fmpq_is_zero(cst))
        tk_put_term(b, cst, TK_RATIONAL, NULL, &first);
    for (slong i = 1; i < n; i++)
        if (items[i].shape != TK_RATIONAL && !fmpz_is_zero(a + i)) {
            fmpq_set_fmpz_frac(c, a + i, a);
            fmpq_neg(c, c);
            tk_put_term(b, c, items[i].shape, items[i].name, &first);
        }
    if (first)
        strbuf_puts(b, "0");
    fmpq_clear(c);
    fmpq_clear(cst);
}

/* The text of the result: the closed form with the height of its relation,
   the precision used and the residual, or the height it was not found below. */
static char *tk_search_report(const tk_search *s, const tk_item *items, const fmpz *a, int found, slong res_exp)
{
    strbuf b;
    strbuf_init(&b);
    double hexp = (double)s->digits / (double)(s->n + 1);
    if (!found) {
        if (hexp < 15)
            strbuf_printf(&b, "no relation below height %.0f", floor(pow(10.0, hexp)));
        else
            strbuf_printf(&b, "no relation below height 10^%.1f", hexp);
        strbuf_printf(&b, " (precision %ld digits)", (long)s->digits);
        return strbuf_take(&b);
    }
    fmpz_t H;
    fmpz_init(H);
    _fmpz_vec_height(H, a, s->n);
    tk_put_answer(&b, items, s->n, a);
    strbuf_puts(&b, " (height ");
    strbuf_put_fmpz(&b, H);
    strbuf_printf(&b, ", precision %ld digits, ", (long)s->digits);
    if (res_exp == WORD_MIN)
        strbuf_puts(&b, "residual 0)");
    else
        strbuf_printf(&b, "residual < 1e-%ld)", (long)floor(-(double)res_exp * TK_LOG10_2));
    fmpz_clear(H);
    return strbuf_take(&b);
}

/* Evaluates the n items precisely enough and fixes the precision of the
   search. Returns NULL or a static error message. */
static const char *tk_search_prepare(tk_search *s, const tk_item *items, const scalar_ring *R, slong requested)
{
    slong want = (slong)(requested * TK_LOG2_10);
    /* exact items lose bits when terms of a Q[pi] number cancel: retry wider */
    for (s->wp = want + 64;; s->wp *= 2) {
        if (!tk_search_eval(s, items, R))
            return "x and the basis are all zero";
        int sharp = 1;
        for (slong i = 0; i < s->n; i++)
            if (items[i].src != TK_DECIMAL && !arb_is_exact(s->v + i))
                sharp &= mag_cmp_2exp_si(arb_radref(s->v + i), s->E - want - 32) <= 0;
        if (sharp || s->wp > 16 * want)
            break;
    }
    for (slong i = 1; i < s->n; i++)
        if (arb_is_zero(s->v + i))
            return "a basis item is zero";
    s->digits = tk_search_digits(s, requested);
    if (s->digits < TK_MIN_DIGITS)
        return "x is known to too few digits for a meaningful relation (at least 8 needed)";
    s->bits = (slong)ceil(s->digits * TK_LOG2_10);
    return NULL;
}

/* Reads x (argument 0) and the basis (argument 1) into items[0..n-1];
   returns n, or 0 after reporting an error. The caller clears n+... items. */
static slong tk_read_items(tk_item *items, const interp *I, const node *call, value **args)
{
    const char *why = NULL;
    if (!tk_item_read(items, args[0], 0, &I->ring, &why)) {
        builtin_fail_at(call, 0, why);
        return 0;
    }
    for (slong i = 0; i < args[1]->len; i++)
        if (!tk_item_read(items + i + 1, args[1]->items[i], 1, &I->ring, &why)) {
            char *msg = xasprintf("basis item %ld: %s", (long)(i + 1), why);
            builtin_fail_at(call, 1, msg);
            free(msg);
            return 0;
        }
    return args[1]->len + 1;
}

/* Searches the relation once the items are read; returns the report string or
   NULL after an error. */
static value *tk_recognise_items(interp *I, const node *call, const tk_item *items, slong n, slong digits)
{
    tk_search s;
    s.n = n;
    s.v = _arb_vec_init(n);
    fmpz *a = _fmpz_vec_init(n);
    value *r = NULL;
    slong res_exp = 0;
    const char *err = tk_search_prepare(&s, items, &I->ring, digits);
    if (err)
        builtin_fail_at(call, err[0] == 'x' ? 0 : 1, err);
    else {
        int found = tk_search_run(&s, a, &res_exp);
        r = value_new_str(tk_search_report(&s, items, a, found, res_exp), &I->ring);
    }
    _fmpz_vec_clear(a, n);
    _arb_vec_clear(s.v, n);
    return r;
}

/* recognise(x, basis, digits): see the comment at the top of the file. */
value *toolkit_recognise(interp *I, const node *call, value **args)
{
    slong digits;
    if (args[1]->kind != V_LIST || args[1]->len < 1 || args[1]->len > TK_MAX_BASIS)
        return builtin_fail_at(call, 1, "expected a list of 1 to 30 basis numbers or names, such as [\"1\", \"pi^-2\"]");
    if (!builtin_get_slong(I, call, args, 2, TK_MIN_DIGITS, TK_MAX_RDIGITS, &digits))
        return NULL;
    slong n = args[1]->len + 1;
    tk_item *items = xcalloc((size_t)n, sizeof(tk_item));
    for (slong i = 0; i < n; i++)
        tk_item_init(items + i);
    value *r = NULL;
    if (tk_read_items(items, I, call, args))
        r = tk_recognise_items(I, call, items, n, digits);
    for (slong i = 0; i < n; i++)
        tk_item_clear(items + i);
    free(items);
    return r;
}
