#!/usr/bin/python3
"""What scikit-rf reads from every Touchstone file shipped in its own package (its test data), as JSON.

/usr/bin/python3 scripts/touchstone/scikit-rf-reference.py OUT.json [FOLDER]
FOLDER defaults to the installed scikit-rf package. For each file: the number of ports, the frequencies,
the S-parameters, the reference impedances scikit-rf uses (HFSS "Port Impedance" comments when the file
says it was exported from HFSS, else the option line's R) and, for one- and two-ports, the impedance of a
part measured by reflection (Network.z[:, 0, 0]) or in a series-thru fixture (2·sqrt(R1·R2)/S21 − R1 − R2 on
scikit-rf's S21 and references).
Compared with chokepoint's reader by scripts/touchstone/compare-with-scikit-rf.ts (DEVELOPERS.md).
"""
import json
import os
import re
import sys
import warnings

import numpy as np

if not hasattr(np, 'complex'):
    np.complex = complex  # scikit-rf 0.15.4 still uses this alias, removed in NumPy 1.24

import skrf as rf  # noqa: E402

warnings.simplefilter('ignore')


def flat(values):
    values = np.asarray(values)
    return {'re': [float(v) for v in np.real(values).ravel()], 'im': [float(v) for v in np.imag(values).ravel()]}


def main():
    out = sys.argv[1]
    folder = sys.argv[2] if len(sys.argv) > 2 else os.path.dirname(rf.__file__)
    results = []
    for directory, _, names in sorted(os.walk(folder)):
        for name in sorted(names):
            if not re.search(r'\.(s\d+p|ts)$', name, re.IGNORECASE):
                continue
            path = os.path.join(directory, name)
            entry = {'path': path, 'library': 'scikit-rf %s' % rf.__version__}
            try:
                network = rf.Network(path)
                entry.update(ok=True, ports=network.nports, frequencyHz=[float(f) for f in network.f],
                             s=flat(network.s), referenceOhm=flat(network.z0))
                with np.errstate(all='ignore'):
                    if network.nports == 1:
                        entry['reflection'] = flat(network.z[:, 0, 0])
                    elif network.nports == 2:
                        # The series-thru formula on scikit-rf's S21 and reference impedances.
                        r1, r2 = network.z0[:, 0], network.z0[:, 1]
                        entry['seriesThru'] = flat(2 * np.sqrt(r1 * r2) / network.s[:, 1, 0] - r1 - r2)
            except Exception as error:  # scikit-rf refuses the file: recorded, not fatal
                entry.update(ok=False, error='%s: %s' % (type(error).__name__, error))
            results.append(entry)
    with open(out, 'w') as stream:
        json.dump(results, stream)
    print('%d files, %d read by scikit-rf %s' % (len(results), sum(r['ok'] for r in results), rf.__version__))


if __name__ == '__main__':
    main()
