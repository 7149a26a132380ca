/* test_output.c - unit tests for the output formats (src/format/output.h).
 *
 * Decimal digits are compared with constants computed independently of Arb: pi, pi^2/6 and
 * pi - 355/113 from `echo 'scale=70; 4*a(1); 16*a(1)^2/6; 4*a(1)-355/113' | bc -l` (GNU bc,
 * arctangent series), which agree with the familiar expansions (pi = 3.14159 26535 89793 ...,
 * zeta(2) = 1.64493 40668 48226 ...). JSON output is parsed by python3's json module (or jq),
 * CSV output by python3's csv module, and LaTeX is compiled by pdflatex when it is installed
 * (otherwise a notice is printed and nothing is counted).
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>

#include "output.h"
#include "unit.h"
#include "value_str.h"

static unit_report rep;
static scalar_ring R;
static const char *names[SCALAR_MAX_VARS];
static char tmpdir[] = "/tmp/pk-test-output-XXXXXX";

/* Parses text in the ring's variable names (L_1, pi) into a new number value. */
static value *num(const char *text)
{
    value *v = value_new_num(&R);
    if (fmpq_mpoly_set_str_pretty(v->num, text, names, R.ctx) != 0)
        fprintf(stderr, "test setup: cannot parse %s\n", text);
    return v;
}

static value *str(const char *s)
{
    char *c = malloc(strlen(s) + 1);
    strcpy(c, s);
    return value_new_str(c, &R);
}

/* Formats v in fmt (digits d) and compares with want (NULL: expect an error containing err_part). */
static void check_value(const value *v, out_format fmt, slong d, int radius, const char *want, const char *err_part)
{
    out_style st = {fmt, d, radius};
    char *err = NULL;
    char *got = out_value(v, &R, &st, &err);
    if (want) {
        UNIT_CHECK(&rep, got && strcmp(got, want) == 0 && !err, "%s/%ld: got '%s' want '%s' (err %s)",
                   out_format_name(fmt), (long)d, got ? got : "(null)", want, err ? err : "-");
    } else {
        UNIT_CHECK(&rep, !got && err && strstr(err, err_part), "%s: expected error with '%s', got '%s' / '%s'",
                   out_format_name(fmt), err_part, got ? got : "(null)", err ? err : "(null)");
    }
    free(got);
    free(err);
}

static void test_format_names(void)
{
    const char *n[] = {"exact", "decimal", "latex", "csv", "json"};
    for (int i = 0; i < 5; i++) {
        out_format f = OUT_JSON;
        UNIT_CHECK(&rep, out_format_parse(&f, n[i]) && (int)f == i && strcmp(out_format_name(f), n[i]) == 0,
                   "format %s", n[i]);
    }
    out_format f = OUT_LATEX;
    UNIT_CHECK(&rep, !out_format_parse(&f, "Decimal") && f == OUT_LATEX, "unknown name must be refused");
    UNIT_CHECK(&rep, !out_format_parse(&f, "") && !out_format_parse(&f, NULL), "empty and NULL names");
}

static void test_decimal(void)
{
    value *pi = num("pi"), *z2 = num("pi^2/6"), *gap = num("pi - 355/113"), *third = num("1/3");
    value *neg = num("-22/7"), *half = num("1/2"), *zero = num("0"), *big = num("10^30 + 1/7");
    check_value(pi, OUT_DECIMAL, 50, 0, "3.1415926535897932384626433832795028841971693993751", NULL);
    check_value(pi, OUT_DECIMAL, 1, 0, "3", NULL);
    check_value(z2, OUT_DECIMAL, 30, 0, "1.64493406684822643647241516665", NULL);
    /* 355/113 agrees with pi to 6 decimals: the first working precision is not enough here */
    check_value(gap, OUT_DECIMAL, 20, 0, "-2.6676418906242231237e-7", NULL);
    check_value(third, OUT_DECIMAL, 10, 0, "0.3333333333", NULL);
    check_value(neg, OUT_DECIMAL, 5, 0, "-3.1429", NULL);
    check_value(half, OUT_DECIMAL, 5, 0, "0.50000", NULL);
    check_value(zero, OUT_DECIMAL, 5, 0, "0", NULL);
    check_value(big, OUT_DECIMAL, 35, 0, "1000000000000000000000000000000.1429", NULL);
    /* an exponent is kept only where positional form would invent zeros */
    check_value(big, OUT_DECIMAL, 5, 0, "1.0000e+30", NULL);
    value *p4 = num("-pi^4");
    check_value(p4, OUT_DECIMAL, 2, 0, "-97", NULL);
    check_value(p4, OUT_DECIMAL, 4, 0, "-97.41", NULL);
    value_release(p4);

    out_style st = {OUT_DECIMAL, 15, 1};
    char *err = NULL, *s = out_value(pi, &R, &st, &err);
    UNIT_CHECK(&rep, s && strncmp(s, "[3.14159265358979", 17) == 0 && strstr(s, "+/-"),
               "radius form of pi: %s", s ? s : "(null)");
    free(s);
    free(err);

    value *L = num("L_1^2/2 + pi");
    check_value(L, OUT_DECIMAL, 10, 0, NULL, "L_1");
    check_value(pi, OUT_DECIMAL, 0, 0, NULL, "digits");
    check_value(pi, OUT_DECIMAL, OUT_MAX_DIGITS + 1, 0, NULL, "digits");
    value *cls = value_new_class(cx_psi(1, R.ctx, NULL), &R);
    check_value(cls, OUT_DECIMAL, 10, 0, NULL, "class");
    value *s1 = str("text");
    check_value(s1, OUT_DECIMAL, 10, 0, "text", NULL);

    char *direct = out_decimal(z2->num, &R, 12, 0);
    UNIT_CHECK(&rep, direct && strcmp(direct, "1.64493406685") == 0, "out_decimal: %s", direct ? direct : "(null)");
    free(direct);
    UNIT_CHECK(&rep, out_decimal(L->num, &R, 5, 0) == NULL, "out_decimal of a formal variable must be NULL");

    value *all[] = {pi, z2, gap, third, neg, half, zero, big, L, cls, s1};
    for (size_t i = 0; i < sizeof all / sizeof all[0]; i++)
        value_release(all[i]);
}

/* Builds exp(2*pi^2*kappa_1 + L_1^2/2*psi_1) as a class value. */
static value *volume_class(void)
{
    value *a = num("2*pi^2"), *b = num("L_1^2/2");
    cx *k = cx_mul(cx_scalar(a->num, R.ctx), cx_kappa(1, R.ctx, NULL));
    cx *p = cx_mul(cx_scalar(b->num, R.ctx), cx_psi(1, R.ctx, NULL));
    value_release(a);
    value_release(b);
    return value_new_class(cx_exp(cx_add(k, p), NULL), &R);
}

/* (psi_1 - 1/2*kappa_2)^3 * psi_2: exercises sums with negative terms and powers. */
static value *power_class(void)
{
    value *h = num("-1/2");
    cx *t = cx_add(cx_psi(1, R.ctx, NULL), cx_mul(cx_scalar(h->num, R.ctx), cx_kappa(2, R.ctx, NULL)));
    value_release(h);
    return value_new_class(cx_mul(cx_pow(t, 3, NULL), cx_psi(2, R.ctx, NULL)), &R);
}

static const struct {
    const char *in, *latex;
} latex_cases[] = {
    {"29/5760", "\\frac{29}{5760}"},
    {"-1/2", "-\\frac{1}{2}"},
    {"7", "7"},
    {"-12", "-12"},
    {"0", "0"},
    {"pi^2/12", "\\frac{\\pi^{2}}{12}"},
    {"3*pi/4", "\\frac{3 \\pi}{4}"},
    {"(L_1^2 + 4*pi^2)/48", "\\frac{L_{1}^{2} + 4 \\pi^{2}}{48}"},
    {"L_1 - 3", "L_{1} - 3"},
    {"-L_1*pi^3/5 + 1/3", "\\frac{-3 L_{1} \\pi^{3} + 5}{15}"},
    {"x_long^2*beta", "x_{long}^{2} \\beta"},
};

/* Checks braces balance and \left/\right pair up: a cheap test of
   well-formedness that runs even where pdflatex is missing. */
static int latex_balanced(const char *s)
{
    int depth = 0, lr = 0;
    for (const char *p = s; *p; p++) {
        if (*p == '\\' && p[1] && strchr("{}", p[1])) {
            p++;
            continue;
        }
        depth += *p == '{';
        depth -= *p == '}';
        lr += strncmp(p, "\\left", 5) == 0;
        lr -= strncmp(p, "\\right", 6) == 0;
        if (depth < 0 || lr < 0)
            return 0;
    }
    return depth == 0 && lr == 0;
}

/* Formats the LaTeX cases; returns them joined as display math lines for pdflatex. */
static char *test_latex_values(void)
{
    size_t cap = 8192, len = 0;
    char *doc = calloc(cap, 1);
    for (size_t i = 0; i < sizeof latex_cases / sizeof latex_cases[0]; i++) {
        value *v = num(latex_cases[i].in);
        check_value(v, OUT_LATEX, 0, 0, latex_cases[i].latex, NULL);
        len += (size_t)snprintf(doc + len, cap - len, "$%s$\\par\n", latex_cases[i].latex);
        value_release(v);
    }
    value *c1 = volume_class(), *c2 = power_class(), *s = str("50% of {x} & #1_2 ~^\\");
    const char *w1 = "\\exp\\left(2 \\pi^{2} \\kappa_{1} + \\frac{L_{1}^{2}}{2} \\psi_{1}\\right)";
    const char *w2 = "\\left(\\psi_{1} - \\frac{1}{2} \\kappa_{2}\\right)^{3} \\psi_{2}";
    const char *w3 = "\\mbox{50\\% of \\{x\\} \\& \\#1\\_2 \\textasciitilde{}\\textasciicircum{}\\textbackslash{}}";
    check_value(c1, OUT_LATEX, 0, 0, w1, NULL);
    check_value(c2, OUT_LATEX, 0, 0, w2, NULL);
    check_value(s, OUT_LATEX, 0, 0, w3, NULL);
    const char *all[] = {w1, w2, w3};
    for (int i = 0; i < 3; i++) {
        UNIT_CHECK(&rep, latex_balanced(all[i]), "unbalanced LaTeX %s", all[i]);
        len += (size_t)snprintf(doc + len, cap - len, "$%s$\\par\n", all[i]);
    }
    value_release(c1);
    value_release(c2);
    value_release(s);
    return doc;
}

/* Reads a whole file into a new string ("" when missing). */
static char *slurp(const char *path)
{
    FILE *f = fopen(path, "rb");
    size_t cap = 4096, len = 0, n;
    char *s = calloc(cap, 1);
    if (!f)
        return s;
    while ((n = fread(s + len, 1, cap - len - 1, f)) > 0) {
        len += n;
        if (len + 1 == cap) {
            s = realloc(s, cap *= 2);
        }
    }
    s[len] = '\0';
    fclose(f);
    return s;
}

static void write_file(const char *path, const char *text)
{
    FILE *f = fopen(path, "wb");
    if (f) {
        fputs(text, f);
        fclose(f);
    }
}

/* A 2 x 3 table of genus g by points n with blanks for the unstable (0,1), (0,2). */
typedef struct {
    value *rows[2], *cols[3], *cells[6];
} table;

static void table_init(table *t, const char *c02)
{
    t->rows[0] = num("0");
    t->rows[1] = num("1");
    for (int j = 0; j < 3; j++) {
        char b[8];
        snprintf(b, sizeof b, "%d", j + 1);
        t->cols[j] = num(b);
    }
    t->cells[0] = NULL;
    t->cells[1] = NULL;
    t->cells[2] = num(c02);
    t->cells[3] = num("1/24");
    t->cells[4] = num("pi^2/12");
    t->cells[5] = str("say \"hi\",\nthen\t\x01 \xff\xc3\xa9 bye\\");
}

static void table_clear(table *t)
{
    for (int i = 0; i < 2; i++)
        value_release(t->rows[i]);
    for (int j = 0; j < 3; j++)
        value_release(t->cols[j]);
    for (int k = 0; k < 6; k++)
        value_release(t->cells[k]);
}

/* Prints the table in fmt to a file in tmpdir; returns 1 on success. */
static int table_print(table *t, out_format fmt, slong digits, const char *path, char **err)
{
    out_style st = {fmt, digits, 0};
    FILE *f = fopen(path, "wb");
    if (!f)
        return 0;
    int ok = out_grid(f, "g", "n", t->rows, 2, t->cols, 3, t->cells, &R, &st, err);
    fclose(f);
    return ok;
}

static void test_grid_text(void)
{
    table t;
    table_init(&t, "1");
    char path[256], *err = NULL;
    snprintf(path, sizeof path, "%s/t.txt", tmpdir);
    value_release(t.cells[5]);
    t.cells[5] = num("(L_1^2 + 4*pi^2)/48");
    UNIT_CHECK(&rep, table_print(&t, OUT_EXACT, 0, path, &err), "text table: %s", err ? err : "");
    char *got = slurp(path);
    const char *want = "g\\n     1        2                    3\n"
                       "  0                                   1\n"
                       "  1  1/24  pi^2/12  (L_1^2 + 4*pi^2)/48\n";
    UNIT_CHECK(&rep, strcmp(got, want) == 0, "text table:\n%s---want---\n%s", got, want);
    free(got);
    free(err);
    err = NULL;

    /* a decimal table cannot show L_1: error, and nothing written */
    UNIT_CHECK(&rep, !table_print(&t, OUT_DECIMAL, 6, path, &err) && err && strstr(err, "L_1")
                         && strstr(err, "row 1, column 3"),
               "decimal table with a variable: %s", err ? err : "(no error)");
    got = slurp(path);
    UNIT_CHECK(&rep, got[0] == '\0', "failed table must print nothing, printed: %s", got);
    free(got);
    free(err);
    err = NULL;

    value_release(t.cells[5]);
    t.cells[5] = num("pi");
    UNIT_CHECK(&rep, table_print(&t, OUT_DECIMAL, 6, path, &err), "decimal table: %s", err ? err : "");
    got = slurp(path);
    want = "g\\n          1         2        3\n"
           "  0                       1.00000\n"
           "  1  0.0416667  0.822467  3.14159\n";
    UNIT_CHECK(&rep, strcmp(got, want) == 0, "decimal table:\n%s---want---\n%s", got, want);
    free(got);
    free(err);
    table_clear(&t);
}

/* Runs a shell command; returns its exit status (-1 when it could not run). */
static int run(const char *cmd)
{
    int rc = system(cmd);
    return rc == -1 ? -1 : WEXITSTATUS(rc);
}

static void test_grid_json(void)
{
    table t;
    table_init(&t, "1");
    char path[256], cmd[1024], *err = NULL;
    snprintf(path, sizeof path, "%s/t.json", tmpdir);
    UNIT_CHECK(&rep, table_print(&t, OUT_JSON, 0, path, &err), "json table: %s", err ? err : "");
    free(err);
    /* the parser must accept it and see exactly the values we put in */
    const char *py = "import json,sys\n"
                     "d = json.load(open(sys.argv[1], encoding='utf-8'))\n"
                     "assert d['row_name'] == 'g' and d['col_name'] == 'n', d\n"
                     "assert d['rows'] == ['0', '1'] and d['cols'] == ['1', '2', '3'], d\n"
                     "assert d['cells'][0] == [None, None, '1'], d\n"
                     "assert d['cells'][1][:2] == ['1/24', 'pi^2/12'], d\n"
                     "assert d['cells'][1][2] == 'say \"hi\",\\nthen\\t\\x01 \\ufffd\\u00e9 bye\\\\', repr(d['cells'][1][2])\n";
    char pyfile[256];
    snprintf(pyfile, sizeof pyfile, "%s/check.py", tmpdir);
    write_file(pyfile, py);
    if (run("command -v python3 >/dev/null 2>&1") == 0) {
        snprintf(cmd, sizeof cmd, "python3 %s %s", pyfile, path);
        UNIT_CHECK(&rep, run(cmd) == 0, "python3 rejected the JSON table (see %s)", path);
    } else if (run("command -v jq >/dev/null 2>&1") == 0) {
        snprintf(cmd, sizeof cmd, "jq -e '.cells[1][0] == \"1/24\"' %s >/dev/null", path);
        UNIT_CHECK(&rep, run(cmd) == 0, "jq rejected the JSON table (see %s)", path);
    } else {
        printf("NOTICE: neither python3 nor jq found; JSON table not parsed (not counted)\n");
    }
    if (run("command -v jq >/dev/null 2>&1") == 0) {
        snprintf(cmd, sizeof cmd, "jq -e '.cells[1][1] == \"pi^2/12\" and .cells[0][0] == null' %s >/dev/null", path);
        UNIT_CHECK(&rep, run(cmd) == 0, "jq disagrees with the JSON table (see %s)", path);
    }
    value *v = str("a\"b");
    check_value(v, OUT_JSON, 0, 0, "\"a\\\"b\"", NULL);
    value_release(v);
    table_clear(&t);
}

static void test_grid_csv(void)
{
    table t;
    table_init(&t, "1");
    char path[256], *err = NULL;
    snprintf(path, sizeof path, "%s/t.csv", tmpdir);
    UNIT_CHECK(&rep, table_print(&t, OUT_CSV, 0, path, &err), "csv table: %s", err ? err : "");
    free(err);
    char *got = slurp(path);
    const char *want = "g\\n,1,2,3\r\n"
                       "0,,,1\r\n"
                       "1,1/24,pi^2/12,\"say \"\"hi\"\",\nthen\t\x01 \xff\xc3\xa9 bye\\\"\r\n";
    UNIT_CHECK(&rep, strcmp(got, want) == 0, "csv table:\n%s", got);
    free(got);
    if (run("command -v python3 >/dev/null 2>&1") == 0) {
        char cmd[1024];
        snprintf(cmd, sizeof cmd,
                 "python3 -c 'import csv,sys; r=list(csv.reader(open(sys.argv[1], newline=\"\", encoding=\"latin-1\")));"
                 " assert len(r)==3 and r[2][3].startswith(\"say \\\"hi\\\",\\nthen\") and r[1]==[\"0\",\"\",\"\",\"1\"], r' %s",
                 path);
        UNIT_CHECK(&rep, run(cmd) == 0, "python3 csv reader disagrees (see %s)", path);
    } else {
        printf("NOTICE: python3 not found; CSV table not parsed (not counted)\n");
    }
    table_clear(&t);
}

static void test_grid_latex(const char *values_doc)
{
    table t;
    table_init(&t, "1");
    char path[256], *err = NULL;
    snprintf(path, sizeof path, "%s/t.tex", tmpdir);
    UNIT_CHECK(&rep, table_print(&t, OUT_LATEX, 0, path, &err), "latex table: %s", err ? err : "");
    free(err);
    char *tab = slurp(path);
    UNIT_CHECK(&rep, strncmp(tab, "\\begin{tabular}{r|rrr}\n$g \\backslash n$ & $1$ & $2$ & $3$ \\\\\n\\hline\n", 63) == 0
                         && strstr(tab, "$1$ & $\\frac{1}{24}$ & $\\frac{\\pi^{2}}{12}$ & $\\mbox{say")
                         && strstr(tab, "$0$ & & & $1$ \\\\\n") && latex_balanced(tab),
               "latex table:\n%s", tab);
    char doc[16384];
    snprintf(doc, sizeof doc, "\\documentclass{article}\n\\begin{document}\n%s\n%s\\end{document}\n", values_doc, tab);
    snprintf(path, sizeof path, "%s/doc.tex", tmpdir);
    write_file(path, doc);
    if (run("command -v pdflatex >/dev/null 2>&1") == 0) {
        char cmd[1024];
        snprintf(cmd, sizeof cmd, "cd %s && pdflatex -interaction=nonstopmode -halt-on-error doc.tex >/dev/null 2>&1",
                 tmpdir);
        UNIT_CHECK(&rep, run(cmd) == 0, "pdflatex failed on %s (see doc.log there)", path);
    } else {
        printf("NOTICE: pdflatex not found; LaTeX output not compiled (not counted)\n");
    }
    free(tab);
    table_clear(&t);
}

/* Series, lists and term-by-term numbers: the value kinds beyond plain numbers. */
static void test_series_and_lists(void)
{
    int x = scalar_ring_declare(&R, "x");
    names[x] = R.names[x];
    value *ser = value_new_series(x, 2, &R), *p = num("1 - x/24 + pi^2/6*x^2");
    tseries_set_mpoly(ser->ser, p->num, R.ctx);
    check_value(ser, OUT_EXACT, 0, 0, "1 - 1/24*x + pi^2/6*x^2 + O(x^3)", NULL);
    check_value(ser, OUT_DECIMAL, 5, 0, "1.0000 - 0.041667*x + 1.6449*x^2 + O(x^3)", NULL);
    check_value(ser, OUT_LATEX, 0, 0, "1 - \\frac{1}{24} x + \\frac{\\pi^{2}}{6} x^{2} + O(x^{3})", NULL);
    check_value(ser, OUT_JSON, 0, 0, "\"1 - 1/24*x + pi^2/6*x^2 + O(x^3)\"", NULL);
    value *ser2 = value_new_series(x, 1, &R), *q = num("(L_1 + 1)*x");
    tseries_set_mpoly(ser2->ser, q->num, R.ctx);
    check_value(ser2, OUT_LATEX, 0, 0, "\\left(L_{1} + 1\\right) x + O(x^{2})", NULL);
    check_value(ser2, OUT_DECIMAL, 5, 0, NULL, "L_1");

    value *list = value_new_list(4, &R), *inner = value_new_list(2, &R);
    inner->items[0] = num("1");
    inner->items[1] = num("2");
    list->items[0] = num("1/2");
    list->items[1] = num("pi");
    list->items[2] = str("s,t");
    list->items[3] = inner;
    check_value(list, OUT_DECIMAL, 3, 0, "[0.500, 3.14, s,t, [1.00, 2.00]]", NULL);
    check_value(list, OUT_JSON, 0, 0, "[\"1/2\", \"pi\", \"s,t\", [\"1\", \"2\"]]", NULL);
    check_value(list, OUT_LATEX, 0, 0, "\\left[\\frac{1}{2}, \\pi, \\mbox{s,t}, \\left[1, 2\\right]\\right]", NULL);
    check_value(list, OUT_CSV, 0, 0, "\"[1/2, pi, s,t, [1, 2]]\"", NULL);
    value *bad = value_new_list(2, &R);
    bad->items[0] = num("1");
    bad->items[1] = num("L_1");
    check_value(bad, OUT_DECIMAL, 3, 0, NULL, "item 2 of the list");

    value *tw = num("L_1/2 + 1/3");
    tw->termwise = 1;
    check_value(tw, OUT_LATEX, 0, 0, "\\frac{L_{1}}{2} + \\frac{1}{3}", NULL);
    tw->termwise = 0;
    check_value(tw, OUT_LATEX, 0, 0, "\\frac{3 L_{1} + 2}{6}", NULL);

    value *all[] = {ser, p, ser2, q, list, bad, tw};
    for (size_t i = 0; i < sizeof all / sizeof all[0]; i++)
        value_release(all[i]);
}

static void test_exact_and_edges(void)
{
    value *v = num("(L_1^2 + 4*pi^2)/48"), *c = power_class();
    check_value(v, OUT_EXACT, 0, 0, "(L_1^2 + 4*pi^2)/48", NULL);
    char *want = value_get_str(c, &R);
    check_value(c, OUT_EXACT, 0, 0, want, NULL);
    check_value(c, OUT_CSV, 0, 0, want, NULL);
    free(want);
    check_value(NULL, OUT_EXACT, 0, 0, NULL, "no value");
    value_release(v);
    value_release(c);

    /* an empty table is still a well-formed document */
    char *err = NULL;
    out_style st = {OUT_JSON, 0, 0};
    char path[256];
    snprintf(path, sizeof path, "%s/empty.json", tmpdir);
    FILE *f = fopen(path, "wb");
    int ok = f && out_grid(f, "g", "n", NULL, 0, NULL, 0, NULL, &R, &st, &err);
    if (f)
        fclose(f);
    char *got = slurp(path);
    UNIT_CHECK(&rep, ok && strstr(got, "\"rows\": []") && strstr(got, "\"cells\": []"), "empty json: %s", got);
    free(got);
    free(err);
}

int main(void)
{
    scalar_ring_init(&R);
    scalar_ring_declare(&R, "L_1");
    scalar_ring_declare(&R, "x_long");
    scalar_ring_declare(&R, "beta");
    static char spare[SCALAR_MAX_VARS][8];
    for (int i = 0; i < SCALAR_MAX_VARS; i++) {
        snprintf(spare[i], sizeof spare[i], "u%d", i);
        names[i] = R.names[i] ? R.names[i] : spare[i];
    }
    if (!mkdtemp(tmpdir)) {
        perror("mkdtemp");
        return 1;
    }
    test_format_names();
    test_decimal();
    char *doc = test_latex_values();
    test_grid_text();
    test_grid_json();
    test_grid_csv();
    test_grid_latex(doc);
    test_exact_and_edges();
    test_series_and_lists();
    free(doc);
    if (rep.failed == 0) {
        char cmd[300];
        snprintf(cmd, sizeof cmd, "rm -rf %s", tmpdir);
        run(cmd);
    } else {
        fprintf(stderr, "test files kept in %s\n", tmpdir);
    }
    scalar_ring_clear(&R);
    flint_cleanup();
    return unit_finish("test_output", &rep);
}
