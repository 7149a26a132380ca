#!/usr/bin/env bash
# Regenerates the hostile scripts that are too large, too deep or too binary
# to write by hand. Their expected .out/.err files are written by hand and
# kept beside them; run this after changing a generator, then re-check them.
set -euo pipefail
cd "$(dirname "$0")"

# 5000 nested parentheses around 1 (the parser refuses nesting, not the C stack)
{ for ((i = 0; i < 5000; i++)); do printf '('; done
  printf '1'
  for ((i = 0; i < 5000; i++)); do printf ')'; done
  printf '\n'; } > deep_parens_5000.pk

# 5000 unary minus signs: right-nested like parentheses, without brackets
{ for ((i = 0; i < 5000; i++)); do printf -- '- '; done
  printf '1\n'; } > deep_unary_minus_5000.pk

# A flat sum of 100000 ones, then a division by zero: the tree is 100000
# levels deep on its left side although the text has no nesting at all.
{ printf '('
  for ((i = 1; i < 100000; i++)); do printf '1+'; done
  printf '1)/0\n'; } > deep_left_chain.pk

# 100001 postfix '!': 50000 '!!' and one '!', each a node above the last.
{ printf '(2'
  for ((i = 0; i < 50000; i++)); do printf '!!'; done
  printf ')/0\n'; } > deep_postfix_chain.pk

# An endless recursion whose body is a chain of 1000 additions: each call
# takes about a thousand nested evaluations, so the C stack runs out long
# before the call-depth limit (2000). The first operand is 130 digits long so
# that every node of the chain is wider than the caret window (160 columns):
# wherever the stack guard trips in the chain, the message looks the same.
{ printf 'print "start"\nlet f(k) = f(k + 1) + 1'
  for ((i = 0; i < 129; i++)); do printf '0'; done
  for ((i = 0; i < 1000; i++)); do printf ' + 1'; done
  printf '\nf(0)\n'; } > rec_deep_body.pk

# A 1 MB line (1+1+...+1, 524288 bytes of "1+" twice over) ending in a stray '@'.
{ for ((i = 0; i < 524287; i++)); do printf '1+'; done
  printf '1 @\n'; } > file_long_line_1mb.pk

# Every byte value 0x00..0xFF once, in order.
for ((i = 0; i < 256; i++)); do printf "\\x$(printf %02x "$i")"; done > file_binary_all_bytes.pk

# A NUL byte between two statements.
printf 'print 1\000print 2\n' > file_nul_byte.pk

# Invalid UTF-8: a lone 0xFF inside a name, after a statement that runs.
printf 'print 1\nlet x\377 = 2\n' > file_invalid_utf8.pk

# An overlong UTF-8 encoding of '/' (0xC0 0xAF) where an operator would be.
printf 'print 6 \300\257 2\n' > file_overlong_utf8.pk

# Windows line endings; the error is on the third line.
printf 'print 1\r\nlet x = 2\r\nprint x + y\r\n' > file_crlf.pk


# A UTF-8 byte-order mark before the first statement; the error on line 1
# must have the column it has without the mark.
printf '\357\273\277print 1/0\n' > file_bom.pk

# A NUL byte inside a string (it would cut the string short).
printf 'print "ab\000cd"\n' > file_nul_in_string.pk

# Windows line endings with an error at the end of a line: the caret must be
# where the line ends, not one column later.
printf 'print 1\r\nprint 2 +\r\n' > file_crlf_end_of_line.pk

# A bare carriage return (not part of \r\n) between two statements on one
# line: an error at its place, after the lines before it ran (it used to join them).
printf 'print 1\nprint 2\rprint 3\n' > file_bare_cr.pk
