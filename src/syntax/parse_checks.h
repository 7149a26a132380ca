/* Checks that the grammar's actions make while building the tree: the
   extent of an integrand (an integral followed by + or -, an integral in an
   integrand), F_2 with ..., and the bracket form of family declarations of
   earlier versions. Each reports at the node responsible. */
#ifndef PSIKAPPA_PARSE_CHECKS_H
#define PSIKAPPA_PARSE_CHECKS_H

#include "ast.h"
#include "parse.h"

/* a + b or a - b (op '+' or '-'), refused when a ends with an integral outside
   parentheses: the two readings are shown. Takes a and b; returns the node, or
   NULL (both freed) after reporting. left, opl and right locate a, op and b. */
node *parser_sum(srcloc at, srcloc left, srcloc opl, srcloc right, int op, node *a, node *b);

/* int_{g,n} integrand, refused when the integrand holds an integral outside
   parentheses. Takes the three nodes; returns the integral or NULL (freed). */
node *parser_integral(srcloc at, node *g, node *n, node *integrand);

/* base[index]: the item of a list. A bare name keeps its text in the node (text[a]), so that
   the evaluator can say what the name is when it is not a list; any other primary (a call,
   a parenthesised expression, another item: t[1][4]) is the node's b. Takes both nodes. */
node *parser_index(srcloc at, node *base, node *index);

/* var L[a..b]: reports the form that replaced it (var L_{a..b}). */
void parser_old_family(const srcloc *at, const char *name);

/* The genus of F_2 with ... (or FTheta_2 with ..., then *theta = 'T', else 0): a number node
   for the digits after F_ / FTheta_. Takes name; returns NULL after reporting when name is
   not F_ or FTheta_ and digits. */
node *parser_free_energy_genus(srcloc at, char *name, int *theta);

/* The genus of FTheta_{g} with ...: the one subscript. Takes name and subs (both freed);
   returns NULL after reporting when the name is not FTheta or there is not one subscript. */
node *parser_free_energy_theta_genus(srcloc at, char *name, node_list *subs);

#endif
