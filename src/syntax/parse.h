/* The front end: source text -> tokens (grammar/lexer.l) -> syntax tree
   (grammar/parser.y). */
#ifndef PSIKAPPA_PARSE_H
#define PSIKAPPA_PARSE_H

#include "ast.h"
#include "source.h"

#define PARSE_MAX_BRACKETS 256

/* State shared by the lexer and the parser for one source. */
typedef struct parse_state {
    const source *src;
    node_list *program;     /* top-level statements parsed so far (owned) */
    /* lexer */
    int line, column;       /* position of the next byte */
    size_t offset;          /* byte offset of the next byte in src->text */
    int depth;              /* open (, [ and subscripts _{: newlines inside them are blanks */
    int last_was_newline;
    int eof_newline_sent;
    int hit_eof;            /* the lexer reached the end of the text */
    const char *lex_error;  /* message for a LEXERROR token */
    char lex_error_buf[256];
    int nopen;              /* stack of open brackets, for "unclosed" notes */
    char open_char[PARSE_MAX_BRACKETS];
    char open_counted[PARSE_MAX_BRACKETS]; /* 1 when the bracket counts in depth */
    srcloc open_loc[PARSE_MAX_BRACKETS];
} parse_state;

/* Parses src. Returns 0 on success, 1 after reporting a syntax error. In both
   cases *program receives the statements that were complete before any error;
   the caller owns it (ast_list_free). */
int parse_source(const source *src, node_list **program);

/* As parse_source; *incomplete is set to 1 when the text ended inside an
   open bracket or block (an interactive session then reads more lines). */
int parse_source_ex(const source *src, node_list **program, int *incomplete);

#endif
