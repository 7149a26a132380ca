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

int parse_source_ex(const source *src, node_list **program, int *incomplete)
{
    srcloc cr;
    if (source_find_bare_cr(src, &cr)) {   /* checked before any statement runs */
        diag_error(&cr, "a carriage return (\\r) that does not end a line: lines end with \\n or \\r\\n "
                        "(convert the file's line endings)");
        *incomplete = 0;
        *program = ast_list_new();
        return 1;
    }
    parse_state *ps = xcalloc(1, sizeof(parse_state));
    ps->src = src;
    ps->program = ast_list_new();
    ps->line = 1;
    ps->column = 1;
    ps->last_was_newline = 1;
    yyscan_t scanner;
    if (yylex_init_extra(ps, &scanner) != 0)
        util_out_of_memory();
    yy_scan_bytes(src->text, (int)src->len, scanner);
    int rc = yyparse(scanner, ps);
    *incomplete = rc != 0 && ps->hit_eof && ps->nopen > 0;
    yylex_destroy(scanner);
    *program = ps->program;
    free(ps);
    return rc == 0 ? 0 : 1;
}
