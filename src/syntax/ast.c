#include "ast.h"

#include <stdlib.h>
#include <string.h>

#include "util.h"

node *ast_new(node_kind kind, srcloc loc)
{
    node *n = xcalloc(1, sizeof(node));
    n->kind = kind;
    n->loc = loc;
    return n;
}

node *ast_text(node_kind kind, srcloc loc, char *text)
{
    node *n = ast_new(kind, loc);
    n->text = text;
    return n;
}

node *ast_unary(node_kind kind, srcloc loc, node *a)
{
    node *n = ast_new(kind, loc);
    n->a = a;
    return n;
}

node *ast_binop(srcloc loc, int op, node *a, node *b)
{
    node *n = ast_new(N_BINOP, loc);
    n->op = op;
    n->a = a;
    n->b = b;
    return n;
}

node *ast_compare(srcloc loc, int cmp, node *a, node *b)
{
    node *n = ast_binop(loc, cmp, a, b);
    n->kind = N_COMPARE;
    return n;
}

node *ast_ternary(node_kind kind, srcloc loc, node *a, node *b, node *c)
{
    node *n = ast_new(kind, loc);
    n->a = a;
    n->b = b;
    n->c = c;
    return n;
}

node *ast_with_list(node_kind kind, srcloc loc, char *text, node_list *list)
{
    node *n = ast_new(kind, loc);
    n->text = text;
    n->list = list;
    return n;
}

node *ast_index_literal(srcloc loc, const char *digits)
{
    return ast_text(N_NUMBER, loc, xstrdup(digits));
}

node_list *ast_list_new(void)
{
    return xcalloc(1, sizeof(node_list));
}

node_list *ast_list_append(node_list *l, node *n)
{
    if (l->len == l->cap) {
        l->cap = l->cap ? 2 * l->cap : 4;
        l->items = xrealloc(l->items, l->cap * sizeof(node *));
    }
    l->items[l->len++] = n;
    return l;
}

void ast_list_free(node_list *l)
{
    if (!l)
        return;
    for (int i = 0; i < l->len; i++)
        ast_free(l->items[i]);
    free(l->items);
    free(l);
}

/* Frees iteratively along the `a` spine so that a very long chain such as
   1+1+1+...+1 does not exhaust the C stack. */
void ast_free(node *n)
{
    while (n) {
        node *next = n->a;
        ast_free(n->b);
        ast_free(n->c);
        ast_list_free(n->list);
        free(n->text);
        free(n);
        n = next;
    }
}

static const char *ast_kind_name(node_kind k)
{
    static const char *names[] = {
        "number", "string", "pi", "name", "indexed", "subscript", "call", "psi", "kappa",
        "correlator", "insert", "neg", "binop", "compare", "factorial",
        "integral", "if", "sum", "specialisation", "list", "logic", "range", "rule", "let", "assign", "def", "for", "print", "var", "vardecl",
        "explain", "if", "table", "load", "output", "precision", "expr"};
    return names[k];
}

static const char *ast_op_name(const node *n)
{
    static const char *cmps[] = {"==", "!=", "<", "<=", ">", ">="};
    static char op[2];
    if (n->kind == N_COMPARE)
        return cmps[n->op];
    op[0] = (char)n->op;
    op[1] = '\0';
    return op;
}

void ast_dump(FILE *out, const node *n, int depth)
{
    if (!n)
        return;
    if (util_stack_exhausted()) {
        fprintf(out, "%*s... (nested too deeply to show)\n", 2 * depth, "");
        return;
    }
    fprintf(out, "%*s%s", 2 * depth, "", ast_kind_name(n->kind));
    if (n->kind == N_BINOP || n->kind == N_COMPARE)
        fprintf(out, " %s", ast_op_name(n));
    if (n->text)
        fprintf(out, " \"%s\"", n->text);
    fprintf(out, " @%d:%d\n", n->loc.first_line, n->loc.first_column);
    ast_dump(out, n->a, depth + 1);
    ast_dump(out, n->b, depth + 1);
    ast_dump(out, n->c, depth + 1);
    if (n->list)
        for (int i = 0; i < n->list->len; i++)
            ast_dump(out, n->list->items[i], depth + 1);
}
