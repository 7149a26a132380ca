#!/usr/bin/env python3
"""Refreshes the ```output blocks of a Markdown document from the ```pk blocks
before them, by running psikappa. Use it after editing an example, then read
the diff: the test suite (tests/docs/run-examples.sh) checks the result.

usage: tools/doc-outputs.py path/to/psikappa docs/language.md
"""
import os
import subprocess
import sys
import tempfile


def run_example(exe, body):
    with tempfile.TemporaryDirectory() as d:
        with open(os.path.join(d, 'example.pk'), 'w') as f:
            f.write('\n'.join(body) + '\n')
        env = dict(os.environ, PSIKAPPA_STORE='off')
        # one stream, as tests/docs/run-examples.sh reads it: a warning stays beside its value
        r = subprocess.run([exe, 'example.pk'], cwd=d, stdout=subprocess.PIPE, stderr=subprocess.STDOUT,
                           text=True, env=env)
        return r.stdout.rstrip('\n').split('\n')


def refresh(exe, lines):
    out, i = [], 0
    while i < len(lines):
        if lines[i] != '```pk':
            out.append(lines[i])
            i += 1
            continue
        end = lines.index('```', i + 1)
        body = lines[i + 1:end]
        out.extend(lines[i:end + 1])
        i = end + 1
        j = i
        while j < len(lines) and lines[j] == '':
            j += 1
        if j < len(lines) and lines[j] == '```output':
            i = lines.index('```', j + 1) + 1
        out.extend(['', '```output'] + run_example(exe, body) + ['```'])
    return out


def main():
    exe, doc = os.path.abspath(sys.argv[1]), sys.argv[2]
    with open(doc) as f:
        lines = f.read().split('\n')
    text = '\n'.join(refresh(exe, lines))
    with open(doc + '.tmp', 'w') as f:   # replaced only once complete
        f.write(text)
    os.replace(doc + '.tmp', doc)


if __name__ == '__main__':
    main()
