#!/usr/bin/python3
"""Regenerate fixtures/touchstone/: Touchstone files of invented parts, and what scikit-rf says about them.

Every number in these files comes from scikit-rf (Debian's python3-scikit-rf; `apt-get install -y
python3-scikit-rf`): the network is built by scikit-rf from an invented part (an RLC bead, a capacitor
with ESR and ESL, a winding with its capacitance), its S-, Y- or Z-parameters are computed by
scikit-rf, and version 1 S-parameter files are written by scikit-rf's own `write_touchstone`. The
layouts that this scikit-rf version cannot write (Touchstone 2 keyword files, Z and Y data, port
impedances only in comments, a 4-port) are laid out here from scikit-rf's numbers, following the
Touchstone 2.0 specification. Beside each file, `<file>.expected.json` holds what scikit-rf computes
from the same network: the parameters in SI units, the reference impedances, and the part's impedance
(Network.z for a one-port, -1/Y21 for a series-thru, Z21 for a shunt-thru). Nothing comes from
chokepoint. Run: /usr/bin/python3 scripts/touchstone/make-fixtures.py (see SOURCE.md).
"""
import json
import os

import numpy as np

# scikit-rf 0.15.4 (Debian 12) still uses the alias np.complex, which NumPy 1.24 (Debian 12) removed;
# it was the builtin complex.
if not hasattr(np, 'complex'):
    np.complex = complex

import skrf as rf  # noqa: E402

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), '..', '..', 'fixtures', 'touchstone')
COMMENT = 'INVENTED test data: an invented part, computed with scikit-rf %s; not a measurement of any product' % rf.__version__


def frequency(start_hz, stop_hz, points, unit):
    return rf.Frequency(start_hz, stop_hz, points, unit='hz', sweep_type='log').__class__(
        start_hz / {'hz': 1, 'khz': 1e3, 'mhz': 1e6, 'ghz': 1e9}[unit],
        stop_hz / {'hz': 1, 'khz': 1e3, 'mhz': 1e6, 'ghz': 1e9}[unit],
        points, unit=unit, sweep_type='log')


def bead(f):
    w = 2 * np.pi * f
    branch = 0.05 + 1j * w * 1e-6
    return 1 / (1 / branch + 1j * w * 2e-12 + 1 / 300.0)


def capacitor(f):
    w = 2 * np.pi * f
    return 0.02 + 1j * w * 3e-9 + 1 / (1j * w * 100e-9)


def winding(f):
    w = 2 * np.pi * f
    return 1 / (1 / (0.1 + 1j * w * 10e-6) + 1j * w * 8e-12)


def references(z0, points, ports):
    return np.array(np.broadcast_to(np.asarray(z0, dtype=complex).reshape(-1, ports) if np.ndim(z0) else z0, (points, ports)), dtype=complex)


def from_z(freq, z, z0):
    z0 = references(z0, len(freq.f), z.shape[1])
    return rf.Network(frequency=freq, s=rf.z2s(z, z0), z0=z0)


def one_port(freq, z_part, z0):
    return from_z(freq, z_part(freq.f).reshape(-1, 1, 1), z0)


def series_thru(freq, z_part, z0):
    y = 1 / z_part(freq.f)
    ym = np.empty((len(y), 2, 2), dtype=complex)
    ym[:, 0, 0] = ym[:, 1, 1] = y
    ym[:, 0, 1] = ym[:, 1, 0] = -y
    z0 = references(z0, len(y), 2)
    return rf.Network(frequency=freq, s=rf.y2s(ym, z0), z0=z0)


def shunt_thru(freq, z_part, z0):
    z = z_part(freq.f)
    zm = np.repeat(z.reshape(-1, 1, 1), 2, axis=1).repeat(2, axis=2)
    return from_z(freq, zm, z0)


def part_impedance(network, fixture):
    if fixture == 'reflection':
        return network.z[:, 0, 0]
    if fixture == 'series-thru':
        return -1 / network.y[:, 1, 0]
    return network.z[:, 1, 0]


def flat(matrices):
    return {'re': [float(v) for v in np.real(matrices).ravel()], 'im': [float(v) for v in np.imag(matrices).ravel()]}


def expected(name, network, parameter, fixture, extra=None):
    data = {
        'library': 'scikit-rf %s' % rf.__version__,
        'ports': network.nports,
        'parameter': parameter,
        'frequencyHz': [float(v) for v in network.f],
        'matrix': flat(getattr(network, parameter.lower())),
        'referenceOhm': flat(network.z0),
    }
    if fixture is not None:
        data['part'] = {'fixture': fixture, **flat(part_impedance(network, fixture))}
    if extra:
        data.update(extra)
    with open(os.path.join(OUT, name + '.expected.json'), 'w') as out:
        json.dump(data, out, indent=1)
        out.write('\n')


def pair(value, form):
    if form == 'RI':
        return '%r %r' % (float(value.real), float(value.imag))
    angle = float(np.angle(value, deg=True))
    if form == 'MA':
        return '%r %r' % (float(abs(value)), angle)
    return '%r %r' % (float(20 * np.log10(abs(value))), angle)


def write(name, lines):
    with open(os.path.join(OUT, name), 'w') as out:
        out.write('\n'.join(lines) + '\n')


def written_by_skrf(name, network, form, fixture, edit=None):
    """A version 1 S-parameter file written by scikit-rf itself."""
    network.comments = COMMENT
    text = network.write_touchstone(filename=name, return_string=True, form=form, write_z0=edit is not None, skrf_comment=False)
    if edit:
        text = edit(text)
    with open(os.path.join(OUT, name), 'w') as out:
        out.write(text)
    expected(name, network, 'S', fixture)


def scaled(network):
    return network.frequency.f_scaled


def v1_parameter_file(name, network, parameter, form, unit_label, r, fixture):
    """Z or Y data as impedance analysers write them: version 1, normalised to R."""
    values = network.z / r if parameter == 'Z' else network.y * r
    lines = ['! ' + COMMENT, '# %s %s %s R %r' % (unit_label, parameter, form, r)]
    for k, f in enumerate(scaled(network)):
        lines.append(' '.join([repr(float(f))] + [pair(values[k, 0, 0], form)]))
    write(name, lines)
    # Z and Y data do not depend on a reference; the file's R is the one it normalised by.
    expected(name, network, parameter, fixture, {'referenceOhm': flat(np.full(network.z0.shape, r, dtype=complex))})


def v2_file(name, network, parameter, form, unit_label, references, matrix_format, order, fixture, reference_on_next_line=False):
    """A Touchstone 2.0 keyword file; Y and Z are in siemens and ohms (not normalised) in version 2."""
    n = network.nports
    values = getattr(network, parameter.lower())
    lines = ['! ' + COMMENT, '[Version] 2.0', '# %s %s %s R 50' % (unit_label, parameter, form), '[Number of Ports] %d' % n]
    if n == 2 and matrix_format == 'Full':
        lines.append('[Two-Port Data Order] %s' % order)
    lines.append('[Number of Frequencies] %d' % len(network.f))
    refs = ' '.join(repr(float(r)) for r in references)
    lines += ['[Reference]', refs] if reference_on_next_line else ['[Reference] ' + refs]
    lines += ['[Matrix Format] %s' % matrix_format, '[Network Data]']
    for k, f in enumerate(scaled(network)):
        m = values[k]
        if matrix_format == 'Full':
            if n == 2 and order == '21_12':
                entries = [m[0, 0], m[1, 0], m[0, 1], m[1, 1]]
            else:
                entries = [m[i, j] for i in range(n) for j in range(n)]
        elif matrix_format == 'Lower':
            entries = [m[i, j] for i in range(n) for j in range(i + 1)]
        else:
            entries = [m[i, j] for i in range(n) for j in range(i, n)]
        lines.append(' '.join([repr(float(f))] + [pair(e, form) for e in entries]))
    lines.append('[End]')
    write(name, lines)
    expected(name, network, parameter, fixture)


def drop_r(text):
    """An exporter that states the port impedances only in comments: the option line has no R."""
    out = []
    for line in text.split('\n'):
        if line.startswith('#'):
            line = ' '.join(line.split()[:4])
        out.append(line)
    return '\n'.join(out)


def coupled_windings_4port(freq):
    """Two windings of 20 µH coupled with k = 0.98 (an invented common-mode choke), port 1 to 2 and 3 to 4."""
    w = 2 * np.pi * freq.f
    l, m, r, cw = 20e-6, 0.98 * 20e-6, 0.05, 5e-12
    y = np.zeros((len(w), 4, 4), dtype=complex)
    a = np.array([[1, 0], [-1, 0], [0, 1], [0, -1]], dtype=float)
    for k in range(len(w)):
        zb = np.array([[r + 1j * w[k] * l, 1j * w[k] * m], [1j * w[k] * m, r + 1j * w[k] * l]])
        yb = np.linalg.inv(zb) + np.eye(2) * 1j * w[k] * cw
        y[k] = a @ yb @ a.T
    z0 = references(50, len(w), 4)
    return rf.Network(frequency=freq, s=rf.y2s(y, z0), z0=z0)


def main():
    os.makedirs(OUT, exist_ok=True)
    # One-ports measured by reflection, written by scikit-rf.
    written_by_skrf('rlc-bead-reflection-ma-mhz.s1p', one_port(frequency(1e5, 3e8, 41, 'mhz'), bead, 50), 'ma', 'reflection')
    written_by_skrf('capacitor-reflection-ri-ghz-75ohm.s1p', one_port(frequency(1e4, 1e9, 31, 'ghz'), capacitor, 75), 'ri', 'reflection')
    written_by_skrf('capacitor-reflection-db-khz.s1p', one_port(frequency(1e4, 1e8, 25, 'khz'), capacitor, 50), 'db', 'reflection')
    # Port impedances only in comments (one per frequency), the option line without R.
    written_by_skrf('rlc-bead-reflection-port-impedance-comments-25ohm.s1p', one_port(frequency(1e5, 3e8, 21, 'ghz'), bead, 25), 'ma', 'reflection', drop_r)
    f = frequency(1e5, 3e8, 21, 'mhz')
    z0 = np.linspace(20, 40, len(f.f)).reshape(-1, 1)
    written_by_skrf('rlc-bead-reflection-port-impedance-comments-varying.s1p', one_port(f, bead, z0), 'ri', 'reflection', drop_r)
    # Two-port thru fixtures, written by scikit-rf.
    written_by_skrf('winding-series-thru-db-mhz.s2p', series_thru(frequency(1e5, 1e8, 31, 'mhz'), winding, 50), 'db', 'series-thru')
    written_by_skrf('capacitor-shunt-thru-ri-hz.s2p', shunt_thru(frequency(1e4, 1e8, 31, 'hz'), capacitor, 50), 'ri', 'shunt-thru')
    # Impedance-analyser style Z and Y data (version 1: normalised to R).
    v1_parameter_file('rlc-bead-z-ma-hz-r1.s1p', one_port(frequency(1e5, 3e8, 41, 'hz'), bead, 50), 'Z', 'MA', 'Hz', 1.0, 'reflection')
    v1_parameter_file('capacitor-z-ri-khz-r50.s1p', one_port(frequency(1e4, 1e8, 25, 'khz'), capacitor, 50), 'Z', 'RI', 'kHz', 50.0, 'reflection')
    v1_parameter_file('capacitor-y-db-mhz-r50.s1p', one_port(frequency(1e4, 1e8, 25, 'mhz'), capacitor, 50), 'Y', 'DB', 'MHz', 50.0, 'reflection')
    # Touchstone 2.0: per-port references, the three matrix formats, both two-port orders, Z data.
    v2_file('winding-series-thru-v2-full-12_21-ri-per-port.ts', series_thru(frequency(1e5, 1e8, 31, 'mhz'), winding, [50, 75]), 'S', 'RI', 'MHz', [50, 75], 'Full', '12_21', 'series-thru')
    v2_file('winding-series-thru-v2-full-21_12-ma.ts', series_thru(frequency(1e5, 1e8, 31, 'mhz'), winding, 50), 'S', 'MA', 'MHz', [50, 50], 'Full', '21_12', 'series-thru', True)
    v2_file('capacitor-shunt-thru-v2-lower-db-per-port.ts', shunt_thru(frequency(1e4, 1e8, 31, 'khz'), capacitor, [50, 100]), 'S', 'DB', 'kHz', [50, 100], 'Lower', None, 'shunt-thru')
    v2_file('capacitor-shunt-thru-v2-upper-ri.ts', shunt_thru(frequency(1e4, 1e8, 31, 'hz'), capacitor, 50), 'S', 'RI', 'Hz', [50, 50], 'Upper', None, 'shunt-thru', True)
    v2_file('rlc-bead-z-v2-ri-mhz.ts', one_port(frequency(1e5, 3e8, 41, 'mhz'), bead, 50), 'Z', 'RI', 'MHz', [50], 'Full', None, 'reflection')
    v2_file('rlc-bead-reflection-v2-ma-ghz-75ohm.ts', one_port(frequency(1e5, 3e8, 41, 'ghz'), bead, 75), 'S', 'MA', 'GHz', [75], 'Full', None, 'reflection')
    # A four-port (two coupled windings) for the generic reader and its conversions.
    choke = coupled_windings_4port(frequency(1e4, 1e8, 21, 'mhz'))
    choke.comments = COMMENT
    with open(os.path.join(OUT, 'coupled-windings-4port-ri-mhz.s4p'), 'w') as out:
        out.write(choke.write_touchstone(filename='coupled-windings-4port-ri-mhz.s4p', return_string=True, form='ri', skrf_comment=False))
    expected('coupled-windings-4port-ri-mhz.s4p', choke, 'S', None, {'y': flat(choke.y)})


if __name__ == '__main__':
    main()
