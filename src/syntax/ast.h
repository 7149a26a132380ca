/* Syntax tree: constructors called from the grammar's actions, a free
   function, and a stable text dump used by tests. */
#ifndef PSIKAPPA_AST_H
#define PSIKAPPA_AST_H

#include <stdio.h>

#include "source.h"

typedef enum {
    /* expressions */
    N_NUMBER,   /* text: decimal digits, or digits '.' digits (exact) */
    N_STRING,   /* text: the unescaped string */
    N_PI,
    N_NAME,     /* text: the name */
    N_INDEXED,  /* text[a] (a name) or b[a] (any other primary): the a-th item of a list */
    N_SUBSCRIPT,/* text_{list}: a member X_{i} of a family declared by var X_{a..b}, or V_{g,n};
                   b: the arguments of V_{g,n}(a_1, ..., a_n) (an N_LIST), else NULL */
    N_CALL,     /* text(list) */
    N_PSI,      /* psi with index a */
    N_KAPPA,    /* kappa with index a */
    N_CORR,     /* <list of N_INSERT>_a */
    N_INSERT,   /* tau with index a, repeated b times (b may be NULL) */
    N_NEG,      /* -a */
    N_BINOP,    /* a op b, op one of + - * / ^ */
    N_COMPARE,  /* a op b, op one of the CMP_ codes */
    N_FACTORIAL,/* a! */
    N_INTEGRAL, /* int_{a,b} c */
    N_IF,       /* if a then b else c */
    N_SUM,      /* sum_{text=a..b} c (op '+'), prod_{text=a..b} c (op '*'), seq_{text=a..b} c (op 'L') */
    N_SPEC,     /* F_{a} with list of N_RULE, order text^b */
    N_LIST,     /* [list] */
    N_LOGIC,    /* a and b (op '&'), a or b ('|'), not a ('~') */
    N_RANGE,    /* text = a..b (in table_{...}) */
    N_RULE,     /* text = a; with list = (N_NAME k): for k >= b, or for k in b..c */
    /* statements */
    S_LET,      /* let text = a */
    S_ASSIGN,   /* text := a (an existing binding takes a new value) */
    S_DEF,      /* let text(list of N_NAME) = a */
    S_FOR,      /* for text in a..b { list } */
    S_PRINT,    /* print list */
    S_VAR,      /* var list of N_VARDECL */
    N_VARDECL,  /* text, or text_{a..b} */
    S_EXPLAIN,  /* explain a */
    S_IF,       /* if a { list } [else b], b an S_IF holding the else block in its list */
    S_TABLE,    /* table_{list of N_RANGE} a */
    S_LOAD,     /* load "text" */
    S_OUTPUT,   /* output text [a] */
    S_PRECISION, /* precision a: working digits of reals */
    S_EXPR      /* a */
} node_kind;

enum { CMP_EQ, CMP_NE, CMP_LT, CMP_LE, CMP_GT, CMP_GE };

typedef struct node node;

typedef struct node_list {
    node **items;
    int len, cap;
} node_list;

struct node {
    node_kind kind;
    srcloc loc;
    int op;           /* operator character or CMP_ code */
    int paren;        /* written in parentheses (which the location leaves out) */
    char *text;       /* owned */
    node *a, *b, *c;  /* owned children, may be NULL */
    node_list *list;  /* owned, may be NULL */
};

/* Constructors take ownership of the children, lists and text they are given. */
node *ast_new(node_kind kind, srcloc loc);
node *ast_text(node_kind kind, srcloc loc, char *text);
node *ast_unary(node_kind kind, srcloc loc, node *a);
node *ast_binop(srcloc loc, int op, node *a, node *b);
node *ast_compare(srcloc loc, int cmp, node *a, node *b);
node *ast_ternary(node_kind kind, srcloc loc, node *a, node *b, node *c);
node *ast_with_list(node_kind kind, srcloc loc, char *text, node_list *list);
/* A literal index such as the 3 in psi_3, as a number node. */
node *ast_index_literal(srcloc loc, const char *digits);

node_list *ast_list_new(void);
/* Appends n to l (taking ownership) and returns l, so that grammar actions chain. */
node_list *ast_list_append(node_list *l, node *n);
void ast_list_free(node_list *l);
void ast_free(node *n);

/* Writes a stable, one-line-per-node dump of the tree (for golden tests). */
void ast_dump(FILE *out, const node *n, int depth);


#endif
