"""Times skimage.measure.marching_cubes (Lewiner) on a float32 cube written by scripts/bench.mjs.

usage: skimage_mc.py FILE N REPEATS LEVEL [LEVEL ...]
Prints one JSON object: {"version", "levels": [{"level", "best_ms", "vertices", "triangles"}]}.
The array is x fastest on disk, so numpy's C order reads it as [z, y, x]; marching cubes does not mind.
"""
import json
import sys
import time

import numpy as np
import skimage
from skimage import measure


def main():
    path, n, repeats = sys.argv[1], int(sys.argv[2]), int(sys.argv[3])
    levels = [float(x) for x in sys.argv[4:]]
    vol = np.fromfile(path, dtype='<f4').reshape((n, n, n))
    out = []
    for level in levels:
        best = float('inf')
        verts = faces = None
        for _ in range(repeats):
            t0 = time.perf_counter()
            verts, faces, _normals, _values = measure.marching_cubes(vol, level=level, method='lewiner')
            best = min(best, (time.perf_counter() - t0) * 1000.0)
        out.append({'level': level, 'best_ms': best, 'vertices': int(len(verts)), 'triangles': int(len(faces))})
    print(json.dumps({'version': skimage.__version__, 'levels': out}))


if __name__ == '__main__':
    main()
