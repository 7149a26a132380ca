/* test_toolkit.c - the asymptotics toolkit (src/toolkit*.c), driven through the interpreter.
 *
 * Property tests on random exact input (fixed seed):
 *   - richardson of order k sends a_n = A + B_1/n + ... + B_k/n^k to A at every n, and order k-1
 *     does not when B_k != 0;
 *   - fitexp with K = k+1 returns A, B_1, ..., B_k exactly; on any sequence its constant term equals
 *     the last Richardson value of order K-1 (both extrapolate the same interpolating polynomial
 *     in 1/n to 1/n = 0);
 *   - diffs telescope and ratios multiply back to the last term.
 * recognise: random combinations c_0 + c_1 K_1 + c_2 K_2 of named constants, evaluated here by Arb
 * and handed over as 50-digit decimals, must come back as the same combination with the height of
 * the primitive relation; adding sqrt(2)/7 (not in the span) must give "no relation".
 * Bessel: the zero returned by bessel_j0_zero(60) is checked by evaluating J_0 around it with Arb,
 * its first digits against Abramowitz-Stegun, Handbook of Mathematical Functions (1964),
 * Table 9.5, j_{0,1} = 2.4048255577 (quoted from memory), and mz_constant(40) against
 * 2/(x_0 J_1(x_0)) recomputed here from that zero.
 * svgplot: the files written parse as XML (python3's xml.dom.minidom, when python3 is present)
 * and hold one polyline per series.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <fcntl.h>
#include <unistd.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "arb_compat.h"
#include "interp.h"
#include "unit.h"
#include "run_script.h"

#ifdef PSIKAPPA_FLINT3_ARB
#include <flint/arb_hypgeom.h>
#else
#include <arb_hypgeom.h>
#endif

static unit_report rep;
static flint_rand_t state;

/* Runs code in a fresh interpreter; returns what it printed (caller frees) and sets *status.
   Standard error is sent to /dev/null meanwhile (interp_run_source chooses the stream of the
   messages itself), so that the errors the tests provoke stay quiet. */
/* Runs code and checks that it printed exactly want. */
static void tk_expect(const char *code, const char *want)
{
    int status;
    char *got = unit_run_script(code, &status);
    UNIT_CHECK(&rep, status == 0 && strcmp(got, want) == 0, "script\n%s\nprinted\n%s(status %d), expected\n%s", code,
               got, status, want);
    free(got);
}

/* A random rational p/q, p in [-9, 9] (nonzero unless zero_ok), q in [1, 6], written as text. */
static void tk_rand_q(fmpq_t c, int zero_ok)
{
    slong p;
    do
        p = (slong)n_randint(state, 19) - 9;
    while (p == 0 && !zero_ok);
    fmpq_set_si(c, p, 1 + n_randint(state, 6));
}

/* Appends the rational c to the script s as "(p/q)". */
static void tk_put_q(char *s, size_t cap, const fmpq_t c)
{
    char *t = fmpq_get_str(NULL, 10, c);
    size_t len = strlen(s);
    snprintf(s + len, cap - len, "(%s)", t);
    flint_free(t);
}

/* a_n = A + sum B_j/n^j (j = 1..k) with random coefficients: richardson and fitexp. */
static void test_richardson_fitexp(void)
{
    for (long trial = 0; trial < unit_iterations(25); trial++) {
        slong k = 1 + (slong)n_randint(state, 6), n0 = 1 + (slong)n_randint(state, 5);
        slong L = k + 1 + (slong)n_randint(state, 5);
        fmpq *c = _fmpq_vec_init(k + 1);
        char s[4096] = "", e[2048] = "";
        for (slong j = 0; j <= k; j++)
            tk_rand_q(c + j, j < k);
        snprintf(s, sizeof s, "let xs = seq_{n=%ld..%ld} 0", (long)n0, (long)(n0 + L - 1));
        for (slong j = 0; j <= k; j++) {
            strcat(s, " + ");
            tk_put_q(s, sizeof s, c + j);
            snprintf(s + strlen(s), sizeof s - strlen(s), "/n^%ld", (long)j);
        }
        snprintf(s + strlen(s), sizeof s - strlen(s), "\nlet R = richardson(xs, %ld, %ld)\nsum_{i=1..%ld} (R[i] - ", (long)k,
                 (long)n0, (long)(L - k));
        tk_put_q(s, sizeof s, c);
        snprintf(s + strlen(s), sizeof s - strlen(s), ")^2\nlet C = fitexp(xs, %ld, %ld)\nsum_{j=1..%ld} 0", (long)n0,
                 (long)(k + 1), (long)(k + 1));
        for (slong j = 0; j <= k; j++) {
            snprintf(s + strlen(s), sizeof s - strlen(s), " + (C[%ld] - ", (long)(j + 1));
            tk_put_q(s, sizeof s, c + j);
            strcat(s, ")^2");
        }
        /* order k-1 cannot remove B_k/n^k: the sum of squares is then positive */
        snprintf(e, sizeof e, "\nlet S = richardson(xs, %ld, %ld)\nsum_{i=1..%ld} (S[i] - ", (long)(k - 1), (long)n0,
                 (long)(L - k + 1));
        strcat(s, e);
        tk_put_q(s, sizeof s, c);
        strcat(s, ")^2 > 0\n");
        tk_expect(s, "0\n0\n1\n");
        _fmpq_vec_clear(c, k + 1);
    }
}

/* Random sequences: fitexp's constant term is the last Richardson value; diffs and ratios telescope. */
static void test_identities(void)
{
    for (long trial = 0; trial < unit_iterations(25); trial++) {
        slong L = 2 + (slong)n_randint(state, 8), K = 1 + (slong)n_randint(state, (ulong)L);
        slong n0 = 1 + (slong)n_randint(state, 9);
        char s[4096] = "let xs = [";
        fmpq_t c;
        fmpq_init(c);
        for (slong i = 0; i < L; i++) {
            tk_rand_q(c, 0);
            strcat(s, i ? ", " : "");
            tk_put_q(s, sizeof s, c);
        }
        snprintf(s + strlen(s), sizeof s - strlen(s),
                 "]\nlet C = fitexp(xs, %ld, %ld)\nlet R = richardson(xs, %ld, %ld)\nC[1] - R[%ld]\n"
                 "let d = diffs(xs)\nxs[1] + sum_{i=1..%ld} d[i] - xs[%ld]\n"
                 "let q = ratios(xs)\nxs[1]*prod_{i=1..%ld} q[i] - xs[%ld]\n",
                 (long)n0, (long)K, (long)(K - 1), (long)n0, (long)(L - K + 1), (long)(L - 1), (long)L,
                 (long)(L - 1), (long)L);
        tk_expect(s, "0\n0\n0\n");
        fmpq_clear(c);
    }
}

/* The named constants used by the recognise test: name, its value, and how a coefficient
   is written with it (0: c*name, 1: c/name). */
typedef struct {
    const char *name, *shown;
    int over;
} tk_const;

static const tk_const tk_consts[] = {
    {"pi", "pi", 0},       {"pi^2", "pi^2", 0},      {"pi^-1", "pi", 1},      {"pi^-2", "pi^2", 1},
    {"log2", "log2", 0},   {"zeta3", "zeta3", 0},    {"euler", "euler", 0},   {"sqrtpi", "sqrtpi", 0},
    {"1/sqrtpi", "sqrtpi", 1},
};

/* r = the value of constant i, computed here independently of the toolkit. */
static void tk_const_value(arb_t r, int i, slong prec)
{
    switch (i) {
    case 0: arb_const_pi(r, prec); break;
    case 1: arb_const_pi(r, prec); arb_sqr(r, r, prec); break;
    case 2: arb_const_pi(r, prec); arb_inv(r, r, prec); break;
    case 3: arb_const_pi(r, prec); arb_sqr(r, r, prec); arb_inv(r, r, prec); break;
    case 4: arb_const_log2(r, prec); break;
    case 5: arb_zeta_ui(r, 3, prec); break;
    case 6: arb_const_euler(r, prec); break;
    case 7: arb_const_sqrt_pi(r, prec); break;
    default: arb_const_sqrt_pi(r, prec); arb_inv(r, r, prec); break;
    }
}

/* Appends the term c*K (K = NULL: the rational c) in the documented layout, e.g. "-5/pi^2". */
static void tk_put_term(char *s, size_t cap, const fmpq_t c, const tk_const *K, int first)
{
    long p = fmpz_get_si(fmpq_numref(c)), q = fmpz_get_si(fmpq_denref(c)), a = labs(p);
    size_t n = strlen(s);
    n += (size_t)snprintf(s + n, cap - n, "%s", p < 0 ? (first ? "-" : " - ") : (first ? "" : " + "));
    char num[64], den[64];
    snprintf(num, sizeof num, "%ld", a);
    snprintf(den, sizeof den, "/%ld", q);
    if (q == 1)
        den[0] = '\0';
    if (!K)
        snprintf(s + n, cap - n, "%s%s", num, den);
    else if (K->over && q == 1)
        snprintf(s + n, cap - n, "%s/%s", num, K->shown);
    else if (K->over)
        snprintf(s + n, cap - n, "%s/(%ld*%s)", num, q, K->shown);
    else
        snprintf(s + n, cap - n, "%s%s%s%s", a == 1 ? "" : num, a == 1 ? "" : "*", K->shown, den);
}

/* Writes to buf the 50-digit decimal of c_0 + c_1 K_i + c_2 K_j (+ sqrt(2)/7 when spoil). */
static void tk_combination(char *buf, size_t cap, const fmpq *c, int i, int j, int spoil)
{
    arb_t x, t;
    arb_init(x);
    arb_init(t);
    slong prec = 400;
    arb_set_fmpq(x, c, prec);
    tk_const_value(t, i, prec);
    arb_mul_fmpz(t, t, fmpq_numref(c + 1), prec);
    arb_div_fmpz(t, t, fmpq_denref(c + 1), prec);
    arb_add(x, x, t, prec);
    tk_const_value(t, j, prec);
    arb_mul_fmpz(t, t, fmpq_numref(c + 2), prec);
    arb_div_fmpz(t, t, fmpq_denref(c + 2), prec);
    arb_add(x, x, t, prec);
    if (spoil) {
        arb_sqrt_ui(t, 2, prec);
        arb_div_ui(t, t, 7, prec);
        arb_add(x, x, t, prec);
    }
    char *d = arb_get_str(x, 50, ARB_STR_NO_RADIUS);
    snprintf(buf, cap, "%s", d);
    flint_free(d);
    arb_clear(x);
    arb_clear(t);
}

/* The expected answer "x = ... (height H" for coefficients c and constants i, j. */
static void tk_expected_answer(char *want, size_t cap, const fmpq *c, int i, int j)
{
    fmpz_t L, H, t;
    fmpz_init(L);
    fmpz_init(H);
    fmpz_init(t);
    int first = 1;
    snprintf(want, cap, "x = ");
    if (!fmpq_is_zero(c)) {
        tk_put_term(want, cap, c, NULL, 1);
        first = 0;
    }
    tk_put_term(want, cap, c + 1, tk_consts + i, first);
    tk_put_term(want, cap, c + 2, tk_consts + j, 0);
    /* the primitive relation is (L, -c_0 L, -c_1 L, -c_2 L), L the lcm of the denominators */
    fmpz_one(L);
    for (int k = 0; k < 3; k++)
        fmpz_lcm(L, L, fmpq_denref(c + k));
    fmpz_set(H, L);
    for (int k = 0; k < 3; k++) {
        fmpz_divexact(t, L, fmpq_denref(c + k));
        fmpz_mul(t, t, fmpq_numref(c + k));
        fmpz_abs(t, t);
        if (fmpz_cmp(t, H) > 0)
            fmpz_set(H, t);
    }
    snprintf(want + strlen(want), cap - strlen(want), " (height %ld,", fmpz_get_si(H));
    fmpz_clear(L);
    fmpz_clear(H);
    fmpz_clear(t);
}

/* recognise on random combinations of two named constants and 1, and on a spoiled one. */
static void test_recognise(void)
{
    const int nconst = (int)(sizeof tk_consts / sizeof tk_consts[0]);
    for (long trial = 0; trial < unit_iterations(30); trial++) {
        int i = (int)n_randint(state, (ulong)nconst), j;
        do
            j = (int)n_randint(state, (ulong)nconst);
        while (j == i || strcmp(tk_consts[i].shown, tk_consts[j].shown) == 0);
        fmpq *c = _fmpq_vec_init(3);
        tk_rand_q(c, 1);
        tk_rand_q(c + 1, 0);
        tk_rand_q(c + 2, 0);
        char x[128], code[512], want[512];
        int spoil = trial % 5 == 4, status;
        tk_combination(x, sizeof x, c, i, j, spoil);
        snprintf(code, sizeof code, "recognise(\"%s\", [\"1\", \"%s\", \"%s\"], 50)\n", x, tk_consts[i].name,
                 tk_consts[j].name);
        if (spoil)
            snprintf(want, sizeof want, "no relation below height");
        else
            tk_expected_answer(want, sizeof want, c, i, j);
        char *got = unit_run_script(code, &status);
        UNIT_CHECK(&rep, status == 0 && strncmp(got, want, strlen(want)) == 0, "%sprinted %sexpected %s...", code, got,
                   want);
        free(got);
        _fmpq_vec_clear(c, 3);
    }
}

/* Reads the single printed line of code as a ball (the decimal with one unit of its last digit). */
static int tk_run_decimal(arb_t x, const char *code)
{
    int status;
    char *got = unit_run_script(code, &status);
    char *nl = strchr(got, '\n');
    if (nl)
        *nl = '\0';
    int ok = status == 0 && arb_set_str(x, got, 600) == 0;
    UNIT_CHECK(&rep, ok && strlen(got) > 40, "%s printed %s", code, got);
    free(got);
    return ok;
}

/* The zero of J_0 and the constant 2/(x_0 J_1(x_0)), checked with Arb directly. */
static void test_bessel(void)
{
    int status;
    char *got = unit_run_script("bessel_j0_zero(10)\n", &status);
    /* Abramowitz-Stegun Table 9.5, j_{0,1} = 2.4048255577 (from memory) */
    UNIT_CHECK(&rep, status == 0 && strcmp(got, "2.404825558\n") == 0, "bessel_j0_zero(10) printed %s", got);
    free(got);
    arb_t x, y, nu, d, C;
    arb_init(x);
    arb_init(y);
    arb_init(nu);
    arb_init(d);
    arb_init(C);
    if (tk_run_decimal(x, "bessel_j0_zero(60)\n")) {
        /* J_0 changes sign within 1e-58 of the printed zero (J_0' = -J_1 is about -0.52 there) */
        arb_set_str(d, "1e-58", 600);
        arb_sub(y, x, d, 600);
        arb_hypgeom_bessel_j(y, nu, y, 600);
        UNIT_CHECK(&rep, arb_is_positive(y), "J_0 not positive just left of the zero");
        arb_add(y, x, d, 600);
        arb_hypgeom_bessel_j(y, nu, y, 600);
        UNIT_CHECK(&rep, arb_is_negative(y), "J_0 not negative just right of the zero");
        arb_one(nu);
        arb_hypgeom_bessel_j(y, nu, x, 600);
        arb_mul(y, y, x, 600);
        arb_ui_div(y, 2, y, 600);
        if (tk_run_decimal(C, "mz_constant(40)\n")) {
            arb_sub(d, C, y, 600);
            arb_abs(d, d);
            arb_set_str(y, "1e-38", 600);
            UNIT_CHECK(&rep, arb_lt(d, y), "mz_constant(40) differs from 2/(x_0 J_1(x_0))");
        }
    }
    arb_clear(x);
    arb_clear(y);
    arb_clear(nu);
    arb_clear(d);
    arb_clear(C);
}

/* Counts the occurrences of needle in the file at path; -1 when it cannot be read. */
static long tk_count_in_file(const char *path, const char *needle)
{
    FILE *f = fopen(path, "r");
    if (!f)
        return -1;
    char *text = NULL;
    size_t len = 0;
    FILE *m = open_memstream(&text, &len);
    int ch;
    while ((ch = fgetc(f)) != EOF)
        fputc(ch, m);
    fclose(f);
    fclose(m);
    long n = 0;
    for (const char *p = text; (p = strstr(p, needle)) != NULL; p++)
        n++;
    free(text);
    return n;
}

/* svgplot writes XML with one polyline per series and escapes the names. */
static void test_svgplot(void)
{
    char dir[] = "/tmp/psikappa_toolkit_XXXXXX", code[1024], path[256], cmd[512];
    if (!mkdtemp(dir)) {
        UNIT_CHECK(&rep, 0, "cannot make a temporary folder");
        return;
    }
    snprintf(path, sizeof path, "%s/plot.svg", dir);
    snprintf(code, sizeof code,
             "let a = seq_{n=2..30} (n + 1)^n/n^n\n"
             "svgplot(\"%s\", [a, richardson(a, 1, 2), seq_{i=1..5} pi^i], [\"inverse\", 2, [\"a <b> & 'c'\", \"R1\", "
             "\"pi\"]])\n",
             path);
    int status;
    char *got = unit_run_script(code, &status);
    UNIT_CHECK(&rep, status == 0 && strncmp(got, path, strlen(path)) == 0, "svgplot printed %s", got);
    free(got);
    UNIT_CHECK(&rep, tk_count_in_file(path, "<polyline") == 3, "expected 3 polylines in %s", path);
    UNIT_CHECK(&rep, tk_count_in_file(path, "a &lt;b&gt; &amp; &apos;c&apos;") == 1, "legend name not escaped");
    if (system("python3 -c 'import xml.dom.minidom' > /dev/null 2>&1") == 0) {
        snprintf(cmd, sizeof cmd, "python3 -c 'import xml.dom.minidom,sys; xml.dom.minidom.parse(sys.argv[1])' %s", path);
        UNIT_CHECK(&rep, system(cmd) == 0, "%s does not parse as XML", path);
    } else {
        printf("test_toolkit: python3 not found, XML parse check skipped\n");
    }
    remove(path);
    rmdir(dir);
}

/* A few errors: the script stops with status 1. */
static void test_errors(void)
{
    const char *bad[] = {
        "ratios([1, 0, 2])\n",        "richardson([1, 2], 2, 1)\n",  "fitexp([1], 1, 2)\n",
        "recognise(\"1.5\", [\"e\"], 20)\n", "recognise(\"3.14\", [\"1\", \"pi\"], 20)\n", "ball(\"x\", 5)\n",
        "svgplot(\"/nonexistent-folder/p.svg\", [1], \"index\")\n",
    };
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        int status;
        char *got = unit_run_script(bad[i], &status);
        UNIT_CHECK(&rep, status == 1 && got[0] == '\0', "%s gave status %d and printed %s", bad[i], status, got);
        free(got);
    }
}

int main(void)
{
    flint_randinit(state);
    interp_install_abort_handler();
    test_richardson_fitexp();
    test_identities();
    test_recognise();
    test_bessel();
    test_svgplot();
    test_errors();
    flint_randclear(state);
    flint_cleanup();
    return unit_finish("test_toolkit", &rep);
}
