#include "parse_checks.h"

#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "strbuf.h"
#include "util.h"

/* Readings longer than this are described in general terms instead. */
#define CHECKS_MAX_QUOTE 120

static int checks_ends_at(const node *n, srcloc end)
{
    return n->loc.last_line == end.last_line && n->loc.last_column == end.last_column;
}

/* The integral that a ends with, outside parentheses (a ends where the
   integrand of that integral ends), or NULL. Walks the right edge only:
   an integral on the left of *, / or ^ takes them into its integrand. */
static const node *checks_trailing_integral(const node *n, srcloc left)
{
    while (n && !n->paren && checks_ends_at(n, left)) {
        if (n->kind == N_INTEGRAL)
            return n;
        if (n->kind == N_BINOP || n->kind == N_SUM || n->kind == N_IF)
            n = n->kind == N_BINOP ? n->b : n->c;
        else if (n->kind == N_NEG)
            n = n->a;
        else
            return NULL;
    }
    return NULL;
}

/* The text of line `line` from column c0 to column c1 (exclusive), or NULL
   when the line is shorter. */
static const char *checks_line(const srcloc *at, int c0, int c1)
{
    const char *line;
    size_t len = source_line(at->src, at->first_line, &line);
    if (c0 < 1 || c1 < c0 || (size_t)(c1 - 1) > len)
        return NULL;
    return line + c0 - 1;
}

/* Column just after the subscript of the integral that starts at column c
   (int_{...}), then after the blanks that follow; 0 when not found. */
static int checks_integrand_column(const srcloc *at, int c)
{
    const char *line;
    size_t len = source_line(at->src, at->first_line, &line);
    int depth = 0;
    for (size_t i = (size_t)c - 1; i < len; i++) {
        depth += line[i] == '{';
        if (line[i] == '}' && --depth == 0) {
            while (i + 1 < len && (line[i + 1] == ' ' || line[i + 1] == '\t'))
                i++;
            return (int)i + 2;
        }
    }
    return 0;
}

/* Writes both readings of "prefix int_{..} A op B" into r1 and r2; 0 when they
   span lines or are too long to quote. */
static int checks_readings(srcloc left, srcloc right, const node *in, int op, strbuf *r1, strbuf *r2)
{
    if (left.first_line != right.last_line || in->loc.first_line != left.first_line)
        return 0;
    int ci = in->loc.first_column, ca = checks_integrand_column(&in->loc, ci);
    int width = right.last_column - left.first_column;
    if (ca == 0 || ca > left.last_column || width > CHECKS_MAX_QUOTE)
        return 0;
    const char *pre = checks_line(&left, left.first_column, ci), *head = checks_line(&left, ci, ca);
    const char *body = checks_line(&left, ca, left.last_column);
    const char *rhs = checks_line(&right, right.first_column, right.last_column);
    if (!pre || !head || !body || !rhs)
        return 0;
    int lpre = ci - left.first_column, lhead = ca - ci, lbody = left.last_column - ca;
    int lrhs = right.last_column - right.first_column;
    while (lhead > 0 && (head[lhead - 1] == ' ' || head[lhead - 1] == '\t'))
        lhead--;
    strbuf_printf(r1, "%.*s%.*s (%.*s %c %.*s)", lpre, pre, lhead, head, lbody, body, op, lrhs, rhs);
    strbuf_printf(r2, "%.*s(%.*s %.*s) %c %.*s", lpre, pre, lhead, head, lbody, body, op, lrhs, rhs);
    return 1;
}

node *parser_sum(srcloc at, srcloc left, srcloc opl, srcloc right, int op, node *a, node *b)
{
    const node *in = checks_trailing_integral(a, left);
    if (!in)
        return ast_binop(at, op, a, b);
    strbuf r1, r2;
    strbuf_init(&r1);
    strbuf_init(&r2);
    if (!checks_readings(left, right, in, op, &r1, &r2)) {
        strbuf_printf(&r1, "int_{g,n} (A %c B)", op);
        strbuf_printf(&r2, "(int_{g,n} A) %c B", op);
    }
    diag_error(&opl, "'%c' after an integral has two readings: write %s to integrate the %s, or %s to %s "
                     "after integrating (an integrand extends over *, / and ^, not over + and -)",
               op, r1.data, op == '+' ? "sum" : "difference", r2.data, op == '+' ? "add" : "subtract");
    strbuf_clear(&r1);
    strbuf_clear(&r2);
    ast_free(a);
    ast_free(b);
    return NULL;
}

/* An integral on the right edge of an integrand, outside parentheses. */
static const node *checks_inner_integral(const node *n)
{
    while (n && !n->paren) {
        if (n->kind == N_INTEGRAL)
            return n;
        if (n->kind == N_BINOP || n->kind == N_SUM || n->kind == N_IF)
            n = n->kind == N_BINOP ? n->b : n->c;
        else if (n->kind == N_NEG || n->kind == N_FACTORIAL)
            n = n->a;
        else
            return NULL;
    }
    return NULL;
}

node *parser_integral(srcloc at, node *g, node *n, node *integrand)
{
    const node *inner = checks_inner_integral(integrand);
    if (!inner)
        return ast_ternary(N_INTEGRAL, at, g, n, integrand);
    const char *outer = checks_line(&at, at.first_column, at.last_column);
    int c = inner->loc.first_column;
    if (outer && at.first_line == at.last_line && inner->loc.first_line == at.first_line
        && at.last_column - at.first_column <= CHECKS_MAX_QUOTE)
        diag_error(&inner->loc, "an integral inside an integrand must be in parentheses: write %.*s(%.*s)",
                   c - at.first_column, outer, at.last_column - c, outer + (c - at.first_column));
    else
        diag_error(&inner->loc, "an integral inside an integrand must be in parentheses: write "
                                "int_{g,n} A * (int_{h,m} B)");
    ast_free(g);
    ast_free(n);
    ast_free(integrand);
    return NULL;
}

void parser_old_family(const srcloc *at, const char *name)
{
    const char *text = checks_line(at, at->first_column, at->last_column);
    int len = at->last_column - at->first_column;
    size_t nl = strlen(name);
    if (text && at->first_line == at->last_line && len <= CHECKS_MAX_QUOTE && len > (int)nl + 2
        && text[nl] == '[' && text[len - 1] == ']')
        diag_error(at, "var %.*s is written var %s_{%.*s}", len, text, name, len - (int)nl - 2, text + nl + 1);
    else
        diag_error(at, "a family of variables is declared as var %s_{a..b}", name);
}

node *parser_free_energy_genus(srcloc at, char *name, int *theta)
{
    size_t len = strlen(name), stem = strncmp(name, "FTheta_", 7) == 0 ? 7 : 2;
    int ok = len > stem && name[0] == 'F' && name[stem - 1] == '_' && strspn(name + stem, "0123456789") == len - stem;
    if (!ok) {
        diag_error(&at, "'with' follows F_{g} or F_2 (a specialisation of F_g), or FTheta_{g} or FTheta_2 (of the "
                        "Brezin-Gross-Witten free energy), not '%s'", name);
        free(name);
        return NULL;
    }
    *theta = stem == 7 ? 'T' : 0;
    node *g = ast_index_literal(at, name + stem);
    free(name);
    return g;
}

node *parser_free_energy_theta_genus(srcloc at, char *name, node_list *subs)
{
    node *g = NULL;
    if (strcmp(name, "FTheta") != 0)
        diag_error(&at, "'with' follows F_{g} or FTheta_{g} (a specialisation of a free energy), not '%s_{...}'", name);
    else if (subs->len != 1)
        diag_error(&at, "FTheta_{g} takes one subscript, the genus (got %d)", subs->len);
    else {
        g = subs->items[0];
        subs->len = 0;
    }
    free(name);
    ast_list_free(subs);
    return g;
}

node *parser_index(srcloc at, node *base, node *index)
{
    node *n;
    if (base->kind == N_NAME && !base->paren) {
        n = ast_text(N_INDEXED, at, base->text);
        base->text = NULL;
        ast_free(base);
    } else {
        n = ast_new(N_INDEXED, at);
        n->b = base;
    }
    n->a = index;
    return n;
}
