/* Statements and programs: let, functions, loops, print, var, explain. */
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cancel.h"
#include "classes/cpoly.h"
#include "correlators/wk_kdv.h"
#include "theta_lang.h"
#include "diag.h"
#include "hodge_lang.h"
#include "builtins.h"
#include "interp.h"
#include "memory.h"
#include "parse.h"
#include "verify_account.h"
#include "util.h"
#include "fastvol.h"
#include "results.h"
#include "integrate.h"
#include "specialise.h"
#include "exec.h"
#include "eval.h"
#include "failure.h"

void interp_init(interp *I)
{
    memset(I, 0, sizeof(interp));
    scalar_ring_init(&I->ring);
    I->globals = scope_new(NULL);
    keymap_init(&I->integrals);
    I->lim.max_terms = 2e7;
    I->lim.max_table = 3e7;
    /* after the defaults, so that the table gets the default limit */
    I->wk = wk_table_new();
    wk_table_set_cancel(I->wk, &cancel_flag);
    cpoly_set_cancel(&cancel_flag);
    wk_table_set_limit(I->wk, (slong)I->lim.max_table);
    I->lim.max_class_terms = 2000000;
    I->lim.max_dim = 2000;
    I->lim.max_depth = 2000;
    I->lim.max_seconds = 600;
    I->list_outer = 1;
    sink_init(&I->sink, STDOUT_FILENO);
    I->out = sink_stream(&I->sink) ? sink_stream(&I->sink) : stdout;
    I->style.fmt = OUT_EXACT;
    I->style.digits = 20;
    I->real_digits = 30;
}

void interp_clear(interp *I)
{
    scope_free(I->globals);
    wk_table_free(I->wk);
    wk_kdv_table_free(I->wk_kdv);
    theta_lang_clear(I);
    hodge_lang_clear(I);
    keymap_clear(&I->integrals);
    fastvol_clear(I);
    volume_cache_clear(I);
    results_close(I);
    verify_account_free(I);
    free(I->store_path);
    sink_clear(&I->sink);
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
    free(I->warned);
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

/* What follows a printed value: in CSV the values of one print are the
   fields of one record (RFC 4180: comma-separated, ended by CRLF, as the
   grids of table are); elsewhere a space, and a newline at the end. */
static const char *exec_print_sep(const interp *I, int last)
{
    if (I->style.fmt == OUT_CSV)
        return last ? "\r\n" : ",";
    return last ? "\n" : " ";
}

static int exec_print(interp *I, scope *s, const node *n)
{
    for (int i = 0; i < n->list->len; i++) {
        value *v = eval_expr(I, s, n->list->items[i]);
        if (!v) {
            if (i > 0)
                fputs(exec_print_sep(I, 1), I->out);
            return 0;
        }
        if (!exec_print_value(I, n->list->items[i], v, exec_print_sep(I, i + 1 == n->list->len)))
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
    if (names_check_reserved(&n->loc, n->text))
        return 0;
    if (!eval_slong(I, s, n->a, "loop start", WORD_MIN / 2, &lo)
        || !eval_slong(I, s, n->b, "loop end", WORD_MIN / 2, &hi))
        return 0;
    for (slong i = lo; i <= hi; i++) {
        if (failure_cancelled(n))
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
    if (names_check_reserved(&d->loc, name))
        return 0;
    int idx = scalar_ring_declare(&I->ring, name);
    if (idx < 0) {
        diag_error(&d->loc, "too many formal variables (at most %d)", SCALAR_MAX_DECLARED);
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
    char *stem = xasprintf("%s_", d->text);
    int reserved = names_check_reserved(&d->loc, stem);
    free(stem);
    if (reserved)
        return 0;
    if (hi - lo + 1 > SCALAR_MAX_DECLARED - I->ring.nvars) {
        diag_error(&d->loc, "declaring %ld variables would pass the limit of %d formal variables",
                   (long)(hi - lo + 1), SCALAR_MAX_DECLARED);
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
    if (e->kind == N_CALL && spectral_explains(s, e->text)) {
        if (!spectral_explain(I, s, e))
            return 0;
        value *v = eval_expr(I, s, e);
        if (!v)
            return 0;
        fputs("  = ", I->out);
        return exec_print_value(I, e, v, "\n");
    }
    if (e->kind != N_INTEGRAL) {
        diag_error(&e->loc, "explain takes an integral int_{g,n} C or a specialisation F_{g} with ...");
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
    return exec_print_value(I, e, v, exec_print_sep(I, 1));
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

/* Whether name is bound in s itself (not in an enclosing scope). */
static int exec_bound_here(const scope *s, const char *name)
{
    for (int i = 0; i < s->len; i++)
        if (strcmp(s->items[i].name, name) == 0)
            return 1;
    return 0;
}

/* let inside a block (a loop or if body) may not hide a binding of an
   enclosing block: the new binding would end with the block, silently
   leaving the outer one as it was. Returns 1 when the name may be bound. */
static int exec_let_ok(interp *I, scope *s, const node *n)
{
    if (names_check_reserved(&n->loc, n->text))
        return 0;
    if (s == I->globals || exec_bound_here(s, n->text) || !scope_lookup(s->parent, n->text))
        return 1;
    diag_error(&n->loc, "let %s here would make a new %s that ends with this block, leaving the outer %s as it "
                        "was: write %s := ... to update the outer one, or choose another name",
               n->text, n->text, n->text, n->text);
    return 0;
}

/* name := expr: the nearest binding of name takes the new value. */
static int exec_assign(interp *I, scope *s, const node *n)
{
    value *v = eval_expr(I, s, n->a);
    if (!v)
        return 0;
    binding *b = scope_lookup(s, n->text);   /* looked up after evaluating: that may add bindings */
    char *msg = NULL;
    if (!b)
        msg = xasprintf("there is no binding '%s' to update (:= changes an existing binding; make one with "
                        "let %s = ...)", n->text, n->text);
    else if (b->kind != B_VALUE)
        msg = xasprintf("'%s' is a %s: := changes the value of a binding made by let", n->text,
                        b->kind == B_FUNCTION ? "function" : "family of variables");
    if (msg) {
        diag_error(&n->loc, "%s", msg);
        free(msg);
        value_release(v);
        return 0;
    }
    value_release(b->val);
    b->val = v;
    return 1;
}

static int exec_stmt_kind(interp *I, scope *s, const node *n)
{
    value *v;
    switch (n->kind) {
    case S_LET:
        if (!exec_let_ok(I, s, n) || !(v = eval_expr(I, s, n->a)))
            return 0;
        scope_bind_value(s, n->text, v);
        return 1;
    case S_ASSIGN:
        return exec_assign(I, s, n);
    case S_DEF:
        if (names_check_reserved(&n->loc, n->text))
            return 0;
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
    case S_PRECISION:
        return exec_precision(I, s, n);
    case S_EXPR:
        if (I->explain_all && n->a->kind == N_INTEGRAL) {
            node e = *n;
            e.kind = S_EXPLAIN;
            return exec_explain(I, s, &e);
        }
        if (!(v = eval_expr(I, s, n->a)))
            return 0;
        return exec_print_value(I, n, v, exec_print_sep(I, 1));
    default:
        diag_error(&n->loc, "not a statement");
        return 0;
    }
}

/* Writes the statement's output whole, or drops it when the statement failed
   half-way. Returns 0 after reporting a failed write. */
static int exec_commit(interp *I, int ok)
{
    if (!ok) {
        sink_discard(&I->sink);
        return 0;
    }
    int had_error = I->sink.err != 0;
    if (sink_commit(&I->sink))
        return 1;
    if (!had_error)
        diag_error(NULL, "cannot write the output: %s", strerror(I->sink.err));
    return 0;
}

int exec_stmt(interp *I, scope *s, const node *n)
{
    if (I->sink.err)
        return 0;   /* the output is gone: nothing more is worth computing */
    if (util_stack_exhausted()) {   /* blocks in functions in loads ... nested very deeply */
        diag_error(&n->loc, "statements nested too deeply for the stack (deep recursion through a block)");
        return 0;
    }
    const srcloc *outer = memory_set_statement(&n->loc);
    int ok = exec_stmt_kind(I, s, n);
    memory_set_statement(outer);
    return exec_commit(I, ok);
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
    sink_discard(&I->sink);   /* what is left belongs to a statement that failed */
    if (ok && syntax_failed && held)
        fputs(held, stderr);
    free(held);
    return ok && !syntax_failed ? 0 : 1;
}
