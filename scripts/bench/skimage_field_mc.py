"""The peer of the coarse-to-fine cost figure: what a user of NumPy and scikit-image does for 3d_z².

usage: skimage_field_mc.py N EXTENT LEVEL
Samples psi_{3,2,0} on a uniform N³ grid over ±EXTENT a0 with NumPy (float32, broadcast axes, no copies of the
grid), then runs skimage.measure.marching_cubes at +LEVEL and -LEVEL (both phases). Timed the way the bench times
ours: wall clock (time.perf_counter) and CPU (time.process_time) from the first array to the last triangle.
Closed form (hydrogen 3d_z², Z = 1, lengths in a0): R_32 = 4 / (81 sqrt 30) r² e^{-r/3} and
Y_20 = (1/4) sqrt(5/pi) (3 cos²θ − 1), so psi = (3 z² − r²) e^{-r/3} / (81 sqrt(6 pi)) (e.g. Griffiths,
"Introduction to Quantum Mechanics", tables 4.3 and 4.7). Prints one JSON object, with psi at three grid
points so the bench can check that both sides mesh the same field.
"""
import json
import sys
import time

import numpy as np
import skimage
from skimage import measure


def main():
    n, extent, level = int(sys.argv[1]), float(sys.argv[2]), float(sys.argv[3])
    w0, c0 = time.perf_counter(), time.process_time()
    x = np.linspace(-extent, extent, n, dtype=np.float32)
    X, Y, Z = x[None, None, :], x[None, :, None], x[:, None, None]  # array[z, y, x]: x fastest, as ours
    r2 = X * X + Y * Y + Z * Z
    psi = (np.float32(3) * Z * Z - r2) * np.exp(-np.sqrt(r2) / np.float32(3)) * np.float32(1 / (81 * np.sqrt(6 * np.pi)))
    w1, c1 = time.perf_counter(), time.process_time()
    tris = 0
    for lv in (level, -level):
        _verts, faces, _normals, _values = measure.marching_cubes(psi, level=lv)
        tris += len(faces)
    w2, c2 = time.perf_counter(), time.process_time()
    probes = [[int(i), int(j), int(k), float(psi[k, j, i])] for (i, j, k) in ((n // 2, n // 3, n // 4), (n // 5, n // 2, n // 2), (1, n - 2, n // 3))]
    print(json.dumps({
        'version': skimage.__version__,
        'field_ms': (w1 - w0) * 1000.0, 'mc_ms': (w2 - w1) * 1000.0,
        'field_cpu_ms': (c1 - c0) * 1000.0, 'mc_cpu_ms': (c2 - c1) * 1000.0,
        'triangles': tris, 'probes': probes,
    }))


if __name__ == '__main__':
    main()
