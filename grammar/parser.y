/* Grammar of the psikappa language. Actions only call the syntax-tree
   constructors of src/syntax/ast.h, so this file reads as the grammar itself. */
%define api.pure full
%define parse.error custom
%locations
%define api.location.type {srcloc}
%param {yyscan_t scanner}
%parse-param {parse_state *ps}
%expect 0

%code requires {
#include "ast.h"
#include "parse.h"
typedef void *yyscan_t;
}

%code provides {
int yylex(YYSTYPE *lvalp, YYLTYPE *llocp, yyscan_t scanner);
}

%code {
#include <stdlib.h>
#include <string.h>
#include "diag.h"
#include "parse_checks.h"
#include "util.h"

#define YYLLOC_DEFAULT(Cur, Rhs, N)                                   \
    do {                                                              \
        if (N) {                                                      \
            (Cur) = YYRHSLOC(Rhs, 1);                                 \
            (Cur).last_line = YYRHSLOC(Rhs, N).last_line;             \
            (Cur).last_column = YYRHSLOC(Rhs, N).last_column;         \
        } else {                                                      \
            (Cur) = YYRHSLOC(Rhs, 0);                                 \
            (Cur).first_line = (Cur).last_line;                       \
            (Cur).first_column = (Cur).last_column;                   \
        }                                                             \
    } while (0)

void yyerror(YYLTYPE *loc, yyscan_t scanner, parse_state *ps, const char *msg);

/* Deeply nested input is refused instead of exhausting the C stack later
   (brackets are refused by the lexer first, at 256 levels). */
#define YYMAXDEPTH 2000

/* Parameters are parsed as arguments, so that `let f(1) = ...` can be told
   apart from a syntax error; 1 when every one is a name, else reports. */
static int parser_check_params(const node_list *params)
{
    for (int i = 0; i < params->len; i++) {
        const node *p = params->items[i];
        if (p->kind == N_NAME)
            continue;
        diag_error(&p->loc, "a parameter of a function must be a name (let f(x, y) = ...), got %s",
                   p->kind == N_NUMBER ? "a number" : p->kind == N_STRING ? "a string" : "an expression");
        return 0;
    }
    return 1;
}

/* a < b < c is refused rather than read as (a < b) < c: comparisons give 0
   or 1, so the chained reading would silently mean something else. A
   parenthesised left side ((a < b) < c) is wider than the comparison in it.
   Returns the comparison node, or NULL (a and b freed) after reporting. */
static node *parser_compare(srcloc at, srcloc left, srcloc op, int cmp, node *a, node *b)
{
    if (a->kind == N_COMPARE && a->loc.first_line == left.first_line && a->loc.first_column == left.first_column) {
        diag_error(&op, "comparisons do not chain: write a < b and b < c instead of a < b < c");
        ast_free(a);
        ast_free(b);
        return NULL;
    }
    return ast_compare(at, cmp, a, b);
}
}

%union {
    char *text;
    node *n;
    node_list *list;
}

%token <text> NUMBER "number" STRING "string" NAME "name"
%token <text> PSI_LIT "psi_N" KAPPA_LIT "kappa_N" TAU_LIT "tau_N"
%token <text> SUBNAME "name_{"
%token LET "'let'" FOR "'for'" IN "'in'" VAR "'var'" PRINT "'print'"
%token EXPLAIN "'explain'" IF "'if'" THEN "'then'" ELSE "'else'"
%token PRECISION "'precision'"
%token LOAD "'load'" OUTPUT "'output'" WITH "'with'" ORDER "'order'" PI "'pi'"
%token INT_SUB "'int_{'" SUM_SUB "'sum_{'" PROD_SUB "'prod_{'" SEQ_SUB "'seq_{'"
%token TABLE_SUB "'table_{'" F_SUB "'F_{'" PSI_SUB "'psi_{'" KAPPA_SUB "'kappa_{'"
%token TAU_SUB "'tau_{'" CORR_SUB "'>_{'" ASSIGN "':='"
%token DOTDOT "'..'" CORR_CLOSE "'>_'" EQ "'=='" NE "'!='" LE "'<='" GE "'>='"
%token DFACT "'!!'" AND "'and'" OR "'or'" NOT "'not'"
%token NEWLINE "end of line"
%token LEXERROR "invalid token"
%token END 0 "end of file"

%type <n> stmt expr primary insertion genus power vardecl
%type <n> rule range
%type <list> args arg_list stmt_list block insertions vardecls expr_list rules ranges

%destructor { free($$); } <text>
%destructor { ast_free($$); } <n>
%destructor { ast_list_free($$); } <list>

%precedence LOW
%left OR
%left AND
%precedence NOT
%left EQ NE '<' LE '>' GE
%left '+' '-'
%precedence INTEGRAL SUMOP
%left '*' '/'
%precedence NEG
%right '^'
%precedence '!' DFACT

%%

program
    : %empty
    | program NEWLINE
    | program stmt NEWLINE          { ast_list_append(ps->program, $2); }
    ;

stmt
    : LET NAME '=' expr                      { $$ = ast_unary(S_LET, @$, $4); $$->text = $2; }
    | LET NAME '(' args ')' '=' expr         { if (!parser_check_params($4)) { free($2); ast_list_free($4); ast_free($7); YYERROR; }
                                               $$ = ast_with_list(S_DEF, @$, $2, $4); $$->a = $7; }
    | FOR NAME IN expr DOTDOT expr block     { $$ = ast_with_list(S_FOR, @$, $2, $7); $$->a = $4; $$->b = $6; }
    | PRINT expr_list                        { $$ = ast_with_list(S_PRINT, @$, NULL, $2); }
    | VAR vardecls                           { $$ = ast_with_list(S_VAR, @$, NULL, $2); }
    | EXPLAIN expr                           { $$ = ast_unary(S_EXPLAIN, @$, $2); }
    | IF expr block                          { $$ = ast_with_list(S_IF, @$, NULL, $3); $$->a = $2; }
    | IF expr block ELSE block               { $$ = ast_with_list(S_IF, @$, NULL, $3); $$->a = $2; $$->b = ast_with_list(S_IF, @5, NULL, $5); }
    | TABLE_SUB ranges '}' expr              { $$ = ast_with_list(S_TABLE, @$, NULL, $2); $$->a = $4; }
    | NAME ASSIGN expr                       { $$ = ast_unary(S_ASSIGN, @$, $3); $$->text = $1; }
    | LOAD STRING                            { $$ = ast_text(S_LOAD, @$, $2); }
    | LET NAME '(' arg_list ',' ')'          { $$ = NULL; diag_error(&@6, "syntax error: unexpected ')', expected a parameter name");
                                               free($2); ast_list_free($4); YYERROR; }
    | OUTPUT                                 { $$ = NULL; diag_error(&@1, "output needs a format: output exact, decimal, latex, csv or json "
                                                               "(decimal and latex may add a number of digits)"); YYERROR; }
    | OUTPUT NAME                            { $$ = ast_text(S_OUTPUT, @$, $2); }
    | OUTPUT NAME expr                       { $$ = ast_text(S_OUTPUT, @$, $2); $$->a = $3; }
    | PRECISION expr                         { $$ = ast_unary(S_PRECISION, @$, $2); }
    | expr                                   { $$ = ast_unary(S_EXPR, @$, $1); }
    ;

block
    : '{' stmt_list '}'             { $$ = $2; }
    | '{' stmt_list stmt '}'        { $$ = ast_list_append($2, $3); }
    ;

stmt_list
    : %empty                        { $$ = ast_list_new(); }
    | stmt_list NEWLINE             { $$ = $1; }
    | stmt_list stmt NEWLINE        { $$ = ast_list_append($1, $2); }
    ;

vardecls
    : vardecl                       { $$ = ast_list_append(ast_list_new(), $1); }
    | vardecls ',' vardecl          { $$ = ast_list_append($1, $3); }
    ;

vardecl
    : NAME                              { $$ = ast_text(N_VARDECL, @$, $1); }
    | SUBNAME expr DOTDOT expr '}'      { $$ = ast_text(N_VARDECL, @$, $1); $$->a = $2; $$->b = $4; }
    | NAME '[' expr DOTDOT expr ']'     { parser_old_family(&@$, $1); free($1); ast_free($3); ast_free($5); $$ = NULL; YYERROR; }
    ;

expr_list
    : expr                          { $$ = ast_list_append(ast_list_new(), $1); }
    | expr_list ',' expr            { $$ = ast_list_append($1, $3); }
    ;

expr
    : primary
    | '-' expr %prec NEG            { $$ = ast_unary(N_NEG, @$, $2); }
    | expr '+' expr                 { if (!($$ = parser_sum(@$, @1, @2, @3, '+', $1, $3))) YYERROR; }
    | expr '-' expr                 { if (!($$ = parser_sum(@$, @1, @2, @3, '-', $1, $3))) YYERROR; }
    | expr '*' expr                 { $$ = ast_binop(@$, '*', $1, $3); }
    | expr '/' expr                 { $$ = ast_binop(@$, '/', $1, $3); }
    | expr '^' expr                 { $$ = ast_binop(@$, '^', $1, $3); }
    | expr '!'                      { $$ = ast_unary(N_FACTORIAL, @$, $1); $$->op = 1; }
    | expr DFACT                    { $$ = ast_unary(N_FACTORIAL, @$, $1); $$->op = 2; }
    | expr EQ expr                  { if (!($$ = parser_compare(@$, @1, @2, CMP_EQ, $1, $3))) YYERROR; }
    | expr NE expr                  { if (!($$ = parser_compare(@$, @1, @2, CMP_NE, $1, $3))) YYERROR; }
    | expr '<' expr                 { if (!($$ = parser_compare(@$, @1, @2, CMP_LT, $1, $3))) YYERROR; }
    | expr LE expr                  { if (!($$ = parser_compare(@$, @1, @2, CMP_LE, $1, $3))) YYERROR; }
    | expr '>' expr                 { if (!($$ = parser_compare(@$, @1, @2, CMP_GT, $1, $3))) YYERROR; }
    | expr GE expr                  { if (!($$ = parser_compare(@$, @1, @2, CMP_GE, $1, $3))) YYERROR; }
    | expr AND expr                 { $$ = ast_binop(@$, '&', $1, $3); $$->kind = N_LOGIC; }
    | expr OR expr                  { $$ = ast_binop(@$, '|', $1, $3); $$->kind = N_LOGIC; }
    | NOT expr                      { $$ = ast_unary(N_LOGIC, @$, $2); $$->op = '~'; }
    | INT_SUB expr ',' expr '}' expr %prec INTEGRAL
                                    { if (!($$ = parser_integral(@$, $2, $4, $6))) YYERROR; }
    | IF expr THEN expr ELSE expr %prec LOW        { $$ = ast_ternary(N_IF, @$, $2, $4, $6); }
    | SUM_SUB NAME '=' expr DOTDOT expr '}' expr %prec SUMOP
                                    { $$ = ast_ternary(N_SUM, @$, $4, $6, $8); $$->text = $2; $$->op = '+'; }
    | SEQ_SUB NAME '=' expr DOTDOT expr '}' expr %prec LOW
                                    { $$ = ast_ternary(N_SUM, @$, $4, $6, $8); $$->text = $2; $$->op = 'L'; }
    | PROD_SUB NAME '=' expr DOTDOT expr '}' expr %prec SUMOP
                                    { $$ = ast_ternary(N_SUM, @$, $4, $6, $8); $$->text = $2; $$->op = '*'; }
    ;

primary
    : NUMBER                        { $$ = ast_text(N_NUMBER, @$, $1); }
    | STRING                        { $$ = ast_text(N_STRING, @$, $1); }
    | PI                            { $$ = ast_new(N_PI, @$); }
    | NAME                          { $$ = ast_text(N_NAME, @$, $1); }
    | NAME '(' args ')'             { $$ = ast_with_list(N_CALL, @$, $1, $3); }
    | primary '[' expr ']'          { $$ = parser_index(@$, $1, $3); }
    | SUBNAME arg_list '}'          { $$ = ast_with_list(N_SUBSCRIPT, @$, $1, $2); }
    | SUBNAME arg_list '}' '(' args ')'
                                    { srcloc paren = @4;
                                      paren.last_line = @6.last_line;
                                      paren.last_column = @6.last_column;
                                      $$ = ast_with_list(N_SUBSCRIPT, @$, $1, $2);
                                      $$->b = ast_with_list(N_LIST, paren, NULL, $5); }
    | PSI_LIT                       { $$ = ast_unary(N_PSI, @$, ast_index_literal(@$, $1)); free($1); }
    | PSI_SUB expr '}'              { $$ = ast_unary(N_PSI, @$, $2); }
    | KAPPA_LIT                     { $$ = ast_unary(N_KAPPA, @$, ast_index_literal(@$, $1)); free($1); }
    | KAPPA_SUB expr '}'            { $$ = ast_unary(N_KAPPA, @$, $2); }
    | '<' insertions CORR_CLOSE genus   { $$ = ast_with_list(N_CORR, @$, NULL, $2); $$->a = $4; }
    | '<' insertions CORR_SUB expr '}'  { $$ = ast_with_list(N_CORR, @$, NULL, $2); $$->a = $4; }
    | '<' NAME '|' insertions CORR_CLOSE genus { $$ = ast_with_list(N_CORR, @$, $2, $4); $$->a = $6; }
    | '<' NAME '|' insertions CORR_SUB expr '}' { $$ = ast_with_list(N_CORR, @$, $2, $4); $$->a = $6; }
    | '(' expr ')'                  { $$ = $2; $$->paren = 1; }
    | '[' args ']'                  { $$ = ast_with_list(N_LIST, @$, NULL, $2); }
    | F_SUB expr '}' WITH rules ',' ORDER NAME '^' power
                                    { $$ = ast_with_list(N_SPEC, @$, $8, $5); $$->a = $2; $$->b = $10; }
    | NAME WITH rules ',' ORDER NAME '^' power
                                    { int theta = 0;
                                      node *g = parser_free_energy_genus(@1, $1, &theta);
                                      if (!g) { free($6); ast_list_free($3); ast_free($8); YYERROR; }
                                      $$ = ast_with_list(N_SPEC, @$, $6, $3); $$->a = g; $$->b = $8; $$->op = theta; }
    | SUBNAME arg_list '}' WITH rules ',' ORDER NAME '^' power
                                    { node *g = parser_free_energy_theta_genus(@1, $1, $2);
                                      if (!g) { free($8); ast_list_free($5); ast_free($10); YYERROR; }
                                      $$ = ast_with_list(N_SPEC, @$, $8, $5); $$->a = g; $$->b = $10; $$->op = 'T'; }
    ;

ranges
    : range                         { $$ = ast_list_append(ast_list_new(), $1); }
    | ranges ',' range              { $$ = ast_list_append($1, $3); }
    ;

range
    : NAME '=' expr DOTDOT expr     { $$ = ast_ternary(N_RANGE, @$, $3, $5, NULL); $$->text = $1; }
    ;

rules
    : rule                          { $$ = ast_list_append(ast_list_new(), $1); }
    | rules ',' rule                { $$ = ast_list_append($1, $3); }
    ;

rule
    : NAME '=' expr                 { $$ = ast_unary(N_RULE, @$, $3); $$->text = $1; }
    | NAME '=' expr FOR NAME GE expr
                                    { $$ = ast_ternary(N_RULE, @$, $3, $7, NULL); $$->text = $1; $$->list = ast_list_append(ast_list_new(), ast_text(N_NAME, @5, $5)); }
    | NAME '=' expr FOR NAME IN expr DOTDOT expr
                                    { $$ = ast_ternary(N_RULE, @$, $3, $7, $9); $$->text = $1; $$->list = ast_list_append(ast_list_new(), ast_text(N_NAME, @5, $5)); }
    ;

args
    : %empty                        { $$ = ast_list_new(); }
    | arg_list
    ;

arg_list
    : expr                          { $$ = ast_list_append(ast_list_new(), $1); }
    | arg_list ',' expr             { $$ = ast_list_append($1, $3); }
    ;

insertions
    : insertion                     { $$ = ast_list_append(ast_list_new(), $1); }
    | insertions insertion          { $$ = ast_list_append($1, $2); }
    ;

insertion
    : TAU_LIT                       { $$ = ast_unary(N_INSERT, @$, ast_index_literal(@$, $1)); free($1); }
    | TAU_LIT '^' power             { $$ = ast_unary(N_INSERT, @$, ast_index_literal(@1, $1)); $$->b = $3; free($1); }
    | TAU_SUB expr '}'              { $$ = ast_unary(N_INSERT, @$, $2); }
    | TAU_SUB expr '}' '^' power    { $$ = ast_unary(N_INSERT, @$, $2); $$->b = $5; }
    ;

power
    : NUMBER                        { $$ = ast_text(N_NUMBER, @$, $1); }
    | NAME                          { $$ = ast_text(N_NAME, @$, $1); }
    | '(' expr ')'                  { $$ = $2; $$->paren = 1; }
    ;

genus
    : NUMBER                        { $$ = ast_text(N_NUMBER, @$, $1); }
    | '-' NUMBER                    { $$ = ast_unary(N_NEG, @$, ast_text(N_NUMBER, @2, $2)); }
    | NAME                          { $$ = ast_text(N_NAME, @$, $1); }
    | '(' expr ')'                  { $$ = $2; $$->paren = 1; }
    ;

%%

/* Names the bracket that an unexpected token leaves open, Lua style. */
static void parser_note_unclosed(const parse_state *ps)
{
    if (ps->nopen <= 0 || ps->nopen > PARSE_MAX_BRACKETS)
        return;
    int i = ps->nopen - 1;
    diag_note(&ps->open_loc[i], "unclosed '%c' opened here", ps->open_char[i]);
}

/* Operators can follow almost any operand; listing them in "expected ..."
   would drown the one token that is really missing. */
static int parser_is_operator(yysymbol_kind_t k)
{
    static const char *ops[] = {"'+'", "'-'", "'*'", "'/'", "'^'", "'!'", "'!!'",
                                "'=='", "'!='", "'<'", "'<='", "'>'", "'>='", "'and'", "'or'"};
    for (size_t i = 0; i < sizeof ops / sizeof ops[0]; i++)
        if (strcmp(yysymbol_name(k), ops[i]) == 0)
            return 1;
    return 0;
}

static int yyreport_syntax_error(const yypcontext_t *ctx, yyscan_t scanner, parse_state *ps)
{
    (void)scanner;
    const YYLTYPE *loc = yypcontext_location(ctx);
    yysymbol_kind_t got = yypcontext_token(ctx);
    if (got == YYSYMBOL_LEXERROR) {
        diag_error(loc, "%s", ps->lex_error ? ps->lex_error : "invalid token");
        return 0;
    }
    enum { MAXEXP = 64, MAXLIST = 5 };
    yysymbol_kind_t expected[MAXEXP];
    int all = yypcontext_expected_tokens(ctx, expected, MAXEXP);
    int wants_expr = 0, n = 0;
    for (int i = 0; i < all; i++) {
        wants_expr |= expected[i] == YYSYMBOL_NUMBER;
        if (!parser_is_operator(expected[i]))
            expected[n++] = expected[i];
    }
    char buf[400];
    int len = snprintf(buf, sizeof buf, "syntax error: unexpected %s", yysymbol_name(got));
    int unclosed = got == YYSYMBOL_YYEOF && ps->nopen > 0 && ps->nopen <= PARSE_MAX_BRACKETS;
    if (unclosed) {
        char open = ps->open_char[ps->nopen - 1];
        snprintf(buf + len, sizeof buf - len, ", expected '%c' to close the '%c' of line %d",
                 open == '(' ? ')' : open == '[' ? ']' : '}', open, ps->open_loc[ps->nopen - 1].first_line);
    } else if (wants_expr)
        snprintf(buf + len, sizeof buf - len, ", expected an expression");
    else if (n > 0 && n <= MAXLIST)
        for (int i = 0; i < n && len < (int)sizeof buf - 60; i++)
            len += snprintf(buf + len, sizeof buf - len, "%s%s",
                            i == 0 ? ", expected " : i == n - 1 ? " or " : ", ",
                            yysymbol_name(expected[i]));
    diag_error(loc, "%s", buf);
    if (got == YYSYMBOL_YYEOF || got == YYSYMBOL_NEWLINE)
        parser_note_unclosed(ps);
    return 0;
}

void yyerror(YYLTYPE *loc, yyscan_t scanner, parse_state *ps, const char *msg)
{
    (void)scanner;
    (void)ps;
    if (strcmp(msg, "memory exhausted") == 0)
        diag_error(loc, "expression nested too deeply: more than %d operators, brackets and operands wait to "
                        "be combined here (split the expression into steps with let)", YYMAXDEPTH);
    else
        diag_error(loc, "%s", msg);
}
