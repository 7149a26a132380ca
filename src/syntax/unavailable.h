/* Names that the field uses for classes: those psikappa does not provide yet
   (boundary classes delta..., DR cycles, ...), whose reading reports that the
   class is not available, and those it provides (the Hodge classes lambda_k
   and ch_k), which the class hooks read first. None can be declared or bound,
   so that no script integrates a formal variable in a class's place. */
#ifndef PSIKAPPA_UNAVAILABLE_H
#define PSIKAPPA_UNAVAILABLE_H

/* What name stands for (e.g. "the Hodge class lambda_k") when it is such a
   reserved name, else NULL. A subscript form such as lambda_{k} is asked as
   "lambda_". */
const char *unavailable_class(const char *name);

/* The message for a reserved name, in buf: "lambda_1 is the Hodge class
   lambda_k, which is not available in psikappa yet ...". */
void unavailable_message(const char *name, char *buf, unsigned long size);

#endif
