"""Makes second-order-wdbc.csv: the terms beyond first order of the WDBC noise ball, per update, computed by
docs/second-order/study.py (numpy 2.4.6 under Python 3.11 made the committed file; Debian's python3-numpy gives the
same to about 1e-12) for SecondOrderTest.

Usage (from this directory): /usr/bin/python3 make_second_order_fixture.py

The problem is NoiseBallOnWdbcTest's (WDBC, 80 % stratified split with seed 2026, z-scored on the split, binary
logistic, l2 = 0.01 on the weights, B = 32: 14 batches of 32 and one of 8 per reshuffled epoch), from theta*, at a
constant rate 0.4 for 3 epochs (45 updates) under `shuffle` and under `replacement` (15 batches of 32 per epoch).
Columns: sampling, update (from 1), |m3|^2, |m1 + m3|^2, tr V (replacement only), 2 E<e0, e1> (shuffle only).
"""
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
STUDY = os.path.join(HERE, '..', '..', '..', '..', '..', '..', '..', 'docs', 'second-order', 'study.py')
sys.argv = ['study.py']
env = {'__file__': os.path.abspath(STUDY), '__name__': 'fixture'}
exec(open(STUDY).read(), env)

with open(os.path.join(HERE, 'second-order-wdbc.csv'), 'w') as out:
    out.write('sampling,update,m3,m,v,cross\n')
    for sampling in ('shuffle', 'replacement'):
        _, _, _, rows = env['predict'](0.4, epochs=3, burn=0, sampling=sampling, trace=True)
        for t, r in enumerate(rows):
            first, m1, m3, m, v, cross = r
            out.write('%s,%d,%.17g,%.17g,%.17g,%.17g\n' % (sampling, t + 1, m3, m, v if sampling == 'replacement' else 0.0,
                                                          cross))
