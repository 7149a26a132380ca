#include "parse.h"

#include <stdlib.h>

#include "diag.h"
#include "parser.h"
#include "util.h"

/* Declared by the reentrant scanner that flex generates. */
int yylex_init_extra(parse_state *extra, yyscan_t *scanner);
int yylex_destroy(yyscan_t scanner);
typedef struct yy_buffer_state *YY_BUFFER_STATE;
YY_BUFFER_STATE yy_scan_bytes(const char *bytes, int len, yyscan_t scanner);

int yyparse(yyscan_t scanner, parse_state *ps);

int parse_source(const source *src, node_list **program)
{
    int incomplete;
    return parse_source_ex(src, program, &incomplete);
}

/* Bytes of src to parse: all of it, or, when it holds a bare carriage return
   (*cr set), the whole lines before the one holding it if they close every
   bracket (so that the statements before run and their errors come first),
   else nothing. */
static size_t parse_extent(const source *src, srcloc *cr, int *has_cr)
{
    *has_cr = source_find_bare_cr(src, cr);
    if (!*has_cr)
        return src->len;
    size_t before = src->line_starts[cr->first_line - 1];
    return source_open_brackets(src->text, before, 0) == 0 ? before : 0;
}

int parse_source_ex(const source *src, node_list **program, int *incomplete)
{
    srcloc cr;
    int has_cr;
    size_t len = parse_extent(src, &cr, &has_cr);
    parse_state *ps = xcalloc(1, sizeof(parse_state));
    ps->src = src;
    ps->program = ast_list_new();
    ps->line = 1;
    ps->column = 1;
    ps->last_was_newline = 1;
    yyscan_t scanner;
    if (yylex_init_extra(ps, &scanner) != 0)
        util_out_of_memory();
    yy_scan_bytes(src->text, (int)len, scanner);
    int rc = yyparse(scanner, ps);
    *incomplete = rc != 0 && ps->hit_eof && ps->nopen > 0 && !has_cr;
    if (rc == 0 && has_cr) {
        diag_error(&cr, "a carriage return (\\r) that does not end a line: lines end with \\n or \\r\\n "
                        "(convert the file's line endings)");
        rc = 1;
    }
    yylex_destroy(scanner);
    *program = ps->program;
    free(ps);
    return rc == 0 ? 0 : 1;
}
