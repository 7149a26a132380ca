/* Statements and programs: let, functions, loops, print, var, explain. */
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "correlators/wk_kdv.h"
#include "diag.h"
#include "builtins.h"
#include "interp.h"
#include "memory.h"
#include "parse.h"
#include "util.h"

void interp_init(interp *I)
{
    memset(I, 0, sizeof(interp));
    scalar_ring_init(&I->ring);
    I->globals = scope_new(NULL);
    I->wk = wk_table_new();
    wk_table_set_cancel(I->wk, &cancel_flag);
    wk_table_set_limit(I->wk, (slong)I->lim.max_table);
    keymap_init(&I->integrals);
    I->lim.max_terms = 2e7;
    I->lim.max_table = 3e7;
    I->lim.max_class_terms = 2000000;
    I->lim.max_dim = 2000;
    I->lim.max_depth = 2000;
    I->lim.max_seconds = 600;
    I->list_outer = 1;
    I->out = stdout;
    I->style.fmt = OUT_EXACT;
    I->style.digits = 20;
}

void interp_clear(interp *I)
{
    scope_free(I->globals);
    wk_table_free(I->wk);
    wk_kdv_table_free(I->wk_kdv);
    keymap_clear(&I->integrals);
    fastvol_clear(I);
    results_close(I);
    free(I->store_path);
    for (int i = 0; i < I->nprograms; i++) {
        ast_list_free(I->programs[i]);
        source_free(I->sources[i]);
    }
    free(I->programs);
    free(I->sources);
    for (int i = 0; i < I->nsearch; i++)
        free(I->search[i]);
    for (int i = 0; i < I->nloaded; i++)
        free(I->loaded[i]);
    free(I->search);
    free(I->loaded);
    free(I->loading);
    free(I->loading_names);
    scalar_ring_clear(&I->ring);
}

/* Prints v in the current output style and releases it; strings print as
   they are. Returns 0 after reporting when v cannot be shown in the style. */
static int exec_print_value(interp *I, const node *at, value *v, const char *sep)
{
    char *err = NULL;
    char *s = v->kind == V_STR && I->style.fmt != OUT_JSON && I->style.fmt != OUT_CSV
                  ? xstrdup(v->str) : out_value(v, &I->ring, &I->style, &err);
    if (s)
        fprintf(I->out, "%s%s", s, sep);
    else
        diag_error(&at->loc, "%s", err ? err : "this value cannot be shown in this output format");
    free(s);
    free(err);
    value_release(v);
    return s != NULL;
}

static int exec_print(interp *I, scope *s, const node *n)
{
    for (int i = 0; i < n->list->len; i++) {
        value *v = eval_expr(I, s, n->list->items[i]);
        if (!v) {
            if (i > 0)
                fputc('\n', I->out);
            return 0;
        }
        if (!exec_print_value(I, n->list->items[i], v, i + 1 < n->list->len ? " " : "\n"))
            return 0;
    }
    return 1;
}

static int exec_block(interp *I, scope *s, const node_list *body)
{
    for (int i = 0; i < body->len; i++)
        if (!exec_stmt(I, s, body->items[i]))
            return 0;
    return 1;
}

static int exec_for(interp *I, scope *s, const node *n)
{
    slong lo, hi;
    if (!eval_slong(I, s, n->a, "loop start", WORD_MIN / 2, &lo)
        || !eval_slong(I, s, n->b, "loop end", WORD_MIN / 2, &hi))
        return 0;
    for (slong i = lo; i <= hi; i++) {
        if (eval_cancelled(n))
            return 0;
        scope *body = scope_new(s);
        scope_bind_value(body, n->text, value_new_si(&I->ring, i));
        int ok = exec_block(I, body, n->list);
        scope_free(body);
        if (!ok)
            return 0;
    }
    return 1;
}

static int exec_var_one(interp *I, scope *s, const node *d, const char *name)
{
    int idx = scalar_ring_declare(&I->ring, name);
    if (idx < 0) {
        diag_error(&d->loc, "too many formal variables (at most %d)", SCALAR_MAX_VARS - 1);
        return 0;
    }
    value *v = value_new_num(&I->ring);
    scalar_set_gen(v->num, &I->ring, idx);
    scope_bind_value(s, name, v);
    return 1;
}

static int exec_var_family(interp *I, scope *s, const node *d)
{
    slong lo, hi;
    if (!eval_slong(I, s, d->a, "first index", 0, &lo) || !eval_slong(I, s, d->b, "last index", lo, &hi))
        return 0;
    if (hi - lo + 1 > SCALAR_MAX_VARS - 1 - I->ring.nvars) {
        diag_error(&d->loc, "declaring %ld variables would pass the limit of %d formal variables",
                   (long)(hi - lo + 1), SCALAR_MAX_VARS - 1);
        return 0;
    }
    for (slong i = lo; i <= hi; i++) {
        char *name = xasprintf("%s_%ld", d->text, (long)i);
        exec_var_one(I, s, d, name);
        free(name);
    }
    scope_bind_family(s, d->text, lo, hi);
    return 1;
}

static int exec_var(interp *I, scope *s, const node *n)
{
    for (int i = 0; i < n->list->len; i++) {
        const node *d = n->list->items[i];
        int ok = d->a ? exec_var_family(I, s, d) : exec_var_one(I, s, d, d->text);
        if (!ok)
            return 0;
    }
    return 1;
}

static int exec_explain(interp *I, scope *s, const node *n)
{
    const node *e = n->a;
    if (e->kind == N_SPEC)
        return specialise_explain(I, s, e);
    if (e->kind == N_CALL && spectral_explains(e->text)) {
        if (!spectral_explain(I, s, e))
            return 0;
        value *v = eval_expr(I, s, e);
        if (!v)
            return 0;
        fputs("  = ", I->out);
        return exec_print_value(I, e, v, "\n");
    }
    if (e->kind != N_INTEGRAL) {
        diag_error(&e->loc, "explain takes an integral int[g, n] C or a specialisation F[g] with ...");
        return 0;
    }
    slong g, npts;
    if (!eval_slong(I, s, e->a, "genus", 0, &g) || !eval_slong(I, s, e->b, "number of points", 0, &npts))
        return 0;
    value *c = eval_expr(I, s, e->c);
    if (!c)
        return 0;
    int ok = integrate_explain(I, e, g, npts, c);
    value_release(c);
    if (!ok)
        return 0;
    value *v = eval_expr(I, s, e);
    if (!v)
        return 0;
    fputs("  = ", I->out);
    return exec_print_value(I, e, v, "\n");
}

/* if C { ... } else { ... }: each block runs in its own scope, like a loop body. */
static int exec_if(interp *I, scope *s, const node *n)
{
    int truth;
    if (!eval_truth(I, s, n->a, &truth))
        return 0;
    const node_list *body = truth ? n->list : n->b ? n->b->list : NULL;
    if (!body)
        return 1;
    scope *inner = scope_new(s);
    int ok = exec_block(I, inner, body);
    scope_free(inner);
    return ok;
}

static int exec_stmt_kind(interp *I, scope *s, const node *n)
{
    value *v;
    switch (n->kind) {
    case S_LET:
        if (!(v = eval_expr(I, s, n->a)))
            return 0;
        scope_bind_value(s, n->text, v);
        return 1;
    case S_DEF:
        scope_bind_function(s, n->text, n);
        return 1;
    case S_FOR:
        return exec_for(I, s, n);
    case S_PRINT:
        return exec_print(I, s, n);
    case S_VAR:
        return exec_var(I, s, n);
    case S_EXPLAIN:
        return exec_explain(I, s, n);
    case S_LOAD:
        return exec_load(I, n);
    case S_IF:
        return exec_if(I, s, n);
    case S_TABLE:
        return exec_table(I, s, n);
    case S_OUTPUT:
        return exec_output(I, s, n);
    case S_EXPR:
        if (I->explain_all && n->a->kind == N_INTEGRAL) {
            node e = *n;
            e.kind = S_EXPLAIN;
            return exec_explain(I, s, &e);
        }
        if (!(v = eval_expr(I, s, n->a)))
            return 0;
        return exec_print_value(I, n, v, "\n");
    default:
        diag_error(&n->loc, "not a statement");
        return 0;
    }
}

int exec_stmt(interp *I, scope *s, const node *n)
{
    const srcloc *outer = memory_set_statement(&n->loc);
    int ok = exec_stmt_kind(I, s, n);
    memory_set_statement(outer);
    return ok;
}

/* Keeps the program and its source alive for the interpreter's lifetime,
   since user functions point into them. */
static void interp_keep(interp *I, node_list *program, source *src)
{
    I->programs = xrealloc(I->programs, (I->nprograms + 1) * sizeof(node_list *));
    I->sources = xrealloc(I->sources, (I->nprograms + 1) * sizeof(source *));
    I->programs[I->nprograms] = program;
    I->sources[I->nprograms] = src;
    I->nprograms++;
}

/* FLINT reports impossible operations by calling its abort hook; the hook
   below turns that into an error of the statement being run. */
static jmp_buf *exec_recover_point;

FLINT_NORETURN static void exec_flint_abort(void)
{
    if (exec_recover_point)
        longjmp(*exec_recover_point, 1);
    fputs("psikappa: error: internal arithmetic error\n", stderr);
    _Exit(1);
}

void interp_install_abort_handler(void)
{
    flint_set_abort(exec_flint_abort);
}

/* Runs the statements of a program, stopping at the first error. */
static int exec_program(interp *I, const node_list *program)
{
    jmp_buf jb;
    jmp_buf *outer = exec_recover_point;
    volatile int i = 0, ok = 1;
    const srcloc *volatile statement = memory_set_statement(NULL);
    memory_set_statement(statement);
    exec_recover_point = &jb;
    if (setjmp(jb)) {
        diag_error(&program->items[i]->loc, "internal arithmetic error inside FLINT; the statement was stopped");
        exec_recover_point = outer;
        memory_set_statement(statement);
        I->list_outer = 1;
        I->depth = 0;
        return 0;
    }
    for (; ok && i < program->len; i++)
        ok = exec_stmt(I, I->globals, program->items[i]);
    exec_recover_point = outer;
    return ok;
}

/* Syntax errors are held back until the statements before them have run,
   so that output and error appear in source order. */
int interp_run_source(interp *I, source *src)
{
    char *held = NULL;
    size_t held_len = 0;
    FILE *mem = open_memstream(&held, &held_len);
    diag_set_stream(mem);
    node_list *program;
    int syntax_failed = parse_source(src, &program);
    diag_set_stream(NULL);
    if (mem)
        fclose(mem);
    interp_keep(I, program, src);
    int ok = exec_program(I, program);
    fflush(I->out);
    if (ok && syntax_failed && held)
        fputs(held, stderr);
    free(held);
    return ok && !syntax_failed ? 0 : 1;
}
