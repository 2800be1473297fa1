#!/usr/bin/env python3
"""Robustness check by mutation: runs `lccsim run` on copies of the demo
circuits with one to three random changes each (a number replaced by an
extreme value, a line deleted or doubled, a statement added) and reports
every outcome that breaks the house rules for bad input: a crash (a signal),
a run past its time, an allocation failure, an internal error, or an exit
code other than 0, 1 or 2. Each offending input is kept for a test.

Usage: python3 scripts/mutate-demos.py [SEED] [COUNT] [--failures]
  from the repository root, after scripts/build.sh. Every run is capped at
  60 s and 300 MB of output files; --failures also lists the messages of the
  cases that failed cleanly (exit 1), to review how well they explain.
"""
import glob
import os
import random
import re
import shutil
import subprocess
import sys
import tempfile

EXTREMES = ['0', '-1', '1e-12', '1e12', '1e-300', '1e300', '0.5', '3', '1e-6', '1e-9', '100000', '7', '2', '0.01']
ADDED = ['steady cycles = 50 method = shooting', 'window from = 0 s to = 1e9 s', 'simulate stop = 60 ms sample = 1 us',
         'steady cycles = 1 tol = 1e-15', 'capacitor Cx (p, n) C = 1 pF', 'capacitor Cx (p, n) C = 1 F',
         'resistor Rx (p, n) R = 1e-9 ohm', 'inductor Lx (p, n) L = 1 nH', 'resistor Ry (a, gnd) R = 1 ohm']
NUMBER = re.compile(r'(?<![A-Za-z_\d.])(\d+(?:\.\d+)?(?:e[-+]?\d+)?)(?![\d.])')


def mutate(text, rng):
    # Short runs: every demo stops at 60 ms.
    lines = re.sub(r'stop = [0-9.e+-]+ ?[a-z]*', 'stop = 60 ms', text).split('\n')
    for _ in range(rng.randint(1, 3)):
        r = rng.random()
        if r < 0.6:
            spots = [(i, m) for i, l in enumerate(lines) if not l.lstrip().startswith('#')
                     for m in NUMBER.finditer(l.split('#')[0])]
            if spots:
                i, m = rng.choice(spots)
                lines[i] = lines[i][:m.start()] + rng.choice(EXTREMES) + lines[i][m.end():]
        elif r < 0.7:
            del lines[rng.randrange(len(lines))]
        elif r < 0.8:
            i = rng.randrange(len(lines))
            lines.insert(i, lines[i])
        else:
            lines.append(rng.choice(ADDED))
    return '\n'.join(lines)


def main():
    args = [a for a in sys.argv[1:] if not a.startswith('--')]
    seed = int(args[0]) if args else 1
    count = int(args[1]) if len(args) > 1 else 200
    rng = random.Random(seed)
    demos = sorted(glob.glob('circuits/*.lcc'))
    work = tempfile.mkdtemp(prefix='lccsim-mutate-')
    kept, outcomes = 0, {}
    for k in range(count):
        demo = rng.choice(demos)
        source = mutate(open(demo).read(), rng)
        path = os.path.join(work, 'case.lcc')
        open(path, 'w').write(source)
        out = os.path.join(work, 'out')
        shutil.rmtree(out, ignore_errors=True)
        command = f'ulimit -f 300000; exec timeout -k 5 60 ./build/lccsim run {path} --out {out} --overwrite'
        r = subprocess.run(['bash', '-c', command], capture_output=True, text=True)
        said = r.stdout + r.stderr
        outcomes[r.returncode] = outcomes.get(r.returncode, 0) + 1
        if r.returncode == 1 and '--failures' in sys.argv:
            print(f'[{seed}:{k}] {demo}: ' + ' | '.join(l for l in said.splitlines() if 'failed (' in l))
        if r.returncode not in (0, 1, 2) or 'bad_alloc' in said or 'error while' in said:
            keep = os.path.join(work, f'offending-{seed}-{k}.lcc')
            open(keep, 'w').write(source)
            kept += 1
            print(f'[{seed}:{k}] {demo}: exit {r.returncode}, kept as {keep}\n{said[-600:]}')
    shutil.rmtree(os.path.join(work, 'out'), ignore_errors=True)
    print(f'{count} mutated runs, exit codes {dict(sorted(outcomes.items()))}; {kept} offending (in {work})')
    return 1 if kept else 0


if __name__ == '__main__':
    sys.exit(main())
